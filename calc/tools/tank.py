"""The tank tools: oil volume at a level (calc.methods.tank), and the tank against the pump's
flow and the oil's air-release time (common practice).
"""

from __future__ import annotations

from ..kernel.errors import InputError
from ..kernel.grading import Band
from ..kernel.registry import TANK, Field, Output, tool
from ..kernel.result import COMMON_PRACTICE, Q, Result
from ..methods.tank import depth_mm, dwell_minutes, level_for_volume_mm, tank_volume_needed_l, \
    volume_at_level_l

SHAPE_CHOICES = (("rectangular", "Rectangular"), ("vertical", "Vertical cylinder"),
                 ("horizontal", "Horizontal cylinder, flat ends"))


def shape_fields() -> tuple[Field, ...]:
    """The tank's shape and inside dimensions: shared by the tank tools, taken from the card."""
    dim = dict(min=50.0, max=20000.0)
    return (
        Field("shape", "Tank shape", "choice", "rectangular", choices=SHAPE_CHOICES,
              binds="tank_shape"),
        Field("length", "Inside length", "length", 1200.0, **dim, binds="tank_length",
              help="Rectangular tank or horizontal cylinder.", usual=(200.0, 5000.0), when=("shape", ("rectangular", "horizontal"))),
        Field("width", "Inside width", "length", 800.0, **dim, binds="tank_width",
              help="Rectangular tank only.", usual=(200.0, 5000.0), when=("shape", "rectangular")),
        Field("height", "Inside height", "length", 700.0, **dim, binds="tank_height",
              help="Rectangular tank or vertical cylinder.", usual=(200.0, 5000.0), when=("shape", ("rectangular", "vertical"))),
        Field("diameter", "Inside diameter", "length", 800.0, **dim, binds="tank_diameter",
              help="Cylinders only.", usual=(200.0, 5000.0), when=("shape", ("vertical", "horizontal"))),
    )


def check_level(shape: str, height_mm: float, diameter_mm: float, level_mm: float,
                key: str = "level") -> float:
    """The tank's depth [mm]; InputError on `key` when the oil would stand above it."""
    depth = depth_mm(shape, height_mm, diameter_mm)
    if level_mm > depth:
        raise InputError(key, "the level ({level}) cannot be above the tank's diameter "
                                  "({depth})" if shape == "horizontal" else
                         "the level ({level}) cannot be above the tank's inside height ({depth})",
                         level=Q(level_mm, "length"), depth=Q(depth, "length"))
    return depth


_V = "volume"
_MM = "length"
_PCT = "percent"

# How full the tank is (common practice, from memory): a low tank uncovers the suction or
# draws the settled water and dirt from the bottom.
LOW_LEVEL_BANDS = (
    Band("act", "The tank is only {full} full: the suction is close to uncovered and draws the "
                "water and dirt that settle at the bottom; top up to the working level with the "
                "same oil before running.", under=10.0),
    Band("watch", "The tank is only {full} full: check that the suction stays well covered at "
                  "the lowest level in the cycle, and top up to the working level.", under=25.0),
)
# Air space above the oil (common practice): room for expansion and for oil coming back.
AIR_SPACE_BANDS = (
    Band("watch", "Less than a tenth of the tank ({tenth}) is air space: leave room for the oil's "
                  "expansion when hot and for oil coming back from cylinders and accumulators "
                  "when the machine stops.", under="tenth"),
)


