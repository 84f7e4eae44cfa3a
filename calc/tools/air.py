"""The air-stiffness tool: the entrained-air mixture rule of calc.methods.air at the working
pressure, and how far a cylinder gives under its load because of the air.
"""

from __future__ import annotations

from ..kernel.constants import ATMOSPHERE_ROUNDED_BAR
from ..kernel.errors import InputError
from ..kernel.grading import Band
from ..kernel.registry import AIR, Field, Output, tool
from ..kernel.result import COMMON_PRACTICE, Q, Result
from ..methods.air import (GAS_EXPONENTS, K_OIL_BAR, air_fraction_at_pressure, column_compression,
                           effective_bulk_modulus, load_pressure_bar, piston_area_mm2)

PROCESS_CHOICES = (("isothermal", "Slow (isothermal)"), ("adiabatic", "Fast (adiabatic)"))
LOAD_PRESSURE_MAX_BAR = 1000.0
# Verdict thresholds, common practice (a judgement, from memory): loss of stiffness at the
# working pressure that is worth a look, and that wants action.
LOSS_WATCH_PCT = 5.0
LOSS_ACT_PCT = 25.0

_P = "pressure"
_MM = "length"
_PCT = "percent"

NO_AIR_BANDS = (
    Band("ok", "With no free air the column is as stiff as the oil itself; its give under the "
               "load is {give_free}."),
)
# The loss of stiffness at the working pressure (common practice, from memory).
LOSS_BANDS = (
    Band("act", "{air} of air makes the oil {loss} softer at {pressure}: expect spongy, lagging "
                "and unsteady motion; find where air gets in (suction leaks, return above the oil "
                "level, low level), let the oil de-aerate, and bleed the circuit.",
         at_least=LOSS_ACT_PCT),
    Band("watch", "{air} of air makes the oil {loss} softer at {pressure}: look for where the air "
                  "gets in.", at_least=LOSS_WATCH_PCT),
    Band("ok", "{air} of air makes the oil only {loss} softer at {pressure}."),
)
# The cylinder's extra give from the air, as a share of its stroke (common practice, from
# memory): a positioning or holding job notices a few tenths of a per cent.
GIVE_WATCH_PCT = 1.0
GIVE_ACT_PCT = 5.0
GIVE_BANDS = (
    Band("act", "The air adds {extra} of give to the cylinder ({share} of its stroke; air-free "
                "oil gives {give_free}): loads sag and stop positions drift; find where the air "
                "gets in and bleed the circuit before any precise or holding work.",
         at_least=GIVE_ACT_PCT),
    Band("watch", "The air adds {extra} of give to the cylinder ({share} of its stroke; air-free "
                  "oil gives {give_free}): positions wander as the load changes.",
         at_least=GIVE_WATCH_PCT),
    Band("ok", "The air adds {extra} of give to the cylinder ({share} of its stroke), little "
               "against the stroke."),
)


