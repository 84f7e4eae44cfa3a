"""The worker boots from the build's memory snapshot, and boots the normal way, saying so,
when the snapshot is missing, corrupt, from another build or too big to restore."""

from __future__ import annotations

import hashlib
import json
from urllib.parse import parse_qs, urlparse

import pytest

from calc import bridge
from calc.kernel import registry
from sitebuild import snapshot

from .conftest import copy_dist, open_app, wait_answer

TOOL = "viscosity-at-temperature"
# Every text the status line showed, in order.
SEEN_STATUS = """
window.__statusSeen = [];
document.addEventListener("DOMContentLoaded", () => {
  const line = document.getElementById("boot-status");
  const note = () => window.__statusSeen.push(line.textContent);
  note();
  new MutationObserver(note).observe(line, { childList: true, characterData: true, subtree: true });
});
"""


def _status(page) -> tuple[str, str, str]:
    line = page.locator("#boot-status")
    return page.get_attribute("html", "data-ready"), line.inner_text(), line.get_attribute("title") or ""


def _answers_like_the_cli(page) -> None:
    expected = bridge.run(TOOL, {}, examples=True)
    assert wait_answer(page, TOOL, "kv") == expected["text"]["kv"]


def test_the_built_snapshot_belongs_to_this_build(dist):
    meta = json.loads((dist / "pyodide" / "snapshot.json").read_text())
    lock = json.loads((dist / "pyodide" / "pyodide-lock.json").read_text())
    stored = (dist / "pyodide" / meta["file"]).read_bytes()
    assert meta["wheel_sha256"] == lock["packages"]["sumpside"]["sha256"]
    assert (len(stored), hashlib.sha256(stored).hexdigest()) == (meta["stored_bytes"], meta["sha256"])
    base = snapshot.stored_base(dist / "pyodide")
    full = snapshot.unsparse(stored, base)
    assert len(full) == meta["bytes"] and full[:4] != stored[:4]  # the stored form is the difference
    # ... from the wasm's static data, which sits in the snapshot's memory behind the header.
    offset = int.from_bytes(full[4:8], "little")
    assert full[offset:offset + 1024] == base[:1024] and len(stored) < len(snapshot.sparse(full))
    assert snapshot.heap_bytes(full) == meta["heap_bytes"]
    # Pyodide 314.0.x restores into its 30 MiB heap without growing it (see sitebuild/snapshot.py).
    assert meta["heap_bytes"] <= 30 * 1024 * 1024
    # The heap's budget, reported by the build: malloc's bytes in use within what it claimed.
    heap = meta["heap"]
    assert 0 < heap["in_use"] <= heap["claimed"] <= heap["budget"] < meta["heap_bytes"]
    assert heap["share"] == round(heap["in_use"] / heap["budget"], 4)
    # The snapshot maker's self-check: every tool answered on its defaults, in both unit
    # systems, exactly as calc answers here (the worker compares a restored interpreter's).
    assert meta["self_check"] == json.loads(bridge.self_check())
    assert meta["self_check"]["ok"] and meta["self_check"]["tools"] == len(registry.tools())
    # ... and the sample the worker runs again after a restore.
    assert meta["quick_check"] == json.loads(bridge.self_check(sample=True))
    sw = (dist / "sw.js").read_text()
    assert '"pyodide/snapshot.bin"' in sw and '"pyodide/snapshot.json"' in sw
    assert ".gz" not in sw and ".br" not in sw  # twins are a wire encoding, never cached twice


def test_boots_from_the_snapshot_by_default(page, base_url, watch):
    open_app(page, base_url, f"#/tool/{TOOL}")
    mode, text, title = _status(page)
    assert mode == "snapshot", (text, title)
    assert "(snapshot), self-check" in title  # the restored interpreter passed calc's self-check
    _answers_like_the_cli(page)
    assert not watch.errors


