"""Barus relation and the viscosity-pressure tool."""

import math

import pytest

from calc import bridge
from calc.kernel.errors import InputError
from calc.methods.pressure import barus_alpha, barus_factor
from calc.tools.pressure import viscosity_pressure

ATM_IN_BAR = 1.01325  # exact by definition, NIST SP 811
FITTED = dict(kv=46.0, pressure=700.0 * ATM_IN_BAR, alpha_from="fitted", alpha=2.0e-3,
              p1=350.0 * ATM_IN_BAR, reading1=8.0, p2=700.0 * ATM_IN_BAR, reading2=14.0)


def test_falling_ball_times_predict_their_own_ratio():
    # A fact of the trade (no source): falling-ball times of 8 s at 350 atm and 14 s at 700 atm,
    # time of fall proportional to viscosity, so viscosity rose by 14/8 = 1.75 when the pressure
    # doubled. The exponent fitted from those readings must predict 1.75 back.
    alpha = barus_alpha(350.0 * ATM_IN_BAR, 8.0, 700.0 * ATM_IN_BAR, 14.0)
    assert barus_factor(alpha, 350.0 * ATM_IN_BAR) == pytest.approx(1.75, rel=1e-12)
    # ln(1.75) / (350 atm) = 1.5789e-3 1/bar, inside the mineral-oil range (from memory).
    assert alpha == pytest.approx(math.log(1.75) / 354.6375, rel=1e-12)


def test_tool_fitted_from_readings_scales_the_viscosity():
    result = viscosity_pressure(**FITTED)
    # From 0 to 700 atm at the fitted alpha: exp(2 ln 1.75) = 1.75^2 (Barus is exponential).
    assert result.values["factor"] == pytest.approx(1.75 ** 2, rel=1e-12)
    assert result.values["kv_p"] == pytest.approx(46.0 * 1.75 ** 2, rel=1e-12)
    assert result.level == "ok"
    assert any("injection" in n.template for n in result.notes)


def test_readings_in_either_order_give_the_same_coefficient():
    swapped = {**FITTED, "p1": FITTED["p2"], "reading1": 14.0, "p2": FITTED["p1"], "reading2": 8.0}
    assert viscosity_pressure(**swapped).values["alpha_used"] == pytest.approx(
        viscosity_pressure(**FITTED).values["alpha_used"], rel=1e-12)


def test_no_rise_at_atmospheric_pressure():
    # Barus at p = 0 (gauge): exp(0) = 1.
    result = viscosity_pressure(**{**FITTED, "alpha_from": "entered", "pressure": 0.0})
    assert result.values["kv_p"] == 46.0


def test_entered_coefficient_outside_mineral_range_is_flagged():
    # Mineral oils about 1.5e-3 to 2.5e-3 1/bar (from memory).
    result = viscosity_pressure(**{**FITTED, "alpha_from": "entered", "alpha": 0.8e-3})
    assert result.level == "watch"


def test_very_high_pressure_warns_that_barus_overestimates():
    # Barus overestimates above a few thousand bar (from memory); the tool flags above 3000 bar.
    result = viscosity_pressure(**{**FITTED, "alpha_from": "entered", "pressure": 5000.0})
    assert result.level == "watch"
    assert any("upper bound" in v.message.template for v in result.verdicts)


def test_reading_that_falls_with_pressure_is_refused():
    with pytest.raises(InputError) as err:
        viscosity_pressure(**{**FITTED, "reading2": 6.0})
    assert err.value.field == "reading2"


def test_readings_at_one_pressure_are_refused():
    with pytest.raises(InputError) as err:
        viscosity_pressure(**{**FITTED, "p2": FITTED["p1"] + 0.5})
    assert err.value.field == "p2"


def test_implausibly_steep_rise_is_refused():
    with pytest.raises(InputError) as err:
        viscosity_pressure(**{**FITTED, "p2": FITTED["p1"] + 10.0, "reading2": 1000.0})
    assert err.value.field == "reading2"


def test_bridge_us_units_coefficient_per_psi():
    metric = bridge.run("viscosity-pressure", {}, examples=True)
    assert metric["units"]["alpha_used"] == "1/bar"
    us = bridge.run("viscosity-pressure", {"pressure": 250.0 / 0.0689475729,
                                           "alpha": 2.0e-3 * 0.0689475729}, "us", examples=True)
    assert us["values"]["kv_p"] == pytest.approx(metric["values"]["kv_p"], rel=1e-9)
    assert us["units"]["alpha_used"] == "1/psi"
