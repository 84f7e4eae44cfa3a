"""The command line of DESIGN section 3, run in-process (so it runs inside Pyodide too)."""

import json

import pytest

from calc.__main__ import main


def _run(capsys, *argv):
    code = main(list(argv))
    out = capsys.readouterr()
    return code, out.out, out.err


def test_issue_example_prints_the_viscosity_at_60c(capsys):
    # Issue 2's acceptance example: about 20.6 cSt at 60 degC for KV40 46, KV100 6.8.
    code, out, _ = _run(capsys, "run", "viscosity-at-temperature", "kv40=46", "kv100=6.8", "temp=60", "--json")
    answer = json.loads(out)
    assert code == 0 and answer["ok"] and answer["text"]["kv"] == "20.6 cSt"
    assert {"t_start", "t_opt_cold", "t_opt_hot", "t_min"} <= set(answer["values"])
    assert set(answer) >= {"tool", "ok", "values", "units", "verdicts", "notes", "sources"}


def test_bad_input_exits_2_naming_the_field(capsys):
    code, out, _ = _run(capsys, "run", "viscosity-at-temperature", "kv40=10", "kv100=20", "--json")
    answer = json.loads(out)
    assert code == 2 and not answer["ok"] and answer["errors"][0]["field"] == "kv100"
    code, _, err = _run(capsys, "run", "viscosity-at-temperature", "kv40=10", "kv100=20")
    assert code == 2 and "kv100" in err


def test_options_may_come_between_pairs(capsys):
    code, out, _ = _run(capsys, "run", "viscosity-at-temperature", "--units", "us", "temp=140", "--json")
    answer = json.loads(out)
    assert code == 0 and answer["units"]["t_min"] == "°F" and answer["text"]["kv"] == "20.6 cSt"


@pytest.mark.parametrize("argv", [
    ["run", "viscosity-at-temperature", "temp"],
    ["run", "viscosity-at-temperature", "--units", "us", "temp"],  # after an option too
])
def test_a_pair_without_equals_is_an_error(capsys, argv):
    code, _, err = _run(capsys, *argv)
    assert code == 2 and "key=value" in err


def test_catalogue_lists_every_tool_with_its_inputs(capsys):
    code, out, _ = _run(capsys, "tools", "--json")
    catalogue = json.loads(out)
    ids = [t["id"] for t in catalogue]
    assert code == 0 and "viscosity-at-temperature" in ids and len(ids) == len(set(ids))
    first = catalogue[ids.index("viscosity-at-temperature")]
    assert {"kv40", "kv100", "temp"} <= {f["key"] for f in first["inputs"]}  # DESIGN's core keys
    code, out, _ = _run(capsys, "tools")
    assert code == 0 and "viscosity-at-temperature" in out
