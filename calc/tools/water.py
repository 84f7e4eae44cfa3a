"""The water-in-oil tool: a sensor's % saturation or a lab's ppm against the oil's saturation
line (calc.methods.water), now and at the coldest the oil gets.

The saturation line is one of the presets (from memory) or the user's own two-point
calibration; outside the range a line covers, its figures are extrapolations and say so.
"""

from __future__ import annotations

import math
from functools import partial

from ..kernel import chart, units
from ..kernel.errors import InputError
from ..kernel.grading import Band
from ..kernel.registry import WATER, Field, Output, tool
from ..kernel.result import COMMON_PRACTICE, FROM_MEMORY, Q, Result
from ..methods.water import (OIL_PRESETS, SaturationLine, content_ppm, fit_saturation,
                             free_water_ppm, free_water_temp_c, relative_saturation_pct,
                             water_volume_ml)

# Keep the content at most this fraction of saturation at the coldest temperature: common practice.
TARGET_FRACTION = 0.5

OWN_CALIBRATION = "own"
OIL_CHOICES = tuple((key, label) for key, label, *_ in OIL_PRESETS) + (
    (OWN_CALIBRATION, "Own calibration (two lab or data-sheet points)"),)

# An own calibration may reach this far beyond its two points before it is called an extrapolation.
CALIBRATION_REACH_K = 15.0
# Saturation rising faster than B = 4000 K is steeper than any oil (about 77 kJ/mol): from memory.
B_MAX_K = 4000.0

_T = "temperature"
_PPM = "ppm"


CALIBRATION_KEYS = ("cal_temp1", "cal_ppm1", "cal_temp2", "cal_ppm2")


def saturation_line(oil: str, cal_temp1: float | None = None, cal_ppm1: float | None = None,
                    cal_temp2: float | None = None, cal_ppm2: float | None = None) -> SaturationLine:
    """The preset's line, or the line through the user's two calibration points (checked)."""
    if oil != OWN_CALIBRATION:
        for key, _label, a, b, t_low, t_high, source in OIL_PRESETS:
            if key == oil:
                return SaturationLine(a, b, t_low, t_high, source, FROM_MEMORY)
        raise InputError("oil", "must be one of {choices}",
                         choices=Q(", ".join(c[0] for c in OIL_CHOICES), "text"))
    given = dict(zip(CALIBRATION_KEYS, (cal_temp1, cal_ppm1, cal_temp2, cal_ppm2)))
    missing = [InputError(k, "is needed for an own calibration: enter two temperatures and the "
                             "saturation content in ppm at each, from a lab or the oil's data sheet")
               for k, v in given.items() if v is None]
    if missing:
        raise InputError.combine(missing)
    if abs(cal_temp2 - cal_temp1) < 5.0:
        raise InputError("cal_temp2", "the two calibration temperatures must be at least {gap} "
                                      "apart", gap=Q(5.0, "temperature_difference"))
    warm_ppm, cold_ppm = (cal_ppm2, cal_ppm1) if cal_temp2 > cal_temp1 else (cal_ppm1, cal_ppm2)
    warm_key = "cal_ppm2" if cal_temp2 > cal_temp1 else "cal_ppm1"
    if warm_ppm <= cold_ppm:
        raise InputError(warm_key, "the saturation at the warmer temperature must be the higher "
                                   "(an oil holds more water when warm)")
    a, b = fit_saturation(cal_temp1, cal_ppm1, cal_temp2, cal_ppm2)
    if b > B_MAX_K:
        raise InputError(warm_key, "the two points make saturation rise more steeply with "
                                   "temperature than any oil does: check the readings and units")
    low, high = sorted((cal_temp1, cal_temp2))
    return SaturationLine(a, b, low - CALIBRATION_REACH_K, high + CALIBRATION_REACH_K,
                          "Own calibration through two saturation points", "own calibration")


def note_unused_calibration(result: Result, oil: str, *cal_values: float | None) -> None:
    if oil != OWN_CALIBRATION and any(v is not None for v in cal_values):
        result.note("The calibration points are used only with the oil \"Own calibration\"; "
                    "this answer uses the preset.")


def reading_to_ppm(reading: str, rh: float, ppm: float, temp: float, line: SaturationLine) -> float:
    """Water content [ppm] from whichever reading the technician has."""
    return content_ppm(rh, temp, line.a, line.b) if reading == "rh" else ppm


_OUTSIDE_LINE = ("{temp} is outside the range the saturation line covers ({low} to {high}): "
                 "the figures there are extrapolated; confirm with a Karl Fischer test "
                 "(ASTM D6304) or the oil maker's data.")
COVERED_BANDS = (Band("watch", _OUTSIDE_LINE, under="low"), Band("watch", _OUTSIDE_LINE, over="high"))


