"""The suction-check tool: the pump's inlet pressure warm and at a cold start
(calc.methods.suction) against its minimum, and where the pump starts to starve.

Cold oil turns the suction flow laminar: the fittings' losses then grow as 1/Re (Hooper's
2-K method), friction follows Churchill's equation through the transition, and the
velocity head counts twice (alpha = 2). Where the balance would put the inlet below the
pressure at which dissolved air leaves the oil, no pressure is reported: the column
breaks and the pump cannot fill, and the tool says how warm the oil must be instead.

A strainer's drop is entered clean at the operating temperature; when cold it rises with
viscosity (laminar flow through the mesh, an assumption) or is held, and a bypass valve
caps it at its opening pressure. Which of these decides the cold-start verdict is said.
Density is held constant. The minimum inlet pressure default, the margins and the bypass
default are common practice.
"""

from __future__ import annotations

import math

from ..kernel.constants import ATMOSPHERE_ROUNDED_BAR
from ..kernel.errors import InputError
from ..kernel.grading import Band, pick
from ..kernel.registry import TANK, Field, Output, tool
from ..kernel.result import COMMON_PRACTICE, FROM_MEMORY, Q, Result
from ..methods import fittings as fit
from ..methods.lines import flow_regime, line_velocity, reynolds_number
from ..methods.suction import (SCAN_LOW_C, inlet_pressure_bar, starving_temperature,
                               strainer_drop_bar)
from ..methods.viscosity import check_two_points, viscosity_on_line, walther_fit

P_MIN_BAR = 0.8  # typical minimum absolute inlet pressure of industrial pumps: common practice
MARGIN_WATCH_BAR = 0.1  # a margin smaller than this is a warning: common practice
# Below about this absolute pressure the air dissolved in mineral oil comes out fast and the
# oil column breaks (from memory; the oil's vapour pressure is far lower still).
COLUMN_BREAKS_BAR = 0.3
# Suction strainers usually carry a bypass valve opening at about 0.2 bar (3 psi): common
# practice, from memory; the strainer's own figure takes precedence.
BYPASS_OPENS_BAR = 0.2
# Suction lines are sized for at most about 1.2 m/s (common practice, as in line-velocity).
SUCTION_VELOCITY_TOP = 1.2

STRAINER_CHOICES = (("viscous", "Rises with viscosity (mesh, laminar)"),
                    ("constant", "Constant"))
BYPASS_CHOICES = (("yes", "Has a bypass valve"), ("no", "No bypass valve"))
ENTRY_CHOICES = (("sharp", "Flush with the tank wall, sharp edge"),
                 ("projecting", "Pipe standing into the tank"),
                 ("rounded", "Well rounded (bell mouth)"))
VALVE_CHOICES = (("none", "No valve"), ("full_bore", "Ball or gate valve, full bore"),
                 ("butterfly", "Butterfly valve"))
ENTRIES = {"sharp": fit.ENTRANCE_SHARP, "projecting": fit.ENTRANCE_PROJECTING,
           "rounded": fit.ENTRANCE_ROUNDED}
VALVES = {"full_bore": fit.FULL_BORE_VALVE, "butterfly": fit.BUTTERFLY_VALVE}

_P = "pressure"
_PA = "absolute_pressure"
_T = "temperature"
_KV = "kinematic_viscosity"

_FIXES = ("use a larger or shorter suction line with fewer bends, raise the oil level or set "
          "the pump below the tank (flooded inlet), and clean or enlarge the strainer")
_BREAKS = ("the energy balance would put the inlet below {breaks}, where the air dissolved in "
           "the oil comes out and the oil column breaks: the pump cannot fill and runs partly "
           "empty (cavitation and aeration)")
# The inlet against the pump's minimum when warm, and at a cold start (common practice).
WARM_BANDS = (
    Band("act", "Even warm ({temp}) " + _BREAKS + "; " + _FIXES + ".", under="breaks",
         basis=FROM_MEMORY),
    Band("act", "Even warm ({temp}) the inlet is at {p}, below the pump's minimum of {p_min}: "
                "the pump starves and cavitates; " + _FIXES + ".", under="p_min"),
    Band("watch", "Warm ({temp}) the inlet is at {p}, only {margin} above the pump's minimum: a "
                  "clogging strainer or a low oil level will starve the pump.", under="watch_at"),
    Band("ok", "Warm ({temp}) the inlet is at {p}, {margin} above the pump's minimum."),
)
_COLD_FIX = (" Warm the oil first (tank heater, or run unloaded at low speed), or " + _FIXES
             + ", or choose a lighter or higher-VI oil.")
