"""Quantities, unit systems and the parsing of typed numbers.

calc computes in the trade's metric units only. Every registry field names a
quantity; this module converts that quantity between the metric unit calc uses
and the unit a US technician reads, at the edge (the bridge and the CLI), and
nowhere else.

>>> to_metric(140.0, "temperature", "us")
60.0
>>> round(from_metric(100.0, "pressure", "us"), 1)
1450.4
>>> parse_number("46,5", "kv40")
46.5
"""

from __future__ import annotations

import math
import re
from dataclasses import dataclass
from typing import Callable

from .constants import (FOOT_IN_M, GAL_IN_L, HP_IN_KW, INCH_IN_MM, LB_IN_KG, LBF_IN_KN,
                        PSI_IN_BAR)
from .errors import InputError, typed
from .result import Q

SYSTEMS = ("metric", "us")


def _identity(x: float) -> float:
    return x


def _scale(factor: float) -> tuple[Callable[[float], float], Callable[[float], float]]:
    """(metric -> us, us -> metric) for a plain proportional unit."""
    return (lambda x: x / factor, lambda x: x * factor)


@dataclass(frozen=True)
class Quantity:
    """A physical quantity: its metric unit, its US unit and the conversions.

    ``to_us`` maps a metric value to the US unit, ``to_metric`` the reverse.

    How people read it (the one place rounding is declared; page, print and CLI text all
    show through `show`, the JSON keeps full precision): ``digits`` significant figures,
    trailing zeros dropped ("0.8 bar", not "0.8000 bar"); or ``decimals`` fixed decimals
    (a temperature to 0.1 degree, a count or a VI as a whole number); or ``style`` "duration"
    for a time in hours or minutes ("1 h 50 min").
    """

    name: str
    metric: str
    us: str
    to_us: Callable[[float], float] = _identity
    to_metric: Callable[[float], float] = _identity
    digits: int = 3
    decimals: int | None = None  # fixed decimals instead of significant figures
    style: str = "number"  # or "duration": minutes and hours as "1 h 50 min"

    def unit(self, system: str) -> str:
        return self.us if system == "us" else self.metric


def _quantity(name: str, metric: str, us: str | None = None, factor: float | None = None,
              digits: int = 3, decimals: int | None = None, style: str = "number") -> Quantity:
    """A quantity whose US unit is `factor` metric units (1 US unit = factor metric)."""
    if factor is None:
        return Quantity(name, metric, us or metric, digits=digits, decimals=decimals, style=style)
    to_us, to_metric = _scale(factor)
    return Quantity(name, metric, us or metric, to_us, to_metric, digits, decimals, style)


_FT2_IN_M2 = FOOT_IN_M ** 2

QUANTITIES: dict[str, Quantity] = {q.name: q for q in (
    Quantity("temperature", "°C", "°F",
             to_us=lambda c: c * 9.0 / 5.0 + 32.0,
             to_metric=lambda f: (f - 32.0) * 5.0 / 9.0, decimals=1),
    Quantity("temperature_difference", "K", "°F",
             to_us=lambda k: k * 9.0 / 5.0, to_metric=lambda f: f * 5.0 / 9.0, decimals=1),
    _quantity("kinematic_viscosity", "cSt"),
    _quantity("pressure", "bar", "psi", PSI_IN_BAR, digits=4),
    # An absolute pressure: shown in the same units, known to calc as never below zero.
    _quantity("absolute_pressure", "bar", "psi", PSI_IN_BAR, digits=4),
    _quantity("pressure_kpa", "kPa", "psi", PSI_IN_BAR * 100.0),
    _quantity("volume", "L", "US gal", GAL_IN_L, digits=4),
    _quantity("volume_ml", "mL", "US fl oz", GAL_IN_L * 1000.0 / 128.0),
    _quantity("foam_ml", "mL"),  # ASTM D892 reports foam in mL in US practice too
    _quantity("flow", "L/min", "gpm", GAL_IN_L),
    _quantity("length", "mm", "in", INCH_IN_MM),
    _quantity("length_m", "m", "ft", FOOT_IN_M),
    _quantity("area", "m²", "ft²", _FT2_IN_M2),
    _quantity("velocity", "m/s", "ft/s", FOOT_IN_M),
    _quantity("power", "kW", "hp", HP_IN_KW),
    _quantity("mass", "kg", "lb", LB_IN_KG),
    _quantity("density", "kg/m³", "lb/ft³", LB_IN_KG / FOOT_IN_M ** 3),  # NIST SP 811: 16.018 46 kg/m³
    _quantity("force", "kN", "lbf", LBF_IN_KN),
    _quantity("heat_transfer", "W/(m²·K)"),
    _quantity("ppm", "ppm", digits=4),
    _quantity("percent", "%"),
    _quantity("fraction", ""),
    _quantity("ratio", ""),
    _quantity("count", "", decimals=0),
    _quantity("per_ml", "/mL"),  # particles per mL (ISO 4406); no US unit
    _quantity("acid_number", "mg KOH/g"),  # ASTM D664 / D974; no US unit
    _quantity("molar_energy", "kJ/mol"),  # activation energy; shown in SI everywhere
    _quantity("minutes", "min", style="duration"),
    _quantity("hours", "h", style="duration"),
    _quantity("days", "d", decimals=0),
    _quantity("seconds", "s"),
    _quantity("per_bar", "1/bar", "1/psi", 1.0 / PSI_IN_BAR),
    _quantity("vi", "", decimals=0),  # ASTM D2270 reports VI as a whole number
    _quantity("vi_unrounded", "", decimals=2),
    _quantity("text", ""),
)}


