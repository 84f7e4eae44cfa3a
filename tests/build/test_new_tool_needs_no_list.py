"""Adding a tool touches its module, its help and its test, nothing else.

A throwaway tool in a new module of a copy of the project appears in the CLI's catalogue,
in the built page and in the memory snapshot, without any list being edited.
"""

from __future__ import annotations

import json
import subprocess
import sys
from pathlib import Path

import pytest

from sitebuild import variant

ROOT = Path(__file__).resolve().parents[2]

THROWAWAY = '''"""A throwaway tool that only the registry test declares."""

from ..kernel.registry import UNITS, Field, Output, tool
from ..kernel.result import COMMON_PRACTICE, Q, Result


@tool("zz-doubled", title="Zz doubled length", summary="Twice the length typed.", topic=UNITS,
      inputs=(Field("length", "Length", "length", 10.0, min=0.0, max=1000.0,
                   usual=(1.0, 100.0)),),
      outputs=(Output("twice", "Twice the length", "length", headline=True),))
def doubled(length: float) -> Result:
    result = Result(values={"twice": 2.0 * length})
    result.add("ok", COMMON_PRACTICE, "Twice {0}.", Q(length, "length"))
    result.sources.append("arithmetic")
    return result
'''


@pytest.fixture(scope="module")
def project_copy(tmp_path_factory) -> Path:
    """The project's sources with one more tool module and its help page."""
    copy = variant.copy_sources(tmp_path_factory.mktemp("project"))
    (copy / "calc" / "tools" / "zz_doubled.py").write_text(THROWAWAY, encoding="utf-8")
    (copy / "site_src" / "help" / "zz-doubled.md").write_text("Doubles a length.\n",
                                                            encoding="utf-8")
    return copy


def _run(copy: Path, *args: str) -> subprocess.CompletedProcess:
    """Python in the copy: `-m calc` puts the copy first on sys.path."""
    return subprocess.run([sys.executable, *args], cwd=copy, capture_output=True, text=True,
                          timeout=600)


def test_cli_lists_the_new_tool(project_copy):
    run = _run(project_copy, "-m", "calc", "tools", "--json")
    assert run.returncode == 0, run.stderr
    assert "zz-doubled" in [t["id"] for t in json.loads(run.stdout)]
    answer = _run(project_copy, "-m", "calc", "run", "zz-doubled", "length=21", "--json")
    assert json.loads(answer.stdout)["values"]["twice"] == 42.0


@pytest.mark.slow
def test_page_and_snapshot_carry_the_new_tool(project_copy):
    if not (ROOT / "node_modules" / "pyodide").is_dir():
        pytest.fail("node_modules/pyodide is missing: `make test` runs npm ci first")
    dist = variant.build(project_copy, project_copy / "dist")
    page = (dist / "index.html").read_text(encoding="utf-8")
    assert 'data-tool="zz-doubled"' in page and "Zz doubled length" in page
    catalogue = json.loads(_run(project_copy, "-m", "calc", "tools", "--json").stdout)
    meta = json.loads((dist / "pyodide" / "snapshot.json").read_text(encoding="utf-8"))
    assert meta["tools"] == len(catalogue)  # the snapshot ran every tool, the new one too
