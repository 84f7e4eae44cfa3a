"""Unit conversions and ASTM D2161 Saybolt seconds; the unit-convert tool."""

import pytest

from calc import bridge
from calc.methods.convert import kinematic_from_saybolt, saybolt_seconds, sus_at_100f
from calc.tools.convert import LINEAR_UNITS, convert, unit_convert
from calc.kernel.errors import InputError

F100_IN_C = (100.0 - 32.0) * 5.0 / 9.0


def test_known_values():
    # NIST SP 811 (2008) appendix B: 1 psi = 6.894757e3 Pa, so 1 bar = 14.5038 psi.
    assert convert(1.0, "bar", "psi") == pytest.approx(14.5038, abs=5e-5)
    # 1 standard atmosphere = 101 325 Pa, exact by definition (NIST SP 811).
    assert convert(1.0, "atm", "bar") == 1.01325
    # 1 US liquid gallon = 231 in^3 = 3.785411784 L exact (NIST SP 811).
    assert convert(1.0, "usgal", "l") == 3.785411784
    assert convert(1.0, "gpm", "lpm") == 3.785411784
    # 1 MPa = 10 bar, 1 kPa = 0.01 bar (SI prefixes, 1 bar = 1e5 Pa exact).
    assert convert(21.0, "mpa", "bar") == pytest.approx(210.0, rel=1e-15)
    assert convert(101.325, "kpa", "atm") == pytest.approx(1.0, rel=1e-15)
    # 1 hp (mechanical, 550 ft lbf/s) = 745.699872 W (NIST SP 811).
    assert convert(1.0, "hp", "kw") == pytest.approx(0.745699872, rel=1e-12)
    # 1 % = 10 000 ppm by definition.
    assert convert(0.05, "percent", "ppm") == pytest.approx(500.0)


@pytest.mark.parametrize("celsius, fahrenheit", [(-40.0, -40.0), (0.0, 32.0), (100.0, 212.0),
                                                 (37.0, 98.6), (-273.15, -459.67)])
def test_temperature_scale_points(celsius, fahrenheit):
    # Definition of the Fahrenheit scale: degF = degC 9/5 + 32 (NIST SP 811).
    assert convert(celsius + 1e-9, "c", "f") == pytest.approx(fahrenheit, abs=1e-6)


@pytest.mark.parametrize("key, kind", [(k, kind) for k, _, kind, _ in LINEAR_UNITS])
def test_every_conversion_has_an_exact_inverse(key, kind):
    mates = [k for k, _, other_kind, _ in LINEAR_UNITS if other_kind == kind]
    for other in mates:
        for value in (0.5, 12.5, 3300.0):
            assert convert(convert(value, key, other), other, key) == pytest.approx(value, rel=1e-13)


def test_temperature_conversion_has_an_exact_inverse():
    for value in (-40.0, 0.0, 37.5, 250.0):
        assert convert(convert(value, "c", "f"), "f", "c") == pytest.approx(value, rel=1e-13)
        assert convert(convert(value, "f", "c"), "c", "f") == pytest.approx(value, rel=1e-13)


def test_units_of_different_kinds_are_refused_naming_the_field():
    with pytest.raises(InputError) as err:
        convert(1.0, "bar", "l")
    assert err.value.field == "to_unit"
    answer = bridge.run("unit-convert", {"value": 3, "from_unit": "kw", "to_unit": "gpm"}, examples=True)
    assert not answer["ok"] and answer["errors"][0]["field"] == "to_unit"


def test_impossible_values_are_refused():
    for value, unit, other in ((-300.0, "c", "f"), (-500.0, "f", "c"), (-1.0, "l", "usgal"),
                               (-5.0, "ppm", "percent"), (20.0, "sus_100f", "cst")):
        with pytest.raises(InputError) as err:
            convert(value, unit, other)
        assert err.value.field == "value"


def test_lower_end_of_the_sus_scale_follows_the_chosen_temperature():
    # The D2161 scale starts at 1.8 cSt (from memory): SUS(1.8) at 100 degF is accepted whatever
    # the temperature field says; only "SUS at the temperature entered" uses that field.
    lowest = saybolt_seconds(1.8, 100.0)
    assert convert(lowest, "sus_100f", "cst", temp_c=150.0) == pytest.approx(1.8, rel=1e-10)
    with pytest.raises(InputError):
        convert(lowest, "sus_at_temp", "cst", temp_c=150.0)


def test_negative_gauge_pressure_is_allowed():
    # A vacuum at a pump inlet reads below zero gauge.
    assert convert(-0.3, "bar", "psi") == pytest.approx(-0.3 / 0.0689475729)


def test_sus_equation_at_its_asymptote():
    # ASTM D2161: at high viscosity SUS = 4.6324 v, the fraction term dies out.
    assert sus_at_100f(5000.0) == pytest.approx(4.6324 * 5000.0, rel=1e-6)


def test_sus_temperature_factor():
    # ASTM D2161 (from memory): SUS at t degF = SUS at 100 degF x (1 + 0.000061 (t - 100));
    # at 210 degF the factor is 1.00671.
    assert saybolt_seconds(20.0, 210.0) / sus_at_100f(20.0) == pytest.approx(1.00671, rel=1e-12)


@pytest.mark.parametrize("temp_f", [100.0, 210.0, 150.0])
@pytest.mark.parametrize("kv", [1.8, 2.0, 4.3, 32.0, 75.0, 500.0, 1.0e4])
def test_sus_inverse_is_exact(kv, temp_f):
    assert kinematic_from_saybolt(saybolt_seconds(kv, temp_f), temp_f) == pytest.approx(kv, rel=1e-10)


def test_tool_sus_at_a_temperature_matches_the_fixed_choices():
    at_210 = unit_convert(10.0, "cst", "sus_210f", F100_IN_C).values["converted"]
    at_temp = unit_convert(10.0, "cst", "sus_at_temp", (210.0 - 32.0) * 5.0 / 9.0).values["converted"]
    assert at_temp == pytest.approx(at_210, rel=1e-12)


def test_tool_text_shows_both_sides():
    result = unit_convert(1.0, "bar", "psi", F100_IN_C)
    assert result.values["text"] == "1 bar = 14.5038 psi"


def test_bridge_is_the_same_in_both_unit_systems():
    # value, from and to carry their own units; only the Saybolt temperature field converts.
    metric = bridge.run("unit-convert", {"value": 60, "from_unit": "sus_at_temp", "to_unit": "cst",
                                         "temp": 50}, examples=True)
    us = bridge.run("unit-convert", {"value": 60, "from_unit": "sus_at_temp", "to_unit": "cst",
                                     "temp": 122}, "us", examples=True)
    assert us["values"]["converted"] == pytest.approx(metric["values"]["converted"], rel=1e-12)
