"""Heat balance of a hydraulic tank: load, what the tank sheds, steady and warm-up temperatures.

    heat load       P = P_in (1 - eta)                  (power not turned into work)
                    P = Q dp / 600   [kW; L/min, bar]    (flow throttled or over a relief valve)
    tank sheds      Q(T) = sum A_i (h_conv,i + h_rad) (T - T_air)
    steady          P = Q(T_steady), solved by bisection (Q rises monotonically with T)
    warm-up         C dT/dt = P - Q(T)  =>  t = integral of C dT / (P - Q(T)) from T_start,
                    integrated numerically (Simpson) in ln|T_steady - T| so the pole at
                    T_steady does no harm; C = m_oil c_oil + m_steel c_steel (lumped)
    cooler duty     P - Q(T_target)

The tank's walls are taken at the oil temperature (thin steel, oil-side film
neglected), so the shedding is an upper bound; the bottom is not counted.
Convection and radiation: `calc.methods.convection`.

Source: energy balance of a lumped body (Incropera et al., Fundamentals of Heat
and Mass Transfer, 6th ed., section 5.3 and eq. 1.12a); Q dp / 600 is the
hydraulic power of a flow at a pressure drop (1 bar x 1 L/min = 100/60 W).
"""

from __future__ import annotations

import math
from typing import Callable

from ..kernel.solve import bisect
from .convection import convection_coefficient, radiation_coefficient
from .tank import depth_mm, segment_area_mm2


# Typical mineral hydraulic oil: density about 870 kg/m^3, specific heat about 1.9 kJ/(kg K)
# near 40 degC (from memory).
OIL_DENSITY_KG_PER_L = 0.870


OIL_CP_KJ_PER_KG_K = 1.9


# Plain carbon steel at 300 K: 7854 kg/m^3, 434 J/(kg K) (Incropera Table A.1, from memory).
STEEL_DENSITY_KG_PER_M3 = 7854.0


STEEL_CP_KJ_PER_KG_K = 0.434


# Hottest oil temperature worth solving for: past any mineral oil's flash point.
STEADY_CAP_C = 300.0


Surface = tuple[float, str, float]  # (area [m^2], orientation for calc.convection, length [m])


def heat_load_from_power_kw(power_kw: float, efficiency_pct: float) -> float:
    """Heat [kW] from the power not turned into useful work, P (1 - eta).

    >>> round(heat_load_from_power_kw(7.5, 80.0), 12)
    1.5
    """
    return power_kw * (1.0 - efficiency_pct / 100.0)


def heat_load_from_throttle_kw(flow_lpm: float, dp_bar: float) -> float:
    """Heat [kW] of flow dropping `dp_bar` across a relief valve or throttle, Q dp / 600.

    >>> heat_load_from_throttle_kw(60.0, 150.0)
    15.0
    """
    return flow_lpm * dp_bar / 600.0


def tank_surfaces(shape: str, length_mm: float, width_mm: float, height_mm: float,
                  diameter_mm: float, level_mm: float, which: str) -> list[Surface]:
    """The tank's shedding surfaces: the walls below the oil level, or all walls and the top.

    A vertical cylinder's wall is taken as a vertical plate, fair when D >= 35 H / Gr^(1/4)
    (Incropera et al., eq. 9.33), true of any tank-sized cylinder in air. A horizontal
    cylinder's wetted shell takes the whole cylinder's average coefficient.

    >>> [(round(a, 3), o, round(l, 3)) for a, o, l in tank_surfaces(
    ...     "rectangular", 1000.0, 500.0, 800.0, 0.0, 400.0, "wetted")]
    [(1.2, 'vertical', 0.4)]
    """
    m = 1e-3
    wall_h = (depth_mm(shape, height_mm, diameter_mm) if which == "all" else level_mm) * m
    if shape == "rectangular":
        walls = [(2.0 * (length_mm + width_mm) * m * wall_h, "vertical", wall_h)]
        top = (length_mm * width_mm * m * m, "up",
               length_mm * width_mm / (2.0 * (length_mm + width_mm)) * m)
    elif shape == "vertical":
        walls = [(math.pi * diameter_mm * m * wall_h, "vertical", wall_h)]
        top = (math.pi * (diameter_mm * m) ** 2 / 4.0, "up", diameter_mm / 4.0 * m)
    else:
        r = diameter_mm / 2.0
        h = min(wall_h / m, diameter_mm)
        wetted_angle = 2.0 * math.acos((r - h) / r)
        return [(wetted_angle * r * length_mm * m * m, "cylinder", diameter_mm * m),
                (2.0 * segment_area_mm2(diameter_mm, h) * m * m, "vertical", h * m)]
    return walls + [top] if which == "all" else walls


