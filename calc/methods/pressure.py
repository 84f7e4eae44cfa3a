"""Viscosity under pressure: the Barus relation.

An oil thickens when it is squeezed. Barus's relation puts the rise as an exponential of
the pressure above the reference (atmospheric) pressure:

    eta_p = eta_0 exp(alpha p)

with alpha the pressure-viscosity coefficient [1/bar]. From two readings r1, r2 of anything
proportional to viscosity (a falling-ball time, a capillary flow time, a viscosity) at two
pressures p1, p2 the coefficient is

    alpha = ln(r2 / r1) / (p2 - p1)

Source: C. Barus, "Isothermals, isopiestics and isometrics relative to viscosity",
American Journal of Science 45 (1893) 87-96 (from memory). Typical mineral-oil
coefficients 1.5e-3 to 2.5e-3 1/bar (15 to 25 1/GPa), and the overestimate above a few
thousand bar: from memory.
"""

from __future__ import annotations

import math


def barus_factor(alpha_per_bar: float, pressure_bar: float) -> float:
    """Factor by which viscosity rises at `pressure_bar` above the reference pressure.

    eta_p / eta_0 = exp(alpha p)

    >>> round(barus_factor(2.0e-3, 350.0), 4)
    2.0138

    Source: Barus (1893).
    """
    return math.exp(alpha_per_bar * pressure_bar)


def barus_alpha(p1_bar: float, reading1: float, p2_bar: float, reading2: float) -> float:
    """Pressure-viscosity coefficient [1/bar] from two readings proportional to viscosity.

    alpha = ln(r2 / r1) / (p2 - p1); r may be viscosities, falling-ball times or flow times.

    >>> round(barus_alpha(0.0, 1.0, 500.0, math.e), 6)
    0.002

    Source: Barus (1893), solved for alpha.
    """
    return math.log(reading2 / reading1) / (p2_bar - p1_bar)
