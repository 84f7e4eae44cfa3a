"""The machine card: the facts of one machine, declared once with the fields tools use.

A card holds what is known about a machine and does not change from visit to visit: its
oil, reservoir, pump, suction line, pressure, cleanliness target, temperatures and service
intervals. Every field is optional but the name; a blank field is simply not known, and
the tools keep their own value for it. Values are kept in calc's metric units; the page
and the CLI type and show them in the reader's units through the same fields as the tools.

Tool inputs that mean a fact of the machine say which card field they take
(`Field.binds`); `facts` gives those facts, with what follows from the card (the full and
working volumes from the tank's dimensions, the new oil's viscosities from its grade and
VI, the cleanliness target from the component and pressure) filled in and said so.

>>> card = parse({"name": "Press 3", "grade": "VG 46", "vi": "100", "pump_flow": "60"})
>>> card["name"], card["pump_flow"]
('Press 3', 60.0)
>>> found, derived = facts(card)
>>> round(found["kv40_new"], 1), sorted(derived)[:2]
(46.0, ['kv100_new', 'kv40_new'])
"""

from __future__ import annotations

from dataclasses import dataclass

from ..kernel import units
from ..kernel.errors import InputError
from ..kernel.registry import Field
from ..methods.iso3448 import GRADE_CHOICES, grade_midpoint
from ..methods.tank import depth_mm, volume_at_level_l
from ..methods.viscosity_index import kv100_from_vi
from ..tools.cleanliness import COMPONENT_CHOICES, target_code
from ..tools.suction import BYPASS_CHOICES, ENTRY_CHOICES, VALVE_CHOICES
from ..tools.tank import APPLICATION_CHOICES, SHAPE_CHOICES
from ..tools.viscosity import PUMP_CHOICES
from ..tools.water import CALIBRATION_KEYS, OIL_CHOICES, OWN_CALIBRATION, saturation_line

FORMAT = "sumpside-card"
VERSION = 1
UNKNOWN = "unknown"
_KV, _T, _L, _MM = "kinematic_viscosity", "temperature", "volume", "length"


def _known(*choices: tuple[str, str]) -> tuple[tuple[str, str], ...]:
    """A choice that may be left as not known (the card's default for every choice)."""
    return ((UNKNOWN, "Not known"),) + tuple(choices)


def _choice(key: str, label: str, choices, help_text: str = "") -> Field:
    return Field(key, label, "choice", UNKNOWN, choices=_known(*choices), help=help_text)


def _number(key: str, label: str, quantity: str, low: float | None, high: float | None,
            help_text: str = "") -> Field:
    return Field(key, label, quantity, None, min=low, max=high, optional=True, help=help_text)


@dataclass(frozen=True)
class Section:
    key: str
    title: str
    fields: tuple[Field, ...]


