"""Kinematic viscosity against temperature: ASTM D341 (Walther form) and the pump's window.

ASTM D341 draws an oil's viscosity-temperature line as a straight line on
log(log(Z)) against log(T), where T is the absolute temperature and Z is the
kinematic viscosity with a small correction that matters only below about 2 cSt:

    log10(log10(Z)) = A - B * log10(T / K)
    Z = v + 0.7 + exp(-1.47 - 1.84 v - 0.51 v^2)                (simplified form)

The standard (D341-09 and later) gives the full correction

    Z = v + 0.7 + C - D + E - F + G - H
    C = exp(-1.14883 - 2.65868 v)      D = exp(-0.0038138 - 12.5645 v)
    E = exp(5.46491 - 37.6289 v)       F = exp(13.0458 - 74.6851 v)
    G = exp(37.4619 - 192.643 v)       H = exp(80.4945 - 400.468 v)

and an approximate inverse; here the inverse is solved exactly by Newton's
method, started from the standard's approximation.

Source: ASTM D341-09 (reapproved 2015), "Viscosity-Temperature Charts for Liquid
Petroleum Products", equations 1 to 4 (coefficients from memory of the standard).
"""

from __future__ import annotations

import math

from ..kernel.constants import ZERO_CELSIUS_K
from ..kernel.errors import InputError
from ..kernel.result import Q
from ..kernel.solve import find_root
from .iso3448 import grade_midpoint
from .viscosity_index import KV100_MIN_CST, kv40_from_vi, kv100_from_vi


# D341 covers about 0.21 cSt to 1e6 cSt with the full Z correction.
KV_MIN_CST = 0.21


KV_MAX_CST = 1.0e6


def walther_z(kv_cst: float) -> float:
    """ASTM D341 corrected viscosity Z for a kinematic viscosity [cSt].

    >>> round(walther_z(46.0), 6)
    46.7
    >>> round(walther_z(1.0), 4)
    1.7222
    """
    v = kv_cst
    return (v + 0.7
            + math.exp(-1.14883 - 2.65868 * v)
            - math.exp(-0.0038138 - 12.5645 * v)
            + math.exp(5.46491 - 37.6289 * v)
            - math.exp(13.0458 - 74.6851 * v)
            + math.exp(37.4619 - 192.643 * v)
            - math.exp(80.4945 - 400.468 * v))


def _dz_dv(v: float) -> float:
    return (1.0
            - 2.65868 * math.exp(-1.14883 - 2.65868 * v)
            + 12.5645 * math.exp(-0.0038138 - 12.5645 * v)
            - 37.6289 * math.exp(5.46491 - 37.6289 * v)
            + 74.6851 * math.exp(13.0458 - 74.6851 * v)
            - 192.643 * math.exp(37.4619 - 192.643 * v)
            + 400.468 * math.exp(80.4945 - 400.468 * v))


def kv_from_z(z: float) -> float:
    """Kinematic viscosity [cSt] whose D341 Z is `z`: the exact inverse of `walther_z`.

    Starts from the standard's approximation
    v = (Z - 0.7) - exp(-0.7487 - 3.295 (Z - 0.7) + 0.6119 (Z - 0.7)^2 - 0.3193 (Z - 0.7)^3)
    and refines by Newton's method to machine precision.

    >>> round(kv_from_z(walther_z(3.3)), 12)
    3.3
    """
    zz = z - 0.7
    v = zz - math.exp(-0.7487 - 3.295 * zz + 0.6119 * zz ** 2 - 0.3193 * zz ** 3) if zz < 3 else zz
    v = max(v, KV_MIN_CST)
    for _ in range(50):
        step = (walther_z(v) - z) / _dz_dv(v)
        v -= step
        if abs(step) <= 1e-13 * max(1.0, v):
            break
    return v


def walther_fit(temp1_c: float, kv1_cst: float, temp2_c: float, kv2_cst: float) -> tuple[float, float]:
    """Constants (A, B) of the D341 line through two measured points.

    Viscosity must fall as temperature rises: the warmer point must be the thinner.

    >>> a, b = walther_fit(40.0, 46.0, 100.0, 6.8)
    >>> round(a, 4), round(b, 4)
    (9.418, 3.6844)
    """
    t1, t2 = temp1_c + ZERO_CELSIUS_K, temp2_c + ZERO_CELSIUS_K
    y1 = math.log10(math.log10(walther_z(kv1_cst)))
    y2 = math.log10(math.log10(walther_z(kv2_cst)))
    b = (y1 - y2) / (math.log10(t2) - math.log10(t1))
    a = y1 + b * math.log10(t1)
    return a, b


def walther_viscosity(temp_c: float, a: float, b: float) -> float:
    """Kinematic viscosity [cSt] at `temp_c` [degC] on the D341 line (A, B).

    >>> a, b = walther_fit(40.0, 46.0, 100.0, 6.8)
    >>> round(walther_viscosity(60.0, a, b), 2)
    20.62
    """
    return kv_from_z(10.0 ** (10.0 ** (a - b * math.log10(temp_c + ZERO_CELSIUS_K))))


