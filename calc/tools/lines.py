"""The line-velocity tool: mean velocity in a bore (calc.methods.lines) against the
common-practice range for the line type, and the bore and hose size a velocity needs.
"""

from __future__ import annotations

import math

from ..kernel.grading import Band
from ..kernel.registry import TANK, Field, Output, tool
from ..kernel.result import COMMON_PRACTICE, Q, Result
from ..methods.lines import HOSE_SIZES, bore_for_velocity, line_velocity, next_hose_size


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


_V = "velocity"
_MM = "length"

# The velocity against the line type's range (common practice); too fast in a suction line
# starves the pump, elsewhere it costs pressure, heat and noise.
_SLOW_OR_INSIDE = (
    Band("ok", "The oil moves at {velocity}, slower than the usual {low} to {high}: the line is "
               "larger than it needs to be, which costs money and holds more oil but does no "
               "harm.", under="low"),
    Band("ok", "The oil moves at {velocity}, inside the usual {low} to {high} for this line."),
)
SUCTION_VELOCITY_BANDS = (
    Band("act", "The oil moves at {velocity} in this suction line, faster than {high}: the pump "
                "may starve and cavitate; use a bore of at least {bore} and run the suction "
                "check.", over="high"),
) + _SLOW_OR_INSIDE
LINE_VELOCITY_BANDS = (
    Band("watch", "The oil moves at {velocity}, faster than the usual {low} to {high} for this "
                  "line: expect more pressure loss, heat and noise; a bore of {bore} or more "
                  "keeps it in range.", over="high"),
) + _SLOW_OR_INSIDE


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


@tool(
    "line-velocity",
    title="Line velocity and bore",
    summary="How fast the oil moves in a suction, pressure or return line, against common "
            "practice ranges, and the bore (and hose size) a target velocity needs.",
    topic=TANK,
    renamed={"flow": "line_flow", "target": "target_velocity"},
    inputs=(
        Field("line_flow", "Flow in the line", "flow", 100.0, min=0.1, max=20000.0,
              binds="pump_flow",
              help="Pump flow for suction and pressure lines; for a return line the flow that "
                   "comes back, which a cylinder's cap side can make larger than the pump's."),
        Field("bore", "Inside diameter (bore)", _MM, 25.0, min=1.0, max=600.0,
              help="The inside diameter, not the outside diameter of the tube or the fitting's "
                   "thread size.", usual=(4.0, 150.0)),
        Field("line", "Line type", "choice", "pressure", choices=LINE_CHOICES),
        Field("pressure", "Working pressure (pressure lines)", "pressure", 160.0, min=0.0,
              binds="working_pressure",
              max=1000.0, help="Used only for pressure lines: higher pressure allows faster oil.", when=("line", "pressure")),
        Field("target_velocity", "Target velocity", _V, None, min=0.1, max=20.0, optional=True,
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
def velocity_in_line(line_flow: float, bore: float, line: str, pressure: float,
                     target_velocity: float | None = None) -> Result:
    """Velocity in the bore against the line type's range, and the bore a target needs."""
    flow, target = line_flow, target_velocity
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
    result.grade(velocity, SUCTION_VELOCITY_BANDS if line == "suction" else LINE_VELOCITY_BANDS,
                 COMMON_PRACTICE, velocity=Q(velocity, _V), low=Q(low, _V), high=Q(high, _V),
                 bore=Q(bore_for_velocity(flow, high), _MM))
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