def quantity(name: str) -> Quantity:
    try:
        return QUANTITIES[name]
    except KeyError:
        raise ValueError(f"unknown quantity {name!r}") from None


def check_system(system: str | None) -> str:
    system = (system or "metric").strip().lower()
    if system not in SYSTEMS:
        raise InputError("units", "unit system must be one of {systems}, not {typed}",
                         systems=Q(", ".join(SYSTEMS), "text"), typed=typed(system))
    return system


def to_metric(value: float, quantity_name: str, system: str) -> float:
    """A value typed in `system` units, in calc's metric unit."""
    if system != "us":
        return value
    return quantity(quantity_name).to_metric(value)


def from_metric(value: float, quantity_name: str, system: str) -> float:
    """A metric value from calc, in `system` units."""
    if system != "us":
        return value
    return quantity(quantity_name).to_us(value)


def unit_label(quantity_name: str, system: str) -> str:
    return quantity(quantity_name).unit(system)


# A lone comma, three digits after it, a whole part of 1 to 3 digits not starting with 0.
_AMBIGUOUS = re.compile(r"(-?[1-9]\d{0,2}),(\d{3})")


def parse_number(text: object, field: str) -> float:
    """A finite number from what a person typed.

    Accepts "46.5", "46,5", " 1 200 ", "1,200.5", "1.200,5", "-5", "1e3", "0,125". A dot
    alone is always the decimal mark ("1.013" bar). Refuses "1,200": a thousand two hundred
    in some countries, one point two in others (a lone comma with three digits after it and
    a whole part that is not 0). Raises InputError naming `field` for anything else.

    >>> parse_number("1.200,5", "volume")
    1200.5
    >>> parse_number("1,200", "volume")
    Traceback (most recent call last):
    ...
    calc.kernel.errors.InputError: volume: '1,200' could be 1200 or 1.2: type 1200, or 1.2 (no thousands separator)
    """
    if isinstance(text, bool):
        raise InputError(field, "must be a number")
    if isinstance(text, (int, float)):
        try:
            value = float(text)
        except OverflowError:
            raise InputError(field, "is far too large a number") from None
    else:
        raw = str(text).strip().replace("\u2212", "-").replace("\u00a0", "").replace(" ", "")
        raw = raw.replace("_", "")
        if not raw:
            raise InputError(field, "is empty: enter a number")
        ambiguous = _AMBIGUOUS.fullmatch(raw)
        if ambiguous:
            whole, part = ambiguous.group(1), ambiguous.group(2)
            raise InputError(field, "{typed} could be {thousands} or {decimal}: type {thousands}, "
                             "or {decimal} (no thousands separator)", typed=typed(text),
                             thousands=Q(whole + part, "text"),
                             decimal=Q(f"{whole}.{part}".rstrip("0").rstrip("."), "text"))
        if "," in raw and "." in raw:
            # The later separator is the decimal mark, the other groups thousands.
            if raw.rfind(",") > raw.rfind("."):
                raw = raw.replace(".", "").replace(",", ".")
            else:
                raw = raw.replace(",", "")
        elif raw.count(",") == 1:
            raw = raw.replace(",", ".")
        try:
            value = float(raw)
        except ValueError:
            raise InputError(field, "must be a number, not {typed}", typed=typed(text)) from None
    if not math.isfinite(value):
        raise InputError(field, "must be a finite number")
    return value


