"""The oil-life tools: oxidation life against temperature and the life a temperature profile
has used (calc.methods.ageing), and the remaining life from a trend of oxidation-reserve
readings against its watch and condemning levels.
"""

from __future__ import annotations

import math
from functools import partial

from ..kernel import chart, units
from ..kernel.errors import InputError
from ..kernel.grading import Band
from ..kernel.registry import AGEING, Field, Output, tool
from ..kernel.result import COMMON_PRACTICE, FROM_MEMORY, Q, Result
from ..methods.ageing import (DOUBLING_STEP_K, activation_energy_for_doubling,
                              equivalent_hours, equivalent_temperature_arrhenius,
                              equivalent_temperature_doubling, hours_to_limit, life_arrhenius,
                              life_doubling)


# Demo figure for the form, not a property of any oil: a reference life at 60 degC.
DEMO_LIFE_H = 10000.0
DEMO_TEMP_C = 60.0
METHOD_CHOICES = (("doubling", "Doubles every 10 K (rule of thumb)"),
                  ("arrhenius", "Arrhenius"))
PROFILE_ROWS = 4
FAR_K = 30.0  # beyond this from the reference, both models are far extrapolations
HOT_OIL_C = 80.0  # common practice: mineral hydraulic oil ages fast above this
_T, _H = "temperature", "hours"


def _profile_fields() -> tuple[Field, ...]:
    fields = []
    demo = ((3000.0, 50.0), (1500.0, 65.0))
    for row in range(1, PROFILE_ROWS + 1):
        hours, temp = demo[row - 1] if row <= len(demo) else (None, None)
        optional = row > len(demo)
        fields += [Field(f"hours{row}", f"Profile {row}: hours", _H, hours, min=0.0, max=1.0e6,
                         optional=optional),
                   Field(f"temp{row}", f"Profile {row}: oil temperature", _T, temp,
                         min=-40.0, max=200.0, optional=optional)]
    return tuple(fields)


def _profile(pairs: tuple[tuple[float | None, float | None], ...]) -> list[tuple[float, float]]:
    """The filled-in (hours, temperature) rows; InputError for a half-filled row."""
    rows = []
    for row, (hours, temp) in enumerate(pairs, start=1):
        if (hours is None) != (temp is None):
            missing = f"temp{row}" if temp is None else f"hours{row}"
            raise InputError(missing, "profile row {row} needs both hours and a temperature",
                             row=Q(float(row), "count"))
        if hours is not None:
            rows.append((hours, temp))
    return rows


CHART_W, CHART_H = 400.0, 330.0
CHART_DECADES = 8
_CHART_BOX = (58.0, 34.0, 328.0, 236.0)  # left, top, width, height of the plot, viewBox units


def life_chart(ref_life_h: float, ref_temp_c: float, temp_c: float, doubling, arrhenius,
               system: str = "metric") -> str:
    """SVG of life against temperature by both models (log life), the point at `temp_c`;
    temperature labelled in `system` units, ticks round in the shown unit."""
    t_low = min(ref_temp_c, temp_c) - 20.0
    t_high = max(ref_temp_c, temp_c) + 20.0
    temps = [t_low + (t_high - t_low) * k / 40 for k in range(41)]
    lives = [model(t, ref_life_h) for model in (doubling, arrhenius) for t in temps]
    # A steep model can run a life down to nothing (or past a float) at the edges: the log
    # axis spans at most CHART_DECADES below the longest life, and lines are held inside it.
    high = max(v for v in lives if math.isfinite(v)) * 1.5
    low = max(min(v for v in lives if v > 0.0) / 1.5, high * 10.0 ** -CHART_DECADES)
    ax = chart.Axes((t_low, t_high), (low, high), _CHART_BOX, y_scale=math.log10)
    inside = lambda v: min(max(v, low), high)  # noqa: E731
    life_now = inside(doubling(temp_c, ref_life_h))
    px, py = ax.point(temp_c, life_now)
    show = lambda value, quantity: units.show(value, quantity, system)  # noqa: E731
    body = [
        chart.frame(ax, chart.unit_ticks(t_low, t_high, _T, system), chart.ticks_125(*ax.y_range),
                    f"Oil temperature, {units.unit_label(_T, system)}",
                    f"Life, {units.unit_label(_H, system)} (log scale)", chart.short),
        chart.polyline([ax.point(t, inside(doubling(t, ref_life_h))) for t in temps],
                       "life-doubling",
                       "#12357a", 4.0),
        chart.polyline([ax.point(t, inside(arrhenius(t, ref_life_h))) for t in temps],
                       "life-arrhenius",
                       "#8b1a1a", 2.5, "8 5"),
        chart.marker(px, py, "operating-point"),
        chart.text(_CHART_BOX[0] + 6, _CHART_BOX[1] + _CHART_BOX[3] - 8,
                   "solid: doubles per step; dashed: Arrhenius", "legend"),
    ]
    title = f"Oil life against temperature: {show(life_now, _H)} at {show(temp_c, _T)}"
    desc = (f"Life halves for each step of heat from {show(ref_life_h, _H)} at "
            f"{show(ref_temp_c, _T)} (solid line); the Arrhenius line (dashed) bends away from it.")
    return chart.document(CHART_W, CHART_H, title, desc, body, "chart chart-life")


