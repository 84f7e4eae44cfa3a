"""Entrained air and the stiffness of the oil column: "spongy controls" in numbers.

Air bubbles in oil act as soft springs in series with the oil. With x the volume
fraction of free air at the pressure p (absolute):

    1 / K_eff = (1 - x) / K_oil + x / K_air         (mixture rule, series compliance)
    K_air = n * p       n = 1 isothermal (slow), n = 1.4 adiabatic (fast, air)

A fraction x0 measured at atmospheric pressure p0 shrinks as the oil is pressed
along a path p V^m = const (oil at constant tangent modulus K_oil):

    V_air = x0 (p0 / p)^(1/m)      V_oil = (1 - x0) exp(-(p - p0) / K_oil)
    x = V_air / (V_air + V_oil)

At a steady working pressure the air has settled to the oil's temperature, so
its fraction there is the isothermal one (m = 1) whatever the process; n = 1.4
then applies to fast changes about that pressure. The column pressed from
atmospheric to a load follows m = n. Along such a path the tangent modulus
-V dp/dV is exactly the mixture rule with m = n, so the column's volume change
from p0 to p1 is the closed form V0 - (V_air + V_oil) at p1. Air that dissolves in the oil under pressure is
ignored: the bubbles are taken to stay free, the softer (worse) case.

Sources: Boyle's law and the isentropic p V^1.4 = const for air; the mixture rule
in the form of H. E. Merritt, "Hydraulic Control Systems" (Wiley, 1967), ch. 2
(from memory); mineral oil's bulk modulus about 16 000 bar, from memory.
"""

from __future__ import annotations

import math

from ..kernel.errors import InputError
from ..kernel.registry import AIR, Field, Output, tool
from ..kernel.result import COMMON_PRACTICE, Q, Result

K_OIL_BAR = 16000.0  # air-free mineral hydraulic oil, about 14 000 to 18 000 bar: from memory
P_ATM_BAR = 1.013  # standard atmosphere 1.01325 bar (ISO 2533), rounded
GAS_EXPONENTS = {"isothermal": 1.0, "adiabatic": 1.4}  # air, ratio of specific heats 1.4
PROCESS_CHOICES = (("isothermal", "Slow (isothermal)"), ("adiabatic", "Fast (adiabatic)"))
LOAD_PRESSURE_MAX_BAR = 1000.0
# Verdict thresholds, common practice (a judgement, from memory): loss of stiffness at the
# working pressure that is worth a look, and that wants action.
LOSS_WATCH_PCT = 5.0
LOSS_ACT_PCT = 25.0

_P = "pressure"
_MM = "length"
_PCT = "percent"


def air_fraction_at_pressure(x0: float, p_abs_bar: float, p0_abs_bar: float = P_ATM_BAR,
                             n: float = 1.0, k_oil_bar: float = K_OIL_BAR) -> float:
    """Volume fraction of free air at `p_abs_bar` from `x0` measured at `p0_abs_bar` (absolute).

    x = x0 (p0/p)^(1/n) / (x0 (p0/p)^(1/n) + (1 - x0) exp(-(p - p0) / K_oil))

    n : exponent of the compression path p V^n = const: 1 for air settled at the oil's
        temperature (isothermal, Boyle), 1.4 for a fast squeeze (adiabatic)

    >>> round(air_fraction_at_pressure(0.01, 101.3, 1.013), 6)
    0.000102
    """
    air = x0 * (p0_abs_bar / p_abs_bar) ** (1.0 / n)
    oil = (1.0 - x0) * math.exp(-(p_abs_bar - p0_abs_bar) / k_oil_bar)
    return air / (air + oil)


def effective_bulk_modulus(k_oil_bar: float, air_fraction: float, p_abs_bar: float,
                           n: float = 1.0) -> float:
    """Bulk modulus [bar] of oil holding `air_fraction` of free air at `p_abs_bar` (absolute).

    1 / K_eff = (1 - x) / K_oil + x / (n p)

    >>> round(effective_bulk_modulus(16000.0, 0.01, 100.0, 1.4), 1)
    7501.7
    >>> effective_bulk_modulus(16000.0, 0.0, 100.0)
    16000.0

    Source: mixture rule as in Merritt (1967), from memory.
    """
    return 1.0 / ((1.0 - air_fraction) / k_oil_bar + air_fraction / (n * p_abs_bar))


