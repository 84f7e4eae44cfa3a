"""What a form asks for: blank means not given, a mode's fields only in that mode, a notice
beside a value outside the range usual in hydraulic work, and numbers rounded for people.

The rules are declared once in calc.kernel.registry; these tests hold every tool to them.
"""

import re

import pytest

from calc import bridge
from calc.__main__ import main
from calc.kernel import registry, units

TOOLS = registry.tools()


def _errors(answer):
    return {e["field"]: e["message"] for e in answer.get("errors", [])}


def test_a_blank_reading_is_an_error_beside_it_never_a_hidden_default():
    # Clearing KV40 once computed with a 49.5 cSt nobody typed.
    typed = {"kv40_new": "46", "kv40_now": ""}
    answer = bridge.run("oil-condition", typed)
    assert not answer["ok"]
    assert _errors(answer)["kv40_now"] == "KV40 now is needed"


def test_a_blank_limit_takes_its_standard_value_which_the_form_shows():
    # The oil-condition watch limit for viscosity is 5 % (its declared standard value).
    typed = {"kv40_new": "46", "kv40_now": "49.5"}
    blank = bridge.run("oil-condition", {**typed, "visc_watch": ""})
    shown = bridge.run("oil-condition", {**typed, "visc_watch": "5"})
    assert blank["ok"] and blank == shown
    assert TOOLS["oil-condition"].field("visc_watch").group == "limits"


def test_examples_are_used_only_when_asked_and_each_is_named():
    asked = bridge.run("viscosity-at-temperature", {"temp": "60"}, examples=True)
    assert asked["ok"] and asked["text"]["kv"] == "20.6 cSt"
    named = {n["field"] for n in asked["notices"]}
    assert {"kv40", "kv100", "temp1", "temp2"} <= named and "temp" not in named
    assert "the example 46 cSt, not a reading" in next(
        n["message"] for n in asked["notices"] if n["field"] == "kv40")
    assert not bridge.run("viscosity-at-temperature", {"temp": "60"})["ok"]


def test_every_tool_refuses_an_empty_form_naming_each_reading():
    for tool_id, found in TOOLS.items():
        answer = bridge.run(tool_id, {})
        needed = [f.key for f in found.inputs if f.group != "limits" and not f.is_choice
                  and not f.is_flag and not f.optional and found.uses(f, found.default_modes())]
        if needed:
            assert not answer["ok"] and set(needed) <= set(_errors(answer)), tool_id
        else:
            assert answer["ok"], tool_id


@pytest.mark.parametrize("tool_id", sorted(t for t, f in TOOLS.items()
                                            if any(x.when for x in f.inputs)))
def test_an_input_the_chosen_mode_does_not_use_is_refused_naming_the_mode(tool_id):
    found = TOOLS[tool_id]
    unused = modes = None
    for mode_key in found.default_modes():  # a mode choice that leaves some field unused
        for value, _label in found.field(mode_key).choices:
            modes = {**found.default_modes(), mode_key: value}
            unused = next((f for f in found.inputs if f.when and not found.uses(f, modes)), None)
            if unused:
                break
        if unused:
            break
    mode = found.field(unused.when[0])
    typed = {unused.when[0]: modes[unused.when[0]],
             unused.key: "1" if unused.is_number else unused.choices[0][0]}
    answer = bridge.run(tool_id, typed, examples=True)
    assert not answer["ok"]
    message = _errors(answer)[unused.key]
    assert mode.label in message and mode.choice_label(unused.when[1][0]) in message


def test_an_input_given_without_its_mode_selects_the_one_mode_that_uses_it():
    # `water-in-oil ppm=100 temp=40` once answered for the sensor's 30 % and ignored the ppm.
    answer = bridge.run("water-in-oil", {"ppm": "100", "temp": "40"}, examples=True)
    assert answer["ok"]
    said = [n["message"] for n in answer["notices"] if n["field"] == "reading"]
    assert said == ["Reading from set to \u201cLab report: ppm (Karl Fischer)\u201d: the only "
                    "choice that uses ppm"]
    assert answer["values"]["ppm"] == pytest.approx(100.0)
    # Inputs of two modes at once choose neither: the mode stays at its default (the
    # sensor) and the lab's ppm is refused.
    both = bridge.run("water-in-oil", {"ppm": "100", "rh": "40", "temp": "40"}, examples=True)
    assert not both["ok"] and set(_errors(both)) == {"ppm"}


def test_the_cli_refuses_a_missing_reading_and_selects_the_mode_of_an_input(capsys):
    assert main(["run", "viscosity-at-temperature", "temp=60"]) == 2
    assert "kv40: Viscosity, reading 1 is needed" in capsys.readouterr().err
    assert main(["run", "water-in-oil", "ppm=100", "temp=40", "--example"]) == 0
    out = capsys.readouterr().out
    assert "check: Reading from set to" in out
    assert "check: Oil density: the example 870 kg/m³, not a reading" in out


