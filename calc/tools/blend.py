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

from ..kernel.errors import InputError
from ..kernel.registry import VISCOSITY, Field, Output, tool
from ..kernel.result import COMMON_PRACTICE, Q, Result

_KV = "kinematic_viscosity"
_PCT = "percent"
_VOL = "volume"

# Refutas constants (Maples 2000).
VBN_SLOPE = 14.534
VBN_OFFSET = 10.975

# Range the tool accepts [cSt]: lubricating and hydraulic oils; ln(ln(v + 0.8)) needs v > 0.2.
KV_MIN_CST = 1.0
KV_MAX_CST = 1.0e5

# ISO 3448: a grade's kinematic viscosity at 40 degC lies within +-10 % of its mid-point.
ISO_3448_TOLERANCE = 0.10
# Common practice: a change of viscosity within 5 % of the oil in service goes unnoticed.
SMALL_CHANGE = 0.05
# Common practice: more than about a tenth of another oil makes the tank a mixed oil.
MIXED_OIL_SHARE = 0.10

PARTS = 4


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


def _kv_field(n: int, default: float | None) -> Field:
    role = {1: " (oil A for a top-up)", 2: " (oil B for a top-up)"}.get(n, "")
    return Field(f"kv{n}", f"Oil {n}: viscosity{role}", _KV, default, min=KV_MIN_CST,
                 max=KV_MAX_CST, optional=default is None,
                 help="All viscosities at the same temperature, usually 40 °C."
                 + (" Leave blank if there is no such part." if default is None else ""))


def _amount_field(n: int, default: float | None) -> Field:
    return Field(f"amount{n}", f"Oil {n}: amount in the mix", "ratio", default, min=0.0,
                 max=1.0e9, optional=default is None,
                 help="Mix only: parts in any one unit (litres, kg or %), all the same unit.")


MODE_CHOICES = (("mix", "Viscosity of a mix"), ("top_up", "Top-up of oil B to reach a target"))
BASIS_CHOICES = (("volume", "Amounts by volume"), ("mass", "Amounts by mass"))


def _mix_parts(kvs: list[float | None], amounts: list[float | None]) -> tuple[list[float], list[float]]:
    """The filled-in parts; InputError for a half-filled part or nothing to mix."""
    used_kv, used_amount = [], []
    for n, (kv, amount) in enumerate(zip(kvs, amounts), start=1):
        if kv is None and amount is None:
            continue
        if kv is None:
            raise InputError(f"kv{n}", f"oil {n} has an amount but no viscosity: enter its "
                                       f"viscosity or clear its amount")
        if amount is None:
            raise InputError(f"amount{n}", f"oil {n} has a viscosity but no amount: enter its "
                                           f"amount (0 leaves it out) or clear its viscosity")
        if amount > 0:
            used_kv.append(kv)
            used_amount.append(amount)
    if not used_amount:
        raise InputError("amount1", "at least one oil needs an amount above 0")
    return used_kv, used_amount


def _mix(result: Result, kvs: list[float | None], amounts: list[float | None], basis: str) -> None:
    used_kv, used_amount = _mix_parts(kvs, amounts)
    kv_mix = blend_viscosity(used_kv, used_amount)
    total = sum(used_amount)
    main = max(range(len(used_amount)), key=lambda i: used_amount[i])
    kv_main = used_kv[main]
    result.values.update(kv_mix=kv_mix, vbn=blending_number(kv_mix),
                         share_other=100.0 * (1.0 - used_amount[main] / total))
    change = kv_mix / kv_main - 1.0
    at = (Q(kv_mix, _KV), Q(kv_main, _KV), Q(100.0 * abs(change), _PCT))
    if abs(change) <= SMALL_CHANGE:
        result.add("ok", COMMON_PRACTICE,
                   "The mix is {0}, within {2} of the main oil ({1}): the grade is unchanged; "
                   "log what was added and when.", *at)
    elif abs(change) <= ISO_3448_TOLERANCE:
        result.add("watch", "ISO 3448 (grade tolerance ±10 % of mid-point)",
                   "The mix is {0}, {2} off the main oil ({1}): near the edge of the ±10 % a "
                   "grade allows; check the pump's viscosity window at the working temperature.",
                   *at)
    else:
        result.add("act", "ISO 3448 (grade tolerance ±10 % of mid-point)",
                   "The mix is {0}, {2} off the main oil ({1}): it is no longer that grade; label "
                   "the tank as mixed oil, check the pump's viscosity window, and plan a drain "
                   "and refill if the machine needs the original grade.", *at)
    if basis == "volume":
        result.note("Amounts by volume: the blending numbers are defined on mass fractions; for "
                    "mineral oils of similar density the difference is small. Use mass for oils "
                    "of very different density (esters, glycols).")


