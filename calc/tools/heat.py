"""The tank-heat tool: the heat balance of calc.methods.heat on the tank's own surfaces, with
its steady and warm-up temperatures judged against the target and the burn limit.
"""

from __future__ import annotations

from functools import partial
from typing import Callable

from ..kernel import chart, units
from ..kernel.errors import InputError
from ..kernel.grading import Band
from ..kernel.registry import TANK, Field, Output, tool
from ..kernel.result import COMMON_PRACTICE, FROM_MEMORY, Q, Result
from ..methods.convection import radiation_coefficient
from ..methods.heat import (STEEL_DENSITY_KG_PER_M3, heat_capacity_kj_per_k,
                            heat_load_from_power_kw, heat_load_from_throttle_kw, shed_kw,
                            steady_temperature_c, tank_shell_area_m2, tank_surfaces,
                            time_to_temperature_min)
from ..methods.tank import volume_at_level_l
from .tank import check_level, shape_fields

# Surfaces hotter than this burn skin on contact within seconds (common practice).
BURN_C = 60.0
# Above about this mineral oil ages fast (from memory).
FAST_AGEING_C = 70.0
# Above about this nitrile seals harden and mineral hydraulic oil breaks down: no machine
# should run there (common practice, from memory; fluoroelastomer seals take more, the oil
# does not). Mineral hydraulic oils flash from about 200 degC (from memory).
NOT_REACHABLE_C = 100.0
FLASH_POINT_C = 200.0
# Above about this the oil runs too hot to leave it so: act (common practice, from memory;
# the same line as the overheating checklist's).
HOT_OIL_ACT_C = 80.0

# No steady state in reach: the tank alone cannot carry the load.
NO_STEADY_BANDS = (
    Band("act", "The tank alone cannot shed {load} at any temperature the oil and seals survive "
                "(it would pass {limit}, and the oil's flash point of about {flash}, long "
                "before it settled): this circuit must not run like this; it needs a cooler of at least "
                "{cooler}, or less heat (a lower relief setting, an unloading circuit)."),
)
# Where the tank alone would settle, against the target and the hot-oil line (common
# practice): a few kelvin over the target is a cooler to plan, hot oil is a cooler to fit.
COOLER_BANDS = (
    Band("act", "The tank alone would settle at {steady}, above {hot}, where the oil ages fast "
                "and seals suffer: a cooler of at least {cooler} (plus margin) is needed; do not "
                "run without it.", over="hot"),
    Band("watch", "The tank alone would settle at {steady}, above the target {target}: a cooler "
                  "of at least {cooler}, more air over the tank or a little less heat keeps it at "
                  "the target.", over="target"),
    Band("ok", "The tank alone settles at {steady}, at or below the target {target}: no cooler "
               "is needed at this load and air temperature."),
)
RUNNING_BANDS = (
    Band("watch", "The tank runs at about {running}: surfaces above {burn} burn skin; guard or "
                  "mark them and wear gloves.", over=BURN_C, basis=COMMON_PRACTICE),
)
AGEING_BANDS = (
    Band("watch", "Above about {fast} mineral oil ages fast (its life roughly halves for every "
                  "10 K more): aim lower if the cooler allows.", over=FAST_AGEING_C,
         basis=FROM_MEMORY),
)

SURFACE_CHOICES = (("wetted", "Walls below the oil level (cautious)"),
                   ("all", "All walls and the top (optimistic)"))
LOAD_CHOICES = (("power", "From input power and efficiency"),
                ("throttle", "From flow and pressure drop (relief, throttle)"))


CHART_W, CHART_H = 400.0, 330.0
_CHART_BOX = (52.0, 34.0, 334.0, 236.0)  # left, top, width, height of the plot, viewBox units


def warmup_chart(load_kw: float, loss_kw: Callable[[float], float], capacity_kj_per_k: float,
                 start_c: float, steady_c: float | None, target_c: float,
                 system: str = "metric") -> str:
    """SVG of the oil temperature against time for the tank alone, with the target and the
    skin-burn line; the curve runs to 95 % of the way to steady (or, with no steady state in
    reach, to NOT_REACHABLE_C, which the caller makes sure lies above the start).
    Temperatures are labelled in `system` units, ticks round in the shown unit."""
    end_c = NOT_REACHABLE_C if steady_c is None else start_c + 0.95 * (steady_c - start_c)
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
    steady_text = (f"no steady state below {show(NOT_REACHABLE_C)}" if steady_c is None
                   else f"steady {show(steady_c)}")
    title = f"Oil temperature of the tank alone from {show(start_c)}: {steady_text}"
    desc = ("Oil temperature against hours from start, with the target as a dashed line, the "
            "skin-burn temperature as a dotted line and the steady temperature as a long-dashed "
            "line.")
    return chart.document(CHART_W, CHART_H, title, desc, body, "chart chart-warmup")


_T = "temperature"
_KW = "power"
_H = "heat_transfer"