def column_compression(volume: float, x0: float, p0_abs_bar: float, p1_abs_bar: float,
                       n: float = 1.0, k_oil_bar: float = K_OIL_BAR) -> float:
    """Volume lost [same unit as `volume`] when a column with air fraction `x0` at `p0` is pressed to `p1`.

    dV = V0 - V0 [x0 (p0/p1)^(1/n) + (1 - x0) exp(-(p1 - p0) / K_oil)]

    >>> round(column_compression(1.0, 0.0, 1.0, 161.0, 1.0, 16000.0), 6)
    0.00995
    >>> round(column_compression(1.0, 0.01, 1.0, 2.0, 1.0, 1.0e12), 6)
    0.005
    """
    air = x0 * (p0_abs_bar / p1_abs_bar) ** (1.0 / n)
    oil = (1.0 - x0) * math.exp(-(p1_abs_bar - p0_abs_bar) / k_oil_bar)
    return volume * (1.0 - air - oil)


def piston_area_mm2(bore_mm: float) -> float:
    """pi/4 d^2 [mm^2].

    >>> round(piston_area_mm2(100.0))
    7854
    """
    return math.pi / 4.0 * bore_mm ** 2


def load_pressure_bar(load_kn: float, bore_mm: float) -> float:
    """Pressure [bar] under a piston of `bore_mm` carrying `load_kn` [kN]: F / A.

    >>> round(load_pressure_bar(100.0, 100.0), 2)
    127.32
    """
    return load_kn * 1000.0 / piston_area_mm2(bore_mm) * 10.0  # N/mm^2 = MPa = 10 bar


@tool(
    "air-stiffness",
    title="Air in the oil and spongy motion",
    summary="How much entrained air softens the oil at the working pressure, and how far a "
            "cylinder gives under its load because of it.",
    topic=AIR,
    inputs=(
        Field("air", "Free air in the oil, at atmospheric pressure", _PCT, 1.0, min=0.0,
              max=50.0, help="Volume of bubbles per volume of oil, as in a sample that has "
                             "just been drawn (milky oil holds several per cent)."),
        Field("pressure", "Working pressure (gauge)", _P, 160.0, min=0.0, max=1000.0),
        Field("process", "How fast the pressure changes", "choice", "isothermal",
              choices=PROCESS_CHOICES,
              help="Slow: the air keeps the oil's temperature. Fast (valve switching, shock): "
                   "the air heats as it is squeezed and is stiffer."),
        Field("k_oil", "Bulk modulus of air-free oil", _P, K_OIL_BAR, min=1000.0, max=50000.0,
              help="About 16 000 bar for mineral oil (from memory); water glycols and esters "
                   "differ: use the oil maker's figure."),
        Field("atmosphere", "Atmospheric pressure (absolute)", _P, P_ATM_BAR, min=0.5, max=1.1),
        Field("bore", "Cylinder bore", _MM, 100.0, min=5.0, max=2000.0),
        Field("stroke", "Oil column length (stroke)", _MM, 500.0, min=1.0, max=20000.0,
              help="Length of the oil column under the piston: the full stroke when extended."),
        Field("line_volume", "Oil in the lines to the cylinder", "volume", 0.0, min=0.0,
              max=10000.0, help="Oil between the valve and the cylinder, which is pressed too."),
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
        raise InputError("load", f"needs more than {LOAD_PRESSURE_MAX_BAR:g} bar on this bore; "
                                 "check the load and the bore")
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
    at = (Q(air, _PCT), Q(pressure, _P), Q(loss, _PCT), Q(give - give_free, _MM), Q(give_free, _MM))
    if x0 == 0.0:
        result.add("ok", COMMON_PRACTICE,
                   "With no free air the column is as stiff as the oil itself; its give under "
                   "the load is {4}.", *at)
    elif loss >= LOSS_ACT_PCT:
        result.add("act", COMMON_PRACTICE,
                   "{0} of air makes the oil {2} softer at {1}: expect spongy, lagging and "
                   "unsteady motion; find where air gets in (suction leaks, return above the "
                   "oil level, low level), let the oil de-aerate, and bleed the circuit.", *at)
    elif loss >= LOSS_WATCH_PCT or give - give_free >= give_free:
        result.add("watch", COMMON_PRACTICE,
                   "{0} of air makes the oil {2} softer at {1} and adds {3} of give to the "
                   "cylinder (air-free: {4}): look for where the air gets in.", *at)
    else:
        result.add("ok", COMMON_PRACTICE,
                   "{0} of air makes the oil {2} softer at {1} and adds {3} of give to the "
                   "cylinder.", *at)
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
