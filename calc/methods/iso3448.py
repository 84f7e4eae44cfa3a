"""ISO 3448 viscosity grades: the table and the grade a KV40 falls in.

A KV40 is read against a grade's limits as the standard writes them: rounded to their
precision first (ASTM E29's rounding method), so 50.6 cSt is inside VG 46 however it was
computed.

Source: ISO 3448:1992, "Industrial liquid lubricants — ISO viscosity
classification", Table 1.
"""

from __future__ import annotations

import math

from ..kernel.grading import as_stated

# ISO 3448:1992, Table 1: (grade, mid-point KV40 [cSt], lower limit, upper limit); limits are
# the mid-point -10 % and +10 %.
ISO_VG_GRADES = (
    ("VG 2", 2.2, 1.98, 2.42), ("VG 3", 3.2, 2.88, 3.52), ("VG 5", 4.6, 4.14, 5.06),
    ("VG 7", 6.8, 6.12, 7.48), ("VG 10", 10.0, 9.0, 11.0), ("VG 15", 15.0, 13.5, 16.5),
    ("VG 22", 22.0, 19.8, 24.2), ("VG 32", 32.0, 28.8, 35.2), ("VG 46", 46.0, 41.4, 50.6),
    ("VG 68", 68.0, 61.2, 74.8), ("VG 100", 100.0, 90.0, 110.0), ("VG 150", 150.0, 135.0, 165.0),
    ("VG 220", 220.0, 198.0, 242.0), ("VG 320", 320.0, 288.0, 352.0),
    ("VG 460", 460.0, 414.0, 506.0), ("VG 680", 680.0, 612.0, 748.0),
    ("VG 1000", 1000.0, 900.0, 1100.0), ("VG 1500", 1500.0, 1350.0, 1650.0),
    ("VG 2200", 2200.0, 1980.0, 2420.0), ("VG 3200", 3200.0, 2880.0, 3520.0),
)
GRADE_CHOICES = tuple((g[0], g[0]) for g in ISO_VG_GRADES)
_BY_NAME = {g[0]: g for g in ISO_VG_GRADES}


def grade_midpoint(grade: str) -> float:
    """Mid-point KV40 [cSt] of an ISO VG grade named like "VG 46".

    >>> grade_midpoint("VG 46"), grade_midpoint("VG 2")
    (46.0, 2.2)
    """
    return _BY_NAME[grade][1]


def grade_limits(grade: str) -> tuple[float, float]:
    """(lower, upper) KV40 limits [cSt] of an ISO VG grade: mid-point -10 % and +10 %.

    >>> grade_limits("VG 46")
    (41.4, 50.6)
    """
    _, _, low, high = _BY_NAME[grade]
    return low, high


def nearest_grade(kv40_cst: float) -> tuple[str, float]:
    """The grade whose mid-point is nearest to `kv40_cst` [cSt] on a log scale, and the
    percentage the KV40 is off that mid-point.

    >>> nearest_grade(48.3)
    ('VG 46', 5.0)
    """
    best = min(ISO_VG_GRADES, key=lambda g: abs(_log_ratio(kv40_cst, g[1])))
    return best[0], round(100.0 * (kv40_cst / best[1] - 1.0), 12)


def grade_containing(kv40_cst: float) -> str | None:
    """The grade whose +-10 % limits hold `kv40_cst` [cSt], or None between grades.

    >>> grade_containing(50.0), grade_containing(55.0), grade_containing(50.6000000000001)
    ('VG 46', None, 'VG 46')
    """
    for name, _, low, high in ISO_VG_GRADES:
        if low <= as_stated(kv40_cst, low) <= high:
            return name
    return None


def neighbours(kv40_cst: float) -> tuple[str | None, str | None]:
    """The grades just thinner and just thicker than `kv40_cst` [cSt] (by mid-point).

    >>> neighbours(55.0)
    ('VG 46', 'VG 68')
    """
    lower = [g[0] for g in ISO_VG_GRADES if g[1] <= kv40_cst]
    upper = [g[0] for g in ISO_VG_GRADES if g[1] > kv40_cst]
    return (lower[-1] if lower else None), (upper[0] if upper else None)


def _log_ratio(a: float, b: float) -> float:
    return math.log(a / b)
