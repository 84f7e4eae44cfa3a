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
Convection and radiation: `calc.convection`.

Source: energy balance of a lumped body (Incropera et al., Fundamentals of Heat
and Mass Transfer, 6th ed., section 5.3 and eq. 1.12a); Q dp / 600 is the
hydraulic power of a flow at a pressure drop (1 bar x 1 L/min = 100/60 W).
"""

from __future__ import annotations

import math
from functools import partial
from typing import Callable

from ..kernel import chart, units
from ..methods.convection import convection_coefficient, radiation_coefficient
from ..kernel.errors import InputError
from ..kernel.registry import TANK, Field, Output, tool
from ..kernel.result import COMMON_PRACTICE, FROM_MEMORY, Q, Result
from ..kernel.solve import bisect
from .tank import check_level, depth_mm, segment_area_mm2, shape_fields, volume_at_level_l

# Typical mineral hydraulic oil: density about 870 kg/m^3, specific heat about 1.9 kJ/(kg K)
# near 40 degC (from memory).
OIL_DENSITY_KG_PER_L = 0.870
OIL_CP_KJ_PER_KG_K = 1.9
# Plain carbon steel at 300 K: 7854 kg/m^3, 434 J/(kg K) (Incropera Table A.1, from memory).
STEEL_DENSITY_KG_PER_M3 = 7854.0
STEEL_CP_KJ_PER_KG_K = 0.434

# Hottest oil temperature worth solving for: past any mineral oil's flash point.
STEADY_CAP_C = 300.0
# Surfaces hotter than this burn skin on contact within seconds (common practice).
BURN_C = 60.0

SURFACE_CHOICES = (("wetted", "Walls below the oil level (cautious)"),
                   ("all", "All walls and the top (optimistic)"))
LOAD_CHOICES = (("power", "From input power and efficiency"),
                ("throttle", "From flow and pressure drop (relief, throttle)"))

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


CHART_W, CHART_H = 400.0, 330.0
_CHART_BOX = (52.0, 34.0, 334.0, 236.0)  # left, top, width, height of the plot, viewBox units


def warmup_chart(load_kw: float, loss_kw: Callable[[float], float], capacity_kj_per_k: float,
                 start_c: float, steady_c: float | None, target_c: float,
                 system: str = "metric") -> str:
    """SVG of the oil temperature against time for the tank alone, with the target and the
    skin-burn line; the curve runs to 95 % of the way to steady (or to 150 degC).
    Temperatures are labelled in `system` units, ticks round in the shown unit."""
    end_c = 150.0 if steady_c is None else start_c + 0.95 * (steady_c - start_c)
    temps = [start_c + (end_c - start_c) * k / 40 for k in range(41)]
    hours = [0.0] + [time_to_temperature_min(load_kw, loss_kw, capacity_kj_per_k, start_c, t,
                                             steady_c, steps=16) / 60.0 for t in temps[1:]]
    shown = (start_c, end_c, target_c, end_c if steady_c is None else steady_c)
    pad = max(5.0, 0.1 * (max(shown) - min(shown)))  # room for a label beyond the outer lines
    t_low, t_high = min(shown) - pad, max(shown) + pad
    ax = chart.Axes((0.0, max(hours[-1], 1e-3)), (t_low, t_high), _CHART_BOX)
    left, _, width, _ = _CHART_BOX
    # A warming curve leaves the upper left free: labels go there, above their lines; a cooling
    # curve leaves the lower right free. Of two lines closer than a label, one label flips side.
    warming = end_c > start_c
    x_label, anchor = (left + 6, "start") if warming else (left + width - 4, "end")
    show = lambda value: units.show(value, "temperature", system)  # noqa: E731
    marks = [(target_c, "target", "#2e6b2e", "6 3", f"target {show(target_c)}")]
    if t_low < BURN_C < t_high:
        marks.append((BURN_C, "limit limit-burn", "#8b1a1a", "3 4", f"{show(BURN_C)} burns skin"))
    if steady_c is not None and t_low < steady_c < t_high:
        marks.append((steady_c, "steady", "#12357a", "12 5", f"steady {show(steady_c)}"))
    marks.sort(key=lambda m: m[0], reverse=not warming)
    body = [chart.frame(ax, chart.ticks_linear(0.0, hours[-1], 6),
                        chart.unit_ticks(t_low, t_high, "temperature", system),
                        f"Time from start, {units.unit_label('hours', system)}",
                        f"Oil temperature, {units.unit_label('temperature', system)}", chart.short)]
    for n, (temp, cls, colour, dash, label) in enumerate(marks):
        after = marks[n + 1][0] if n + 1 < len(marks) else None
        crowded = after is not None and abs(ax.y(after) - ax.y(temp)) < 2 * chart.TEXT_SIZE
        above = warming != crowded
        body += [chart.hline(ax, temp, cls, colour, 2.0, dash),
                 chart.text(x_label, ax.y(temp) + (-5 if above else 17), label, cls.split()[-1] + "-label",
                            anchor=anchor)]
    body.append(chart.polyline([ax.point(h, t) for h, t in zip(hours, temps)], "oil-line",
                               "#12357a", 4.0))
    steady_text = (f"no steady state below {show(STEADY_CAP_C)}" if steady_c is None
                   else f"steady {show(steady_c)}")
    title = f"Oil temperature of the tank alone from {show(start_c)}: {steady_text}"
    desc = ("Oil temperature against hours from start, with the target as a dashed line, the "
            "skin-burn temperature as a dotted line and the steady temperature as a long-dashed "
            "line.")
    return chart.document(CHART_W, CHART_H, title, desc, body, "chart chart-warmup")


def heat_capacity_kj_per_k(oil_l: float, steel_kg: float) -> float:
    """Lumped heat capacity [kJ/K] of the oil and the tank's steel.

    >>> round(heat_capacity_kj_per_k(100.0, 50.0), 2)
    187.0
    """
    return oil_l * OIL_DENSITY_KG_PER_L * OIL_CP_KJ_PER_KG_K + steel_kg * STEEL_CP_KJ_PER_KG_K


_T = "temperature"
_KW = "power"
_H = "heat_transfer"


@tool(
    "tank-heat",
    title="Tank heat balance",
    summary="Heat the circuit puts into the oil, what the tank sheds by itself, the oil "
            "temperature it settles at, the warm-up time and the cooler needed for a target.",
    topic=TANK,
    inputs=(
        Field("load_from", "Heat load", "choice", "power", choices=LOAD_CHOICES),
        Field("power", "Power into the pump", _KW, 7.5, min=0.0, max=5000.0,
              help="Motor shaft power averaged over the cycle."),
        Field("efficiency", "Overall efficiency of the circuit", "percent", 80.0, min=0.0,
              max=100.0, help="Share of the input power that leaves as useful work."),
        Field("flow", "Flow through the relief or throttle", "flow", 60.0, min=0.0, max=1.0e5),
        Field("dp", "Pressure drop across it", "pressure", 150.0, min=0.0, max=1000.0),
    ) + shape_fields() + (
        Field("surfaces", "Surfaces that shed heat", "choice", "wetted", choices=SURFACE_CHOICES),
        Field("emissivity", "Emissivity of the tank surface", "ratio", 0.9, min=0.02, max=1.0,
              help="About 0.9 for painted steel, 0.1 to 0.3 for bare or galvanised sheet "
                   "(from memory)."),
        Field("wall", "Wall thickness", "length", 3.0, min=0.5, max=50.0),
        Field("ambient", "Air temperature around the tank", _T, 25.0, min=-40.0, max=60.0),
        Field("start", "Oil temperature at start", _T, None, min=-40.0, max=150.0, optional=True,
              help="Blank: the oil starts at the air temperature."),
        Field("target", "Target oil temperature", _T, 55.0, min=-30.0, max=150.0,
              help="The temperature to hold (cooler duty) and to warm up to."),
    ),
    outputs=(
        Output("load", "Heat load", _KW),
        Output("area", "Shedding surface", "area"),
        Output("oil_volume", "Oil in the tank", "volume"),
        Output("steady", "Steady oil temperature, tank alone", _T,
               "Blank when the tank alone cannot shed the load at any sensible temperature.", headline=True),
        Output("shed_target", "Tank sheds at the target", _KW),
        Output("h_conv", "Convection coefficient at the target", _H),
        Output("h_rad", "Radiation coefficient at the target", _H),
        Output("cooler", "Cooler duty to hold the target", _KW),
        Output("time_to_target", "Time from start to target", "minutes",
               "Blank when the tank alone never reaches the target."),
        Output("time_to_90", "Time to 90 % of the way to steady", "minutes",
               "How long the tank alone takes to get most of the way to its steady temperature."),
    ),
)
def tank_heat(load_from: str, power: float, efficiency: float, flow: float, dp: float,
              shape: str, length: float, width: float, height: float, diameter: float,
              level: float, surfaces: str, emissivity: float, wall: float, ambient: float,
              target: float, start: float | None = None) -> Result:
    """Heat load against the tank's own shedding: steady temperature, warm-up, cooler duty."""
    check_level(shape, height, diameter, level)
    if level <= 0.0:
        raise InputError("level", "the tank must hold some oil: enter a level above the bottom")
    if target <= ambient:
        raise InputError("target", "the target must be above the air temperature: a tank "
                                   "cannot shed heat to warmer air")
    start_c = ambient if start is None else start
    load = (heat_load_from_power_kw(power, efficiency) if load_from == "power"
            else heat_load_from_throttle_kw(flow, dp))
    faces = tank_surfaces(shape, length, width, height, diameter, level, surfaces)
    loss = lambda t: shed_kw(faces, emissivity, t, ambient)  # noqa: E731
    steady = steady_temperature_c(load, loss, ambient)
    oil = volume_at_level_l(shape, length, width, height, diameter, level)
    steel_kg = (tank_shell_area_m2(shape, length, width, height, diameter) * wall * 1e-3
                * STEEL_DENSITY_KG_PER_M3)
    capacity = heat_capacity_kj_per_k(oil, steel_kg)
    area = sum(a for a, _, _ in faces)
    if area < 1e-6:
        raise InputError("level", "almost no tank surface is wetted at this level: enter the "
                                  "working level, or count all walls")
    shed_target = loss(target)
    h_rad = radiation_coefficient(emissivity, target, ambient)
    h_conv = 1000.0 * shed_target / (area * (target - ambient)) - h_rad
    cooler = max(load - shed_target, 0.0)
    result = Result(values={
        "load": load, "area": area, "oil_volume": oil, "steady": steady,
        "shed_target": shed_target, "h_conv": h_conv, "h_rad": h_rad, "cooler": cooler,
        "time_to_target": time_to_temperature_min(load, loss, capacity, start_c, target, steady),
        "time_to_90": None if steady is None else time_to_temperature_min(
            load, loss, capacity, start_c, start_c + 0.9 * (steady - start_c), steady),
    })
    if steady is None or abs(steady - start_c) > 0.5:
        result.charts["warmup"] = partial(warmup_chart, load, loss, capacity, start_c, steady,
                                          target)
    _verdicts(result, load, steady, target, cooler)
    result.note("Walls are taken at the oil temperature and the air as still: a fan, wind or "
                "open air sheds more, an enclosure, a wall close by or sun on the tank less.")
    result.note("Warm-up counts the oil and steel of the tank only, integrated numerically from "
                "the heat balance; pipes, cylinders and the pump add heat capacity and surface, "
                "so the real machine warms a little slower.")
    result.note("Hot oil and hot surfaces burn: let them cool, wear gloves, and lock out the "
                "machine before opening the circuit; follow the equipment maker's limits.")
    result.sources += [
        "Heat load: P(1 - efficiency), or Q dp / 600 (hydraulic power)",
        "Natural convection: Churchill-Chu vertical plate and horizontal cylinder, McAdams / "
        "Lloyd-Moran hot plate facing up (Incropera et al., 6th ed., ch. 9)",
        "Air at 1 atm at the film temperature: Incropera et al. Table A.4 (from memory)",
        "Radiation: grey surface to surroundings at air temperature, emissivity entered",
        "Oil 0.87 kg/L, 1.9 kJ/(kg K); steel 7854 kg/m³, 0.434 kJ/(kg K): from memory",
    ]
    return result


