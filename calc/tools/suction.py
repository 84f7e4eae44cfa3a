"""The suction-check tool: the pump's inlet pressure warm and at a cold start
(calc.methods.suction) against its minimum, and where the pump starts to starve.

Assumptions, each said in the result: fitting K factors are turbulent-flow values held
constant (in cold laminar flow real fitting losses are higher); density does not change
with temperature; a strainer's drop is entered clean at the operating temperature and
either rises in proportion to viscosity or is held constant. The minimum inlet pressure
default and the margins are common practice.
"""

from __future__ import annotations

from ..kernel.constants import ATMOSPHERE_ROUNDED_BAR
from ..kernel.errors import InputError
from ..kernel.grading import Band
from ..kernel.registry import TANK, Field, Output, tool
from ..kernel.result import COMMON_PRACTICE, Q, Result
from ..methods.lines import flow_regime, line_velocity, reynolds_number
from ..methods.suction import (SCAN_LOW_C, inlet_pressure_bar, starving_temperature,
                               strainer_drop_bar)
from ..methods.viscosity import check_two_points, walther_fit, walther_viscosity

P_MIN_BAR = 0.8  # typical minimum absolute inlet pressure of industrial pumps: common practice
MARGIN_WATCH_BAR = 0.1  # a margin smaller than this is a warning: common practice

_FIXES = ("use a larger or shorter suction line with fewer bends, raise the oil level or set "
          "the pump below the tank (flooded inlet), and clean or enlarge the strainer")
# The inlet's margin over the pump's minimum when warm, and at a cold start (common practice).
WARM_BANDS = (
    Band("act", "Even warm ({temp}) the inlet is at {p}, below the pump's minimum of {p_min}: "
                "the pump starves and cavitates; " + _FIXES + ".", under=0.0),
    Band("watch", "Warm ({temp}) the inlet is at {p}, only {margin} above the pump's minimum: a "
                  "clogging strainer or a low oil level will starve the pump.",
         under=MARGIN_WATCH_BAR),
    Band("ok", "Warm ({temp}) the inlet is at {p}, {margin} above the pump's minimum."),
)
COLD_BANDS = (
    Band("act", "At a cold start ({temp}) the inlet falls to {p}, below the pump's minimum of "
                "{p_min}: the pump starves until the oil is warmer than {t_starve}. Warm the oil "
                "first (tank heater, or run unloaded at low speed), or " + _FIXES + ", or choose "
                "a lighter or higher-VI oil.", under=0.0),
    Band("watch", "At a cold start ({temp}) the inlet is at {p}, close to the pump's minimum of "
                  "{p_min}: start unloaded and let the oil warm before full flow.",
         under=MARGIN_WATCH_BAR),
    Band("ok", "At a cold start ({temp}) the inlet stays at {p}; the pump would starve only with "
               "oil colder than {t_starve}."),
)
COLD_BANDS_NEVER_STARVES = COLD_BANDS[:2] + (
    Band("ok", "At a cold start ({temp}) the inlet stays at {p}, and the pump does not starve "
               "with oil down to {coldest}."),
)

STRAINER_CHOICES = (("viscous", "Rises with viscosity (mesh, laminar)"),
                    ("constant", "Constant"))

_P = "pressure"
_T = "temperature"
_KV = "kinematic_viscosity"


