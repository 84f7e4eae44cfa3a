"""Natural convection and radiation from a hot surface to still air at 1 atm.

Air properties come from a table at 1 atm, interpolated linearly in the
absolute temperature and read at the film temperature (T_surface + T_air) / 2;
the expansion coefficient of an ideal gas is beta = 1 / T_film.

    Gr = g beta (T_s - T_air) L^3 / nu^2      Ra = Gr Pr      h = Nu k / L

Correlations, each for an isothermal surface:
    vertical plate, all Ra (Churchill and Chu 1975):
        Nu = {0.825 + 0.387 Ra^(1/6) / [1 + (0.492/Pr)^(9/16)]^(8/27)}^2
    horizontal plate, hot side up, L = area / perimeter (McAdams 1954, Lloyd and Moran 1974):
        Nu = 0.54 Ra^(1/4) for Ra <= 1e7,   Nu = 0.15 Ra^(1/3) above
    the same plate colder than the air above it (McAdams 1954, as in `ht`):
        Nu = 0.27 Ra^(1/4) for Ra <= 1e10,  Nu = 0.15 Ra^(1/3) above
    horizontal cylinder, L = D (Churchill and Chu 1975):
        Nu = {0.60 + 0.387 Ra^(1/6) / [1 + (0.559/Pr)^(9/16)]^(8/27)}^2
    radiation to surroundings at the air temperature, grey surface:
        h_rad = eps sigma (T_s^2 + T_air^2)(T_s + T_air)

Source: Incropera, DeWitt, Bergman and Lavine, Fundamentals of Heat and Mass
Transfer, 6th ed., eqs. 9.26, 9.30-9.31 and 9.34, and Table A.4 (air at 1 atm;
values from memory of the table, checked in the tests against the Lemmon and
Jacobsen air formulation in `chemicals`).
"""

from __future__ import annotations

from ..kernel.constants import STANDARD_GRAVITY, STEFAN_BOLTZMANN, ZERO_CELSIUS_K

# Air at 1 atm: (T [K], kinematic viscosity [1e-6 m^2/s], thermal conductivity [1e-3 W/(m K)],
# Prandtl number). Incropera et al., Fundamentals of Heat and Mass Transfer, Table A.4
# (from memory of the table).
AIR_1ATM = (
    (200.0, 7.590, 18.1, 0.737),
    (250.0, 11.44, 22.3, 0.720),
    (300.0, 15.89, 26.3, 0.707),
    (350.0, 20.92, 30.0, 0.700),
    (400.0, 26.41, 33.8, 0.690),
    (450.0, 32.39, 37.3, 0.686),
    (500.0, 38.79, 40.7, 0.684),
    (550.0, 45.57, 43.9, 0.683),
    (600.0, 52.69, 46.9, 0.685),
    (650.0, 60.21, 49.7, 0.690),
    (700.0, 68.10, 52.4, 0.695),
)


def air_properties(temp_c: float) -> tuple[float, float, float]:
    """(kinematic viscosity [m^2/s], conductivity [W/(m K)], Prandtl number) of air at 1 atm.

    Linear interpolation in Table A.4; held at the end rows outside 200 K to 700 K.

    >>> nu, k, pr = air_properties(26.85)
    >>> round(nu * 1e6, 2), round(k * 1e3, 1), pr
    (15.89, 26.3, 0.707)
    """
    t = min(max(temp_c + ZERO_CELSIUS_K, AIR_1ATM[0][0]), AIR_1ATM[-1][0])
    for (t0, *row0), (t1, *row1) in zip(AIR_1ATM, AIR_1ATM[1:]):
        if t <= t1:
            w = (t - t0) / (t1 - t0)
            nu, k, pr = (a + w * (b - a) for a, b in zip(row0, row1))
            return nu * 1e-6, k * 1e-3, pr
    raise AssertionError("unreachable: t is clamped to the table")


def grashof(length_m: float, surface_c: float, air_c: float, nu_m2s: float) -> float:
    """Grashof number, g beta |T_s - T_air| L^3 / nu^2 with beta = 1 / T_film (ideal gas).

    >>> round(grashof(1.0, 60.0, 20.0, 1.7e-5) / 1e9, 3)
    4.334
    """
    beta = 1.0 / ((surface_c + air_c) / 2.0 + ZERO_CELSIUS_K)
    return STANDARD_GRAVITY * beta * abs(surface_c - air_c) * length_m ** 3 / nu_m2s ** 2


