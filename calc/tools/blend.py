"""The blends and top-ups tool: the Refutas blending numbers of calc.methods.blend, judged
against the ISO 3448 grade band.
"""

from __future__ import annotations

from ..kernel.errors import InputError
from ..kernel.grading import Band, as_stated
from ..kernel.registry import VISCOSITY, Field, Output, tool
from ..kernel.result import COMMON_PRACTICE, Q, Result
from ..methods.blend import (blend_viscosity, blending_number, drain_and_fill, top_up_fraction,
                             top_up_volume)
from ..methods.iso3448 import GRADE_CHOICES, grade_containing, grade_limits

_KV = "kinematic_viscosity"
_PCT = "percent"
_VOL = "volume"


# Range the tool accepts [cSt]: lubricating and hydraulic oils; ln(ln(v + 0.8)) needs v > 0.2.
KV_MIN_CST = 1.0
KV_MAX_CST = 1.0e5

# ISO 3448: a grade's kinematic viscosity at 40 degC lies within +-10 % of its mid-point.
ISO_3448_TOLERANCE = 0.10
# Common practice: a change of viscosity within 5 % of the oil in service goes unnoticed.
SMALL_CHANGE = 0.05
# Common practice: more than about a tenth of another oil makes the tank a mixed oil.
MIXED_OIL_SHARE = 0.10
ISO_3448_BASIS = "ISO 3448 (grade tolerance ±10 % of mid-point)"

# The mix against the ISO 3448 band of the grade that should be in the tank (graded on the
# mix's KV40 rounded as the grade's limits are written), and, inside it, against the main
# oil it was made from (common practice: within 5 % goes unnoticed).
MIX_GRADE_BANDS = (
    Band("act", "The mix is {mix}, above {grade} ({low} to {high}): the tank no longer holds that "
                "grade; label it as mixed oil, check the pump's viscosity window, and plan a "
                "drain and refill if the machine needs {grade}.", over="high"),
    Band("act", "The mix is {mix}, below {grade} ({low} to {high}): the tank no longer holds that "
                "grade; label it as mixed oil, check the pump's viscosity window, and plan a "
                "drain and refill if the machine needs {grade}.", under="low"),
)
MIX_CHANGE_BANDS = (
    Band("ok", "The mix is {mix}, within {change} of the main oil ({main}) and inside {grade}: "
               "log what was added and when.", at_most=SMALL_CHANGE, basis=COMMON_PRACTICE),
    Band("watch", "The mix is {mix}, {change} off the main oil ({main}), still inside {grade} "
                  "({low} to {high}): check the pump's viscosity window at the working "
                  "temperature.", basis=COMMON_PRACTICE),
)
# With no grade to hold to, the change from the main oil against the ±10 % a grade spans.
MIX_BANDS = (
    Band("ok", "The mix is {mix}, within {change} of the main oil ({main}): log what was added "
               "and when.", at_most=SMALL_CHANGE, basis=COMMON_PRACTICE),
    Band("watch", "The mix is {mix}, {change} off the main oil ({main}): near the ±10 % an ISO "
                  "grade spans; check the pump's viscosity window at the working temperature.",
         at_most=ISO_3448_TOLERANCE),
    Band("act", "The mix is {mix}, {change} off the main oil ({main}): more than an ISO grade "
                "spans; label the tank as mixed oil, check the pump's viscosity window, and plan "
                "a drain and refill if the machine needs the original oil."),
)
# A top-up's target against the grade that should be in the tank.
TARGET_GRADE_BANDS = (
    Band("watch", "The target {target} lies outside {grade} ({low} to {high}): the tank would no "
                  "longer hold that grade.", over="high"),
    Band("watch", "The target {target} lies outside {grade} ({low} to {high}): the tank would no "
                  "longer hold that grade.", under="low"),
)
MAIN_GRADE = "main"
EXPECTED_CHOICES = ((MAIN_GRADE, "The main oil's grade"),) + GRADE_CHOICES


def expected_grade(choice: str, kv_main: float) -> str | None:
    """The grade the tank should hold: the one chosen, or the one the main oil is inside."""
    return grade_containing(kv_main) if choice == MAIN_GRADE else choice


def _grade_named(grade: str) -> dict:
    low, high = grade_limits(grade)
    return {"grade": Q(grade, "text"), "low": Q(low, _KV), "high": Q(high, _KV)}


