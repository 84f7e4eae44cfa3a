"""Drying the oil: time for a dehydrator or a water-removing filter to reach a target content.

A unit drawing `Q` from a well-mixed tank of `V` and removing the fraction `eta`
of the water in each pass (single-pass efficiency) lowers the content as

    V dC/dt = -eta Q C       so       C(t) = C0 exp(-eta Q t / V)

and needs t = V / (eta Q) ln(C0 / C_target); the content halves every
ln(2) V / (eta Q). The model assumes no new water gets in while drying and a
constant efficiency; real units lose efficiency as the oil dries, so read the
time as the least it will take.

The usual target (common practice) keeps the content at most 50 % of the
saturation at the coldest temperature the oil sees, so no free water ever drops
out.

Source: first-order (well-mixed tank) mass balance; target rule common practice.
"""

from __future__ import annotations

import math

from ..kernel.registry import WATER, Field, Output, tool
from ..kernel.result import COMMON_PRACTICE, Q, Result
from .water import (DRAIN_CAUTION, TARGET_FRACTION, note_coldest, note_unused_calibration,
                    oil_fields, reading_fields, reading_to_ppm, saturation_line, tank_fields,
                    warn_outside, water_volume_ml)

_PPM = "ppm"
_T = "temperature"


def well_mixed_content_ppm(c0_ppm: float, minutes: float, flow_lpm: float, efficiency_pct: float,
                           volume_l: float) -> float:
    """Water content [ppm] after `minutes` [min] of drying a well-mixed tank.

    C(t) = C0 exp(-eta Q t / V), eta = efficiency_pct / 100, Q [L/min], V [L]

    >>> round(well_mixed_content_ppm(400.0, 60.0, 20.0, 50.0, 600.0), 1)
    147.2
    """
    return c0_ppm * math.exp(-efficiency_pct / 100.0 * flow_lpm * minutes / volume_l)


def drying_time_min(c0_ppm: float, target_ppm: float, flow_lpm: float, efficiency_pct: float,
                    volume_l: float) -> float:
    """Minutes [min] to bring a well-mixed tank from `c0_ppm` to `target_ppm`; 0 if already there.

    t = V / (eta Q) ln(C0 / C_target)

    >>> round(drying_time_min(400.0, 100.0, 20.0, 50.0, 600.0), 1)
    83.2
    """
    if c0_ppm <= target_ppm:
        return 0.0
    return volume_l / (efficiency_pct / 100.0 * flow_lpm) * math.log(c0_ppm / target_ppm)


def halving_time_min(flow_lpm: float, efficiency_pct: float, volume_l: float) -> float:
    """Minutes [min] in which a well-mixed tank's water content halves: ln(2) V / (eta Q).

    >>> round(halving_time_min(20.0, 50.0, 600.0), 1)
    41.6
    """
    return math.log(2.0) * volume_l / (efficiency_pct / 100.0 * flow_lpm)


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
    inputs=reading_fields() + (
        Field("target_ppm", "Target water content", _PPM, None, min=1.0, max=100000.0,
              optional=True,
              help="Leave blank for 50 % of saturation at the coldest temperature "
                   "(common practice), or enter the machine maker's limit."),
        Field("flow", "Dehydrator flow", "flow", 20.0, min=0.1, max=10000.0),
        Field("efficiency", "Water removed per pass", "percent", 50.0, min=1.0, max=100.0,
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
                 flow: float, efficiency: float, volume: float, density: float, oil: str,
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
    minutes = drying_time_min(content, target, flow, efficiency, volume)
    result = Result(values={
        "ppm": content,
        "target_ppm": target,
        "hours": minutes / 60.0,
        "half_hours": halving_time_min(flow, efficiency, volume) / 60.0,
        "passes": flow * minutes / volume,
        "removed_ml": water_volume_ml(max(0.0, content - target), volume, density),
        "target_basis": ("50 % of saturation at the coldest temperature (common practice)"
                         if target_ppm is None else "entered"),
    })
    free_now = content > line.saturation(temp)
    if free_now:
        result.add("act", COMMON_PRACTICE,
                   "There is free water at {0}: drain what has settled at the tank bottom "
                   "first; the drying time below counts on the unit taking the rest.", Q(temp, _T))
        result.note(DRAIN_CAUTION)
    if minutes == 0.0:
        result.add("ok", COMMON_PRACTICE,
                   "The oil is at {0}, already at or below the target of {1}: no drying needed; "
                   "keep breathers and seals tight.", Q(content, _PPM), Q(target, _PPM))
    else:
        result.add("watch", COMMON_PRACTICE,
                   "Run the unit about {0} (the tank through it {1} times) to bring the oil from "
                   "{2} to {3}; take a new reading then, because new water keeps coming in "
                   "until the ingress is stopped.",
                   Q(minutes / 60.0, "hours"), Q(flow * minutes / volume, "ratio"),
                   Q(content, _PPM), Q(target, _PPM))
    if target_ppm is not None and target_ppm > sat_cold:
        result.add("act", COMMON_PRACTICE,
                   "The target {0} is more than the oil holds dissolved at {1} ({2}): free water "
                   "would still drop out when the oil is cold; aim for {3} or less.",
                   Q(target_ppm, _PPM), Q(temp_cold, _T), Q(sat_cold, _PPM), Q(usual, _PPM))
    elif target_ppm is not None and target_ppm > usual:
        result.add("watch", COMMON_PRACTICE,
                   "The target {0} is above 50 % of saturation at {1} ({2}): little margin "
                   "before free water drops out when the oil is cold.",
                   Q(target_ppm, _PPM), Q(temp_cold, _T), Q(usual, _PPM))
    result.note("The time assumes a well-mixed tank, no new water and a constant efficiency. "
                "Vacuum and air-stripping dehydrators take dissolved water; coalescing and "
                "water-absorbing filters take mainly free water and slow down near saturation, "
                "and an absorbing element holds only so much water (compare {0} with its "
                "rated capacity).", Q(water_volume_ml(max(0.0, content - target), volume,
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

