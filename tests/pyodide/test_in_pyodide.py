"""The calc test suite and calc's doctests again, inside Pyodide under Node.js, against the wheel
the build ships: what passes there is what the native run collects, less what is native-only."""

import itertools
import json
import os
import re
import shutil
import subprocess
import sys
from collections import Counter
from pathlib import Path

import pytest

ROOT = Path(__file__).resolve().parents[2]
WHEELS = ROOT / ".cache" / "pyodide-wheels"
RUNNER = Path(__file__).with_name("run_calc_tests.mjs")
# What is native-only: the test modules that skip themselves in Pyodide because
# pytest.importorskip finds no library named here. These reference libraries are missing
# there on purpose: they need numpy and scipy, which PyPI has no Pyodide wheels of.
NATIVE_ONLY_IMPORTS = ("chemicals", "fluids", "ht")
MISSING_IMPORT = re.compile(r"could not import '(\w+)")

pytestmark = pytest.mark.pyodide


def _shipped_wheel() -> Path:
    dist = Path(os.environ.get("SUMPSIDE_DIST", ROOT / "dist"))
    found = sorted((dist / "pyodide").glob("sumpside-*.whl"))
    if not found:
        pytest.fail("dist/ holds no calc wheel: run `make test` (it builds first)")
    return found[-1]


def _native_ids() -> set[str]:
    """calc's doctests and tests/calc as the native run collects them, from the repository."""
    command = [sys.executable, "-m", "pytest", "--collect-only", "-q", "--doctest-modules", "calc", "tests/calc"]
    run = subprocess.run(command, cwd=ROOT, capture_output=True, text=True, timeout=300)
    assert run.returncode == 0, run.stdout[-2000:] + run.stderr[-2000:]
    return set(itertools.takewhile(bool, run.stdout.splitlines()))  # the ids, up to a blank line


def _listing(title: str, ids, skipped) -> str:
    """A count per module, then the first 30 ids of modules that Pyodide did not skip whole,
    each with why Pyodide skipped it if it did."""
    def line(place, text):
        return f"{text}  ({skipped[place]})" if place in skipped else text
    per_module = Counter(i.split("::")[0] for i in ids)
    shown = sorted(i for i in ids if i.split("::")[0] not in skipped)
    lines = [f"{title}:"] + [line(m, f"  {m}: {n}") for m, n in sorted(per_module.items())]
    lines += [line(i, f"    {i}") for i in shown[:30]] + (["    ..."] if len(shown) > 30 else [])
    return "\n".join(lines)


def test_calc_suite_passes_inside_pyodide(tmp_path):
    if not shutil.which("node"):
        pytest.fail("Node.js is needed to run calc inside Pyodide")
    if not any(WHEELS.glob("pytest-*.whl")):
        pytest.fail(f"{WHEELS} holds no pytest wheel: `make test` downloads them")
    outcomes_file = tmp_path / "outcomes.json"
    run = subprocess.Popen(["node", str(RUNNER), str(_shipped_wheel()), str(WHEELS), str(outcomes_file)],
                           cwd=ROOT, stdout=subprocess.PIPE, stderr=subprocess.STDOUT, text=True)
    try:
        native = _native_ids()  # while Pyodide runs
        output = run.communicate(timeout=900)[0]
    finally:
        run.kill()  # only if it is still running
    tail = "\n".join(line[:400] for line in output.splitlines()[-40:])
    sys.stdout.write(tail + "\n")
    assert "on Python 3.14" in output and "emscripten" in output and outcomes_file.exists(), tail
    outcomes = json.loads(outcomes_file.read_text())
    passed, skipped = set(outcomes["passed"]), outcomes["skipped"]
    assert len(passed) == len(outcomes["passed"]), "two tests passed under one id inside Pyodide"

    lacking = {place: m.group(1) for place, why in skipped.items() if (m := MISSING_IMPORT.search(why))}
    native_only_places = [place for place, lib in lacking.items() if lib in NATIVE_ONLY_IMPORTS]
    native_only = {i for i in native
                   if any(i == place or i.startswith(place + "::") for place in native_only_places)}
    print(f"passed in Pyodide: {len(passed)}; collected natively: {len(native)}; "
          f"native-only: {len(native_only)} in {len({i.split('::')[0] for i in native_only})} modules")
    problems = []
    if unexplained := native - native_only - passed:
        problems.append(_listing("collected natively, but did not pass in Pyodide and is not "
                                 "native-only (make it run there, or add its import to "
                                 "NATIVE_ONLY_IMPORTS)", unexplained, skipped))
    if unknown := passed - native:
        problems.append(_listing("passed in Pyodide, but not collected natively", unknown, {}))
    if ran := passed & native_only:
        problems.append(_listing("native-only, but passed in Pyodide", ran, {}))
    if stale := sorted(set(NATIVE_ONLY_IMPORTS) - set(lacking.values())):
        problems.append(f"NATIVE_ONLY_IMPORTS names {stale}, but no test in Pyodide skipped for lack "
                        "of it: take it out of the declaration")
    if run.returncode:
        problems.append(f"pytest inside Pyodide exited with status {run.returncode}: "
                        "its output ends under 'Captured stdout call'")
    if problems:
        pytest.fail("\n\n".join(problems), pytrace=False)
