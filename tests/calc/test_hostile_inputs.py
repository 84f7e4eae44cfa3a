"""Inputs that once got a confident answer, a traceback or a misreading, and must not again.

Each case is a reproduction from an adversarial run against the bridge and the CLI; the
physical reasons are given beside each."""

import json

import pytest

from calc import bridge
from calc.__main__ import main


def _error(answer, field):
    assert not answer["ok"], answer
    return {e["field"]: e["message"] for e in answer["errors"]}[field]


def test_a_lone_comma_with_three_digits_is_refused_as_ambiguous():
    # "1,200" is 1200 in some countries and 1.2 in others; a dot is always the decimal mark.
    message = _error(bridge.run("tank-sizing", {"tank_volume": "1,200"}, examples=True), "tank_volume")
    assert message == "'1,200' could be 1200 or 1.2: type 1200, or 1.2 (no thousands separator)"
    assert bridge.run("tank-sizing", {"tank_volume": "1200,5"}, examples=True)["ok"]
    assert bridge.run("suction-check", {"atmosphere": "1.013"}, examples=True)["ok"]


def test_a_huge_integer_is_an_error_not_an_overflow():
    message = _error(bridge.run("viscosity-index", {"kv40": 10 ** 400}, examples=True), "kv40")
    assert message == "is far too large a number"


@pytest.mark.parametrize("entry", ["run_json", "reexpress_json", "machines_json"])
@pytest.mark.parametrize("request_text", ["[" * 100000, '{"inputs": {}}', "null", "[1, 2]", "{"])
def test_every_bridge_entry_answers_its_json_error_shape(entry, request_text):
    answer = json.loads(getattr(bridge, entry)(request_text))
    errors = answer.get("errors")
    assert isinstance(errors, list) and errors and all(e["message"] for e in errors), answer


def test_a_key_given_twice_on_the_cli_is_an_error_naming_it(capsys):
    assert main(["run", "viscosity-grade", "kv=46", "kv=320", "--example"]) == 2
    assert "error: kv: is given twice: give it once" in capsys.readouterr().err


def test_the_limit_a_us_message_shows_is_accepted():
    # 1 000 000 L is 264 172 US gal (NIST SP 811: 1 US gal = 3.785411784 L); the message
    # shows it as 264200 US gal, and typing that figure is taking the limit itself.
    refused = _error(bridge.run("tank-sizing", {"tank_volume": "300000"}, "us", examples=True),
                     "tank_volume")
    assert "264200 US gal" in refused
    taken = bridge.run("tank-sizing", {"tank_volume": "264200", "oil_volume": "100"}, "us",
                       examples=True)
    assert taken["ok"], taken


def test_foam_left_standing_cannot_exceed_the_foam_made():
    # ASTM D892: stability is the foam still standing 10 min after the blowing stopped.
    message = _error(bridge.run("foam-air-tests", {"seq1_tendency": "10", "seq1_stability": "500"},
                                examples=True), "seq1_stability")
    assert "cannot be more than the foam the blowing made" in message


def test_a_sensor_and_a_lab_that_disagree_are_named():
    # 5 ppm at 40 degC is about 1.5 % of saturation for a mineral oil (its saturation line,
    # from memory), not the 100 % the sensor says.
    answer = bridge.run("checklist-water", {"ppm": "5", "rh": "100", "temp": "40"}, examples=True)
    assert answer["ok"] and any("The two water readings disagree" in n for n in answer["notes"])
    agree = bridge.run("checklist-water", {"ppm": "100", "rh": "40", "temp": "40"}, examples=True)
    assert not any("disagree" in n for n in agree["notes"])


def test_an_oxidation_reserve_above_the_new_oils_is_refused():
    message = _error(bridge.run("oxidation-trend", {"new_value": "100", "reserve_before": "500",
                                                    "reserve_now": "400"}, examples=True),
                     "reserve_before")
    assert "an oxidation reserve only falls" in message


def test_more_particles_after_a_filter_than_before_is_named():
    answer = bridge.run("filter-beta", {"beta": "200", "upstream": "100", "downstream": "5000"},
                        examples=True)
    assert answer["ok"] and any("More particles after the filter" in n for n in answer["notes"])


def test_a_gauge_pressure_below_a_full_vacuum_is_refused():
    # A gauge pressure is at least minus one standard atmosphere, -1.01325 bar (ISO 2533).
    message = _error(bridge.run("unit-convert", {"from_unit": "bar", "to_unit": "psi",
                                                 "value": "-50"}), "value")
    assert "-1.013 bar" in message
    assert bridge.run("unit-convert", {"from_unit": "bar", "to_unit": "psi", "value": "-1"})["ok"]


@pytest.mark.parametrize("argv", [
    ["run", "tank-sizing", "--bogus", "--json"],
    ["run", "--json"],
    ["run", "tank-sizing", "--units", "imperial", "--json"],
    ["tools", "--json", "--units", "furlongs"],
])
def test_a_wrong_command_line_answers_in_json_under_json(argv, capsys):
    # Issue 14: a script reading --json output gets the error shape, never argparse's usage.
    assert main(argv) == 2
    out = json.loads(capsys.readouterr().out)
    assert out["ok"] is False and out["errors"][0]["field"] == "command line"
    assert out["errors"][0]["message"]


def test_a_wrong_command_line_without_json_prints_usage(capsys):
    assert main(["run", "tank-sizing", "--bogus"]) == 2
    err = capsys.readouterr().err
    assert err.startswith("usage:") and "--bogus" in err


def test_units_are_read_whatever_their_case(capsys):
    assert main(["run", "unit-convert", "from_unit=bar", "to_unit=psi", "value=1",
                 "--units", "US", "--json"]) == 0
    assert json.loads(capsys.readouterr().out)["ok"] is True
