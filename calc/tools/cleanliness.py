"""The cleanliness tools: the ISO 4406 code of particle counts (calc.methods.cleanliness)
against a target for the most sensitive component (common practice), and a filter's beta
ratio.
"""

from __future__ import annotations

import math

from ..kernel.errors import InputError
from ..kernel.grading import Band
from ..kernel.registry import CLEANLINESS, Field, Output, tool
from ..kernel.result import COMMON_PRACTICE, Q, Result
from ..methods.cleanliness import (ABOVE_TABLE, SCALE_TABLE, SIZES_UM, TOP_SCALE, Code,
                                   beta_efficiency_pct, check_code_order, code_excess,
                                   downstream_count, format_code, iso4406_code, scale_number,
                                   scale_range, worst_excess)


def excess_text(excess: int | None) -> str | None:
    """Codes over target as shown: "+2", "0", "-1"; None if nothing compares.

    >>> excess_text(2), excess_text(0), excess_text(-1)
    ('+2', '0', '-1')
    """
    return None if excess is None else f"{excess:+d}" if excess else "0"


# A measured code against its target, by the worst size (common practice): one code over
# is about twice the particles, two or more four times.
CLEANLINESS_BANDS = (
    Band("act", "Cleanliness {found} is two or more codes over the target {wanted} (four times "
                "the particles or more): check filter elements, bypass valves and breathers now, "
                "look for the source (seals, top-up oil, open tank), and filter the oil down "
                "before the components wear.", at_least=2.0),
    Band("watch", "Cleanliness {found} is one code over the target {wanted} (about twice the "
                  "particles): take a second sample with a clean bottle from a running line "
                  "(ISO 4021) to confirm, and check the filter's bypass indicator and the tank "
                  "breather.", at_least=1.0),
    Band("ok", "Cleanliness {found} meets the target {wanted}."),
)
# A measured beta ratio against the rated one (common practice).
BETA_BANDS = (
    Band("watch", "The measured ratio {measured} is below the rated {rated}: check the element's "
                  "bypass valve and seals, and that both samples were taken the same clean way; a "
                  "rated ratio holds only in the ISO 16889 test.", under="rated"),
    Band("ok", "The measured ratio {measured} reaches the rated {rated}."),
)


# Typical ISO 4406 targets by the most dirt-sensitive component, for working pressure up
# to 140 bar. Common practice (the shape of filter makers' and lubrication guides' target
# charts), from memory; the component maker's figure always takes precedence.
TARGET_CODES = (
    ("servo", "Servo valve", (16, 14, 11)),
    ("proportional", "Proportional valve", (17, 15, 12)),
    ("piston", "Piston pump or motor", (18, 16, 13)),
    ("vane", "Vane pump", (18, 16, 14)),
    ("gear", "Gear pump", (19, 17, 14)),
    ("valves", "Directional valves, cylinders", (20, 18, 15)),
)
# Higher pressure, cleaner oil: codes one step cleaner above 140 bar, two above 210 bar.
# Common practice, from memory.
PRESSURE_STEPS_BAR = ((140.0, 0), (210.0, 1), (math.inf, 2))
COMPONENT_CHOICES = tuple((key, label) for key, label, _code in TARGET_CODES)


def target_code(component: str, pressure_bar: float) -> Code:
    """Typical target code for a component at a working pressure (common practice).

    >>> target_code("piston", 100.0), target_code("piston", 140.0), target_code("piston", 250.0)
    ((18, 16, 13), (18, 16, 13), (16, 14, 11))
    """
    base = next(code for key, _label, code in TARGET_CODES if key == component)
    step = next(s for limit, s in PRESSURE_STEPS_BAR if pressure_bar <= limit)
    return tuple(max(0, n - step) for n in base)


_COUNT = "per_ml"
_SCALE = "count"


def _count_field(key: str, size: int, default: float) -> Field:
    return Field(key, f"Particles ≥{size} µm(c) per mL", _COUNT, default, min=0.0, max=1.0e8,
                 help="Cumulative count per mL from the particle counter or lab report.",
                 when=("source", "counts"))


# ISO 4406 scale numbers usual in hydraulic work: about 8 (very clean, servo systems) to
# 24 (dirty) (common practice).
USUAL_SCALE = (8.0, 24.0)


