"""Start-up and latency benchmark of the built app against a bare Pyodide page.

    python -m sitebuild.bench [--repeat 3] [--changes 300] [--out bench/results/latest.json]

`make bench` builds first, then runs this. It copies dist/ to a temporary folder, writes
beside it a bare page that only boots the same Pyodide (same files, same twins, same
kind of service worker) the plain way in a module worker and computes one Python
expression, serves both with sitebuild.serve on 127.0.0.1 and drives Debian's Chromium
with Playwright. Every figure is the median of --repeat runs, each in a fresh browser
context; times are milliseconds from navigation start (the page's performance.now()):

- first paint and "shell usable": the later of the first contentful paint and the end of
  DOMContentLoaded (the page's module script has run, so navigation, checklists and
  cautions work; no Python is involved);
- first computed answer: the app's first answer shown in the page (the headline output of
  the catalogue's first tool, see ``timed_tool``), the bare page's first Python result;
  first visit (empty profile), warm reload (service worker and cache in place), offline
  reload (network off); the same for the bare page, and app / bare for each: the ratio is
  the figure that carries across machines;
- input change to answer: a changed value of that tool's first number field submitted (the
  form computes at once on submit) until the new answer is in the page, over --changes
  changes; and, for a few, a typed change, which waits for the page's typing pause first;
- the first answer in its parts (sitebuild/bench_report.py): when each of the worker's boot
  steps ran (js/boot-phases.js: snapshot read, decode and digest, wasm compile and
  instantiate, Pyodide's load and restore, self-check, first call) and its cache reads
  (resource timing), ms from navigation;
- bytes on a first visit by file, raw and as the server sent them (it serves the .br twin
  to Chromium, as a host would), counted at the server;
- bytes of an update: a phone holding this build gets a build that differs in one help page
  (sitebuild/variant.py); what the server sends until the new build is installed;
- the snapshot heap in use against its budget (dist/pyodide/snapshot.json, from the build);
- the boot figures again with Chromium's renderers held to a quarter of the CPU (see
  Throttle: CDP's CPU throttling does not reach workers) as a stand-in for a mid-range phone;
- the machine kit with 200 machines and 20,000 readings on the phone, at a quarter of the
  CPU: the machines list and a machine page with 1,000 readings (sitebuild/bench_machines);
- the merge of two phones' exports of 10,000 readings each in the app's worker, at a quarter
  of the CPU (sitebuild/bench_merge);
- the QR version of a machine label's code for the demo cards and a full card, drawn as the
  page draws it (sitebuild/bench_labels; natively, nothing timed).

It prints the tables and the issue's targets against what it measured, and writes the JSON.
Nothing here asserts a time: tests never do.
"""

from __future__ import annotations

import argparse
import json
import os
import platform
import shutil
import signal
import statistics
import sys
import tempfile
import threading
import time
from pathlib import Path
from urllib.parse import urlparse

from sitebuild import bench_labels, bench_machines, bench_merge, bench_report, serve, variant

ROOT = Path(__file__).resolve().parent.parent
DIST = ROOT / "dist"
OUT = ROOT / "bench" / "results" / "latest.json"
CHROMIUM = "/usr/bin/chromium"
CHROMIUM_ARGS = ["--no-sandbox", "--disable-background-networking", "--disable-component-update",
                 "--disable-sync", "--no-first-run", "--disable-gpu", "--disable-quic"]
PHONE = {"width": 360, "height": 740}
TIMEOUT_MS = 300_000
# Pyodide's own files; with the snapshot they are not "the app's own files".
PYODIDE_CORE = ("pyodide.mjs", "pyodide.asm.mjs", "pyodide.asm.wasm", "python_stdlib.zip")
SNAPSHOT_FILES = ("snapshot.bin",)

# Marks when the first answer (app) or first result (bare) reached the page; %s is the
# selector of the timed output (the bare page has none).
INIT_SCRIPT = """
window.__answerAt = null;
const seed = %s;  // the timed form as a technician left it (restored on load, as typed)
if (seed && location.pathname.indexOf("bare") < 0) localStorage.setItem(seed.key, JSON.stringify(seed.kept));
document.addEventListener("DOMContentLoaded", () => {
  const el = document.querySelector(%s) || document.getElementById("bare-out");
  if (!el) return;
  const check = () => {
    const text = el.textContent.trim();
    if (window.__answerAt === null && text !== "\u2013" && text !== "" && text !== "booting")
      window.__answerAt = performance.now();
  };
  new MutationObserver(check).observe(el, { childList: true, characterData: true, subtree: true });
  check();
});
"""

