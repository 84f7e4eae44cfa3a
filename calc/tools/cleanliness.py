"""Solid-particle cleanliness: ISO 4406 codes, targets by component, filter beta ratios.

ISO 4406 reports cumulative particle counts per millilitre at three sizes,
>= 4, >= 6 and >= 14 um(c) (sizes from an automatic counter calibrated to
ISO 11171), each as a scale number from the standard's table 1, written
"18/16/13". One step up the scale roughly doubles the count. A size not
counted is written "-" ("-/16/13"). The filter side follows ISO 16889 (multi-pass
test): beta_x(c) = upstream count / downstream count at size x, and the
capture efficiency is (1 - 1 / beta) * 100 %.

Sources: ISO 4406:2021 (same table as ISO 4406:1999), table 1, from memory of the
standard, checked against the table as reproduced in filter makers' handbooks;
ISO 16889:2022 (beta ratio definition); ISO 4021 (sampling from working lines) and
ISO 3722 (sample bottle cleanliness), cited from memory.
"""

from __future__ import annotations

import math

from ..kernel.errors import InputError
from ..kernel.registry import CLEANLINESS, Field, Output, tool
from ..kernel.result import COMMON_PRACTICE, Q, Result

# ISO 4406:2021 table 1: (scale number, more than, up to and including) particles per mL.
# The bounds are the rounded doubling series the standard prints (1.3, 2.5, 640, 1300...),
# not exact powers of two. Source: ISO 4406 table 1, from memory, as reproduced in
# filter makers' handbooks.
SCALE_TABLE = (
    (0, 0.0, 0.01), (1, 0.01, 0.02), (2, 0.02, 0.04), (3, 0.04, 0.08), (4, 0.08, 0.16),
    (5, 0.16, 0.32), (6, 0.32, 0.64), (7, 0.64, 1.3), (8, 1.3, 2.5), (9, 2.5, 5.0),
    (10, 5.0, 10.0), (11, 10.0, 20.0), (12, 20.0, 40.0), (13, 40.0, 80.0), (14, 80.0, 160.0),
    (15, 160.0, 320.0), (16, 320.0, 640.0), (17, 640.0, 1300.0), (18, 1300.0, 2500.0),
    (19, 2500.0, 5000.0), (20, 5000.0, 10000.0), (21, 10000.0, 20000.0),
    (22, 20000.0, 40000.0), (23, 40000.0, 80000.0), (24, 80000.0, 160000.0),
    (25, 160000.0, 320000.0), (26, 320000.0, 640000.0), (27, 640000.0, 1300000.0),
    (28, 1300000.0, 2500000.0),
)
# Above the table's last bound the standard writes ">28"; calc carries it as 29.
ABOVE_TABLE = 29
TOP_SCALE = 28

SIZES_UM = (4, 6, 14)
Code = tuple  # (scale at >=4, >=6, >=14 um(c)), each int or None for "-"


def scale_number(count_per_ml: float) -> int:
    """ISO 4406 scale number of a cumulative count [particles per mL].

    A count exactly on a bound belongs to the lower number ("up to and including").
    No particles at all is scale 0. Above 2 500 000 per mL the answer is 29 (">28").

    >>> scale_number(1300.0), scale_number(1300.1), scale_number(2500.0)
    (17, 18, 18)

    Source: ISO 4406:2021 table 1 (from memory).
    """
    for number, _low, high in SCALE_TABLE:
        if count_per_ml <= high:
            return number
    return ABOVE_TABLE


def scale_range(number: int) -> tuple[float, float | None]:
    """(more than, up to and including) particles per mL of a scale number; None is open.

    >>> scale_range(18)
    (1300.0, 2500.0)
    """
    if number == ABOVE_TABLE:
        return SCALE_TABLE[-1][2], None
    _n, low, high = SCALE_TABLE[number]
    return low, high


