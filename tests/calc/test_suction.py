"""Pump inlet pressure warm and cold, and the starving temperature (calc.suction)."""

import math

import pytest

from calc.kernel.errors import InputError
from calc.methods.lines import line_velocity
from calc.kernel.constants import STANDARD_GRAVITY as G
from calc.methods.suction import (inlet_pressure_bar, static_head_bar, starving_temperature,
                                  strainer_drop_bar)
from calc.tools.suction import suction_check
from calc.methods.viscosity import walther_fit, walther_viscosity

DEFAULTS = dict(pump_flow=100.0, suction_bore=50.0, suction_length=1.5, roughness=0.045,
                suction_head=0.3, entry="sharp",
                elbows_90=2.0, bends_90=0.0, elbows_45=0.0, tees=0.0, suction_valve="none",
                strainer=0.05, strainer_model="viscous", bypass="no", bypass_opens=0.2,
                kv40=46.0, kv100=6.8, density=870.0, temp_running=50.0, temp_cold=0.0,
                atmosphere=1.013,
                pump_min_inlet=0.8)


def run(**changes):
    return suction_check(**{**DEFAULTS, **changes})


def test_static_head_by_hand():
    # By hand: 870 kg/m3 * 9.80665 m/s2 * 2 m = 17 063.6 Pa = 0.170636 bar.
    assert static_head_bar(870.0, 2.0) == pytest.approx(0.170636, abs=1e-6)
    assert G == 9.80665  # standard gravity, CGPM 1901


def test_laminar_inlet_pressure_by_hand():
    # By hand (Hagen-Poiseuille, f = 64/Re, no fittings): 60 L/min in 40 mm -> v = 0.795775 m/s;
    # 100 cSt -> Re = 318.31, f = 0.201062; rho v^2/2 = 275.47 Pa (rho 870); the laminar
    # kinetic-energy factor is 2 (parabolic profile), so the losses are
    # (2 + f * 2 / 0.04) * 275.467 = 12.0531 * 275.467 = 3320.22 Pa; head -0.5 m = -4265.89 Pa.
    # p = 101 300 - 4265.89 - 3320.22 = 93 713.89 Pa = 0.937139 bar.
    p = inlet_pressure_bar(1.013, -0.5, 870.0, 60.0, 40.0, 2.0, 0.0, (), 100.0, 0.0)
    assert p == pytest.approx(0.937139, abs=2e-6)


def test_viscosity_comes_from_calc_viscosity():
    # The tool must use ASTM D341 from calc.methods.viscosity, not a copy of its own.
    result = run(kv40=68.0, kv100=8.7, temp_running=55.0, temp_cold=-5.0)
    a, b = walther_fit(40.0, 68.0, 100.0, 8.7)
    assert result.values["kv"] == walther_viscosity(55.0, a, b)
    assert result.values["kv_cold"] == walther_viscosity(-5.0, a, b)


def test_starving_temperature_gives_the_minimum_inlet_pressure():
    # Definition: at t_starve the inlet pressure equals the pump's minimum (to 1e-3 bar).
    for changes in ({}, {"suction_head": -0.8, "suction_bore": 38.0, "suction_length": 3.0},
                    {"strainer": 0.0},
                    {"strainer_model": "constant", "elbows_90": 5.0, "suction_valve": "butterfly",
                     "pump_flow": 180.0},
                    {"pump_min_inlet": 0.9, "kv40": 100.0, "kv100": 11.0}):
        result = run(**changes)
        t = result.values["t_starve"]
        assert t is not None, changes
        at_t = run(**changes, temp_cold=t)
        assert at_t.values["p_inlet_cold"] == pytest.approx(changes.get("pump_min_inlet", 0.8), abs=1e-3)


def test_colder_is_worse():
    # Physics: thicker oil, more loss; monotone over a laminar cold range.
    # A column that breaks (no pressure shown) is the worst of all.
    pressures = [run(temp_cold=t).values["p_inlet_cold"] for t in (-30, -20, -10, 0, 10, 20, 30, 40)]
    ranked = [-math.inf if p is None else p for p in pressures]
    assert ranked == sorted(ranked) and None in pressures and pressures[-1] is not None


def test_starving_verdict_and_the_fixes():
    result = run(temp_cold=10.0)
    assert result.values["margin_cold"] < 0 < result.values["margin"]
    assert result.level == "act"
    message = result.verdicts[-1].message.template
    assert "warmer than" in message and "flooded inlet" in message


def test_even_warm_starving_has_no_starving_temperature():
    result = run(suction_head=-3.0)
    assert result.values["margin"] < 0
    assert result.values["t_starve"] is None
    assert result.verdicts[0].level == "act"


def test_no_starving_in_range_with_a_big_flooded_line():
    result = run(suction_bore=100.0, suction_head=3.0, strainer=0.0, suction_length=0.5,
                 elbows_90=0.0, entry="rounded")
    assert result.values["t_starve"] is None
    assert result.level == "ok"


def test_strainer_models():
    # Viscous model: laminar flow through a mesh, drop in proportion to viscosity (an assumption).
    assert strainer_drop_bar(0.05, 230.0, 23.0, "viscous") == pytest.approx(0.5)
    assert strainer_drop_bar(0.05, 230.0, 23.0, "constant") == 0.05
    assert strainer_drop_bar(0.05, 230.0, 23.0, "viscous", 0.25) == 0.25
    bypassed = run(bypass="yes", bypass_opens=0.2, temp_cold=15.0)
    assert bypassed.values["strainer_cold"] == 0.2
    assert bypassed.values["p_inlet_cold"] > run(temp_cold=15.0).values["p_inlet_cold"]


def test_starving_temperature_search_by_bisection():
    # A straight line crosses 0.8 at exactly 12.5 degC.
    assert starving_temperature(lambda t: 0.7 + 0.008 * t, 0.8, 60.0) == pytest.approx(12.5, abs=1e-5)
    assert starving_temperature(lambda t: 0.7, 0.8, 60.0) is None
    assert starving_temperature(lambda t: 0.9, 0.8, 60.0) is None


def test_velocity_reported_matches_line_velocity():
    assert run().values["velocity"] == line_velocity(100.0, 50.0)


@pytest.mark.parametrize("changes, field", [({"temp_cold": 60.0}, "temp_cold"),
                                            ({"kv100": 50.0}, "kv100"),
                                            ({"roughness": 3.0, "suction_bore": 20.0}, "roughness")])
def test_bad_combinations_name_the_field(changes, field):
    with pytest.raises(InputError) as err:
        run(**changes)
    assert err.value.field == field