SECTIONS = (
    Section("machine", "Machine", (
        Field("name", "Name", "text", None, max=80, help="As it is known on site: Press 3, "
                                                        "Line 2 saw, Crane 14."),
        Field("site", "Site or location", "text", None, max=120, optional=True),
    )),
    Section("oil", "Oil", (
        Field("oil_name", "Oil (trade name)", "text", None, max=120, optional=True),
        _choice("grade", "ISO VG grade", GRADE_CHOICES),
        _number("vi", "Viscosity index", "vi", -100.0, 400.0, "From the oil's data sheet."),
        _number("kv40_new", "New oil's KV40", _KV, 2.0, 1.0e4,
                "From the data sheet; blank takes the grade's mid-point."),
        _number("kv100_new", "New oil's KV100", _KV, 1.0, 1.0e4,
                "From the data sheet; blank follows from KV40 and VI (ASTM D2270)."),
        _number("an_new", "New oil's acid number", "acid_number", 0.0, 20.0),
        _choice("oil_family", "Oil type for water", OIL_CHOICES,
                "Sets how much water the oil holds dissolved."),
        _number("cal_temp1", "Own calibration: temperature 1", _T, -40.0, 150.0),
        _number("cal_ppm1", "Own calibration: saturation 1", "ppm", 1.0, 1.0e5),
        _number("cal_temp2", "Own calibration: temperature 2", _T, -40.0, 150.0),
        _number("cal_ppm2", "Own calibration: saturation 2", "ppm", 1.0, 1.0e5),
        _number("density", "Oil density", "density", 600.0, 1300.0),
    )),
    Section("reservoir", "Reservoir", (
        _choice("tank_shape", "Tank shape", SHAPE_CHOICES),
        _number("tank_length", "Inside length", _MM, 50.0, 20000.0),
        _number("tank_width", "Inside width", _MM, 50.0, 20000.0),
        _number("tank_height", "Inside height", _MM, 50.0, 20000.0),
        _number("tank_diameter", "Inside diameter", _MM, 50.0, 20000.0),
        _number("working_level", "Working oil level", _MM, 1.0, 20000.0,
                "From the inside bottom, with the machine at rest in its working state."),
        _number("low_level", "Lowest oil level in the cycle", _MM, 1.0, 20000.0,
                "With cylinders extended and accumulators charged."),
        _number("tank_volume", "Full tank volume", _L, 1.0, 1.0e6,
                "Blank: from the shape and dimensions."),
        _number("oil_volume", "Oil at the working level", _L, 1.0, 1.0e6,
                "Blank: from the shape, dimensions and working level."),
        _choice("application", "Kind of machine", APPLICATION_CHOICES),
    )),
    Section("pump", "Pump", (
        _choice("pump_type", "Pump type", PUMP_CHOICES),
        _number("pump_flow", "Pump flow", "flow", 0.1, 5000.0, "The flow actually delivered."),
        _number("pump_min_inlet", "Pump's minimum inlet pressure (absolute)",
                "absolute_pressure", 0.1, 5.0, "From the pump's data sheet."),
        _number("visc_start", "Maker's limit: max viscosity at start-up", _KV, 1.0, 1.0e5),
        _number("visc_opt_high", "Maker's optimum band, top", _KV, 1.0, 1.0e5),
        _number("visc_opt_low", "Maker's optimum band, bottom", _KV, 1.0, 1.0e5),
        _number("visc_min", "Maker's limit: minimum viscosity", _KV, 1.0, 1.0e5),
    )),
    Section("suction", "Suction line", (
        _number("suction_bore", "Bore", _MM, 5.0, 600.0),
        _number("suction_length", "Length", "length_m", 0.0, 100.0),
        _number("suction_head", "Oil level above the pump inlet", "length_m", -10.0, 30.0,
                "Negative when the pump sits above the oil."),
        _choice("entry", "Where the line leaves the tank", ENTRY_CHOICES),
        _number("elbows_90", "90° elbows", "count", 0.0, 20.0),
        _number("bends_90", "90° long-radius bends", "count", 0.0, 20.0),
        _number("elbows_45", "45° elbows", "count", 0.0, 20.0),
        _number("tees", "Tees, flow through the branch", "count", 0.0, 20.0),
        _choice("suction_valve", "Valve in the line", VALVE_CHOICES),
        _number("strainer", "Strainer drop, clean, warm", "pressure", 0.0, 2.0),
        _choice("strainer_bypass", "Strainer bypass", BYPASS_CHOICES),
        _number("bypass_opens", "Bypass opens at", "pressure", 0.01, 2.0),
    )),
    Section("circuit", "Pressure and cleanliness", (
        _number("working_pressure", "Working pressure", "pressure", 0.0, 1000.0),
        _choice("component", "Most dirt-sensitive component", COMPONENT_CHOICES),
        _number("target4", "Own cleanliness target, ≥4 µm(c)", "count", 0.0, 28.0,
                "Blank: the typical target for the component and pressure."),
        _number("target6", "Own cleanliness target, ≥6 µm(c)", "count", 0.0, 28.0),
        _number("target14", "Own cleanliness target, ≥14 µm(c)", "count", 0.0, 28.0),
    )),
    Section("temperatures", "Temperatures", (
        _number("temp_cold_start", "Coldest start-up", _T, -40.0, 100.0),
        _number("temp_running", "Normal running", _T, -20.0, 150.0),
        _number("temp_hottest", "Hottest steady running", _T, -20.0, 150.0),
        _number("ambient", "Usual air temperature around the machine", _T, -40.0, 60.0),
    )),
    Section("intervals", "Service intervals", (
        _number("sample_days", "Oil sample every", "days", 1.0, 3650.0),
        _number("filter_days", "Filter change every", "days", 1.0, 3650.0),
        Field("filter_changed", "Filter last changed", "date", None, optional=True),
        _number("oil_days", "Oil change every", "days", 1.0, 7300.0),
        Field("oil_changed", "Oil last changed", "date", None, optional=True),
    )),
    Section("notes", "Notes", (
        Field("notes", "Notes", "text", None, max=2000, optional=True),
    )),
)
FIELDS = {f.key: f for section in SECTIONS for f in section.fields}


def field(key: str) -> Field:
    return FIELDS[key]


def parse(raw: dict, system: str = "metric") -> dict:
    """A card's fields from what was typed (or a stored card), in metric; every bad field
    is reported at once, named, as tool inputs are. Blank fields are left out.

    >>> parse({"name": "Saw 2", "pump_flow": "twelve"})
    Traceback (most recent call last):
    ...
    calc.kernel.errors.InputError: pump_flow: must be a number, not 'twelve'
    """
    if not isinstance(raw, dict):
        raise InputError("card", "a machine card is a set of named fields")
    errors = [InputError(key, "is not a field of the machine card") for key in sorted(raw)
              if key not in FIELDS]
    card = {}
    for key, f in FIELDS.items():
        try:
            value = f.parse(raw.get(key), system)
        except InputError as err:
            errors.append(err)
            continue
        if value is not None and value != UNKNOWN:
            card[key] = value
    if not errors:
        errors = _cross_checks(card)
    if errors:
        raise InputError.combine(errors)
    return card


