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

from ..kernel.errors import InputError, typed
from ..kernel.result import Q


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
        raise InputError(field, "an ISO 4406 code has three numbers like 18/16/13, not {typed}",
                         typed=typed(text))
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
            raise InputError(field, "each part of the code is a scale number 0 to {top} or '-', "
                                    "not {typed}", top=Q(float(TOP_SCALE), "count"),
                             typed=typed(part))
    check_code_order(tuple(code), field)
    return tuple(code)


def check_code_order(code: Code, field: str, prefix: str | None = None) -> None:
    """InputError unless the scale numbers fall (or stay) from small to large particles: on
    `field`, or, with `prefix`, on the field of the size that breaks the order ("code6").

    >>> check_code_order((14, 16, 13), "code", "code")
    Traceback (most recent call last):
    ...
    calc.kernel.errors.InputError: code6: counts are cumulative: a larger size cannot have a higher scale number than a smaller size
    """
    known = [(size, n) for size, n in zip(SIZES_UM, code) if n is not None]
    for (_, smaller), (size, larger) in zip(known, known[1:]):
        if larger > smaller:
            raise InputError(field if prefix is None else f"{prefix}{size}",
                             "counts are cumulative: a larger size cannot have a higher "
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
