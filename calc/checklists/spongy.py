"""Troubleshooting checklist: spongy, jerky or sluggish motion.

Symptoms and readings (oil temperature, entrained air) ranked over the causes of
soft or slow motion; why each happens is told in site_src/checklists/checklist-spongy.md. The air-stiffness tool turns an air content and a
pressure into the loss of stiffness; the viscosity tools tell how thick the oil
is at the temperature entered here.
"""

from __future__ import annotations

from ..kernel.registry import Field, Output
from ..kernel.result import Q, Result
from ..methods.air import stiffness_loss_pct
from ..tools import air
from .scoreboard import (AGAINST, MODERATE, STRONG, WEAK, Cause, Check, Scoreboard, Symptom,
                         checklist)

CAUSES = (
    Cause("entrained-air", 'Air carried in the oil',
          checks=(
              Check("look-oil", 'Look at the oil in the tank and in a clear sample: foam, or a '
                    'cloud that clears from the bottom up, is air.'),
              Check("work-how", 'Work out how much stiffness the air costs at the working '
                    'pressure.', tool="air-stiffness"),
              Check("read-lab", "Read the lab's air-release time against the grade's limit, "
                    'then work through the aeration and foam checklist.', tool="foam-air-tests"),
          ),
          caution='Take samples only at a sampling point made for it; oil may be hot and under '
                  'pressure.'),
    Cause("trapped-air", 'Air trapped in cylinders or high points',
          checks=(
              Check("ask-circuit", 'Ask whether the circuit was opened or refilled just before '
                    'the trouble began.'),
              Check("cycle-actuator", 'Cycle each actuator slowly over its full stroke at low '
                    'pressure, several times.'),
              Check("bleed-proper", 'Bleed at the proper bleed screws at the high points, with '
                    'the machine stopped.'),
          ),
          caution='Stop, lock out, lower or block raised loads and relieve accumulators before '
                  'opening a bleed screw; never loosen a fitting under pressure: oil under '
                  'pressure injects through skin.'),
    Cause("cold-oil", 'Oil too thick while cold',
          checks=(
              Check("measure-oil", 'Measure the oil temperature in the tank.'),
              Check("read-oil", "Read the oil's viscosity at that temperature against the "
                    "pump's window.", tool="viscosity-at-temperature"),
              Check("warm-low", 'Warm up at low load before working; fit a tank heater or a '
                    'lighter grade if the maker allows.'),
          ),
          caution="Follow the equipment maker's oil list before changing grade; tank heaters "
                  'and their wiring are for a qualified electrician.'),
    Cause("internal-leakage", 'Leakage past seals or valve spools',
          checks=(
              Check("load-held", 'With the load held, watch whether a cylinder creeps; mark the '
                    'rod and time it.'),
              Check("time-full", 'Time a full stroke cold and warm; a big slowdown when warm '
                    'points to leakage.'),
              Check("cylinder-pump", 'Have the cylinder or pump leakage tested by someone '
                    'trained to do it.'),
          ),
          caution='Keep clear of a held load while testing for drift; block it mechanically '
                  'before anyone works below it.'),
    Cause("soft-lines", 'Long or soft hoses swelling under pressure',
          checks=(
              Check("measure-hose", 'Measure the hose length between valve and actuator and '
                    'compare it with the circuit diagram.'),
              Check("check-hose", 'Check hose types against the parts list; a lower-rated hose '
                    'swells more.'),
          ),
          caution='Never stand in line with a hose under pressure and never feel along it for '
                  'leaks; a burst hose can whip and inject oil.'),
    Cause("low-pressure", 'Supply pressure too low for the load',
          checks=(
              Check("read-pressure", 'Read the pressure gauge with the load moving and compare '
                    'with the circuit diagram.'),
              Check("check-relief", 'Check the relief valve and the pump for internal leakage '
                    '(a hot valve or a hot pump case points there).'),
              Check("relief-setting", 'Have the relief setting checked by someone qualified to '
                    'adjust it.'),
          ),
          caution='Never raise a relief setting above the value on the circuit diagram; stored '
                  'energy in accumulators and raised loads stays after the pump stops.'),
)

