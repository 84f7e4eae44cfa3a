"""Pump inlet pressure: hot, at a cold start, and the temperature below which the pump starves.

Energy balance from the oil surface in the tank (at rest, at atmospheric
pressure) to the pump inlet (absolute pressures):

    p_inlet = p_atm + rho g h - (1 + K + f L / D) rho v^2 / 2 - dp_strainer

h is the height of the lowest working oil level above the inlet (negative when
the pump lifts the oil), the 1 is the velocity head the oil gains, K the sum of
the fittings' loss factors (entry, elbows, valves), f the Darcy friction factor
of the line (calc.lines: 64/Re laminar, Colebrook turbulent). The oil's
viscosity at each temperature comes from its ASTM D341 line (calc.viscosity).

Assumptions, each said in the result: fitting K factors are turbulent-flow
values held constant (in cold laminar flow real fitting losses are higher);
density does not change with temperature; a strainer's drop is entered clean at
the operating temperature and either rises in proportion to viscosity (laminar
flow through the mesh, an assumption) or is held constant.

Sources: Darcy-Weisbach and Bernoulli (any fluid mechanics text); standard
gravity 9.806 65 m/s^2 (CGPM 1901); minimum inlet pressure default common practice.
"""

from __future__ import annotations

from typing import Callable

from ..kernel.errors import InputError
from .lines import (darcy_drop_bar, dynamic_pressure_bar, flow_regime, friction_factor,
                    line_velocity, reynolds_number)
from ..kernel.registry import TANK, Field, Output, tool
from ..kernel.result import COMMON_PRACTICE, Q, Result
from ..kernel.solve import bisect
from ..methods.viscosity import check_two_points, walther_fit, walther_viscosity

G = 9.80665  # standard gravity [m/s^2], CGPM 1901
P_ATM_BAR = 1.013  # standard atmosphere 1.01325 bar (ISO 2533), rounded as gauges read it
P_MIN_BAR = 0.8  # typical minimum absolute inlet pressure of industrial pumps: common practice
MARGIN_WATCH_BAR = 0.1  # a margin smaller than this is a warning: common practice
SCAN_LOW_C = -40.0  # coldest temperature searched for starving
SCAN_STEP_K = 1.0

STRAINER_CHOICES = (("viscous", "Rises with viscosity (mesh, laminar)"),
                    ("constant", "Constant"))

_P = "pressure"
_T = "temperature"
_KV = "kinematic_viscosity"


def static_head_bar(density_kgm3: float, head_m: float) -> float:
    """Pressure of an oil column rho g h [bar]; negative h (pump above the oil) gives suction.

    >>> round(static_head_bar(870.0, 1.0), 5)
    0.08532
    """
    return density_kgm3 * G * head_m / 1.0e5


def strainer_drop_bar(rated_bar: float, kv_cst: float, rated_kv_cst: float, model: str,
                      bypass_bar: float | None = None) -> float:
    """Strainer pressure drop [bar] at `kv_cst`, from `rated_bar` measured at `rated_kv_cst`.

    model "viscous": dp = rated * kv / rated_kv (laminar flow through a mesh: an assumption);
    model "constant": dp = rated. A bypass valve caps the drop at its opening pressure.

    >>> strainer_drop_bar(0.05, 460.0, 23.0, "viscous"), strainer_drop_bar(0.05, 460.0, 23.0, "viscous", 0.2)
    (1.0, 0.2)
    """
    drop = rated_bar * kv_cst / rated_kv_cst if model == "viscous" else rated_bar
    return drop if bypass_bar is None else min(drop, bypass_bar)


def inlet_pressure_bar(atmosphere_bar: float, head_m: float, density_kgm3: float,
                       flow_lpm: float, bore_mm: float, length_m: float, roughness_mm: float,
                       k_sum: float, kv_cst: float, strainer_bar: float) -> float:
    """Absolute pressure [bar] at the pump inlet.

    p = p_atm + rho g h - (1 + K + f L / D) rho v^2 / 2 - dp_strainer

    >>> round(inlet_pressure_bar(1.013, 0.3, 870.0, 100.0, 50.0, 1.5, 0.045, 1.5, 23.0, 0.05), 4)
    0.9775
    """
    velocity = line_velocity(flow_lpm, bore_mm)
    f = friction_factor(reynolds_number(velocity, bore_mm, kv_cst), roughness_mm / bore_mm)
    line_loss = (darcy_drop_bar(f, length_m, bore_mm, density_kgm3, velocity)
                 + (1.0 + k_sum) * dynamic_pressure_bar(density_kgm3, velocity))
    return atmosphere_bar + static_head_bar(density_kgm3, head_m) - line_loss - strainer_bar


