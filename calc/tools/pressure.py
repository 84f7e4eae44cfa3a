"""The viscosity-under-pressure tool: Barus's relation (calc.methods.pressure) with the
coefficient entered or fitted from two readings.
"""

from __future__ import annotations

from ..kernel.errors import InputError
from ..kernel.grading import Band
from ..kernel.registry import VISCOSITY, Field, Output, tool
from ..kernel.result import FROM_MEMORY, Q, Result
from ..methods.pressure import barus_alpha, barus_factor

_KV = "kinematic_viscosity"
_P = "pressure"
_ALPHA = "per_bar"

# Typical pressure-viscosity coefficients of mineral oils [1/bar], from memory.
MINERAL_ALPHA_PER_BAR = (1.5e-3, 2.5e-3)
# Above about this pressure [bar] Barus overestimates the rise (from memory: "a few thousand bar").
BARUS_RELIABLE_BAR = 3000.0
# Accepted range of the coefficient [1/bar]: beyond 1e-2 (100 1/GPa) no oil is known.
ALPHA_MIN_PER_BAR = 1.0e-5
ALPHA_MAX_PER_BAR = 1.0e-2
PRESSURE_MAX_BAR = 10000.0

# The coefficient against the range typical of mineral oils (from memory).
_OUTSIDE = ("The coefficient {alpha} is outside the range typical of mineral oils ({low} to "
            "{high}): check the readings, or the fluid's data sheet (water glycols and many "
            "synthetics have lower values).")
ALPHA_BANDS = (
    Band("watch", _OUTSIDE, under="low"),
    Band("watch", _OUTSIDE, over="high"),
    Band("ok", "The coefficient {alpha} is typical of mineral oil; at {pressure} the oil is about "
               "{kv_p}."),
)
# Where the relation itself stops being reliable (from memory).
RELIABLE_BANDS = (
    Band("watch", "Above about {reliable} the Barus relation overestimates the rise: treat "
                  "{kv_p} as an upper bound.", over=BARUS_RELIABLE_BAR),
)


def _fitted_alpha(p1: float, reading1: float, p2: float, reading2: float) -> float:
    if abs(p2 - p1) < 1.0:
        raise InputError("p2", "the two readings must be at least {gap} apart", gap=Q(1.0, _P))
    (p_low, r_low), (p_high, r_high) = sorted(((p1, reading1), (p2, reading2)))
    high_key = "reading2" if p2 > p1 else "reading1"
    if r_high <= r_low:
        raise InputError(high_key, "the reading at the higher pressure must be the larger: an "
                                   "oil thickens under pressure")
    alpha = barus_alpha(p_low, r_low, p_high, r_high)
    if alpha > ALPHA_MAX_PER_BAR:
        raise InputError(high_key, "the two readings rise faster than any oil does (more than "
                                   "a factor e every {step}): check the readings and pressures",
                         step=Q(1.0 / ALPHA_MAX_PER_BAR, _P))
    return alpha


@tool(
    "viscosity-pressure",
    title="Viscosity under pressure",
    summary="How much thicker the oil is at pressure (Barus), with the coefficient entered or "
            "fitted from two readings at two pressures.",
    topic=VISCOSITY,
    inputs=(
        Field("kv", "Viscosity at atmospheric pressure", _KV, 46.0, min=0.5, max=1.0e5,
              help="At the working temperature."),
        Field("pressure", "Pressure", _P, 250.0, min=0.0, max=PRESSURE_MAX_BAR,
              binds="working_pressure",
              help="Gauge pressure, above atmospheric."),
        Field("alpha_from", "Pressure-viscosity coefficient", "choice", "entered",
              choices=(("entered", "Entered below"), ("fitted", "Fitted from two readings"))),
        Field("alpha", "Coefficient", _ALPHA, 2.0e-3, min=ALPHA_MIN_PER_BAR,
              max=ALPHA_MAX_PER_BAR, help="From the oil's data sheet; mineral oils are typically "
                                          "0.0015 to 0.0025 1/bar (15 to 25 1/GPa).", when=("alpha_from", "entered")),
        # The two readings' defaults are an invented example (12.0 s at 100 bar, 23.5 s at
        # 400 bar: 2.24e-3 1/bar), not the data of any test.
        Field("p1", "Pressure of reading 1", _P, 100.0, min=0.0, max=PRESSURE_MAX_BAR,
              help="Fitted only.", when=("alpha_from", "fitted")),
        Field("reading1", "Reading 1", "ratio", 12.0, min=1.0e-6, max=1.0e9,
              help="Fitted only: a viscosity, a falling-ball time or a flow time; both readings "
                   "in the same unit.", usual=(1.0e-6, 1.0e9), when=("alpha_from", "fitted")),
        Field("p2", "Pressure of reading 2", _P, 400.0, min=0.0, max=PRESSURE_MAX_BAR,
              help="Fitted only.", when=("alpha_from", "fitted")),
        Field("reading2", "Reading 2", "ratio", 23.5, min=1.0e-6, max=1.0e9, help="Fitted only.", usual=(1.0e-6, 1.0e9), when=("alpha_from", "fitted")),
    ),
    outputs=(
        Output("kv_p", "Viscosity at pressure", _KV,
               "The atmospheric viscosity times the rise factor.", headline=True),
        Output("factor", "Rise factor", "ratio", "Viscosity at pressure over viscosity at "
                                                  "atmospheric pressure."),
        Output("alpha_used", "Coefficient used", _ALPHA),
    ),
)
def viscosity_pressure(kv: float, pressure: float, alpha_from: str, alpha: float, p1: float,
                       reading1: float, p2: float, reading2: float) -> Result:
    """Viscosity at `pressure` [bar gauge] by Barus, alpha entered or fitted from two readings."""
    if alpha_from == "fitted":
        alpha = _fitted_alpha(p1, reading1, p2, reading2)
    factor = barus_factor(alpha, pressure)
    result = Result(values={"kv_p": kv * factor, "factor": factor, "alpha_used": alpha})
    low, high = MINERAL_ALPHA_PER_BAR
    kv_p = Q(kv * factor, _KV)
    result.grade(alpha, ALPHA_BANDS, FROM_MEMORY, alpha=Q(alpha, _ALPHA), low=Q(low, _ALPHA),
                 high=Q(high, _ALPHA), pressure=Q(pressure, _P), kv_p=kv_p)
    result.grade(pressure, RELIABLE_BANDS, FROM_MEMORY, reliable=Q(BARUS_RELIABLE_BAR, _P),
                 kv_p=kv_p)
    result.note("Typical mineral oils: {0} to {1} (15 to 25 1/GPa), from memory; the oil's own "
                "data sheet takes precedence.", Q(low, _ALPHA), Q(high, _ALPHA))
    result.note("What benefits is the thin film in loaded rolling bearings and gear teeth, where "
                "contact pressures of thousands of bar thicken the oil enough to carry the load.")
    result.note("Barus describes the dynamic viscosity; the oil's density also rises a little with "
                "pressure, so the kinematic viscosity rises slightly less (a few % at {0}, from "
                "memory).", Q(350.0, _P))
    if alpha_from == "fitted":
        result.note("Readings at pressure need a rig rated for it: oil escaping under pressure "
                    "can pierce the skin (injection injury, get medical help at once); relieve "
                    "pressure before opening anything.")
    result.sources += ["Barus relation eta_p = eta_0 exp(alpha p): C. Barus, Am. J. Sci. 45 (1893), "
                       "from memory",
                       "Typical coefficients of mineral oils and the limit of the relation: from "
                       "memory"]
    return result