# Tick boxes in the order of the form, each with the points it gives (common practice, see
# calc.checklists.scoreboard).
SYMPTOMS = (
    Symptom("foam_or_cloudy", "Foam in the tank or cloudy oil",
            (("entrained-air", STRONG, "foam or cloudy oil: air in the oil"),)),
    Symptom("after_repair", "Started after the circuit was opened or refilled",
            (("trapped-air", STRONG, "started after the circuit was opened: not bled"),)),
    Symptom("springy_stop", "Actuator bounces or springs back when it stops",
            ((("entrained-air", "trapped-air", "soft-lines"), WEAK,
              "springs back when stopped: something in the column gives"),)),
    Symptom("jerky_slow", "Jerky at low speed",
            ((("trapped-air", "entrained-air"), WEAK, "jerky at low speed"),)),
    Symptom("worse_cold", "Worse with cold oil, better once warm",
            (("cold-oil", STRONG, "worse cold, better warm"),)),
    Symptom("drifts", "A held cylinder creeps or drifts",
            (("internal-leakage", STRONG, "a held cylinder drifts: oil passes a seal or spool"),)),
    Symptom("slow_under_load", "Slow only under load",
            ((("internal-leakage", "low-pressure"), MODERATE, "slow only under load"),)),
    Symptom("long_hoses", "Long hoses between valve and actuator",
            (("soft-lines", MODERATE, "long hoses swell and store oil"),)),
    Symptom("pressure_drops", "Gauge pressure falls under load",
            (("low-pressure", STRONG, "pressure falls under load"),
             ("internal-leakage", WEAK, "pressure falls under load: the pump may leak inside"))),
)

# Common practice, from memory: well-deaerated oil in service carries well under 1 % air by
# volume; from about 1 % the column turns noticeably soft at low and medium pressure. Used
# when no working pressure is entered; with one, the stiffness loss decides.
AIR_WATCH_PCT = 1.0
# Common practice: below about 15 degC most hydraulic oils are several times thicker than at
# working temperature; above 30 degC cold oil is not the cause.
COLD_C = 15.0
WARM_C = 30.0


def _score_air(board: Scoreboard, air_content, pressure):
    """Points for an entered air content; the stiffness loss [%] when a pressure is known."""
    if air_content is None:
        return None
    if pressure is None:
        board.weigh("entrained-air", air_content >= AIR_WATCH_PCT, STRONG,
                    "{0} air in the oil, at or above {1}", "{0} air in the oil, under {1}",
                    Q(air_content, "percent"), Q(AIR_WATCH_PCT, "percent"))
        return None
    loss = stiffness_loss_pct(air_content, pressure)
    board.weigh("entrained-air", loss >= air.LOSS_WATCH_PCT, STRONG,
                "{0} air makes the oil {2} softer at {1}",
                "{0} air makes the oil only {2} softer at {1}",
                Q(air_content, "percent"), Q(pressure, "pressure"), Q(loss, "percent"))
    return loss


@checklist(
    "checklist-spongy",
    title="Spongy or sluggish motion: what to check first",
    summary="Tick what you see and enter the readings you have; the causes of soft, jerky or "
            "slow motion are ranked, each with its checks and cautions.",
    causes=CAUSES,
    symptoms=SYMPTOMS,
    readings=(
        Field("temp", "Oil temperature", "temperature", None, min=-40.0, max=150.0,
              tracks="oil_temp",
              optional=True),
        Field("air_content", "Entrained air, by volume at atmospheric pressure", "percent", None,
              min=0.0, max=50.0, optional=True, help="From a sample or the air-stiffness tool."),
        Field("pressure", "Working pressure (gauge)", "pressure", None, min=0.0, max=1000.0,
              binds="working_pressure",
              optional=True, group="machine",
              help="With the air content, gives the loss of stiffness."),
    ),
    outputs=(Output("stiffness_loss", "Stiffness lost to the air", "percent"),),
    caution="Before bleeding air or opening a line, stop the machine, lower or block raised "
            "loads, relieve accumulators and lock out; bleed through the proper bleed screws "
            "only, never by loosening a fitting under pressure. Keep clear of moving parts.",
    sources=("Air content 1 %, oil below 15 °C: common practice, from memory",
             "Stiffness loss: mixture rule of the air-stiffness tool"),
)
def checklist_spongy(board: Scoreboard, found: Result, temp, air_content, pressure):
    """Rank the causes of spongy or sluggish motion from the ticked SYMPTOMS and readings."""
    if temp is not None:
        if temp < COLD_C:
            board.add("cold-oil", MODERATE, "oil at {0}, below {1}: several times thicker than "
                      "when warm", Q(temp, "temperature"), Q(COLD_C, "temperature"))
        elif temp > WARM_C:
            board.add("cold-oil", AGAINST, "oil at {0}: warm enough", Q(temp, "temperature"))
    found.values["stiffness_loss"] = _score_air(board, air_content, pressure)
