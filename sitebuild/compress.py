"""The build's wire encodings: a ``.br`` and a ``.gz`` twin beside every file worth it.

Static hosts serve a precompressed twin when the browser accepts its encoding (sitebuild.serve
does the same); brotli at its highest quality is the smallest that browsers decode. The twins
are written after the service worker's precache list, so they are wire encodings only: the
cache stores the decoded bytes (the snapshot is inflated once, not at every boot).

Brotli at quality 11 takes about half a minute for each of the snapshot and the wasm, so each
twin is kept in .cache/brotli under the sha256 of what it compresses: the Pyodide core's twins
are made once, the snapshot's again only when its bytes change. Same bytes in, same bytes out.
"""

from __future__ import annotations

import gzip
import hashlib
import os
import tempfile
from concurrent.futures import ThreadPoolExecutor
from pathlib import Path

import brotli

ROOT = Path(__file__).resolve().parent.parent
BROTLI_CACHE = ROOT / ".cache" / "brotli"
# Files the browser fetches that compress well.
SUFFIXES = (".bin", ".wasm", ".mjs", ".js", ".css", ".html", ".json", ".webmanifest", ".svg",
            ".zip", ".whl")
# A twin is kept only if it saves this share of the file at least.
WORTH = 0.9


def _brotli(raw: bytes) -> bytes:
    key = BROTLI_CACHE / (hashlib.sha256(raw).hexdigest() + ".br")
    if key.is_file():
        return key.read_bytes()
    packed = brotli.compress(raw, quality=11)
    BROTLI_CACHE.mkdir(parents=True, exist_ok=True)
    with tempfile.NamedTemporaryFile(dir=BROTLI_CACHE, delete=False) as handle:
        handle.write(packed)
    os.replace(handle.name, key)  # whole or not at all, should two builds run at once
    return packed


def _twins(path: Path) -> list[Path]:
    raw = path.read_bytes()
    written = []
    for suffix, packed in ((".br", _brotli(raw)), (".gz", gzip.compress(raw, compresslevel=9, mtime=0))):
        if len(packed) < WORTH * len(raw):
            twin = path.with_name(path.name + suffix)
            twin.write_bytes(packed)
            written.append(twin)
    return written


def write_twins(dist: Path, min_bytes: int = 1024) -> list[str]:
    """The ``.br`` and ``.gz`` twins of every compressible file in `dist`; returns them,
    relative to `dist`."""
    files = [path for path in sorted(dist.rglob("*"))
             if path.is_file() and path.suffix in SUFFIXES and path.stat().st_size >= min_bytes]
    with ThreadPoolExecutor(max_workers=os.cpu_count() or 1) as pool:
        written = [twin for twins in pool.map(_twins, files) for twin in twins]
    return sorted(twin.relative_to(dist).as_posix() for twin in written)