# A top-up by the share of oil B in the tank afterwards (common practice).
SHARE_BANDS = (
    Band("watch", "Oil B will be {share} of the tank: it is now a mixed oil; label the tank, log "
                  "both oils, and confirm with the oil supplier that their additive packages are "
                  "compatible.", over=MIXED_OIL_SHARE),
    Band("ok", "Oil B will be {share} of the tank, a small top-up; still confirm the two oils "
               "are compatible if they are of different makes or types."),
)
DRAIN_BANDS = (  # common practice
    Band("watch", "{add} of oil B does not fit: drain {drain} of oil A first, then fill {fill} of "
                  "oil B to reach {target} with a full tank.", over=0.0),
)


def _kv_field(n: int, default: float | None) -> Field:
    role = {1: " (oil A for a top-up)", 2: " (oil B for a top-up)"}.get(n, "")
    return Field(f"kv{n}", f"Oil {n}: viscosity{role}", _KV, default, min=KV_MIN_CST,
                 max=KV_MAX_CST, optional=default is None,
                 help="All viscosities at the same temperature, usually 40 °C."
                 + (" Leave blank if there is no such part." if default is None else ""))


def _amount_field(n: int, default: float | None) -> Field:
    return Field(f"amount{n}", f"Oil {n}: amount in the mix", "ratio", default, min=0.0,
                 max=1.0e9, optional=default is None,
                 help="Mix only: parts in any one unit (litres, kg or %), all the same unit.", usual=(0.0, 1.0e9), when=("mode", "mix"))


MODE_CHOICES = (("mix", "Viscosity of a mix"), ("top_up", "Top-up of oil B to reach a target"))
BASIS_CHOICES = (("volume", "Amounts by volume"), ("mass", "Amounts by mass"))


def _mix_parts(kvs: list[float | None], amounts: list[float | None]) -> tuple[list[float], list[float]]:
    """The filled-in parts; InputError for a half-filled part or nothing to mix."""
    used_kv, used_amount = [], []
    for n, (kv, amount) in enumerate(zip(kvs, amounts), start=1):
        if kv is None and amount is None:
            continue
        if kv is None:
            raise InputError(f"kv{n}", "oil {n} has an amount but no viscosity: enter its "
                                       "viscosity or clear its amount", n=Q(float(n), "count"))
        if amount is None:
            raise InputError(f"amount{n}", "oil {n} has a viscosity but no amount: enter its "
                                           "amount (0 leaves it out) or clear its viscosity",
                             n=Q(float(n), "count"))
        if amount > 0:
            used_kv.append(kv)
            used_amount.append(amount)
    if not used_amount:
        raise InputError("amount1", "at least one oil needs an amount above 0")
    return used_kv, used_amount


def _mix(result: Result, kvs: list[float | None], amounts: list[float | None], basis: str,
         grade_choice: str) -> None:
    used_kv, used_amount = _mix_parts(kvs, amounts)
    kv_mix = blend_viscosity(used_kv, used_amount)
    total = sum(used_amount)
    main = max(range(len(used_amount)), key=lambda i: used_amount[i])
    kv_main = used_kv[main]
    result.values.update(kv_mix=kv_mix, vbn=blending_number(kv_mix),
                         share_other=100.0 * (1.0 - used_amount[main] / total))
    change = kv_mix / kv_main - 1.0
    named = dict(mix=Q(kv_mix, _KV), main=Q(kv_main, _KV), change=Q(100.0 * abs(change), _PCT))
    grade = expected_grade(grade_choice, kv_main)
    if grade is None:
        result.grade(abs(change), MIX_BANDS, ISO_3448_BASIS, **named)
        result.note("The main oil ({main}) is in no ISO 3448 grade band, so the mix is judged by "
                    "its change from it.", **named)
    else:
        named.update(_grade_named(grade))
        low = grade_limits(grade)[0]
        if not result.grade(as_stated(kv_mix, low), MIX_GRADE_BANDS, ISO_3448_BASIS, **named):
            result.grade(abs(change), MIX_CHANGE_BANDS, ISO_3448_BASIS, **named)
        result.note("The grade check reads the viscosities as KV40 (cSt at {temp}), as ISO "
                    "3448 defines its grades.", temp=Q(40.0, "temperature"))
    if basis == "volume":
        result.note("Amounts by volume: the blending numbers are defined on mass fractions; for "
                    "mineral oils of similar density the difference is small. Use mass for oils "
                    "of very different density (esters, glycols).")


