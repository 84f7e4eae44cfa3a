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

from ..kernel.errors import InputError
from ..kernel.registry import TANK, Field, Output, tool
from ..kernel.result import COMMON_PRACTICE, Q, Result
from ..kernel.solve import bisect

MM3_PER_L = 1.0e6

SHAPE_CHOICES = (("rectangular", "Rectangular"), ("vertical", "Vertical cylinder"),
                 ("horizontal", "Horizontal cylinder, flat ends"))


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


def shape_fields() -> tuple[Field, ...]:
    """The tank's shape, inside dimensions and oil level: shared by the tank tools."""
    dim = dict(min=50.0, max=20000.0)
    return (
        Field("shape", "Tank shape", "choice", "rectangular", choices=SHAPE_CHOICES),
        Field("length", "Inside length", "length", 1200.0, **dim,
              help="Rectangular tank or horizontal cylinder."),
        Field("width", "Inside width", "length", 800.0, **dim, help="Rectangular tank only."),
        Field("height", "Inside height", "length", 700.0, **dim,
              help="Rectangular tank or vertical cylinder."),
        Field("diameter", "Inside diameter", "length", 800.0, **dim, help="Cylinders only."),
        Field("level", "Oil level from the bottom", "length", 550.0, min=0.0, max=20000.0,
              help="Measured inside, from the bottom of the tank to the oil surface."),
    )


def check_level(shape: str, height_mm: float, diameter_mm: float, level_mm: float) -> float:
    """The tank's depth [mm]; InputError on `level` when the oil would stand above it."""
    depth = depth_mm(shape, height_mm, diameter_mm)
    if level_mm > depth:
        what = "diameter" if shape == "horizontal" else "inside height"
        raise InputError("level", f"the level ({level_mm:g} mm) cannot be above the tank's {what} "
                                  f"({depth:g} mm)")
    return depth


_V = "volume"
_MM = "length"
_PCT = "percent"


@tool(
    "tank-volume",
    title="Tank volume at a level",
    summary="Oil in the tank at a measured level (or the level for a volume), the full volume, "
            "how full it is and the air space above the oil.",
    topic=TANK,
    inputs=shape_fields() + (
        Field("volume", "Oil volume (to find its level)", _V, None, min=0.0, max=1.0e7,
              optional=True, help="Leave blank to compute the volume at the level above; enter a "
                                  "volume to find the level it stands at."),
    ),
    outputs=(
        Output("oil_volume", "Oil in the tank", _V, headline=True),
        Output("oil_level", "Oil level", _MM),
        Output("full_volume", "Full volume", _V),
        Output("percent_full", "Full", _PCT, "Oil volume as a share of the full volume.", headline=True),
        Output("air_space", "Air space above the oil", _V),
        Output("mode", "Computed", "text"),
    ),
)
def tank_volume(shape: str, length: float, width: float, height: float, diameter: float,
                level: float, volume: float | None = None) -> Result:
    """Volume at a level, or the level of a volume, for one of three tank shapes."""
    dims = (shape, length, width, height, diameter)
    depth = depth_mm(shape, height, diameter)
    full = volume_at_level_l(*dims, depth)
    if volume is None:
        check_level(shape, height, diameter, level)
        oil, oil_level, mode = volume_at_level_l(*dims, level), level, "volume from level"
    else:
        if volume > full:
            raise InputError("volume", f"{volume:g} L does not fit: the tank holds {full:.4g} L "
                                       "when full")
        oil, oil_level, mode = volume, level_for_volume_mm(*dims, volume), "level from volume"
    result = Result(values={"oil_volume": oil, "oil_level": oil_level, "full_volume": full,
                            "percent_full": 100.0 * oil / full, "air_space": full - oil,
                            "mode": mode})
    if full - oil < 0.1 * full:
        result.add("watch", COMMON_PRACTICE,
                   "Less than a tenth of the tank ({0}) is air space: leave room for the oil's "
                   "expansion when hot and for oil coming back from cylinders and accumulators "
                   "when the machine stops.", Q(0.1 * full, _V))
    result.note("Dimensions are inside dimensions; baffles, pipes and heaters inside the tank "
                "take up some of the volume, and the oil below the suction inlet cannot be used.")
    if shape == "horizontal":
        result.note("Horizontal cylinder: a millimetre of level is worth least near the bottom and "
                    "the top, most at half full; read the sight glass with the machine level.")
    result.sources.append("Rectangle, cylinder and circular-segment volumes (Perry's Chemical "
                          "Engineers' Handbook, mensuration formulas)")
    return result


