"""Oil lines: mean velocity, the bore a velocity needs, and Darcy-Weisbach friction.

Mean velocity of a flow Q in a round bore d (continuity):

    v [m/s] = (Q [L/min] / 60 000) / (pi/4 * (d [mm] / 1000)^2)

Friction in a full round line (Darcy-Weisbach):

    dp = f * (L / D) * rho * v^2 / 2
    f = 64 / Re                                   laminar, Re < 2300
    1/sqrt(f) = -2 log10(e/D / 3.7 + 2.51 / (Re sqrt(f)))   turbulent, Re >= 4000 (Colebrook)

Colebrook is solved iteratively. Between Re 2300 and 4000 the flow is neither
one thing nor the other; here f is blended linearly between the laminar value
at 2300 and the Colebrook value at 4000, so that losses have no jump.

Sources: Darcy-Weisbach and the laminar f = 64/Re (Hagen-Poiseuille);
C. F. Colebrook, "Turbulent flow in pipes...", J. Inst. Civil Eng. 11 (1939);
the 2300 / 4000 limits of the transition are common practice.
"""

from __future__ import annotations

import math

from ..kernel.registry import TANK, Field, Output, tool
from ..kernel.result import COMMON_PRACTICE, Q, Result

RE_LAMINAR_MAX = 2300.0  # common practice
RE_TURBULENT_MIN = 4000.0  # common practice

LINE_CHOICES = (("suction", "Suction (tank to pump)"), ("pressure", "Pressure (pump to valves)"),
                ("return", "Return (to tank)"))

# Mean velocity ranges [m/s], common practice (typical of hydraulic design tables, from memory).
SUCTION_RANGE = (0.6, 1.2)
RETURN_RANGE = (2.0, 4.0)
PRESSURE_LINE_LOW = 2.0
# Pressure lines: (working pressure up to [bar], top of the range [m/s]); thicker walls and
# shorter runs at high pressure allow faster oil. Common practice, from memory.
PRESSURE_LINE_TOP = ((25.0, 3.0), (50.0, 4.0), (100.0, 4.5), (150.0, 5.0), (200.0, 5.5),
                     (math.inf, 6.0))

# Hydraulic hose sizes: (SAE dash number, nominal bore [mm], ISO/EN nominal size DN).
# SAE J517 numbers a hose by its nominal inside diameter in sixteenths of an inch, so the
# bore is dash * 25.4 / 16 mm exactly; the DN pairing is from memory of EN 853 / ISO 18752
# tables. Actual bores vary a little by maker and hose type: check the hose's data sheet.
HOSE_SIZES = tuple((dash, dash * 25.4 / 16.0, dn) for dash, dn in (
    (4, 6), (5, 8), (6, 10), (8, 12), (10, 16), (12, 19), (16, 25), (20, 31), (24, 38),
    (32, 51), (40, 63), (48, 76)))

_V = "velocity"
_MM = "length"


def line_velocity(flow_lpm: float, bore_mm: float) -> float:
    """Mean velocity [m/s] of `flow_lpm` [L/min] in a round bore of `bore_mm` [mm].

    v = (Q / 60 000) / (pi/4 * (d / 1000)^2)

    >>> round(line_velocity(100.0, 25.0), 2)
    3.4
    >>> round(line_velocity(60.0, 1000.0 * math.sqrt(4.0 / math.pi) * 0.1), 6)
    0.1

    Source: continuity, Q = v * A.
    """
    return (flow_lpm / 60000.0) / (math.pi / 4.0 * (bore_mm / 1000.0) ** 2)


def bore_for_velocity(flow_lpm: float, velocity_ms: float) -> float:
    """Bore [mm] in which `flow_lpm` [L/min] moves at `velocity_ms` [m/s]: inverse of line_velocity.

    d = 1000 * sqrt(4 * (Q / 60 000) / (pi * v))

    >>> round(bore_for_velocity(100.0, 3.395), 2)
    25.0
    """
    return 1000.0 * math.sqrt(4.0 * (flow_lpm / 60000.0) / (math.pi * velocity_ms))