def show(value: float | None, quantity_name: str, system: str) -> str:
    """A metric value as a person reads it in `system`: "20.6 cSt", "141 °F".

    A "text" quantity (a grade's name, a cause's title) is shown as it is.

    >>> show(60.0, "temperature", "us"), show("VG 46", "text", "us")
    ('140.0 °F', 'VG 46')
    """
    if value is None:
        return "n/a"
    if quantity_name == "text":
        return str(value)
    q = quantity(quantity_name)
    if q.style == "duration" and math.isfinite(value):
        return duration(value * 60.0 if quantity_name == "hours" else value)
    text = show_number(value, quantity_name, system)
    unit = q.unit(system)
    if not unit:
        return text
    if unit == "%":
        return f"{text} %"
    return f"{text} {unit}"


def show_number(value: float, quantity_name: str, system: str) -> str:
    """The number of `show` without its unit, rounded as shown ("20.6", "141.0").

    >>> show_number(60.0, "temperature", "us")
    '140.0'
    """
    q = quantity(quantity_name)
    shown = from_metric(value, quantity_name, system)
    text = (f"{shown:.{q.decimals}f}" if q.decimals is not None
            else _trimmed(format_number(shown, q.digits)))
    if text.startswith("-") and not text.strip("-0."):
        text = text[1:]  # no "-0.0"
    return text


def _trimmed(text: str) -> str:
    return text.rstrip("0").rstrip(".") if "." in text and "e" not in text else text


def duration(minutes: float) -> str:
    """A time as people say it: "45 min", "1 h 50 min", "2 d 3 h"; "4.96 min" below an hour
    keeps three figures (a dwell time); past 1000 h, whole hours.

    >>> duration(110.0), duration(4.96), duration(55.2), duration(60.0), duration(3000.0)
    ('1 h 50 min', '4.96 min', '55.2 min', '1 h', '2 d 2 h')
    >>> duration(90000.0)
    '1500 h'
    """
    if abs(minutes) < 60.0:
        return f"{_trimmed(format_number(minutes, 3))} min"
    sign = "-" if minutes < 0 else ""
    if not math.isfinite(minutes) or abs(minutes) >= 60000.0:
        return f"{_trimmed(format_number(minutes / 60.0, 3))} h"
    hours, mins = divmod(round(abs(minutes)), 60)
    if hours >= 48:
        days, hours = divmod(round(abs(minutes) / 60.0), 24)
        return f"{sign}{days} d" + (f" {hours} h" if hours else "")
    return f"{sign}{hours} h" + (f" {mins} min" if mins else "")


def format_number(value: float, digits: int = 3) -> str:
    """`value` to `digits` significant figures, never in exponent form for field values.

    >>> format_number(20.5893, 3), format_number(1234.5, 3), format_number(0.012345, 3)
    ('20.6', '1230', '0.0123')
    """
    if value == 0 or not math.isfinite(value):
        return "0" if value == 0 else str(value)
    magnitude = math.floor(math.log10(abs(value)))
    if magnitude >= 15:  # round() overflows near the float limit; such values are only echoed back
        return f"{value:.{digits}g}"
    decimals = digits - 1 - magnitude
    if decimals > 0:
        return f"{value:.{decimals}f}"
    return f"{int(round(value, decimals))}"


def format_input(value: float) -> str:
    """A value as it is put back into a form field: 4 significant figures, no trailing zeros.

    >>> format_input(140.0), format_input(6.8), format_input(0.000123456)
    ('140', '6.8', '0.0001235')
    """
    text = format_number(value, 4)
    return text.rstrip("0").rstrip(".") if "." in text else text