def tank_shell_area_m2(shape: str, length_mm: float, width_mm: float, height_mm: float,
                       diameter_mm: float) -> float:
    """Whole outside area [m^2] of the tank, bottom and top included (for its steel mass).

    >>> tank_shell_area_m2("rectangular", 1000.0, 500.0, 800.0, 0.0)
    3.4
    """
    m = 1e-3
    if shape == "rectangular":
        return 2.0 * (length_mm * width_mm + length_mm * height_mm + width_mm * height_mm) * m * m
    end = math.pi * (diameter_mm * m) ** 2 / 4.0
    run = height_mm if shape == "vertical" else length_mm
    return math.pi * diameter_mm * m * run * m + 2.0 * end


def shed_kw(surfaces: list[Surface], emissivity: float, surface_c: float, air_c: float) -> float:
    """Heat [kW] the surfaces shed at `surface_c` to still air and surroundings at `air_c`.

    >>> round(shed_kw([(1.0, "vertical", 0.5)], 0.9, 60.0, 20.0), 4)
    0.4496
    """
    if surface_c == air_c:
        return 0.0
    h_rad = radiation_coefficient(emissivity, surface_c, air_c)
    watts = sum(area * (convection_coefficient(orient, length, surface_c, air_c) + h_rad)
                for area, orient, length in surfaces if area > 0.0)
    return watts * (surface_c - air_c) / 1000.0


def steady_temperature_c(load_kw: float, loss_kw: Callable[[float], float], air_c: float,
                         cap_c: float = STEADY_CAP_C) -> float | None:
    """Oil temperature [degC] at which `loss_kw(T)` equals `load_kw`; None if above `cap_c`.

    `loss_kw` must rise with T and be zero at `air_c`. Bisection to 1e-9 K.

    >>> round(steady_temperature_c(2.0, lambda t: 0.05 * (t - 20.0), 20.0), 6)
    60.0
    """
    if load_kw <= 0.0:
        return air_c
    if loss_kw(cap_c) < load_kw:
        return None
    return bisect(lambda t: loss_kw(t) - load_kw, air_c, cap_c, x_tol=1e-9, rel_tol=0.0)


def time_to_temperature_min(load_kw: float, loss_kw: Callable[[float], float],
                            capacity_kj_per_k: float, start_c: float, target_c: float,
                            steady_c: float | None, steps: int = 128) -> float | None:
    """Minutes for the lumped tank to go from `start_c` to `target_c` [degC].

    t = C * integral dT / (P - Q(T)); with T = T_steady - s e^u the integrand
    C e^u / |P - Q| is smooth up to the steady temperature, so composite Simpson
    in u converges fast. None when the target is not between start and steady.
    Linear check: Q = UA (T - T_air) gives t = C / UA ln((T_s - T_0) / (T_s - T)).

    >>> round(time_to_temperature_min(2.0, lambda t: 0.05 * (t - 20.0), 600.0, 20.0, 40.0, 60.0), 3)
    138.629
    """
    if steady_c is None:
        steady_c = math.inf
    if not (start_c < target_c < steady_c or steady_c < target_c < start_c):
        return None
    if abs(steady_c - target_c) < 1e-4:
        return None  # the approach is asymptotic: a target at the steady temperature is never met
    if math.isinf(steady_c):
        f = lambda t: capacity_kj_per_k / (load_kw - loss_kw(t))  # noqa: E731
        a, b = start_c, target_c
    else:
        sign = 1.0 if steady_c > start_c else -1.0
        f = lambda u: capacity_kj_per_k * math.exp(u) / abs(  # noqa: E731
            load_kw - loss_kw(steady_c - sign * math.exp(u)))
        a, b = math.log(abs(steady_c - target_c)), math.log(abs(steady_c - start_c))
    width = (b - a) / steps
    total = f(a) + f(b) + sum((4.0 if i % 2 else 2.0) * f(a + i * width) for i in range(1, steps))
    return total * width / 3.0 / 60.0


def heat_capacity_kj_per_k(oil_l: float, steel_kg: float) -> float:
    """Lumped heat capacity [kJ/K] of the oil and the tank's steel.

    >>> round(heat_capacity_kj_per_k(100.0, 50.0), 2)
    187.0
    """
    return oil_l * OIL_DENSITY_KG_PER_L * OIL_CP_KJ_PER_KG_K + steel_kg * STEEL_CP_KJ_PER_KG_K
