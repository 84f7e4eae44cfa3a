"""Drying the oil: time for a dehydrator or a water-removing filter to reach a target content.

A unit drawing `Q` from a well-mixed tank of `V` and removing the fraction `eta`
of the water in each pass (single-pass efficiency) lowers the content as

    V dC/dt = -eta Q C       so       C(t) = C0 exp(-eta Q t / V)

and needs t = V / (eta Q) ln(C0 / C_target); the content halves every
ln(2) V / (eta Q). The model assumes no new water gets in while drying and a
constant efficiency; real units lose efficiency as the oil dries, so read the
time as the least it will take.

Source: first-order (well-mixed tank) mass balance.
"""

from __future__ import annotations

import math


def well_mixed_content_ppm(c0_ppm: float, minutes: float, flow_lpm: float, efficiency_pct: float,
                           volume_l: float) -> float:
    """Water content [ppm] after `minutes` [min] of drying a well-mixed tank.

    C(t) = C0 exp(-eta Q t / V), eta = efficiency_pct / 100, Q [L/min], V [L]

    >>> round(well_mixed_content_ppm(400.0, 60.0, 20.0, 50.0, 600.0), 1)
    147.2
    """
    return c0_ppm * math.exp(-efficiency_pct / 100.0 * flow_lpm * minutes / volume_l)


def drying_time_min(c0_ppm: float, target_ppm: float, flow_lpm: float, efficiency_pct: float,
                    volume_l: float) -> float:
    """Minutes [min] to bring a well-mixed tank from `c0_ppm` to `target_ppm`; 0 if already there.

    t = V / (eta Q) ln(C0 / C_target)

    >>> round(drying_time_min(400.0, 100.0, 20.0, 50.0, 600.0), 1)
    83.2
    """
    if c0_ppm <= target_ppm:
        return 0.0
    return volume_l / (efficiency_pct / 100.0 * flow_lpm) * math.log(c0_ppm / target_ppm)


def halving_time_min(flow_lpm: float, efficiency_pct: float, volume_l: float) -> float:
    """Minutes [min] in which a well-mixed tank's water content halves: ln(2) V / (eta Q).

    >>> round(halving_time_min(20.0, 50.0, 600.0), 1)
    41.6
    """
    return math.log(2.0) * volume_l / (efficiency_pct / 100.0 * flow_lpm)
