"""The machine card: its fields validate like tool fields, every tool input that means a fact
of the machine binds to one card field with the same quantity, one key means one thing
across tools, and a tool run from a card gives the answer the same inputs typed give."""

from collections import defaultdict

import pytest

from calc import bridge
from calc.kernel import registry, units
from calc.kernel.errors import InputError
from calc.machines import card
from calc.machines.demo import plant

TOOLS = registry.tools()
BOUND = [(t.id, f) for t in TOOLS.values() for f in t.inputs if f.binds]
# Card fields no tool input takes: the machine's own description, the tank's levels (tools
# take the volumes that follow from them) and the service intervals (the machine page's).
CARD_ONLY = {"name", "site", "oil_name", "low_level", "sample_days", "filter_days",
             "filter_changed", "oil_days", "oil_changed", "notes"}
# Facts the card derives rather than holds as a field of its own.
DERIVED_ONLY = {"low_oil_volume"}


def test_card_fields_validate_like_tool_fields():
    # Range, named field, every bad field at once.
    with pytest.raises(InputError) as err:
        card.parse({"name": "Saw 2", "pump_flow": "-3", "vi": "x", "grade": "VG 47"})
    assert sorted(e.field for e in err.value.errors) == ["grade", "pump_flow", "vi"]
    # The name is the one field needed.
    with pytest.raises(InputError) as err:
        card.parse({"pump_flow": "60"})
    assert err.value.field == "name"
    # Not a card field: named too.
    with pytest.raises(InputError) as err:
        card.parse({"name": "Saw 2", "flow": "60"})
    assert err.value.field == "flow"


def test_card_takes_the_readers_units():
    # 10 US gal/min = 37.854 L/min; 212 degF = 100 degC; 1 in = 25.4 mm (NIST SP 811, B.9).
    typed = card.parse({"name": "Saw 2", "pump_flow": "10", "temp_running": "212",
                        "suction_bore": "1"}, "us")
    assert typed["pump_flow"] == pytest.approx(37.854118, rel=1e-6)
    assert typed["temp_running"] == pytest.approx(100.0)
    assert typed["suction_bore"] == pytest.approx(25.4)
    shown = card.shown(typed, "us")
    assert shown["pump_flow"] == "10" and shown["temp_running"] == "212"


def test_text_and_dates_are_checked():
    with pytest.raises(InputError) as err:
        card.parse({"name": "Saw 2", "filter_changed": "31/03/2026"})
    assert err.value.field == "filter_changed"
    with pytest.raises(InputError) as err:
        card.parse({"name": "x" * 81})
    assert err.value.field == "name"
    with pytest.raises(InputError) as err:
        card.parse({"name": "Saw\x002"})
    assert err.value.field == "name"
    assert card.parse({"name": "  Saw 2 ", "filter_changed": "2026-03-31"}) == {
        "name": "Saw 2", "filter_changed": "2026-03-31"}


def test_cross_checks_name_the_field():
    cases = [({"kv40_new": "46", "kv100_new": "50"}, "kv100_new"),
             ({"working_level": "300", "low_level": "400"}, "low_level"),
             ({"visc_start": "800", "visc_opt_high": "900"}, "visc_opt_high"),
             ({"temp_cold_start": "60", "temp_running": "40"}, "temp_cold_start"),
             ({"elbows_90": "1.5"}, "elbows_90"),
             ({"oil_family": "own", "cal_temp1": "20", "cal_ppm1": "100"}, "cal_temp2")]
    for typed, field in cases:
        with pytest.raises(InputError) as err:
            card.parse({"name": "Saw 2", **typed})
        assert field in [e.field for e in err.value.errors], typed


def test_facts_follow_from_the_card():
    # A 1000 x 500 x 600 mm tank holds 300 L full; at 480 mm, 240 L (by hand).
    found, derived = card.facts(card.parse({
        "name": "Saw 2", "tank_shape": "rectangular", "tank_length": "1000", "tank_width": "500",
        "tank_height": "600", "working_level": "480", "grade": "VG 46", "vi": "100",
        "component": "servo", "working_pressure": "160"}))
    assert found["tank_volume"] == pytest.approx(300.0)
    assert found["oil_volume"] == pytest.approx(240.0)
    # VG 46 mid-point 46 cSt (ISO 3448 Table 1); at VI 100 its KV100 is 6.8 cSt to the
    # table's 0.1 (ASTM D2270 Table 1 interpolated, as the viscosity-index tool does).
    assert found["kv40_new"] == 46.0 and found["kv100_new"] == pytest.approx(6.8, abs=0.05)
    assert {"tank_volume", "oil_volume", "kv40_new", "kv100_new", "target4"} <= set(derived)
    # Typed facts win over derived ones.
    typed = card.facts(card.parse({"name": "Saw 2", "grade": "VG 46", "kv40_new": "44.1"}))[0]
    assert typed["kv40_new"] == 44.1


def test_every_binding_names_a_card_field_of_the_same_quantity():
    for tool_id, f in BOUND:
        assert f.binds in card.FIELDS or f.binds in DERIVED_ONLY, (tool_id, f.key)
        assert f.quantity == card.quantity_of(f.binds), (tool_id, f.key, f.binds)


