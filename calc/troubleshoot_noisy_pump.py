"""Troubleshooting checklist: noisy pump.

Symptoms and readings (inlet pressure, suction line velocity, oil temperature)
ranked over the causes of site_src/checklists/noisy-pump.md. The suction-check
tool works out the inlet pressure at cold start and hot; line-velocity the
speed in the suction line.
"""

from __future__ import annotations

from . import suction
from .checklists import (MODERATE, STRONG, TOPIC, WEAK, Scoreboard, checklist_result,
                         count_entered, flag, RANKING_OUTPUTS)
from .registry import Field, tool
from .result import Q

CAUSES = (
    ("cavitation", "Pump starving at the inlet"),
    ("air-in-oil", "Air drawn in or carried in the oil"),
    ("coupling", "Coupling misaligned or worn, mounting loose"),
    ("valve-chatter", "A relief or pressure valve chattering"),
    ("pump-wear", "Worn or damaged pump"),
)

# Common practice (calc.suction): industrial pumps need at least about 0.8 bar absolute at the
# inlet; the pump maker's figure takes precedence.
MIN_INLET_BAR_ABS = suction.P_MIN_BAR
# Common practice: suction lines are sized for about 0.5 to 1.2 m/s.
MAX_SUCTION_VELOCITY = 1.2

CAUTION = ("Listen and measure from outside the guard: never remove a coupling guard from a "
           "running pump, and never feel for leaks with a hand. Stop, lock out and relieve "
           "pressure before opening the suction line or the pump; oil may be hot.")


def _score_readings(board: Scoreboard, inlet, pump_min, velocity) -> list[tuple]:
    verdicts = []
    if inlet is not None:
        limit = MIN_INLET_BAR_ABS if pump_min is None else pump_min
        args = (Q(inlet, "pressure"), Q(limit, "pressure"))
        board.weigh("cavitation", inlet < limit, STRONG,
                    "inlet pressure {0} absolute, below the pump's {1}",
                    "inlet pressure {0} absolute, above the pump's {1}", *args)
        if inlet < limit:
            verdicts.append(("act", "Inlet pressure {0} absolute, below the {1} the pump needs: "
                             "it is starving; do not run it at full speed until found.", *args))
    if velocity is not None and velocity > MAX_SUCTION_VELOCITY:
        board.add("cavitation", MODERATE, "suction line velocity {0}, above the {1} common "
                  "practice allows", Q(velocity, "velocity"), Q(MAX_SUCTION_VELOCITY, "velocity"))
    return verdicts


@tool(
    "checklist-noisy-pump",
    title="Noisy pump: what to check first",
    summary="Tick what you hear and enter the readings you have; the causes of a noisy pump are "
            "ranked, each with its checks and cautions.",
    topic=TOPIC,
    inputs=(
        flag("worse_cold", "Noisier at cold start, quieter once warm"),
        flag("whine", "High whine that rises with speed"),
        flag("rattle", "Rattle like gravel"),
        flag("foam", "Foam in the tank or cloudy oil"),
        flag("strainer_old", "Suction strainer not cleaned lately, or inlet valve not fully open"),
        flag("level_low", "Oil level low"),
        flag("vibration", "Vibration at the coupling or pump mounting"),
        flag("after_pump_work", "Started after the pump or motor was changed or moved"),
        flag("noise_at_setting", "Noise or squeal comes as the pressure reaches its setting"),
        flag("slow_or_hot", "Machine slower, or the pump case hotter, than it used to be"),
        Field("inlet_pressure", "Pump inlet pressure, absolute", "pressure", None, min=0.0,
              max=10.0, optional=True, help="From a vacuum gauge at the inlet, or the "
                                            "suction-check tool."),
        Field("pump_min_inlet", "Pump's minimum inlet pressure, absolute", "pressure", None,
              min=0.1, max=5.0, optional=True,
              help="From the pump's data sheet; blank uses 0.8 bar (common practice)."),
        Field("suction_velocity", "Oil speed in the suction line", "velocity", None, min=0.0,
              max=50.0, optional=True, help="From the line-velocity tool."),
    ),
    outputs=RANKING_OUTPUTS,
)
def checklist_noisy_pump(worse_cold=False, whine=False, rattle=False, foam=False,
                         strainer_old=False, level_low=False, vibration=False,
                         after_pump_work=False, noise_at_setting=False, slow_or_hot=False,
                         inlet_pressure=None, pump_min_inlet=None, suction_velocity=None):
    """Rank the causes of pump noise from symptoms and readings."""
    board = Scoreboard(CAUSES)
    if worse_cold:
        board.add("cavitation", MODERATE, "worse cold: thick oil starves the inlet")
    if whine:
        board.add("cavitation", MODERATE, "whine rising with speed")
        board.add("pump-wear", WEAK, "whine rising with speed")
    if rattle:
        board.add_each(("cavitation", "air-in-oil"), MODERATE, "gravel rattle: vapour or air "
                                                               "bubbles collapsing")
    if foam:
        board.add("air-in-oil", STRONG, "foam or cloudy oil")
    if strainer_old:
        board.add("cavitation", STRONG, "strainer not cleaned or inlet valve not fully open")
    if level_low:
        board.add_each(("cavitation", "air-in-oil"), MODERATE, "low oil level")
    if vibration:
        board.add("coupling", STRONG, "vibration at the coupling or mounting")
    if after_pump_work:
        board.add("coupling", MODERATE, "started after the pump or motor was moved")
        board.add("air-in-oil", WEAK, "started after the pump was changed: an inlet joint")
    if noise_at_setting:
        board.add("valve-chatter", STRONG, "noise comes at the pressure setting")
    if slow_or_hot:
        board.add("pump-wear", STRONG, "slower machine or hotter pump: wear inside")
    verdicts = _score_readings(board, inlet_pressure, pump_min_inlet, suction_velocity)
    entered = count_entered(worse_cold, whine, rattle, foam, strainer_old, level_low, vibration,
                            after_pump_work, noise_at_setting, slow_or_hot, inlet_pressure,
                            suction_velocity)
    result = checklist_result(board, entered, CAUTION, verdicts)
    if inlet_pressure is not None and pump_min_inlet is None:
        result.note("The pump's minimum inlet pressure was taken as 0.8 bar absolute (common "
                    "practice): the pump maker's data sheet takes precedence.")
    result.sources.append("Inlet 0.8 bar absolute, suction line 1.2 m/s: common practice, "
                          "from memory")
    return result
