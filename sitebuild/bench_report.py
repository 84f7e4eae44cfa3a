"""The benchmark's tables and the targets of its issue, from the result sitebuild.bench made.

The targets are what the delivery and machine issues set for a phone on a plant's mobile data; each line says the
figure measured in this run and whether it is met. Nothing here measures or asserts anything.
"""

from __future__ import annotations

from sitebuild import bench_labels, bench_machines

PHASES = (("first_visit", "first visit"), ("warm_reload", "warm reload"), ("offline_reload", "offline reload"))
# The first answer's parts, in the order they start; "restore" is derived (see boot_parts).
PARTS = (
    ("worker start", "worker created (from the page's head)"),
    ("read pyodide-lock.json", "cache read: lock file"),
    ("read snapshot.json", "cache read: snapshot.json"),
    # The wasm and the snapshot are read from this build's cache by the worker itself
    # (js/build-cache.js), so no resource timing lists them; Pyodide's own request for the
    # wasm, stopped as soon as its response comes, is left out.
    ("wasm compile", "wasm read and compile (this build's cache)"),
    ("snapshot read", "snapshot read (this build's cache)"),
    ("read pyodide.asm.mjs", "cache read: pyodide.asm.mjs"),
    ("snapshot decode", "snapshot decode (zero runs back)"),
    ("snapshot digest", "snapshot sha256 (off the thread)"),
    ("read python_stdlib.zip", "cache read: stdlib zip"),
    ("wasm instantiate", "wasm instantiate"),
    ("pyodide load", "Pyodide load (script, restore, bootstrap)"),
    ("restore", "  of it: after bytes and wasm are ready"),
    ("calc load", "calc wheel load (normal boot)"),
    ("self-check", "self-check"),
    ("first call", "first call (the timed tool)"),
    ("answer shown", "answer shown in the page"),
)
TARGETS_NOTE = "the targets the delivery, machines and sharing issues set, measured in this run"


def _ms(value) -> str:
    return "–" if value is None else f"{value:,.0f}"


def boot_parts(phase: dict) -> dict[str, list]:
    """A phase's parts with the derived ones: "restore" (Pyodide's load after the snapshot's
    bytes and the wasm instance were ready) and "answer shown"."""
    parts = dict(phase.get("parts") or {})
    load = parts.get("pyodide load")
    ready = [parts[n][1] for n in ("snapshot decode", "wasm instantiate") if n in parts]
    if load and ready:
        parts["restore"] = [max(ready), load[1]]
    if phase.get("answer") is not None and "first call" in parts:
        parts["answer shown"] = [parts["first call"][1], phase["answer"]]
    return parts


def _boot_block(result: dict, label: str, key: str) -> list[str]:
    block = result["boot"][key]
    app, bare, ratio = block["app"], block["bare"], block["ratio"]
    lines = [f"Boot, {label} (median of {result['repeat']}, ms from navigation)",
             f"| {'':<16} | {'first paint':>11} | {'shell usable':>12} | {'worker boot':>11} "
             f"| {'answer (app)':>12} | {'answer (bare)':>13} | {'app / bare':>10} |",
             "|" + "|".join("-" * w for w in (18, 13, 14, 13, 14, 15, 12)) + "|"]
    for phase, name in PHASES:
        r = "–" if ratio[phase] is None else f"{ratio[phase]:.2f}"
        a = app[phase]
        lines.append(f"| {name:<16} | {_ms(a['first_paint']):>11} | {_ms(a['shell_usable']):>12} "
                     f"| {_ms(a['worker_boot']):>11} | {_ms(a['answer']):>12} | {_ms(bare[phase]['answer']):>13} | {r:>10} |")
    extra = ""
    if key == "throttled" and result["boot"].get("normal"):
        slow = bare["warm_reload"]["answer"] / result["boot"]["normal"]["bare"]["warm_reload"]["answer"]
        extra = f"; the bare warm boot took {slow:.1f}x as long as unthrottled"
    lines += [f"app boot mode: {', '.join(app['warm_reload']['modes'])}{extra}", ""]
    return lines


def _parts_block(result: dict, key: str, phase: str) -> list[str]:
    parts = boot_parts(result["boot"][key]["app"][phase])
    if not parts:
        return []
    lines = [f"First answer in parts, {dict(PHASES)[phase]}, CPU {'as is' if key == 'normal' else '/ 4'} "
             "(median ms from navigation; parts overlap)",
             f"| {'part':<44} | {'start':>6} | {'end':>6} | {'ms':>6} |",
             "|" + "|".join("-" * w for w in (46, 8, 8, 8)) + "|"]
    for name, label in PARTS:
        if name in parts:
            start, end = parts[name]
            lines.append(f"| {label:<44} | {_ms(start):>6} | {_ms(end):>6} | {_ms(end - start):>6} |")
    return lines + [""]


