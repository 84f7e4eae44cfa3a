"""Condition of an in-service oil: a reading or a lab report against limits.

Each property is read against a watch and an act limit; the tool's overall
verdict is the worst of them, and its findings are listed most urgent first.
A reading that reaches a limit counts as over it (a change of exactly 10 % is at
the act level, a reserve of exactly 25 % of new is at the act level).

Limits (all editable on the form, each with its basis):
- viscosity change of KV40 from the new oil: 5 % watch, 10 % act (common practice;
  ISO 3448 grades are themselves +-10 % wide);
- acid number rise over the new oil [mg KOH/g]: 0.3 watch, 0.5 act (common practice,
  from memory; some programs act only at 1.0);
- water [ppm]: 200 watch, 500 act (common practice for hydraulic oils);
- ISO 4406 code against the target: 1 code over watch, 2 or more act (common practice);
- oxidation reserve (RPVOT or similar, % of new): 50 % watch, 25 % act (ASTM D4378
  guidance for turbine oils, from memory).
"""

from __future__ import annotations

from ..kernel.errors import InputError
from ..kernel.grading import Band
from ..kernel.registry import AGEING, Field, Output, tool
from ..kernel.result import COMMON_PRACTICE, FROM_MEMORY, LEVELS, Q, Result
from ..methods.cleanliness import worst_excess
from ..methods.condition import acid_number_rise, viscosity_change_pct
from .cleanliness import add_cleanliness_verdict, code_from_fields, excess_text, scale_fields
from .water import OIL_CHOICES, calibration_fields, saturation_line

_KV, _PCT, _AN, _PPM = "kinematic_viscosity", "percent", "acid_number", "ppm"


def _limit(key: str, label: str, quantity: str, default: float, low: float, high: float,
           basis: str) -> Field:
    return Field(key, label, quantity, default, min=low, max=high, help=basis, group="limits")


# Each reading against its watch and act limits (typed on the form, so named); reaching a
# limit counts. Viscosity moves either way, each with its own likely causes.
_UP = ("check for a top-up with a heavier oil, oxidation (compare acid number) or water "
       "emulsion")
_DOWN = ("check for a top-up with a lighter oil, fuel or solvent, or shear of the viscosity "
         "improver")


def _viscosity_bands(causes: str) -> tuple[Band, ...]:
    """The viscosity change's bands, for one direction and its likely causes."""
    moved = "Viscosity {kv40} has moved {change} from the new oil's {new} "
    return (
        Band("act", moved + "(limit {act}): " + causes + "; change the oil or correct the mix.",
             at_least="act"),
        Band("watch", moved + "(limit {watch}): " + causes + "; resample and trend it.",
             at_least="watch"),
        Band("ok", "Viscosity {kv40} is within {change} of the new oil's {new}."),
    )


VISCOSITY_UP_BANDS = _viscosity_bands(_UP)
VISCOSITY_DOWN_BANDS = _viscosity_bands(_DOWN)
ACID_BANDS = (
    Band("act", "Acid number has risen {value} (act at {act}): the oil is oxidised or "
                "contaminated; plan an oil change and look for varnish and the cause of the "
                "heat.", at_least="act"),
    Band("watch", "Acid number has risen {value} (watch at {watch}): the oil is oxidising; check "
                  "for heat, air and water, and test the oxidation reserve.", at_least="watch"),
    Band("ok", "Acid number has risen {value}, below the watch limit {watch}."),
)
WATER_BANDS = (
    Band("act", "Water {value} (act at {act}): find and stop the entry (cooler leak, washdown, "
                "breather) and dry the oil with a dehydrator or change it.", at_least="act"),
    Band("watch", "Water {value} (watch at {watch}): check breathers, coolers and seals, and "
                  "drain free water from the tank bottom.", at_least="watch"),
    Band("ok", "Water {value} is below the watch limit {watch}."),
)
# Water against what the oil holds dissolved at its temperature (common practice, as the
# water-in-oil tool reads it): above saturation there is free water, above half of it free
# water drops out as the oil cools.
SATURATION_BANDS = (
    Band("act", "Water {value} is {share} of what this oil holds dissolved at {temp}: there is "
                "free water; drain the tank bottom, find the way in and dry the oil.",
         at_least=100.0),
    Band("watch", "Water {value} is {share} of what this oil holds dissolved at {temp}: free "
                  "water drops out as it cools; check breathers, coolers and seals.",
         at_least=50.0),
    Band("ok", "Water {value} is only {share} of what this oil holds dissolved at {temp}."),
)
UNKNOWN_OIL = "unknown"
OIL_TYPE_CHOICES = ((UNKNOWN_OIL, "Not known"),) + OIL_CHOICES
RESERVE_BANDS = (
    Band("act", "Oxidation reserve {value} of new (act at {act}): the antioxidant is nearly "
                "spent; plan the oil change and flush if there is varnish.", at_most="act",
         basis=FROM_MEMORY),
    Band("watch", "Oxidation reserve {value} of new (watch at {watch}): sample more often; the "
                  "oxidation-trend tool estimates when it reaches the limit.", at_most="watch"),
    Band("ok", "Oxidation reserve {value} of new is above the watch level {watch}."),
)


