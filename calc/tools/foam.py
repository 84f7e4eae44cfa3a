"""Foam and air release of a hydraulic oil read against the limits for its grade.

Two laboratory tests tell how an oil lets go of air:

- Foam (ASTM D892 / ISO 6247): air is blown through the oil for 5 minutes in
  three sequences, I at 24 degC, II at 93.5 degC, III at 24 degC again after
  II. The *tendency* is the foam on top at the end of blowing [mL]; the
  *stability* is the foam still there after 10 minutes' settling [mL].
  Results are written tendency/stability, e.g. "30/0".
- Air release (ISO 9120 / ASTM D3427): air is dispersed in the oil at 50 degC
  and the minutes until only 0.2 % by volume of air is left are the air-release
  time. It is the entrained air (bubbles inside the oil), not the foam on top,
  that makes controls spongy and pumps noisy.

Neither number is a property of the machine: an oil that passes both and still
foams in the tank points to a mechanical cause (air drawn in, a return line
that splashes, too little time in the tank).

Sources: test methods ASTM D892, ISO 6247, ISO 9120, ASTM D3427 (procedures
from memory). Limits: ISO 11158 (category HM) and DIN 51524-2 (HLP) minimum
requirements, recalled from memory: confirm against the standard or the oil's
data sheet.
"""

from __future__ import annotations

from typing import NamedTuple

from ..kernel.errors import InputError, typed
from ..kernel.grading import Band
from ..kernel.registry import AIR, Field, Output, tool
from ..kernel.result import COMMON_PRACTICE, Q, Result

_ML = "foam_ml"  # foam is reported in mL in both unit systems (ASTM D892)
_MIN = "minutes"


class FoamLimits(NamedTuple):
    """Limits of one grade: foam tendency and stability [mL] per sequence, air release [min]."""

    tendency_24: float  # sequences I and III, 24 degC
    tendency_93: float  # sequence II, 93.5 degC
    stability: float  # all three sequences, after 10 min settling
    air_release_min: float  # at 50 degC


# ISO 11158 (HM) and DIN 51524-2 (HLP) minimum requirements per ISO VG: foam 150/0 mL for
# sequences I and III and 75/0 mL for II; air release at 50 degC. FROM MEMORY of the
# standards, not checked against a copy at hand.
GRADE_LIMITS = (
    ("VG 22", FoamLimits(150.0, 75.0, 0.0, 5.0)),
    ("VG 32", FoamLimits(150.0, 75.0, 0.0, 5.0)),
    ("VG 46", FoamLimits(150.0, 75.0, 0.0, 10.0)),
    ("VG 68", FoamLimits(150.0, 75.0, 0.0, 13.0)),
    ("VG 100", FoamLimits(150.0, 75.0, 0.0, 21.0)),
)
GRADE_CHOICES = tuple((g, f"ISO {g}") for g, _ in GRADE_LIMITS)
LIMITS_BASIS = "ISO 11158 HM / DIN 51524-2 HLP limits, from memory"

# Everything a reading can point to, in the order they are reported.
PATTERNS = {
    "contamination": "contamination with a surface-active substance (grease, detergent "
                     "engine oil, cleaning agent, water with fines)",
    "antifoam-lost": "antifoam used up or filtered out, or a wrong or mixed top-up",
    "antifoam-overdose": "too much antifoam (silicone) slowing the air release",
    "slow-air-release": "an oil that holds air: contamination, ageing or a wrong or mixed top-up",
    "mechanical": "a mechanical cause: air drawn in on the suction side, a return line above "
                  "the oil level, or too little dwell time in the tank",
    "within-limits": "an oil that lets go of air as it should",
}


def grade_limits(grade: str) -> FoamLimits:
    """The preset limits of an ISO VG grade ("VG 46").

    >>> grade_limits("VG 46").air_release_min
    10.0

    Source: ISO 11158 HM / DIN 51524-2, from memory.
    """
    for name, limits in GRADE_LIMITS:
        if name == grade:
            return limits
    names = ", ".join(g for g, _ in GRADE_LIMITS)
    raise InputError("grade", "must be one of {names}, not {typed}", names=Q(names, "text"),
                     typed=typed(grade))


def foam_sequences(seq1: tuple[float | None, float | None], seq2: tuple[float | None, float | None],
                   seq3: tuple[float | None, float | None], limits: FoamLimits):
    """Each sequence's (name, tendency, stability, tendency limit), blanks left out.

    >>> [s[0] for s in foam_sequences((30, 0), (None, None), (40, 0), grade_limits("VG 46"))]
    ['I', 'III']
    """
    rows = (("I", seq1, limits.tendency_24), ("II", seq2, limits.tendency_93),
            ("III", seq3, limits.tendency_24))
    return [(name, t, s, lim) for name, (t, s), lim in rows if t is not None or s is not None]


