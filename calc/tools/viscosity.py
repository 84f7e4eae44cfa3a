"""Kinematic viscosity against temperature: ASTM D341 (Walther form) and the pump's window.

ASTM D341 draws an oil's viscosity-temperature line as a straight line on
log(log(Z)) against log(T), where T is the absolute temperature and Z is the
kinematic viscosity with a small correction that matters only below about 2 cSt:

    log10(log10(Z)) = A - B * log10(T / K)
    Z = v + 0.7 + exp(-1.47 - 1.84 v - 0.51 v^2)                (simplified form)

The standard (D341-09 and later) gives the full correction

    Z = v + 0.7 + C - D + E - F + G - H
    C = exp(-1.14883 - 2.65868 v)      D = exp(-0.0038138 - 12.5645 v)
    E = exp(5.46491 - 37.6289 v)       F = exp(13.0458 - 74.6851 v)
    G = exp(37.4619 - 192.643 v)       H = exp(80.4945 - 400.468 v)

and an approximate inverse; here the inverse is solved exactly by Newton's
method, started from the standard's approximation.

Source: ASTM D341-09 (reapproved 2015), "Viscosity-Temperature Charts for Liquid
Petroleum Products", equations 1 to 4 (coefficients from memory of the standard).
"""

from __future__ import annotations

import math
from functools import partial

from ..kernel import chart, units
from ..kernel.errors import InputError
from ..methods.iso3448 import GRADE_CHOICES, grade_midpoint
from ..kernel.registry import VISCOSITY, Field, Output, tool
from ..kernel.result import COMMON_PRACTICE, Q, Result
from .vi import kv100_from_vi

KELVIN = 273.15

# D341 covers about 0.21 cSt to 1e6 cSt with the full Z correction.
KV_MIN_CST = 0.21
KV_MAX_CST = 1.0e6


def walther_z(kv_cst: float) -> float:
    """ASTM D341 corrected viscosity Z for a kinematic viscosity [cSt].

    >>> round(walther_z(46.0), 6)
    46.7
    >>> round(walther_z(1.0), 4)
    1.7222
    """
    v = kv_cst
    return (v + 0.7
            + math.exp(-1.14883 - 2.65868 * v)
            - math.exp(-0.0038138 - 12.5645 * v)
            + math.exp(5.46491 - 37.6289 * v)
            - math.exp(13.0458 - 74.6851 * v)
            + math.exp(37.4619 - 192.643 * v)
            - math.exp(80.4945 - 400.468 * v))


def _dz_dv(v: float) -> float:
    return (1.0
            - 2.65868 * math.exp(-1.14883 - 2.65868 * v)
            + 12.5645 * math.exp(-0.0038138 - 12.5645 * v)
            - 37.6289 * math.exp(5.46491 - 37.6289 * v)
            + 74.6851 * math.exp(13.0458 - 74.6851 * v)
            - 192.643 * math.exp(37.4619 - 192.643 * v)
            + 400.468 * math.exp(80.4945 - 400.468 * v))


def kv_from_z(z: float) -> float:
    """Kinematic viscosity [cSt] whose D341 Z is `z`: the exact inverse of `walther_z`.

    Starts from the standard's approximation
    v = (Z - 0.7) - exp(-0.7487 - 3.295 (Z - 0.7) + 0.6119 (Z - 0.7)^2 - 0.3193 (Z - 0.7)^3)
    and refines by Newton's method to machine precision.

    >>> round(kv_from_z(walther_z(3.3)), 12)
    3.3
    """
    zz = z - 0.7
    v = zz - math.exp(-0.7487 - 3.295 * zz + 0.6119 * zz ** 2 - 0.3193 * zz ** 3) if zz < 3 else zz
    v = max(v, KV_MIN_CST)
    for _ in range(50):
        step = (walther_z(v) - z) / _dz_dv(v)
        v -= step
        if abs(step) <= 1e-13 * max(1.0, v):
            break
    return v


def walther_fit(temp1_c: float, kv1_cst: float, temp2_c: float, kv2_cst: float) -> tuple[float, float]:
    """Constants (A, B) of the D341 line through two measured points.

    Viscosity must fall as temperature rises: the warmer point must be the thinner.

    >>> a, b = walther_fit(40.0, 46.0, 100.0, 6.8)
    >>> round(a, 4), round(b, 4)
    (9.418, 3.6844)
    """
    t1, t2 = temp1_c + KELVIN, temp2_c + KELVIN
    y1 = math.log10(math.log10(walther_z(kv1_cst)))
    y2 = math.log10(math.log10(walther_z(kv2_cst)))
    b = (y1 - y2) / (math.log10(t2) - math.log10(t1))
    a = y1 + b * math.log10(t1)
    return a, b