@tool(
    "tank-volume",
    title="Tank volume at a level",
    summary="Oil in the tank at a measured level (or the level for a volume), the full volume, "
            "how full it is and the air space above the oil.",
    topic=TANK,
    inputs=shape_fields() + (
        Field("level", "Oil level from the bottom", "length", 550.0, min=0.0, max=20000.0,
              help="Measured inside, from the bottom of the tank to the oil surface.", usual=(50.0, 5000.0)),
        Field("volume", "Oil volume (to find its level)", _V, None, min=0.0, max=1.0e7,
              optional=True, help="Leave blank to compute the volume at the level above; enter a "
                                  "volume to find the level it stands at."),
    ),
    outputs=(
        Output("oil_volume", "Oil in the tank", _V, headline=True),
        Output("oil_level", "Oil level", _MM),
        Output("full_volume", "Full volume", _V),
        Output("percent_full", "Full", _PCT, "Oil volume as a share of the full volume.",
               headline=True, at_least=0.0, at_most=100.0),
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
            raise InputError("volume", "{volume} does not fit: the tank holds {full} when full",
                             volume=Q(volume, _V), full=Q(full, _V))
        oil, oil_level, mode = volume, level_for_volume_mm(*dims, volume), "level from volume"
    result = Result(values={"oil_volume": oil, "oil_level": oil_level, "full_volume": full,
                            "percent_full": 100.0 * oil / full, "air_space": full - oil,
                            "mode": mode})
    result.grade(full - oil, AIR_SPACE_BANDS, COMMON_PRACTICE, tenth=Q(0.1 * full, _V))
    result.grade(100.0 * oil / full, LOW_LEVEL_BANDS, COMMON_PRACTICE,
                 full=Q(100.0 * oil / full, _PCT))
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

# The tank in minutes of pump flow against common practice for the application.
FLOW_MINUTES_BANDS = (
    Band("watch", "The tank holds only {minutes} of pump flow, under the usual {low} to {high}: "
                  "the oil has little time to shed air, heat and dirt; a tank of about {needed}, "
                  "or a cooler and a well-placed return, make up for it.", under="low"),
    Band("ok", "The tank holds {minutes} of pump flow, at or above the usual {low} to {high}."),
)
# The dwell at a level against the oil's air-release time (common practice).
DWELL_BANDS = (
    Band("ok", "At the {where} the oil stays {dwell} in the tank, at least its air-release time "
               "of {air_release}.", at_least="ok_dwell"),
    Band("watch", "At the {where} the oil stays {dwell}, less than its air-release time of "
                  "{air_release}: some air goes back to the pump; keep the level up, fit a baffle "
                  "and a return diffuser, or use an oil with better air release.",
         at_least="act_dwell"),
    Band("act", "At the {where} the oil stays only {dwell}, under half its air-release time of "
                "{air_release}: aerated oil goes back to the pump; raise the level, fit a bigger "
                "tank or baffles and a diffuser, slow the return, or use an oil with better air "
                "release."),
)
# The level the dwell needs against the levels the tank runs at (common practice).
LEVEL_NEEDED_BANDS = (
    Band("act", "Even full, this tank holds less than the air-release time of flow: fit a bigger "
                "tank (about {needed}) or use an oil with a shorter air-release time.",
         over=100.0),
    Band("act", "Only a brim-full tank holds the air-release time of flow, and no tank runs "
                "brim-full: fit a bigger tank (about {needed}) or use an oil with a shorter "
                "air-release time.", at_least=100.0),
    Band("watch", "Keep the level above {level} of the full volume: below it the oil leaves the "
                  "tank before its air has risen out.", over="lowest"),
)


@tool(
    "tank-sizing",
    title="Tank size and dwell time",
    summary="The tank against the pump's flow (minutes of flow) and the time the oil stays in "
            "it against its air-release time, at the working level and at the low level.",
    topic=TANK,
    renamed={"flow": "pump_flow"},
    related={"foam-air-tests": "The oil's air-release time from its lab report: the dwell "
             "against it governs this tank's verdict over the minutes-of-flow rule of thumb."},
    retired={"working_level": "give the oil at the working level as oil_volume (the "
                              "tank-volume tool turns a level into a volume)",
             "low_level": "give the oil at the lowest level as low_oil_volume"},
    inputs=(
        Field("tank_volume", "Full tank volume", _V, 400.0, min=1.0, max=1.0e6,
              binds="tank_volume",
              help="The tank-volume tool gives it from the dimensions."),
        Field("pump_flow", "Pump flow", "flow", 100.0, min=0.1, max=1.0e5, binds="pump_flow",
              help="Flow actually delivered, e.g. displacement x speed x volumetric efficiency."),
        Field("application", "Machine", "choice", "industrial", choices=APPLICATION_CHOICES,
              binds="application"),
        Field("oil_volume", "Oil at the working level", _V, 320.0, min=1.0, max=1.0e6,
              binds="oil_volume", help="The tank-volume tool turns a level into a volume."),
        Field("low_oil_volume", "Oil at the lowest level in the cycle", _V, None, min=1.0,
              max=1.0e6, optional=True, binds="low_oil_volume",
              help="With cylinders extended and accumulators charged; blank if it stays put."),
        Field("air_release", "Air-release time of the oil", _MIN, 5.0, min=0.1, max=120.0,
              help="ISO 9120 / ASTM D3427 result, usually at 50 °C, from the data sheet or a "
                   "lab report of the oil in service."),
        Field("baffle", "Baffle between return and suction", "choice", "yes",
              choices=(("yes", "Yes"), ("no", "No or not known"))),
    ),
    outputs=(
        Output("working_share", "Working level, share of the full volume", _PCT,
               at_least=0.0, at_most=100.0),
        Output("flow_minutes", "Tank volume in minutes of pump flow", _MIN, headline=True),
        Output("practice", "Common practice", "text"),
        Output("dwell", "Dwell time at the working level", _MIN, headline=True),
        Output("dwell_ratio", "Dwell / air-release time", "ratio"),
        Output("low_dwell", "Dwell time at the low level", _MIN),
        Output("low_ratio", "Dwell / air-release time at the low level", "ratio"),
        Output("level_needed", "Lowest level for a dwell of the air-release time", _PCT,
               "Blank when even a full tank falls short.", at_least=0.0, at_most=100.0),
        Output("tank_needed", "Tank volume needed", _V,
               "The larger of: the common-practice minutes of flow, and the air-release time "
               "of flow at the working level."),
    ),
)
def tank_sizing(tank_volume: float, pump_flow: float, application: str, oil_volume: float,
                air_release: float, baffle: str, low_oil_volume: float | None = None) -> Result:
    """Tank minutes of flow and dwell time against common practice and the air-release time."""
    if oil_volume > tank_volume:
        raise InputError("oil_volume", "the oil at the working level cannot be more than the "
                                       "full tank ({full})", full=Q(tank_volume, _V))
    if low_oil_volume is not None and low_oil_volume > oil_volume:
        raise InputError("low_oil_volume", "the oil at the lowest level must be at most the oil "
                                           "at the working level")
    flow, oil = pump_flow, oil_volume
    working_level = 100.0 * oil / tank_volume
    low_level = None if low_oil_volume is None else 100.0 * low_oil_volume / tank_volume
    lo_min, hi_min = FLOW_MINUTES[application]
    fill = working_level / 100.0
    dwell = dwell_minutes(oil, flow)
    ratio = dwell / air_release
    level_needed = 100.0 * DWELL_OK_RATIO * air_release * flow / tank_volume
    flow_minutes = dwell_minutes(tank_volume, flow)
    needed = max(tank_volume_needed_l(flow, lo_min, 1.0),
                 tank_volume_needed_l(flow, DWELL_OK_RATIO * air_release, fill))
    values = {"working_share": working_level, "flow_minutes": flow_minutes, "dwell": dwell,
              "dwell_ratio": ratio,
              "practice": f"{lo_min:g} to {hi_min:g} min of pump flow ({application}, "
                          "common practice)",
              "low_dwell": None, "low_ratio": None,
              "level_needed": level_needed if level_needed <= 100.0 else None,
              "tank_needed": needed}
    result = Result(values=values)
    minutes = result.grade(flow_minutes, FLOW_MINUTES_BANDS, COMMON_PRACTICE,
                           minutes=Q(flow_minutes, _MIN), low=Q(lo_min, _MIN),
                           high=Q(hi_min, _MIN), needed=Q(needed, _V))
    dwelt = _grade_dwell(result, "working level", dwell, air_release)
    if minutes is not None and dwelt is not None:
        _rule_of_thumb_gives_way(result, flow_minutes, lo_min, hi_min)
    if low_level is not None:
        low_dwell = dwell_minutes(low_oil_volume, flow)
        values.update(low_dwell=low_dwell, low_ratio=low_dwell / air_release)
        if low_level < working_level:
            _grade_dwell(result, "low level", low_dwell, air_release)
    result.grade(level_needed, LEVEL_NEEDED_BANDS, COMMON_PRACTICE, needed=Q(needed, _V),
                 level=Q(level_needed, _PCT),
                 lowest=Q(min(working_level, low_level or working_level), _PCT))
    if baffle == "no":
        result.add("watch", COMMON_PRACTICE,
                   "Without a baffle the return stream can run straight to the suction, so part "
                   "of the oil stays far less than the mean {0}: fit a baffle between return and "
                   "suction.", Q(dwell, _MIN))
    result.note("Return lines should end below the lowest oil level, away from the suction and "
                "aimed at a wall or through a diffuser, with a low outlet velocity; a return that "
                "splashes or jets drives air into the oil.")
    result.note("ISO 9120 measures air release at a set temperature (usually {test_temp}): "
                "colder, thicker oil holds its air longer, and contaminated or wrongly topped-up "
                "oil can take several times the new-oil figure; retest the oil in service.",
                test_temp=Q(50.0, "temperature"))
    result.note("At the lowest level the suction inlet must stay well covered, or it draws a "
                "vortex of air; check it with the tank's sight glass before running.")
    result.sources += ["Tank minutes of pump flow, industrial 3 to 5, mobile 1 to 2: common "
                       "practice",
                       "Air-release time: ISO 9120 / ASTM D3427 (entered); dwell at least equal "
                       "to it: common practice"]
    return result


def _rule_of_thumb_gives_way(result: Result, flow_minutes: float, low: float,
                             high: float) -> None:
    """One answer per question: where the dwell against the oil's own air-release time
    finds fault, a minutes-of-flow "ok" (a rule of thumb) does not stand beside it as a
    verdict; it is said as a note that the dwell governs."""
    minutes, dwell = result.verdicts[-2], result.verdicts[-1]
    if minutes.level != "ok" or dwell.level == "ok":
        return
    result.verdicts.remove(minutes)
    result.note("The tank holds {minutes} of pump flow, within the usual {low} to {high} (a rule "
                "of thumb), but the oil's own air-release time against its dwell governs the "
                "verdict here.", minutes=Q(flow_minutes, _MIN), low=Q(low, _MIN),
                high=Q(high, _MIN))


def _grade_dwell(result: Result, where: str, dwell: float, air_release: float) -> Band | None:
    return result.grade(dwell, DWELL_BANDS, COMMON_PRACTICE, where=Q(where, "text"), dwell=Q(dwell, _MIN),
                 air_release=Q(air_release, _MIN),
                 ok_dwell=Q(DWELL_OK_RATIO * air_release, _MIN),
                 act_dwell=Q(DWELL_ACT_RATIO * air_release, _MIN))