def test_a_mistyped_value_computes_with_a_notice_beside_its_field():
    # 6846 cSt is a KV40 no hydraulic oil has (ISO 3448 ends at VG 3200; hydraulic grades
    # at VG 680, 748 cSt at most): the usual range is VG 10's floor to VG 680's ceiling.
    answer = bridge.run("oil-condition", {"kv40_new": "46", "kv40_now": "6846"})
    assert answer["ok"]
    notice = {n["field"]: n["message"] for n in answer["notices"]}["kv40_now"]
    assert notice == ("6850 cSt is above the usual range of KV40 now, 9 cSt to 750 cSt "
                      "(common practice): check the reading")
    quiet = bridge.run("oil-condition", {"kv40_new": "46", "kv40_now": "49"})
    assert quiet["notices"] == []


def test_notices_are_in_the_readers_units():
    answer = bridge.run("water-in-oil", {"reading": "rh", "rh": "30", "temp": "250",
                                         "temp_cold": "59", "oil_volume": "50",
                                         "density": "54.3"}, "us")
    assert answer["ok"]
    notice = {n["field"]: n["message"] for n in answer["notices"]}["temp"]
    assert "212.0 °F" in notice and "°C" not in notice


def test_every_number_field_has_a_usual_range_its_example_sits_in():
    for tool_id, found in TOOLS.items():
        for f in found.inputs:
            if not f.is_number:
                assert f.usual_range is None
                continue
            low, high = f.usual_range
            assert low <= high, (tool_id, f.key)
            if f.default is not None:
                assert low <= f.default <= high, (tool_id, f.key, f.default, f.usual_range)


def test_every_example_answer_is_free_of_range_notices():
    for tool_id in TOOLS:
        for system in units.SYSTEMS:
            answer = bridge.run(tool_id, {}, system, examples=True)
            assert answer["ok"], tool_id
            assert not [n for n in answer["notices"] if "usual range" in n["message"]], tool_id


SIG_FIGS = re.compile(r"^-?(\d+(?:\.\d+)?)")


def _significant(text):
    digits = SIG_FIGS.match(text).group(1).replace(".", "").lstrip("0")
    return len(digits.rstrip("0")) if "." not in text.split()[0] else len(digits)


def test_every_output_has_a_rounding_rule_for_people():
    # Each output's quantity declares significant figures, fixed decimals or a duration.
    for tool_id, found in TOOLS.items():
        for out in found.outputs:
            if out.quantity == "text":
                continue
            q = units.quantity(out.quantity)
            assert q.style in ("number", "duration"), (tool_id, out.key)
            shown = units.show(1234.5678, out.quantity, "metric")
            if q.style == "duration":
                assert re.fullmatch(r"\d+ (h|d)( \d+ (min|h))?", shown), shown
            elif q.decimals is not None:
                number = shown.split()[0]
                assert len(number.partition(".")[2]) == q.decimals, (tool_id, out.key, shown)
            else:
                assert _significant(shown) <= q.digits, (tool_id, out.key, shown)


@pytest.mark.parametrize(("minutes", "shown"), [
    (110.0, "1 h 50 min"),  # 1.833 h once
    (55.45, "55.5 min"),  # 0.9242 h once: a dwell time keeps three figures
    (4.96, "4.96 min"),
    (60.0, "1 h"),
    (3000.0, "2 d 2 h"),
])
def test_durations_read_as_people_say_them(minutes, shown):
    assert units.show(minutes, "minutes", "metric") == shown
    assert units.show(minutes / 60.0, "hours", "us") == shown


def test_a_vi_and_a_count_are_whole_numbers_and_no_trailing_zeros():
    assert units.show(95.0, "vi", "metric") == "95"
    assert units.show(40.0, "per_ml", "metric") == "40 /mL"
    assert units.show(1300.0, "per_ml", "metric") == "1300 /mL"


def test_two_tools_on_one_cold_start_each_say_which_governs_and_link_the_other():
    # The viscosity tool's start-up temperature is the pump's limit alone; the suction check
    # adds the line: each names the other, and the warmer governs.
    for one, other in (("viscosity-at-temperature", "suction-check"),
                       ("suction-check", "viscosity-at-temperature")):
        related = bridge.run(one, {}, examples=True)["related"]
        assert [r["tool"] for r in related] == [other]
        assert "the warmer of the two governs" in related[0]["why"]
        assert related[0]["title"] == TOOLS[other].title
    for found in TOOLS.values():
        assert all(other in TOOLS for other, _why in found.related), found.id


def test_a_tank_is_not_ok_and_act_at_once():
    # 400 L on 100 L/min is 4 min of flow (inside the 3 to 5 min rule of thumb, common
    # practice) while the oil stays 4 min against a 10 min air-release time: the dwell governs.
    answer = bridge.run("tank-sizing", {"tank_volume": "400", "oil_volume": "400",
                                        "pump_flow": "100", "air_release": "10"}, examples=True)
    levels = [v["level"] for v in answer["verdicts"]]
    assert "ok" not in levels and answer["level"] == "act"
    assert any("rule of thumb" in n and "governs" in n for n in answer["notes"])
    # With a short air-release time the rule of thumb and the dwell agree, and both say so.
    fine = bridge.run("tank-sizing", {"tank_volume": "400", "oil_volume": "400",
                                      "pump_flow": "100", "air_release": "3"}, examples=True)
    assert [v["level"] for v in fine["verdicts"]][:2] == ["ok", "ok"]