def walther_viscosity(temp_c: float, a: float, b: float) -> float:
    """Kinematic viscosity [cSt] at `temp_c` [degC] on the D341 line (A, B).

    >>> a, b = walther_fit(40.0, 46.0, 100.0, 6.8)
    >>> round(walther_viscosity(60.0, a, b), 2)
    20.62
    """
    return kv_from_z(10.0 ** (10.0 ** (a - b * math.log10(temp_c + KELVIN))))


def viscosity_on_line(temp_c: float, a: float, b: float) -> float | None:
    """`walther_viscosity`, or None where the line runs past what a float holds.

    >>> print(viscosity_on_line(-60.0, *walther_fit(240.0, 1000.0, 250.0, 1.0)))
    None
    """
    try:
        return walther_viscosity(temp_c, a, b)
    except OverflowError:
        return None


def walther_temperature(kv_cst: float, a: float, b: float) -> float:
    """Temperature [degC] at which the D341 line (A, B) has viscosity `kv_cst` [cSt].

    >>> a, b = walther_fit(40.0, 46.0, 100.0, 6.8)
    >>> round(walther_temperature(20.62, a, b), 1)
    60.0
    """
    log_t = (a - math.log10(math.log10(walther_z(kv_cst)))) / b
    return 10.0 ** log_t - KELVIN


def check_two_points(temp1_c: float, kv1_cst: float, temp2_c: float, kv2_cst: float,
                     fields: tuple[str, str, str, str] = ("temp1", "kv40", "temp2", "kv100")) -> None:
    """InputError unless the two readings make a D341 line: distinct, thinner when warmer."""
    f_t1, f_kv1, f_t2, f_kv2 = fields
    for key, kv in ((f_kv1, kv1_cst), (f_kv2, kv2_cst)):
        if not KV_MIN_CST <= kv <= KV_MAX_CST:
            raise InputError(key, f"must be between {KV_MIN_CST} and {KV_MAX_CST:g} cSt (ASTM D341 range)")
    if abs(temp2_c - temp1_c) < 1.0:
        raise InputError(f_t2, "the two readings must be at least 1 °C apart")
    warm_kv, cold_kv = (kv2_cst, kv1_cst) if temp2_c > temp1_c else (kv1_cst, kv2_cst)
    warm_key = f_kv2 if temp2_c > temp1_c else f_kv1
    if warm_kv >= cold_kv:
        raise InputError(warm_key, "the reading at the higher temperature must be the lower "
                                   "viscosity (an oil thins as it warms)")


# Pump viscosity windows [cSt]: (max at start-up, top of optimum band, bottom of optimum
# band, minimum). Common practice: typical of pump makers' data sheets, from memory.
# Always prefer the figures of the pump's own data sheet.
PUMP_WINDOWS = {
    "vane": (700.0, 40.0, 16.0, 10.0),
    "gear": (1000.0, 100.0, 16.0, 10.0),
    "piston": (1000.0, 36.0, 16.0, 10.0),
}
PUMP_CHOICES = (("vane", "Vane pump"), ("gear", "Gear pump"), ("piston", "Axial piston pump"))
OIL_FROM = (("readings", "Two viscosity readings"), ("grade", "ISO VG grade and VI"))

_KV = "kinematic_viscosity"
_T = "temperature"


def pump_window(pump: str, start_max: float | None = None, opt_high: float | None = None,
                opt_low: float | None = None, minimum: float | None = None) -> tuple[float, float, float, float]:
    """The pump type's window with any entered limit in its place, checked for order."""
    preset = PUMP_WINDOWS[pump]
    window = tuple(p if v is None else v for p, v in zip(preset, (start_max, opt_high, opt_low, minimum)))
    names = ("visc_start", "visc_opt_high", "visc_opt_low", "visc_min")
    for (key, upper), lower in zip(zip(names, window), window[1:]):
        if upper <= lower:
            raise InputError(key, "the pump's limits must fall in order: start-up maximum > top of "
                                  "optimum band > bottom of optimum band > minimum")
    return window


