"""ISO VG grades in the field: which grade a reading is, and which grade a machine needs.

`viscosity-grade` classifies a measured viscosity by ISO 3448 (calc.iso3448),
tracing a reading taken at another temperature back to 40 °C along the oil's
ASTM D341 line, whose KV100 follows from the oil's VI by ASTM D2270; it flags a
wrong or mixed oil against the grade that should be in the tank.

`grade-selector` tries each grade at a set of VIs against the pump's viscosity
window between the coldest start and the hottest steady temperature.

Sources: ISO 3448:1992 Table 1; ASTM D2270-10; ASTM D341-09. The 10 % rule for a
wrong or mixed oil and the pump windows are common practice.
"""

from __future__ import annotations

import math

from ..kernel.errors import InputError
from ..kernel.grading import Band, as_stated
from ..methods.iso3448 import (GRADE_CHOICES, ISO_VG_GRADES, grade_containing, grade_limits,
                      grade_midpoint, nearest_grade, neighbours)
from ..kernel.registry import VISCOSITY, Field, Output, tool
from ..kernel.result import COMMON_PRACTICE, Q, Result
from ..kernel.solve import bracket
from ..methods.viscosity import grade_at_temperatures, kv40_from_reading
from ..methods.viscosity_index import KV100_MIN_CST
from .viscosity import PUMP_FIELDS, note_preset_limits, pump_window, window_text

_KV = "kinematic_viscosity"
_T = "temperature"
_PCT = "percent"

# Common practice: a KV40 more than 10 % off the mid-point of the grade that should be in the
# tank is a finding (the ISO 3448 band is +-10 %).
WRONG_OIL_PERCENT = 10.0
_CHECK_FIRST = (" Check the top-up records, take a fresh sample from the same point, and send it "
                "to the lab before draining or changing anything.")
# Graded on the KV40 rounded as the grade's limits are written (ISO 3448, ASTM E29).
WRONG_OIL_BANDS = (
    Band("act", "At {kv40} the oil is {off} above the mid-point of {grade}: a heavier oil may "
                "have been topped up, or the oil has thickened (oxidation, water, sludge)."
                + _CHECK_FIRST, over="high"),
    Band("act", "At {kv40} the oil is {off} below the mid-point of {grade}: a lighter oil may "
                "have been topped up, or the oil has thinned (solvent or fuel dilution, shear of "
                "the VI improver)." + _CHECK_FIRST, under="low"),
    Band("ok", "At {kv40} the oil is within 10 % of the mid-point of {grade} ({low} to {high}): "
               "consistent with the right oil."),
)


EXPECTED_CHOICES = (("none", "Not known"),) + GRADE_CHOICES


