"""Troubleshooting checklist: aeration and foam.

Symptoms at the machine and the oil's lab readings (foam sequence I, air-release
time, the tank's dwell time) ranked over the causes of air in the oil; why each happens is
told in site_src/checklists/checklist-aeration.md. The oil's readings are judged by
calc.tools.foam against the limits of its grade.
"""

from __future__ import annotations

from ..kernel.registry import Field, Output
from ..kernel.result import Q, Result
from ..methods.tank import dwell_minutes
from ..tools import foam, tank
from .scoreboard import (AGAINST, MODERATE, STRONG, WEAK, Cause, Check, Scoreboard, Symptom,
                         both_or_neither, checklist)

# In the order of the printed page: quick outside checks first.
CAUSES = (
    Cause("suction-leak", 'Air drawn in on the suction side',
          checks=(
              Check("pump-running", 'With the pump running, listen at the inlet fittings, '
                    'flanges and shaft seal for a hiss or a change in pump noise.',
                    tool="suction-check"),
              Check("smear-grease", 'Smear grease on a suspect joint or pour clean oil over it; '
                    'if the pump noise changes, that joint leaks.'),
              Check("work-inlet", 'Work out the inlet pressure at cold start and hot against '
                    "the pump's minimum.", tool="suction-check"),
              Check("machine-stopped", 'Machine stopped and locked out: tighten or renew '
                    'clamps, hoses and seals on the suction line.'),
          ),
          caution='Keep hands, hair and loose clothing clear of couplings and shafts of a '
                  'running pump. Stop the machine, lock it out and relieve pressure before '
                  'opening any fitting; oil, pump and lines may be hot.'),
    Cause("return-line", 'Return line ending above the oil level',
          checks=(
              Check("look-tank", 'Look into the tank through the filler with the machine '
                    'running: does the return flow splash or boil at the surface?'),
              Check("find-lowest", 'Find the lowest working level (all cylinders extended) and '
                    'check the return pipe still ends well below it.', tool="tank-volume"),
              Check("check-diffuser", 'Check that a diffuser or baffle is fitted and intact '
                    'between the return and the suction.'),
          ),
          caution='Never reach into a tank of a running machine; the return flow may be hot.'),
    Cause("tank-dwell", 'Oil level low or too little time in the tank',
          checks=(
              Check("read-level", 'Read the level in the sight glass with all cylinders in '
                    'their working position; top up to the mark with the same oil.'),
              Check("work-oil", "Work out the oil's time in the tank (working volume over pump "
                    'flow) against its air-release time.', tool="tank-sizing"),
              Check("check-leak", 'Check for a leak that keeps lowering the level: hoses, '
                    'cylinder rods, drain plugs.'),
          ),
          caution='Never feel for a leak with your hand: oil under pressure injects through '
                  'skin. Use a piece of card, and see a doctor at once after any injection '
                  'injury.'),
    Cause("antifoam-overdose", 'Too much antifoam slowing the air release',
          checks=(
              Check("read-lab", "Read the lab's air-release time against the limit for the "
                    'grade, with the foam result beside it.', tool="foam-air-tests"),
              Check("ask-anyone", 'Ask whether anyone added an antifoam or "foam stopper" to '
                    'the tank; do not add more.'),
              Check("agree-partial", 'Agree a partial oil change or a fresh charge with the oil '
                    'supplier.'),
          ),
          caution='Drain into closed containers, clean up spills at once, and dispose of used '
                  'oil by local rules.'),
    Cause("contaminated-oil", 'Oil contaminated with grease, engine oil, cleaner or water',
          checks=(
              Check("read-lab", "Read the lab's foam stability: foam that stands after settling "
                    'points to a contaminant.', tool="foam-air-tests"),
              Check("check-oil", 'Check the oil for water.', tool="water-in-oil"),
              Check("ask-went", 'Ask what went into the tank lately: which oil, from which '
                    'container, and whether parts were cleaned in place.'),
          ),
          caution='Wear gloves and eye protection when sampling; take samples from a running '
                  'machine only at a sampling valve made for it.'),
    Cause("wrong-topup", 'Wrong or mixed oil topped up',
          checks=(
              Check("compare-label", 'Compare the label of the last top-up with the oil named '
                    'for the machine.'),
              Check("viscosity-checked", 'Have the viscosity checked against the grade; a shift '
                    'points to a mixed oil.', tool="viscosity-grade"),
              Check("read-lab", "Read the lab's foam and air-release results against the "
                    "grade's limits.", tool="foam-air-tests"),
          ),
          caution="A wrong oil can harm seals and pumps: follow the equipment maker's oil list "
                  'before topping up again.'),
    Cause("antifoam-lost", 'Antifoam used up or filtered out',
          checks=(
              Check("read-lab", "Read the lab's foam tendency against the grade's limit, with "
                    'the stability beside it.', tool="foam-air-tests"),
              Check("check-oil", "Check the oil's age and condition.", tool="oil-condition"),
              Check("ask-oil", 'Ask the oil supplier before dosing any additive; an oil change '
                    'is often the sound fix.'),
          ),
          caution='Dispose of used oil and filters by local rules; never pour oil on the ground '
                  'or into drains.'),
)
MECHANICAL = ("suction-leak", "return-line", "tank-dwell")