def window_verdict(result: Result, kv: float, temp_c: float,
                   window: tuple[float, float, float, float], crossings: dict) -> None:
    """ok / watch / act for the oil's viscosity `kv` at the operating temperature."""
    start_max, opt_high, opt_low, minimum = window
    at = (Q(temp_c, _T), Q(kv, _KV))
    if kv > start_max:
        result.add("act", COMMON_PRACTICE,
                   "At {0} the oil is {1}, thicker than the pump's start-up limit of {2}: do not "
                   "start under load; warm the oil above {3} first, or use a lighter grade.",
                   *at, Q(start_max, _KV), Q(crossings["t_start"], _T))
    elif kv > opt_high:
        result.add("watch", COMMON_PRACTICE,
                   "At {0} the oil is {1}, thicker than the optimum band ({2} to {3}): fine for "
                   "warm-up at low load; run at full load only above {4}.",
                   *at, Q(opt_low, _KV), Q(opt_high, _KV), Q(crossings["t_opt_cold"], _T))
    elif kv >= opt_low:
        result.add("ok", COMMON_PRACTICE,
                   "At {0} the oil is {1}, inside the pump's optimum band ({2} to {3}).",
                   *at, Q(opt_low, _KV), Q(opt_high, _KV))
    elif kv >= minimum:
        result.add("watch", COMMON_PRACTICE,
                   "At {0} the oil is {1}, thinner than the optimum band: leakage and wear rise. "
                   "Keep the oil below {2} (check the cooler) or use a heavier grade.",
                   *at, Q(crossings["t_opt_hot"], _T))
    else:
        result.add("act", COMMON_PRACTICE,
                   "At {0} the oil is {1}, below the pump's minimum of {2}: the film is too thin "
                   "and the pump will wear. Bring the oil below {3} or use a heavier grade.",
                   *at, Q(minimum, _KV), Q(crossings["t_min"], _T))


def oil_from_grade(grade: str, vi: float) -> tuple[float, float]:
    """(KV40, KV100) [cSt] of an oil of ISO VG `grade` (its mid-point) and viscosity index `vi`.

    KV100 by the ASTM D2270 inverse (calc.vi.kv100_from_vi).

    >>> [round(v, 2) for v in oil_from_grade("VG 46", 100.0)]
    [46.0, 6.76]
    """
    kv40 = grade_midpoint(grade)
    try:
        return kv40, kv100_from_vi(kv40, vi)
    except InputError as err:
        raise InputError("vi", f"{grade} with VI {vi:g}: {err.message}") from None


CHART_W, CHART_H = 400.0, 330.0
_CHART_BOX = (52.0, 34.0, 334.0, 236.0)  # left, top, width, height of the plot, viewBox units
_T_LOW, _T_HIGH = -60.0, 250.0  # the tool's own temperature range


def _d341_y(kv_cst: float) -> float:
    return chart.log_log(walther_z(kv_cst))


def _d341_x(temp_c: float) -> float:
    return math.log10(temp_c + KELVIN)


