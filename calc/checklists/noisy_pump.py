"""Troubleshooting checklist: noisy pump.

Symptoms and readings (inlet pressure, suction line velocity, oil temperature)
ranked over the causes of a noisy pump; why each happens is told in
site_src/checklists/checklist-noisy-pump.md. The suction-check
tool works out the inlet pressure at cold start and hot; line-velocity the
speed in the suction line.
"""

from __future__ import annotations

from ..kernel.grading import Band
from ..kernel.registry import Field
from ..kernel.result import Q, Result
from ..tools import suction
from .scoreboard import (MODERATE, READING_BASIS, STRONG, WEAK, Cause, Check, Scoreboard,
                         Symptom, checklist)

CAUSES = (
    Cause("cavitation", 'Pump starving at the inlet',
          checks=(
              Check("check-suction", 'Check that the suction valve is fully open and the '
                    'strainer has been cleaned.'),
              Check("work-inlet", 'Work out the inlet pressure at cold start and hot against '
                    "the pump's minimum.", tool="suction-check"),
              Check("check-speed", 'Check the speed of the oil in the suction line.',
                    tool="line-velocity"),
              Check("read-oil", "Read the oil's viscosity at the coldest start temperature "
                    "against the pump's limit.", tool="viscosity-at-temperature"),
          ),
          caution='Stop, lock out and relieve pressure before opening the suction line or '
                  'strainer; lock the suction valve open afterwards so the pump cannot start '
                  'against a shut valve.'),
    Cause("air-in-oil", 'Air drawn in or carried in the oil',
          checks=(
              Check("look-oil", 'Look at the oil in the tank: foam or a cloud of fine bubbles.'),
              Check("pour-clean", 'Pour clean oil over suspect inlet joints and the shaft seal '
                    'with the pump running; if the noise changes, that joint leaks.',
                    tool="suction-check"),
              Check("read-lab", "Read the lab's foam and air-release results against the "
                    "grade's limits.", tool="foam-air-tests"),
          ),
          caution='Keep hands, hair and loose clothing clear of couplings and shafts; work from '
                  'outside the guard.'),
    Cause("coupling", 'Coupling misaligned or worn, mounting loose',
          checks=(
              Check("look-listen", 'Look and listen from outside the guard for vibration at the '
                    'bell housing and feet.'),
              Check("machine-locked", 'Machine locked out: check the coupling insert for wear '
                    'and the bolts for tightness.'),
              Check("alignment-checked", 'Have the alignment checked after any pump or motor '
                    'change.'),
          ),
          caution='Lock out the motor at its isolator before removing a coupling guard.'),
    Cause("valve-chatter", 'A relief or pressure valve chattering',
          checks=(
              Check("note-noise", 'Note whether the noise comes only as the pressure reaches '
                    'its setting.'),
              Check("find-loudest", "Find the loudest valve with a mechanic's stethoscope or a "
                    'thermometer (it also runs hot).'),
              Check("valve-checked", 'Have the valve checked and set by someone qualified to '
                    'adjust it.'),
          ),
          caution='Never adjust a pressure valve above the value on the circuit diagram; stand '
                  'clear of fittings under pressure.'),
    Cause("pump-wear", 'Worn or damaged pump',
          checks=(
              Check("compare-cycle", 'Compare cycle times with earlier records; a slower '
                    'machine at the same settings points to a worn pump.'),
              Check("look-filter", 'Look at the filter element for shiny metal and check the '
                    "oil's cleanliness.", tool="iso-4406"),
              Check("pump-s", "Have the pump's case drain flow measured against the maker's "
                    'figure.'),
          ),
          caution="Leave pump repairs to people trained on them; the equipment maker's manual "
                  'comes first. Dispose of used oil and filters by local rules.'),
)

_WHINE = "whine rising with speed"
# Tick boxes in the order of the form, each with the points it gives (common practice, see
# calc.checklists.scoreboard).
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

# Common practice (as in the suction-check tool): industrial pumps need at least about 0.8 bar absolute at the
# inlet; the pump maker's figure takes precedence.
MIN_INLET_BAR_ABS = suction.P_MIN_BAR
# Common practice: suction lines are sized for about 0.5 to 1.2 m/s.
MAX_SUCTION_VELOCITY = 1.2

INLET_BANDS = (
    Band("act", "Inlet pressure {inlet} absolute, below the {limit} the pump needs: it is "
                "starving; do not run it at full speed until found.", under="limit"),
)


@checklist(
    "checklist-noisy-pump",
    title="Noisy pump: what to check first",
    summary="Tick what you hear and enter the readings you have; the causes of a noisy pump are "
            "ranked, each with its checks and cautions.",
    causes=CAUSES,
    symptoms=SYMPTOMS,
    readings=(
        Field("inlet_pressure", "Pump inlet pressure, absolute", "absolute_pressure", None, min=0.0,
              max=10.0, optional=True, help="From a vacuum gauge at the inlet, or the "
                                            "suction-check tool."),
        Field("pump_min_inlet", "Pump's minimum inlet pressure, absolute", "absolute_pressure", None,
              binds="pump_min_inlet",
              min=0.1, max=5.0, optional=True, group="machine",
              help="From the pump's data sheet; blank uses 0.8 bar (common practice).", usual=(0.4, 1.0)),
        Field("suction_velocity", "Oil speed in the suction line", "velocity", None, min=0.0,
              max=50.0, optional=True, help="From the line-velocity tool."),
    ),
    caution="Listen and measure from outside the guard: never remove a coupling guard from a "
            "running pump, and never feel for leaks with a hand. Stop, lock out and relieve "
            "pressure before opening the suction line or the pump; oil may be hot.",
    sources=("Inlet 0.8 bar absolute, suction line 1.2 m/s: common practice, from memory",),
)
def checklist_noisy_pump(board: Scoreboard, found: Result, inlet_pressure, pump_min_inlet,
                         suction_velocity):
    """Rank the causes of pump noise from the ticked SYMPTOMS and readings."""
    if inlet_pressure is not None:
        limit = MIN_INLET_BAR_ABS if pump_min_inlet is None else pump_min_inlet
        args = (Q(inlet_pressure, "pressure"), Q(limit, "pressure"))
        board.weigh("cavitation", inlet_pressure < limit, STRONG,
                    "inlet pressure {0} absolute, below the pump's {1}",
                    "inlet pressure {0} absolute, above the pump's {1}", *args)
        found.grade(inlet_pressure, INLET_BANDS, READING_BASIS,
                    inlet=Q(inlet_pressure, "pressure"), limit=Q(limit, "pressure"))
    if suction_velocity is not None and suction_velocity > MAX_SUCTION_VELOCITY:
        board.add("cavitation", MODERATE, "suction line velocity {0}, above the {1} common "
                  "practice allows", Q(suction_velocity, "velocity"),
                  Q(MAX_SUCTION_VELOCITY, "velocity"))
    if inlet_pressure is not None and pump_min_inlet is None:
        found.note("The pump's minimum inlet pressure was taken as {p_min} absolute (common "
                   "practice): the pump maker's data sheet takes precedence.",
                   p_min=Q(MIN_INLET_BAR_ABS, "absolute_pressure"))