@tool(
    "viscosity-grade",
    title="Viscosity grade check",
    summary="The ISO VG grade of a measured viscosity, also from a reading at another "
            "temperature, and whether it is the oil that should be in the tank.",
    topic=VISCOSITY,
    renamed={"temp": "kv_temp"},
    inputs=(
        Field("kv", "Measured viscosity", _KV, 48.0, min=0.5, max=1.0e5,
              help="Kinematic viscosity from the lab report or a field viscometer."),
        Field("kv_temp", "Temperature of the reading", _T, 40.0, min=-30.0, max=150.0,
              help="40 °C for a standard KV40. Any other temperature is traced back to 40 °C."),
        Field("vi", "Viscosity index of the oil", "vi", 100.0, min=-100.0, max=400.0, binds="vi",
              optional=True,
              help="From the data sheet or the machine card. Needed only when the reading is "
                   "not at 40 °C; at 40 °C it gives the KV100 shown beside the grade."),
        Field("grade", "Grade that should be in the tank", "choice", "VG 46",
              choices=EXPECTED_CHOICES, binds="grade"),
    ),
    outputs=(
        Output("kv40", "Viscosity at 40 °C", _KV, headline=True, tracks="kv40"),
        Output("kv100", "Viscosity at 100 °C (from the VI)", _KV),
        Output("nearest", "Nearest ISO grade", "text"),
        Output("off_nearest", "Off that grade's mid-point", _PCT),
        Output("band", "ISO 3448 band", "text", "The grade whose ±10 % band holds the "
                                                 "reading, or the two grades it falls between.", headline=True),
        Output("off_expected", "Off the expected grade's mid-point", _PCT),
    ),
)
def viscosity_grade(kv: float, kv_temp: float, vi: float | None, grade: str) -> Result:
    """ISO 3448 grade of a reading, and the wrong-oil check against the expected grade."""
    temp = kv_temp
    if vi is None and temp != 40.0:
        raise InputError("vi", "is needed to trace a reading at {temp} back to {forty}: type "
                               "the oil's VI from its data sheet, or read the viscosity at {forty}",
                         temp=Q(temp, _T), forty=Q(40.0, _T))
    kv40, kv100 = (kv, None) if vi is None else kv40_from_reading(kv, temp, vi)
    name, off = nearest_grade(kv40)
    inside = grade_containing(kv40)
    if inside:
        band = f"inside {inside}"
    else:
        lower, upper = neighbours(kv40)
        band = (f"between {lower} and {upper}" if lower and upper
                else f"outside ISO 3448 ({'below VG 2' if upper else 'above VG 3200'})")
    off_expected = None if grade == "none" else 100.0 * (kv40 / grade_midpoint(grade) - 1.0)
    result = Result(values={"kv40": kv40, "kv100": kv100, "nearest": name, "off_nearest": off,
                            "band": band, "off_expected": off_expected})
    if off_expected is not None:
        low, high = grade_limits(grade)
        result.grade(as_stated(kv40, low), WRONG_OIL_BANDS, COMMON_PRACTICE, kv40=Q(kv40, _KV),
                     off=Q(abs(off_expected), _PCT), grade=Q(grade, "text"),
                     low=Q(low, _KV), high=Q(high, _KV))
    if kv100 is None and vi is not None:
        result.note("D2270 gives no KV100 for an oil this thin at VI {vi} (it would be below {two} "
                    "at {hundred}); a reading at {forty} needs none to be graded.",
                    vi=Q(vi, "vi"), two=Q(2.0, _KV), hundred=Q(100.0, _T), forty=Q(40.0, _T))
    if not inside:
        result.note("The reading is in none of the ISO 3448 bands: a mix of two grades, an oil "
                    "that has thickened or thinned in service, or an oil not sold by ISO grade.")
    if temp != 40.0:
        result.note("The reading at {temp} was traced back to {forty} assuming VI {vi}; a wrong VI "
                    "shifts the answer more the farther the reading is from {forty}. A lab KV40 "
                    "settles it.", temp=Q(temp, _T), forty=Q(40.0, _T), vi=Q(vi, "vi"))
    result.note("Take samples at normal running temperature from a sample valve, with gloves and "
                "eye protection: hot oil burns and oil under pressure can pierce skin. Keep used "
                "oil and sample bottles for proper disposal.")
    result.sources += ["ISO 3448:1992, Table 1 (grades, ±10 % limits)"]
    if temp != 40.0:
        result.sources += ["ASTM D2270-10 (KV100 from VI)", "ASTM D341-09 (line to 40 °C)"]
    result.sources.append("Wrong / mixed oil at more than 10 % off the mid-point: common practice")
    return result


# --- grade selector ----------------------------------------------------------------------

VI_SETS = {
    "common": (95.0, 100.0, 120.0, 140.0, 160.0, 200.0),
    "sweep": tuple(float(v) for v in range(90, 251, 10)),
}
VI_SET_CHOICES = (("common", "VI 95, 100, 120, 140, 160, 200"),
                  ("sweep", "VI 90 to 250 in steps of 10"))
GRADE_SETS = {
    # Common practice: hydraulic oils are sold from VG 10 to VG 150.
    "hydraulic": tuple(g[0] for g in ISO_VG_GRADES if 10.0 <= g[1] <= 150.0),
    "all": tuple(g[0] for g in ISO_VG_GRADES),
}
GRADE_SET_CHOICES = (("hydraulic", "Hydraulic grades, VG 10 to VG 150"),
                     ("all", "All ISO grades, VG 2 to VG 3200"))


