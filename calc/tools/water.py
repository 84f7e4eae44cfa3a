"""Water in oil: saturation against temperature, % saturation <-> ppm, free water, water in the tank.

An oil holds water dissolved up to its saturation content S, which rises with
temperature; water beyond S is free water (haze, emulsion, a layer at the
bottom). Over the range a machine sees, log10 S falls on a straight line in 1/T
(the van 't Hoff form of a solubility):

    log10(S / ppm) = A - B / T            T = temp_c + 273.15  [K]

Inline sensors report the relative saturation (water activity x 100) at the
oil's own temperature; with the linear isotherm those sensors assume,

    ppm = (rh / 100) * S(T)               (definition of relative saturation)

A lab reports the content in ppm by mass by Karl Fischer titration (ASTM D6304).
Free water drops out when the oil cools below T_free, where S(T_free) equals the
content:  T_free = B / (A - log10(ppm)).

Sources: log-linear solubility in 1/T (van 't Hoff); hydraulic-oil preset
constants from memory; insulating-oil constants are Oommen's equation for new
mineral transformer oil (from memory, checked in the tests against a published
table).
"""

from __future__ import annotations

import math
from functools import partial

from ..kernel import chart, units
from ..kernel.errors import InputError
from ..kernel.registry import WATER, Field, Output, tool
from ..kernel.result import COMMON_PRACTICE, FROM_MEMORY, Q, Result

KELVIN = 273.15

# Water at 20 degC, 998.2 kg/m3: IAPWS-95 (checked in the tests against chemicals.iapws95).
WATER_DENSITY_KG_M3 = 998.2

# Keep the content at most this fraction of saturation at the coldest temperature: common practice.
TARGET_FRACTION = 0.5

# Oil presets: (key, label, A, B [K], covered from [degC], covered to [degC], source).
# The hydraulic presets are FROM MEMORY, chosen to give typical figures: plain mineral
# 100 ppm at 20 degC and 400 ppm at 65 degC; mineral with additives 200 ppm at 20 degC and
# 600 ppm at 65 degC; synthetic ester 1500 ppm at 20 degC and 3500 ppm at 65 degC.
# Insulating oil: Oommen's equation for new mineral transformer oil, log10 S = 7.0895 - 1567/T
# (constants from memory; reproduces a published saturation table, see the tests).
OIL_PRESETS = (
    ("mineral-aw", "Mineral hydraulic oil with additives (HM / HLP)", 5.8863, 1051.0, 0.0, 100.0,
     "Mineral hydraulic oil with additives: constants from memory (about 200 ppm at 20 °C, "
     "600 ppm at 65 °C)"),
    ("mineral-plain", "Mineral oil without additives (HH / HL, turbine R&O)", 6.5241, 1326.0,
     0.0, 100.0,
     "Mineral oil without additives: constants from memory (about 100 ppm at 20 °C, "
     "400 ppm at 65 °C)"),
    ("ester", "Synthetic ester (HEES)", 5.9412, 811.0, 0.0, 100.0,
     "Synthetic ester: constants from memory (about 1500 ppm at 20 °C, 3500 ppm at 65 °C)"),
    ("insulating", "Mineral insulating oil (transformer oil, new)", 7.0895, 1567.0, 0.0, 100.0,
     "Mineral insulating oil: Oommen's equation log10 S = 7.0895 − 1567/T (constants from memory)"),
)
OWN_CALIBRATION = "own"
OIL_CHOICES = tuple((key, label) for key, label, *_ in OIL_PRESETS) + (
    (OWN_CALIBRATION, "Own calibration (two lab or data-sheet points)"),)

# An own calibration may reach this far beyond its two points before it is called an extrapolation.
CALIBRATION_REACH_K = 15.0
# Saturation rising faster than B = 4000 K is steeper than any oil (about 77 kJ/mol): from memory.
B_MAX_K = 4000.0

_T = "temperature"
_PPM = "ppm"


def saturation_ppm(temp_c: float, a: float, b: float) -> float:
    """Water content at saturation [ppm by mass], log10(S) = a - b / T.

    Parameters
    ----------
    temp_c : oil temperature [degC]
    a, b : oil constants [-], [K]; presets in OIL_PRESETS, or fitted by `fit_saturation`

    >>> round(saturation_ppm(40.0, 7.0895, 1567.0))
    122

    Source: log-linear solubility in 1/T (van 't Hoff form); Oommen's constants from memory.
    """
    return 10.0 ** (a - b / (temp_c + KELVIN))