@tool(
    "tank-heat",
    title="Tank heat balance",
    summary="Heat the circuit puts into the oil, what the tank sheds by itself, the oil "
            "temperature it settles at, the warm-up time and the cooler needed for a target.",
    topic=TANK,
    renamed={"flow": "throttle_flow", "level": "working_level", "target": "target_temp"},
    inputs=(
        Field("load_from", "Heat load", "choice", "power", choices=LOAD_CHOICES),
        Field("power", "Power into the pump", _KW, 7.5, min=0.0, max=5000.0,
              help="Motor shaft power averaged over the cycle.", when=("load_from", "power")),
        Field("efficiency", "Overall efficiency of the circuit", "percent", 80.0, min=0.0,
              max=100.0, help="Share of the input power that leaves as useful work.", usual=(50.0, 95.0), when=("load_from", "power")),
        Field("throttle_flow", "Flow through the relief or throttle", "flow", 60.0, min=0.0,
              max=1.0e5, when=("load_from", "throttle")),
        Field("dp", "Pressure drop across it", "pressure", 150.0, min=0.0, max=1000.0, when=("load_from", "throttle")),
    ) + shape_fields() + (
        Field("working_level", "Working oil level", "length", 550.0, min=0.0, max=20000.0,
              binds="working_level",
              help="From the inside bottom of the tank to the oil surface at work.", usual=(50.0, 5000.0)),
        Field("surfaces", "Surfaces that shed heat", "choice", "wetted", choices=SURFACE_CHOICES),
        Field("emissivity", "Emissivity of the tank surface", "ratio", 0.9, min=0.02, max=1.0,
              help="About 0.9 for painted steel, 0.1 to 0.3 for bare or galvanised sheet "
                   "(from memory).", usual=(0.1, 0.98), group="limits"),
        Field("wall", "Wall thickness", "length", 3.0, min=0.5, max=50.0, usual=(1.5, 12.0), group="machine"),
        Field("ambient", "Air temperature around the tank", _T, 25.0, min=-40.0, max=60.0,
              binds="ambient", usual=(-30.0, 50.0)),
        Field("start", "Oil temperature at start", _T, None, min=-40.0, max=150.0, optional=True,
              help="Blank: the oil starts at the air temperature."),
        Field("target_temp", "Target oil temperature", _T, 55.0, min=-30.0, max=150.0,
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
def tank_heat(load_from: str, power: float, efficiency: float, throttle_flow: float, dp: float,
              shape: str, length: float, width: float, height: float, diameter: float,
              working_level: float, surfaces: str, emissivity: float, wall: float,
              ambient: float, target_temp: float, start: float | None = None) -> Result:
    """Heat load against the tank's own shedding: steady temperature, warm-up, cooler duty."""
    flow, level, target = throttle_flow, working_level, target_temp
    check_level(shape, height, diameter, level, "working_level")
    if level <= 0.0:
        raise InputError("working_level", "the tank must hold some oil: enter a level above the "
                                          "bottom")
    if target <= ambient:
        raise InputError("target_temp", "the target must be above the air temperature: a tank "
                                   "cannot shed heat to warmer air")
    start_c = ambient if start is None else start
    load = (heat_load_from_power_kw(power, efficiency) if load_from == "power"
            else heat_load_from_throttle_kw(flow, dp))
    faces = tank_surfaces(shape, length, width, height, diameter, level, surfaces)
    loss = lambda t: shed_kw(faces, emissivity, t, ambient)  # noqa: E731
    # A steady state past what oil and seals survive is no state the machine can reach.
    steady = steady_temperature_c(load, loss, ambient, cap_c=NOT_REACHABLE_C)
    oil = volume_at_level_l(shape, length, width, height, diameter, level)
    steel_kg = (tank_shell_area_m2(shape, length, width, height, diameter) * wall * 1e-3
                * STEEL_DENSITY_KG_PER_M3)
    capacity = heat_capacity_kj_per_k(oil, steel_kg)
    area = sum(a for a, _, _ in faces)
    if area < 1e-6:
        raise InputError("working_level", "almost no tank surface is wetted at this level: enter the "
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
    if (start_c < NOT_REACHABLE_C) if steady is None else abs(steady - start_c) > 0.5:
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
    named = dict(load=Q(load, _KW), cooler=Q(cooler, _KW), target=Q(target, _T))
    if steady is None:
        result.grade(load, NO_STEADY_BANDS, COMMON_PRACTICE, limit=Q(NOT_REACHABLE_C, _T),
                     flash=Q(FLASH_POINT_C, _T), **named)
    else:
        result.grade(steady, COOLER_BANDS, COMMON_PRACTICE, steady=Q(steady, _T),
                     hot=Q(HOT_OIL_ACT_C, _T), **named)
    running = target if steady is None else min(steady, target)
    result.grade(running, RUNNING_BANDS, running=Q(running, _T), burn=Q(BURN_C, _T))
    result.grade(running, AGEING_BANDS, fast=Q(FAST_AGEING_C, _T))