COLD_BANDS = (
    Band("act", "At a cold start ({temp}) " + _BREAKS + ". It fills only with oil warmer than "
                "{t_starve}." + _COLD_FIX, under="breaks", basis=FROM_MEMORY),
    Band("act", "At a cold start ({temp}) the inlet falls to {p}, below the pump's minimum of "
                "{p_min}: the pump starves until the oil is warmer than {t_starve}." + _COLD_FIX,
         under="p_min"),
    Band("watch", "At a cold start ({temp}) the inlet is at {p}, close to the pump's minimum of "
                  "{p_min}: start unloaded and let the oil warm before full flow.",
         under="watch_at"),
    Band("ok", "At a cold start ({temp}) the inlet stays at {p}; the pump would starve only with "
               "oil colder than {t_starve}."),
)
COLD_BANDS_NEVER_STARVES = COLD_BANDS[:3] + (
    Band("ok", "At a cold start ({temp}) the inlet stays at {p}, and the pump does not starve "
               "with oil down to {coldest}."),
)
VELOCITY_BANDS = (
    Band("watch", "The oil moves at {velocity} in the suction line, faster than the usual "
                  "{top}: losses grow with the square of the speed; a larger bore helps most.",
         over=SUCTION_VELOCITY_TOP),
)


def _count(key: str, label: str, default: float) -> Field:
    return Field(key, label, "count", default, min=0.0, max=20.0, binds=key, usual=(0.0, 8.0),
                 help="How many in the suction line between the tank and the pump.")