def _verdicts(result: Result, load: float, steady: float | None, target: float,
              cooler: float) -> None:
    if steady is None:
        result.add("act", COMMON_PRACTICE,
                   "The tank alone cannot shed {0} at any sensible oil temperature: a cooler of "
                   "at least {1} is needed; do not run without it.", Q(load, _KW), Q(cooler, _KW))
    elif steady > target:
        result.add("act" if cooler > 0.1 * load else "watch", COMMON_PRACTICE,
                   "The tank alone would settle at {0}, above the target {1}: a cooler of at "
                   "least {2} (plus margin) is needed; do not run without it.",
                   Q(steady, _T), Q(target, _T), Q(cooler, _KW))
    else:
        result.add("ok", COMMON_PRACTICE,
                   "The tank alone settles at {0}, at or below the target {1}: no cooler is "
                   "needed at this load and air temperature.", Q(steady, _T), Q(target, _T))
    running = target if steady is None else min(steady, target)
    if running > BURN_C:
        result.add("watch", COMMON_PRACTICE,
                   "The tank runs at about {0}: surfaces above {1} burn skin; guard or mark them "
                   "and wear gloves.", Q(running, _T), Q(BURN_C, _T))
    if running > 70.0:
        result.add("watch", FROM_MEMORY,
                   "Above about {0} mineral oil ages fast (its life roughly halves for every "
                   "10 K more): aim lower if the cooler allows.", Q(70.0, _T))