def warn_outside(result: Result, line: SaturationLine, temps: tuple[float, ...]) -> None:
    """A clear warning for each temperature the saturation line does not cover."""
    for temp_c in temps:
        result.grade(temp_c, COVERED_BANDS, line.basis, temp=Q(temp_c, _T),
                     low=Q(line.t_low, _T), high=Q(line.t_high, _T))


DRAIN_CAUTION = ("Before draining water from the tank bottom: let the oil settle and cool (hot oil "
                 "and surfaces burn), stop and lock out the machine, lower or block raised loads, "
                 "have spill absorbent and a container ready, and dispose of the water and oil "
                 "mix as used oil under local rules. Free water at the bottom is drained first, "
                 "before any drying.")


# Inputs shared by the water tools, declared once.
READING_CHOICES = (("rh", "Inline sensor: % saturation"), ("ppm", "Lab report: ppm (Karl Fischer)"))


def reading_fields() -> tuple[Field, ...]:
    return (
        Field("reading", "Reading from", "choice", "rh", choices=READING_CHOICES,
              help="A sensor in the oil reads % saturation at the oil's temperature; a lab "
                   "reports ppm by Karl Fischer (ASTM D6304)."),
        Field("rh", "Sensor reading, % saturation", "percent", 30.0, min=0.0, max=100.0,
              help="Used when the reading is from a sensor. Water activity 0.30 is 30 %.", when=("reading", "rh")),
        Field("ppm", "Lab water content", _PPM, 150.0, min=0.0, max=100000.0,
              help="Used when the reading is from a lab report, ppm by mass.", when=("reading", "ppm")),
        Field("temp", "Oil temperature at the reading", _T, 50.0, min=-40.0, max=150.0,
              tracks="oil_temp",
              help="The sensor's own temperature reading, or the tank temperature."),
        Field("temp_cold", "Coldest oil temperature", _T, 15.0, min=-40.0, max=150.0,
              binds="temp_cold_start",
              help="The coldest the oil gets: overnight, cooled to the room, or a cold start."),
    )


def oil_fields() -> tuple[Field, ...]:
    return (
        Field("oil", "Oil", "choice", "mineral-aw", choices=OIL_CHOICES, binds="oil_family",
              help="Presets are typical figures from memory; an own calibration from the "
                   "oil's data sheet or a lab is better."),
    ) + calibration_fields()


def calibration_fields() -> tuple[Field, ...]:
    """The two points of an own saturation calibration (CALIBRATION_KEYS), bound to the
    machine card's."""
    def cal(key: str, label: str, quantity: str, low: float, high: float) -> Field:
        return Field(key, label, quantity, None, min=low, max=high, optional=True, binds=key,
                     help="Only for an own calibration, from a lab or the oil's data sheet.")
    return (
        cal("cal_temp1", "Calibration point 1: temperature", _T, -40.0, 150.0),
        cal("cal_ppm1", "Calibration point 1: saturation", _PPM, 1.0, 100000.0),
        cal("cal_temp2", "Calibration point 2: temperature", _T, -40.0, 150.0),
        cal("cal_ppm2", "Calibration point 2: saturation", _PPM, 1.0, 100000.0),
    )


def tank_fields() -> tuple[Field, ...]:
    return (
        Field("oil_volume", "Oil in the tank", "volume", 200.0, min=1.0, max=1.0e6,
              binds="oil_volume"),
        Field("density", "Oil density", "density", 870.0, min=600.0, max=1500.0, binds="density",
              help="As on the data sheet; mineral hydraulic oil is typically 870 kg/m³ "
                   "(54.3 lb/ft³), esters about 920 kg/m³ (57.4 lb/ft³)."),
    )