@tool(
    "oxidation-life",
    title="Oxidation life and temperature",
    summary="How oil life shortens with heat, and how much of it a run of hours at "
            "several temperatures has used.",
    topic=AGEING,
    inputs=(
        Field("ref_life", "Reference life", _H, DEMO_LIFE_H, min=1.0, max=1.0e7,
              help="Life of your oil at the reference temperature: from the oil maker, the "
                   "site's history or a test. The starting figure is a demo, not a property "
                   "of any oil."),
        Field("ref_temp", "Reference temperature", _T, DEMO_TEMP_C, min=0.0, max=200.0),
        Field("temp", "Oil temperature to check", _T, 70.0, min=-40.0, max=200.0),
        Field("method", "Life model for the profile", "choice", "doubling",
              choices=METHOD_CHOICES),
        Field("step", "Heat that halves the life", "temperature_difference", DOUBLING_STEP_K,
              min=3.0, max=30.0, help="10 K is the rule of thumb (common practice).", when=("method", "doubling"), group="limits"),
        Field("activation", "Activation energy", "molar_energy", None, min=10.0, max=300.0,
              optional=True, help="Leave blank to match the rule of thumb at the reference "
                                  "temperature.", when=("method", "arrhenius")),
        *_profile_fields(),
    ),
    outputs=(
        Output("life_doubling", "Life at temperature, doubling rule", _H, headline=True),
        Output("life_arrhenius", "Life at temperature, Arrhenius", _H),
        Output("activation_used", "Activation energy used", "molar_energy"),
        Output("profile_hours", "Profile hours", _H),
        Output("equivalent_hours", "Equivalent hours at reference temperature", _H),
        Output("life_used", "Life used by the profile", "percent"),
        Output("life_at_profile", "Total life at this duty", _H,
               "Life if the oil kept running the profile's mix of temperatures."),
        Output("equivalent_temp", "Equivalent steady temperature", _T),
    ),
)
def oxidation_life(ref_life: float, ref_temp: float, temp: float, method: str, step: float,
                   activation: float | None = None,
                   hours1: float | None = None, temp1: float | None = None,
                   hours2: float | None = None, temp2: float | None = None,
                   hours3: float | None = None, temp3: float | None = None,
                   hours4: float | None = None, temp4: float | None = None) -> Result:
    """Life at `temp` by both models, and the life a temperature profile has used."""
    activation_j = activation * 1000.0 if activation is not None \
        else activation_energy_for_doubling(ref_temp, step)
    doubling = lambda t, life: life_doubling(t, life, ref_temp, step)  # noqa: E731
    arrhenius = lambda t, life: life_arrhenius(t, life, ref_temp, activation_j)  # noqa: E731
    model = doubling if method == "doubling" else arrhenius
    profile = _profile(((hours1, temp1), (hours2, temp2), (hours3, temp3), (hours4, temp4)))
    total = sum(h for h, _t in profile)
    eq_h = equivalent_hours(profile, ref_temp, model)
    used = eq_h / ref_life
    values = {
        "life_doubling": doubling(temp, ref_life),
        "life_arrhenius": arrhenius(temp, ref_life),
        "activation_used": activation_j / 1000.0,
        "profile_hours": total,
        "equivalent_hours": eq_h,
        "life_used": used * 100.0,
        "life_at_profile": ref_life * total / eq_h if eq_h > 0.0 else None,
        "equivalent_temp": None,
    }
    if eq_h > 0.0:
        values["equivalent_temp"] = (
            equivalent_temperature_doubling(total, eq_h, ref_temp, step) if method == "doubling"
            else equivalent_temperature_arrhenius(total, eq_h, ref_temp, activation_j))
    result = Result(values=values)
    result.charts["life"] = partial(life_chart, ref_life, ref_temp, temp, doubling, arrhenius)
    result.grade(used, LIFE_USED_BANDS, COMMON_PRACTICE, equivalent=Q(eq_h, _H), life=Q(ref_life, _H))
    speed = ref_life / model(temp, ref_life)
    result.note("At {0} the oil ages {1} times as fast as at {2}.",
                Q(temp, _T), Q(speed, "ratio"), Q(ref_temp, _T))
    hottest = max([temp] + [t for _h, t in profile])
    if any(abs(t - ref_temp) > FAR_K for t in [temp] + [t for _h, t in profile]):
        result.note("Temperatures more than {0} from the reference are far extrapolations: "
                    "both models are rough there and part ways; trust oil tests over them.",
                    Q(FAR_K, "temperature_difference"))
    if hottest > HOT_OIL_C:
        result.note("Above about {0} mineral hydraulic oil ages fast and additives and seals "
                    "suffer (common practice); find out why it runs hot. Hot oil and surfaces "
                    "burn: let them cool before touching.", Q(HOT_OIL_C, _T))
    if ref_life == DEMO_LIFE_H and ref_temp == DEMO_TEMP_C:
        result.note("The reference life of {0} at {1} is the form's demo figure, not a "
                    "property of any oil: enter your oil's figure.",
                    Q(ref_life, _H), Q(ref_temp, _T))
    result.sources += ["Rate doubles per 10 K: common practice",
                       "Arrhenius equation (IUPAC Gold Book); R from CODATA 2018",
                       "Life used: Miner-style sum of hours weighted by rate"]
    return result