def test_a_bound_input_takes_every_value_the_card_allows():
    # A number the card allows must be one every bound input allows, and every choice the
    # card offers (but "not known") one the input offers: otherwise a card filled in with
    # care would be refused by a tool.
    narrow = {("foam-air-tests", "grade"), ("checklist-aeration", "grade")}  # presets only
    for tool_id, f in BOUND:
        if f.binds not in card.FIELDS:
            continue
        own = card.field(f.binds)
        if f.is_number:
            assert (f.min is None or (own.min is not None and own.min >= f.min)) and (
                f.max is None or (own.max is not None and own.max <= f.max)), (tool_id, f.key)
        elif f.is_choice and (tool_id, f.key) not in narrow:
            offered = {c[0] for c in own.choices} - {card.UNKNOWN}
            assert offered <= {c[0] for c in f.choices}, (tool_id, f.key)


def test_one_key_one_meaning_across_tools():
    seen = defaultdict(set)
    for found in TOOLS.values():
        for f in found.inputs:
            seen[f.key].add((f.quantity, f.binds))
    clashes = {key: meanings for key, meanings in seen.items() if len(meanings) > 1}
    assert not clashes, clashes


def test_a_key_named_like_a_card_field_binds_that_field():
    for found in TOOLS.values():
        for f in found.inputs:
            if f.key in card.FIELDS:
                assert f.binds == f.key, (found.id, f.key)


def test_every_card_field_is_used():
    bound = {f.binds for _tool_id, f in BOUND}
    assert set(card.FIELDS) - bound == CARD_ONLY


def test_old_keys_keep_working_or_name_the_new_one():
    # Renamed: the old key still works and gives the same answer.
    assert bridge.run("tank-sizing", {"flow": "50"}, examples=True) == bridge.run("tank-sizing",
                                                                   {"pump_flow": "50"}, examples=True)
    both = bridge.run("tank-sizing", {"flow": "50", "pump_flow": "60"}, examples=True)
    assert not both["ok"] and "pump_flow" in both["errors"][0]["message"]
    # Retired with a new meaning: refused, naming what to give instead.
    gone = bridge.run("tank-sizing", {"working_level": "80"}, examples=True)
    assert not gone["ok"] and "oil_volume" in gone["errors"][0]["message"]
    for found in TOOLS.values():
        for old, new in found.renamed:
            assert new in {f.key for f in found.inputs} and old not in {f.key for f in found.inputs}


def _press():
    return plant(__import__("datetime").date(2026, 12, 2))["machines"][0]


def _typed(found, facts, system):
    """Every bound input the card knows that the tool's default mode uses, typed out in
    `system` as a technician would (the card fills only the inputs the mode uses)."""
    typed = {}
    for f in found.inputs:
        fact = facts.get(f.binds) if f.binds else None
        if fact is None or not found.uses(f, found.default_modes()):
            continue
        if f.is_flag:
            typed[f.key] = "yes" if fact else "no"
        elif f.is_number:
            typed[f.key] = repr(units.from_metric(fact, f.quantity, system))
        else:
            typed[f.key] = fact
    return typed


def _without_card_marks(answer):
    return {k: v for k, v in answer.items() if k not in ("from_card", "inputs")}


@pytest.mark.parametrize("system", ["metric", "us"])
@pytest.mark.parametrize("tool_id", sorted({t for t, _f in BOUND}))
def test_card_and_one_override_equals_all_typed(tool_id, system):
    machine = _press()
    found = TOOLS[tool_id]
    facts = card.facts(machine["card"])[0]
    typed = _typed(found, facts, system)
    # The override: the first bound input the card gives, set to the tool's own default.
    override = next((f for f in found.inputs if f.key in typed and f.default is not None
                     and not f.is_flag), None)
    changed = {}
    if override is not None:
        changed[override.key] = (repr(units.from_metric(override.default, override.quantity,
                                                        system))
                                 if override.is_number else override.default)
    with_card = bridge.run_for_machine(tool_id, changed, system, machine, examples=True)
    all_typed = bridge.run(tool_id, {**typed, **changed}, system, examples=True)
    assert with_card["ok"] == all_typed["ok"]
    if with_card["ok"]:
        assert _without_card_marks(with_card) == all_typed
        assert set(with_card["from_card"]) == set(typed) - set(changed)
    else:  # refused alike, field for field and word for word
        assert with_card["errors"] == all_typed["errors"]


def test_a_card_value_a_tool_cannot_take_is_refused_naming_the_card():
    # VG 680 has no foam-test preset (ISO 11158 / DIN 51524 list VG 10 to VG 100, from
    # memory): the tool must not quietly use its own VG 46 instead.
    machine = {"id": "m1", "card": card.parse({"name": "Gearbox rig", "grade": "VG 680"})}
    answer = bridge.run_for_machine("foam-air-tests", {"air_release": "20"}, "metric", machine, examples=True)
    assert not answer["ok"] and answer["errors"][0]["field"] == "grade"
    assert "machine card" in answer["errors"][0]["message"]
    # Typed for this reading, it runs.
    assert bridge.run_for_machine("foam-air-tests", {"grade": "VG 68", "air_release": "20"},
                                  "metric", machine, examples=True)["ok"]


def test_without_a_machine_every_tool_works_as_before():
    for tool_id in TOOLS:
        assert bridge.run_for_machine(tool_id, {}, "metric", {"id": "m", "card": {"name": "A"}}, examples=True
                                      ) == {**bridge.run(tool_id, {}, examples=True), "from_card": [],
                                            "inputs": TOOLS[tool_id].parse({}, examples=True)}
