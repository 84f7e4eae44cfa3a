"""Troubleshooting checklist: oil running hot.

Symptoms and temperatures (tank, cooler in and out, surroundings) ranked over the
causes of hot oil; why each happens is told in site_src/checklists/checklist-overheating.md.
The tank-heat tool gives the steady temperature the tank and cooler should reach; enter
the measured ones here.
"""

from __future__ import annotations

from ..kernel.errors import InputError
from ..kernel.grading import Band
from ..kernel.registry import Field
from ..kernel.result import Q, Result
from .scoreboard import (AGAINST, MODERATE, READING_BASIS, STRONG, WEAK, Cause, Check,
                         Scoreboard, Symptom, both_or_neither, checklist)

CAUSES = (
    Cause("cooler", 'Cooler not taking the heat away',
          checks=(
              Check("look-cooler", 'Look at the cooler: fins clean, fan turning the right way, '
                    'water valve open.'),
              Check("measure-oil", 'Measure the oil temperature into and out of the cooler with '
                    'a contact thermometer; a working cooler takes several degrees off.'),
              Check("work-heat", 'Work out the heat the tank and cooler should shed at this '
                    'load against what they do.', tool="tank-heat"),
          ),
          caution='Keep clear of a running fan; switch it off and lock it out before cleaning '
                  'the fins. Cooler pipes may be hot.'),
    Cause("relief-blowing", 'Oil blowing over a relief or pressure valve',
          checks=(
              Check("contact-infrared", 'With a contact or infrared thermometer, find the '
                    'hottest valve and line; a relief valve and its tank line running hottest '
                    'is the sign.'),
              Check("check-pump", 'Check that the pump unloads (pressure drops) while the '
                    'machine waits.'),
              Check("relief-setting", "Have the relief setting checked against the machine's "
                    'circuit diagram by someone qualified to adjust it.'),
          ),
          caution='Never adjust a relief valve above the value on the circuit diagram; do not '
                  'stand in line with a fitting under pressure. Hot surfaces burn.'),
    Cause("internal-leakage", 'Worn pump, valves or cylinders leaking inside',
          checks=(
              Check("compare-pump", 'Compare pump case and drain line temperatures with a '
                    'thermometer; a much hotter case points to wear.'),
              Check("time-cylinder", 'Time a cylinder stroke cold and warm; a big slowdown when '
                    'warm points to leakage.'),
              Check("pump-s", "Have the pump's case drain flow measured against the maker's "
                    'figure.'),
          ),
          caution='Before opening a case drain or a cylinder port, stop, lock out, lower or '
                  'block raised loads and relieve accumulators.'),
    Cause("tank-low", 'Too little oil, or a tank too small for the heat',
          checks=(
              Check("read-level", 'Read the level in the sight glass with the cylinders in '
                    'their working position; top up with the same oil.'),
              Check("work-tank", "Work out the tank's oil volume and compare it with the pump "
                    'flow.', tool="tank-sizing"),
              Check("look-external", 'Look for external leaks that keep lowering the level.'),
          ),
          caution='Never feel for a leak with a hand: oil under pressure injects through skin. '
                  'Use a card, and see a doctor at once after any injection injury.'),
    Cause("hot-surroundings", 'Hot surroundings or blocked air flow',
          checks=(
              Check("measure-air", 'Measure the air temperature beside the tank and cooler, not '
                    'across the hall.'),
              Check("clear-anything", 'Clear anything stacked against the tank or in front of '
                    'the cooler.'),
              Check("work-steady", 'Work out the steady oil temperature for this air '
                    'temperature.', tool="tank-heat"),
          ),
          caution='Keep walkways clear when moving material away from the machine; hot tank '
                  'walls burn.'),
    Cause("wrong-viscosity", 'Oil too thick or too thin for the machine',
          checks=(
              Check("compare-label", 'Compare the label of the last oil filled with the oil '
                    'named for the machine.'),
              Check("read-oil", "Read the oil's viscosity at the working temperature against "
                    "the pump's window.", tool="viscosity-at-temperature"),
              Check("viscosity-sample", 'Have the viscosity of a sample checked against its '
                    'grade.', tool="viscosity-grade"),
          ),
          caution='Drain and dispose of a wrong oil by local rules; follow the equipment '
                  "maker's oil list for the refill."),
)

# Tick boxes in the order of the form, each with the points it gives (common practice, see
# calc.checklists.scoreboard).
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

TEMPERATURE_BANDS = (
    Band("act", "Oil at {temp}, above {act}: it ages fast and seals harden; reduce the load and "
                "find the cause now.", over=ACT_C),
    Band("watch", "Oil at {temp}, above the {watch} it is best kept under.", over=WATCH_C),
    Band("ok", "Oil at {temp}, within the usual range up to {watch}."),
)


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


@checklist(
    "checklist-overheating",
    title="Oil running hot: what to check first",
    summary="Tick what you see and enter the temperatures you have; the causes of hot oil are "
            "ranked, each with its checks and cautions.",
    causes=CAUSES,
    renamed={"ambient": "air_temp"},
    symptoms=SYMPTOMS,
    readings=(
        Field("temp", "Oil temperature in the tank", _T, None, min=-40.0, max=200.0,
              tracks="oil_temp",
              optional=True),
        Field("cooler_in", "Oil temperature into the cooler", _T, None, min=-40.0, max=200.0,
              optional=True),
        Field("cooler_out", "Oil temperature out of the cooler", _T, None, min=-40.0, max=200.0,
              optional=True),
        Field("air_temp", "Air temperature around the machine now", _T, None, min=-40.0,
              max=80.0,
              optional=True),
    ),
    caution="Hot oil and surfaces burn: measure with a contact or infrared thermometer, not "
            "with a hand. Stop, lock out and relieve pressure (accumulators, raised loads) "
            "before opening anything, and let the oil cool before draining.",
    sources=("Oil temperatures 60 / 80 °C, cooler drop 3 K, 20 K above the air: common "
             "practice, from memory",),
)
def checklist_overheating(board: Scoreboard, found: Result, temp, cooler_in, cooler_out,
                          air_temp):
    """Rank the causes of hot oil from the ticked SYMPTOMS and temperatures."""
    both_or_neither("enter the oil temperature both into and out of the cooler, or neither",
                    cooler_in=cooler_in, cooler_out=cooler_out)
    if cooler_in is not None and cooler_out > cooler_in + 1.0:
        raise InputError("cooler_out", "oil leaving a cooler cannot be warmer than oil going in: "
                                       "check which reading is which")
    _score_temperatures(board, temp, cooler_in, cooler_out, air_temp)
    if temp is not None:
        found.grade(temp, TEMPERATURE_BANDS, READING_BASIS, temp=Q(temp, _T),
                    watch=Q(WATCH_C, _T), act=Q(ACT_C, _T))