@tool(
    "suction-check",
    title="Pump suction check",
    summary="Absolute pressure at the pump inlet when warm and at a cold start, against the "
            "pump's minimum, and the oil temperature below which the pump starves.",
    topic=TANK,
    inputs=(
        Field("flow", "Pump flow", "flow", 100.0, min=0.1, max=5000.0),
        Field("bore", "Suction line bore", "length", 50.0, min=5.0, max=600.0,
              help="Inside diameter of the narrowest part of the suction line."),
        Field("length", "Suction line length", "length_m", 1.5, min=0.0, max=100.0),
        Field("roughness", "Wall roughness", "length", 0.045, min=0.0, max=5.0,
              help="About 0.045 mm for commercial steel pipe, 0.0015 mm for drawn tube "
                   "(from memory of the Moody chart's table)."),
        Field("head", "Oil level above pump inlet", "length_m", 0.3, min=-10.0, max=30.0,
              help="Lowest working oil level minus inlet height; negative when the pump sits "
                   "above the oil and has to lift it."),
        Field("k_sum", "Fittings, sum of K factors", "ratio", 1.5, min=0.0, max=100.0,
              help="Add the loss factors of the tank outlet, elbows, tees and valves: e.g. a "
                   "sharp pipe entry about 0.5, a 90° elbow about 0.3 to 1 (from memory)."),
        Field("strainer", "Strainer drop, clean, warm", _P, 0.05, min=0.0, max=2.0,
              help="The strainer's pressure drop at this flow at the operating temperature; "
                   "0 if there is none."),
        Field("strainer_model", "Strainer drop when cold", "choice", "viscous",
              choices=STRAINER_CHOICES),
        Field("strainer_bypass", "Strainer bypass opens at", _P, None, min=0.01, max=2.0,
              optional=True, help="Leave blank if the strainer has no bypass valve."),
        Field("kv40", "Oil viscosity at 40 °C", _KV, 46.0, min=0.5, max=1.0e5),
        Field("kv100", "Oil viscosity at 100 °C", _KV, 6.8, min=0.5, max=1.0e4),
        Field("density", "Oil density", "density", 870.0, min=600.0, max=1300.0,
              help="About 850 to 890 kg/m³ for mineral hydraulic oil (from memory)."),
        Field("temp", "Operating oil temperature", _T, 50.0, min=-40.0, max=150.0),
        Field("temp_cold", "Cold start oil temperature", _T, 0.0, min=-40.0, max=150.0),
        Field("atmosphere", "Atmospheric pressure (absolute)", _P, ATMOSPHERE_ROUNDED_BAR, min=0.5, max=1.1,
              help="1.013 bar at sea level; about 0.9 bar at 1000 m."),
        Field("p_min", "Pump minimum inlet pressure (absolute)", _P, P_MIN_BAR, min=0.1, max=5.0,
              help="From the pump's data sheet; 0.8 bar absolute is typical (common practice)."),
    ),
    outputs=(
        Output("velocity", "Velocity in the suction line", "velocity"),
        Output("kv", "Viscosity at operating temperature", _KV),
        Output("re", "Reynolds number, warm", "ratio"),
        Output("regime", "Flow, warm", "text"),
        Output("p_inlet", "Inlet pressure, warm (absolute)", _P),
        Output("margin", "Margin to pump minimum, warm", _P),
        Output("kv_cold", "Viscosity at cold start", _KV),
        Output("re_cold", "Reynolds number, cold", "ratio"),
        Output("regime_cold", "Flow, cold", "text"),
        Output("p_inlet_cold", "Inlet pressure, cold start (absolute)", _P, headline=True),
        Output("margin_cold", "Margin to pump minimum, cold", _P),
        Output("strainer_cold", "Strainer drop, cold", _P),
        Output("t_starve", "Pump starves below", _T,
               "The oil temperature at which the inlet pressure falls to the pump's minimum.", headline=True),
    ),
)
def suction_check(flow: float, bore: float, length: float, roughness: float, head: float,
                  k_sum: float, strainer: float, strainer_model: str,
                  strainer_bypass: float | None, kv40: float, kv100: float, density: float,
                  temp: float, temp_cold: float, atmosphere: float, p_min: float) -> Result:
    """Inlet pressure warm and cold on the oil's D341 line, and where the pump starts to starve."""
    check_two_points(40.0, kv40, 100.0, kv100)
    if temp_cold >= temp:
        raise InputError("temp_cold", "the cold start temperature must be lower than the "
                                      "operating temperature")
    if roughness / bore > 0.05:
        raise InputError("roughness", "must be at most 5 % of the bore (the Moody chart's range)")
    a, b = walther_fit(40.0, kv40, 100.0, kv100)
    kv = walther_viscosity(temp, a, b)

    def strainer_at(kv_cst: float) -> float:
        return strainer_drop_bar(strainer, kv_cst, kv, strainer_model, strainer_bypass)

    def inlet_at(temp_c: float) -> float:
        kv_t = walther_viscosity(temp_c, a, b)
        return inlet_pressure_bar(atmosphere, head, density, flow, bore, length, roughness,
                                  k_sum, kv_t, strainer_at(kv_t))

    velocity = line_velocity(flow, bore)
    kv_cold = walther_viscosity(temp_cold, a, b)
    re, re_cold = reynolds_number(velocity, bore, kv), reynolds_number(velocity, bore, kv_cold)
    p_hot, p_cold = inlet_at(temp), inlet_at(temp_cold)
    # Search down to the cold start first, so a starving cold start always finds its crossing.
    t_starve = starving_temperature(inlet_at, p_min, temp, temp_cold)
    if t_starve is None and p_hot >= p_min:
        t_starve = starving_temperature(inlet_at, p_min, temp_cold)
    result = Result(values={
        "velocity": velocity, "kv": kv, "re": re, "regime": flow_regime(re),
        "p_inlet": p_hot, "margin": p_hot - p_min,
        "kv_cold": kv_cold, "re_cold": re_cold, "regime_cold": flow_regime(re_cold),
        "p_inlet_cold": p_cold, "margin_cold": p_cold - p_min,
        "strainer_cold": strainer_at(kv_cold), "t_starve": t_starve,
    })
    _verdicts(result, temp, temp_cold, p_hot, p_cold, p_min, t_starve)
    _notes(result, velocity, strainer, strainer_model, p_cold)
    result.sources += ["Bernoulli with Darcy-Weisbach losses; f = 64/Re laminar, Colebrook "
                       "turbulent (C. F. Colebrook, 1939)",
                       "Oil viscosity at each temperature: ASTM D341 (Walther form)",
                       "Minimum inlet pressure and margins: common practice; the pump's data "
                       "sheet takes precedence"]
    return result


