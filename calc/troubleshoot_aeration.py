"""Troubleshooting checklist: aeration and foam.

Symptoms at the machine and the oil's lab readings (foam sequence I, air-release
time, the tank's dwell time) ranked over the causes of site_src/checklists/aeration.md.
The oil's readings are judged by calc.foam against the limits of its grade.
"""

from __future__ import annotations

from . import foam, tank
from .checklists import (AGAINST, MODERATE, STRONG, TOPIC, WEAK, Scoreboard, Symptom,
                         checklist_result, both_or_neither, count_entered, symptom_fields,
                         RANKING_OUTPUTS)
from .registry import Field, Output, tool
from .result import Q

# In the order of the printed page: quick outside checks first.
CAUSES = (
    ("suction-leak", "Air drawn in on the suction side"),
    ("return-line", "Return line ending above the oil level"),
    ("tank-dwell", "Oil level low or too little time in the tank"),
    ("antifoam-overdose", "Too much antifoam slowing the air release"),
    ("contaminated-oil", "Oil contaminated with grease, engine oil, cleaner or water"),
    ("wrong-topup", "Wrong or mixed oil topped up"),
    ("antifoam-lost", "Antifoam used up or filtered out"),
)
MECHANICAL = ("suction-leak", "return-line", "tank-dwell")

_FINE_AIR = "cloudy oil that clears from the bottom: fine air"
_RATTLE = "pump rattles: air or vapour at the inlet"
_TOPUP = "started after a top-up or oil change"
# Tick boxes in the order of the form, each with the points it gives (common practice, see
# calc.checklists).
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

CAUTION = ("Stop the machine, lock it out and relieve pressure (accumulators, raised loads) "
           "before opening any fitting; never feel for leaks with a hand: oil under pressure "
           "injects through skin. Oil and pump may be hot.")


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
                       f"sequence I foam within the limits for {grade}")
    if air_release is None:
        return
    args = (Q(air_release, "minutes"), Q(limits.air_release_min, "minutes"))
    if air_release > limits.air_release_min:
        reason = f"air release {{0}} against {{1}} allowed for {grade}"
        board.add_each(("contaminated-oil", "antifoam-overdose"), MODERATE, reason, *args)
        board.add("wrong-topup", WEAK, reason, *args)
    else:
        board.add("antifoam-overdose", AGAINST,
                  f"air release {{0}}, within the {{1}} allowed for {grade}", *args)
    if "antifoam-overdose" in patterns:
        board.add("antifoam-overdose", STRONG,
                  "foam passes while the air release is long: typical of too much antifoam")
    if "mechanical" in patterns and sequences:
        board.add_each(MECHANICAL, MODERATE, "the oil passes its foam and air-release tests, "
                                             "so the air comes from the machine")


def _score_tank(board: Scoreboard, grade: str, air_release, oil_volume, pump_flow) -> None:
    if oil_volume is None or pump_flow is None:
        return
    dwell = tank.dwell_minutes(oil_volume, pump_flow)
    needed = air_release if air_release is not None else foam.grade_limits(grade).air_release_min
    if dwell < tank.DWELL_OK_RATIO * needed:
        board.add("tank-dwell", STRONG,
                  "the oil stays {0} in the tank, less than the {1} it needs to release air",
                  Q(dwell, "minutes"), Q(needed, "minutes"))
    elif dwell < MIN_DWELL_MIN:
        board.add("tank-dwell", MODERATE,
                  "the tank holds {0} of pump flow, less than the {1} common practice asks",
                  Q(dwell, "minutes"), Q(MIN_DWELL_MIN, "minutes"))


@tool(
    "checklist-aeration",
    title="Aeration and foam: what to check first",
    summary="Tick what you see and enter the readings you have; the causes of air in the oil "
            "are ranked, each with its checks and cautions.",
    topic=TOPIC,
    inputs=(
        *symptom_fields(SYMPTOMS),
        Field("grade", "Oil grade", "choice", "VG 46", choices=foam.GRADE_CHOICES),
        Field("air_release", "Air-release time at 50 °C (lab)", "minutes", None, min=0.0,
              max=120.0, optional=True),
        Field("seq1_tendency", "Foam sequence I: tendency (lab)", "foam_ml", None, min=0.0,
              max=2000.0, optional=True),
        Field("seq1_stability", "Foam sequence I: stability (lab)", "foam_ml", None, min=0.0,
              max=2000.0, optional=True),
        Field("oil_volume", "Oil in the tank at working level", "volume", None, min=1.0,
              max=1.0e6, optional=True, help="From the tank-volume tool."),
        Field("pump_flow", "Pump flow", "flow", None, min=0.1, max=1.0e5, optional=True),
    ),
    outputs=(
        *RANKING_OUTPUTS,
        Output("dwell_time", "Oil's time in the tank", "minutes"),
    ),
)
def checklist_aeration(grade="VG 46", air_release=None, seq1_tendency=None, seq1_stability=None,
                       oil_volume=None, pump_flow=None, **symptoms):
    """Rank the causes of air in the oil from the ticked SYMPTOMS and readings."""
    both_or_neither("enter both the oil volume and the pump flow for the dwell time, or neither",
                    oil_volume=oil_volume, pump_flow=pump_flow)
    board = Scoreboard(CAUSES)
    ticked = board.tick(SYMPTOMS, symptoms)
    _score_oil(board, grade, air_release, seq1_tendency, seq1_stability)
    _score_tank(board, grade, air_release, oil_volume, pump_flow)
    entered = ticked + count_entered(air_release, seq1_tendency, seq1_stability, oil_volume)
    result = checklist_result(board, entered, CAUTION)
    result.values["dwell_time"] = (None if oil_volume is None
                                   else tank.dwell_minutes(oil_volume, pump_flow))
    result.sources += ["Oil limits: ISO 11158 HM / DIN 51524-2 HLP, from memory (calc.foam)",
                       "Dwell time against air release: common practice (calc.tank)"]
    return result
