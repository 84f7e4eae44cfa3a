"""Line velocity, bore for a velocity, hose sizes and Darcy friction (calc.lines)."""

import math

import pytest

from calc import bridge
from calc.methods.lines import (HOSE_SIZES, bore_for_velocity, colebrook_friction,
                               darcy_drop_bar, friction_factor, line_velocity, next_hose_size,
                               reynolds_number)
from calc.tools.lines import velocity_in_line, velocity_range


def test_hand_checked_velocity():
    # By formula, by hand: 100 L/min = 1.6667e-3 m3/s; pi/4 * 0.025^2 = 4.9087e-4 m2 -> 3.395 m/s.
    assert line_velocity(100.0, 25.0) == pytest.approx(3.3953, abs=1e-4)


def test_hand_checked_velocity_in_a_one_inch_hose():
    # By hand: 40 US gpm = 151.416 L/min in a 1 in (25.4 mm) bore -> 4.980 m/s (16.34 ft/s).
    assert line_velocity(40 * 3.785411784, 25.4) == pytest.approx(4.980, abs=1e-3)


@pytest.mark.parametrize("flow, bore", [(1.0, 4.0), (100.0, 25.0), (450.0, 63.5), (5000.0, 300.0)])
def test_velocity_and_bore_are_inverses(flow, bore):
    # Continuity Q = v A both ways.
    assert bore_for_velocity(flow, line_velocity(flow, bore)) == pytest.approx(bore, rel=1e-12)


def test_hose_sizes_are_sixteenths_of_an_inch():
    # SAE J517 dash numbering: nominal bore = dash / 16 in; -16 is 1 in = 25.4 mm.
    assert dict((d, b) for d, b, _ in HOSE_SIZES)[16] == pytest.approx(25.4)
    assert next_hose_size(19.05) == (12, pytest.approx(19.05), 19)
    assert next_hose_size(19.1)[0] == 16
    assert next_hose_size(80.0) is None


def test_ranges_follow_line_type_and_pressure():
    # Common practice ranges (from memory of typical design tables).
    assert velocity_range("suction") == (0.6, 1.2)
    assert velocity_range("return") == (2.0, 4.0)
    tops = [velocity_range("pressure", p)[1] for p in (10.0, 50.0, 100.0, 200.0, 350.0)]
    assert tops == sorted(tops) and tops[0] < tops[-1]


def test_reynolds_by_hand():
    # By hand: 2 m/s * 0.02 m / 46e-6 m2/s = 869.6.
    assert reynolds_number(2.0, 20.0, 46.0) == pytest.approx(869.565, abs=1e-3)


def test_laminar_friction_is_64_over_re():
    # Hagen-Poiseuille: f = 64/Re, independent of roughness, well inside the laminar range
    # (Churchill's equation leaves it smoothly as the transition nears).
    for re in (10.0, 500.0, 1000.0):
        assert friction_factor(re, 0.01) == pytest.approx(64.0 / re, rel=1e-12)


def test_colebrook_satisfies_its_equation():
    # Colebrook (1939): the returned f makes both sides of the equation equal.
    for re, ed in ((4000.0, 0.0), (1e5, 1e-4), (1e7, 0.05)):
        f = colebrook_friction(re, ed)
        rhs = -2.0 * math.log10(ed / 3.7 + 2.51 / (re * math.sqrt(f)))
        assert 1.0 / math.sqrt(f) == pytest.approx(rhs, rel=1e-10)


def test_transition_has_no_jump():
    # Churchill's one equation has no jump at either end of 2300..4000 (common practice limits).
    assert friction_factor(2300.0 - 1e-9, 1e-3) == pytest.approx(friction_factor(2300.0, 1e-3))
    assert friction_factor(4000.0 - 1e-9, 1e-3) == pytest.approx(friction_factor(4000.0, 1e-3))


def test_darcy_drop_by_hand():
    # By hand: f 0.02, L/D = 10 / 0.025 = 400, rho v^2/2 = 870 * 9 / 2 = 3915 Pa -> 0.3132 bar.
    assert darcy_drop_bar(0.02, 10.0, 25.0, 870.0, 3.0) == pytest.approx(0.3132, rel=1e-12)


def test_tool_flags_a_fast_suction_line():
    result = velocity_in_line(100.0, 25.0, "suction", 0.0)
    assert result.level == "act"
    assert result.values["bore_needed"] == pytest.approx(bore_for_velocity(100.0, 1.2))
    assert result.values["hose_velocity"] <= 1.2


def test_tool_target_velocity_sizes_the_bore():
    result = velocity_in_line(100.0, 25.0, "pressure", 160.0, target_velocity=3.0)
    assert line_velocity(100.0, result.values["bore_needed"]) == pytest.approx(3.0)
    assert result.values["hose_bore"] >= result.values["bore_needed"]


def test_bridge_us_units():
    us = bridge.run("line-velocity", {"line_flow": 40, "bore": 1.0, "line": "return"}, "us", examples=True)
    # By hand: 40 gpm in a 1 in bore = 4.980 m/s = 16.34 ft/s.
    assert us["values"]["velocity"] == pytest.approx(16.34, abs=0.01)
    assert us["units"]["bore_needed"] == "in"