READ_TIMES = """() => {
  const nav = performance.getEntriesByType("navigation")[0];
  const paint = Object.fromEntries(performance.getEntriesByType("paint").map((p) => [p.name, p.startTime]));
  const fcp = paint["first-contentful-paint"] ?? paint["first-paint"] ?? null;
  return { first_paint: paint["first-paint"] ?? fcp, first_contentful_paint: fcp,
           dom_content_loaded: nav.domContentLoadedEventEnd,
           shell_usable: Math.max(fcp ?? 0, nav.domContentLoadedEventEnd),
           answer: window.__answerAt, mode: document.documentElement.dataset.ready || null,
           worker_boot: Number(((document.getElementById("boot-status") || {}).title || "")
             .match(/started in (\\d+) ms/)?.[1]) || null };
}"""

# [n, typed, {tool, out, field, values}]: n changes of the field, each to the next value.
LATENCY = """async ([n, typed, timed]) => {
  const form = document.querySelector(`form[data-tool="${timed.tool}"]`);
  const input = form.querySelector(`[name="${timed.field}"]`);
  const out = form.querySelector(`[data-out="${timed.out}"]`);
  const times = [];
  for (let i = 0; i < n; i++) {
    const changed = new Promise((resolve) => {
      const mo = new MutationObserver(() => { mo.disconnect(); resolve(performance.now()); });
      mo.observe(out, { childList: true, characterData: true, subtree: true });
    });
    input.value = timed.values[i % timed.values.length];  // each answers differently from the last
    const t0 = performance.now();
    if (typed) input.dispatchEvent(new Event("input", { bubbles: true }));
    else form.requestSubmit();
    times.push((await changed) - t0);
  }
  return times;
}"""

BARE_PAGE = """<!doctype html>
<html lang="en"><head><meta charset="utf-8"><title>Bare Pyodide</title>
<meta name="viewport" content="width=device-width, initial-scale=1"></head>
<body><h1>Bare Pyodide boot</h1><p id="bare-out">booting</p>
<script type="module" src="bare.js"></script></body></html>
"""
BARE_JS = """const worker = new Worker("bare-worker.js", { type: "module" });
worker.onmessage = (event) => { document.getElementById("bare-out").textContent = event.data; };
if ("serviceWorker" in navigator) navigator.serviceWorker.register("sw.js");
"""
BARE_WORKER = """import { loadPyodide } from "./pyodide/pyodide.mjs";
const pyodide = await loadPyodide({ indexURL: new URL("pyodide/", import.meta.url).href });
postMessage("sum = " + pyodide.runPython("sum(range(10))"));
"""
# The same cache-first scheme as the app's service worker, so reloads compare like with like.
BARE_SW = """const CACHE = "bare-1";
const PRECACHE = %s;
self.addEventListener("install", (event) => event.waitUntil(
  caches.open(CACHE).then((c) => c.addAll(PRECACHE.map((u) => new Request(u, { cache: "reload" }))))));
self.addEventListener("activate", (event) => event.waitUntil(self.clients.claim()));
self.addEventListener("fetch", (event) => {
  if (event.request.method !== "GET") return;
  event.respondWith(caches.open(CACHE).then((c) => c.match(event.request, { ignoreSearch: true }))
    .then((hit) => hit || fetch(event.request)));
});
"""


