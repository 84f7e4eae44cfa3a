"""Troubleshooting checklist: noisy pump.

Symptoms and readings (inlet pressure, suction line velocity, oil temperature)
ranked over the causes of site_src/checklists/noisy-pump.md. The suction-check
tool works out the inlet pressure at cold start and hot; line-velocity the
speed in the suction line.
"""

from __future__ import annotations

from . import suction
from .checklists import (MODERATE, STRONG, TOPIC, WEAK, Scoreboard, Symptom, checklist_result,
                         count_entered, symptom_fields, RANKING_OUTPUTS)
from .registry import Field, tool
from .result import Q

CAUSES = (
    ("cavitation", "Pump starving at the inlet"),
    ("air-in-oil", "Air drawn in or carried in the oil"),
    ("coupling", "Coupling misaligned or worn, mounting loose"),
    ("valve-chatter", "A relief or pressure valve chattering"),
    ("pump-wear", "Worn or damaged pump"),
)

_WHINE = "whine rising with speed"
# Tick boxes in the order of the form, each with the points it gives (common practice, see
# calc.checklists).
SYMPTOMS = (
    Symptom("worse_cold", "Noisier at cold start, quieter once warm",
            (("cavitation", MODERATE, "worse cold: thick oil starves the inlet"),)),
    Symptom("whine", "High whine that rises with speed",
            (("cavitation", MODERATE, _WHINE), ("pump-wear", WEAK, _WHINE))),
    Symptom("rattle", "Rattle like gravel",
            ((("cavitation", "air-in-oil"), MODERATE,
              "gravel rattle: vapour or air bubbles collapsing"),)),
    Symptom("foam", "Foam in the tank or cloudy oil",
            (("air-in-oil", STRONG, "foam or cloudy oil"),)),
    Symptom("strainer_old", "Suction strainer not cleaned lately, or inlet valve not fully open",
            (("cavitation", STRONG, "strainer not cleaned or inlet valve not fully open"),)),
    Symptom("level_low", "Oil level low",
            ((("cavitation", "air-in-oil"), MODERATE, "low oil level"),)),
    Symptom("vibration", "Vibration at the coupling or pump mounting",
            (("coupling", STRONG, "vibration at the coupling or mounting"),)),
    Symptom("after_pump_work", "Started after the pump or motor was changed or moved",
            (("coupling", MODERATE, "started after the pump or motor was moved"),
             ("air-in-oil", WEAK, "started after the pump was changed: an inlet joint"))),
    Symptom("noise_at_setting", "Noise or squeal comes as the pressure reaches its setting",
            (("valve-chatter", STRONG, "noise comes at the pressure setting"),)),
    Symptom("slow_or_hot", "Machine slower, or the pump case hotter, than it used to be",
            (("pump-wear", STRONG, "slower machine or hotter pump: wear inside"),)),
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
        *symptom_fields(SYMPTOMS),
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
def checklist_noisy_pump(inlet_pressure=None, pump_min_inlet=None, suction_velocity=None,
                         **symptoms):
    """Rank the causes of pump noise from the ticked SYMPTOMS and readings."""
    board = Scoreboard(CAUSES)
    ticked = board.tick(SYMPTOMS, symptoms)
    verdicts = _score_readings(board, inlet_pressure, pump_min_inlet, suction_velocity)
    entered = ticked + count_entered(inlet_pressure, suction_velocity)
    result = checklist_result(board, entered, CAUTION, verdicts)
    if inlet_pressure is not None and pump_min_inlet is None:
        result.note("The pump's minimum inlet pressure was taken as 0.8 bar absolute (common "
                    "practice): the pump maker's data sheet takes precedence.")
    result.sources.append("Inlet 0.8 bar absolute, suction line 1.2 m/s: common practice, "
                          "from memory")
    return result