def fit_status(kv_cold: float, kv_hot: float, window: tuple[float, float, float, float]) -> str:
    """"fit", or why not: "thick_cold" (above the start-up maximum when cold), "thin" (below
    the optimum band when hot), "thick_hot" (still above the optimum band when hot).

    >>> fit_status(500.0, 20.0, (700.0, 40.0, 16.0, 10.0))
    'fit'
    """
    start_max, opt_high, opt_low, _ = window
    if kv_cold > start_max:
        return "thick_cold"
    if kv_hot < opt_low:
        return "thin"
    if kv_hot > opt_high:
        return "thick_hot"
    return "fit"


def _status(grade: str, vi: float, cold_c: float, hot_c: float, window) -> tuple[str, float, float]:
    try:
        kv_cold, kv_hot = grade_at_temperatures(grade, vi, cold_c, hot_c)
    except InputError:
        return "undefined", 0.0, 0.0
    return fit_status(kv_cold, kv_hot, window), kv_cold, kv_hot


def minimum_vi(grade: str, cold_c: float, hot_c: float, window, fits_at: float,
               floor: float = 0.0) -> float:
    """The least VI (not below `floor`) at which `grade` fits, given that it fits at `fits_at`.

    Bisection between `floor` and `fits_at`, to 0.01 VI.

    >>> round(minimum_vi("VG 46", 0.0, 60.0, (700.0, 40.0, 16.0, 10.0), 95.0), 1)
    75.6
    """
    def fits(vi: float) -> bool:
        return _status(grade, vi, cold_c, hot_c, window)[0] == "fit"
    if fits(floor):
        return floor
    return bracket(fits, floor, fits_at, x_tol=0.01, rel_tol=0.0)[1]  # the end that fits


# Why a grade tried does not fit, at the VI kindest to it.
WHY_NOT = {
    "thick_cold": "{grade} is too thick to start at {cold}: {kv_cold} at VI {vi}, above the "
                  "start-up maximum of {start_max}.",
    "thin": "{grade} is too thin at {hot}: {kv_hot} at VI {vi}, below the optimum band.",
    "too_thin": "{grade} is too thin at {hot}: {kv_hot} at VI {vi}, below the pump's minimum of "
                "{minimum}.",
    "thick_hot": "{grade} is heavier than needed: at {hot} still {kv_hot} at VI {vi}, above the "
                 "optimum band.",
    "undefined": "{grade} has no oil at these VIs (its KV100 would be below {least}, outside "
                 "ASTM D2270).",
}
FIT_BANDS = (  # graded on the number of grades that fit (common practice)
    Band("ok", "{best} at VI {vi} fits: {kv_cold} at the coldest start of {cold} (start-up "
               "limit {start_max}) and {kv_hot} at {hot}, inside the optimum band.",
         at_least=1.0),
    Band("act", "No grade tried keeps the oil inside the pump's window from {cold} to {hot}: "
                "heat the tank before start-up, improve cooling, or ask the pump maker for its "
                "limits."),
)


