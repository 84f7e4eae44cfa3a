"""The drying-time tool: the well-mixed tank model of calc.methods.drying, with the target
taken as 50 % of saturation at the coldest temperature (common practice) unless entered.
"""

from __future__ import annotations

from ..kernel.grading import Band
from ..kernel.registry import WATER, Field, Output, tool
from ..kernel.result import COMMON_PRACTICE, Q, Result
from ..methods.drying import drying_time_min, halving_time_min
from ..methods.water import water_volume_ml
from .water import (DRAIN_CAUTION, TARGET_FRACTION, note_coldest, note_unused_calibration,
                    oil_fields, reading_fields, reading_to_ppm, saturation_line, tank_fields,
                    warn_outside)

_PPM = "ppm"
_T = "temperature"

# Free water in the tank now: it is drained, not dried (common practice).
FREE_NOW_BANDS = (
    Band("act", "There is free water at {temp}: drain what has settled at the tank bottom first; "
                "the drying time below counts on the unit taking the rest.", over="sat"),
)
# The time the unit must run: none, or some (common practice).
DRYING_BANDS = (
    Band("ok", "The oil is at {ppm}, already at or below the target of {target}: no drying "
               "needed; keep breathers and seals tight.", at_most=0.0),
    Band("watch", "Run the unit about {hours} (the tank through it {passes} times) to bring the "
                  "oil from {ppm} to {target}; take a new reading then, because new water keeps "
                  "coming in until the ingress is stopped."),
)
# An entered target against what the oil holds at its coldest (common practice).
TARGET_BANDS = (
    Band("act", "The target {target} is more than the oil holds dissolved at {cold} ({sat_cold}): "
                "free water would still drop out when the oil is cold; aim for {usual} or less.",
         over="sat_cold"),
    Band("watch", "The target {target} is above 50 % of saturation at {cold} ({usual}): little "
                  "margin before free water drops out when the oil is cold.", over="usual"),
)


def drying_target_ppm(sat_cold_ppm: float, fraction: float = TARGET_FRACTION) -> float:
    """Target content [ppm]: `fraction` of saturation at the coldest temperature (common practice).

    >>> drying_target_ppm(180.0)
    90.0
    """
    return fraction * sat_cold_ppm


@tool(
    "water-drying",
    title="Drying time",
    summary="How long a dehydrator or a water-removing filter takes to bring the tank from "
            "the water content now to a target, and what target keeps free water from "
            "dropping out at the coldest temperature.",
    topic=WATER,
    renamed={"volume": "oil_volume", "flow": "dryer_flow", "efficiency": "dryer_efficiency"},
    inputs=reading_fields() + (
        Field("target_ppm", "Target water content", _PPM, None, min=1.0, max=100000.0,
              optional=True,
              help="Leave blank for 50 % of saturation at the coldest temperature "
                   "(common practice), or enter the machine maker's limit."),
        Field("dryer_flow", "Dehydrator flow", "flow", 20.0, min=0.1, max=10000.0),
        Field("dryer_efficiency", "Water removed per pass", "percent", 50.0, min=1.0, max=100.0,
              help="Single-pass efficiency from the unit's data sheet: the share of the "
                   "water in the oil it removes in one pass at this content."),
    ) + tank_fields() + oil_fields(),
    outputs=(
        Output("ppm", "Water content now", _PPM),
        Output("target_ppm", "Target water content", _PPM),
        Output("hours", "Drying time to target", "hours", headline=True),
        Output("half_hours", "Content halves every", "hours"),
        Output("passes", "Tank volumes through the unit", "ratio"),
        Output("removed_ml", "Water to remove", "volume_ml"),
        Output("target_basis", "Target from", "text"),
    ),
)
def water_drying(reading: str, rh: float, ppm: float, temp: float, temp_cold: float,
                 dryer_flow: float, dryer_efficiency: float, oil_volume: float, density: float,
                 oil: str,
                 target_ppm: float | None = None, cal_temp1: float | None = None,
                 cal_ppm1: float | None = None, cal_temp2: float | None = None,
                 cal_ppm2: float | None = None) -> Result:
    """Time to dry the tank to the target on the well-mixed model, with the target itself."""
    line = saturation_line(oil, cal_temp1, cal_ppm1, cal_temp2, cal_ppm2)
    content = reading_to_ppm(reading, rh, ppm, temp, line)
    temp_cold_entered, temp_cold = temp_cold, min(temp, temp_cold)  # never above the reading
    sat_cold = line.saturation(temp_cold)
    usual = drying_target_ppm(sat_cold)
    target = usual if target_ppm is None else target_ppm
    minutes = drying_time_min(content, target, dryer_flow, dryer_efficiency, oil_volume)
    result = Result(values={
        "ppm": content,
        "target_ppm": target,
        "hours": minutes / 60.0,
        "half_hours": halving_time_min(dryer_flow, dryer_efficiency, oil_volume) / 60.0,
        "passes": dryer_flow * minutes / oil_volume,
        "removed_ml": water_volume_ml(max(0.0, content - target), oil_volume, density),
        "target_basis": ("50 % of saturation at the coldest temperature (common practice)"
                         if target_ppm is None else "entered"),
    })
    if result.grade(content, FREE_NOW_BANDS, COMMON_PRACTICE, temp=Q(temp, _T),
                    sat=Q(line.saturation(temp), _PPM)):
        result.note(DRAIN_CAUTION)
    result.grade(minutes, DRYING_BANDS, COMMON_PRACTICE, ppm=Q(content, _PPM),
                 target=Q(target, _PPM), hours=Q(minutes / 60.0, "hours"),
                 passes=Q(dryer_flow * minutes / oil_volume, "ratio"))
    if target_ppm is not None:
        result.grade(target_ppm, TARGET_BANDS, COMMON_PRACTICE, target=Q(target_ppm, _PPM),
                     cold=Q(temp_cold, _T), sat_cold=Q(sat_cold, _PPM), usual=Q(usual, _PPM))
    result.note("The time assumes a well-mixed tank, no new water and a constant efficiency. "
                "Vacuum and air-stripping dehydrators take dissolved water; coalescing and "
                "water-absorbing filters take mainly free water and slow down near saturation, "
                "and an absorbing element holds only so much water (compare {0} with its "
                "rated capacity).", Q(water_volume_ml(max(0.0, content - target), oil_volume,
                                                          density), "volume_ml"))
    result.note("Connecting a unit means opening the circuit: stop and lock out the machine, "
                "relieve pressure (accumulators too), mind hot oil and surfaces, and follow the "
                "unit maker's instructions.")
    note_coldest(result, temp, temp_cold_entered)
    note_unused_calibration(result, oil, cal_temp1, cal_ppm1, cal_temp2, cal_ppm2)
    warn_outside(result, line, (temp, temp_cold))
    result.sources += [line.source,
                       "Well-mixed tank, first-order removal: C(t) = C0 exp(−η Q t / V)",
                       "Target of at most 50 % of saturation at the coldest temperature: "
                       "common practice"]
    return result

