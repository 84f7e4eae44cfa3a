"""The unit-convert tool: plain units through one base unit of their kind by the exact factors
of calc.kernel.constants (NIST SP 811, appendix B), temperatures, and kinematic viscosity to
Saybolt seconds (ASTM D2161, calc.methods.convert).
"""

from __future__ import annotations

from ..kernel import units
from ..kernel.constants import ABSOLUTE_ZERO_C, GAL_IN_L, HP_IN_KW, PSI_IN_BAR, \
    STANDARD_ATMOSPHERE_BAR
from ..kernel.errors import InputError
from ..kernel.registry import UNITS, Field, Output, tool
from ..kernel.result import Q, Result
from ..methods.convert import (SUS_KV_MAX_CST, SUS_KV_MIN_CST, celsius_to_fahrenheit,
                              fahrenheit_to_celsius, kinematic_from_saybolt, saybolt_seconds)

# (key, label, kind, metric units per unit). Base units: °C, bar, L, L/min, kW, ppm, cSt.
# Factors: NIST SP 811 (2008) appendix B, via calc.kernel.constants; 1 % = 10 000 ppm by definition.
LINEAR_UNITS = (
    ("bar", "bar", "pressure", 1.0),
    ("psi", "psi", "pressure", PSI_IN_BAR),
    ("kpa", "kPa", "pressure", 0.01),
    ("mpa", "MPa", "pressure", 10.0),
    ("atm", "atm (standard)", "pressure", STANDARD_ATMOSPHERE_BAR),
    ("l", "L", "volume", 1.0),
    ("usgal", "US gal", "volume", GAL_IN_L),
    ("lpm", "L/min", "flow", 1.0),
    ("gpm", "US gpm", "flow", GAL_IN_L),
    ("kw", "kW", "power", 1.0),
    ("hp", "hp (mechanical)", "power", HP_IN_KW),
    ("ppm", "ppm", "concentration", 1.0),
    ("percent", "%", "concentration", 1.0e4),
    ("cst", "cSt (mm²/s)", "viscosity", 1.0),
)
TEMPERATURE_UNITS = (("c", "°C"), ("f", "°F"))
# Saybolt Universal Seconds at 100 °F, 210 °F, or at the temperature entered [degF or None].
SUS_UNITS = (("sus_100f", "SUS at 100 °F", 100.0), ("sus_210f", "SUS at 210 °F", 210.0),
             ("sus_at_temp", "SUS at the temperature entered", None))

UNIT_CHOICES = (tuple((k, label) for k, label in TEMPERATURE_UNITS)
                + tuple((k, label) for k, label, _, _ in LINEAR_UNITS)
                + tuple((k, label) for k, label, _ in SUS_UNITS))
_LABELS = dict(UNIT_CHOICES)
_KIND = {**{k: "temperature" for k, _ in TEMPERATURE_UNITS},
         **{k: kind for k, _, kind, _ in LINEAR_UNITS},
         **{k: "viscosity" for k, _, _ in SUS_UNITS}}
_FACTOR = {k: f for k, _, _, f in LINEAR_UNITS}
_SUS_TEMP_F = {k: t for k, _, t in SUS_UNITS}


def _check_value(value: float, unit: str, temp_f: float) -> None:
    kind = _KIND[unit]
    if kind == "temperature":
        temp_c = value if unit == "c" else fahrenheit_to_celsius(value)
        if temp_c <= ABSOLUTE_ZERO_C:
            raise InputError("value", "is at or below absolute zero ({zero})",
                             zero=Q(ABSOLUTE_ZERO_C, "temperature"))
    elif kind == "pressure":
        # Gauge pressures below atmospheric are negative, down to a full vacuum at most.
        vacuum = -STANDARD_ATMOSPHERE_BAR / _FACTOR[unit]
        if value < vacuum * (1.0 + 1e-9):
            shown = f"{units.format_number(vacuum, 4)} {_LABELS[unit].split(' ')[0]}"
            raise InputError("value", "is below a full vacuum ({vacuum} gauge): a gauge pressure "
                             "is at least minus one atmosphere", vacuum=Q(shown, "text"))
    elif value < 0:
        raise InputError("value", "a {kind} cannot be negative", kind=Q(kind, "text"))
    elif unit in _SUS_TEMP_F:
        temp_f = _SUS_TEMP_F[unit] or temp_f
        low, high = (saybolt_seconds(kv, temp_f) for kv in (SUS_KV_MIN_CST, SUS_KV_MAX_CST))
        if not low <= value <= high:
            raise InputError("value", "ASTM D2161 covers {low} to {high} SUS at this temperature "
                                      "({kv_low} to {kv_high})", low=Q(low, "seconds"),
                             high=Q(high, "seconds"), kv_low=Q(SUS_KV_MIN_CST, "kinematic_viscosity"),
                             kv_high=Q(SUS_KV_MAX_CST, "kinematic_viscosity"))