def fit_saturation(temp1_c: float, sat1_ppm: float, temp2_c: float,
                   sat2_ppm: float) -> tuple[float, float]:
    """Constants (A, B [K]) of the saturation line through two (temperature, saturation) points.

    B = (log10 S2 - log10 S1) / (1/T1 - 1/T2),  A = log10 S1 + B / T1

    >>> a, b = fit_saturation(20.0, 200.0, 65.0, 600.0)
    >>> round(a, 4), round(b)
    (5.8863, 1051)
    """
    t1, t2 = temp1_c + KELVIN, temp2_c + KELVIN
    b = (math.log10(sat2_ppm) - math.log10(sat1_ppm)) / (1.0 / t1 - 1.0 / t2)
    return math.log10(sat1_ppm) + b / t1, b


def relative_saturation_pct(ppm: float, temp_c: float, a: float, b: float) -> float:
    """Relative saturation [%] of a content `ppm` [ppm] at `temp_c` [degC]; above 100 % is free water.

    rh = 100 * ppm / S(T)

    >>> round(relative_saturation_pct(61.0, 40.0, 7.0895, 1567.0), 1)
    50.1
    """
    return 100.0 * ppm / saturation_ppm(temp_c, a, b)


def content_ppm(rh_pct: float, temp_c: float, a: float, b: float) -> float:
    """Water content [ppm] of a sensor reading `rh_pct` [%] taken at `temp_c` [degC].

    ppm = (rh / 100) * S(T)

    >>> round(content_ppm(50.0, 40.0, 7.0895, 1567.0), 1)
    60.9
    """
    return rh_pct / 100.0 * saturation_ppm(temp_c, a, b)


def free_water_temp_c(ppm: float, a: float, b: float) -> float | None:
    """Temperature [degC] below which a content `ppm` [ppm] no longer stays dissolved.

    T_free = B / (A - log10 ppm) - 273.15, where S(T_free) = ppm. None when the oil is dry
    (0 ppm) or when the line never holds that much (ppm >= 10**A).

    >>> round(free_water_temp_c(121.8, 7.0895, 1567.0), 1)
    40.0
    """
    if ppm <= 0.0:
        return None
    margin = a - math.log10(ppm)
    if margin <= 0.0:
        return None
    return b / margin - KELVIN


def free_water_ppm(ppm: float, temp_c: float, a: float, b: float) -> float:
    """Free (undissolved) water [ppm] at `temp_c` [degC]: the content above saturation, or 0.

    >>> round(free_water_ppm(300.0, 40.0, 7.0895, 1567.0))
    178
    """
    return max(0.0, ppm - saturation_ppm(temp_c, a, b))


def water_volume_ml(ppm: float, oil_volume_l: float, oil_density_kg_m3: float = 870.0) -> float:
    """Volume of water [mL] in `oil_volume_l` [L] of oil of density [kg/m3] at `ppm` [ppm by mass].

    mL = ppm * 1e-6 * V * rho_oil / rho_water, water at 998.2 kg/m3 (20 degC)

    >>> round(water_volume_ml(500.0, 200.0, 870.0), 1)
    87.2
    """
    return ppm * 1.0e-6 * oil_volume_l * oil_density_kg_m3 / WATER_DENSITY_KG_M3 * 1000.0


class SaturationLine:
    """An oil's saturation line with the temperature range it is trusted over, and its source."""

    def __init__(self, a: float, b: float, t_low: float, t_high: float, source: str, basis: str):
        self.a, self.b = a, b
        self.t_low, self.t_high = t_low, t_high
        self.source, self.basis = source, basis

    def saturation(self, temp_c: float) -> float:
        return saturation_ppm(temp_c, self.a, self.b)

    def covers(self, temp_c: float) -> bool:
        return self.t_low <= temp_c <= self.t_high

    def describe(self) -> str:
        return f"log10 S = {self.a:.4f} − {self.b:.0f}/T"


CALIBRATION_KEYS = ("cal_temp1", "cal_ppm1", "cal_temp2", "cal_ppm2")


def saturation_line(oil: str, cal_temp1: float | None = None, cal_ppm1: float | None = None,
                    cal_temp2: float | None = None, cal_ppm2: float | None = None) -> SaturationLine:
    """The preset's line, or the line through the user's two calibration points (checked)."""
    if oil != OWN_CALIBRATION:
        for key, _label, a, b, t_low, t_high, source in OIL_PRESETS:
            if key == oil:
                return SaturationLine(a, b, t_low, t_high, source, FROM_MEMORY)
        raise InputError("oil", f"must be one of {', '.join(c[0] for c in OIL_CHOICES)}")
    given = dict(zip(CALIBRATION_KEYS, (cal_temp1, cal_ppm1, cal_temp2, cal_ppm2)))
    missing = [InputError(k, "is needed for an own calibration: enter two temperatures and the "
                             "saturation content in ppm at each, from a lab or the oil's data sheet")
               for k, v in given.items() if v is None]
    if missing:
        raise InputError.combine(missing)
    if abs(cal_temp2 - cal_temp1) < 5.0:
        raise InputError("cal_temp2", "the two calibration temperatures must be at least "
                                      "5 °C (9 °F) apart")
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


