"""Blends and top-ups: the viscosity of a mix of oils, and how much of oil B reaches a target.

Each oil's kinematic viscosity v [cSt] is turned into a viscosity blending number

    VBN = 14.534 ln(ln(v + 0.8)) + 10.975

which mixes linearly: VBN_mix = sum x_i VBN_i, with x_i the fraction of each part (by mass
in the original method; by volume it is close for mineral oils of similar density). The mix's
viscosity is the back-transform v = exp(exp((VBN - 10.975) / 14.534)) - 0.8. All viscosities
must be at the same temperature; the result is at that temperature.

Source: the Refutas blending number as given in R. E. Maples, "Petroleum Refinery Process
Economics", 2nd ed., PennWell (2000), used in the practice of ASTM D7152 ("Calculating
Viscosity of a Blend of Petroleum Products"), which also describes other blending methods
(from memory of the standard).
"""

from __future__ import annotations

import math


# Refutas constants (Maples 2000).
VBN_SLOPE = 14.534


VBN_OFFSET = 10.975


def blending_number(kv_cst: float) -> float:
    """Refutas viscosity blending number of a kinematic viscosity [cSt].

    VBN = 14.534 ln(ln(v + 0.8)) + 10.975

    >>> round(blending_number(46.0), 3)
    30.552

    Source: Maples (2000), the Refutas equation.
    """
    return VBN_SLOPE * math.log(math.log(kv_cst + 0.8)) + VBN_OFFSET


def viscosity_from_blending_number(vbn: float) -> float:
    """Kinematic viscosity [cSt] whose Refutas blending number is `vbn`.

    v = exp(exp((VBN - 10.975) / 14.534)) - 0.8

    >>> round(viscosity_from_blending_number(blending_number(68.0)), 9)
    68.0
    """
    return math.exp(math.exp((vbn - VBN_OFFSET) / VBN_SLOPE)) - 0.8


def blend_viscosity(kvs_cst: list[float], amounts: list[float]) -> float:
    """Kinematic viscosity [cSt] of a mix of oils with viscosities `kvs_cst` at one temperature.

    `amounts` are the parts of each oil in any one unit (litres, kg, %); they are
    normalised to fractions x_i, and VBN_mix = sum x_i VBN_i.

    >>> round(blend_viscosity([46.0, 68.0], [50.0, 50.0]), 2)
    55.68

    Source: ASTM D7152 practice with the Refutas blending number (Maples 2000).
    """
    total = sum(amounts)
    vbn = sum(a * blending_number(kv) for kv, a in zip(kvs_cst, amounts)) / total
    return viscosity_from_blending_number(vbn)


def top_up_fraction(kv_a_cst: float, kv_b_cst: float, target_cst: float) -> float:
    """Fraction of oil B in a mix of A and B that has viscosity `target_cst` [cSt].

    x_B = (VBN_target - VBN_A) / (VBN_B - VBN_A); the target must lie between A and B.

    >>> round(top_up_fraction(46.0, 68.0, blend_viscosity([46.0, 68.0], [3.0, 1.0])), 12)
    0.25
    """
    vbn_a = blending_number(kv_a_cst)
    return (blending_number(target_cst) - vbn_a) / (blending_number(kv_b_cst) - vbn_a)


def top_up_volume(tank_l: float, fraction_b: float) -> float:
    """Litres of oil B to add to `tank_l` litres of oil A so that B is `fraction_b` of the mix.

    V_B = V_A x_B / (1 - x_B)

    >>> top_up_volume(300.0, 0.25)
    100.0
    """
    return tank_l * fraction_b / (1.0 - fraction_b)


def drain_and_fill(tank_l: float, capacity_l: float, fraction_b: float) -> tuple[float, float]:
    """(litres of A to drain, litres of B to fill) to reach `fraction_b` with a full tank.

    With the tank filled to `capacity_l`: B = x_B C and the drain D = x_B C - (C - V_A).

    >>> drain_and_fill(300.0, 320.0, 0.25)
    (60.0, 80.0)
    """
    fill = fraction_b * capacity_l
    return fill - (capacity_l - tank_l), fill