def _top_up(result: Result, kv_a: float, kv_b: float, target: float, tank_l: float,
            capacity_l: float | None) -> None:
    if kv_a == kv_b:
        raise InputError("kv2", "oil B has the same viscosity as oil A: adding it cannot change "
                                "the viscosity")
    low, high = sorted((kv_a, kv_b))
    if not low <= target <= high or target == kv_b:
        raise InputError("target", f"must lie between oil A ({kv_a:g} cSt) and oil B "
                                   f"({kv_b:g} cSt), and not equal B: a mix of two oils always "
                                   f"lies between them")
    if capacity_l is not None and capacity_l < tank_l:
        raise InputError("capacity_l", "the tank's capacity must be at least the oil already in it")
    fraction_b = top_up_fraction(kv_a, kv_b, target)
    add_l = top_up_volume(tank_l, fraction_b)
    drain_l = 0.0
    if capacity_l is not None and tank_l + add_l > capacity_l:
        drain_l, add_l = drain_and_fill(tank_l, capacity_l, fraction_b)
    result.values.update(kv_mix=target, vbn=blending_number(target), top_up=add_l,
                         drain=drain_l, share_other=100.0 * fraction_b)
    share = Q(100.0 * fraction_b, _PCT)
    if drain_l > 0:
        result.add("watch", COMMON_PRACTICE,
                   "{0} of oil B does not fit: drain {1} of oil A first, then fill {2} of oil B "
                   "to reach {3} with a full tank.",
                   Q(top_up_volume(tank_l, fraction_b), _VOL), Q(drain_l, _VOL), Q(add_l, _VOL),
                   Q(target, _KV))
        result.note("Before draining: stop the machine, lock out and relieve pressure (lower raised "
                    "loads, discharge accumulators); oil may be hot. Contain spills and dispose of "
                    "used oil as local rules require.")
    if fraction_b > MIXED_OIL_SHARE:
        result.add("watch", COMMON_PRACTICE,
                   "Oil B will be {0} of the tank: it is now a mixed oil; label the tank, log both "
                   "oils, and confirm with the oil supplier that their additive packages are "
                   "compatible.", share)
    else:
        result.add("ok", COMMON_PRACTICE,
                   "Oil B will be {0} of the tank, a small top-up; still confirm the two oils are "
                   "compatible if they are of different makes or types.", share)
    result.note("Top-up by volume: the blending numbers are defined on mass fractions; for mineral "
                "oils of similar density the difference is small.")


@tool(
    "viscosity-blend",
    title="Blends and top-ups",
    summary="The viscosity of a mix of up to four oils, or how much of oil B to add to a tank of "
            "oil A to reach a target viscosity.",
    topic=VISCOSITY,
    inputs=(
        Field("mode", "What to work out", "choice", "mix", choices=MODE_CHOICES),
        _kv_field(1, 46.0), _amount_field(1, 80.0),
        _kv_field(2, 68.0), _amount_field(2, 20.0),
        _kv_field(3, None), _amount_field(3, None),
        _kv_field(4, None), _amount_field(4, None),
        Field("basis", "Amounts are", "choice", "volume", choices=BASIS_CHOICES,
              help="Mix only."),
        Field("tank_l", "Oil A in the tank now", _VOL, 200.0, min=0.1, max=1.0e6,
              help="Top-up only."),
        Field("capacity_l", "Tank capacity", _VOL, None, min=0.1, max=1.0e6, optional=True,
              help="Top-up only. When the top-up does not fit, the tool says how much oil A to "
                   "drain first."),
        Field("target", "Target viscosity", _KV, 50.0, min=KV_MIN_CST, max=KV_MAX_CST,
              help="Top-up only: at the same temperature as oils A and B."),
    ),
    outputs=(
        Output("kv_mix", "Viscosity of the mix", _KV, "At the temperature of the entered "
               "viscosities.", headline=True),
        Output("top_up", "Oil B to add", _VOL, headline=True),
        Output("drain", "Oil A to drain first", _VOL),
        Output("share_other", "Share of other oils", _PCT,
               "Mix: all but the largest part. Top-up: oil B in the tank afterwards."),
        Output("vbn", "Blending number of the mix", "ratio"),
    ),
)
def viscosity_blend(mode: str, kv1: float, amount1: float, kv2: float, amount2: float,
                    basis: str, tank_l: float, target: float,
                    kv3: float | None = None, amount3: float | None = None,
                    kv4: float | None = None, amount4: float | None = None,
                    capacity_l: float | None = None) -> Result:
    """Mix result or top-up volume by the Refutas blending numbers (ASTM D7152 practice)."""
    result = Result(values={})
    if mode == "mix":
        _mix(result, [kv1, kv2, kv3, kv4], [amount1, amount2, amount3, amount4], basis)
    else:
        _top_up(result, kv1, kv2, target, tank_l, capacity_l)
    result.note("All viscosities must be at the same temperature (usually {0}); the result is "
                "at that temperature.", Q(40.0, "temperature"))
    result.note("Oils of different makes or types (zinc and zinc-free antiwear, mineral and "
                "synthetic, fire-resistant fluids) can react: additives drop out, filters plug, "
                "foam rises. Check compatibility with the oil supplier before mixing.")
    result.sources += [
        "ASTM D7152 practice (the standard also describes other blending methods; from memory)",
        "Refutas blending number VBN = 14.534 ln(ln(v + 0.8)) + 10.975: R. E. Maples, Petroleum "
        "Refinery Process Economics, 2nd ed. (2000)",
        "ISO 3448: grade tolerance ±10 % of mid-point",
    ]
    return result