def starving_temperature(inlet_at: Callable[[float], float], p_min_bar: float,
                         warm_c: float, cold_c: float = SCAN_LOW_C) -> float | None:
    """Warmest temperature [degC] below `warm_c` at which `inlet_at(T)` falls to `p_min_bar`.

    Steps down from `warm_c` in 1 K steps to the first temperature with the inlet below the
    minimum, then bisects that step to 1e-6 K. None when the inlet is already below the
    minimum at `warm_c`, or stays above it down to `cold_c`. (Stepping first matters: the
    friction loss drops a little where cooling turns the flow laminar, so the margin is not
    strictly monotone in temperature across the transition.)

    >>> round(starving_temperature(lambda t: 0.5 + 0.01 * t, 0.8, 80.0), 6)
    30.0
    """
    margin = lambda t: inlet_at(t) - p_min_bar  # noqa: E731
    if margin(warm_c) < 0.0:
        return None
    upper = warm_c
    while upper > cold_c:
        lower = max(upper - SCAN_STEP_K, cold_c)
        if margin(lower) < 0.0:
            return bisect(margin, lower, upper, x_tol=1e-6, rel_tol=0.0, max_iter=60)
        upper = lower
    return None


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
        Field("atmosphere", "Atmospheric pressure (absolute)", _P, P_ATM_BAR, min=0.5, max=1.1,
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
    fixes = ("use a larger or shorter suction line with fewer bends, raise the oil level or "
             "set the pump below the tank (flooded inlet), and clean or enlarge the strainer")
    if p_hot < p_min:
        result.add("act", COMMON_PRACTICE,
                   "Even warm ({0}) the inlet is at {1}, below the pump's minimum of {2}: the "
                   "pump starves and cavitates; " + fixes + ".",
                   Q(temp, _T), Q(p_hot, _P), Q(p_min, _P))
    elif p_hot - p_min < MARGIN_WATCH_BAR:
        result.add("watch", COMMON_PRACTICE,
                   "Warm ({0}) the inlet is at {1}, only {2} above the pump's minimum: a "
                   "clogging strainer or a low oil level will starve the pump.",
                   Q(temp, _T), Q(p_hot, _P), Q(p_hot - p_min, _P))
    else:
        result.add("ok", COMMON_PRACTICE,
                   "Warm ({0}) the inlet is at {1}, {2} above the pump's minimum.",
                   Q(temp, _T), Q(p_hot, _P), Q(p_hot - p_min, _P))
    if p_hot < p_min:
        return
    if p_cold < p_min:
        result.add("act", COMMON_PRACTICE,
                   "At a cold start ({0}) the inlet falls to {1}, below the pump's minimum of "
                   "{2}: the pump starves until the oil is warmer than {3}. Warm the oil first "
                   "(tank heater, or run unloaded at low speed), or " + fixes
                   + ", or choose a lighter or higher-VI oil.",
                   Q(temp_cold, _T), Q(p_cold, _P), Q(p_min, _P), Q(t_starve, _T))
    elif p_cold - p_min < MARGIN_WATCH_BAR:
        result.add("watch", COMMON_PRACTICE,
                   "At a cold start ({0}) the inlet is at {1}, close to the pump's minimum of "
                   "{2}: start unloaded and let the oil warm before full flow.",
                   Q(temp_cold, _T), Q(p_cold, _P), Q(p_min, _P))
    elif t_starve is not None:
        result.add("ok", COMMON_PRACTICE,
                   "At a cold start ({0}) the inlet stays at {1}; the pump would starve only "
                   "with oil colder than {2}.", Q(temp_cold, _T), Q(p_cold, _P), Q(t_starve, _T))
    else:
        result.add("ok", COMMON_PRACTICE,
                   "At a cold start ({0}) the inlet stays at {1}, and the pump does not starve "
                   "with oil down to {2}.", Q(temp_cold, _T), Q(p_cold, _P), Q(SCAN_LOW_C, _T))


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
