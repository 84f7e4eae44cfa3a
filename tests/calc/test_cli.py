"""The command line of DESIGN section 3, run in-process (so it runs inside Pyodide too)."""

import json

import pytest

from calc.__main__ import main


def _run(capsys, *argv):
    # The CLI tests run on the tools' examples where a reading is not given (said in the output).
    code = main(list(argv) + (["--example"] if argv and argv[0] == "run" else []))
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


def test_a_machine_card_file_fills_the_machine_facts(capsys, tmp_path):
    # A bare card typed in US units: 10 US gal/min is 37.854 L/min (NIST SP 811, B.9).
    card = tmp_path / "saw.json"
    card.write_text(json.dumps({"name": "Saw 2", "pump_flow": "10", "tank_volume": "40",
                                "oil_volume": "32"}))
    code, out, _ = _run(capsys, "run", "tank-sizing", "--machine", str(card), "--units", "us",
                        "--json")
    answer = json.loads(out)
    assert code == 0 and set(answer["from_card"]) == {"pump_flow", "tank_volume", "oil_volume"}
    assert answer["inputs"]["pump_flow"] == pytest.approx(37.854118, rel=1e-6)
    # A key=value given wins over the card, and the human output names what the card gave.
    code, out, _ = _run(capsys, "run", "tank-sizing", "--machine", str(card), "--units", "us",
                        "pump_flow=20")
    assert code == 0 and "from the machine card: tank_volume, oil_volume" in out
    # A machine record as the app exports it works the same.
    record = tmp_path / "record.json"
    record.write_text(json.dumps({"id": "m1", "card": {"name": "Saw 2", "pump_flow": 37.854118}}))
    code, out, _ = _run(capsys, "run", "tank-sizing", "--machine", str(record), "--json")
    assert code == 0 and json.loads(out)["from_card"] == ["pump_flow"]


def test_a_bad_machine_card_file_exits_2_naming_it(capsys, tmp_path):
    missing = tmp_path / "none.json"
    code, _, err = _run(capsys, "run", "tank-sizing", "--machine", str(missing))
    assert code == 2 and "--machine" in err
    bad = tmp_path / "bad.json"
    bad.write_text(json.dumps({"name": "Saw 2", "pump_flow": "lots"}))
    code, _, err = _run(capsys, "run", "tank-sizing", "--machine", str(bad))
    assert code == 2 and "pump_flow" in err