def foam_patterns(sequences, air_release_min: float | None, limits: FoamLimits,
                  machine_foams: bool = False) -> tuple[str, ...]:
    """What the readings point to: keys of `PATTERNS`, most telling first.

    - stability above its limit in any sequence: contamination (foam that does not break);
    - tendency above its limit with stable-free foam: antifoam lost, or a wrong / mixed oil;
    - foam within limits but air release too long: antifoam overdose;
    - air release too long with foam also out: an oil that holds air;
    - every entered test within limits and the machine foams: a mechanical cause.

    >>> foam_patterns([("I", 40.0, 0.0, 150.0)], 14.0, grade_limits("VG 46"))
    ('antifoam-overdose',)
    >>> foam_patterns([("I", 40.0, 0.0, 150.0)], 6.0, grade_limits("VG 46"), machine_foams=True)
    ('mechanical',)

    Source: common practice of oil analysis; thresholds are the grade's limits.
    """
    stable = any(s is not None and s > limits.stability for _, _, s, _ in sequences)
    tall = any(t is not None and t > lim for _, t, _, lim in sequences)
    foam_known = bool(sequences)
    slow = air_release_min is not None and air_release_min > limits.air_release_min
    found = []
    if stable:
        found.append("contamination")
    if tall and not stable:
        found.append("antifoam-lost")
    if slow and foam_known and not (stable or tall):
        found.append("antifoam-overdose")
    elif slow:
        found.append("slow-air-release")
    if not found and (foam_known or air_release_min is not None):
        found.append("mechanical" if machine_foams else "within-limits")
    return tuple(found)


# An oil in service is not held to the new-oil figure: above it is a watch, and action comes
# only at a margin beyond it (common practice for oils in service, from memory; turbine-oil
# practice as in ASTM D4378 acts at a foam tendency of 450 mL or stability of 10 mL, and at
# an air release about twice the new-oil limit).
IN_SERVICE_TENDENCY_ML = 450.0
IN_SERVICE_STABILITY_ML = 10.0
IN_SERVICE_AIR_RELEASE_FACTOR = 2.0
IN_SERVICE_BASIS = "in-service margin over the new-oil limit, common practice, from memory"


class ActLimits(NamedTuple):
    """Where an oil in service wants action, from its new-oil limits."""

    tendency_24: float
    tendency_93: float
    stability: float
    air_release_min: float


def in_service_limits(new: FoamLimits) -> ActLimits:
    """The action limits of an oil in service above its new-oil limits (common practice).

    >>> in_service_limits(grade_limits("VG 68")).air_release_min
    26.0
    """
    return ActLimits(max(IN_SERVICE_TENDENCY_ML, new.tendency_24),
                     max(IN_SERVICE_TENDENCY_ML, new.tendency_93),
                     max(IN_SERVICE_STABILITY_ML, new.stability),
                     IN_SERVICE_AIR_RELEASE_FACTOR * new.air_release_min)


# Each sequence against its limits: foam that stays points to a contaminant, tall foam that
# breaks to a lost antifoam. Above the new-oil limit is a watch (on that limit's basis), past
# the in-service margin it is act.
STABILITY_BANDS = (
    Band("act", "Sequence {sequence}: {stability} of foam still standing after settling, past "
                "the {act} where an oil in service wants action: the foam does not break, find "
                "the contaminant.", over="act", basis=IN_SERVICE_BASIS),
    Band("watch", "Sequence {sequence}: {stability} of foam still standing after settling, above "
                  "the {limit} of a new oil: resample, and look for a contaminant.",
         over="limit"),
)
TENDENCY_BANDS = (
    Band("act", "Sequence {sequence}: foam tendency {tendency}, past the {act} where an oil in "
                "service wants action.", over="act", basis=IN_SERVICE_BASIS),
    Band("watch", "Sequence {sequence}: foam tendency {tendency}, above the {limit} of a new "
                  "oil.", over="limit"),
)
SEQUENCE_OK_BANDS = (
    Band("ok", "Sequence {sequence}: foam within the grade's limits.", at_most=0.0),
)
AIR_RELEASE_BANDS = (
    Band("act", "Air release {air_release}, past the {act} (twice the new-oil {limit} for "
                "{grade}) where an oil in service wants action: air stays in the oil and makes "
                "controls spongy and pumps noisy.", over="act", basis=IN_SERVICE_BASIS),
    Band("watch", "Air release {air_release}, above the {limit} of a new {grade} oil but short "
                  "of the {act} where an oil in service wants action: resample and trend it.",
         over="limit"),
    Band("ok", "Air release {air_release}, within the {limit} allowed for {grade}."),
)
# What the readings point to: the two that are findings in their own right are verdicts;
# the others explain readings already graded above.
PATTERN_VERDICTS = {
    "antifoam-lost": "Check what was topped up and whether very fine filtration or ageing took "
                     "the antifoam out; ask the oil supplier before dosing any additive.",
    "mechanical": "The oil passes its tests, so the air comes from the machine: check the "
                  "suction side for leaks, the return line ends below the lowest oil level, and "
                  "the tank's dwell time.",
}
PATTERN_NOTES = {
    "contamination": "Foam that does not break points to something in the oil (grease, engine "
                     "oil, cleaner, water): correct the cause, then drain, flush and refill, do "
                     "not just top up.",
    "antifoam-overdose": "Good foam numbers with a long air release is typical of too much "
                         "antifoam: do not add more; ask the oil supplier about a partial oil "
                         "change.",
    "slow-air-release": "The oil holds air: check for contamination, ageing and mixed oils with "
                        "a full lab analysis.",
}


