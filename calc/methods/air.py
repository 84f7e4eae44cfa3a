"""Entrained air and the stiffness of the oil column: "spongy controls" in numbers.

Air bubbles in oil act as soft springs in series with the oil. With x the volume
fraction of free air at the pressure p (absolute):

    1 / K_eff = (1 - x) / K_oil + x / K_air         (mixture rule, series compliance)
    K_air = n * p       n = 1 isothermal (slow), n = 1.4 adiabatic (fast, air)

A fraction x0 measured at atmospheric pressure p0 shrinks as the oil is pressed
along a path p V^m = const (oil at constant tangent modulus K_oil):

    V_air = x0 (p0 / p)^(1/m)      V_oil = (1 - x0) exp(-(p - p0) / K_oil)
    x = V_air / (V_air + V_oil)

At a steady working pressure the air has settled to the oil's temperature, so
its fraction there is the isothermal one (m = 1) whatever the process; n = 1.4
then applies to fast changes about that pressure. The column pressed from
atmospheric to a load follows m = n. Along such a path the tangent modulus
-V dp/dV is exactly the mixture rule with m = n, so the column's volume change
from p0 to p1 is the closed form V0 - (V_air + V_oil) at p1. Air that dissolves in the oil under pressure is
ignored: the bubbles are taken to stay free, the softer (worse) case.

Sources: Boyle's law and the isentropic p V^1.4 = const for air; the mixture rule
in the form of H. E. Merritt, "Hydraulic Control Systems" (Wiley, 1967), ch. 2
(from memory); mineral oil's bulk modulus about 16 000 bar, from memory.
"""

from __future__ import annotations

import math

from ..kernel.constants import ATMOSPHERE_ROUNDED_BAR


K_OIL_BAR = 16000.0  # air-free mineral hydraulic oil, about 14 000 to 18 000 bar: from memory


GAS_EXPONENTS = {"isothermal": 1.0, "adiabatic": 1.4}  # air, ratio of specific heats 1.4


def air_fraction_at_pressure(x0: float, p_abs_bar: float, p0_abs_bar: float = ATMOSPHERE_ROUNDED_BAR,
                             n: float = 1.0, k_oil_bar: float = K_OIL_BAR) -> float:
    """Volume fraction of free air at `p_abs_bar` from `x0` measured at `p0_abs_bar` (absolute).

    x = x0 (p0/p)^(1/n) / (x0 (p0/p)^(1/n) + (1 - x0) exp(-(p - p0) / K_oil))

    n : exponent of the compression path p V^n = const: 1 for air settled at the oil's
        temperature (isothermal, Boyle), 1.4 for a fast squeeze (adiabatic)

    >>> round(air_fraction_at_pressure(0.01, 101.3, 1.013), 6)
    0.000102
    """
    air = x0 * (p0_abs_bar / p_abs_bar) ** (1.0 / n)
    oil = (1.0 - x0) * math.exp(-(p_abs_bar - p0_abs_bar) / k_oil_bar)
    return air / (air + oil)


def effective_bulk_modulus(k_oil_bar: float, air_fraction: float, p_abs_bar: float,
                           n: float = 1.0) -> float:
    """Bulk modulus [bar] of oil holding `air_fraction` of free air at `p_abs_bar` (absolute).

    1 / K_eff = (1 - x) / K_oil + x / (n p)

    >>> round(effective_bulk_modulus(16000.0, 0.01, 100.0, 1.4), 1)
    7501.7
    >>> effective_bulk_modulus(16000.0, 0.0, 100.0)
    16000.0

    Source: mixture rule as in Merritt (1967), from memory.
    """
    return 1.0 / ((1.0 - air_fraction) / k_oil_bar + air_fraction / (n * p_abs_bar))


def column_compression(volume: float, x0: float, p0_abs_bar: float, p1_abs_bar: float,
                       n: float = 1.0, k_oil_bar: float = K_OIL_BAR) -> float:
    """Volume lost [same unit as `volume`] when a column with air fraction `x0` at `p0` is pressed to `p1`.

    dV = V0 - V0 [x0 (p0/p1)^(1/n) + (1 - x0) exp(-(p1 - p0) / K_oil)]

    written as V0 [-(1 - x0) expm1(-dp / K_oil) - x0 expm1(-log1p(dp / p0) / n)], dp = p1 - p0,
    so a tiny pressure rise keeps its precision instead of vanishing in 1 - (nearly 1).

    >>> round(column_compression(1.0, 0.0, 1.0, 161.0, 1.0, 16000.0), 6)
    0.00995
    >>> round(column_compression(1.0, 0.01, 1.0, 2.0, 1.0, 1.0e12), 6)
    0.005
    >>> column_compression(1.0, 0.01, 1.0, 1.0 + 1e-15, 1.0, 16000.0) > 0.0
    True
    """
    dp = p1_abs_bar - p0_abs_bar
    oil = -(1.0 - x0) * math.expm1(-dp / k_oil_bar)
    air = -x0 * math.expm1(-math.log1p(dp / p0_abs_bar) / n)
    return volume * (oil + air)


def piston_area_mm2(bore_mm: float) -> float:
    """pi/4 d^2 [mm^2].

    >>> round(piston_area_mm2(100.0))
    7854
    """
    return math.pi / 4.0 * bore_mm ** 2


def load_pressure_bar(load_kn: float, bore_mm: float) -> float:
    """Pressure [bar] under a piston of `bore_mm` carrying `load_kn` [kN]: F / A.

    >>> round(load_pressure_bar(100.0, 100.0), 2)
    127.32
    """
    return load_kn * 1000.0 / piston_area_mm2(bore_mm) * 10.0  # N/mm^2 = MPa = 10 bar


def stiffness_loss_pct(air_pct: float, pressure_bar: float) -> float:
    """Loss of stiffness [%] of oil holding `air_pct` free air (at atmospheric) at a gauge pressure.

    loss = 100 (1 - K_eff / K_oil), with the air compressed isothermally to the working
    pressure and K_eff from the mixture rule of calc.air (1/K = (1-x)/K_oil + x/p).

    >>> round(stiffness_loss_pct(1.0, 10.0), 1)
    57.4

    Source: Boyle's law and the mixture rule (Merritt 1967, from memory), as above.
    """
    p_abs = pressure_bar + ATMOSPHERE_ROUNDED_BAR
    x = air_fraction_at_pressure(air_pct / 100.0, p_abs)
    return 100.0 * (1.0 - effective_bulk_modulus(K_OIL_BAR, x, p_abs) / K_OIL_BAR)
