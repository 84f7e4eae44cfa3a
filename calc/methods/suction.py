"""Pump inlet pressure: hot, at a cold start, and the temperature below which the pump starves.

Energy balance from the oil surface in the tank (at rest, at atmospheric
pressure) to the pump inlet (absolute pressures):

    p_inlet = p_atm + rho g h - (alpha + K(Re) + f L / D) rho v^2 / 2 - dp_strainer

h is the height of the lowest working oil level above the inlet (negative when
the pump lifts the oil), alpha the kinetic-energy factor of the velocity head the oil
gains (2 laminar, 1 turbulent), K(Re) the sum of the fittings' loss factors by Hooper's
2-K method (calc.methods.fittings), f the Darcy friction factor of the line (Churchill,
calc.methods.lines). The oil's viscosity at each temperature comes from its ASTM D341
line (calc.methods.viscosity).

Sources: Darcy-Weisbach and Bernoulli (any fluid mechanics text); standard
gravity 9.806 65 m/s^2 (CGPM 1901); Hooper (1981); Churchill (1977).
"""

from __future__ import annotations

from typing import Callable

from ..kernel.constants import STANDARD_GRAVITY
from ..kernel.solve import bisect
from .fittings import Fitting, fittings_k, kinetic_energy_factor
from .lines import darcy_drop_bar, dynamic_pressure_bar, friction_factor, line_velocity, reynolds_number

# The coldest temperature searched for starving, and the step of the search.
SCAN_LOW_C = -40.0
SCAN_STEP_K = 1.0


def static_head_bar(density_kgm3: float, head_m: float) -> float:
    """Pressure of an oil column rho g h [bar]; negative h (pump above the oil) gives suction.

    >>> round(static_head_bar(870.0, 1.0), 5)
    0.08532
    """
    return density_kgm3 * STANDARD_GRAVITY * head_m / 1.0e5


def strainer_drop_bar(rated_bar: float, kv_cst: float, rated_kv_cst: float, model: str,
                      bypass_bar: float | None = None) -> float:
    """Strainer pressure drop [bar] at `kv_cst`, from `rated_bar` measured at `rated_kv_cst`.

    model "viscous": dp = rated * kv / rated_kv (laminar flow through a mesh: an assumption);
    model "constant": dp = rated. A bypass valve caps the drop at its opening pressure.

    >>> strainer_drop_bar(0.05, 460.0, 23.0, "viscous"), strainer_drop_bar(0.05, 460.0, 23.0, "viscous", 0.2)
    (1.0, 0.2)
    """
    drop = rated_bar * kv_cst / rated_kv_cst if model == "viscous" else rated_bar
    return drop if bypass_bar is None else min(drop, bypass_bar)


def inlet_pressure_bar(atmosphere_bar: float, head_m: float, density_kgm3: float,
                       flow_lpm: float, bore_mm: float, length_m: float, roughness_mm: float,
                       fittings: tuple[Fitting, ...], kv_cst: float, strainer_bar: float) -> float:
    """Absolute pressure [bar] at the pump inlet, as the energy balance gives it.

    p = p_atm + rho g h - (alpha + K(Re) + f L / D) rho v^2 / 2 - dp_strainer

    A result at or below zero means the line cannot bring this flow at all: the oil column
    breaks long before (see the suction-check tool).

    >>> from calc.methods.fittings import ENTRANCE_SHARP, ELBOW_90
    >>> fittings = (Fitting(1, *ENTRANCE_SHARP, entrance=True), Fitting(2, *ELBOW_90))
    >>> round(inlet_pressure_bar(1.013, 0.3, 870.0, 100.0, 50.0, 1.5, 0.045, fittings, 23.0, 0.05), 4)
    0.9707
    """
    velocity = line_velocity(flow_lpm, bore_mm)
    re = reynolds_number(velocity, bore_mm, kv_cst)
    f = friction_factor(re, roughness_mm / bore_mm)
    line_loss = (darcy_drop_bar(f, length_m, bore_mm, density_kgm3, velocity)
                 + (kinetic_energy_factor(re) + fittings_k(fittings, re, bore_mm))
                 * dynamic_pressure_bar(density_kgm3, velocity))
    return atmosphere_bar + static_head_bar(density_kgm3, head_m) - line_loss - strainer_bar


def starving_temperature(inlet_at: Callable[[float], float], p_min_bar: float,
                         warm_c: float, cold_c: float = SCAN_LOW_C) -> float | None:
    """Warmest temperature [degC] below `warm_c` at which `inlet_at(T)` falls to `p_min_bar`.

    Steps down from `warm_c` in 1 K steps to the first temperature with the inlet below the
    minimum, then bisects that step to 1e-6 K. None when the inlet is already below the
    minimum at `warm_c`, or stays above it down to `cold_c`. (Stepping first matters: the
    friction loss drops a little where cooling turns the flow laminar, so the margin is not
    strictly monotone in temperature across the transition.)

    >>> round(starving_temperature(lambda t: 0.5 + 0.01 * t, 0.8, 80.0), 6)
    30.0
    """
    margin = lambda t: inlet_at(t) - p_min_bar  # noqa: E731
    if margin(warm_c) < 0.0:
        return None
    upper = warm_c
    while upper > cold_c:
        lower = max(upper - SCAN_STEP_K, cold_c)
        if margin(lower) < 0.0:
            return bisect(margin, lower, upper, x_tol=1e-6, rel_tol=0.0, max_iter=60)
        upper = lower
    return None