@tool(
    "water-in-oil",
    title="Water in oil",
    summary="A sensor's % saturation or a lab's ppm, both ways: dissolved and free water now and "
            "when the oil cools, the temperature at which free water drops out, and the water "
            "in the tank.",
    topic=WATER,
    renamed={"volume": "oil_volume"},
    inputs=reading_fields() + oil_fields() + tank_fields(),
    outputs=(
        Output("ppm", "Water content", _PPM, headline=True, tracks="water_ppm"),
        Output("rh", "Saturation at oil temperature", "percent", headline=True, tracks="water_saturation"),
        Output("sat", "Oil holds dissolved at oil temperature", _PPM),
        Output("free_ppm", "Free water at oil temperature", _PPM),
        Output("t_free", "Free water drops out below", _T,
               "Blank when the oil holds this water dissolved even at very low temperatures.", headline=True),
        Output("rh_cold", "Saturation at coldest temperature", "percent"),
        Output("sat_cold", "Oil holds dissolved at coldest temperature", _PPM),
        Output("free_cold_ppm", "Free water at coldest temperature", _PPM),
        Output("water_ml", "Water in the tank", "volume_ml"),
        Output("free_ml", "Of it free, at oil temperature", "volume_ml"),
        Output("free_cold_ml", "Of it free, at coldest temperature", "volume_ml"),
        Output("line", "Saturation line used", "text"),
    ),
)
def water_in_oil(reading: str, rh: float, ppm: float, temp: float, temp_cold: float, oil: str,
                 oil_volume: float, density: float, cal_temp1: float | None = None,
                 cal_ppm1: float | None = None, cal_temp2: float | None = None,
                 cal_ppm2: float | None = None) -> Result:
    """Where the water in the oil is now and at the coldest temperature, and how much there is."""
    line = saturation_line(oil, cal_temp1, cal_ppm1, cal_temp2, cal_ppm2)
    content = reading_to_ppm(reading, rh, ppm, temp, line)
    temp_cold_entered, temp_cold = temp_cold, min(temp, temp_cold)  # never above the reading
    sat, sat_cold = line.saturation(temp), line.saturation(temp_cold)
    free = free_water_ppm(content, temp, line.a, line.b)
    free_cold = free_water_ppm(content, temp_cold, line.a, line.b)
    t_free = free_water_temp_c(content, line.a, line.b)
    shown_t_free = t_free if t_free is not None and -60.0 <= t_free <= 200.0 else None
    result = Result(values={
        "ppm": content,
        "rh": 100.0 * min(content, sat) / sat,
        "sat": sat,
        "free_ppm": free,
        "t_free": shown_t_free,
        "rh_cold": 100.0 * min(content, sat_cold) / sat_cold,
        "sat_cold": sat_cold,
        "free_cold_ppm": free_cold,
        "water_ml": water_volume_ml(content, oil_volume, density),
        "free_ml": water_volume_ml(free, oil_volume, density),
        "free_cold_ml": water_volume_ml(free_cold, oil_volume, density),
        "line": line.describe(),
    })
    if not result.grade(free, FREE_NOW_BANDS, COMMON_PRACTICE, temp=Q(temp, _T),
                        sat=Q(sat, _PPM), free=Q(free, _PPM)) and reading == "rh":
        result.grade(rh, SENSOR_BANDS, COMMON_PRACTICE)
    cold_verdict(result, content, temp_cold, sat_cold, shown_t_free)
    note_coldest(result, temp, temp_cold_entered)
    note_unused_calibration(result, oil, cal_temp1, cal_ppm1, cal_temp2, cal_ppm2)
    if free > 0.0 or free_cold > 0.0:
        result.note(DRAIN_CAUTION)
        if min(temp, temp_cold) < 0.0:
            result.note("Below {0} free water turns to ice: crystals block strainers and "
                        "filters and starve the pump at a cold start.", Q(0.0, _T))
    if t_free is not None and shown_t_free is None and t_free < -60.0:
        result.note("The oil holds this water dissolved down to below {0}.", Q(-60.0, _T))
    warn_outside(result, line, (temp, temp_cold))
    result.charts["saturation"] = partial(saturation_chart, line, content, temp, temp_cold,
                                          shown_t_free)
    result.sources += [line.source,
                       "Saturation line log10 S = A − B/T (van 't Hoff form)",
                       "ppm = (% saturation / 100) × S(T), definition of relative saturation",
                       "Target of at most 50 % of saturation at the coldest temperature: "
                       "common practice"]
    return result


def note_coldest(result: Result, temp: float, temp_cold: float) -> None:
    """Say so when the coldest temperature entered is warmer than the reading itself."""
    if temp_cold > temp:
        result.note("The coldest temperature entered ({0}) is above the oil's temperature at the "
                    "reading: the oil has been at {1}, so the cold check uses {1}.",
                    Q(temp_cold, _T), Q(temp, _T))


# Free water now: any is a finding (common practice).
FREE_NOW_BANDS = (
    Band("act", "At {temp} the oil holds only {sat} dissolved; the other {free} is free water: "
                "drain it from the tank bottom, find where the water gets in, then dry the oil.",
         over=0.0),
)
# A sensor reads relative saturation; at 100 % it cannot tell how much free water there is.
SENSOR_BANDS = (
    Band("act", "The sensor reads saturated: there may be free water it cannot count; take a "
                "sample for Karl Fischer (ASTM D6304) and check the tank bottom for water.",
         at_least=100.0),
)
# The content against saturation at the coldest temperature the oil sees (common practice).
_COLD_SETTLES = (" and settles in the tank bottom and low spots; dry the oil to below {target} and "
                 "stop the ingress.")