@tool(
    "suction-check",
    title="Pump suction check",
    summary="Absolute pressure at the pump inlet when warm and at a cold start, against the "
            "pump's minimum, and the oil temperature below which the pump starves.",
    topic=TANK,
    inputs=(
        Field("pump_flow", "Pump flow", "flow", 100.0, min=0.1, max=5000.0, binds="pump_flow"),
        Field("suction_bore", "Suction line bore", "length", 50.0, min=5.0, max=600.0,
              binds="suction_bore",
              help="Inside diameter of the narrowest part of the suction line.", usual=(10.0, 150.0)),
        Field("suction_length", "Suction line length", "length_m", 1.5, min=0.0, max=100.0,
              binds="suction_length", usual=(0.0, 5.0)),
        Field("roughness", "Wall roughness", "length", 0.045, min=0.0, max=5.0,
              help="About 0.045 mm for commercial steel pipe, 0.0015 mm for drawn tube "
                   "(from memory of the Moody chart's table).", usual=(0.0, 0.2), group="limits"),
        Field("suction_head", "Oil level above pump inlet", "length_m", 0.3, min=-10.0,
              max=30.0, binds="suction_head",
              help="Lowest working oil level minus inlet height; negative when the pump sits "
                   "above the oil and has to lift it.", usual=(-2.0, 3.0)),
        Field("entry", "Where the line leaves the tank", "choice", "sharp", binds="entry",
              choices=ENTRY_CHOICES),
        _count("elbows_90", "90° elbows (standard, screwed)", 2.0),
        _count("bends_90", "90° bends (long radius)", 0.0),
        _count("elbows_45", "45° elbows", 0.0),
        _count("tees", "Tees, flow through the branch", 0.0),
        Field("suction_valve", "Valve in the line", "choice", "none", choices=VALVE_CHOICES,
              binds="suction_valve",
              help="A suction valve must be locked open or interlocked with the pump."),
        Field("strainer", "Strainer drop, clean, warm", _P, 0.05, min=0.0, max=2.0,
              binds="strainer",
              help="The strainer's pressure drop at this flow at the operating temperature; "
                   "0 if there is none.", usual=(0.0, 0.3)),
        Field("strainer_model", "Strainer drop when cold", "choice", "viscous",
              choices=STRAINER_CHOICES),
        Field("bypass", "Strainer bypass", "choice", "yes", choices=BYPASS_CHOICES,
              binds="strainer_bypass",
              help="Most suction strainers have one (common practice); check the strainer."),
        Field("bypass_opens", "Bypass opens at", _P, BYPASS_OPENS_BAR, min=0.01, max=2.0,
              binds="bypass_opens",
              help="About 0.2 bar (3 psi) is usual (common practice, from memory); the "
                   "strainer's data takes precedence.", usual=(0.05, 0.5)),
        Field("kv40", "Oil viscosity at 40 °C", _KV, 46.0, min=0.5, max=1.0e5, binds="kv40_new", usual=(9.0, 750.0)),
        Field("kv100", "Oil viscosity at 100 °C", _KV, 6.8, min=0.5, max=1.0e4,
              binds="kv100_new", usual=(2.0, 60.0)),
        Field("density", "Oil density", "density", 870.0, min=600.0, max=1300.0, binds="density",
              help="About 850 to 890 kg/m³ for mineral hydraulic oil (from memory)."),
        Field("temp_running", "Operating oil temperature", _T, 50.0, min=-40.0, max=150.0,
              binds="temp_running"),
        Field("temp_cold", "Cold start oil temperature", _T, 0.0, min=-40.0, max=150.0,
              binds="temp_cold_start"),
        Field("atmosphere", "Atmospheric pressure (absolute)", _PA, ATMOSPHERE_ROUNDED_BAR,
              min=0.5, max=1.1, help="1.013 bar at sea level; about 0.9 bar at 1000 m.", usual=(0.75, 1.05), group="limits"),
        Field("pump_min_inlet", "Pump minimum inlet pressure (absolute)", _PA, P_MIN_BAR,
              min=0.1, binds="pump_min_inlet",
              max=5.0,
              help="From the pump's data sheet; 0.8 bar absolute is typical (common practice).", usual=(0.4, 1.0)),
    ),
    outputs=(
        Output("velocity", "Velocity in the suction line", "velocity"),
        Output("kv", "Viscosity at operating temperature", _KV),
        Output("re", "Reynolds number, warm", "ratio"),
        Output("regime", "Flow, warm", "text"),
        Output("k_warm", "Fittings' loss factor, warm", "ratio",
               "Sum of the fittings' K at the warm Reynolds number (Hooper's 2-K method)."),
        Output("p_inlet", "Inlet pressure, warm (absolute)", _PA, at_least=0.0,
               help="Blank when the line cannot bring the flow: the oil column breaks."),
        Output("margin", "Margin to pump minimum, warm", _P),
        Output("kv_cold", "Viscosity at cold start", _KV),
        Output("re_cold", "Reynolds number, cold", "ratio"),
        Output("regime_cold", "Flow, cold", "text"),
        Output("k_cold", "Fittings' loss factor, cold", "ratio"),
        Output("p_inlet_cold", "Inlet pressure, cold start (absolute)", _PA, headline=True,
               at_least=0.0,
               help="Blank when the line cannot bring the flow: the oil column breaks."),
        Output("margin_cold", "Margin to pump minimum, cold", _P),
        Output("strainer_cold", "Strainer drop, cold", _P),
        Output("t_starve", "Pump starves below", _T,
               "The oil temperature at which the inlet pressure falls to the pump's minimum.",
               headline=True),
    ),
    renamed={"flow": "pump_flow", "bore": "suction_bore", "length": "suction_length",
             "head": "suction_head", "valve": "suction_valve", "temp": "temp_running",
             "p_min": "pump_min_inlet"},
    retired={"k_sum": "the fittings are now described by kind and count (entry, elbows_90, "
                      "bends_90, elbows_45, tees, valve), so their losses can grow in cold, "
                      "laminar flow",
             "strainer_bypass": "use bypass=yes or no, and bypass_opens for its pressure"},
    related={"viscosity-at-temperature": "Its start-up temperature is the pump's viscosity "
             "limit alone, without the suction line: this check's is usually warmer, and the "
             "warmer of the two governs a cold start."},
)
def suction_check(pump_flow: float, suction_bore: float, suction_length: float,
                  roughness: float, suction_head: float, entry: str, elbows_90: float,
                  bends_90: float, elbows_45: float, tees: float, suction_valve: str,
                  strainer: float, strainer_model: str, bypass: str, bypass_opens: float,
                  kv40: float, kv100: float, density: float, temp_running: float,
                  temp_cold: float, atmosphere: float, pump_min_inlet: float) -> Result:
    """Inlet pressure warm and cold on the oil's D341 line, and where the pump starts to starve."""
    flow, bore, length, head, valve = (pump_flow, suction_bore, suction_length, suction_head,
                                       suction_valve)
    temp, p_min = temp_running, pump_min_inlet
    check_two_points(40.0, kv40, 100.0, kv100)
    if temp_cold >= temp:
        raise InputError("temp_cold", "the cold start temperature must be lower than the "
                                      "operating temperature")
    if roughness / bore > 0.05:
        raise InputError("roughness", "must be at most 5 % of the bore (the Moody chart's range)")
    for key, count in (("elbows_90", elbows_90), ("bends_90", bends_90),
                       ("elbows_45", elbows_45), ("tees", tees)):
        if count != int(count):
            raise InputError(key, "is a count of fittings: a whole number")
    line = (fit.Fitting(1, *ENTRIES[entry], entrance=True), fit.Fitting(elbows_90, *fit.ELBOW_90),
            fit.Fitting(bends_90, *fit.BEND_90), fit.Fitting(elbows_45, *fit.ELBOW_45),
            fit.Fitting(tees, *fit.TEE_BRANCH)) + (
        (fit.Fitting(1, *VALVES[valve]),) if valve in VALVES else ())
    a, b = walther_fit(40.0, kv40, 100.0, kv100)
    kv, kv_cold = viscosity_on_line(temp, a, b), viscosity_on_line(temp_cold, a, b)
    for key, t, kv_t in (("temp_running", temp, kv), ("temp_cold", temp_cold, kv_cold)):
        if kv_t is None:
            raise InputError(key, "at {temp} this oil's viscosity line runs off any scale: check "
                                  "the two viscosities", temp=Q(t, _T))
    cap = bypass_opens if bypass == "yes" else None

    def strainer_at(kv_cst: float, cap_bar: float | None = cap) -> float:
        return strainer_drop_bar(strainer, kv_cst, kv, strainer_model, cap_bar)

    def inlet_at(temp_c: float, cap_bar: float | None = cap) -> float:
        kv_t = viscosity_on_line(temp_c, a, b)
        if kv_t is None:
            return -math.inf  # past any scale: too thick to flow at all
        return inlet_pressure_bar(atmosphere, head, density, flow, bore, length, roughness,
                                  line, kv_t, strainer_at(kv_t, cap_bar))

    velocity = line_velocity(flow, bore)
    re, re_cold = reynolds_number(velocity, bore, kv), reynolds_number(velocity, bore, kv_cold)
    p_hot, p_cold = inlet_at(temp), inlet_at(temp_cold)
    t_starve = _starving(inlet_at, p_min, temp, temp_cold, p_hot)
    result = Result(values={
        "velocity": velocity, "kv": kv, "re": re, "regime": flow_regime(re),
        "k_warm": fit.fittings_k(line, re, bore),
        "p_inlet": None if p_hot < COLUMN_BREAKS_BAR else p_hot,
        "margin": None if p_hot < COLUMN_BREAKS_BAR else p_hot - p_min,
        "kv_cold": kv_cold, "re_cold": re_cold, "regime_cold": flow_regime(re_cold),
        "k_cold": fit.fittings_k(line, re_cold, bore),
        "p_inlet_cold": None if p_cold < COLUMN_BREAKS_BAR else p_cold,
        "margin_cold": None if p_cold < COLUMN_BREAKS_BAR else p_cold - p_min,
        "strainer_cold": strainer_at(kv_cold), "t_starve": t_starve,
    })
    limits = dict(p_min=Q(p_min, _PA), breaks=Q(COLUMN_BREAKS_BAR, _PA),
                  watch_at=Q(p_min + MARGIN_WATCH_BAR, _PA))
    warm = result.grade(p_hot, WARM_BANDS, COMMON_PRACTICE, temp=Q(temp, _T), p=Q(p_hot, _PA),
                        margin=Q(p_hot - p_min, _P), **limits)
    if warm.level != "act":
        result.grade(p_cold, COLD_BANDS if t_starve is not None else COLD_BANDS_NEVER_STARVES,
                     COMMON_PRACTICE, temp=Q(temp_cold, _T), p=Q(p_cold, _PA),
                     t_starve=Q(t_starve, _T), coldest=Q(SCAN_LOW_C, _T), **limits)
        _say_what_governs(result, strainer, strainer_model, bypass, bypass_opens, kv_cold,
                          strainer_at, inlet_at, p_min, temp, temp_cold)
    result.grade(velocity, VELOCITY_BANDS, COMMON_PRACTICE, velocity=Q(velocity, "velocity"),
                 top=Q(SUCTION_VELOCITY_TOP, "velocity"))
    _notes(result, strainer, strainer_model)
    result.sources += ["Bernoulli with Darcy-Weisbach losses; friction by S. W. Churchill "
                       "(1977), laminar to turbulent",
                       "Fittings: the 2-K method, W. B. Hooper (1981), from memory; laminar "
                       "kinetic-energy factor 2",
                       "Oil viscosity at each temperature: ASTM D341 (Walther form)",
                       "Minimum inlet pressure, margins and the strainer bypass: common "
                       "practice; the pump's and strainer's data take precedence"]
    return result