def viscosity_on_line(temp_c: float, a: float, b: float) -> float | None:
    """`walther_viscosity`, or None where the line runs past what a float holds.

    >>> print(viscosity_on_line(-60.0, *walther_fit(240.0, 1000.0, 250.0, 1.0)))
    None
    """
    try:
        return walther_viscosity(temp_c, a, b)
    except OverflowError:
        return None


def walther_temperature(kv_cst: float, a: float, b: float) -> float:
    """Temperature [degC] at which the D341 line (A, B) has viscosity `kv_cst` [cSt].

    >>> a, b = walther_fit(40.0, 46.0, 100.0, 6.8)
    >>> round(walther_temperature(20.62, a, b), 1)
    60.0
    """
    log_t = (a - math.log10(math.log10(walther_z(kv_cst)))) / b
    return 10.0 ** log_t - ZERO_CELSIUS_K


def check_two_points(temp1_c: float, kv1_cst: float, temp2_c: float, kv2_cst: float,
                     fields: tuple[str, str, str, str] = ("temp1", "kv40", "temp2", "kv100")) -> None:
    """InputError unless the two readings make a D341 line: distinct, thinner when warmer."""
    f_t1, f_kv1, f_t2, f_kv2 = fields
    for key, kv in ((f_kv1, kv1_cst), (f_kv2, kv2_cst)):
        if not KV_MIN_CST <= kv <= KV_MAX_CST:
            raise InputError(key, "must be between {low} and {high} (ASTM D341 range)",
                             low=Q(KV_MIN_CST, "kinematic_viscosity"),
                             high=Q(KV_MAX_CST, "kinematic_viscosity"))
    if abs(temp2_c - temp1_c) < 1.0:
        raise InputError(f_t2, "the two readings must be at least {gap} apart",
                         gap=Q(1.0, "temperature_difference"))
    warm_kv, cold_kv = (kv2_cst, kv1_cst) if temp2_c > temp1_c else (kv1_cst, kv2_cst)
    warm_key = f_kv2 if temp2_c > temp1_c else f_kv1
    if warm_kv >= cold_kv:
        raise InputError(warm_key, "the reading at the higher temperature must be the lower "
                                   "viscosity (an oil thins as it warms)")


def kv40_from_reading(kv_cst: float, temp_c: float, vi: float) -> tuple[float, float | None]:
    """(KV40, KV100) [cSt] of the oil of viscosity index `vi` that reads `kv_cst` [cSt] at
    `temp_c` [degC].

    The oil's D341 line through (40 °C, KV40) and (100 °C, KV100) must pass through the
    reading, and (KV40, KV100) must have the given VI by ASTM D2270: solved for KV100.
    A reading at 40 °C is the KV40 itself; its KV100 is None where D2270 has none (an oil
    that thin would fall below 2 cSt at 100 °C). Elsewhere InputError naming "kv" when no
    oil in D2270's range (KV100 >= 2 cSt) fits.

    >>> [round(v, 2) for v in kv40_from_reading(20.62, 60.0, 100.0)]
    [46.16, 6.77]
    >>> kv40_from_reading(2.2, 40.0, 100.0)
    (2.2, None)
    """
    if temp_c == 40.0:
        try:
            return kv_cst, kv100_from_vi(kv_cst, vi)
        except InputError:
            return kv_cst, None

    def excess(kv100: float) -> float:
        a, b = walther_fit(40.0, kv40_from_vi(kv100, vi), 100.0, kv100)
        return walther_viscosity(temp_c, a, b) - kv_cst

    top = 1.0e4
    if excess(KV100_MIN_CST) > 0.0:
        raise InputError("kv", "too thin to classify: an oil of this VI reading that low would "
                               "have KV100 below {least}, outside ASTM D2270",
                         least=Q(KV100_MIN_CST, "kinematic_viscosity"))
    if excess(top) < 0.0:
        raise InputError("kv", "too thick to trace back to {forty} (KV100 above {top})",
                         forty=Q(40.0, "temperature"), top=Q(top, "kinematic_viscosity"))
    kv100 = find_root(excess, KV100_MIN_CST, top)
    return kv40_from_vi(kv100, vi), kv100


def grade_at_temperatures(grade: str, vi: float, cold_c: float, hot_c: float) -> tuple[float, float]:
    """Viscosity [cSt] of ISO `grade` (mid-point) of viscosity index `vi` at `cold_c` and
    `hot_c` [degC], on its D341 line; InputError when the grade has no such VI.

    >>> [round(v, 1) for v in grade_at_temperatures("VG 46", 100.0, 0.0, 60.0)]
    [584.9, 20.6]
    """
    kv40 = grade_midpoint(grade)
    a, b = walther_fit(40.0, kv40, 100.0, kv100_from_vi(kv40, vi))
    return walther_viscosity(cold_c, a, b), walther_viscosity(hot_c, a, b)