def warn_outside(result: Result, line: SaturationLine, temps: tuple[float, ...]) -> None:
    """A clear warning for each temperature the saturation line does not cover."""
    for temp_c in temps:
        if not line.covers(temp_c):
            result.add("watch", line.basis,
                       "{0} is outside the range the saturation line covers ({1} to {2}): the "
                       "figures there are extrapolated; confirm with a Karl Fischer test "
                       "(ASTM D6304) or the oil maker's data.",
                       Q(temp_c, _T), Q(line.t_low, _T), Q(line.t_high, _T))


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
              help="Used when the reading is from a sensor. Water activity 0.30 is 30 %."),
        Field("ppm", "Lab water content", _PPM, 150.0, min=0.0, max=100000.0,
              help="Used when the reading is from a lab report, ppm by mass."),
        Field("temp", "Oil temperature at the reading", _T, 50.0, min=-40.0, max=150.0,
              help="The sensor's own temperature reading, or the tank temperature."),
        Field("temp_cold", "Coldest oil temperature", _T, 15.0, min=-40.0, max=150.0,
              help="The coldest the oil gets: overnight, cooled to the room, or a cold start."),
    )


def oil_fields() -> tuple[Field, ...]:
    def cal(key: str, label: str, quantity: str, low: float, high: float) -> Field:
        return Field(key, label, quantity, None, min=low, max=high, optional=True,
                     help="Only for an own calibration, from a lab or the oil's data sheet.")
    return (
        Field("oil", "Oil", "choice", "mineral-aw", choices=OIL_CHOICES,
              help="Presets are typical figures from memory; an own calibration from the "
                   "oil's data sheet or a lab is better."),
        cal("cal_temp1", "Calibration point 1: temperature", _T, -40.0, 150.0),
        cal("cal_ppm1", "Calibration point 1: saturation", _PPM, 1.0, 100000.0),
        cal("cal_temp2", "Calibration point 2: temperature", _T, -40.0, 150.0),
        cal("cal_ppm2", "Calibration point 2: saturation", _PPM, 1.0, 100000.0),
    )


def tank_fields() -> tuple[Field, ...]:
    return (
        Field("volume", "Oil in the tank", "volume", 200.0, min=1.0, max=1.0e6),
        Field("density", "Oil density", "density", 870.0, min=600.0, max=1500.0,
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
                 volume: float, density: float, cal_temp1: float | None = None,
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
        "water_ml": water_volume_ml(content, volume, density),
        "free_ml": water_volume_ml(free, volume, density),
        "free_cold_ml": water_volume_ml(free_cold, volume, density),
        "line": line.describe(),
    })
    if free > 0.0:
        result.add("act", COMMON_PRACTICE,
                   "At {0} the oil holds only {1} dissolved; the other {2} is free water: drain "
                   "it from the tank bottom, find where the water gets in, then dry the oil.",
                   Q(temp, _T), Q(sat, _PPM), Q(free, _PPM))
    elif reading == "rh" and rh >= 100.0:
        result.add("act", COMMON_PRACTICE,
                   "The sensor reads saturated: there may be free water it cannot count; take a "
                   "sample for Karl Fischer (ASTM D6304) and check the tank bottom for water.")
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


def cold_verdict(result: Result, content: float, temp_cold: float, sat_cold: float,
                 t_free: float | None) -> None:
    """ok / watch / act for the water at the coldest temperature the oil sees."""
    target = TARGET_FRACTION * sat_cold
    if content > sat_cold:
        drops = ("free water drops out below {2}" if t_free is not None
                 else "there is free water even far warmer than that")
        result.add("act", COMMON_PRACTICE,
                   "At {0} the oil holds only {1} dissolved: " + drops + " and settles in the "
                   "tank bottom and low spots; dry the oil to below {3} and stop the ingress.",
                   Q(temp_cold, _T), Q(sat_cold, _PPM),
                   Q(temp_cold if t_free is None else t_free, _T), Q(target, _PPM))
    elif content > target:
        result.add("watch", COMMON_PRACTICE,
                   "At {0} the oil would be at {1} of saturation, above the usual limit of 50 %: "
                   "plan to dry it to below {2} and check breathers, seals and coolers for "
                   "water ingress.",
                   Q(temp_cold, _T), Q(100.0 * content / sat_cold, "percent"), Q(target, _PPM))
    else:
        result.add("ok", COMMON_PRACTICE,
                   "All the water stays dissolved down to {0}, where the oil is at {1} of "
                   "saturation: below the usual limit of 50 %.",
                   Q(temp_cold, _T), Q(100.0 * content / sat_cold, "percent"))


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
