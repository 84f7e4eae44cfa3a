"""Losses of pipe fittings that rise as the flow turns laminar: the 2-K method of Hooper.

A constant loss factor K holds only for turbulent flow; at the low Reynolds numbers of cold
oil in a suction line a fitting loses many times more. Hooper's two constants per fitting
give

    K = K1 / Re + K_inf (1 + 1 in / D)          elbows, tees, valves (D inside, in inches)
    K = K1 / Re + K_inf                         pipe entrances (no size term)

and the velocity head the oil gains at the entry carries the kinetic-energy factor of its
velocity profile: alpha = 2 for the parabolic profile of laminar flow, about 1 turbulent.

Sources: W. B. Hooper, "The 2-K method predicts head losses in pipe fittings", Chemical
Engineering, Aug. 24, 1981, p. 96 (constants from memory, cross-checked against
fluids.fittings.Hooper in the tests); alpha = 2 for Hagen-Poiseuille flow (any fluid
mechanics text, e.g. F. M. White, Fluid Mechanics, the energy equation).

>>> round(two_k(800.0, 0.4, 1.0e5, 50.0), 4)
0.6112
"""

from __future__ import annotations

from typing import NamedTuple

from .lines import RE_LAMINAR_MAX, RE_TURBULENT_MIN

MM_PER_INCH = 25.4

# Hooper (1981), Table 1: (K1, K_inf) of the fittings a suction line is built from.
ELBOW_90 = (800.0, 0.40)  # 90° elbow, standard (R/D = 1), screwed
BEND_90 = (800.0, 0.20)  # 90° bend, long radius (R/D = 1.5)
ELBOW_45 = (500.0, 0.20)  # 45° elbow, standard (R/D = 1)
TEE_BRANCH = (500.0, 0.70)  # tee with the flow turning through the branch, screwed
FULL_BORE_VALVE = (300.0, 0.10)  # gate, ball or plug valve, full line size
BUTTERFLY_VALVE = (800.0, 0.25)
# Hooper (1981): pipe entrances, K1 = 160 for all.
ENTRANCE_SHARP = (160.0, 0.50)  # flush with the tank wall, sharp edge
ENTRANCE_PROJECTING = (160.0, 1.00)  # pipe standing into the tank (Borda entrance)
ENTRANCE_ROUNDED = (160.0, 0.04)  # well rounded, r/D 0.15 and more


class Fitting(NamedTuple):
    """`count` fittings of the 2-K constants (k1, k_inf); an entrance has no size term."""

    count: float
    k1: float
    k_inf: float
    entrance: bool = False


def two_k(k1: float, k_inf: float, re: float, bore_mm: float) -> float:
    """Loss factor of one fitting at Reynolds number `re` in a bore of `bore_mm` [mm].

    K = K1 / Re + K_inf (1 + 1 in / D)

    >>> round(two_k(800.0, 0.4, 50.0, 50.0), 3)
    16.603
    """
    return k1 / re + k_inf * (1.0 + MM_PER_INCH / bore_mm)


def entrance_k(k1: float, k_inf: float, re: float) -> float:
    """Loss factor of a pipe entrance at Reynolds number `re`: K = K1 / Re + K_inf.

    >>> entrance_k(160.0, 0.5, 320.0)
    1.0
    """
    return k1 / re + k_inf


def fittings_k(fittings: tuple[Fitting, ...], re: float, bore_mm: float) -> float:
    """Sum of the loss factors of `fittings` at `re` in a bore of `bore_mm` [mm].

    >>> round(fittings_k((Fitting(1, *ENTRANCE_SHARP, entrance=True), Fitting(2, *ELBOW_90)),
    ...                  1.0e6, 50.0), 3)
    1.708
    """
    return sum(f.count * (entrance_k(f.k1, f.k_inf, re) if f.entrance
                          else two_k(f.k1, f.k_inf, re, bore_mm)) for f in fittings)


def kinetic_energy_factor(re: float) -> float:
    """Kinetic-energy factor alpha of the flow's velocity profile: 2 laminar, 1 turbulent.

    Between Re 2300 and 4000 it is taken linearly in Re, so the energy balance has no jump.

    >>> kinetic_energy_factor(1000.0), kinetic_energy_factor(3150.0), kinetic_energy_factor(1.0e5)
    (2.0, 1.5, 1.0)
    """
    if re <= RE_LAMINAR_MAX:
        return 2.0
    if re >= RE_TURBULENT_MIN:
        return 1.0
    return 2.0 - (re - RE_LAMINAR_MAX) / (RE_TURBULENT_MIN - RE_LAMINAR_MAX)