def nu_vertical_plate(rayleigh: float, prandtl: float) -> float:
    """Churchill-Chu average Nusselt number of an isothermal vertical plate, all Ra.

    >>> round(nu_vertical_plate(1e9, 0.7), 2)
    122.62
    """
    return (0.825 + 0.387 * rayleigh ** (1.0 / 6.0)
            / (1.0 + (0.492 / prandtl) ** (9.0 / 16.0)) ** (8.0 / 27.0)) ** 2


# Where McAdams' two forms for a hot plate facing up meet: 0.54 Ra^(1/4) = 0.15 Ra^(1/3).
HOT_UP_SWITCH_RA = (0.54 / 0.15) ** 12


def nu_plate_hot_side_up(rayleigh: float) -> float:
    """McAdams / Lloyd-Moran average Nusselt number, upper face of a hot horizontal plate,
    length scale area / perimeter.

    Nu = 0.54 Ra^(1/4) up to Ra 1e7 and 0.15 Ra^(1/3) above, as published, jump by 6 % at
    1e7; here the switch is where the two meet (Ra 4.7e6), so the heat a tank sheds has no
    jump for a steady temperature to fall into. Between 4.7e6 and 1e7 this reads up to 6 %
    above the published low-Ra form, well inside the correlation's own scatter.

    >>> round(nu_plate_hot_side_up(1e6), 2), round(nu_plate_hot_side_up(1e9), 1)
    (17.08, 150.0)
    >>> low = nu_plate_hot_side_up(HOT_UP_SWITCH_RA * (1 - 1e-12))
    >>> abs(low - nu_plate_hot_side_up(HOT_UP_SWITCH_RA * (1 + 1e-12))) < 1e-9
    True
    """
    if rayleigh <= HOT_UP_SWITCH_RA:
        return 0.54 * rayleigh ** 0.25
    return 0.15 * rayleigh ** (1.0 / 3.0)


def nu_plate_cold_side_up(rayleigh: float) -> float:
    """McAdams average Nusselt number, upper face of a horizontal plate colder than the air
    (the air settles on it), length scale area / perimeter.

    >>> round(nu_plate_cold_side_up(1e6), 2)
    8.54
    """
    if rayleigh <= 1e10:
        return 0.27 * rayleigh ** 0.25
    return 0.15 * rayleigh ** (1.0 / 3.0)


def nu_horizontal_cylinder(rayleigh: float, prandtl: float) -> float:
    """Churchill-Chu average Nusselt number of an isothermal horizontal cylinder, Ra <= 1e12.

    >>> round(nu_horizontal_cylinder(1e9, 0.7), 2)
    115.53
    """
    return (0.60 + 0.387 * rayleigh ** (1.0 / 6.0)
            / (1.0 + (0.559 / prandtl) ** (9.0 / 16.0)) ** (8.0 / 27.0)) ** 2


ORIENTATIONS = ("vertical", "up", "cylinder")


def convection_coefficient(orientation: str, length_m: float, surface_c: float,
                           air_c: float) -> float:
    """Average natural convection coefficient [W/(m^2 K)] of a surface in still air.

    orientation : "vertical" (plate, L = height), "up" (upper face of a horizontal plate,
                  L = area / perimeter) or "cylinder" (horizontal cylinder, L = diameter)

    >>> round(convection_coefficient("vertical", 0.5, 60.0, 20.0), 2)
    4.95
    """
    nu, k, pr = air_properties((surface_c + air_c) / 2.0)
    ra = grashof(length_m, surface_c, air_c, nu) * pr
    if orientation == "vertical":
        nusselt = nu_vertical_plate(ra, pr)
    elif orientation == "up":
        nusselt = nu_plate_hot_side_up(ra) if surface_c >= air_c else nu_plate_cold_side_up(ra)
    else:
        nusselt = nu_horizontal_cylinder(ra, pr)
    return nusselt * k / length_m


def radiation_coefficient(emissivity: float, surface_c: float, air_c: float) -> float:
    """Linearised radiation coefficient [W/(m^2 K)] of a grey surface to surroundings at `air_c`.

    >>> round(radiation_coefficient(0.9, 60.0, 20.0), 2)
    6.29
    """
    ts, ta = surface_c + ZERO_CELSIUS_K, air_c + ZERO_CELSIUS_K
    return emissivity * STEFAN_BOLTZMANN * (ts * ts + ta * ta) * (ts + ta)