# The share of the reference life a profile has used (common practice).
LIFE_USED_BANDS = (
    Band("act", "The profile has used all of the reference life ({equivalent} equivalent of "
                "{life}): have the oil tested (oxidation reserve, acid number, viscosity) before "
                "trusting it further.", at_least=1.0),
    Band("watch", "The profile has used over three quarters of the reference life "
                  "({equivalent} equivalent of {life}): sample the oil and plan the change.",
         at_least=0.75),
    Band("ok", "The profile has used less than three quarters of the reference life "
               "({equivalent} equivalent of {life})."),
)
# The oxidation reserve against its condemning limit (ASTM D4378 guidance, from memory) and
# its watch level (common practice), now and by the next sample at the present rate: a level
# crossed before the next sample is acted on now, not found late.
_CONDEMNED = Band("act", "The reserve is {now} of new, at or below the condemning limit of "
                         "{limit}: plan the oil change now and check the acid number and for "
                         "varnish.", at_most="limit", basis=FROM_MEMORY)
RESERVE_BANDS = (
    _CONDEMNED,
    Band("watch", "The reserve is {now} of new, at or below the watch level of {watch}: sample "
                  "more often and look for heat, air and water that speed oxidation.",
         at_most="watch"),
    Band("ok", "The reserve is {now} of new, above the watch level of {watch}, and stays above it "
               "past the next sample in {next_sample}."),
)
RESERVE_BANDS_LIMIT_SOON = (
    _CONDEMNED,
    Band("act", "At this rate the reserve reaches the condemning limit of {limit} in {to_limit}, "
                "before the next sample in {next_sample}: plan the oil change now and sample "
                "sooner."),
)
RESERVE_BANDS_WATCH_SOON = RESERVE_BANDS[:2] + (
    Band("watch", "At this rate the reserve reaches the watch level of {watch} in {to_watch}, "
                  "before the next sample in {next_sample}: sample sooner and look for heat, air "
                  "and water that speed oxidation."),
)


