"""Grading a value against its bands: thresholds and their sentences kept as data.

A tool lists the bands of one reading worst first, one line each, with the sentence a
technician acts on and, where it differs from the tool's, the basis of the limit:

    LOSS_BANDS = (  # common practice
        Band("act", "Stiffness down {loss}: bleed the circuit.", at_least=25.0),
        Band("watch", "Stiffness down {loss}: find where air gets in.", at_least=5.0),
        Band("ok", "Stiffness down only {loss}."),
    )
    result.grade(loss, LOSS_BANDS, COMMON_PRACTICE, loss=Q(loss, "percent"))

The first band whose bounds all hold is the verdict; when none holds there is none. A bound is a number in calc's metric
unit, or the name of a quantity given to the grading (a limit typed on the form):
``at_least="act"`` holds when the value reaches the quantity named ``act``.

>>> bands = (Band("act", "", at_least="act"), Band("watch", "", over=2.0), Band("ok", ""))
>>> [pick(v, bands, {"act": 5.0}).level for v in (1.0, 2.0, 2.5, 5.0)]
['ok', 'ok', 'watch', 'act']
"""

from __future__ import annotations

import operator
from dataclasses import dataclass
from decimal import ROUND_HALF_EVEN, Decimal

LEVEL_NAMES = ("ok", "watch", "act")
_TESTS = (("at_least", operator.ge), ("over", operator.gt), ("at_most", operator.le),
          ("under", operator.lt))


@dataclass(frozen=True)
class Band:
    """One band of a reading: its level, its sentence, its bounds, and its basis if its own.

    at_least : the band holds values >= this (reaching a limit counts)
    over : values > this
    at_most : values <= this
    under : values < this
    """

    level: str
    says: str
    at_least: float | str | None = None
    over: float | str | None = None
    at_most: float | str | None = None
    under: float | str | None = None
    basis: str | None = None

    def __post_init__(self):
        if self.level not in LEVEL_NAMES:
            raise ValueError(f"band level must be one of {LEVEL_NAMES}, not {self.level!r}")

    def holds(self, value: float, limits: dict[str, float]) -> bool:
        for name, test in _TESTS:
            bound = getattr(self, name)
            if bound is None:
                continue
            if not test(value, limits[bound] if isinstance(bound, str) else bound):
                return False
        return True


def pick(value: float, bands: tuple[Band, ...],
         limits: dict[str, float] | None = None) -> Band | None:
    """The first of `bands` that holds `value`, or None: a table may grade only the bad side.

    >>> print(pick(1.0, (Band("act", "", at_least=5.0),)))
    None
    """
    for band in bands:
        if band.holds(value, limits or {}):
            return band
    return None


def stated_decimals(limit: float) -> int:
    """How many decimals a limit is written with (41.4 has 1, 1100.0 none, 1.98 two).

    >>> stated_decimals(41.4), stated_decimals(1100.0), stated_decimals(1.98)
    (1, 0, 2)
    """
    text = repr(float(limit))
    if "e" in text or "." not in text:
        return 0
    return len(text.split(".")[1].rstrip("0"))


def as_stated(value: float, limit: float) -> float:
    """`value` rounded to the precision `limit` is written with, before the two are compared.

    The rounding method of ASTM E29: a reading of 50.6000000001 is inside a limit written
    50.6, and an exact half goes to the even digit. A standard's limit is compared this way,
    so that a value the standard would call on the limit is not called over it.

    >>> as_stated(50.6000000001, 50.6), as_stated(50.65, 50.6), as_stated(50.75, 50.6)
    (50.6, 50.6, 50.8)
    """
    places = Decimal(1).scaleb(-stated_decimals(limit))
    return float(Decimal(repr(float(value))).quantize(places, rounding=ROUND_HALF_EVEN))
