"""The worker's memory snapshot: made at build time in Node.js, restored in the browser.

A normal Pyodide boot spends seconds in the interpreter's own start-up; restoring a
snapshot of an interpreter that already imported calc and ran every tool takes a fraction
of that. ``write_snapshot`` runs sitebuild/make_snapshot.mjs with the build's own copy of
the pinned Pyodide and writes, beside it in dist/pyodide/:

- ``snapshot.bin``: the snapshot without its long runs of zero bytes (see ``sparse``: about
  half the size, so the cache read at every boot takes half the time; the worker puts the
  zeros back in a few ms); sitebuild.compress adds its ``.br`` and ``.gz`` twins for the
  wire, and the cache keeps the decoded bytes, so no boot inflates anything;
- ``snapshot.json``: what ties it to this build: the calc wheel's sha256 (the same hash
  the lock file gives the wheel; the snapshot also carries it inside the interpreter as
  ``calc._snapshot_wheel_sha256``), the Pyodide version, the byte count and sha256 of
  ``snapshot.bin`` as stored and the size of the full snapshot, the heap against its
  budget, and the freshly booted interpreter's ``calc.bridge.self_check()`` (every tool
  on its defaults in both unit systems, and the digest of all those answers) beside its
  ``self_check(sample=True)`` (the first tool of each topic), which the worker runs again
  after a restore and compares.

Pyodide 314.0.x restores into its default 30 MiB of memory without growing it, so a snapshot
whose memory outgrew that cannot be restored ("offset is out of bounds"). That memory is the
heap's budget: below the heap sit the interpreter's static data and its stack, so malloc
may have what lies above (about 17 MB). The build reports the bytes in use against that
budget, warns at WARN_SHARE of it, and fails when the snapshot would not restore (the
worker's fallback to the normal boot stays for a snapshot that breaks on a phone).
"""

from __future__ import annotations

import hashlib
import json
import re
import struct
import tempfile
import shutil
import subprocess
import sys
from pathlib import Path

import numpy as np

HERE = Path(__file__).resolve().parent
SCRIPT = HERE / "make_snapshot.mjs"
# Pyodide 314.0.x's wasm memory at start-up (31457280 bytes); a restore never grows it.
DEFAULT_HEAP_BYTES = 30 * 1024 * 1024
SNAPSHOT = "snapshot.bin"
META = "snapshot.json"
# snapshot.json's layout; the worker refuses any other (site_src/js/snapshot-check.js).
FORMAT = 5
# The build warns when this share of the heap's budget is in use.
WARN_SHARE = 0.8


SPARSE_MAGIC = b"SPZ2"
# Runs that match the base shorter than this stay in the chunks: each costs an 8-byte header.
MIN_RUN = 256


def wasm_data_image(wasm: bytes) -> bytes:
    """The memory a wasm module's data segments lay out at instantiation, up to the last one's
    end: the interpreter's static data, before any code has run. Pyodide 314.0.x's segments
    are all active, at constant offsets (WebAssembly core spec, 5.5.12 data section).

    >>> module = bytes.fromhex("0061736d01000000" "0b08" "01" "00" "4102" "0b" "02" "6869")
    >>> wasm_data_image(module)
    b'\\x00\\x00hi'
    """
    def leb(at: int) -> tuple[int, int]:
        value = shift = 0
        while True:
            byte = wasm[at]
            at += 1
            value |= (byte & 0x7F) << shift
            shift += 7
            if not byte & 0x80:
                return value, at
    image, at = bytearray(), 8
    while at < len(wasm):
        section, size_at = wasm[at], at + 1
        size, at = leb(size_at)
        end = at + size
        if section == 11:
            count, at = leb(at)
            for _ in range(count):
                kind, at = leb(at)
                if kind != 0 or wasm[at] != 0x41:  # active, memory 0, offset (i32.const N)
                    raise ValueError("a data segment that is not active at a constant offset")
                offset, at = leb(at + 1)
                if wasm[at] != 0x0B:
                    raise ValueError("a data segment's offset is not one constant")
                length, at = leb(at + 1)
                if len(image) < offset + length:
                    image.extend(bytes(offset + length - len(image)))
                image[offset:offset + length] = wasm[at:at + length]
                at += length
        at = end
    return bytes(image)


def sparse(snapshot: bytes, base: bytes = b"", base_offset: int = 0, min_run: int = MIN_RUN) -> bytes:
    """`snapshot` as the difference from what a fresh instance holds: `base` at `base_offset`
    (the wasm's data segments, behind Pyodide's header), zero elsewhere. Runs of `min_run`
    bytes or more that match are left out.

    Layout (little-endian u32): b"SPZ2", full size, base offset, base length, chunk count,
    then per chunk its offset, its length and its bytes; outside the chunks the snapshot is
    the base (the worker takes it from the instance's memory before any code runs) or zero.

    >>> data = b"ab" + bytes(300) + b"c" + b"xy" * 200
    >>> packed = sparse(data, b"xy" * 200, 303)
    >>> len(packed) < 40, unsparse(packed, b"xy" * 200) == data
    (True, True)
    """
    expected = bytearray(len(snapshot))
    expected[base_offset:base_offset + len(base)] = base
    differ = bytes(np.bitwise_xor(np.frombuffer(snapshot, np.uint8), np.frombuffer(bytes(expected), np.uint8)))
    chunks, start = [], 0
    for run in re.finditer(rb"\x00{%d,}" % min_run, differ):
        if run.start() > start:
            chunks.append((start, snapshot[start:run.start()]))
        start = run.end()
    if start < len(snapshot):
        chunks.append((start, snapshot[start:]))
    parts = [SPARSE_MAGIC, struct.pack("<IIII", len(snapshot), base_offset, len(base), len(chunks))]
    for offset, data in chunks:
        parts += [struct.pack("<II", offset, len(data)), data]
    return b"".join(parts)