def _limits(quantity: str, value: float, watch: float, act: float) -> dict:
    return {"value": Q(value, quantity), "watch": Q(watch, quantity), "act": Q(act, quantity)}


@tool(
    "oil-condition",
    title="Oil condition check",
    summary="A reading or lab report against watch and act limits: viscosity change, acid "
            "number, water, cleanliness and oxidation reserve, with one overall verdict.",
    topic=AGEING,
    renamed={"kv40": "kv40_now"},
    inputs=(
        Field("kv40_new", "KV40 of the new oil", _KV, 46.0, min=1.0, max=10000.0,
              binds="kv40_new",
              help="From the new-oil data sheet or the first sample.", usual=(9.0, 750.0)),
        Field("kv40_now", "KV40 now", _KV, 49.5, min=1.0, max=10000.0, tracks="kv40", usual=(9.0, 750.0)),
        Field("an_new", "Acid number of the new oil", _AN, None, min=0.0, max=20.0, optional=True,
              binds="an_new"),
        Field("an_now", "Acid number now", _AN, None, min=0.0, max=50.0, optional=True,
              tracks="acid_number"),
        Field("ppm", "Water", _PPM, None, min=0.0, max=1.0e6, optional=True,
              tracks="water_ppm"),
        Field("temp", "Oil temperature at sampling", "temperature", None, min=-40.0, max=150.0,
              tracks="oil_temp",
              optional=True, help="With the oil type, the water is read against saturation."),
        Field("oil", "Oil type", "choice", UNKNOWN_OIL, choices=OIL_TYPE_CHOICES,
              binds="oil_family", help="Sets how much water the oil holds dissolved (the "
                                    "water-in-oil tool's presets, from memory)."),
        *calibration_fields(),
        *scale_fields("code", "ISO 4406 code now", "Blank for a size not reported ('-').",
                      reading=True),
        *scale_fields("target", "ISO 4406 target", "From the iso-4406 tool or the machine "
                      "maker.", target=True),
        Field("reserve", "Oxidation reserve, % of new", _PCT, None, min=0.0, max=200.0,
              tracks="oxidation_reserve",
              optional=True, help="RPVOT or similar, as a % of the new oil's result."),
        _limit("visc_watch", "Viscosity change: watch", _PCT, 5.0, 0.5, 50.0, "common practice"),
        _limit("visc_act", "Viscosity change: act", _PCT, 10.0, 1.0, 80.0,
               "common practice; ISO 3448 grades are ±10 % wide"),
        _limit("an_watch", "Acid number rise: watch", _AN, 0.3, 0.01, 10.0,
               "common practice, from memory"),
        _limit("an_act", "Acid number rise: act", _AN, 0.5, 0.02, 20.0,
               "common practice, from memory; some programs act at 1.0"),
        _limit("water_watch", "Water: watch", _PPM, 200.0, 10.0, 1.0e5, "common practice"),
        _limit("water_act", "Water: act", _PPM, 500.0, 20.0, 1.0e5, "common practice"),
        _limit("reserve_watch", "Oxidation reserve: watch", _PCT, 50.0, 2.0, 99.0,
               "common practice"),
        _limit("reserve_act", "Oxidation reserve: act", _PCT, 25.0, 1.0, 95.0,
               "ASTM D4378 guidance, from memory"),
    ),
    outputs=(
        Output("level", "Overall verdict", "text", headline=True),
        Output("visc_change", "Viscosity change", _PCT, tracks="kv40_change"),
        Output("an_rise", "Acid number rise", _AN, tracks="acid_rise"),
        Output("water_saturation", "Water, % of saturation at the oil's temperature", _PCT,
               tracks="water_saturation"),
        Output("excess", "Cleanliness: codes over target", "text"),
        Output("findings", "Findings over a limit", "text", headline=True),
    ),
)
def oil_condition(kv40_new: float, kv40_now: float, an_new: float | None = None,
                  an_now: float | None = None, ppm: float | None = None,
                  temp: float | None = None, oil: str = UNKNOWN_OIL,
                  cal_temp1: float | None = None, cal_ppm1: float | None = None,
                  cal_temp2: float | None = None, cal_ppm2: float | None = None,
                  code4: float | None = None, code6: float | None = None,
                  code14: float | None = None, target4: float | None = None,
                  target6: float | None = None, target14: float | None = None,
                  reserve: float | None = None, visc_watch: float = 5.0, visc_act: float = 10.0,
                  an_watch: float = 0.3, an_act: float = 0.5, water_watch: float = 200.0,
                  water_act: float = 500.0, reserve_watch: float = 50.0,
                  reserve_act: float = 25.0) -> Result:
    """Every reading given against its limits; the worst level is the verdict."""
    kv40 = kv40_now
    for watch_key, watch, act in (("visc_watch", visc_watch, visc_act),
                                  ("an_watch", an_watch, an_act),
                                  ("water_watch", water_watch, water_act)):
        if act <= watch:
            raise InputError(watch_key, "the watch limit must be below the act limit")
    if reserve_act >= reserve_watch:
        raise InputError("reserve_watch", "the watch level must be above the act level")
    if an_now is not None and an_new is None:  # the new oil's alone (a card's) is no reading
        raise InputError("an_new", "enter the new oil's acid number too, to see the rise")
    code = code_from_fields("code", (code4, code6, code14))
    target = code_from_fields("target", (target4, target6, target14))
    has_code, has_target = any(n is not None for n in code), any(n is not None for n in target)
    if has_code and not has_target:  # a target alone (as a machine card gives) is no reading
        raise InputError("target6", "enter the target for the code, or leave the code blank "
                                    "(the iso-4406 tool gives typical targets)")

    result = Result(values={"level": "ok", "visc_change": None, "an_rise": None,
                            "water_saturation": None,
                            "excess": None, "findings": "0"})
    change = viscosity_change_pct(kv40, kv40_new)
    result.values["visc_change"] = change
    result.grade(abs(change), VISCOSITY_UP_BANDS if change > 0 else VISCOSITY_DOWN_BANDS,
                 COMMON_PRACTICE, kv40=Q(kv40, _KV), new=Q(kv40_new, _KV),
                 change=Q(abs(change), _PCT), watch=Q(visc_watch, _PCT), act=Q(visc_act, _PCT))
    if an_now is not None:
        rise = acid_number_rise(an_now, an_new)
        result.values["an_rise"] = rise
        result.grade(rise, ACID_BANDS, FROM_MEMORY, **_limits(_AN, rise, an_watch, an_act))
    if ppm is not None:
        result.grade(ppm, WATER_BANDS, COMMON_PRACTICE,
                     **_limits(_PPM, ppm, water_watch, water_act))
        if temp is not None and oil != UNKNOWN_OIL:
            line = saturation_line(oil, cal_temp1, cal_ppm1, cal_temp2, cal_ppm2)
            share = 100.0 * ppm / line.saturation(temp)
            result.values["water_saturation"] = share
            result.grade(share, SATURATION_BANDS, COMMON_PRACTICE, value=Q(ppm, _PPM),
                         share=Q(share, _PCT), temp=Q(temp, "temperature"))
        else:
            result.note("Give the oil's temperature at sampling and its type to read the water "
                        "against saturation too, as the water-in-oil tool does.")
    if has_code:
        result.values["excess"] = excess_text(worst_excess(code, target))
        add_cleanliness_verdict(result, code, target)
    if reserve is not None:
        result.grade(reserve, RESERVE_BANDS, COMMON_PRACTICE,
                     **_limits(_PCT, reserve, reserve_watch, reserve_act))
    result.verdicts.sort(key=lambda v: -LEVELS.index(v.level))  # most urgent first
    result.values["level"] = result.level
    result.values["findings"] = str(sum(v.level != "ok" for v in result.verdicts))
    result.note("One sample can mislead: confirm a bad result with a second sample taken the "
                "same way before a costly action, and trend every result over time.")
    result.note("Sampling a running machine: the line is under pressure and the oil may be hot; "
                "keep hands away from leaks (injection injury). Dispose of used oil and wipes as "
                "the site's rules require.")
    result.sources += ["Viscosity change vs new oil: common practice (ISO 3448 grades ±10 %)",
                       "Acid number rise (ASTM D664 / D974 results): common practice, from memory",
                       "Water limits: common practice",
                       "ISO 4406 code vs target: common practice",
                       "Oxidation reserve limits: ASTM D4378 guidance, from memory"]
    return result