@tool(
    "air-stiffness",
    title="Air in the oil and spongy motion",
    summary="How much entrained air softens the oil at the working pressure, and how far a "
            "cylinder gives under its load because of it.",
    topic=AIR,
    inputs=(
        Field("air", "Free air in the oil, at atmospheric pressure", _PCT, 1.0, min=0.0,
              max=50.0, help="Volume of bubbles per volume of oil, as in a sample that has "
                             "just been drawn (milky oil holds several per cent).", usual=(0.0, 15.0)),
        Field("pressure", "Working pressure (gauge)", _P, 160.0, min=0.0, max=1000.0,
              binds="working_pressure"),
        Field("process", "How fast the pressure changes", "choice", "isothermal",
              choices=PROCESS_CHOICES,
              help="Slow: the air keeps the oil's temperature. Fast (valve switching, shock): "
                   "the air heats as it is squeezed and is stiffer."),
        Field("k_oil", "Bulk modulus of air-free oil", _P, K_OIL_BAR, min=1000.0, max=50000.0,
              help="About 16 000 bar for mineral oil (from memory); water glycols and esters "
                   "differ: use the oil maker's figure.", usual=(12000.0, 20000.0), group="limits"),
        Field("atmosphere", "Atmospheric pressure (absolute)", "absolute_pressure",
              ATMOSPHERE_ROUNDED_BAR, min=0.5,
              max=1.1, usual=(0.75, 1.05), group="limits"),
        Field("bore", "Cylinder bore", _MM, 100.0, min=5.0, max=2000.0, usual=(16.0, 500.0)),
        Field("stroke", "Oil column length (stroke)", _MM, 500.0, min=1.0, max=20000.0,
              help="Length of the oil column under the piston: the full stroke when extended.", usual=(10.0, 5000.0)),
        Field("line_volume", "Oil in the lines to the cylinder", "volume", 0.0, min=0.0,
              max=10000.0, help="Oil between the valve and the cylinder, which is pressed too.", usual=(0.0, 1000.0)),
        Field("load", "Load on the cylinder", "force", 100.0, min=0.0, max=100000.0),
    ),
    outputs=(
        Output("air_at_pressure", "Free air at working pressure", _PCT),
        Output("k_air", "Bulk modulus of the air", _P),
        Output("k_eff", "Effective bulk modulus", _P),
        Output("stiffness_loss", "Loss of stiffness against air-free oil", _PCT, headline=True),
        Output("load_pressure", "Pressure to carry the load", _P),
        Output("lost_motion", "Give of the cylinder under the load", _MM,
               "How far the piston sinks (or lags) while the oil column is pressed from "
               "atmospheric to the load pressure.", headline=True),
        Output("lost_motion_air_free", "Same, with air-free oil", _MM),
        Output("lost_motion_air", "Extra give caused by the air", _MM),
    ),
)
def air_stiffness(air: float, pressure: float, process: str, k_oil: float, atmosphere: float,
                  bore: float, stroke: float, line_volume: float, load: float) -> Result:
    """Effective bulk modulus at the working pressure, and the cylinder's give under the load."""
    n = GAS_EXPONENTS[process]
    x0 = air / 100.0
    p_abs = atmosphere + pressure
    p_load = load_pressure_bar(load, bore)
    if p_load > LOAD_PRESSURE_MAX_BAR:
        raise InputError("load", "needs more than {most} on this bore; check the load and the "
                                 "bore", most=Q(LOAD_PRESSURE_MAX_BAR, _P))
    x = air_fraction_at_pressure(x0, p_abs, atmosphere, 1.0, k_oil)  # settled: isothermal
    k_eff = effective_bulk_modulus(k_oil, x, p_abs, n)
    area = piston_area_mm2(bore)
    column_mm3 = area * stroke + line_volume * 1.0e6
    p1 = atmosphere + p_load
    give = column_compression(column_mm3, x0, atmosphere, p1, n, k_oil) / area
    give_free = column_compression(column_mm3, 0.0, atmosphere, p1, n, k_oil) / area
    loss = 100.0 * (1.0 - k_eff / k_oil)
    result = Result(values={
        "air_at_pressure": 100.0 * x, "k_air": n * p_abs, "k_eff": k_eff,
        "stiffness_loss": loss, "load_pressure": p_load, "lost_motion": give,
        "lost_motion_air_free": give_free, "lost_motion_air": give - give_free,
    })
    extra = give - give_free
    named = dict(air=Q(air, _PCT), pressure=Q(pressure, _P), loss=Q(loss, _PCT),
                 extra=Q(extra, _MM), give_free=Q(give_free, _MM))
    if x0 == 0.0:
        result.grade(loss, NO_AIR_BANDS, COMMON_PRACTICE, **named)
    else:
        share = 100.0 * extra / stroke
        result.grade(loss, LOSS_BANDS, COMMON_PRACTICE, **named)
        result.grade(share, GIVE_BANDS, COMMON_PRACTICE, share=Q(share, _PCT), **named)
    if p_load > pressure:
        result.note("The load needs {0}, more than the working pressure {1}: the cylinder "
                    "cannot hold or lift it.", Q(p_load, _P), Q(pressure, _P))
    result.note("Free air is taken to stay as bubbles; under pressure some dissolves over "
                "seconds to minutes, so real oil may be somewhat stiffer than shown.")
    result.note("Air squeezed fast heats up and can ignite oil vapour (dieseling), which "
                "darkens the oil and burns seals.")
    result.note("A spongy cylinder can sag or jump when the load changes: support raised loads "
                "mechanically and lock out before working under them. Never bleed air by "
                "loosening a fitting under pressure: oil jets inject through skin.")
    result.sources += ["Mixture rule 1/K = (1-x)/K_oil + x/(n p), as in H. E. Merritt, "
                       "Hydraulic Control Systems (1967), from memory",
                       "Air: Boyle's law (isothermal), p V^1.4 = const (adiabatic)",
                       "Oil bulk modulus default 16 000 bar: from memory"]
    return result
