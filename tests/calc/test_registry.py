"""Contracts every tool keeps, enumerated from the registry."""

import json

import pytest

from calc import bridge
from calc.kernel import registry, units
from calc.kernel.errors import InputError
from .cases import all_finite

TOOLS = registry.tools()



@pytest.mark.parametrize("tool_id", sorted(TOOLS))
def test_defaults_compute(tool_id):
    answer = bridge.run(tool_id, {}, examples=True)
    assert answer["ok"], answer
    assert answer["values"], "a tool must compute something from its defaults"
    assert all_finite(answer)
    for v in answer["verdicts"]:
        assert v["level"] in ("ok", "watch", "act") and v["message"] and v["basis"]
    assert answer["sources"], "every tool names its sources"


@pytest.mark.parametrize("tool_id", sorted(TOOLS))
def test_declaration_is_complete(tool_id):
    found = TOOLS[tool_id]
    assert found.title and found.summary and found.topic
    for f in found.inputs:
        assert f.label
        if f.is_flag:
            assert f.default in (None, False, True)
        elif f.is_choice:
            assert f.choices and (f.default in [c[0] for c in f.choices])
        else:
            units.quantity(f.quantity)  # a known quantity
            if f.default is not None:
                f.check_range(float(f.default), "metric")
    for o in found.outputs:
        units.quantity(o.quantity)


@pytest.mark.parametrize("tool_id", sorted(TOOLS))
def test_text_in_a_number_field_names_the_field(tool_id):
    numeric = [f for f in TOOLS[tool_id].inputs if not f.is_choice]
    if not numeric:
        pytest.skip("no numeric input")
    answer = bridge.run(tool_id, {numeric[0].key: "lots"}, examples=True)
    assert not answer["ok"]
    assert answer["errors"][0]["field"] == numeric[0].key


@pytest.mark.parametrize("tool_id", sorted(TOOLS))
def test_us_units_round_trip(tool_id):
    # Defaults typed in US units come back to the same metric answer (the fields the
    # default modes use: one the mode does not use is refused).
    found = TOOLS[tool_id]
    typed = {f.key: units.from_metric(f.default, f.quantity, "us")
             for f in found.inputs if not f.is_choice and f.default is not None
             and found.uses(f, found.default_modes())}
    metric, us = bridge.run(tool_id, {}, examples=True), bridge.run(tool_id, typed, "us", examples=True)
    assert us["ok"], us
    for o in found.outputs:
        if isinstance(metric["values"].get(o.key), float):
            back = units.to_metric(us["values"][o.key], o.quantity, "us")
            assert back == pytest.approx(metric["values"][o.key], rel=1e-6, abs=1e-9)


def test_unknown_tool_and_unknown_input_are_errors():
    assert bridge.run("no-such-tool", {}, examples=True)["errors"][0]["field"] == "tool"
    first = sorted(TOOLS)[0]
    assert bridge.run(first, {"bogus": 1}, examples=True)["errors"][0]["field"] == "bogus"


def test_run_json_survives_garbage():
    for request in ("", "[]", "{", '{"tool": 5}', '{"tool": "viscosity-at-temperature", "inputs": 3}'):
        answer = json.loads(bridge.run_json(request))
        assert "ok" in answer


@pytest.mark.parametrize("typed, expected", [("46.5", 46.5), ("46,5", 46.5), (" 1 200 ", 1200.0),
                                             ("1,200.5", 1200.5), ("1.200,5", 1200.5),
                                             ("\u22125", -5.0), (7, 7.0)])
def test_typed_numbers(typed, expected):
    assert units.parse_number(typed, "x") == expected


@pytest.mark.parametrize("typed", ["", "abc", "nan", "inf", "1e999", True, "4..5"])
def test_bad_numbers_name_the_field(typed):
    with pytest.raises(InputError) as err:
        units.parse_number(typed, "kv40")
    assert err.value.field == "kv40"


def test_unit_conversions_are_exact_inverses():
    # NIST SP 811 factors: 1 psi = 0.0689476 bar, 1 US gal = 3.785411784 L.
    assert units.from_metric(1.0, "pressure", "us") == pytest.approx(14.5038, rel=1e-5)
    assert units.to_metric(1.0, "volume", "us") == pytest.approx(3.785411784)
    assert units.to_metric(212.0, "temperature", "us") == pytest.approx(100.0)
    for name in units.QUANTITIES:
        assert units.to_metric(units.from_metric(12.5, name, "us"), name, "us") == pytest.approx(12.5)
