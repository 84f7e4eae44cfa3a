"""Troubleshooting checklist: oil running hot.

Symptoms and temperatures (tank, cooler in and out, surroundings) ranked over the
causes of site_src/checklists/overheating.md. The tank-heat tool gives the steady
temperature the tank and cooler should reach; enter the measured ones here.
"""

from __future__ import annotations

from .checklists import (AGAINST, MODERATE, STRONG, TOPIC, WEAK, Scoreboard, Symptom,
                         both_or_neither, checklist_result, count_entered, symptom_fields,
                         RANKING_OUTPUTS)
from .errors import InputError
from .registry import Field, tool
from .result import Q

CAUSES = (
    ("cooler", "Cooler not taking the heat away"),
    ("relief-blowing", "Oil blowing over a relief or pressure valve"),
    ("internal-leakage", "Worn pump, valves or cylinders leaking inside"),
    ("tank-low", "Too little oil, or a tank too small for the heat"),
    ("hot-surroundings", "Hot surroundings or blocked air flow"),
    ("wrong-viscosity", "Oil too thick or too thin for the machine"),
)

# Tick boxes in the order of the form, each with the points it gives (common practice, see
# calc.checklists).
SYMPTOMS = (
    Symptom("hot_when_idle", "Hot even while the machine waits or holds pressure",
            (("relief-blowing", STRONG, "hot while waiting: the pump delivers over a valve"),)),
    Symptom("relief_hot", "A relief valve or its return line is hotter than the rest",
            (("relief-blowing", STRONG, "the relief valve or its line runs hottest"),)),
    Symptom("hissing_valve", "A valve hisses or whistles",
            (("relief-blowing", MODERATE, "a valve hisses: oil flowing over it"),
             ("internal-leakage", WEAK, "a valve hisses: oil flowing past it"))),
    Symptom("slow_under_load", "Motion slows as the oil warms",
            (("internal-leakage", MODERATE, "slower when warm: leakage grows as oil thins"),
             ("wrong-viscosity", WEAK, "slower when warm: the oil may be too thin"))),
    Symptom("pump_case_hot", "Pump case or its drain line very hot",
            (("internal-leakage", STRONG, "pump case or drain line very hot: leakage inside"),)),
    Symptom("cooler_dirty", "Cooler fins dirty, fan not running, or water valve shut",
            (("cooler", STRONG, "cooler dirty, fan stopped or water valve shut"),)),
    Symptom("level_low", "Oil level low in the sight glass",
            (("tank-low", STRONG, "low oil level: less oil and less wetted tank wall"),)),
    Symptom("hot_room", "Machine in a hot place, or the tank boxed in",
            (("hot-surroundings", MODERATE, "hot place or the tank boxed in"),)),
    Symptom("after_oil_change", "Started after an oil change or top-up with another oil",
            (("wrong-viscosity", STRONG, "started after an oil change or top-up"),)),
)

_T = "temperature"
_DT = "temperature_difference"

# Common practice, from memory: mineral hydraulic oil is best kept at 40 to 60 degC; above
# about 70 degC it ages fast (rate doubles per 10 K) and seals harden; above 80 degC act.
WATCH_C = 60.0
ACT_C = 80.0
# Common practice, from memory: a working oil cooler takes several kelvin off the oil; less
# than 3 K across it with hot oil means it does little.
COOLER_MIN_DROP_K = 3.0
# Common practice: the tank and cooler reject heat in proportion to oil minus air temperature;
# under 20 K of difference they can do little.
MIN_HEADROOM_K = 20.0

CAUTION = ("Hot oil and surfaces burn: measure with a contact or infrared thermometer, not "
           "with a hand. Stop, lock out and relieve pressure (accumulators, raised loads) "
           "before opening anything, and let the oil cool before draining.")


def _score_temperatures(board: Scoreboard, temp, cooler_in, cooler_out, ambient) -> None:
    if cooler_in is not None and cooler_out is not None:
        drop = cooler_in - cooler_out
        hot = temp if temp is not None else cooler_in
        if drop < COOLER_MIN_DROP_K and hot > WATCH_C:
            board.add("cooler", STRONG, "the cooler takes only {0} off oil at {1}",
                      Q(drop, _DT), Q(hot, _T))
        elif drop >= COOLER_MIN_DROP_K:
            board.add("cooler", AGAINST, "the cooler takes {0} off the oil: it is working",
                      Q(drop, _DT))
    if ambient is not None:
        oil = temp if temp is not None else cooler_in
        if oil is not None and oil - ambient < MIN_HEADROOM_K:
            board.add("hot-surroundings", STRONG,
                      "oil at {0} is only {1} above the air at {2}: little room to shed heat",
                      Q(oil, _T), Q(oil - ambient, _DT), Q(ambient, _T))
        elif ambient > 40.0:
            board.add("hot-surroundings", MODERATE, "the air around the machine is {0}",
                      Q(ambient, _T))


def _temperature_verdicts(temp) -> list[tuple]:
    """The (level, template, *Q) verdict on the tank temperature, if one was entered."""
    if temp is None:
        return []
    if temp > ACT_C:
        return [("act", "Oil at {0}, above {1}: it ages fast and seals harden; reduce the load "
                 "and find the cause now.", Q(temp, _T), Q(ACT_C, _T))]
    if temp > WATCH_C:
        return [("watch", "Oil at {0}, above the {1} it is best kept under.",
                 Q(temp, _T), Q(WATCH_C, _T))]
    return [("ok", "Oil at {0}, within the usual range up to {1}.", Q(temp, _T), Q(WATCH_C, _T))]


@tool(
    "checklist-overheating",
    title="Oil running hot: what to check first",
    summary="Tick what you see and enter the temperatures you have; the causes of hot oil are "
            "ranked, each with its checks and cautions.",
    topic=TOPIC,
    inputs=(
        *symptom_fields(SYMPTOMS),
        Field("temp", "Oil temperature in the tank", _T, None, min=-40.0, max=200.0,
              optional=True),
        Field("cooler_in", "Oil temperature into the cooler", _T, None, min=-40.0, max=200.0,
              optional=True),
        Field("cooler_out", "Oil temperature out of the cooler", _T, None, min=-40.0, max=200.0,
              optional=True),
        Field("ambient", "Air temperature around the machine", _T, None, min=-40.0, max=80.0,
              optional=True),
    ),
    outputs=RANKING_OUTPUTS,
)
def checklist_overheating(temp=None, cooler_in=None, cooler_out=None, ambient=None, **symptoms):
    """Rank the causes of hot oil from the ticked SYMPTOMS and temperatures."""
    both_or_neither("enter the oil temperature both into and out of the cooler, or neither",
                    cooler_in=cooler_in, cooler_out=cooler_out)
    if cooler_in is not None and cooler_out > cooler_in + 1.0:
        raise InputError("cooler_out", "oil leaving a cooler cannot be warmer than oil going in: "
                                       "check which reading is which")
    board = Scoreboard(CAUSES)
    ticked = board.tick(SYMPTOMS, symptoms)
    _score_temperatures(board, temp, cooler_in, cooler_out, ambient)
    entered = ticked + count_entered(temp, cooler_in, ambient)
    result = checklist_result(board, entered, CAUTION, _temperature_verdicts(temp))
    result.sources.append("Oil temperatures 60 / 80 °C, cooler drop 3 K, 20 K above the air: "
                          "common practice, from memory")
    return result