def _to_base(value: float, unit: str, temp_f: float) -> float:
    if unit == "c":
        return value
    if unit == "f":
        return fahrenheit_to_celsius(value)
    if unit in _SUS_TEMP_F:
        return kinematic_from_saybolt(value, _SUS_TEMP_F[unit] or temp_f)
    return value * _FACTOR[unit]


def _from_base(base: float, unit: str, temp_f: float) -> float:
    if unit == "c":
        return base
    if unit == "f":
        return celsius_to_fahrenheit(base)
    if unit in _SUS_TEMP_F:
        if not SUS_KV_MIN_CST <= base <= SUS_KV_MAX_CST:
            raise InputError("value", "ASTM D2161 covers {kv_low} to {kv_high}, not {kv}",
                             kv_low=Q(SUS_KV_MIN_CST, "kinematic_viscosity"),
                             kv_high=Q(SUS_KV_MAX_CST, "kinematic_viscosity"),
                             kv=Q(base, "kinematic_viscosity"))
        return saybolt_seconds(base, _SUS_TEMP_F[unit] or temp_f)
    return base / _FACTOR[unit]


def convert(value: float, from_unit: str, to_unit: str, temp_c: float = 37.77777777777778) -> float:
    """`value` in `from_unit` expressed in `to_unit` (keys of UNIT_CHOICES).

    `temp_c` [degC] is the temperature of a Saybolt reading for "sus_at_temp".

    >>> round(convert(1.0, "bar", "psi"), 4)
    14.5038
    >>> round(convert(1.0, "atm", "bar"), 12)
    1.01325
    """
    if _KIND[from_unit] != _KIND[to_unit]:
        raise InputError("to_unit", "{to} is a unit of {to_kind}, {frm} one of {kind}: pick a "
                                    "{kind} unit to convert to", to=Q(_LABELS[to_unit], "text"),
                         to_kind=Q(_KIND[to_unit], "text"), frm=Q(_LABELS[from_unit], "text"),
                         kind=Q(_KIND[from_unit], "text"))
    temp_f = celsius_to_fahrenheit(temp_c)
    _check_value(value, from_unit, temp_f)
    return _from_base(_to_base(value, from_unit, temp_f), to_unit, temp_f)


def _plain(value: float) -> str:
    """Six significant figures without trailing zeros: "46", "14.5038"."""
    text = units.format_number(value, 6)
    return text.rstrip("0").rstrip(".") if "." in text else text


@tool(
    "unit-convert",
    title="Unit converter",
    summary="Temperature, pressure, volume, flow, power, ppm and %, and cSt to Saybolt seconds "
            "(ASTM D2161) and back.",
    topic=UNITS,
    inputs=(
        Field("value", "Value", "ratio", 46.0, min=-1.0e9, max=1.0e9, usual=(-1.0e9, 1.0e9)),
        Field("from_unit", "From", "choice", "cst", choices=UNIT_CHOICES),
        Field("to_unit", "To", "choice", "sus_100f", choices=UNIT_CHOICES),
        Field("temp", "Temperature of the Saybolt reading", "temperature", 37.77777777777778,
              min=-20.0, max=200.0, help="Only for “SUS at the temperature entered”.", group="limits"),
    ),
    outputs=(
        Output("converted", "Converted value", "ratio", "In the unit picked under “To”."),
        Output("text", "Conversion", "text", headline=True),
    ),
)
def unit_convert(value: float, from_unit: str, to_unit: str, temp: float) -> Result:
    """One conversion between two units of the same kind."""
    converted = convert(value, from_unit, to_unit, temp)
    shown = f"{_plain(value)} {_LABELS[from_unit]} = {_plain(converted)} {_LABELS[to_unit]}"
    result = Result(values={"converted": converted, "text": shown})
    kinds = {_KIND[from_unit], _KIND[to_unit]}
    sus = {from_unit, to_unit} & set(_SUS_TEMP_F)
    if sus:
        result.sources.append("ASTM D2161 (Saybolt Universal Seconds; equations from memory of "
                              "the standard, checked against chemicals.viscosity)")
        if "sus_at_temp" in sus:
            result.note("Saybolt seconds at {0}: the 100 °F value times (1 + 0.000061 (t - 100)), "
                        "t in °F (ASTM D2161).", Q(temp, "temperature"))
    if "pressure" in kinds:
        result.note("Gauge stays gauge and absolute stays absolute: the conversion does not add "
                    "the atmosphere.")
    if "concentration" in kinds:
        result.note("ppm and % are both by mass here (1 % = 10 000 ppm); water sensors that "
                    "report % saturation use another scale.")
    result.sources.append("NIST SP 811 (2008), appendix B: exact factors (1 atm = 1.01325 bar, "
                          "1 US gal = 3.785411784 L, 1 psi = 0.0689476 bar, 1 hp = 0.7457 kW)")
    return result