def timed_tool() -> dict:
    """What the app's figures time, taken from the registry: the catalogue's first tool of
    kind "tool", its first headline output, its first number field with a default, and
    values of that field that calc answers (checked here, natively), each answer differing
    from the one before, so every change shows a new answer."""
    from calc import bridge
    from calc.kernel import registry, units

    tool = next(iter(registry.of_kind("tool").values()))
    field = next(f for f in tool.inputs if not f.is_choice and f.default is not None)
    out = tool.headline[0]
    default, scale = float(field.default), (abs(float(field.default)) or 1.0) / 50
    values, last = [], None
    for step in range(-20, 21):
        value = default + step * scale
        if (field.min is not None and value < field.min) or (field.max is not None and value > field.max):
            continue
        answer = bridge.run(tool.id, {field.key: f"{value:g}"}, examples=True)
        if answer["ok"] and answer["text"].get(out) != last:
            values.append(f"{value:g}")
            last = answer["text"][out]
    if len(values) < 2:
        sys.exit(f"bench: {tool.id}.{field.key} gives fewer than two different answers near its default")
    # A form starts blank (calc's rule): the timed one is seeded with the tool's examples,
    # as "Fill an example" types them, so the first answer shows as soon as calc is up.
    examples = {f.key: units.format_input(float(f.default)) for f in tool.inputs
                if f.is_number and f.default is not None and tool.uses(f, tool.default_modes())}
    return {"tool": tool.id, "out": out, "field": field.key, "values": values,
            "examples": examples}


def init_script(timed: dict) -> str:
    seed = {"key": "sumpside.form." + timed["tool"],
            "kept": {"units": "metric", "inputs": timed["examples"]}}
    return INIT_SCRIPT % (json.dumps(seed),
                          json.dumps(f'form[data-tool="{timed["tool"]}"] [data-out="{timed["out"]}"]'))


def write_bare_page(target: Path, dist: Path) -> None:
    """A page that boots the build's Pyodide the plain way; never shipped in dist/."""
    pyo = target / "pyodide"
    pyo.mkdir(parents=True)
    for name in PYODIDE_CORE + ("pyodide-lock.json",):
        for copy in (name, name + ".br", name + ".gz"):
            if (dist / "pyodide" / copy).exists():
                shutil.copy2(dist / "pyodide" / copy, pyo / copy)
    (target / "index.html").write_text(BARE_PAGE, encoding="utf-8")
    (target / "bare.js").write_text(BARE_JS, encoding="utf-8")
    (target / "bare-worker.js").write_text(BARE_WORKER, encoding="utf-8")
    files = ["./", "bare.js", "bare-worker.js"] + [f"pyodide/{n}" for n in PYODIDE_CORE + ("pyodide-lock.json",)]
    (target / "sw.js").write_text(BARE_SW % json.dumps(files), encoding="utf-8")


def median(values):
    values = [v for v in values if v is not None]
    return round(statistics.median(values), 1) if values else None


def percentile(values, q):
    ordered = sorted(values)
    return round(ordered[min(len(ordered) - 1, int(round(q / 100 * (len(ordered) - 1))))], 1)


class Throttle:
    """Chromium's renderers held to 1/rate of the CPU, page and workers alike.

    CDP's Emulation.setCPUThrottlingRate slows only a page's main thread: this Chromium
    answers "Operation is only supported for pages, not workers" for a worker, and the
    calculator boots in a worker. So the renderer processes this benchmark started (they
    run the page, its worker and the service worker) are stopped and continued in turn,
    running PERIOD_S / rate of every PERIOD_S, as cpulimit does. The network service and
    the browser process stay at full speed, as a phone's flash and radio would.
    """

    PERIOD_S = 0.02

    def __init__(self, rate: float):
        self.rate = rate
        self.stop = threading.Event()
        self.thread = None
        self.seen: set[int] = set()

    def __enter__(self):
        if self.rate > 1:
            self.thread = threading.Thread(target=self._run, daemon=True)
            self.thread.start()
        return self

    def __exit__(self, *exc):
        if self.thread:
            self.stop.set()
            self.thread.join()
        return False

    @staticmethod
    def _renderers() -> list[int]:
        """Renderer processes descended from this process (so started by this benchmark)."""
        me, parents, found = os.getpid(), {}, []
        for entry in os.listdir("/proc"):
            if not entry.isdigit():
                continue
            try:
                stat = Path(f"/proc/{entry}/stat").read_text()
                parents[int(entry)] = int(stat.rsplit(")", 1)[1].split()[1])
                if b"--type=renderer" in Path(f"/proc/{entry}/cmdline").read_bytes():
                    found.append(int(entry))
            except (OSError, ValueError, IndexError):
                continue

        def mine(pid):
            for _ in range(32):
                pid = parents.get(pid, 0)
                if pid == me:
                    return True
                if pid <= 1:
                    return False
            return False
        return [pid for pid in found if mine(pid)]

    def _signal(self, pids, sig):
        for pid in pids:
            try:
                os.kill(pid, sig)
            except ProcessLookupError:
                pass

    def _run(self):
        run_s = self.PERIOD_S / self.rate
        pids, rescan = [], 0.0
        try:
            while not self.stop.is_set():
                now = time.monotonic()
                if now >= rescan:
                    pids, rescan = self._renderers(), now + 0.2
                    self.seen.update(pids)
                self._signal(pids, signal.SIGCONT)
                time.sleep(run_s)
                self._signal(pids, signal.SIGSTOP)
                time.sleep(self.PERIOD_S - run_s)
        finally:
            self._signal(self._renderers() or pids, signal.SIGCONT)