def _break(folder, how: str) -> None:
    pyo = folder / "pyodide"
    meta_path = pyo / "snapshot.json"
    meta = json.loads(meta_path.read_text())
    snap = pyo / meta["file"]
    if how == "missing":
        for name in ("snapshot.json", "snapshot.bin"):
            for path in pyo.glob(name + "*"):
                path.unlink()
        return
    if how == "corrupt":
        data = bytearray(snap.read_bytes())
        data[len(data) // 2] ^= 0xFF  # one flipped byte in the heap: Pyodide itself would not notice
        snap.write_bytes(bytes(data))
    elif how == "truncated":
        snap.write_bytes(snap.read_bytes()[: meta["stored_bytes"] // 2])
    elif how == "other-build":
        meta["wheel_sha256"] = "0" * 64
    elif how == "other-answers":
        # What a snapshot of other calc code would show: every tool passes, with other answers.
        meta["quick_check"]["digest"] = hashlib.sha256(b"other calc code").hexdigest()
    elif how == "too-big":
        # A heap past the 30 MiB a 314.0.x restore holds ("offset is out of bounds" otherwise).
        base = snapshot.stored_base(pyo)
        full = snapshot.unsparse(snap.read_bytes(), base) + bytes(1024 * 1024)
        data = snapshot.sparse(full, base, int.from_bytes(full[4:8], "little"))
        snap.write_bytes(data)
        meta.update(bytes=len(full), stored_bytes=len(data), sha256=hashlib.sha256(data).hexdigest())
    meta_path.write_text(json.dumps(meta))
    # The server prefers the twins: drop them, so it serves the files changed above.
    for path in (snap, meta_path):
        for twin in pyo.glob(path.name + ".*"):
            twin.unlink()


@pytest.mark.parametrize("how, says", [
    ("missing", "no snapshot in this build"),
    ("corrupt", "corrupt"),
    ("truncated", "bytes, not"),
    ("other-build", "another build"),
    ("other-answers", "answered its self-check differently"),
    ("too-big", "outgrows"),
])
def test_falls_back_to_a_normal_boot_and_says_why(page, dist, serve_dir, tmp_path, watch, how, says):
    folder = copy_dist(dist, tmp_path)
    _break(folder, how)
    base = serve_dir(folder)
    notes = []
    page.on("console", lambda m: notes.append(m.text) if m.type == "warning" else None)
    page.add_init_script(SEEN_STATUS)
    open_app(page, base, f"#/tool/{TOOL}")
    mode, text, title = _status(page)
    assert mode == "normal", (text, title)
    assert says in title, title
    # While the normal boot ran, the status line said the quick start was unavailable and why.
    seen = page.evaluate("window.__statusSeen")
    assert any("quick start unavailable" in s and says in s for s in seen), seen
    assert any(says in n for n in notes), notes
    _answers_like_the_cli(page)
    assert not watch.errors


# The worker's reads: resource timing lists what it fetched; a read from CacheStorage is none.
WORKER_FETCHED = """() => performance.getEntriesByType("resource").map((e) => new URL(e.name).pathname.split("/").pop())"""
BUILD_CACHED = """async () => {
  const name = "sumpside-" + document.documentElement.dataset.build;
  for (let i = 0; i < 600; i++) {
    if (await caches.match(new URL("pyodide/snapshot.bin", document.baseURI).href, { cacheName: name })) return true;
    await new Promise((r) => setTimeout(r, 100));
  }
  return false;
}"""


def _worker(page):
    return next(w for w in page.workers if urlparse(w.url).path.endswith("/worker.js"))


def test_a_reload_reads_the_snapshot_from_this_builds_cache(page, base_url, watch):
    # The wasm is read so too (Pyodide's own request for it, stopped at once, is listed): its
    # early compile from that response is the module instantiated.
    open_app(page, base_url, f"#/tool/{TOOL}")
    assert page.evaluate(BUILD_CACHED)  # the service worker has stored this build
    open_app(page, base_url, f"#/tool/{TOOL}")
    worker = _worker(page)
    assert parse_qs(urlparse(worker.url).query)["build"] == [page.get_attribute("html", "data-build")]
    assert _status(page)[0] == "snapshot"
    assert "snapshot.bin" not in worker.evaluate(WORKER_FETCHED)
    assert "wasm instantiate" in worker.evaluate("() => self.bootPhases")
    _answers_like_the_cli(page)
    # With this build's cache gone (the phone cleared it), the same files are fetched.
    page.evaluate("async () => { for (const n of await caches.keys()) await caches.delete(n); }")
    open_app(page, base_url, f"#/tool/{TOOL}")
    assert _status(page)[0] == "snapshot"
    assert "snapshot.bin" in _worker(page).evaluate(WORKER_FETCHED)
    _answers_like_the_cli(page)
    assert not watch.errors