def velocity_range(line: str, pressure_bar: float = 0.0) -> tuple[float, float]:
    """Common-practice mean velocity range (low, high) [m/s] for a line type.

    >>> velocity_range("suction"), velocity_range("pressure", 160.0)
    ((0.6, 1.2), (2.0, 5.5))
    """
    if line == "suction":
        return SUCTION_RANGE
    if line == "return":
        return RETURN_RANGE
    top = next(v for p, v in PRESSURE_LINE_TOP if pressure_bar <= p)
    return (PRESSURE_LINE_LOW, top)


def next_hose_size(bore_mm: float) -> tuple[int, float, int] | None:
    """The smallest hose size (dash, bore [mm], DN) at least `bore_mm` [mm]; None past the list.

    >>> next_hose_size(23.0)
    (16, 25.4, 25)
    """
    return next((size for size in HOSE_SIZES if size[1] >= bore_mm * (1.0 - 1e-9)), None)


def reynolds_number(velocity_ms: float, bore_mm: float, kv_cst: float) -> float:
    """Reynolds number Re = v * d / nu, with d [mm] and nu [cSt = mm^2/s].

    >>> round(reynolds_number(1.0, 50.0, 50.0))
    1000
    """
    return velocity_ms * bore_mm * 1000.0 / kv_cst


def colebrook_friction(re: float, rel_roughness: float) -> float:
    """Darcy friction factor of turbulent flow by the Colebrook equation, solved by iteration.

    1/sqrt(f) = -2 log10(rel_roughness / 3.7 + 2.51 / (Re sqrt(f)))

    Fixed-point iteration on x = 1/sqrt(f) from x = 8 converges to 1e-12 in a handful
    of steps over the Moody chart's range.

    >>> round(colebrook_friction(1.0e5, 0.0), 4)
    0.018

    Source: Colebrook (1939).
    """
    x = 8.0
    for _ in range(100):
        new = -2.0 * math.log10(rel_roughness / 3.7 + 2.51 * x / re)
        if abs(new - x) < 1e-12:
            x = new
            break
        x = new
    return 1.0 / (x * x)


def friction_factor(re: float, rel_roughness: float = 0.0) -> float:
    """Darcy friction factor for any Reynolds number.

    Laminar (Re < 2300): f = 64 / Re. Turbulent (Re >= 4000): Colebrook.
    In between: linear in Re from 64/2300 to the Colebrook value at 4000.

    >>> round(friction_factor(1000.0), 4), round(friction_factor(1.0e5, 0.0), 4)
    (0.064, 0.018)
    """
    if re < RE_LAMINAR_MAX:
        return 64.0 / re
    if re >= RE_TURBULENT_MIN:
        return colebrook_friction(re, rel_roughness)
    share = (re - RE_LAMINAR_MAX) / (RE_TURBULENT_MIN - RE_LAMINAR_MAX)
    laminar = 64.0 / RE_LAMINAR_MAX
    return laminar + share * (colebrook_friction(RE_TURBULENT_MIN, rel_roughness) - laminar)


def flow_regime(re: float) -> str:
    """ "laminar", "transition" or "turbulent" by the common-practice limits 2300 and 4000."""
    if re < RE_LAMINAR_MAX:
        return "laminar"
    return "turbulent" if re >= RE_TURBULENT_MIN else "transition"


def dynamic_pressure_bar(density_kgm3: float, velocity_ms: float) -> float:
    """rho * v^2 / 2 in bar.

    >>> dynamic_pressure_bar(1000.0, 2.0)
    0.02
    """
    return density_kgm3 * velocity_ms ** 2 / 2.0 / 1.0e5


def darcy_drop_bar(friction: float, length_m: float, bore_mm: float, density_kgm3: float,
                   velocity_ms: float) -> float:
    """Darcy-Weisbach friction loss [bar]: f * (L / D) * rho * v^2 / 2.

    >>> round(darcy_drop_bar(0.064, 2.0, 50.0, 870.0, 1.0), 5)
    0.01114
    """
    return friction * length_m / (bore_mm / 1000.0) * dynamic_pressure_bar(density_kgm3, velocity_ms)