# The worker's boot steps (js/boot-phases.js) and its cache reads, with its time origin.
WORKER_PARTS = """() => ({ origin: performance.timeOrigin, phases: self.bootPhases || {},
  reads: performance.getEntriesByType("resource").map((e) => [e.name, e.startTime, e.responseEnd]) })"""


def boot_parts(page) -> dict | None:
    """When each boot step of the page's calculator worker ran: name -> [start, end] in ms
    from navigation; cache reads as "read FILE"; "worker start" is the worker's creation."""
    worker = next((w for w in page.workers if urlparse(w.url).path.endswith("/worker.js")), None)
    if worker is None:
        return None
    found = worker.evaluate(WORKER_PARTS)
    shift = found["origin"] - page.evaluate("performance.timeOrigin")
    parts = {"worker start": [round(shift), round(shift)]}
    for name, (start, end) in found["phases"].items():
        parts[name] = [round(start + shift), round(end + shift)]
    for url, start, end in found["reads"]:  # the first read of each file
        parts.setdefault("read " + urlparse(url).path.rsplit("/", 1)[-1], [round(start + shift), round(end + shift)])
    return parts


def one_visit_cycle(browser, url: str, timed: dict, rate: float, sent: list | None = None) -> dict:
    """First visit, warm reload and offline reload of one page in a fresh context; with the
    server's `sent`, how many responses the first visit took (until the build is cached)."""
    mark = len(sent) if sent is not None else 0
    context = browser.new_context(viewport=PHONE, service_workers="allow")
    page = context.new_page()
    page.add_init_script(init_script(timed))
    figures = {}
    throttle = Throttle(rate)
    try:
        throttle.__enter__()
        for phase in ("first_visit", "warm_reload", "offline_reload"):
            if phase == "first_visit":
                page.goto(url)
            else:
                if phase == "offline_reload":
                    context.set_offline(True)
                page.reload()
            page.wait_for_function("() => window.__answerAt !== null", timeout=TIMEOUT_MS, polling=50)
            figures[phase] = page.evaluate(READ_TIMES)
            figures[phase]["parts"] = boot_parts(page)
            if phase == "first_visit":
                # Reloads count only once the service worker holds the whole build.
                page.wait_for_function("() => navigator.serviceWorker.controller !== null",
                                       timeout=TIMEOUT_MS, polling=100)
                page.evaluate("() => navigator.serviceWorker.ready.then(() => true)")
                if sent is not None:
                    page.wait_for_timeout(2000)  # the worker's late read (the wheel's files)
                    figures["first_visit_responses"] = len(sent) - mark
    finally:
        throttle.__exit__(None, None, None)
        context.close()
    figures["renderers_throttled"] = len(throttle.seen)
    return figures


def update_cost(browser, site: Path, base: str, sent: list, timed: dict, build_b: Path) -> dict:
    """What a phone holding this build downloads for build B: a fresh visit until the service
    worker holds the whole build, then B in the site's place and an update check, until B's
    worker is installed (or refused); the bytes are the server's, as sent."""
    context = browser.new_context(viewport=PHONE, service_workers="allow")
    page = context.new_page()
    page.add_init_script(init_script(timed))
    try:
        page.goto(f"{base}app/#/tool/{timed['tool']}")
        page.wait_for_function("() => navigator.serviceWorker.controller !== null",
                               timeout=TIMEOUT_MS, polling=100)
        page.wait_for_timeout(2000)  # the worker's late reads (the wheel's files) are done
        del sent[:]
        shutil.rmtree(site)
        shutil.copytree(build_b, site)
        outcome = page.evaluate(variant.UPDATE_CHECK)
        got = list(sent)
    finally:
        context.close()
    files = sorted(urlparse(s.path).path.split("/app/", 1)[-1] for s in got)
    return {"outcome": outcome, "files": files, "requests": len(got),
            "bytes": sum(s.bytes for s in got)}