def _cross_checks(card: dict) -> list[InputError]:
    errors = []
    if "kv40_new" in card and "kv100_new" in card and card["kv100_new"] >= card["kv40_new"]:
        errors.append(InputError("kv100_new", "must be lower than KV40 (an oil thins as it "
                                              "warms)"))
    if card.get("low_level", 0.0) > card.get("working_level", float("inf")):
        errors.append(InputError("low_level", "must be at or below the working level"))
    window = [card.get(k) for k in ("visc_start", "visc_opt_high", "visc_opt_low", "visc_min")]
    given = [v for v in window if v is not None]
    if any(b >= a for a, b in zip(given, given[1:])):
        errors.append(InputError("visc_opt_high", "the pump's limits must fall in order: "
                                                  "start-up maximum, optimum band top and "
                                                  "bottom, minimum"))
    if card.get("temp_cold_start", -1e9) > card.get("temp_running", 1e9):
        errors.append(InputError("temp_cold_start", "must be below the normal running "
                                                    "temperature"))
    if card.get("oil_family") == OWN_CALIBRATION:
        try:
            saturation_line(OWN_CALIBRATION, *(card.get(k) for k in CALIBRATION_KEYS))
        except InputError as err:
            errors.append(err)
    for key in ("elbows_90", "bends_90", "elbows_45", "tees", "target4", "target6", "target14"):
        if key in card and card[key] != int(card[key]):
            errors.append(InputError(key, "is a whole number"))
    return errors


def facts(card: dict) -> tuple[dict, list[str]]:
    """(Every fact the card gives, metric; the keys that follow from others rather than
    typed). What follows: volumes from the tank's shape and size, the new oil's KV40 and
    KV100 from its grade and VI, the cleanliness target from the component and pressure.
    """
    found, derived = dict(card), []

    def put(key: str, value) -> None:
        if key not in found and value is not None:
            found[key] = value
            derived.append(key)

    shape = found.get("tank_shape")
    dims = (found.get("tank_length"), found.get("tank_width"), found.get("tank_height"),
            found.get("tank_diameter"))
    needs = {"rectangular": (0, 1, 2), "vertical": (3, 2), "horizontal": (3, 0)}.get(shape)
    if needs and all(dims[i] is not None for i in needs):
        full_dims = tuple(0.0 if d is None else d for d in dims)
        depth = depth_mm(shape, full_dims[2], full_dims[3])
        put("tank_volume", volume_at_level_l(shape, *full_dims, depth))
        for level_key, volume_key in (("working_level", "oil_volume"),
                                      ("low_level", "low_oil_volume")):
            level = found.get(level_key)
            if level is not None and level <= depth:
                put(volume_key, volume_at_level_l(shape, *full_dims, level))
    grade = found.get("grade")
    if grade is not None:
        put("kv40_new", grade_midpoint(grade))
    if "kv40_new" in found and "vi" in found:
        try:
            put("kv100_new", kv100_from_vi(found["kv40_new"], found["vi"]))
        except InputError:
            pass  # no D2270 oil of that VI at that KV40: the KV100 stays unknown
    if "component" in found and not any(k in card for k in ("target4", "target6", "target14")):
        code = target_code(found["component"], found.get("working_pressure", 0.0))
        for key, number in zip(("target4", "target6", "target14"), code):
            put(key, float(number))
    return found, derived


def describe(system: str = "metric") -> list[dict]:
    """The card's sections and fields for the page, in `system` units."""
    return [{"key": s.key, "title": s.title, "fields": [f.describe(system) for f in s.fields]}
            for s in SECTIONS]


def shown(card: dict, system: str) -> dict:
    """A card's values as typed in `system` units (for a form or a summary)."""
    out = {}
    for key, value in card.items():
        f = FIELDS.get(key)
        if f is None:
            continue
        out[key] = (units.format_input(units.from_metric(value, f.quantity, system))
                    if f.is_number else value)
    return out


def summary(card: dict, system: str) -> list[dict]:
    """The card as a reader sees it: {label, text} for every field given, in `system` units,
    with the facts that follow from others marked so."""
    found, derived = facts(card)
    lines = []
    for section in SECTIONS:
        for f in section.fields:
            if f.key not in found:
                continue
            value = found[f.key]
            text = (units.show(value, f.quantity, system) if f.is_number
                    else dict(f.choices).get(value, value) if f.choices else str(value))
            lines.append({"section": section.title, "key": f.key, "label": f.label,
                          "text": text, "derived": f.key in derived})
    for key, label in (("low_oil_volume", "Oil at the lowest level"),):
        if key in found:
            lines.append({"section": "Reservoir", "key": key, "label": label,
                          "text": units.show(found[key], _L, system), "derived": True})
    return lines


def quantity_of(key: str) -> str:
    """The quantity of a card fact, derived ones included."""
    return _L if key == "low_oil_volume" else FIELDS[key].quantity