def _starving(inlet_at, p_min: float, temp: float, temp_cold: float, p_hot: float) -> float | None:
    """The warmest temperature at which the inlet falls to the pump's minimum, if in range."""
    # Search down to the cold start first, so a starving cold start always finds its crossing.
    found = starving_temperature(inlet_at, p_min, temp, temp_cold)
    if found is None and p_hot >= p_min:
        found = starving_temperature(inlet_at, p_min, temp_cold)
    return found


def _say_what_governs(result: Result, strainer: float, strainer_model: str, bypass: str,
                      bypass_opens: float, kv_cold: float, strainer_at, inlet_at, p_min: float,
                      temp: float, temp_cold: float) -> None:
    """Say whether the bypass assumption decides the cold-start verdict, or it holds either way."""
    if strainer <= 0.0 or strainer_model != "viscous":
        return
    assumed = bypass_opens if bypass == "yes" else None
    other = None if bypass == "yes" else BYPASS_OPENS_BAR
    if strainer_at(kv_cold, None) <= (assumed if assumed is not None else other):
        return  # the cold drop never reaches a bypass: the assumption changes nothing
    limits = {"p_min": p_min, "breaks": COLUMN_BREAKS_BAR, "watch_at": p_min + MARGIN_WATCH_BAR}
    band_of = lambda cap: pick(inlet_at(temp_cold, cap), COLD_BANDS, limits)  # noqa: E731
    named = dict(assumed=Q(strainer_at(kv_cold), _P), other=Q(strainer_at(kv_cold, other), _P),
                 usual=Q(BYPASS_OPENS_BAR, _P))
    if band_of(assumed) is band_of(other):
        result.note("The strainer's bypass does not change the cold-start verdict: its cold "
                    "drop is {assumed} as entered and would be {other} the other way."
                    if bypass == "yes" else
                    "The strainer has no bypass, so its cold drop grows to {assumed}; with a "
                    "bypass opening at {usual} it would be {other}, and the cold-start verdict "
                    "would be the same.", **named)
        return
    p_other = inlet_at(temp_cold, other)
    named["p_other"], named["breaks"] = Q(p_other, _PA), Q(COLUMN_BREAKS_BAR, _PA)
    fills = p_other >= COLUMN_BREAKS_BAR
    if bypass == "yes":
        result.note("The strainer's bypass decides the cold-start verdict: it holds the "
                    "strainer's drop to {assumed}; without a bypass the drop would be {other} and "
                    "the inlet would fall to {p_other}. Check that the strainer has a bypass and "
                    "its opening pressure." if fills else
                    "The strainer's bypass decides the cold-start verdict: it holds the "
                    "strainer's drop to {assumed}; without a bypass the drop would be {other}, "
                    "the inlet would fall below {breaks} and the pump could not fill. Check that "
                    "the strainer has a bypass and its opening pressure.", **named)
    else:
        result.note("The strainer decides the cold-start verdict: with no bypass its drop grows "
                    "to {assumed}; a bypass opening at {usual} would hold it to {other}, and the "
                    "inlet would then be {p_other}." if fills else
                    "The strainer decides the cold-start verdict: with no bypass its drop grows "
                    "to {assumed}; a bypass opening at {usual} would hold it to {other}, yet the "
                    "inlet would still fall below {breaks}.", **named)


def _notes(result: Result, strainer: float, strainer_model: str) -> None:
    if strainer > 0.0:
        result.note("Strainer drop: entered clean at the operating temperature and raised in "
                    "proportion to viscosity when cold (laminar flow through the mesh, an "
                    "assumption)." if strainer_model == "viscous" else
                    "Strainer drop: entered clean at the operating temperature and held "
                    "constant when cold (an assumption: cold oil usually raises it).")
    result.note("Fitting losses follow Hooper's 2-K method, so they grow in cold, laminar flow; "
                "density is held constant.")
    result.note("Never fit a restrictor, a fine filter or a shut-off valve that can be left "
                "closed in a suction line unless the pump maker allows it (a suction valve must "
                "be locked open or interlocked): a starved pump cavitates and can be wrecked in "
                "minutes.")
    result.note("Before opening a suction line: stop and lock out the machine, let hot oil cool, "
                "and have a tray ready; the tank drains through an open suction line.")