def first_visit_bytes(sent: list, site: Path) -> dict:
    """The first visit's responses (page, worker and precache), by file: raw size on disk,
    requests, and bytes as the server sent them (a twin when the browser accepted one)."""
    rows: dict[str, dict] = {}
    for s in sent:
        rel = urlparse(s.path).path.split("/app/", 1)[-1] or "index.html"
        disk = site / rel
        if not disk.is_file():
            continue
        row = rows.setdefault(rel, {"file": rel, "requests": 0, "raw": disk.stat().st_size, "sent": 0,
                                    "encoding": s.encoding or "identity"})
        row["requests"] += 1
        row["sent"] += s.bytes
    files = sorted(rows.values(), key=lambda r: -r["sent"])
    own = [f for f in files if is_app_own(f["file"])]
    return {"files": files, "requests": sum(f["requests"] for f in files),
            "raw_total": sum(f["raw"] for f in files), "sent_total": sum(f["sent"] for f in files),
            "app_own_raw": sum(f["raw"] for f in own), "app_own_sent": sum(f["sent"] for f in own)}


def latency(browser, url: str, timed: dict, changes: int) -> dict:
    context = browser.new_context(viewport=PHONE, service_workers="allow")
    page = context.new_page()
    page.add_init_script(init_script(timed))
    try:
        page.goto(url)
        page.wait_for_function("() => window.__answerAt !== null", timeout=TIMEOUT_MS, polling=50)
        page.evaluate(LATENCY, [10, False, timed])  # warm-up, not counted
        submitted = page.evaluate(LATENCY, [changes, False, timed])
        typed = page.evaluate(LATENCY, [max(10, changes // 15), True, timed])
    finally:
        context.close()
    return {
        "submitted": {"n": len(submitted), "median": median(submitted), "p95": percentile(submitted, 95)},
        "typed": {"n": len(typed), "median": median(typed), "p95": percentile(typed, 95)},
    }


def is_app_own(rel: str) -> bool:
    name = rel.rsplit("/", 1)[-1]
    return not (rel.startswith("pyodide/") and name in PYODIDE_CORE + SNAPSHOT_FILES)


def summarize(runs: list[dict]) -> dict:
    out = {}
    for phase in ("first_visit", "warm_reload", "offline_reload"):
        out[phase] = {key: median([r[phase][key] for r in runs])
                      for key in ("first_paint", "shell_usable", "answer", "worker_boot")}
        out[phase]["modes"] = sorted({str(r[phase]["mode"]) for r in runs})
        out[phase]["runs"] = [r[phase]["answer"] for r in runs]
        parts = [r[phase]["parts"] or {} for r in runs]
        names = sorted({name for p in parts for name in p}, key=lambda n: median(
            [p[n][0] for p in parts if n in p]))
        out[phase]["parts"] = {name: [median([p[name][k] for p in parts if name in p]) for k in (0, 1)]
                               for name in names}
    out["renderers_throttled"] = max(r.get("renderers_throttled", 0) for r in runs)
    return out


def ratios(app: dict, bare: dict) -> dict:
    return {phase: (round(app[phase]["answer"] / bare[phase]["answer"], 3)
                    if app[phase]["answer"] and bare[phase]["answer"] else None)
            for phase in ("first_visit", "warm_reload", "offline_reload")}


def main(argv: list[str] | None = None) -> int:
    parser = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    parser.add_argument("--repeat", type=int, default=3, help="runs per figure (median reported)")
    parser.add_argument("--changes", type=int, default=300, help="input changes for the latency figure")
    parser.add_argument("--no-throttle", action="store_true", help="skip the 4x CPU throttled boots")
    parser.add_argument("--no-update", action="store_true", help="skip the update (it builds once more)")
    parser.add_argument("--dist", type=Path, default=DIST)
    parser.add_argument("--out", type=Path, default=OUT)
    args = parser.parse_args(argv)
    dist = args.dist.resolve()
    if not (dist / "index.html").exists():
        sys.exit("bench: dist/ is not built: run `make bench` (it builds first) or `python build.py`")
    try:
        from playwright.sync_api import sync_playwright
    except ImportError:
        sys.exit("bench: playwright is missing: run `make setup`")
    if not Path(CHROMIUM).exists():
        sys.exit(f"bench: {CHROMIUM} is missing: `make chromium` installs it as root")

    timed = timed_tool()
    with tempfile.TemporaryDirectory(prefix="sumpside-bench-") as tmp:
        site = Path(tmp)
        shutil.copytree(dist, site / "app")  # a copy: a build running meanwhile cannot disturb it
        write_bare_page(site / "bare", site / "app")
        build_b = None
        if not args.no_update:
            print("bench: building a variant with one help page changed", file=sys.stderr)
            build_b = variant.build_with_one_help_change(site / "variant")
        server, base = serve.start_in_thread(site, record=True)
        app_url, bare_url = f"{base}app/#/tool/{timed['tool']}", f"{base}bare/"
        result = {"when": time.strftime("%Y-%m-%dT%H:%M:%S%z"), "repeat": args.repeat,
                  "timed": {k: timed[k] for k in ("tool", "out", "field")},
                  "machine": {"platform": platform.platform(), "cpus": os.cpu_count()},
                  "build": json.loads((dist / "build.json").read_text()),
                  "heap": json.loads((dist / "pyodide" / "snapshot.json").read_text()).get("heap"),
                  "boot": {}, "labels": bench_labels.label_row()}
        try:
            with sync_playwright() as playwright:
                browser = playwright.chromium.launch(executable_path=CHROMIUM, headless=True, args=CHROMIUM_ARGS)
                result["chromium"] = browser.version
                rates = [("normal", 1)] + ([] if args.no_throttle else [("throttled", 4)])
                for key, rate in rates:
                    app_runs, bare_runs = [], []
                    for i in range(args.repeat):
                        # Interleaved, so a load change on the machine hits both alike.
                        if key == "normal" and i == 0:
                            mark = len(server.sent)
                            app_runs.append(one_visit_cycle(browser, app_url, timed, rate, server.sent))
                            first_visit = server.sent[mark:mark + app_runs[-1]["first_visit_responses"]]
                        else:
                            app_runs.append(one_visit_cycle(browser, app_url, timed, rate))
                        bare_runs.append(one_visit_cycle(browser, bare_url, timed, rate))
                        print(f"bench: {key} run {i + 1}/{args.repeat}: app {app_runs[-1]['warm_reload']['answer']:.0f} ms "
                              f"warm, bare {bare_runs[-1]['warm_reload']['answer']:.0f} ms warm", file=sys.stderr)
                    app, bare = summarize(app_runs), summarize(bare_runs)
                    result["boot"][key] = {"rate": rate, "app": app, "bare": bare, "ratio": ratios(app, bare)}
                result["latency"] = latency(browser, app_url, timed, args.changes)
                result["machine_kit"] = bench_machines.machines_row(
                    browser, f"{base}app/", max(args.repeat, 5), Throttle, PHONE)
                result["merge"] = bench_merge.browser_row(
                    browser, f"{base}app/", args.repeat, Throttle, bench_machines.RATE, PHONE)
                if build_b:
                    result["update"] = update_cost(browser, site / "app", base, server.sent, timed, build_b)
                    result["update"]["changed_help"] = variant.changed_help_page(ROOT).name
                browser.close()
        finally:
            server.shutdown()
        result["bytes"] = first_visit_bytes(first_visit, site / "app")
    text = bench_report.table(result)
    result["table"] = text
    args.out.parent.mkdir(parents=True, exist_ok=True)
    args.out.write_text(json.dumps(result, indent=2, ensure_ascii=False), encoding="utf-8")
    print(text)
    print(f"\nwritten {args.out.relative_to(ROOT) if args.out.is_relative_to(ROOT) else args.out}")
    return 0


if __name__ == "__main__":
    sys.exit(main())