# Tank volume in minutes of pump flow: common practice, not a standard. Industrial power units
# are usually built to 3 to 5 times the pump's flow per minute; mobile machines, short of room
# and weight, to 1 to 2 times, with a cooler and careful return design.
FLOW_MINUTES = {"industrial": (3.0, 5.0), "mobile": (1.0, 2.0)}
APPLICATION_CHOICES = (("industrial", "Industrial (stationary)"), ("mobile", "Mobile machine"))

# Dwell at the working level against the oil's ISO 9120 air-release time (common practice):
# the oil should stay in the tank at least as long as the test took to clear it; under half
# that, bubbles surely reach the pump.
DWELL_OK_RATIO = 1.0
DWELL_ACT_RATIO = 0.5

_MIN = "minutes"


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


@tool(
    "tank-sizing",
    title="Tank size and dwell time",
    summary="The tank against the pump's flow (minutes of flow) and the time the oil stays in "
            "it against its air-release time, at the working level and at the low level.",
    topic=TANK,
    inputs=(
        Field("tank_volume", "Full tank volume", _V, 400.0, min=1.0, max=1.0e6,
              help="The tank-volume tool gives it from the dimensions."),
        Field("flow", "Pump flow", "flow", 100.0, min=0.1, max=1.0e5,
              help="Flow actually delivered, e.g. displacement x speed x volumetric efficiency."),
        Field("application", "Machine", "choice", "industrial", choices=APPLICATION_CHOICES),
        Field("working_level", "Working level, % of full volume", _PCT, 80.0, min=1.0, max=100.0),
        Field("low_level", "Lowest level in the cycle, % of full volume", _PCT, None, min=1.0,
              max=100.0, optional=True,
              help="With cylinders extended and accumulators charged; blank if it stays put."),
        Field("air_release", "Air-release time of the oil", _MIN, 5.0, min=0.1, max=120.0,
              help="ISO 9120 / ASTM D3427 result, usually at 50 °C, from the data sheet or a "
                   "lab report of the oil in service."),
        Field("baffle", "Baffle between return and suction", "choice", "yes",
              choices=(("yes", "Yes"), ("no", "No or not known"))),
    ),
    outputs=(
        Output("oil_volume", "Oil at the working level", _V),
        Output("flow_minutes", "Tank volume in minutes of pump flow", _MIN, headline=True),
        Output("practice", "Common practice", "text"),
        Output("dwell", "Dwell time at the working level", _MIN, headline=True),
        Output("dwell_ratio", "Dwell / air-release time", "ratio"),
        Output("low_dwell", "Dwell time at the low level", _MIN),
        Output("low_ratio", "Dwell / air-release time at the low level", "ratio"),
        Output("level_needed", "Lowest level for a dwell of the air-release time", _PCT,
               "Blank when even a full tank falls short."),
        Output("tank_needed", "Tank volume needed", _V,
               "The larger of: the common-practice minutes of flow, and the air-release time "
               "of flow at the working level."),
    ),
)
def tank_sizing(tank_volume: float, flow: float, application: str, working_level: float,
                air_release: float, baffle: str, low_level: float | None = None) -> Result:
    """Tank minutes of flow and dwell time against common practice and the air-release time."""
    if low_level is not None and low_level > working_level:
        raise InputError("low_level", "the lowest level must be at or below the working level")
    lo_min, hi_min = FLOW_MINUTES[application]
    fill = working_level / 100.0
    oil = tank_volume * working_level / 100.0
    dwell = dwell_minutes(oil, flow)
    ratio = dwell / air_release
    level_needed = 100.0 * DWELL_OK_RATIO * air_release * flow / tank_volume
    flow_minutes = dwell_minutes(tank_volume, flow)
    needed = max(tank_volume_needed_l(flow, lo_min, 1.0),
                 tank_volume_needed_l(flow, DWELL_OK_RATIO * air_release, fill))
    values = {"oil_volume": oil, "flow_minutes": flow_minutes, "dwell": dwell, "dwell_ratio": ratio,
              "practice": f"{lo_min:g} to {hi_min:g} min of pump flow ({application}, "
                          "common practice)",
              "low_dwell": None, "low_ratio": None,
              "level_needed": level_needed if level_needed <= 100.0 else None,
              "tank_needed": needed}
    result = Result(values=values)
    at = (Q(flow_minutes, _MIN), Q(lo_min, _MIN), Q(hi_min, _MIN))
    if flow_minutes < lo_min:
        result.add("watch", COMMON_PRACTICE,
                   "The tank holds only {0} of pump flow, under the usual {1} to {2}: the oil has "
                   "little time to shed air, heat and dirt; a tank of about {3}, or a cooler and "
                   "a well-placed return, make up for it.", *at, Q(needed, _V))
    else:
        result.add("ok", COMMON_PRACTICE,
                   "The tank holds {0} of pump flow, at or above the usual {1} to {2}.", *at)
    _dwell_verdict(result, "working level", dwell, air_release)
    if low_level is not None:
        low_dwell = dwell_minutes(tank_volume * low_level / 100.0, flow)
        values.update(low_dwell=low_dwell, low_ratio=low_dwell / air_release)
        if low_level < working_level:
            _dwell_verdict(result, "low level", low_dwell, air_release)
    if level_needed > 100.0:
        result.add("act", COMMON_PRACTICE,
                   "Even full, this tank holds less than the air-release time of flow: fit a "
                   "bigger tank (about {0}) or use an oil with a shorter air-release time.",
                   Q(needed, _V))
    elif level_needed > min(working_level, low_level or working_level):
        result.add("watch", COMMON_PRACTICE,
                   "Keep the level above {0} of the full volume: below it the oil leaves the "
                   "tank before its air has risen out.", Q(level_needed, _PCT))
    if baffle == "no":
        result.add("watch", COMMON_PRACTICE,
                   "Without a baffle the return stream can run straight to the suction, so part "
                   "of the oil stays far less than the mean {0}: fit a baffle between return and "
                   "suction.", Q(dwell, _MIN))
    result.note("Return lines should end below the lowest oil level, away from the suction and "
                "aimed at a wall or through a diffuser, with a low outlet velocity; a return that "
                "splashes or jets drives air into the oil.")
    result.note("ISO 9120 measures air release at a set temperature (usually 50 °C): colder, "
                "thicker oil holds its air longer, and contaminated or wrongly topped-up oil can "
                "take several times the new-oil figure; retest the oil in service.")
    result.note("At the lowest level the suction inlet must stay well covered, or it draws a "
                "vortex of air; check it with the tank's sight glass before running.")
    result.sources += ["Tank minutes of pump flow, industrial 3 to 5, mobile 1 to 2: common "
                       "practice",
                       "Air-release time: ISO 9120 / ASTM D3427 (entered); dwell at least equal "
                       "to it: common practice"]
    return result


def _dwell_verdict(result: Result, where: str, dwell: float, air_release: float) -> None:
    at = (Q(dwell, _MIN), Q(air_release, _MIN))
    lead = "At the " + where + " the oil stays "
    if dwell >= DWELL_OK_RATIO * air_release:
        result.add("ok", COMMON_PRACTICE,
                   lead + "{0} in the tank, at least its air-release time of {1}.", *at)
    elif dwell >= DWELL_ACT_RATIO * air_release:
        result.add("watch", COMMON_PRACTICE,
                   lead + "{0}, less than its air-release time of {1}: some air goes back to the "
                   "pump; keep the level up, fit a baffle and a return diffuser, or use an oil "
                   "with better air release.", *at)
    else:
        result.add("act", COMMON_PRACTICE,
                   lead + "only {0}, under half its air-release time of {1}: aerated oil goes "
                   "back to the pump; raise the level, fit a bigger tank or baffles and a "
                   "diffuser, slow the return, or use an oil with better air release.", *at)