def _grade_sequences(result: Result, sequences, limits: FoamLimits, act: ActLimits,
                     basis: str) -> None:
    for name, tendency, stability, t_limit in sequences:
        sequence = Q(name, "text")
        t_act = act.tendency_93 if name == "II" else act.tendency_24
        excess = []
        if stability is not None:
            result.grade(stability, STABILITY_BANDS, basis, sequence=sequence,
                         stability=Q(stability, _ML), limit=Q(limits.stability, _ML),
                         act=Q(act.stability, _ML))
            excess.append(stability - limits.stability)
        if tendency is not None:
            result.grade(tendency, TENDENCY_BANDS, basis, sequence=sequence,
                         tendency=Q(tendency, _ML), limit=Q(t_limit, _ML), act=Q(t_act, _ML))
            excess.append(tendency - t_limit)
        result.grade(max(excess), SEQUENCE_OK_BANDS, basis, sequence=sequence)


def _grade_patterns(result: Result, patterns, air_release_min, limits: FoamLimits,
                    act: ActLimits, grade: str, basis: str) -> None:
    if air_release_min is not None:
        result.grade(air_release_min, AIR_RELEASE_BANDS, basis,
                     air_release=Q(air_release_min, _MIN), limit=Q(limits.air_release_min, _MIN),
                     act=Q(act.air_release_min, _MIN), grade=Q(grade, "text"))
    for key in patterns:
        if key in PATTERN_VERDICTS:
            result.add("watch", COMMON_PRACTICE, PATTERN_VERDICTS[key])
        elif key in PATTERN_NOTES:
            result.note(PATTERN_NOTES[key])


def _foam_field(key: str, label: str) -> Field:
    return Field(key, label, _ML, None, min=0.0, max=2000.0, optional=True,
                 help="From the lab report (ASTM D892 / ISO 6247); leave blank if not tested.")


def _limit_field(key: str, label: str, quantity: str, high: float) -> Field:
    return Field(key, label, quantity, None, min=0.0, max=high, optional=True,
                 help="Leave blank for the grade's preset (ISO 11158 / DIN 51524-2, from "
                      "memory); enter the oil's own specification when you have it.")