def d341_chart(a: float, b: float, window: tuple[float, float, float, float],
               temp_c: float, kv_cst: float, system: str = "metric") -> str:
    """SVG of the oil's D341 line, the pump's window and the operating point.

    Axes as on an ASTM D341 chart: log log Z up, log absolute temperature across,
    labelled in `system` units (°C or °F; cSt in both). Ticks are round in the shown
    unit and sit at their true place on the log absolute temperature axis.
    """
    start_max, opt_high, opt_low, minimum = window
    kv_low = max(0.3, min(minimum, kv_cst) / 1.6)
    kv_high = max(start_max, kv_cst) * 2.0
    edge_cold = walther_temperature(kv_high, a, b)
    edge_hot = walther_temperature(kv_low, a, b)
    t_low = max(_T_LOW, min(edge_cold, temp_c - 5.0))
    t_high = min(_T_HIGH, max(edge_hot, temp_c + 5.0))
    ax = chart.Axes((t_low, t_high), (kv_low, kv_high), _CHART_BOX, _d341_x, _d341_y)
    left, top, width, _ = _CHART_BOX
    show = lambda value, quantity: units.show(value, quantity, system)  # noqa: E731
    cst = units.unit_label(_KV, system)

    line_from, line_to = max(t_low, edge_cold), min(t_high, edge_hot)
    line = [ax.point(t, walther_viscosity(t, a, b))
            for t in (line_from + (line_to - line_from) * k / 80 for k in range(81))]
    px, py = ax.point(temp_c, kv_cst)
    label_anchor = "end" if px > left + width * 0.5 else "start"  # room for "-40.0 °F: 1230 cSt"
    label_dx = -12 if label_anchor == "end" else 12
    label_y = py - 10 if py - 10 > top + chart.TEXT_SIZE else py + 24  # stay inside the plot
    body = [
        chart.hband(ax, opt_low, opt_high, "band-optimum", "#d4e8d4"),
        chart.frame(ax, chart.unit_ticks(t_low, t_high, _T, system),
                    chart.ticks_125(kv_low, kv_high),
                    f"Oil temperature, {units.unit_label(_T, system)}",
                    f"Viscosity, {cst} (ASTM D341 scale)", chart.short),
        chart.hline(ax, opt_high, "band-edge", "#2e6b2e", 1.5, "6 3"),
        chart.hline(ax, opt_low, "band-edge", "#2e6b2e", 1.5, "6 3"),
        chart.hline(ax, start_max, "limit limit-start", "#8b1a1a", 2.5, "12 5"),
        chart.hline(ax, minimum, "limit limit-min", "#8b1a1a", 2.5, "3 4"),
        chart.text(left + width - 4, ax.y(start_max) - 5, f"start-up max {start_max:g} {cst}",
                   "limit-label", anchor="end"),
        chart.text(left + width - 4, ax.y(minimum) + 17, f"minimum {minimum:g} {cst}",
                   "limit-label", anchor="end"),
        chart.text(left + 6, (ax.y(opt_high) + ax.y(opt_low)) / 2 + 5, "optimum band",
                   "band-label", weight="bold", fill="#1f4d1f"),
        chart.polyline(line, "oil-line", "#12357a", 4.0),
        chart.marker(px, py, "operating-point"),
        chart.text(px + label_dx, label_y, f"{show(temp_c, _T)}: {show(kv_cst, _KV)}",
                   "point-label",
                   anchor=label_anchor, weight="bold"),
    ]
    title = (f"Viscosity against temperature: {show(kv_cst, _KV)} at {show(temp_c, _T)}, "
             f"pump window {start_max:g} / {opt_high:g} to {opt_low:g} / {minimum:g} {cst}")
    desc = ("The oil's line on ASTM D341 axes with the pump's optimum band shaded, the start-up "
            "maximum as a long-dashed line, the minimum as a short-dashed line, and the "
            "operating point marked with a ring.")
    return chart.document(CHART_W, CHART_H, title, desc, body, "chart chart-d341")


def _kv_field(key: str, label: str, default: float, help_text: str) -> Field:
    return Field(key, label, _KV, default, min=KV_MIN_CST, max=KV_MAX_CST, help=help_text)


def pump_limit_field(key: str, label: str) -> Field:
    """An optional pump limit [cSt]: blank takes the pump type's preset."""
    return Field(key, label, _KV, None, min=1.0, max=1.0e5, optional=True,
                 help="Leave blank to use the pump type's typical figure; enter the pump "
                      "maker's figure when you have it.")


# The pump type and its four limits, as every tool that checks an oil against a pump asks them.
PUMP_FIELDS = (
    Field("pump", "Pump type", "choice", "vane", choices=PUMP_CHOICES),
    pump_limit_field("visc_start", "Max viscosity at start-up"),
    pump_limit_field("visc_opt_high", "Optimum band, top"),
    pump_limit_field("visc_opt_low", "Optimum band, bottom"),
    pump_limit_field("visc_min", "Minimum viscosity"),
)


def window_text(window: tuple[float, float, float, float]) -> str:
    """The window as shown: start-up maximum / optimum band / minimum, in cSt.

    >>> window_text(PUMP_WINDOWS["vane"])
    '700 / 40–16 / 10 cSt'
    """
    start_max, opt_high, opt_low, minimum = window
    return f"{start_max:g} / {opt_high:g}–{opt_low:g} / {minimum:g} cSt"


def note_preset_limits(result: Result, *limits: float | None) -> None:
    """Say that blank pump limits are typical figures, when any was left blank."""
    if any(v is None for v in limits):
        result.note("Blank pump limits use typical figures for the pump type; the pump maker's "
                    "data sheet always takes precedence.")