@tool(
    "oxidation-trend",
    title="Remaining life from oxidation reserve",
    summary="When the oil's oxidation reserve (RPVOT or % of new) reaches its condemning "
            "limit, by a straight line through two readings.",
    topic=AGEING,
    inputs=(
        Field("new_value", "Reading of the new oil", "ratio", 100.0, min=0.001, max=1.0e5,
              help="100 when readings are % of new; the new oil's RPVOT minutes when readings "
                   "are in minutes.", usual=(0.001, 1.0e5)),
        Field("reserve_before", "Earlier reading", "ratio", 80.0, min=0.0, max=1.0e5, usual=(0.0, 1.0e5)),
        Field("reserve_now", "Reading now", "ratio", 62.0, min=0.0, max=1.0e5, usual=(0.0, 1.0e5)),
        Field("interval", "Hours between the readings", _H, 2000.0, min=1.0, max=1.0e6,
              help="Running hours, or calendar hours (days × 24); the answer comes out in the "
                   "same kind of hours."),
        Field("limit_pct", "Condemning limit, % of new", "percent", 25.0, min=1.0, max=95.0,
              help="25 % of new: common practice for turbine oils (ASTM D4378, from memory).", group="limits"),
        Field("watch_pct", "Watch level, % of new", "percent", 50.0, min=2.0, max=99.0, group="limits"),
        Field("next_sample", "Hours to the next sample", _H, None, min=1.0, max=1.0e6,
              optional=True, help="Blank: the same as the hours between the two readings."),
    ),
    outputs=(
        Output("reserve_pct", "Reserve now, % of new", "percent", tracks="oxidation_reserve"),
        Output("loss_per_1000h", "Loss per 1000 h, % of new", "percent"),
        Output("hours_to_watch", "Hours until the watch level", _H),
        Output("hours_to_limit", "Hours until the condemning limit", _H, headline=True),
    ),
)
def oxidation_trend(new_value: float, reserve_before: float, reserve_now: float,
                    interval: float, limit_pct: float, watch_pct: float,
                    next_sample: float | None = None) -> Result:
    """Straight-line extrapolation of the oxidation reserve to the watch and condemning levels."""
    if watch_pct <= limit_pct:
        raise InputError("watch_pct", "the watch level must be above the condemning limit")
    # A reserve is what is left of the new oil's: a reading well above the new oil's is a
    # mistyped figure or the wrong new-oil value (10 % over allows for the test's repeatability,
    # common practice).
    for key, reading in (("reserve_before", reserve_before), ("reserve_now", reserve_now)):
        if reading > 1.1 * new_value:
            raise InputError(key, "{reading} is more than the new oil's {new}: an oxidation "
                             "reserve only falls; check this reading and the new oil's value",
                             reading=Q(reading, "ratio"), new=Q(new_value, "ratio"))
    # Rounded to 1e-9 % so that a reading exactly on a limit stays on it.
    now_pct = round(reserve_now / new_value * 100.0, 9)
    before_pct = round(reserve_before / new_value * 100.0, 9)
    to_limit = hours_to_limit(now_pct, before_pct, interval, limit_pct)
    to_watch = hours_to_limit(now_pct, before_pct, interval, watch_pct)
    result = Result(values={
        "reserve_pct": now_pct,
        "loss_per_1000h": (before_pct - now_pct) / interval * 1000.0,
        "hours_to_watch": to_watch,
        "hours_to_limit": to_limit,
    })
    ahead = interval if next_sample is None else next_sample
    if to_limit is not None and to_limit <= ahead:
        bands = RESERVE_BANDS_LIMIT_SOON
    elif to_watch is not None and to_watch <= ahead:
        bands = RESERVE_BANDS_WATCH_SOON
    else:
        bands = RESERVE_BANDS
    result.grade(now_pct, bands, COMMON_PRACTICE, now=Q(now_pct, "percent"),
                 limit=Q(limit_pct, "percent"), watch=Q(watch_pct, "percent"),
                 to_limit=Q(to_limit, _H), to_watch=Q(to_watch, _H), next_sample=Q(ahead, _H))
    if to_limit is None:
        result.note("The reading is not falling between the two samples, so no end date can "
                    "be drawn; check that both were tested the same way.")
    result.note("The reserve often falls slowly and then fast once the antioxidant is spent: "
                "a straight line can be optimistic late in life, so sample more often there.")
    result.sources += ["Linear extrapolation between two readings",
                       "Condemning limit 25 % of new RPVOT: ASTM D4378 guidance, from memory",
                       "Watch level 50 % of new: common practice"]
    return result
