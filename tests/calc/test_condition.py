"""Oil condition against watch / act limits: each boundary and the worst-level verdict."""

import pytest

from calc import bridge
from calc.kernel.grading import pick
from calc.methods.condition import viscosity_change_pct
from calc.tools.condition import RESERVE_BANDS, VISCOSITY_UP_BANDS, oil_condition
from calc.kernel.errors import InputError


def _check(**kw):
    args = dict(kv40_new=46.0, kv40_now=46.0)
    args.update(kw)
    return oil_condition(**args)


def _level_of(result, word):
    found = [v.level for v in result.verdicts if word in v.message.template]
    assert len(found) == 1, result.verdicts
    return found[0]


def test_viscosity_change_definition():
    # Change vs new oil, (now - new) / new; ISO 3448 grades are +-10 % of mid-point.
    assert viscosity_change_pct(50.6, 46.0) == pytest.approx(10.0)
    assert viscosity_change_pct(43.7, 46.0) == pytest.approx(-5.0)


@pytest.mark.parametrize("kv40, level", [
    # Common practice: 5 % watch, 10 % act, either direction; reaching a limit counts.
    (48.2, "ok"), (48.3, "watch"), (43.7, "watch"), (50.5, "watch"), (50.6, "act"),
    (41.4, "act"), (41.5, "watch"),
])
def test_viscosity_boundaries(kv40, level):
    assert _level_of(_check(kv40_now=kv40), "Viscosity") == level


@pytest.mark.parametrize("an_now, level", [
    # Acid number rise over new: 0.3 watch, 0.5 act (common practice, from memory).
    (0.59, "ok"), (0.6, "watch"), (0.79, "watch"), (0.8, "act"), (1.5, "act"),
])
def test_acid_number_boundaries(an_now, level):
    assert _level_of(_check(an_new=0.3, an_now=an_now), "Acid number") == level


@pytest.mark.parametrize("ppm, level", [
    # Water: 200 ppm watch, 500 ppm act (common practice).
    (199.0, "ok"), (200.0, "watch"), (499.0, "watch"), (500.0, "act"),
])
def test_water_boundaries(ppm, level):
    assert _level_of(_check(ppm=ppm), "Water") == level


@pytest.mark.parametrize("reserve, level", [
    # Oxidation reserve, % of new: 50 watch (common practice), 25 act (ASTM D4378
    # guidance, from memory); reaching a level counts.
    (50.1, "ok"), (50.0, "watch"), (25.1, "watch"), (25.0, "act"),
])
def test_reserve_boundaries(reserve, level):
    assert _level_of(_check(reserve=reserve), "Oxidation reserve") == level


@pytest.mark.parametrize("code, level", [
    # Common practice: at or under target ok, one code over watch, two or more act.
    ((18.0, 16.0, 13.0), "ok"), ((17.0, 15.0, 12.0), "ok"), ((19.0, 16.0, 13.0), "watch"),
    ((18.0, 16.0, 15.0), "act"), ((None, 17.0, 13.0), "watch"),
])
def test_cleanliness_against_target(code, level):
    c4, c6, c14 = code
    result = _check(code4=c4, code6=c6, code14=c14, target4=18.0, target6=16.0, target14=13.0)
    assert _level_of(result, "Cleanliness") == level


def test_worst_level_wins_and_comes_first():
    result = _check(kv40_now=48.3, ppm=100.0, reserve=20.0, an_new=0.3, an_now=0.4)
    assert result.values["level"] == "act" == result.level
    assert [v.level for v in result.verdicts] == ["act", "watch", "ok", "ok"]
    assert result.values["findings"] == "2"
    assert _check().values["level"] == "ok"


def test_edited_limits_are_used():
    assert _level_of(_check(ppm=300.0, water_watch=400.0, water_act=800.0), "Water") == "ok"
    with pytest.raises(InputError) as err:
        _check(water_watch=500.0, water_act=500.0)
    assert err.value.field == "water_watch"
    with pytest.raises(InputError) as err:
        _check(reserve_watch=20.0, reserve_act=25.0)
    assert err.value.field == "reserve_watch"


def test_half_pairs_are_refused_naming_the_missing_field():
    with pytest.raises(InputError) as err:
        _check(an_now=0.6)
    assert err.value.field == "an_new"
    with pytest.raises(InputError) as err:
        _check(code6=16.0, code14=13.0)
    assert err.value.field == "target6"
    # The facts alone (a machine card fills them in every reading) are no reading: accepted,
    # and nothing is graded for them.
    alone = _check(an_new=0.4, target4=18.0, target6=16.0, target14=13.0)
    assert alone.values["an_rise"] is None and alone.values["excess"] is None


def test_bridge_with_a_lab_report():
    answer = bridge.run("oil-condition", {"kv40_new": 46, "kv40_now": "44,1", "ppm": 650,
                                          "code4": 20, "code6": 18, "code14": 15,
                                          "target4": 18, "target6": 16, "target14": 13}, examples=True)
    assert answer["ok"] and answer["level"] == "act"
    assert answer["verdicts"][0]["level"] == "act"


def test_band_boundaries_reaching_a_limit_counts():
    rising = lambda v: pick(v, VISCOSITY_UP_BANDS, {"watch": 5.0, "act": 10.0}).level  # noqa: E731
    falling = lambda v: pick(v, RESERVE_BANDS, {"watch": 50.0, "act": 25.0}).level  # noqa: E731
    assert rising(10.0) == "act" and rising(4.999) == "ok"
    assert falling(25.0) == "act" and falling(50.0001) == "ok"


def test_water_is_read_against_saturation_when_the_oil_and_temperature_are_known():
    # The review's case: 450 ppm is over the 200 ppm watch limit, and the same additive mineral
    # oil holds only about 338 ppm dissolved at 40 degC (the water-in-oil tool's preset, from
    # memory): 133 % of saturation, free water, act.
    answer = bridge.run("oil-condition", {"ppm": 450, "temp": 40, "oil": "mineral-aw"}, examples=True)
    water = bridge.run("water-in-oil", {"reading": "ppm", "ppm": 450, "temp": 40}, examples=True)
    assert answer["values"]["water_saturation"] == pytest.approx(
        450.0 / water["values"]["sat"] * 100.0, rel=1e-12)
    assert answer["level"] == "act"
    alone = bridge.run("oil-condition", {"ppm": 450}, examples=True)
    assert alone["values"]["water_saturation"] is None
    assert any("saturation" in n for n in alone["notes"])
