"""Two builds of the same sources give the same dist/, byte for byte.

A phone fetches only the files whose hash changed (site_src/sw.js), so a build that differed
from the last one in a file it did not mean to change (a time stamp, a random seed in the
snapshot) would cost every phone that file again.
"""

from __future__ import annotations

import hashlib
import subprocess
import sys
from pathlib import Path

import pytest

from sitebuild import variant

ROOT = Path(__file__).resolve().parents[2]


def _digests(dist: Path) -> dict[str, str]:
    return {path.relative_to(dist).as_posix(): hashlib.sha256(path.read_bytes()).hexdigest()
            for path in sorted(dist.rglob("*")) if path.is_file()}


@pytest.mark.slow
def test_two_builds_are_byte_identical(tmp_path):
    if not (ROOT / "node_modules" / "pyodide").is_dir():
        pytest.fail("node_modules/pyodide is missing: `make test` runs npm ci first")
    # At the same time, one from a copy of the sources elsewhere, each into its own folder:
    # neither the moment nor a path may show in what is built.
    copy = variant.copy_sources(tmp_path / "copy" / "of" / "the" / "sources")
    runs = [(ROOT, tmp_path / "first" / "dist"), (copy, tmp_path / "second" / "elsewhere")]
    builds = [subprocess.Popen([sys.executable, "build.py", "--dist", str(folder)], cwd=sources,
                               stdout=subprocess.PIPE, stderr=subprocess.STDOUT, text=True)
              for sources, folder in runs]
    folders = [folder for _, folder in runs]
    for build in builds:
        output = build.communicate(timeout=900)[0]
        assert build.returncode == 0, output[-3000:]
    first, second = (_digests(folder) for folder in folders)
    assert first.keys() == second.keys()
    assert [name for name in first if first[name] != second[name]] == []
    assert "pyodide/snapshot.bin" in first and "sw.js" in first
