"""Tank volume at a level, and tank size against the pump's flow and the oil's air release.

Three shapes, all measured inside, level from the inside bottom:

    rectangular          V = L W h
    vertical cylinder    V = (pi D^2 / 4) h
    horizontal cylinder  V = L [R^2 acos((R - h) / R) - (R - h) sqrt(2 R h - h^2)]   (flat ends)

The horizontal cylinder's segment area is the circular segment of height h
(any geometry handbook, e.g. Perry's Chemical Engineers' Handbook, "mensuration
formulas"); its inverse, the level holding a given volume, has no closed form
and is solved by bisection.
"""

from __future__ import annotations

import math

from ..kernel.solve import bisect


MM3_PER_L = 1.0e6


def rectangular_volume_l(length_mm: float, width_mm: float, level_mm: float) -> float:
    """Oil [L] in a rectangular tank, V = L W h; dimensions inside [mm].

    >>> rectangular_volume_l(1000.0, 500.0, 400.0)
    200.0
    """
    return length_mm * width_mm * level_mm / MM3_PER_L


def vertical_cylinder_volume_l(diameter_mm: float, level_mm: float) -> float:
    """Oil [L] in an upright cylinder, V = (pi D^2 / 4) h; inside diameter and level [mm].

    >>> round(vertical_cylinder_volume_l(1000.0, 500.0), 2)
    392.7
    """
    return math.pi * diameter_mm ** 2 / 4.0 * level_mm / MM3_PER_L


def segment_area_mm2(diameter_mm: float, level_mm: float) -> float:
    """Area [mm^2] of a circle of `diameter_mm` below a chord at height `level_mm`.

    A = R^2 acos((R - h) / R) - (R - h) sqrt(2 R h - h^2) = R^2 (theta - sin theta) / 2,
    with the central angle theta = 4 asin(sqrt(h / D)) (the same angle, free of the
    cancellation acos suffers near h = 0); above half full, A = pi R^2 - A(D - h).

    >>> round(segment_area_mm2(1000.0, 500.0) / (math.pi * 500.0 ** 2 / 2.0), 12)
    1.0
    """
    h = min(max(level_mm, 0.0), diameter_mm)
    if h > diameter_mm / 2.0:
        return math.pi * diameter_mm ** 2 / 4.0 - segment_area_mm2(diameter_mm, diameter_mm - h)
    theta = 4.0 * math.asin(math.sqrt(h / diameter_mm))
    # theta - sin(theta) by its series when small, where the difference would lose digits.
    excess = (theta ** 3 / 6.0 - theta ** 5 / 120.0 + theta ** 7 / 5040.0 if theta < 1e-2
              else theta - math.sin(theta))
    return diameter_mm ** 2 / 8.0 * excess


def horizontal_cylinder_volume_l(diameter_mm: float, length_mm: float, level_mm: float) -> float:
    """Oil [L] in a horizontal cylinder with flat ends: segment area times length.

    Source: circular segment formula (Perry's Handbook, mensuration formulas).

    >>> round(horizontal_cylinder_volume_l(1000.0, 2000.0, 250.0), 1)
    307.1
    """
    return segment_area_mm2(diameter_mm, level_mm) * length_mm / MM3_PER_L


def horizontal_cylinder_level_mm(diameter_mm: float, length_mm: float, volume_l: float) -> float:
    """Level [mm] at which a horizontal flat-ended cylinder holds `volume_l` [L].

    The segment area grows monotonically with the level, so bisection on
    [0, D] converges; 60 halvings reach below 1e-15 D.

    >>> round(horizontal_cylinder_level_mm(1000.0, 2000.0, 307.092), 2)
    250.0
    """
    return bisect(lambda level: horizontal_cylinder_volume_l(diameter_mm, length_mm, level)
                  - volume_l, 0.0, diameter_mm, rel_tol=0.0, max_iter=60)


def depth_mm(shape: str, height_mm: float, diameter_mm: float) -> float:
    """The inside depth of the tank: its height, or the diameter of a horizontal cylinder."""
    return diameter_mm if shape == "horizontal" else height_mm


def volume_at_level_l(shape: str, length_mm: float, width_mm: float, height_mm: float,
                      diameter_mm: float, level_mm: float) -> float:
    """Oil [L] at `level_mm` in a tank of `shape`; dimensions a shape does not use are ignored.

    >>> volume_at_level_l("vertical", 0.0, 0.0, 1200.0, 1000.0, 500.0) == vertical_cylinder_volume_l(1000.0, 500.0)
    True
    """
    if shape == "rectangular":
        return rectangular_volume_l(length_mm, width_mm, level_mm)
    if shape == "vertical":
        return vertical_cylinder_volume_l(diameter_mm, level_mm)
    return horizontal_cylinder_volume_l(diameter_mm, length_mm, level_mm)


def level_for_volume_mm(shape: str, length_mm: float, width_mm: float, height_mm: float,
                        diameter_mm: float, volume_l: float) -> float:
    """The level [mm] at which a tank of `shape` holds `volume_l` [L]: the inverse of
    `volume_at_level_l` (closed form for the prisms, bisection for the horizontal cylinder).

    >>> level_for_volume_mm("rectangular", 1000.0, 500.0, 800.0, 0.0, 200.0)
    400.0
    """
    if shape == "horizontal":
        return horizontal_cylinder_level_mm(diameter_mm, length_mm, volume_l)
    return volume_l / volume_at_level_l(shape, length_mm, width_mm, height_mm, diameter_mm, 1.0)


def dwell_minutes(oil_volume_l: float, flow_lpm: float) -> float:
    """Mean time [min] the oil spends in the tank, t = V / Q.

    The mean of a well-mixed tank; flow short-circuiting from return to suction makes the
    real time for part of the oil shorter.

    >>> dwell_minutes(300.0, 100.0)
    3.0
    """
    return oil_volume_l / flow_lpm


def tank_volume_needed_l(flow_lpm: float, minutes: float, fill_fraction: float) -> float:
    """Full tank volume [L] that holds `minutes` of pump flow when filled to `fill_fraction`.

    >>> tank_volume_needed_l(100.0, 3.0, 0.75)
    400.0
    """
    return flow_lpm * minutes / fill_fraction