def _top_up(result: Result, kv_a: float, kv_b: float, target: float, tank_l: float,
            capacity_l: float | None, grade_choice: str) -> None:
    if kv_a == kv_b:
        raise InputError("kv2", "oil B has the same viscosity as oil A: adding it cannot change "
                                "the viscosity")
    low, high = sorted((kv_a, kv_b))
    if not low <= target <= high or target == kv_b:
        raise InputError("target_kv", "must lie between oil A ({kv_a}) and oil B ({kv_b}), and not "
                                   "equal B: a mix of two oils always lies between them",
                         kv_a=Q(kv_a, _KV), kv_b=Q(kv_b, _KV))
    if capacity_l is not None and capacity_l < tank_l:
        raise InputError("tank_volume", "the tank's capacity must be at least the oil already in it")
    fraction_b = top_up_fraction(kv_a, kv_b, target)
    add_l = top_up_volume(tank_l, fraction_b)
    drain_l = 0.0
    if capacity_l is not None and tank_l + add_l > capacity_l:
        drain_l, add_l = drain_and_fill(tank_l, capacity_l, fraction_b)
    result.values.update(kv_mix=target, vbn=blending_number(target), top_up=add_l,
                         drain=drain_l, share_other=100.0 * fraction_b)
    if result.grade(drain_l, DRAIN_BANDS, COMMON_PRACTICE,
                    add=Q(top_up_volume(tank_l, fraction_b), _VOL), drain=Q(drain_l, _VOL),
                    fill=Q(add_l, _VOL), target=Q(target, _KV)):
        result.note("Before draining: stop the machine, lock out and relieve pressure (lower raised "
                    "loads, discharge accumulators); oil may be hot. Contain spills and dispose of "
                    "used oil as local rules require.")
    result.grade(fraction_b, SHARE_BANDS, COMMON_PRACTICE, share=Q(100.0 * fraction_b, _PCT))
    grade = expected_grade(grade_choice, kv_a)
    if grade is not None:
        low = grade_limits(grade)[0]
        result.grade(as_stated(target, low), TARGET_GRADE_BANDS, ISO_3448_BASIS,
                     target=Q(target, _KV), **_grade_named(grade))
    result.note("Top-up by volume: the blending numbers are defined on mass fractions; for mineral "
                "oils of similar density the difference is small.")


@tool(
    "viscosity-blend",
    title="Blends and top-ups",
    summary="The viscosity of a mix of up to four oils, or how much of oil B to add to a tank of "
            "oil A to reach a target viscosity.",
    topic=VISCOSITY,
    renamed={"tank_l": "oil_volume", "capacity_l": "tank_volume", "target": "target_kv"},
    inputs=(
        Field("mode", "What to work out", "choice", "mix", choices=MODE_CHOICES),
        _kv_field(1, 46.0), _amount_field(1, 80.0),
        _kv_field(2, 68.0), _amount_field(2, 20.0),
        _kv_field(3, None), _amount_field(3, None),
        _kv_field(4, None), _amount_field(4, None),
        Field("basis", "Amounts are", "choice", "volume", choices=BASIS_CHOICES,
              help="Mix only.", when=("mode", "mix")),
        Field("grade", "Grade that should be in the tank", "choice", MAIN_GRADE,
              choices=EXPECTED_CHOICES, binds="grade",
              help="The result is judged against this grade's ISO 3448 band; by default the "
                   "grade the main oil (oil A for a top-up) is in."),
        Field("oil_volume", "Oil A in the tank now", _VOL, 200.0, min=0.1, max=1.0e6,
              binds="oil_volume", help="Top-up only.", when=("mode", "top_up")),
        Field("tank_volume", "Tank capacity", _VOL, None, min=0.1, max=1.0e6, optional=True,
              binds="tank_volume",
              help="Top-up only. When the top-up does not fit, the tool says how much oil A to "
                   "drain first.", when=("mode", "top_up")),
        Field("target_kv", "Target viscosity", _KV, 50.0, min=KV_MIN_CST, max=KV_MAX_CST,
              help="Top-up only: at the same temperature as oils A and B.", when=("mode", "top_up")),
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
                    basis: str, grade: str, oil_volume: float, target_kv: float,
                    kv3: float | None = None, amount3: float | None = None,
                    kv4: float | None = None, amount4: float | None = None,
                    tank_volume: float | None = None) -> Result:
    """Mix result or top-up volume by the Refutas blending numbers (ASTM D7152 practice)."""
    result = Result(values={})
    if mode == "mix":
        _mix(result, [kv1, kv2, kv3, kv4], [amount1, amount2, amount3, amount4], basis, grade)
    else:
        _top_up(result, kv1, kv2, target_kv, oil_volume, tank_volume, grade)
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