def _bytes_block(b: dict) -> list[str]:
    lines = [f"Bytes on a first visit, as the server sent them ({b['requests']} responses: page, worker, "
             "service worker)",
             f"| {'file':<40} | {'req':>3} | {'raw':>11} | {'sent':>11} | {'as':>8} |",
             "|" + "|".join("-" * w for w in (42, 5, 13, 13, 10)) + "|"]
    for row in b["files"]:
        lines.append(f"| {row['file']:<40} | {row['requests']:>3} | {row['raw']:>11,} | {row['sent']:>11,} "
                     f"| {row['encoding']:>8} |")
    lines.append(f"| {'all files':<40} | {'':>3} | {b['raw_total']:>11,} | {b['sent_total']:>11,} | {'':>8} |")
    lines.append(f"| {'app own files (no Pyodide core, no snapshot)':<40} | {'':>3} | {b['app_own_raw']:>11,} "
                 f"| {b['app_own_sent']:>11,} | {'':>8} |")
    return lines + [""]


def targets(result: dict) -> list[tuple[str, str, str, bool | None]]:
    """(what, target, measured, met) for each target the run measured."""
    rows = []
    update = result.get("update")
    if update:
        rows.append(("update, one help page changed", "< 300 kB",
                     f"{update['bytes']:,} bytes in {update['requests']} responses ({update['outcome']})",
                     update["outcome"] == "installed" and update["bytes"] < 300_000))
    sent = result["bytes"]["sent_total"]
    rows.append(("first visit, compressed, in all", "< 9 MB", f"{sent:,} bytes", sent < 9_000_000))
    for key, label in (("normal", "full speed"), ("throttled", "renderer CPU / 4")):
        block = result["boot"].get(key)
        if block:
            for phase in ("warm_reload", "offline_reload"):
                ratio = block["ratio"][phase]
                rows.append((f"first answer, {dict(PHASES)[phase]}, {label}", "<= 0.22 x bare",
                             "–" if ratio is None else f"{ratio:.3f} x bare",
                             ratio is not None and ratio <= 0.22))
    median = result["latency"]["submitted"]["median"]
    rows.append(("input change to answer, median", "< 20 ms", f"{median:.1f} ms", median < 20))
    kit = result.get("machine_kit")
    if kit:
        for key, label in (("machine_list_ms", "machines list, 200 machines, CPU / 4"),
                           ("machine_page_ms", "machine page, 1,000 readings, CPU / 4")):
            rows.append((label, "< 300 ms after ready", f"{kit[key]:,.0f} ms", kit[key] < 300))
    merge = result.get("merge")
    if merge:
        rows.append((f"merge of two exports of {merge['readings_each']:,} readings, CPU / {merge['rate']:g}",
                     "< 2 s", f"{merge['merge_ms']:,.0f} ms", merge["merge_ms"] < 2000))
    labels = result.get("labels")
    if labels:
        rows.append(("label QR code, typical card (demo cards)", f"<= version {labels['target_version']}",
                     f"version {labels['typical_version']} (a full card: {labels['largest_version']})",
                     labels["typical_version"] <= labels["target_version"]))
    heap = result.get("heap")
    if heap:
        rows.append(("snapshot heap in use, share of its budget", "reported (build warns at 80 %)",
                     f"{heap['in_use']:,} of {heap['budget']:,} bytes ({100 * heap['share']:.0f} %)", None))
    return rows


def _targets_block(result: dict) -> list[str]:
    lines = [f"Targets ({TARGETS_NOTE})",
             f"| {'what':<44} | {'target':<30} | {'measured':<44} | {'met':<4} |",
             "|" + "|".join("-" * w for w in (46, 32, 46, 6)) + "|"]
    for what, target, measured, met in targets(result):
        said = "–" if met is None else ("yes" if met else "NO")
        lines.append(f"| {what:<44} | {target:<30} | {measured:<44} | {said:<4} |")
    return lines


def table(result: dict) -> str:
    lines = []
    for label, key in (("CPU as is", "normal"), ("renderer CPU / 4", "throttled")):
        if result["boot"].get(key):
            lines += _boot_block(result, label, key)
    for key in ("normal", "throttled"):
        if result["boot"].get(key):
            lines += _parts_block(result, key, "warm_reload")
    lat = result["latency"]
    lines += ["Input change to answer (ms)",
              f"| {'':<34} | {'n':>4} | {'median':>7} | {'p95':>7} |",
              "|" + "|".join("-" * w for w in (36, 6, 9, 9)) + "|"]
    for key, label in (("submitted", "submitted (computes at once)"), ("typed", "typed (after the typing pause)")):
        lines.append(f"| {label:<34} | {lat[key]['n']:>4} | {lat[key]['median']:>7.1f} | {lat[key]['p95']:>7.1f} |")
    lines.append("")
    lines += _bytes_block(result["bytes"])
    update = result.get("update")
    if update:
        lines += [f"Update to a build with one help page changed ({update['changed_help']}): "
                  f"{update['outcome']}, {update['requests']} responses, {update['bytes']:,} bytes: "
                  + ", ".join(update["files"]), ""]
    heap = result.get("heap")
    if heap:
        lines += [f"Snapshot heap: {heap['in_use']:,} bytes in use of a {heap['budget']:,}-byte budget "
                  f"({100 * heap['share']:.0f} %; the allocator's break at {100 * heap['claimed_share']:.0f} %)", ""]
    if result.get("machine_kit"):
        lines += [bench_machines.table(result["machine_kit"]), ""]
    if result.get("labels"):
        lines += [bench_labels.table(result["labels"]), ""]
    lines += _targets_block(result)
    return "\n".join(lines)