def iso4406_code(count4: float | None, count6: float | None, count14: float | None) -> Code:
    """The code of counts per mL at >=4, >=6 and >=14 um(c); None for a size not counted.

    Counts are cumulative, so none may exceed the count at a smaller size.

    >>> format_code(iso4406_code(3000.0, 500.0, 7.0))
    '19/16/10'
    """
    counts = (count4, count6, count14)
    for (smaller, larger), key in zip(((0, 1), (1, 2), (0, 2)), ("count6", "count14", "count14")):
        if counts[smaller] is not None and counts[larger] is not None \
                and counts[larger] > counts[smaller]:
            raise InputError(key, "counts are cumulative: the count at a larger size cannot "
                                  "exceed the count at a smaller size")
    return tuple(None if c is None else scale_number(c) for c in counts)


def format_code(code: Code) -> str:
    """"18/16/13", "-/16/13" or ">28/..." as the standard writes it."""
    def one(n):
        if n is None:
            return "-"
        return f">{TOP_SCALE}" if n == ABOVE_TABLE else str(n)
    return "/".join(one(n) for n in code)


def parse_code(text: str, field: str = "code") -> Code:
    """A code typed as "18/16/13", "-/16/13", "16/13" (two sizes) or with "≥" marks.

    A two-number code is read as the >=6 and >=14 um(c) sizes (ISO 4406's two-part
    form), so "16/13" is "-/16/13".

    >>> parse_code("18/16/13"), parse_code("-/16/13"), parse_code("≥14/12/≥7")
    ((18, 16, 13), (None, 16, 13), (14, 12, 7))
    """
    parts = [p.strip() for p in str(text).replace("\\", "/").split("/")]
    if len(parts) == 2:
        parts = ["-"] + parts
    if len(parts) != 3:
        raise InputError(field, f"an ISO 4406 code has three numbers like 18/16/13, not {text!r}")
    code = []
    for part in parts:
        number = part.lstrip("≥").strip()  # "≥": fewer than 20 particles counted
        if number in ("-", ""):
            code.append(None)
        elif number == f">{TOP_SCALE}":
            code.append(ABOVE_TABLE)
        elif number.isascii() and number.isdigit() and int(number) <= TOP_SCALE:
            code.append(int(number))
        else:
            raise InputError(field, f"each part of the code is a scale number 0 to {TOP_SCALE} "
                                    f"or '-', not {part!r}")
    check_code_order(tuple(code), field)
    return tuple(code)


def check_code_order(code: Code, field: str) -> None:
    """InputError unless the scale numbers fall (or stay) from small to large particles."""
    present = [n for n in code if n is not None]
    if any(b > a for a, b in zip(present, present[1:])):
        raise InputError(field, "counts are cumulative: a larger size cannot have a higher "
                                "scale number than a smaller size")


def code_excess(measured: Code, target: Code) -> tuple[int | None, ...]:
    """Scale numbers by which each size is over target (negative: cleaner); None if not both.

    >>> code_excess((19, 17, 13), (18, 16, 13))
    (1, 1, 0)
    """
    return tuple(None if m is None or t is None else m - t for m, t in zip(measured, target))


def worst_excess(measured: Code, target: Code) -> int | None:
    """The most codes any size is over target (negative: cleaner); None if nothing compares.

    >>> worst_excess((19, 17, 13), (18, 16, 14)), worst_excess((None, 16, 13), (18, None, None))
    (1, None)
    """
    compared = [e for e in code_excess(measured, target) if e is not None]
    return max(compared) if compared else None


def excess_text(excess: int | None) -> str | None:
    """Codes over target as shown: "+2", "0", "-1"; None if nothing compares.

    >>> excess_text(2), excess_text(0), excess_text(-1)
    ('+2', '0', '-1')
    """
    return None if excess is None else f"{excess:+d}" if excess else "0"


def excess_level(excess: tuple[int | None, ...]) -> str:
    """ok when no size is over target, watch at 1 code over, act at 2 or more (common practice).

    >>> excess_level((0, -1, None)), excess_level((1, 0, 0)), excess_level((0, 2, 1))
    ('ok', 'watch', 'act')
    """
    worst = max((e for e in excess if e is not None), default=0)
    return "ok" if worst <= 0 else "watch" if worst == 1 else "act"


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


def beta_efficiency_pct(beta: float) -> float:
    """Capture efficiency [%] of a filter of beta ratio `beta` (>= 1): (1 - 1/beta) * 100.

    >>> beta_efficiency_pct(200.0), beta_efficiency_pct(1000.0)
    (99.5, 99.9)

    Source: ISO 16889 (definition of the filtration ratio).
    """
    return (1.0 - 1.0 / beta) * 100.0