def scale_fields(prefix: str, label: str, help_text: str, *, target: bool = False,
                 reading: bool = False, when: tuple | None = None) -> tuple[Field, ...]:
    """Three optional scale-number fields `<prefix>4`, `<prefix>6`, `<prefix>14`: a target
    (taken from the machine card's own target) or a reading (followed over time)."""
    return tuple(Field(f"{prefix}{size}", f"{label}, ≥{size} µm(c)", _SCALE, None, min=0.0,
                       max=float(TOP_SCALE), optional=True, help=help_text,
                       binds=f"target{size}" if target else None,
                       tracks=f"iso4406_{size}" if reading else None, usual=USUAL_SCALE,
                       when=when)
                 for size in SIZES_UM)


def code_from_fields(prefix: str, values: tuple[float | None, ...]) -> Code:
    """Whole scale numbers from three fields, checked; InputError names the bad field."""
    code = []
    for size, value in zip(SIZES_UM, values):
        if value is not None and value != int(value):
            raise InputError(f"{prefix}{size}", "a scale number is a whole number, 0 to {top}",
                             top=Q(float(TOP_SCALE), "count"))
        code.append(None if value is None else int(value))
    check_code_order(tuple(code), f"{prefix}{SIZES_UM[-1]}", prefix)
    return tuple(code)


def add_cleanliness_verdict(result: Result, measured: Code, target: Code) -> None:
    """The verdict of a measured code against a target, with what to do."""
    worst = worst_excess(measured, target)
    if worst is None:
        result.note("No size is in both the measured and the target code: nothing to compare.")
        return
    result.grade(worst, CLEANLINESS_BANDS, COMMON_PRACTICE,
                 found=Q(format_code(measured), "text"), wanted=Q(format_code(target), "text"))


@tool(
    "iso-4406",
    title="ISO 4406 cleanliness code",
    summary="The ISO 4406 code of particle counts, or the counts behind a code, against the "
            "target for the most sensitive component at the working pressure.",
    topic=CLEANLINESS,
    inputs=(
        Field("source", "Start from", "choice", "counts",
              choices=(("counts", "Particle counts per mL"), ("code", "A code from a report"))),
        _count_field("count4", 4, 1850.0),
        _count_field("count6", 6, 410.0),
        _count_field("count14", 14, 52.0),
        *scale_fields("scale", "Code on the report", "Used when starting from a code; leave "
                      "blank for a size written '-'.", when=("source", "code")),
        Field("component", "Most sensitive component", "choice", "piston", binds="component",
              choices=COMPONENT_CHOICES),
        Field("pressure", "Working pressure", "pressure", 160.0, min=0.0, max=1000.0,
              binds="working_pressure"),
        *scale_fields("target", "Own target", "Leave all three blank to use the typical "
                      "target for the component and pressure.", target=True),
    ),
    outputs=(
        Output("code", "ISO 4406 code", "text", headline=True),
        *(Output(f"scale{size}", f"Scale number, ≥{size} µm(c)", _SCALE,
                 tracks=f"iso4406_{size}") for size in SIZES_UM),
        Output("low4", "≥4 µm(c): more than", _COUNT),
        Output("high4", "≥4 µm(c): up to", _COUNT),
        Output("low6", "≥6 µm(c): more than", _COUNT),
        Output("high6", "≥6 µm(c): up to", _COUNT),
        Output("low14", "≥14 µm(c): more than", _COUNT),
        Output("high14", "≥14 µm(c): up to", _COUNT),
        Output("target_code", "Target code", "text"),
        Output("excess", "Codes over target (worst size)", "text",
               "Negative: that many codes cleaner than the target."),
    ),
)
def iso_4406(source: str, count4: float, count6: float, count14: float,
             scale4: float | None, scale6: float | None, scale14: float | None,
             component: str, pressure: float, target4: float | None = None,
             target6: float | None = None, target14: float | None = None) -> Result:
    """ISO 4406 code (or its ranges) against a target code."""
    if source == "counts":
        measured = iso4406_code(count4, count6, count14)
        ignored = any(n is not None for n in (scale4, scale6, scale14))
    else:
        measured = code_from_fields("scale", (scale4, scale6, scale14))
        if all(n is None for n in measured):
            raise InputError("scale6", "enter the code's scale numbers, or start from counts")
        ignored = False
    own = code_from_fields("target", (target4, target6, target14))
    target = own if any(n is not None for n in own) else target_code(component, pressure)
    values: dict[str, float | str | None] = {"code": format_code(measured)}
    for size, number in zip(SIZES_UM, measured):
        values[f"scale{size}"] = None if number is None else float(number)
        low, high = (None, None) if number is None else scale_range(number)
        values[f"low{size}"], values[f"high{size}"] = low, high
    values["target_code"] = format_code(target)
    values["excess"] = excess_text(worst_excess(measured, target))
    result = Result(values=values)
    add_cleanliness_verdict(result, measured, target)
    if ignored:
        result.note("Starting from counts: the code typed under 'Code on the report' is not used.")
    if target is not own:
        result.note("The target is a typical figure for the component and pressure (common "
                    "practice); the component maker's figure always takes precedence.")
    if ABOVE_TABLE in measured:
        result.note("A count above {0} is off the ISO 4406 table (>28): dilute the sample "
                    "or count by another method.", Q(SCALE_TABLE[-1][2], _COUNT))
    result.note("Take samples from a running line upstream of the filters with a valve and "
                "bottle kept clean (ISO 4021, ISO 3722). The line is under pressure and the oil "
                "may be hot: wear gloves and eye protection, and never feel for a leak by hand.")
    result.sources += ["ISO 4406:2021 table 1 (scale numbers, from memory)",
                       "Targets by component and pressure: common practice, from memory"]
    return result


