"""Natural convection against `ht` (Caleb Bell's heat transfer library, tests only)."""

import pytest

ht = pytest.importorskip("ht")

from calc.kernel.constants import STANDARD_GRAVITY as GRAVITY, ZERO_CELSIUS_K as KELVIN  # noqa: E402
from calc.methods.convection import (air_properties, convection_coefficient,  # noqa: E402
                             nu_horizontal_cylinder, nu_plate_cold_side_up, nu_plate_hot_side_up,
                             nu_vertical_plate)

RAYLEIGHS = [1e2, 1e4, 3.3e6, 1e7, 2e7, 1e9, 1e11]
PRANDTLS = [0.69, 0.707, 0.72]


@pytest.mark.parametrize("ra", RAYLEIGHS)
@pytest.mark.parametrize("pr", PRANDTLS)
def test_vertical_plate_churchill_chu(ra, pr):
    # ht.conv_free_immersed.Nu_vertical_plate_Churchill (Churchill and Chu 1975).
    assert nu_vertical_plate(ra, pr) == pytest.approx(ht.Nu_vertical_plate_Churchill(pr, ra / pr), rel=1e-12)


@pytest.mark.parametrize("ra", [r for r in RAYLEIGHS if not 4.7e6 < r <= 1e7] + [4.6e6, 1.01e7])
def test_hot_plate_facing_up_mcadams(ra):
    # ht.conv_free_immersed.Nu_horizontal_plate_McAdams, buoyancy-assisted (McAdams 1954),
    # outside the window where calc switches forms early to stay continuous.
    assert nu_plate_hot_side_up(ra) == pytest.approx(
        ht.Nu_horizontal_plate_McAdams(0.7, ra / 0.7, buoyancy=True), rel=1e-12)


@pytest.mark.parametrize("ra", [5e6, 8e6, 1e7])
def test_hot_plate_facing_up_switches_where_the_forms_meet(ra):
    # Between 4.7e6 (where 0.54 Ra^1/4 = 0.15 Ra^1/3) and 1e7 calc takes McAdams' upper form,
    # at most 6.5 % above ht's lower one: the published forms jump by 6.4 % at 1e7.
    mine = nu_plate_hot_side_up(ra)
    published = ht.Nu_horizontal_plate_McAdams(0.7, ra / 0.7, buoyancy=True)
    assert mine == pytest.approx(0.15 * ra ** (1.0 / 3.0), rel=1e-12)
    assert 1.0 <= mine / published <= 1.065


@pytest.mark.parametrize("ra", RAYLEIGHS + [1e10, 5e10])
def test_cold_plate_facing_up_mcadams(ra):
    # ht.conv_free_immersed.Nu_horizontal_plate_McAdams, buoyancy opposed (a tank top colder
    # than the air, e.g. oil starting cold in a warm shop).
    assert nu_plate_cold_side_up(ra) == pytest.approx(
        ht.Nu_horizontal_plate_McAdams(0.7, ra / 0.7, buoyancy=False), rel=1e-12)


@pytest.mark.parametrize("ra", RAYLEIGHS)
@pytest.mark.parametrize("pr", PRANDTLS)
def test_horizontal_cylinder_churchill_chu(ra, pr):
    # ht.conv_free_immersed.Nu_horizontal_cylinder_Churchill_Chu.
    assert nu_horizontal_cylinder(ra, pr) == pytest.approx(
        ht.Nu_horizontal_cylinder_Churchill_Chu(pr, ra / pr), rel=1e-12)


@pytest.mark.parametrize("orientation, method", [
    ("vertical", lambda pr, gr: ht.Nu_vertical_plate_Churchill(pr, gr)),
    ("up", lambda pr, gr: ht.Nu_horizontal_plate_McAdams(pr, gr, buoyancy=True)),
    ("cylinder", lambda pr, gr: ht.Nu_horizontal_cylinder_Churchill_Chu(pr, gr)),
])
@pytest.mark.parametrize("length_m, surface_c, air_c", [(0.55, 80.0, 25.0), (0.2, 45.0, -10.0),
                                                         (1.2, 120.0, 40.0)])
def test_coefficient_from_the_same_air_properties(orientation, method, length_m, surface_c, air_c):
    # h = Nu k / L with Gr = g beta dT L^3 / nu^2, beta = 1 / T_film, ht's Nusselt number.
    nu, k, pr = air_properties((surface_c + air_c) / 2)
    beta = 1.0 / ((surface_c + air_c) / 2 + KELVIN)
    gr = GRAVITY * beta * (surface_c - air_c) * length_m ** 3 / nu ** 2
    expected = method(pr, gr) * k / length_m
    assert convection_coefficient(orientation, length_m, surface_c, air_c) == pytest.approx(expected, rel=1e-12)


def test_free_convection_of_a_tank_wall_is_a_few_watts():
    # Order of magnitude (Incropera ch. 9 discussion, from memory): free convection in air gives
    # about 2 to 25 W/(m^2 K); a 0.5 m wall at 60 degC in 20 degC air sits near 5.
    assert 2.0 < convection_coefficient("vertical", 0.5, 60.0, 20.0) < 25.0


def test_cold_top_uses_the_opposed_buoyancy_form():
    # A top colder than the air: McAdams buoyancy=False in ht, with the same air properties.
    nu, k, pr = air_properties((10.0 + 30.0) / 2)
    gr = GRAVITY / (20.0 + KELVIN) * 20.0 * 0.3 ** 3 / nu ** 2
    expected = ht.Nu_horizontal_plate_McAdams(pr, gr, buoyancy=False) * k / 0.3
    assert convection_coefficient("up", 0.3, 10.0, 30.0) == pytest.approx(expected, rel=1e-12)