_FINE_AIR = "cloudy oil that clears from the bottom: fine air"
_RATTLE = "pump rattles: air or vapour at the inlet"
_TOPUP = "started after a top-up or oil change"
# Tick boxes in the order of the form, each with the points it gives (common practice, see
# calc.checklists.scoreboard).
SYMPTOMS = (
    Symptom("foam_on_surface", "Foam on the oil in the tank",
            ((("suction-leak", "return-line", "tank-dwell", "contaminated-oil", "antifoam-lost"),
              WEAK, "foam on the oil in the tank"),)),
    Symptom("milky_clears", "Oil cloudy, clears from the bottom up when left standing",
            (("suction-leak", MODERATE, _FINE_AIR),
             (("tank-dwell", "antifoam-overdose"), WEAK, _FINE_AIR)),
            "Fine air bubbles rise and clear from the bottom; water clears from the top or "
            "not at all."),
    Symptom("pump_noise", "Pump noisy (rattle, like gravel)",
            (("suction-leak", MODERATE, _RATTLE), ("tank-dwell", WEAK, _RATTLE))),
    Symptom("spongy", "Actuators spongy or jerky",
            ((("suction-leak", "antifoam-overdose", "tank-dwell"), WEAK,
              "spongy actuators: air carried into the circuit"),)),
    Symptom("worse_cold", "Worse with cold oil",
            (("suction-leak", WEAK, "worse when cold: the inlet vacuum is deepest with thick oil"),
             ("antifoam-overdose", WEAK, "worse when cold: air leaves thick oil slowly"))),
    Symptom("after_suction_work", "Started after work on the pump or suction line",
            (("suction-leak", STRONG, "started after work on the pump or suction line"),)),
    Symptom("return_splashing", "Return flow splashes or is visible at the surface",
            (("return-line", STRONG, "return flow splashes at the surface"),)),
    Symptom("level_low", "Oil level low in the sight glass",
            (("tank-dwell", STRONG,
              "low oil level: less time in the tank and a vortex at the suction"),
             ("suction-leak", WEAK, "low oil level can uncover the suction"))),
    Symptom("after_topup", "Started after a top-up or oil change",
            (("wrong-topup", STRONG, _TOPUP), ("contaminated-oil", WEAK, _TOPUP))),
)

# Common practice (calc.tank): an industrial tank holds 3 to 5 minutes of pump flow.
MIN_DWELL_MIN = tank.FLOW_MINUTES["industrial"][0]