@tool(
    "filter-beta",
    title="Filter beta ratio",
    summary="Capture efficiency of a filter from its beta ratio, the count left after one "
            "pass, and a measured ratio from counts before and after the filter.",
    topic=CLEANLINESS,
    inputs=(
        Field("beta", "Rated beta ratio", "ratio", 200.0, min=1.0, max=1.0e7,
              help="β at the rated size from the element's data sheet, e.g. β10(c) ≥ 200.", usual=(2.0, 4000.0)),
        Field("upstream", "Count before the filter, per mL", _COUNT, 2500.0, min=0.0, max=1.0e8,
              help="At the beta's particle size."),
        Field("downstream", "Count after the filter, per mL", _COUNT, None, min=0.0, max=1.0e8,
              optional=True, help="Measured at the same size; leave blank if not measured."),
    ),
    outputs=(
        Output("efficiency", "Capture efficiency", "percent", headline=True),
        Output("after_pass", "Count after one pass", _COUNT),
        Output("scale_before", "Scale number before", "text"),
        Output("scale_after", "Scale number after one pass", "text"),
        Output("beta_measured", "Measured beta ratio", "ratio"),
        Output("efficiency_measured", "Measured efficiency", "percent"),
    ),
)
def filter_beta(beta: float, upstream: float, downstream: float | None = None) -> Result:
    """Efficiency and one-pass count of a filter of beta ratio `beta` (ISO 16889)."""
    after = downstream_count(upstream, beta)
    values: dict[str, float | str | None] = {
        "efficiency": beta_efficiency_pct(beta),
        "after_pass": after,
        "scale_before": format_code((scale_number(upstream),)),
        "scale_after": format_code((scale_number(after),)),
        "beta_measured": None,
        "efficiency_measured": None,
    }
    result = Result(values=values)
    if downstream is not None:
        if upstream <= 0.0 or downstream <= 0.0:
            raise InputError("downstream", "both counts must be above zero to give a ratio")
        measured = upstream / downstream
        if not math.isfinite(measured):
            raise InputError("downstream", "the two counts give a ratio too large to mean anything: "
                                           "check the count after the filter")
        values["beta_measured"] = measured
        values["efficiency_measured"] = beta_efficiency_pct(measured) if measured >= 1.0 else None
        if measured < 1.0:
            result.note("More particles after the filter than before it ({after} against "
                        "{before}): the filter cannot add dirt, so the element is bypassing or "
                        "torn, a sample was taken dirty, or the two counts are swapped; take "
                        "both samples again before acting on this ratio.",
                        after=Q(downstream, "per_ml"), before=Q(upstream, "per_ml"))
        result.grade(measured, BETA_BANDS, COMMON_PRACTICE, measured=Q(measured, "ratio"),
                     rated=Q(beta, "ratio"))
    result.note("Stop the machine, relieve pressure and lock out before changing an element; "
                "the oil and the housing may be hot. Dispose of used elements as oily waste.")
    result.sources += ["ISO 16889 (filtration ratio and efficiency)",
                       "ISO 4406:2021 table 1 (scale numbers, from memory)"]
    return result