def _verdicts(result: Result, temp: float, temp_cold: float, p_hot: float, p_cold: float,
              p_min: float, t_starve: float | None) -> None:
    warm = result.grade(p_hot - p_min, WARM_BANDS, COMMON_PRACTICE, temp=Q(temp, _T),
                        p=Q(p_hot, _P), p_min=Q(p_min, _P), margin=Q(p_hot - p_min, _P))
    if warm.level == "act":
        return
    result.grade(p_cold - p_min, COLD_BANDS if t_starve is not None else COLD_BANDS_NEVER_STARVES,
                 COMMON_PRACTICE, temp=Q(temp_cold, _T), p=Q(p_cold, _P), p_min=Q(p_min, _P),
                 t_starve=Q(t_starve, _T), coldest=Q(SCAN_LOW_C, _T))


def _notes(result: Result, velocity: float, strainer: float, strainer_model: str,
           p_cold: float) -> None:
    if velocity > 1.2:
        result.note("The oil moves at {0} in the suction line, faster than the usual 1.2 m/s "
                    "(common practice).", Q(velocity, "velocity"))
    if p_cold < 0.0:
        result.note("A computed pressure below zero absolute means the line cannot deliver "
                    "this flow at all at that temperature: the oil column breaks and the pump "
                    "runs partly empty.")
    if strainer > 0.0:
        result.note("Strainer drop: entered clean at the operating temperature and "
                    + ("raised in proportion to viscosity when cold (laminar flow through the "
                       "mesh, an assumption)." if strainer_model == "viscous"
                       else "held constant when cold (an assumption: cold oil usually raises it)."))
    result.note("Fitting K factors are turbulent-flow values held constant; in cold, laminar "
                "flow real fitting losses are higher. Density is held constant.")
    result.note("Never fit a restrictor, a fine filter or a shut-off valve that can be left "
                "closed in a suction line unless the pump maker allows it (a suction valve must "
                "be locked open or interlocked): a starved pump cavitates and can be wrecked in "
                "minutes.")
    result.note("Before opening a suction line: stop and lock out the machine, let hot oil cool, "
                "and have a tray ready; the tank drains through an open suction line.")
