"""The oil's viscosity at any temperature against the pump's window (ASTM D341 line).

The oil is two viscosity readings, or an ISO VG grade (its mid-point KV40) and a VI
(its KV100 by the ASTM D2270 inverse). The pump's window is four limits: the most it
can take at start-up, the optimum band, and the least it needs; typical figures per pump
type are common practice, the pump maker's own always come first.
"""

from __future__ import annotations

import math
from functools import partial

from ..kernel import chart, units
from ..kernel.constants import ZERO_CELSIUS_K
from ..kernel.errors import InputError
from ..kernel.grading import Band
from ..kernel.registry import VISCOSITY, Field, Output, tool
from ..kernel.result import COMMON_PRACTICE, Q, Result
from ..methods.iso3448 import GRADE_CHOICES, grade_midpoint
from ..methods.viscosity import (KV_MAX_CST, KV_MIN_CST, check_two_points, viscosity_on_line,
                                 walther_fit, walther_temperature, walther_viscosity, walther_z)
from ..methods.viscosity_index import kv100_from_vi

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


# The oil's viscosity against the pump's window, worst first at each end (common practice).
WINDOW_BANDS = (
    Band("act", "At {temp} the oil is {kv}, thicker than the pump's start-up limit of "
                "{start_max}: do not start under load; warm the oil above {t_start} first, or "
                "use a lighter grade.", over="start_max"),
    Band("watch", "At {temp} the oil is {kv}, thicker than the optimum band ({opt_low} to "
                  "{opt_high}): fine for warm-up at low load; run at full load only above "
                  "{t_opt_cold}.", over="opt_high"),
    Band("ok", "At {temp} the oil is {kv}, inside the pump's optimum band ({opt_low} to "
               "{opt_high}).", at_least="opt_low"),
    Band("watch", "At {temp} the oil is {kv}, thinner than the optimum band: leakage and wear "
                  "rise. Keep the oil below {t_opt_hot} (check the cooler) or use a heavier "
                  "grade.", at_least="minimum"),
    Band("act", "At {temp} the oil is {kv}, below the pump's minimum of {minimum}: the film is "
                "too thin and the pump will wear. Bring the oil below {t_min} or use a heavier "
                "grade."),
)


def grade_window(result: Result, kv: float, temp_c: float,
                 window: tuple[float, float, float, float], crossings: dict) -> None:
    """ok / watch / act for the oil's viscosity `kv` at the operating temperature."""
    start_max, opt_high, opt_low, minimum = window
    result.grade(kv, WINDOW_BANDS, COMMON_PRACTICE, temp=Q(temp_c, _T), kv=Q(kv, _KV),
                 start_max=Q(start_max, _KV), opt_high=Q(opt_high, _KV),
                 opt_low=Q(opt_low, _KV), minimum=Q(minimum, _KV),
                 **{k: Q(v, _T) for k, v in crossings.items()})


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
        raise InputError("vi", "{grade} with VI {vi}: {why}", grade=Q(grade, "text"),
                         vi=Q(vi, "vi"), why=Q(err.message, "text")) from None


CHART_W, CHART_H = 400.0, 330.0
_CHART_BOX = (52.0, 34.0, 334.0, 236.0)  # left, top, width, height of the plot, viewBox units
_T_LOW, _T_HIGH = -60.0, 250.0  # the tool's own temperature range


def _d341_y(kv_cst: float) -> float:
    return chart.log_log(walther_z(kv_cst))


def _d341_x(temp_c: float) -> float:
    return math.log10(temp_c + ZERO_CELSIUS_K)


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


def _kv_field(key: str, label: str, default: float, help_text: str, binds: str,
              **declared) -> Field:
    return Field(key, label, _KV, default, min=KV_MIN_CST, max=KV_MAX_CST, help=help_text,
                 binds=binds, **declared)


def pump_limit_field(key: str, label: str) -> Field:
    """An optional pump limit [cSt]: blank takes the pump type's preset (or the card's)."""
    return Field(key, label, _KV, None, min=1.0, max=1.0e5, optional=True, binds=key,
                 help="Leave blank to use the pump type's typical figure; enter the pump "
                      "maker's figure when you have it.")


# The pump type and its four limits, as every tool that checks an oil against a pump asks them.
PUMP_FIELDS = (
    Field("pump", "Pump type", "choice", "vane", choices=PUMP_CHOICES, binds="pump_type"),
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
        _kv_field("kv40", "Viscosity, reading 1", 46.0, binds="kv40_new", help_text="Usually "
                  "the KV at 40 °C from the "
                  "data sheet or lab report.", usual=(9.0, 750.0), when=("oil_from", "readings")),
        Field("temp1", "Temperature of reading 1", _T, 40.0, min=-60.0, max=250.0, when=("oil_from", "readings")),
        _kv_field("kv100", "Viscosity, reading 2", 6.8, "Usually the KV at 100 °C.",
                  binds="kv100_new", usual=(2.0, 60.0), when=("oil_from", "readings")),
        Field("temp2", "Temperature of reading 2", _T, 100.0, min=-60.0, max=250.0, when=("oil_from", "readings")),
        Field("grade", "ISO VG grade", "choice", "VG 46", choices=GRADE_CHOICES, binds="grade",
              help="Used when the oil is given by grade and VI: its KV at 40 °C is the "
                   "grade's mid-point.", when=("oil_from", "grade")),
        Field("vi", "Viscosity index", "vi", 100.0, min=-100.0, max=400.0, binds="vi",
              help="Used with the grade; from the oil's data sheet.", when=("oil_from", "grade")),
        Field("temp", "Oil temperature now", _T, 50.0, min=-60.0, max=250.0, tracks="oil_temp",
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
    related={"suction-check": "Its cold-start temperature adds the suction line's losses and "
             "the pump's minimum inlet pressure to the viscosity limit used here, so it is "
             "usually warmer: the warmer of the two governs a cold start."},
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
    grade_window(result, kv, temp, window, crossings)
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