@tool(
    "grade-selector",
    title="Grade selector",
    summary="Which ISO VG grades, at which viscosity index, keep the oil inside the pump's "
            "window from the coldest start to the hottest steady running.",
    topic=VISCOSITY,
    inputs=(
        Field("temp_cold", "Coldest start-up temperature", _T, 0.0, min=-50.0, max=100.0,
              binds="temp_cold_start",
              help="Oil temperature at the coldest start: the tank on a winter morning."),
        Field("temp_hot", "Hottest steady temperature", _T, 60.0, min=-20.0, max=150.0,
              binds="temp_hottest",
              help="Oil temperature in the tank at full load on the hottest day."),
        *PUMP_FIELDS,
        Field("vi_set", "VIs to try", "choice", "common", choices=VI_SET_CHOICES),
        Field("grades", "Grades to try", "choice", "hydraulic", choices=GRADE_SET_CHOICES),
    ),
    outputs=(
        Output("best_grade", "Best grade", "text", headline=True),
        Output("best_vi", "Least VI it needs", "vi",
               "Below this VI the grade leaves the pump's window.", headline=True),
        Output("vi_pick", "Lowest VI tried that fits", "vi"),
        Output("kv_cold", "Its viscosity at the coldest start", _KV),
        Output("kv_hot", "Its viscosity at the hottest steady temperature", _KV),
        Output("fits", "Grades that fit", "text"),
        Output("window", "Pump window used", "text"),
    ),
)
def grade_selector(temp_cold: float, temp_hot: float, pump: str, vi_set: str, grades: str,
                   visc_start: float | None = None, visc_opt_high: float | None = None,
                   visc_opt_low: float | None = None, visc_min: float | None = None) -> Result:
    """Grades and VIs that keep the oil in the pump's window from `temp_cold` to `temp_hot`."""
    if temp_hot <= temp_cold:
        raise InputError("temp_hot", "the hottest steady temperature must be above the coldest "
                                     "start-up temperature")
    window = pump_window(pump, visc_start, visc_opt_high, visc_opt_low, visc_min)
    start_max, opt_high, opt_low, minimum = window
    vis = VI_SETS[vi_set]
    table = {g: [(vi, *_status(g, vi, temp_cold, temp_hot, window)) for vi in vis]
             for g in GRADE_SETS[grades]}
    fitting = {g: [row for row in rows if row[1] == "fit"] for g, rows in table.items()}
    fitting = {g: rows for g, rows in fitting.items() if rows}

    def least_vi(g: str) -> float:
        first = fitting[g][0][0]
        below = [vi for vi in vis if vi < first]
        return minimum_vi(g, temp_cold, temp_hot, window, first, below[-1] if below else 0.0)

    least = {g: least_vi(g) for g in fitting}
    fits_text = "; ".join(f"{g}: VI {', '.join(f'{r[0]:g}' for r in rows)}"
                          for g, rows in fitting.items()) or "none"
    result = Result(values={"best_grade": "none", "best_vi": None, "vi_pick": None,
                            "kv_cold": None, "kv_hot": None, "fits": fits_text,
                            "window": window_text(window)})
    named = dict(cold=Q(temp_cold, _T), hot=Q(temp_hot, _T), start_max=Q(start_max, _KV),
                 minimum=Q(minimum, _KV))
    if fitting:
        # Lowest VI needed first (high-VI oils cost more and lose VI by shear); then the grade
        # whose hot viscosity sits nearest the middle of the optimum band.
        centre = (opt_high * opt_low) ** 0.5
        best = min(fitting, key=lambda g: (round(least[g], 6),
                                           abs(math.log(fitting[g][0][3] / centre))))
        vi_pick, _, kv_cold, kv_hot = fitting[best][0]
        result.values.update(best_grade=best, best_vi=least[best], vi_pick=vi_pick,
                             kv_cold=kv_cold, kv_hot=kv_hot)
        result.grade(float(len(fitting)), FIT_BANDS, COMMON_PRACTICE, best=Q(best, "text"),
                     vi=Q(vi_pick, "vi"), kv_cold=Q(kv_cold, _KV), kv_hot=Q(kv_hot, _KV),
                     **named)
    else:
        result.grade(0.0, FIT_BANDS, COMMON_PRACTICE, **named)
    for g, rows in table.items():
        if g in fitting:
            continue
        # The highest VI is the kindest to a cold start and a hot film; unless the grade is then
        # too thick when hot, in which case the lowest VI is the kindest.
        pick = rows[-1] if rows[-1][1] != "thick_hot" else rows[0]
        reason = "too_thin" if pick[1] == "thin" and pick[3] < minimum else pick[1]
        result.note(WHY_NOT[reason], grade=Q(g, "text"), vi=Q(pick[0], "vi"),
                    kv_cold=Q(pick[2], _KV), kv_hot=Q(pick[3], _KV),
                    least=Q(KV100_MIN_CST, _KV), **named)
    result.note("Below the oil's pour point the D341 line no longer holds: check the data "
                "sheet's pour point against the coldest start. High-VI oils thickened with "
                "polymers lose some VI in service; leave a margin.")
    note_preset_limits(result, visc_start, visc_opt_high, visc_opt_low, visc_min)
    result.sources += ["ISO 3448:1992 (grade mid-points)", "ASTM D2270-10 (KV100 from VI)",
                       "ASTM D341-09 (viscosity at temperature)",
                       "Pump window and grade choice: common practice"]
    return result