@tool(
    "foam-air-tests",
    title="Foam and air-release tests",
    summary="Read a lab's foam test (sequences I, II, III) and air-release time against the "
            "limits for the oil's grade, and what the pattern points to.",
    topic=AIR,
    inputs=(
        Field("grade", "Oil grade", "choice", "VG 46", choices=GRADE_CHOICES, binds="grade"),
        Field("air_release", "Air-release time at 50 °C", _MIN, None, min=0.0, max=120.0,
              tracks="air_release",
              optional=True, help="ISO 9120 / ASTM D3427, minutes to 0.2 % air."),
        _foam_field("seq1_tendency", "Sequence I (24 °C): tendency"),
        _foam_field("seq1_stability", "Sequence I (24 °C): stability"),
        _foam_field("seq2_tendency", "Sequence II (93.5 °C): tendency"),
        _foam_field("seq2_stability", "Sequence II (93.5 °C): stability"),
        _foam_field("seq3_tendency", "Sequence III (24 °C after II): tendency"),
        _foam_field("seq3_stability", "Sequence III (24 °C after II): stability"),
        Field("machine_foams", "The machine foams or the oil looks milky with air", "flag", False),
        _limit_field("limit_tendency_24", "Limit: tendency, sequences I and III", _ML, 2000.0),
        _limit_field("limit_tendency_93", "Limit: tendency, sequence II", _ML, 2000.0),
        _limit_field("limit_stability", "Limit: stability, all sequences", _ML, 2000.0),
        _limit_field("limit_air_release", "Limit: air release", _MIN, 120.0),
    ),
    outputs=(
        Output("points_to", "What the readings point to", "text", headline=True),
        Output("air_release_limit", "Air release allowed, new oil", _MIN),
        Output("air_release_act", "Air release where an oil in service wants action", _MIN),
        Output("air_release_ratio", "Air release against its limit", "ratio",
               "Above 1 the oil is slower to let go of air than its grade allows."),
        Output("tendency_limit_24", "Foam tendency allowed, I and III", _ML),
        Output("tendency_limit_93", "Foam tendency allowed, II", _ML),
        Output("stability_limit", "Foam stability allowed", _ML),
        Output("limits_basis", "Limits used", "text"),
    ),
)
def foam_air_tests(grade: str, air_release: float | None = None,
                   seq1_tendency: float | None = None, seq1_stability: float | None = None,
                   seq2_tendency: float | None = None, seq2_stability: float | None = None,
                   seq3_tendency: float | None = None, seq3_stability: float | None = None,
                   machine_foams: bool = False, limit_tendency_24: float | None = None,
                   limit_tendency_93: float | None = None, limit_stability: float | None = None,
                   limit_air_release: float | None = None) -> Result:
    """The foam test and air-release time against the grade's limits, and their pattern."""
    preset = grade_limits(grade)
    overrides = (limit_tendency_24, limit_tendency_93, limit_stability, limit_air_release)
    limits = FoamLimits(*(p if o is None else o for p, o in zip(preset, overrides)))
    if limits.air_release_min <= 0.0:
        raise InputError("limit_air_release", "must be more than 0 minutes")
    own = any(o is not None for o in overrides)
    basis = "the oil's specification as entered" if own else LIMITS_BASIS
    for n, (made, left) in enumerate(((seq1_tendency, seq1_stability), (seq2_tendency, seq2_stability),
                                      (seq3_tendency, seq3_stability)), 1):
        # ASTM D892: stability is what still stands 10 min after the blowing stopped.
        if made is not None and left is not None and left > made:
            raise InputError(f"seq{n}_stability", "the foam still standing after the rest "
                             "({left}) cannot be more than the foam the blowing made ({made}): "
                             "check the two figures of the report",
                             left=Q(left, "foam_ml"), made=Q(made, "foam_ml"))
    sequences = foam_sequences((seq1_tendency, seq1_stability), (seq2_tendency, seq2_stability),
                               (seq3_tendency, seq3_stability), limits)
    patterns = foam_patterns(sequences, air_release, limits, machine_foams)
    points_to = "; ".join(PATTERNS[p] for p in patterns) if patterns else "no reading entered"
    result = Result(values={
        "points_to": points_to,
        "air_release_limit": limits.air_release_min,
        "air_release_ratio": None if air_release is None else air_release / limits.air_release_min,
        "tendency_limit_24": limits.tendency_24,
        "tendency_limit_93": limits.tendency_93,
        "stability_limit": limits.stability,
        "limits_basis": basis,
    })
    act = in_service_limits(limits)
    result.values["air_release_act"] = act.air_release_min
    _grade_sequences(result, sequences, limits, act, basis)
    _grade_patterns(result, patterns, air_release, limits, act, grade, basis)
    if not patterns:
        result.note("Enter the lab's foam and air-release results to read them against the "
                    "limits shown for {grade}.", grade=Q(grade, "text"))
    if not own:
        result.note("Preset limits are recalled from ISO 11158 (HM) and DIN 51524-2 (HLP), "
                    "not read from the standard: the oil's data sheet and the machine maker's "
                    "specification take precedence.")
    result.note("Take samples from a running machine at a live point, away from hot surfaces; "
                "never open a line under pressure, and dispose of used oil by local rules.")
    result.sources += ["ASTM D892 / ISO 6247 foam test (sequences I, II, III)",
                       "ISO 9120 / ASTM D3427 air release at 50 °C",
                       "New-oil limits: ISO 11158 HM / DIN 51524-2 HLP, from memory",
                       "In-service action margins: common practice (turbine-oil practice as in "
                       "ASTM D4378), from memory",
                       "Reading of patterns: common practice"]
    return result
