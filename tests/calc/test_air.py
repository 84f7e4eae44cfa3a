"""Entrained air, effective bulk modulus and the cylinder's give (calc.air)."""

import math

import pytest

from calc import bridge
from calc.methods.air import (air_fraction_at_pressure, column_compression, effective_bulk_modulus,
                              load_pressure_bar)
from calc.tools.air import air_stiffness
from calc.kernel.errors import InputError

DEFAULTS = dict(air=1.0, pressure=160.0, process="isothermal", k_oil=16000.0, atmosphere=1.013,
                bore=100.0, stroke=500.0, line_volume=0.0, load=100.0)


def run(**changes):
    return air_stiffness(**{**DEFAULTS, **changes})


def test_no_air_gives_the_oil_modulus_back():
    # Definition of the mixture rule: x = 0 leaves K_oil.
    assert effective_bulk_modulus(16000.0, 0.0, 50.0, 1.4) == 16000.0
    result = run(air=0.0)
    assert result.values["k_eff"] == pytest.approx(16000.0, rel=1e-12)
    assert result.values["stiffness_loss"] == pytest.approx(0.0, abs=1e-9)
    assert result.values["lost_motion_air"] == 0.0


def test_mixture_rule_hand_example():
    # Mixture rule in the form of Merritt, Hydraulic Control Systems (1967), ch. 2 (from memory);
    # numbers by hand: 1 % air at 100 bar abs, adiabatic: 1/K = 0.99/16000 + 0.01/140
    # = 6.1875e-5 + 7.142857e-5 = 1.3330357e-4 1/bar -> K = 7501.67 bar.
    assert effective_bulk_modulus(16000.0, 0.01, 100.0, 1.4) == pytest.approx(7501.67, abs=0.01)
    # Isothermal, same: 1/K = 6.1875e-5 + 1e-4 = 1.61875e-4 -> 6177.61 bar.
    assert effective_bulk_modulus(16000.0, 0.01, 100.0, 1.0) == pytest.approx(6177.61, abs=0.01)


def test_air_fraction_follows_boyle():
    # Boyle's law (isothermal): air alone halves in volume from 1 to 2 bar abs.
    assert air_fraction_at_pressure(1.0, 2.0, 1.0, 1.0) == 1.0
    # By hand: 1 % air from 1 to 2 bar abs, stiff oil: 0.005 / (0.005 + 0.99) = 0.0050251.
    assert air_fraction_at_pressure(0.01, 2.0, 1.0, 1.0, 1e15) == pytest.approx(0.00502513, rel=1e-6)
    # Adiabatic: (1/2)^(1/1.4) = 0.609507 of the volume remains.
    assert air_fraction_at_pressure(0.5, 2.0, 1.0, 1.4, 1e15) == pytest.approx(
        0.609507 / 1.609507, rel=1e-6)


def test_closed_form_compression_equals_integral_of_the_modulus():
    # Consistency: d(ln V) = -dp / K_eff(p) integrated numerically (Simpson in ln p, 2000 steps)
    # must equal the closed form, which shows the mixture rule and the compressed fraction agree.
    k_oil, x0, p0, p1, n = 16000.0, 0.02, 1.013, 201.013, 1.4
    steps = 2000
    h = (math.log(p1) - math.log(p0)) / steps

    def dlnv_dlnp(u):
        p = math.exp(u)
        return -p / effective_bulk_modulus(k_oil, air_fraction_at_pressure(x0, p, p0, n, k_oil), p, n)

    u0 = math.log(p0)
    simpson = dlnv_dlnp(u0) + dlnv_dlnp(u0 + steps * h) + sum(
        (4 if i % 2 else 2) * dlnv_dlnp(u0 + i * h) for i in range(1, steps))
    ratio = math.exp(simpson * h / 3.0)  # V1 / V0
    assert 1.0 - ratio == pytest.approx(column_compression(1.0, x0, p0, p1, n, k_oil), rel=1e-9)


def test_load_pressure_by_hand():
    # By hand: 100 kN on 100 mm bore: 100 000 N / 7853.98 mm2 = 12.732 MPa = 127.32 bar.
    assert load_pressure_bar(100.0, 100.0) == pytest.approx(127.324, abs=1e-3)


def test_give_of_air_free_column_by_hand():
    # By hand: 500 mm column pressed 127.32 bar with K = 16 000 bar:
    # 500 * (1 - exp(-127.32 / 16000)) = 3.9632 mm.
    assert run().values["lost_motion_air_free"] == pytest.approx(3.9632, abs=1e-3)


def test_air_adds_give_and_softens():
    base, more = run(air=1.0), run(air=3.0)
    assert more.values["k_eff"] < base.values["k_eff"] < 16000.0
    assert more.values["lost_motion"] > base.values["lost_motion"] > base.values["lost_motion_air_free"]
    # By hand: 1 % of a 500 mm column (5 mm of air) pressed 1.013 -> 128.34 bar abs isothermally
    # keeps 5 * 1.013 / 128.34 = 0.0395 mm: about 4.96 mm of extra give, less the oil it displaces.
    assert base.values["lost_motion_air"] == pytest.approx(4.92, abs=0.01)


def test_adiabatic_is_stiffer_than_isothermal():
    assert run(process="adiabatic").values["k_eff"] > run(process="isothermal").values["k_eff"]


def test_lines_volume_adds_give():
    assert run(line_volume=2.0).values["lost_motion"] > run().values["lost_motion"]


def test_impossible_load_names_the_field():
    with pytest.raises(InputError) as err:
        run(load=10000.0, bore=20.0)
    assert err.value.field == "load"


def test_heavy_air_at_low_pressure_is_act():
    assert run(air=5.0, pressure=20.0).level == "act"


def test_bridge_us_units():
    us = bridge.run("air-stiffness", {"pressure": 2320.6, "bore": 3.937, "load": 22480.9}, "us", examples=True)
    assert us["ok"] and us["units"]["k_eff"] == "psi" and us["units"]["lost_motion"] == "in"


def test_lost_motion_is_judged_as_well_as_the_stiffness():
    # The review's case: 5 % air at 50 bar softens the oil 24.7 % (a watch by stiffness alone)
    # but adds 68.5 mm of give to a 1 m stroke, 6.9 % of it: act (common practice, from memory:
    # act at 5 % of the stroke, watch at 1 %).
    answer = bridge.run("air-stiffness", {"air": 5, "pressure": 50, "load": 30, "bore": 80,
                                          "stroke": 1000, "line_volume": 2}, examples=True)
    assert answer["values"]["lost_motion_air"] == pytest.approx(68.5, abs=0.1)
    assert [v["level"] for v in answer["verdicts"]] == ["watch", "act"]
