"""The calc test suite again, inside Pyodide under Node.js, against the wheel the build ships."""

import os
import re
import shutil
import subprocess
import sys
from pathlib import Path

import pytest

ROOT = Path(__file__).resolve().parents[2]
WHEELS = ROOT / ".cache" / "pyodide-wheels"
RUNNER = Path(__file__).with_name("run_calc_tests.mjs")

pytestmark = pytest.mark.pyodide


def _shipped_wheel() -> Path:
    dist = Path(os.environ.get("SUMPSIDE_DIST", ROOT / "dist"))
    found = sorted((dist / "pyodide").glob("sumpside-*.whl"))
    if not found:
        pytest.fail("dist/ holds no calc wheel: run `make test` (it builds first)")
    return found[-1]


def test_calc_suite_passes_inside_pyodide():
    if not shutil.which("node"):
        pytest.fail("Node.js is needed to run calc inside Pyodide")
    if not any(WHEELS.glob("pytest-*.whl")):
        pytest.fail(f"{WHEELS} holds no pytest wheel: `make test` downloads them")
    run = subprocess.run(["node", str(RUNNER), str(_shipped_wheel()), str(WHEELS)],
                         cwd=ROOT, capture_output=True, text=True, timeout=900)
    tail = "\n".join(line[:400] for line in (run.stdout + run.stderr).splitlines()[-40:])
    sys.stdout.write(tail + "\n")
    assert "on Python 3.14" in run.stdout and "emscripten" in run.stdout, tail
    summary = re.search(r"(\d+) passed", run.stdout)
    assert summary and int(summary.group(1)) > 50, tail
    assert run.returncode == 0, tail