@tool(
    "line-velocity",
    title="Line velocity and bore",
    summary="How fast the oil moves in a suction, pressure or return line, against common "
            "practice ranges, and the bore (and hose size) a target velocity needs.",
    topic=TANK,
    inputs=(
        Field("flow", "Flow in the line", "flow", 100.0, min=0.1, max=20000.0,
              help="Pump flow for suction and pressure lines; for a return line the flow that "
                   "comes back, which a cylinder's cap side can make larger than the pump's."),
        Field("bore", "Inside diameter (bore)", _MM, 25.0, min=1.0, max=600.0,
              help="The inside diameter, not the outside diameter of the tube or the fitting's "
                   "thread size."),
        Field("line", "Line type", "choice", "pressure", choices=LINE_CHOICES),
        Field("pressure", "Working pressure (pressure lines)", "pressure", 160.0, min=0.0,
              max=1000.0, help="Used only for pressure lines: higher pressure allows faster oil."),
        Field("target", "Target velocity", _V, None, min=0.1, max=20.0, optional=True,
              help="Leave blank to size for the top of the common-practice range."),
    ),
    outputs=(
        Output("velocity", "Mean velocity in this bore", _V, headline=True),
        Output("v_low", "Common practice range, from", _V),
        Output("v_high", "Common practice range, to", _V),
        Output("bore_needed", "Bore for the target velocity", _MM,
               "A smaller bore than this makes the oil faster than the target."),
        Output("hose_size", "Next hose size up (SAE dash / DN)", "text"),
        Output("hose_bore", "Nominal bore of that hose", _MM),
        Output("hose_velocity", "Velocity in that hose", _V),
    ),
)
def line_velocity_tool(flow: float, bore: float, line: str, pressure: float,
                       target: float | None = None) -> Result:
    """Velocity in the bore against the line type's range, and the bore a target needs."""
    low, high = velocity_range(line, pressure)
    goal = high if target is None else target
    velocity = line_velocity(flow, bore)
    needed = bore_for_velocity(flow, goal)
    hose = next_hose_size(needed)
    result = Result(values={
        "velocity": velocity, "v_low": low, "v_high": high, "bore_needed": needed,
        "hose_size": None if hose is None else f"-{hose[0]} / DN {hose[2]}",
        "hose_bore": None if hose is None else hose[1],
        "hose_velocity": None if hose is None else line_velocity(flow, hose[1]),
    })
    at = (Q(velocity, _V), Q(low, _V), Q(high, _V))
    if velocity > high and line == "suction":
        result.add("act", COMMON_PRACTICE,
                   "The oil moves at {0} in this suction line, faster than {2}: the pump may "
                   "starve and cavitate; use a bore of at least {3} and run the suction check.",
                   *at, Q(bore_for_velocity(flow, high), _MM))
    elif velocity > high:
        result.add("watch", COMMON_PRACTICE,
                   "The oil moves at {0}, faster than the usual {1} to {2} for this line: expect "
                   "more pressure loss, heat and noise; a bore of {3} or more keeps it in range.",
                   *at, Q(bore_for_velocity(flow, high), _MM))
    elif velocity < low:
        result.add("ok", COMMON_PRACTICE,
                   "The oil moves at {0}, slower than the usual {1} to {2}: the line is larger "
                   "than it needs to be, which costs money and holds more oil but does no harm.",
                   *at)
    else:
        result.add("ok", COMMON_PRACTICE,
                   "The oil moves at {0}, inside the usual {1} to {2} for this line.", *at)
    if target is not None and not low <= target <= high:
        result.note("The target {0} is outside the common-practice range {1} to {2}.",
                    Q(target, _V), Q(low, _V), Q(high, _V))
    if hose is None:
        result.note("The bore needed is larger than the biggest hose size listed ({0}): use "
                    "tube or pipe, or split the flow between lines.", Q(HOSE_SIZES[-1][1], _MM))
    else:
        result.note("Hose sizes are nominal (SAE J517 dash = sixteenths of an inch); the "
                    "actual bore varies by maker: check the hose's data sheet.")
    if line == "return":
        result.note("A return line should end below the lowest oil level, away from the pump "
                    "inlet, or it whips air into the oil.")
    result.sources += ["Continuity: v = Q / A",
                       "Velocity ranges: common practice (typical design tables, from memory)",
                       "Hose sizes: SAE J517 dash numbering; DN pairing from memory"]
    return result
