"""Ranking rules of the water, overheating, contamination, spongy and noisy-pump checklists.

Thresholds are the modules' own, each marked there: common practice, from memory.
"""

import pytest

from calc import bridge
from calc.troubleshoot_contamination import checklist_contamination, steps_over, target_code
from calc.troubleshoot_noisy_pump import checklist_noisy_pump
from calc.troubleshoot_overheating import checklist_overheating
from calc.troubleshoot_spongy import checklist_spongy
from calc.troubleshoot_water import checklist_water


def _order(result):
    return [c.key for c in result.ranked]


def _reasons(result, key):
    show = lambda v, q: f"{v:g} {q}"  # noqa: E731
    return [r.render(show) for c in result.ranked if c.key == key for r in c.reasons]


# Water

def test_idle_cooling_and_rust_point_to_condensation():
    result = checklist_water(cools_overnight=True, rust_top=True, temp=30.0)
    assert _order(result)[0] == "condensation"
    assert result.ranked[0].score == 6.0  # STRONG 3 + MODERATE 2 + WEAK 1 (oil below 40 degC)


def test_a_lot_of_water_with_a_water_cooler_points_to_the_cooler():
    result = checklist_water(free_water=True, water_cooler=True, ppm=2500.0)
    assert _order(result)[0] == "cooler-leak"
    assert "water content 2500 ppm, more than 1000 ppm: water coming in in quantity" in \
        _reasons(result, "cooler-leak")
    assert result.level == "act"  # 2500 ppm above the 500 ppm act line (common practice)


def test_milky_oil_that_will_not_settle_points_to_an_emulsion():
    result = checklist_water(milky_oil=True, after_topup=True)
    assert _order(result)[:2] == ["wet-topup", "emulsion"]


@pytest.mark.parametrize("rh, level", [(50.0, "ok"), (85.0, "watch"), (100.0, "act")])
def test_sensor_saturation_sets_the_level(rh, level):
    # 80 % watch, 100 % free water (common practice, from memory).
    assert checklist_water(rh=rh).level == level


@pytest.mark.parametrize("ppm, level", [(150.0, "ok"), (300.0, "watch"), (600.0, "act")])
def test_water_content_sets_the_level(ppm, level):
    # 200 ppm watch, 500 ppm act (common practice, from memory).
    assert checklist_water(ppm=ppm).verdicts[-1].level == level


# Overheating

def test_relief_running_hot_outranks_the_rest():
    result = checklist_overheating(relief_hot=True, hot_when_idle=True, temp=75.0)
    assert _order(result)[0] == "relief-blowing"
    assert result.ranked[0].score == 6.0


def test_cooler_that_barely_cools_hot_oil():
    # 68 in, 67 out: 1 K off oil at 68 degC, under the 3 K a working cooler takes (from memory).
    result = checklist_overheating(temp=68.0, cooler_in=68.0, cooler_out=67.0)
    assert _order(result)[0] == "cooler"
    assert "the cooler takes only 1 temperature_difference off oil at 68 temperature" in \
        _reasons(result, "cooler")


def test_working_cooler_and_hot_room_point_to_the_surroundings():
    result = checklist_overheating(temp=62.0, cooler_in=62.0, cooler_out=55.0, ambient=45.0)
    assert _order(result)[0] == "hot-surroundings"
    assert _order(result)[-1] == "cooler"  # 7 K drop: AGAINST


def test_cooler_out_warmer_than_in_is_refused():
    answer = bridge.run("checklist-overheating", {"cooler_in": 50, "cooler_out": 60})
    assert not answer["ok"] and answer["errors"][0]["field"] == "cooler_out"


@pytest.mark.parametrize("temp, level", [(50.0, "ok"), (70.0, "watch"), (90.0, "act")])
def test_oil_temperature_verdict(temp, level):
    # 60 / 80 degC lines, common practice from memory.
    levels = [v.level for v in checklist_overheating(temp=temp).verdicts]
    assert levels[-1] == level


# Contamination

def test_iso_4406_steps_double_the_count():
    # ISO 4406: each scale number doubles the count, so the step difference is the exponent.
    assert steps_over((20, 18, 13), target_code("piston")) == 2
    assert steps_over((16, 14, 11), target_code("general")) == -3


def test_code_over_target_with_a_blocked_filter():
    result = checklist_contamination(filter_indicator=True, component="piston",
                                     code_4=22.0, code_6=20.0, code_14=16.0)
    assert _order(result)[0] == "filter-bypass"
    assert "code 22/20/16 is 4 count steps over the target 18/16/13" in \
        _reasons(result, "filter-bypass")
    assert result.values["steps_over"] == 4.0 and result.level == "act"


def test_metal_on_the_filter_points_to_wear():
    result = checklist_contamination(metal_seen=True, pump_louder=True)
    assert _order(result)[0] == "wear-debris"


def test_half_a_code_and_rising_code_are_refused():
    assert bridge.run("checklist-contamination", {"code_4": 18})["errors"][0]["field"] == "code_6"
    answer = bridge.run("checklist-contamination", {"code_4": 14, "code_6": 16, "code_14": 13})
    assert answer["errors"][0]["field"] == "code_6"


# Spongy

def test_air_content_and_foam_point_to_entrained_air():
    result = checklist_spongy(foam_or_cloudy=True, air_content=2.0)
    assert _order(result)[0] == "entrained-air"
    assert result.ranked[0].score == 6.0


def test_drift_under_load_points_to_leakage():
    result = checklist_spongy(drifts=True, slow_under_load=True, temp=45.0)
    assert _order(result)[0] == "internal-leakage"
    assert [c.score for c in result.ranked if c.key == "cold-oil"] == [-2.0]


def test_after_repair_points_to_trapped_air():
    assert _order(checklist_spongy(after_repair=True, jerky_slow=True))[0] == "trapped-air"


# Noisy pump

def test_low_inlet_pressure_puts_cavitation_first():
    # 0.6 bar absolute against the 0.8 bar preset (common practice, from memory).
    result = checklist_noisy_pump(whine=True, inlet_pressure=0.6)
    assert _order(result)[0] == "cavitation"
    assert "inlet pressure 0.6 pressure absolute, below the pump's 0.8 pressure" in \
        _reasons(result, "cavitation")
    assert result.level == "act"


def test_good_inlet_and_foam_put_air_first():
    result = checklist_noisy_pump(rattle=True, foam=True, inlet_pressure=0.95,
                                  pump_min_inlet=0.8)
    assert _order(result)[0] == "air-in-oil"


def test_vibration_after_pump_change_points_to_the_coupling():
    result = checklist_noisy_pump(vibration=True, after_pump_work=True)
    assert _order(result)[0] == "coupling"
