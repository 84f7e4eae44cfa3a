"""Oil lines: mean velocity, the bore a velocity needs, and Darcy-Weisbach friction.

Mean velocity of a flow Q in a round bore d (continuity):

    v [m/s] = (Q [L/min] / 60 000) / (pi/4 * (d [mm] / 1000)^2)

Friction in a full round line (Darcy-Weisbach):

    dp = f * (L / D) * rho * v^2 / 2

with f from Churchill's equation (1977), which spans laminar, transitional and turbulent
flow in one smooth expression: 64/Re when laminar, Colebrook's turbulent values (solved
here too, for reference) to about 1 %, and no jump in between.

Sources: Darcy-Weisbach and the laminar f = 64/Re (Hagen-Poiseuille); S. W. Churchill,
Chem. Eng. 84 (1977); C. F. Colebrook, "Turbulent flow in pipes...", J. Inst. Civil Eng.
11 (1939); the 2300 / 4000 limits of the transition (for naming the regime) are common
practice.
"""

from __future__ import annotations

import math


RE_LAMINAR_MAX = 2300.0  # common practice


RE_TURBULENT_MIN = 4000.0  # common practice


# Hydraulic hose sizes: (SAE dash number, nominal bore [mm], ISO/EN nominal size DN).
# SAE J517 numbers a hose by its nominal inside diameter in sixteenths of an inch, so the
# bore is dash * 25.4 / 16 mm exactly; the DN pairing is from memory of EN 853 / ISO 18752
# tables. Actual bores vary a little by maker and hose type: check the hose's data sheet.
HOSE_SIZES = tuple((dash, dash * 25.4 / 16.0, dn) for dash, dn in (
    (4, 6), (5, 8), (6, 10), (8, 12), (10, 16), (12, 19), (16, 25), (20, 31), (24, 38),
    (32, 51), (40, 63), (48, 76)))


def line_velocity(flow_lpm: float, bore_mm: float) -> float:
    """Mean velocity [m/s] of `flow_lpm` [L/min] in a round bore of `bore_mm` [mm].

    v = (Q / 60 000) / (pi/4 * (d / 1000)^2)

    >>> round(line_velocity(100.0, 25.0), 2)
    3.4
    >>> round(line_velocity(60.0, 1000.0 * math.sqrt(4.0 / math.pi) * 0.1), 6)
    0.1

    Source: continuity, Q = v * A.
    """
    return (flow_lpm / 60000.0) / (math.pi / 4.0 * (bore_mm / 1000.0) ** 2)


def bore_for_velocity(flow_lpm: float, velocity_ms: float) -> float:
    """Bore [mm] in which `flow_lpm` [L/min] moves at `velocity_ms` [m/s]: inverse of line_velocity.

    d = 1000 * sqrt(4 * (Q / 60 000) / (pi * v))

    >>> round(bore_for_velocity(100.0, 3.395), 2)
    25.0
    """
    return 1000.0 * math.sqrt(4.0 * (flow_lpm / 60000.0) / (math.pi * velocity_ms))


def next_hose_size(bore_mm: float) -> tuple[int, float, int] | None:
    """The smallest hose size (dash, bore [mm], DN) at least `bore_mm` [mm]; None past the list.

    >>> next_hose_size(23.0)
    (16, 25.4, 25)
    """
    return next((size for size in HOSE_SIZES if size[1] >= bore_mm * (1.0 - 1e-9)), None)


def reynolds_number(velocity_ms: float, bore_mm: float, kv_cst: float) -> float:
    """Reynolds number Re = v * d / nu, with d [mm] and nu [cSt = mm^2/s].

    >>> round(reynolds_number(1.0, 50.0, 50.0))
    1000
    """
    return velocity_ms * bore_mm * 1000.0 / kv_cst


def colebrook_friction(re: float, rel_roughness: float) -> float:
    """Darcy friction factor of turbulent flow by the Colebrook equation, solved by iteration.

    1/sqrt(f) = -2 log10(rel_roughness / 3.7 + 2.51 / (Re sqrt(f)))

    Fixed-point iteration on x = 1/sqrt(f) from x = 8 converges to 1e-12 in a handful
    of steps over the Moody chart's range.

    >>> round(colebrook_friction(1.0e5, 0.0), 4)
    0.018

    Source: Colebrook (1939).
    """
    x = 8.0
    for _ in range(100):
        new = -2.0 * math.log10(rel_roughness / 3.7 + 2.51 * x / re)
        if abs(new - x) < 1e-12:
            x = new
            break
        x = new
    return 1.0 / (x * x)


def churchill_friction(re: float, rel_roughness: float = 0.0) -> float:
    """Darcy friction factor for any Reynolds number, laminar to fully rough (Churchill 1977).

    f = 8 [(8 / Re)^12 + (A + B)^-1.5]^(1/12)
    A = [2.457 ln(1 / ((7 / Re)^0.9 + 0.27 e/D))]^16      B = (37 530 / Re)^16

    One smooth equation: 64/Re in laminar flow, Colebrook's values to about 1 % when
    turbulent, and a transition between them with no jump.

    >>> round(churchill_friction(1000.0), 6), round(churchill_friction(1.0e5, 1e-4), 5)
    (0.064, 0.01846)

    Source: S. W. Churchill, "Friction-factor equation spans all fluid-flow regimes",
    Chemical Engineering 84 (Nov. 7, 1977) 91-92.
    """
    a = (2.457 * math.log(1.0 / ((7.0 / re) ** 0.9 + 0.27 * rel_roughness))) ** 16
    b = (37530.0 / re) ** 16
    return 8.0 * ((8.0 / re) ** 12 + (a + b) ** -1.5) ** (1.0 / 12.0)


def friction_factor(re: float, rel_roughness: float = 0.0) -> float:
    """Darcy friction factor of a round line at any Reynolds number: `churchill_friction`.

    >>> round(friction_factor(1000.0), 4), round(friction_factor(1.0e5, 0.0), 4)
    (0.064, 0.0179)
    """
    return churchill_friction(re, rel_roughness)


def flow_regime(re: float) -> str:
    """ "laminar", "transition" or "turbulent" by the common-practice limits 2300 and 4000."""
    if re < RE_LAMINAR_MAX:
        return "laminar"
    return "turbulent" if re >= RE_TURBULENT_MIN else "transition"


def dynamic_pressure_bar(density_kgm3: float, velocity_ms: float) -> float:
    """rho * v^2 / 2 in bar.

    >>> dynamic_pressure_bar(1000.0, 2.0)
    0.02
    """
    return density_kgm3 * velocity_ms ** 2 / 2.0 / 1.0e5


def darcy_drop_bar(friction: float, length_m: float, bore_mm: float, density_kgm3: float,
                   velocity_ms: float) -> float:
    """Darcy-Weisbach friction loss [bar]: f * (L / D) * rho * v^2 / 2.

    >>> round(darcy_drop_bar(0.064, 2.0, 50.0, 870.0, 1.0), 5)
    0.01114
    """
    return friction * length_m / (bore_mm / 1000.0) * dynamic_pressure_bar(density_kgm3, velocity_ms)