def downstream_count(upstream_per_ml: float, beta: float) -> float:
    """Count per mL after one pass through a filter of beta ratio `beta`: upstream / beta.

    >>> downstream_count(2500.0, 200.0)
    12.5
    """
    return upstream_per_ml / beta


_COUNT = "per_ml"
_SCALE = "count"


def _count_field(key: str, size: int, default: float) -> Field:
    return Field(key, f"Particles ≥{size} µm(c) per mL", _COUNT, default, min=0.0, max=1.0e8,
                 help="Cumulative count per mL from the particle counter or lab report.")


def _scale_field(key: str, label: str, help_text: str) -> Field:
    return Field(key, label, _SCALE, None, min=0.0, max=float(TOP_SCALE), optional=True,
                 help=help_text)


def scale_fields(prefix: str, label: str, help_text: str) -> tuple[Field, ...]:
    """Three optional scale-number fields `<prefix>4`, `<prefix>6`, `<prefix>14`."""
    return tuple(_scale_field(f"{prefix}{size}", f"{label}, ≥{size} µm(c)", help_text)
                 for size in SIZES_UM)


def code_from_fields(prefix: str, values: tuple[float | None, ...]) -> Code:
    """Whole scale numbers from three fields, checked; InputError names the bad field."""
    code = []
    for size, value in zip(SIZES_UM, values):
        if value is not None and value != int(value):
            raise InputError(f"{prefix}{size}", "a scale number is a whole number, 0 to 28")
        code.append(None if value is None else int(value))
    check_code_order(tuple(code), f"{prefix}{SIZES_UM[-1]}")
    return tuple(code)


def add_cleanliness_verdict(result: Result, measured: Code, target: Code) -> None:
    """The verdict of a measured code against a target, with what to do."""
    if worst_excess(measured, target) is None:
        result.note("No size is in both the measured and the target code: nothing to compare.")
        return
    level = excess_level(code_excess(measured, target))
    found, wanted = format_code(measured), format_code(target)
    if level == "ok":
        result.add("ok", COMMON_PRACTICE, f"Cleanliness {found} meets the target {wanted}.")
    elif level == "watch":
        result.add("watch", COMMON_PRACTICE,
                   f"Cleanliness {found} is one code over the target {wanted} (about twice the "
                   "particles): take a second sample with a clean bottle from a running line "
                   "(ISO 4021) to confirm, and check the filter's bypass indicator and the "
                   "tank breather.")
    else:
        result.add("act", COMMON_PRACTICE,
                   f"Cleanliness {found} is two or more codes over the target {wanted} (four "
                   "times the particles or more): check filter elements, bypass valves and "
                   "breathers now, look for the source (seals, top-up oil, open tank), and "
                   "filter the oil down before the components wear.")


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
                      "blank for a size written '-'."),
        Field("component", "Most sensitive component", "choice", "piston",
              choices=COMPONENT_CHOICES),
        Field("pressure", "Working pressure", "pressure", 160.0, min=0.0, max=1000.0),
        *scale_fields("target", "Own target", "Leave all three blank to use the typical "
                      "target for the component and pressure."),
    ),
    outputs=(
        Output("code", "ISO 4406 code", "text", headline=True),
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
              help="β at the rated size from the element's data sheet, e.g. β10(c) ≥ 200."),
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
        if measured < beta:
            result.add("watch", COMMON_PRACTICE,
                       "The measured ratio {0} is below the rated {1}: check the element's "
                       "bypass valve and seals, and that both samples were taken the same clean "
                       "way; a rated ratio holds only in the ISO 16889 test.",
                       Q(measured, "ratio"), Q(beta, "ratio"))
        else:
            result.add("ok", COMMON_PRACTICE, "The measured ratio {0} reaches the rated {1}.",
                       Q(measured, "ratio"), Q(beta, "ratio"))
    result.note("Stop the machine, relieve pressure and lock out before changing an element; "
                "the oil and the housing may be hot. Dispose of used elements as oily waste.")
    result.sources += ["ISO 16889 (filtration ratio and efficiency)",
                       "ISO 4406:2021 table 1 (scale numbers, from memory)"]
    return result