COLD_BANDS = (
    Band("act", "At {cold} the oil holds only {sat_cold} dissolved: free water drops out below "
                "{t_free}" + _COLD_SETTLES, over="sat_cold"),
    Band("watch", "At {cold} the oil would be at {rh_cold} of saturation, above the usual limit "
                  "of 50 %: plan to dry it to below {target} and check breathers, seals and "
                  "coolers for water ingress.", over="target"),
    Band("ok", "All the water stays dissolved down to {cold}, where the oil is at {rh_cold} of "
               "saturation: below the usual limit of 50 %."),
)
# The same when no temperature holds the water dissolved: free even far warmer.
COLD_BANDS_FREE_THROUGHOUT = (
    Band("act", "At {cold} the oil holds only {sat_cold} dissolved: there is free water even far "
                "warmer than that" + _COLD_SETTLES, over="sat_cold"),
) + COLD_BANDS[1:]


def cold_verdict(result: Result, content: float, temp_cold: float, sat_cold: float,
                 t_free: float | None) -> None:
    """ok / watch / act for the water at the coldest temperature the oil sees."""
    bands = COLD_BANDS if t_free is not None else COLD_BANDS_FREE_THROUGHOUT
    result.grade(content, bands, COMMON_PRACTICE, cold=Q(temp_cold, _T),
                 sat_cold=Q(sat_cold, _PPM), target=Q(TARGET_FRACTION * sat_cold, _PPM),
                 rh_cold=Q(100.0 * content / sat_cold, "percent"),
                 t_free=Q(temp_cold if t_free is None else t_free, _T))


CHART_W, CHART_H = 400.0, 330.0
_CHART_BOX = (56.0, 34.0, 330.0, 236.0)  # left, top, width, height of the plot, viewBox units


def saturation_chart(line: SaturationLine, content: float, temp_c: float, temp_cold_c: float,
                     t_free: float | None, system: str = "metric") -> str:
    """SVG of the saturation line (log ppm up, temperature across in `system` units, ticks
    round in the shown unit), its 50 % line and the content."""
    t_low = max(-40.0, min(temp_cold_c, t_free if t_free is not None else temp_cold_c) - 10.0)
    t_high = min(150.0, max(temp_c, t_free if t_free is not None else temp_c) + 15.0)
    s_low, s_high = line.saturation(t_low), line.saturation(t_high)
    y_low = max(0.1, min(TARGET_FRACTION * s_low, content if content > 0 else s_low) / 1.5)
    y_high = max(s_high, content) * 1.5
    ax = chart.Axes((t_low, t_high), (y_low, y_high), _CHART_BOX, y_scale=math.log10)
    temps = [t_low + (t_high - t_low) * k / 60 for k in range(61)]
    left, top, width, _ = _CHART_BOX
    label_t = t_low + 0.04 * (t_high - t_low)
    show = lambda value, quantity: units.show(value, quantity, system)  # noqa: E731
    body = [
        chart.frame(ax, chart.unit_ticks(t_low, t_high, _T, system), chart.ticks_125(y_low, y_high),
                    f"Oil temperature, {units.unit_label(_T, system)}",
                    f"Water, {units.unit_label(_PPM, system)} (log scale)", chart.short),
        chart.polyline([ax.point(t, line.saturation(t)) for t in temps], "saturation-line",
                       "#12357a", 4.0),
        chart.polyline([ax.point(t, TARGET_FRACTION * line.saturation(t)) for t in temps],
                       "target-line", "#2e6b2e", 2.0, "6 3"),
        chart.text(ax.x(label_t), ax.y(line.saturation(label_t)) - 8, "saturation",
                   "line-label", fill="#12357a", weight="bold"),
        chart.text(ax.x(label_t), ax.y(TARGET_FRACTION * line.saturation(label_t)) + 20,
                   "50 % of saturation", "line-label", fill="#1f4d1f"),
    ]
    if content > 0.0:
        label_y = ax.y(content) + 20 if ax.y(content) - 8 < top + chart.TEXT_SIZE else ax.y(content) - 8
        body += [chart.hline(ax, content, "content-line", "#8b1a1a", 2.5, "12 5"),
                 chart.text(left + width - 4, label_y, f"water {show(content, _PPM)}",
                            "point-label", anchor="end", weight="bold"),
                 chart.marker(*ax.point(temp_c, content), "reading-point"),
                 chart.marker(*ax.point(temp_cold_c, content), "cold-point", radius=5.0)]
    title = (f"Saturation against temperature: {show(content, _PPM)} of water, "
             f"{show(line.saturation(temp_c), _PPM)} held at {show(temp_c, _T)}")
    desc = ("The oil's saturation line (solid), half of it as the usual limit (short dashes), "
            "and the water content (long dashes) with rings at the reading's and the coldest "
            "temperature. Where the content line is above the solid line, free water drops out.")
    return chart.document(CHART_W, CHART_H, title, desc, body, "chart chart-saturation")
