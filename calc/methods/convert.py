"""Kinematic viscosity to Saybolt seconds, and degrees Celsius to Fahrenheit.

Kinematic viscosity converts to Saybolt Universal Seconds by ASTM D2161:

    SUS(100 degF) = 4.6324 v + (1 + 0.03264 v) / ((3930.2 + 262.7 v + 23.97 v^2 + 1.646 v^3) 1e-5)
    SUS(t degF) = SUS(100 degF) (1 + 0.000061 (t - 100))

with v in cSt; the reverse is solved numerically.

Source: ASTM D2161, "Conversion of Kinematic Viscosity to Saybolt Universal Viscosity"
(equations from memory of the standard, checked against chemicals.viscosity); NIST SP 811
(2008), appendix B.
"""

from __future__ import annotations

from ..kernel.solve import bisect


# ASTM D2161's scale starts at about 32 SUS, 1.8 cSt (from memory of the standard).
SUS_KV_MIN_CST = 1.8


SUS_KV_MAX_CST = 1.0e6


def sus_at_100f(kv_cst: float) -> float:
    """Saybolt Universal Seconds at 100 °F of a kinematic viscosity [cSt] (ASTM D2161).

    SUS = 4.6324 v + (1 + 0.03264 v) / ((3930.2 + 262.7 v + 23.97 v^2 + 1.646 v^3) 1e-5)

    >>> round(sus_at_100f(46.0), 1)
    214.2
    """
    v = kv_cst
    return 4.6324 * v + (1.0 + 0.03264 * v) / ((3930.2 + 262.7 * v + 23.97 * v ** 2
                                                 + 1.646 * v ** 3) * 1.0e-5)


def saybolt_seconds(kv_cst: float, temp_f: float = 100.0) -> float:
    """Saybolt Universal Seconds of a kinematic viscosity [cSt] measured at `temp_f` [degF].

    SUS(t) = SUS(100 degF) (1 + 0.000061 (t - 100))   (ASTM D2161)

    >>> round(saybolt_seconds(10.0, 210.0), 2)
    59.23
    """
    return sus_at_100f(kv_cst) * (1.0 + 0.000061 * (temp_f - 100.0))


def kinematic_from_saybolt(sus: float, temp_f: float = 100.0) -> float:
    """Kinematic viscosity [cSt] whose ASTM D2161 Saybolt seconds at `temp_f` [degF] are `sus`.

    The D2161 relation rises steadily with v; solved by bisection to 1e-12 relative.

    >>> round(kinematic_from_saybolt(saybolt_seconds(46.0, 210.0), 210.0), 9)
    46.0
    """
    return bisect(lambda kv: saybolt_seconds(kv, temp_f) - sus, 0.5, SUS_KV_MAX_CST * 2.0,
                  rel_tol=1e-12, max_iter=200)


def celsius_to_fahrenheit(temp_c: float) -> float:
    """degF = degC 9/5 + 32, exact (NIST SP 811).

    >>> celsius_to_fahrenheit(100.0)
    212.0
    """
    return temp_c * 9.0 / 5.0 + 32.0


def fahrenheit_to_celsius(temp_f: float) -> float:
    """degC = (degF - 32) 5/9, exact (NIST SP 811).

    >>> fahrenheit_to_celsius(-40.0)
    -40.0
    """
    return (temp_f - 32.0) * 5.0 / 9.0