def unsparse(packed: bytes, base: bytes) -> bytes:
    """The full snapshot back from `sparse` (the worker does the same in JavaScript)."""
    if packed[:4] != SPARSE_MAGIC:
        raise ValueError("not a stored snapshot")
    size, base_offset, base_length, count = struct.unpack_from("<IIII", packed, 4)
    out, at = bytearray(size), 20
    out[base_offset:base_offset + base_length] = base[:base_length]
    for _ in range(count):
        offset, length = struct.unpack_from("<II", packed, at)
        at += 8
        out[offset:offset + length] = packed[at:at + length]
        at += length
    return bytes(out)


def stored_base(pyodide_dir: Path) -> bytes:
    """The base a stored snapshot of this build is the difference from."""
    return wasm_data_image((pyodide_dir / "pyodide.asm.wasm").read_bytes())


def heap_bytes(snapshot: bytes) -> int:
    """Bytes of wasm heap in a Pyodide snapshot: the header's second word is the heap's offset."""
    offset = int.from_bytes(snapshot[4:8], "little")
    return len(snapshot) - offset


def heap_budget(figures: dict) -> dict:
    """The heap against its budget, from the snapshot maker's figures (heapFigures in
    make_snapshot.mjs): the budget is the memory above the heap's start.

    >>> heap_budget({"memory": 100, "heap_start": 20, "break": 60, "arena": 40, "in_use": 30})["share"]
    0.375
    """
    budget = figures["memory"] - figures["heap_start"]
    return {"budget": budget, "in_use": figures["in_use"], "claimed": figures["arena"],
            "share": round(figures["in_use"] / budget, 4),
            "claimed_share": round(figures["arena"] / budget, 4)}


def _pyodide_version(pyodide_dir: Path) -> str:
    npm = HERE.parent / "node_modules" / "pyodide" / "package.json"
    return json.loads(npm.read_text())["version"] if npm.exists() else "unknown"


def write_snapshot(pyodide_dir: Path) -> dict:
    """Make dist/pyodide/snapshot.bin and snapshot.json; returns the metadata."""
    node = shutil.which("node")
    if not node:
        sys.exit("build: `node` is missing: the memory snapshot is made with Node.js "
                 "(install nodejs, then `npm ci`)")
    lock = json.loads((pyodide_dir / "pyodide-lock.json").read_text())
    wheel_sha = lock["packages"]["sumpside"]["sha256"]
    # The version the worker's loader reports, from the copied module (the lock file has none).
    version = _pyodide_version(pyodide_dir)
    with tempfile.TemporaryDirectory() as tmp:
        raw = Path(tmp) / "snapshot.raw"
        run = subprocess.run([node, str(SCRIPT), "snapshot", str(pyodide_dir), str(raw), wheel_sha],
                             capture_output=True, text=True)
        if run.returncode != 0:
            tail = "\n".join((run.stderr or run.stdout).strip().splitlines()[-15:])
            sys.exit(f"build: making the memory snapshot failed:\n{tail}")
        made = json.loads(run.stdout.strip().splitlines()[-1])
        data = raw.read_bytes()
    if heap_bytes(data) > DEFAULT_HEAP_BYTES:
        sys.exit(f"build: the snapshot's memory is {heap_bytes(data):,} bytes, more than the "
                 f"{DEFAULT_HEAP_BYTES:,} a Pyodide {version} restore can hold: the heap outgrew its "
                 f"budget ({made['heap']['in_use']:,} bytes in use). Import less before the snapshot, "
                 "or make the worker grow the memory before it restores")
    heap = heap_budget(made["heap"])
    print(f"snapshot: heap {heap['in_use']:,} of {heap['budget']:,} bytes in use "
          f"({heap['share']:.0%} of its budget)")
    if heap["share"] >= WARN_SHARE:
        print(f"build: WARNING the snapshot heap is {heap['share']:.0%} full (warned from "
              f"{WARN_SHARE:.0%}); past its budget the build fails", file=sys.stderr)
    stored = sparse(data, stored_base(pyodide_dir), int.from_bytes(data[4:8], "little"))
    (pyodide_dir / SNAPSHOT).write_bytes(stored)
    meta = {
        "format": FORMAT,
        "file": SNAPSHOT,
        "encoding": "SPZ2: the difference from the wasm's data segments",
        "wheel_sha256": wheel_sha,
        "pyodide": version,
        "bytes": len(data),
        "heap_bytes": heap_bytes(data),
        "stored_bytes": len(stored),
        "sha256": hashlib.sha256(stored).hexdigest(),
        "tools": made["tools"],
        "heap": heap,
        "self_check": made["self_check"],
        "quick_check": made["quick_check"],
    }
    (pyodide_dir / META).write_text(json.dumps(meta, indent=2, ensure_ascii=False), encoding="utf-8")
    return meta