def _score_oil(board: Scoreboard, grade: str, air_release, tendency, stability) -> None:
    """Points for the lab readings, read by calc.foam's patterns against the grade's limits."""
    limits = foam.grade_limits(grade)
    sequences = foam.foam_sequences((tendency, stability), (None, None), (None, None), limits)
    patterns = foam.foam_patterns(sequences, air_release, limits, machine_foams=True)
    if "contamination" in patterns:
        board.add("contaminated-oil", STRONG,
                  "sequence I: {0} of foam still standing after settling, against {1} allowed",
                  Q(stability, "foam_ml"), Q(limits.stability, "foam_ml"))
    if "antifoam-lost" in patterns:
        board.add("antifoam-lost", STRONG,
                  "sequence I: foam tendency {0} against {1} allowed, and the foam breaks",
                  Q(tendency, "foam_ml"), Q(limits.tendency_24, "foam_ml"))
    if tendency is not None and tendency > limits.tendency_24:
        board.add("wrong-topup", WEAK, "sequence I: foam tendency {0} against {1} allowed",
                  Q(tendency, "foam_ml"), Q(limits.tendency_24, "foam_ml"))
    elif sequences and "contamination" not in patterns:
        board.add_each(("contaminated-oil", "antifoam-lost"), AGAINST,
                       "sequence I foam within the limits for {grade}", grade=Q(grade, "text"))
    if air_release is None:
        return
    args = (Q(air_release, "minutes"), Q(limits.air_release_min, "minutes"))
    if air_release > limits.air_release_min:
        reason = "air release {0} against {1} allowed for {grade}"
        board.add_each(("contaminated-oil", "antifoam-overdose"), MODERATE, reason, *args,
                       grade=Q(grade, "text"))
        board.add("wrong-topup", WEAK, reason, *args, grade=Q(grade, "text"))
    else:
        board.add("antifoam-overdose", AGAINST,
                  "air release {0}, within the {1} allowed for {grade}", *args,
                  grade=Q(grade, "text"))
    if "antifoam-overdose" in patterns:
        board.add("antifoam-overdose", STRONG,
                  "foam passes while the air release is long: typical of too much antifoam")
    if "mechanical" in patterns and sequences:
        board.add_each(MECHANICAL, MODERATE, "the oil passes its foam and air-release tests, "
                                             "so the air comes from the machine")


def _score_tank(board: Scoreboard, grade: str, air_release, oil_volume, pump_flow) -> None:
    if oil_volume is None or pump_flow is None:
        return
    dwell = dwell_minutes(oil_volume, pump_flow)
    needed = air_release if air_release is not None else foam.grade_limits(grade).air_release_min
    if dwell < tank.DWELL_OK_RATIO * needed:
        board.add("tank-dwell", STRONG,
                  "the oil stays {0} in the tank, less than the {1} it needs to release air",
                  Q(dwell, "minutes"), Q(needed, "minutes"))
    elif dwell < MIN_DWELL_MIN:
        board.add("tank-dwell", MODERATE,
                  "the tank holds {0} of pump flow, less than the {1} common practice asks",
                  Q(dwell, "minutes"), Q(MIN_DWELL_MIN, "minutes"))


@checklist(
    "checklist-aeration",
    title="Aeration and foam: what to check first",
    summary="Tick what you see and enter the readings you have; the causes of air in the oil "
            "are ranked, each with its checks and cautions.",
    causes=CAUSES,
    symptoms=SYMPTOMS,
    readings=(
        Field("grade", "Oil grade", "choice", "VG 46", choices=foam.GRADE_CHOICES, binds="grade",
              group="machine"),
        Field("air_release", "Air-release time at 50 °C (lab)", "minutes", None, min=0.0,
              tracks="air_release",
              max=120.0, optional=True),
        Field("seq1_tendency", "Foam sequence I: tendency (lab)", "foam_ml", None, min=0.0,
              max=2000.0, optional=True),
        Field("seq1_stability", "Foam sequence I: stability (lab)", "foam_ml", None, min=0.0,
              max=2000.0, optional=True),
        Field("oil_volume", "Oil in the tank at working level", "volume", None, min=1.0,
              max=1.0e6, optional=True, binds="oil_volume", help="From the tank-volume tool."),
        Field("pump_flow", "Pump flow", "flow", None, min=0.1, max=1.0e5, optional=True,
              binds="pump_flow"),
    ),
    outputs=(Output("dwell_time", "Oil's time in the tank", "minutes"),),
    caution="Stop the machine, lock it out and relieve pressure (accumulators, raised loads) "
            "before opening any fitting; never feel for leaks with a hand: oil under pressure "
            "injects through skin. Oil and pump may be hot.",
    sources=("Oil limits: ISO 11158 HM / DIN 51524-2 HLP, from memory (as in the foam-air-tests tool)",
             "Dwell time against air release: common practice (as in the tank-sizing tool)"),
)
def checklist_aeration(board: Scoreboard, found: Result, grade, air_release, seq1_tendency,
                       seq1_stability, oil_volume, pump_flow):
    """Rank the causes of air in the oil from the ticked SYMPTOMS and readings."""
    both_or_neither("enter both the oil volume and the pump flow for the dwell time, or neither",
                    oil_volume=oil_volume, pump_flow=pump_flow)
    _score_oil(board, grade, air_release, seq1_tendency, seq1_stability)
    _score_tank(board, grade, air_release, oil_volume, pump_flow)
    found.values["dwell_time"] = (None if oil_volume is None
                                  else dwell_minutes(oil_volume, pump_flow))