@tool(
    "viscosity-at-temperature",
    title="Viscosity at temperature",
    summary="The oil's viscosity at the working temperature from two lab readings, and the "
            "temperatures at which it leaves the pump's window.",
    topic=VISCOSITY,
    inputs=(
        Field("oil_from", "Oil given by", "choice", "readings", choices=OIL_FROM),
        _kv_field("kv40", "Viscosity, reading 1", 46.0, "Usually the KV at 40 °C from the "
                  "data sheet or lab report."),
        Field("temp1", "Temperature of reading 1", _T, 40.0, min=-60.0, max=250.0),
        _kv_field("kv100", "Viscosity, reading 2", 6.8, "Usually the KV at 100 °C."),
        Field("temp2", "Temperature of reading 2", _T, 100.0, min=-60.0, max=250.0),
        Field("grade", "ISO VG grade", "choice", "VG 46", choices=GRADE_CHOICES,
              help="Used when the oil is given by grade and VI: its KV at 40 °C is the "
                   "grade's mid-point."),
        Field("vi", "Viscosity index", "vi", 100.0, min=-100.0, max=400.0,
              help="Used with the grade; from the oil's data sheet."),
        Field("temp", "Oil temperature now", _T, 50.0, min=-60.0, max=250.0,
              help="Measured in the tank or at the pump inlet."),
        *PUMP_FIELDS,
    ),
    outputs=(
        Output("kv", "Viscosity at oil temperature", _KV, headline=True),
        Output("t_start", "Coldest start-up temperature", _T,
               "Below this the oil is thicker than the pump's start-up limit."),
        Output("t_opt_cold", "Optimum band begins at", _T),
        Output("t_opt_hot", "Optimum band ends at", _T),
        Output("t_min", "Hottest safe temperature", _T,
               "Above this the oil is thinner than the pump's minimum."),
        Output("window", "Pump window used", "text"),
        Output("kv40_used", "KV at 40 °C of the oil's line", _KV),
        Output("kv100_used", "KV at 100 °C of the oil's line", _KV),
    ),
)
def viscosity_at_temperature(kv40: float, temp1: float, kv100: float, temp2: float, temp: float,
                             pump: str, visc_start: float | None = None,
                             visc_opt_high: float | None = None, visc_opt_low: float | None = None,
                             visc_min: float | None = None, oil_from: str = "readings",
                             grade: str = "VG 46", vi: float = 100.0) -> Result:
    """Viscosity at `temp` on the D341 line of the oil, against the pump's window.

    The oil is two readings (KV at temp1 and temp2) or an ISO VG grade and VI.
    """
    if oil_from == "grade":
        (kv40, kv100), temp1, temp2 = oil_from_grade(grade, vi), 40.0, 100.0
    check_two_points(temp1, kv40, temp2, kv100)
    window = pump_window(pump, visc_start, visc_opt_high, visc_opt_low, visc_min)
    a, b = walther_fit(temp1, kv40, temp2, kv100)
    kv = viscosity_on_line(temp, a, b)
    if kv is None:
        raise InputError("temp", "at this temperature the oil's line runs off any scale: take "
                                 "readings nearer the oil temperature")
    start_max, opt_high, opt_low, minimum = window
    crossings = {
        "t_start": walther_temperature(start_max, a, b),
        "t_opt_cold": walther_temperature(opt_high, a, b),
        "t_opt_hot": walther_temperature(opt_low, a, b),
        "t_min": walther_temperature(minimum, a, b),
    }
    result = Result(values={"kv": kv, **crossings,
                            "window": window_text(window),
                            "kv40_used": viscosity_on_line(40.0, a, b),
                            "kv100_used": viscosity_on_line(100.0, a, b)})
    window_verdict(result, kv, temp, window, crossings)
    if not (min(temp1, temp2) - 30.0 <= temp <= max(temp1, temp2) + 30.0):
        result.note("{0} is far outside the two readings ({1} and {2}): the D341 line is an "
                    "extrapolation there; confirm with a reading nearer that temperature.",
                    Q(temp, _T), Q(temp1, _T), Q(temp2, _T))
    note_preset_limits(result, visc_start, visc_opt_high, visc_opt_low, visc_min)
    if kv > KV_MAX_CST:
        result.note("Above {0} the viscosity is beyond the ASTM D341 chart: the figure shows "
                    "only that the oil is far too thick to pump.", Q(KV_MAX_CST, _KV))
    if oil_from == "grade":
        result.note(f"The oil is taken at the mid-point of {grade}, {{0}} at {{1}}; a real "
                    f"batch may be up to 10 % either side. Its KV100 of {{2}} follows from VI "
                    f"{vi:g} (ASTM D2270).", Q(kv40, _KV), Q(40.0, _T), Q(kv100, _KV))
        result.sources.append("ISO 3448 (grade mid-point); ASTM D2270 (KV100 from VI)")
    result.charts["viscosity"] = partial(d341_chart, a, b, window, temp, kv)
    result.sources += ["ASTM D341 (Walther form with Z correction)",
                       "Pump window: common practice, typical of makers' data sheets"]
    return result
