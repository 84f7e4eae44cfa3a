"""The catalogue: every tool and checklist declared once, beside the function that computes it.

A module under calc/tools/ declares a tool with the `tool` decorator::

    @tool("viscosity-at-temperature", title=..., summary=..., topic=topics.VISCOSITY,
          inputs=(Field("kv40", "KV at 40 °C", "kinematic_viscosity", 46.0, min=0.5),),
          outputs=(Output("kv", "Viscosity at temp", "kinematic_viscosity", headline=True),))
    def viscosity_at_temperature(kv40, ...): ...

A module under calc/checklists/ declares a checklist with `calc.checklists.scoreboard.checklist`.
Modules are found, not listed: `tools()` imports every module of those two packages once.
The page's forms, the CLI's arguments, the web worker's dispatch and the tests are all
derived from these declarations; a declaration that does not fit its function (an input
the function does not take, a parameter no field fills, an unknown quantity, a default
outside its range) fails when the module is imported, not at the first call.
"""

from __future__ import annotations

import importlib
import inspect
import math
import pkgutil
from dataclasses import dataclass
from datetime import date
from typing import Callable

from . import units
from .constants import ABSOLUTE_ZERO_C
from .errors import InputError, typed
from .result import Q, Result, Text

# Quantities kept as text: free text, and a calendar day (ISO 8601 date).
TEXT_QUANTITIES = ("text", "date")
TEXT_MAX_CHARS = 200

# The packages whose modules declare tools and checklists.
PACKAGES = ("calc.tools", "calc.checklists")
KINDS = ("tool", "checklist")
# Field groups, in the order a form shows them: the reading typed at the machine, the
# machine's own facts, and the limits and options that change how the reading is judged.
GROUPS = ("reading", "machine", "limits")


@dataclass(frozen=True)
class Topic:
    """A section of the catalogue; TOPICS gives their order."""

    key: str
    title: str


VISCOSITY = Topic("viscosity", "Viscosity")
WATER = Topic("water", "Water")
TANK = Topic("tank", "Tank and circuit")
AIR = Topic("air", "Air and foam")
AGEING = Topic("ageing", "Oil life and condition")
CLEANLINESS = Topic("cleanliness", "Cleanliness")
UNITS = Topic("units", "Units")
TROUBLESHOOTING = Topic("troubleshooting", "Troubleshooting")
TOPICS = (VISCOSITY, WATER, TANK, AIR, AGEING, CLEANLINESS, UNITS, TROUBLESHOOTING)


@dataclass(frozen=True)
class Tracked:
    """A quantity of the oil's condition that is followed over time, whichever tool gives it."""

    key: str
    label: str
    quantity: str


TRACKED = {t.key: t for t in (
    Tracked("oil_temp", "Oil temperature", "temperature"),
    Tracked("kv40", "Viscosity at 40 °C", "kinematic_viscosity"),
    Tracked("kv40_change", "Viscosity change from new", "percent"),
    Tracked("water_ppm", "Water content", "ppm"),
    Tracked("water_saturation", "Water, % of saturation", "percent"),
    Tracked("iso4406_4", "ISO 4406 code, ≥4 µm(c)", "count"),
    Tracked("iso4406_6", "ISO 4406 code, ≥6 µm(c)", "count"),
    Tracked("iso4406_14", "ISO 4406 code, ≥14 µm(c)", "count"),
    Tracked("acid_number", "Acid number", "acid_number"),
    Tracked("acid_rise", "Acid number rise", "acid_number"),
    Tracked("oxidation_reserve", "Oxidation reserve", "percent"),
    Tracked("air_release", "Air-release time", "minutes"),
)}


@dataclass(frozen=True)
class Field:
    """One input of a tool.

    quantity : a key of `units.QUANTITIES`, "choice" for a pick from `choices`, "flag" for
        a tick box (reaches the function as True / False), "text" for free text (at most
        `max` characters) or "date" for a calendar day (YYYY-MM-DD)
    default : what the form starts with, metric; None with ``optional`` means blank
    min, max : the allowed range, metric, inclusive
    choices : (value, label) pairs of a choice field
    optional : a blank entry is allowed and reaches the function as None
    group : "reading" (typed at the machine), "machine" (a fact of the machine) or
        "limits" (limits and options); a field bound to the machine card is a machine fact
    binds : the machine card's field this input takes when a machine is chosen
    tracks : the condition quantity (TRACKED) this input is a reading of, followed over time
    """

    key: str
    label: str
    quantity: str
    default: float | str | None = None
    min: float | None = None
    max: float | None = None
    help: str = ""
    choices: tuple[tuple[str, str], ...] = ()
    optional: bool = False
    group: str = "reading"
    binds: str | None = None
    tracks: str | None = None

    def __post_init__(self):
        if self.binds is not None and self.group == "reading":
            object.__setattr__(self, "group", "machine")

    @property
    def is_choice(self) -> bool:
        return self.quantity in ("choice", "flag")

    @property
    def is_text(self) -> bool:
        """Free text or a date: kept as typed (trimmed), never converted."""
        return self.quantity in TEXT_QUANTITIES

    @property
    def is_number(self) -> bool:
        return not (self.is_choice or self.is_text)

    @property
    def is_flag(self) -> bool:
        return self.quantity == "flag"

    def check_declaration(self, where: str) -> None:
        """ValueError unless this field is well declared (called when a tool is declared)."""
        if self.group not in GROUPS:
            raise ValueError(f"{where}: field {self.key!r} group must be one of {GROUPS}")
        if self.is_flag:
            if self.default not in (None, False, True):
                raise ValueError(f"{where}: tick box {self.key!r} defaults to True or False")
            return
        if self.is_choice:
            if not self.choices or self.default not in [c[0] for c in self.choices]:
                raise ValueError(f"{where}: choice {self.key!r} needs choices and a default "
                                 "among them")
            return
        if self.tracks is not None and (self.tracks not in TRACKED
                                        or TRACKED[self.tracks].quantity != self.quantity):
            raise ValueError(f"{where}: field {self.key!r} tracks {self.tracks!r}, which is "
                             f"not a {self.quantity} condition quantity")
        if self.is_text:
            return
        units.quantity(self.quantity)
        if self.default is None and not self.optional:
            return
        if self.default is not None:
            self.check_range(float(self.default), "metric")

    def parse(self, raw: object, system: str) -> float | str | None:
        """The metric value of what was typed, or InputError naming this field."""
        if self.is_flag:
            return _parse_flag(raw, self.key)
        if _blank(raw):
            if self.optional:
                return None
            if self.default is None:
                raise InputError(self.key, "{label} is needed", label=Q(self.label, "text"))
            return self.default
        if self.is_choice:
            value = str(raw).strip()
            allowed = [c[0] for c in self.choices]
            if value not in allowed:
                raise InputError(self.key, "must be one of {allowed}, not {typed}",
                                 allowed=Q(", ".join(allowed), "text"), typed=typed(value))
            return value
        if self.is_text:
            return self.parse_text(raw)
        value = units.to_metric(units.parse_number(raw, self.key), self.quantity, system)
        self.check_range(value, system)
        return value

    def parse_text(self, raw: object) -> str:
        """Free text trimmed (no control characters, at most `max` characters), or a date."""
        value = " ".join(str(raw).split()) if self.quantity == "date" else str(raw).strip()
        if any(ord(c) < 32 and c not in "\n\t" for c in value):
            raise InputError(self.key, "holds control characters: type plain text")
        most = int(self.max) if self.max is not None else TEXT_MAX_CHARS
        if len(value) > most:
            raise InputError(self.key, "is {length} characters long; at most {most}",
                             length=Q(float(len(value)), "count"), most=Q(float(most), "count"))
        if self.quantity == "date":
            try:
                date.fromisoformat(value)
            except ValueError:
                raise InputError(self.key, "is a date written year-month-day, like 2026-03-31, "
                                           "not {typed}", typed=typed(value)) from None
        return value

    def accepts(self, metric: object) -> bool:
        """Whether a value already in metric (a machine card's fact) is valid for this field."""
        try:
            if self.is_choice:
                return metric in [c[0] for c in self.choices] or (
                    self.is_flag and isinstance(metric, bool))
            if self.is_text:
                return isinstance(metric, str) and self.parse_text(metric) == metric
            if isinstance(metric, bool) or not isinstance(metric, (int, float)):
                return False
            self.check_range(float(metric), "metric")
            return True
        except InputError:
            return False

    def check_range(self, value: float, system: str) -> None:
        if self.quantity == "temperature" and value <= ABSOLUTE_ZERO_C:
            raise InputError(self.key, "is at or below absolute zero ({zero})",
                             zero=Q(ABSOLUTE_ZERO_C, "temperature"))
        low_ok = self.min is None or value >= self.min
        high_ok = self.max is None or value <= self.max
        if low_ok and high_ok:
            return
        named = dict(label=Q(self.label, "text"), low=Q(self.min, self.quantity),
                     high=Q(self.max, self.quantity), value=Q(value, self.quantity))
        if self.min is not None and self.max is not None:
            raise InputError(self.key, "{label} must be between {low} and {high}, not {value}",
                             **named)
        if self.min is not None:
            raise InputError(self.key, "{label} must be at least {low}, not {value}", **named)
        raise InputError(self.key, "{label} must be at most {high}, not {value}", **named)

    def describe(self, system: str = "metric") -> dict:
        """This field for the catalogue, in `system` units."""
        number = self.is_number
        convert = (lambda v: None if v is None else units.from_metric(v, self.quantity, system)
                   ) if number else (lambda v: v)
        shared = {"key": self.key, "label": self.label, "help": self.help, "group": self.group,
                  "binds": self.binds, "tracks": self.tracks}
        if self.is_flag:
            return {**shared, "quantity": "flag", "unit": "", "default": bool(self.default),
                    "min": None, "max": None, "choices": [], "optional": True}
        return {
            **shared,
            "quantity": self.quantity,
            "unit": units.unit_label(self.quantity, system) if number else "",
            "default": convert(self.default),
            "min": convert(self.min) if number else None,
            "max": convert(self.max) if number else self.max,
            "choices": [list(c) for c in self.choices],
            "optional": self.optional,
        }


_TRUE = ("1", "true", "yes", "on", "y")
_FALSE = ("", "0", "false", "no", "off", "n")


def _blank(raw: object) -> bool:
    """Nothing typed: absent, None or only spaces."""
    return raw is None or (isinstance(raw, str) and not raw.strip())


def _parse_flag(raw: object, key: str) -> bool:
    if raw is None or isinstance(raw, bool):
        return bool(raw)
    word = str(raw).strip().lower()
    if word in _TRUE:
        return True
    if word in _FALSE:
        return False
    raise InputError(key, "is a tick box: yes or no, not {typed}", typed=typed(raw))


# The least value a quantity can physically take, whatever the tool.
PHYSICAL_FLOORS = {"temperature": ABSOLUTE_ZERO_C, "absolute_pressure": 0.0}


@dataclass(frozen=True)
class Output:
    """One shown result of a tool.

    headline : one of the few values shown beside the verdict (the answer at a glance)
    tracks : the key of the condition quantity (TRACKED) this output measures, so the log
        and the machine page follow it over time whichever tool gave it
    at_least, at_most : the physical bounds of the value (an absolute pressure is never
        below zero, a share of a tank never above 100 %); a tool that returns a value past
        them has a bug
    """

    key: str
    label: str
    quantity: str
    help: str = ""
    headline: bool = False
    tracks: str | None = None
    at_least: float | None = None
    at_most: float | None = None

    @property
    def bounds(self) -> tuple[float | None, float | None]:
        """The physical bounds of this output: its own, else its quantity's (no temperature
        at or below absolute zero, no absolute pressure below zero)."""
        low = self.at_least
        if low is None and self.quantity in PHYSICAL_FLOORS:
            low = PHYSICAL_FLOORS[self.quantity]
        return low, self.at_most

    def check_declaration(self, where: str) -> None:
        units.quantity(self.quantity)
        if self.tracks is not None:
            tracked = TRACKED.get(self.tracks)
            if tracked is None or tracked.quantity != self.quantity:
                raise ValueError(f"{where}: output {self.key!r} tracks {self.tracks!r}, which "
                                 f"is not a {self.quantity} condition quantity")

    def describe(self, system: str = "metric") -> dict:
        return {"key": self.key, "label": self.label, "quantity": self.quantity,
                "unit": units.unit_label(self.quantity, system), "help": self.help,
                "headline": self.headline, "tracks": self.tracks}


@dataclass(frozen=True)
class Check:
    """One check of a checklist cause: what to do, and the tool that gives its number."""

    key: str
    text: str
    tool: str | None = None


@dataclass(frozen=True)
class Cause:
    """One cause of a checklist as declared: its title, its checks and its caution."""

    key: str
    title: str
    checks: tuple[Check, ...]
    caution: str


@dataclass(frozen=True)
class Tool:
    id: str
    title: str
    summary: str
    topic: Topic
    inputs: tuple[Field, ...]
    outputs: tuple[Output, ...]
    compute: Callable[..., Result]
    kind: str = "tool"
    causes: tuple[Cause, ...] = ()  # a checklist's causes, in the order of its page
    # Input keys the tool no longer takes, each with what to type instead.
    retired: tuple[tuple[str, str], ...] = ()
    # Input keys that were renamed, each with its new key: the old key still works.
    renamed: tuple[tuple[str, str], ...] = ()

    def field(self, key: str) -> Field:
        for f in self.inputs:
            if f.key == key:
                return f
        raise KeyError(key)

    @property
    def headline(self) -> tuple[str, ...]:
        return tuple(o.key for o in self.outputs if o.headline)

    def parse(self, raw: dict, system: str = "metric", facts: dict | None = None) -> dict:
        """All inputs in metric units, every bad field reported at once.

        `facts` are a machine card's facts (metric, calc.machines.card): a bound input left
        blank takes its card field's value, checked like a typed one; one that does not fit
        this tool is an error naming the input and saying the value came from the card
        (never a silent fall-back to the tool's default).
        """
        return self.parse_from(raw, system, facts)[0]

    def parse_from(self, raw: dict, system: str = "metric",
                   facts: dict | None = None) -> tuple[dict, list[str]]:
        """(inputs in metric, the keys that came from the card): see `parse`."""
        raw, errors = self.rename_old_keys(raw)
        from_card = []
        for f in self.inputs:
            fact = (facts or {}).get(f.binds) if f.binds else None
            if _blank(raw.get(f.key)) and fact is not None:
                from_card.append(f.key)
        return self._parse(raw, system, {k: facts[self.field(k).binds] for k in from_card},
                           errors), from_card

    def rename_old_keys(self, raw: dict) -> tuple[dict, list[InputError]]:
        """`raw` with renamed keys under their new names; both given is an error."""
        raw, errors = dict(raw), []
        for old, new in self.renamed:
            if old not in raw:
                continue
            if _blank(raw.get(new)):
                raw[new] = raw.pop(old)
            else:
                raw.pop(old)
                errors.append(InputError(old, "is the old name of {new}: give only {new}",
                                         new=Q(new, "text")))
        return raw, errors

    def _parse(self, raw: dict, system: str, metric: dict, errors: list[InputError]) -> dict:
        unknown = sorted(set(raw) - {f.key for f in self.inputs})
        retired = dict(self.retired)
        inputs = Q(", ".join(f.key for f in self.inputs), "text")
        errors += [InputError(k, "is no longer an input of {tool}: {instead}",
                             tool=Q(self.id, "text"), instead=Q(retired[k], "text"))
                  if k in retired else
                  InputError(k, "is not an input of {tool}; inputs are {inputs}",
                             tool=Q(self.id, "text"), inputs=inputs) for k in unknown]
        values = {}
        for f in self.inputs:
            if f.key in metric:
                try:
                    values[f.key] = f.parse(metric[f.key], "metric")
                except InputError as err:
                    errors.append(InputError(f.key, Text(
                        err.text.template + " (this value is the machine card's: type one for "
                        "this reading, or correct the card)", err.text.args, err.text.named)))
                continue
            try:
                values[f.key] = f.parse(raw.get(f.key), system)
            except InputError as err:
                errors.append(err)
        if errors:
            raise InputError.combine(errors)
        return values

    def run(self, raw: dict, system: str = "metric", facts: dict | None = None) -> Result:
        return self.run_parsed(self.parse(raw, units.check_system(system), facts))

    def run_parsed(self, values: dict) -> Result:
        """The answer to inputs already parsed to metric (as `parse` gives them)."""
        result = self.compute(**values)
        self._check(result)
        return result

    def _check(self, result: Result) -> None:
        """A tool that returns a non-finite or undeclared value is a bug, not an answer."""
        declared = {o.key for o in self.outputs}
        extra = set(result.values) - declared
        if extra:
            raise RuntimeError(f"{self.id} returned undeclared outputs {sorted(extra)}")
        for out in self.outputs:
            value = result.values.get(out.key)
            if not isinstance(value, float):
                continue
            if not math.isfinite(value):
                raise RuntimeError(f"{self.id} computed a non-finite {out.key}")
            low, high = out.bounds
            if (low is not None and value < low) or (high is not None and value > high):
                raise RuntimeError(f"{self.id} computed {out.key} = {value!r}, outside its "
                                   f"physical bounds")

    def describe(self, system: str = "metric") -> dict:
        return {
            "id": self.id, "title": self.title, "summary": self.summary,
            "topic": self.topic.title, "kind": self.kind,
            "inputs": [f.describe(system) for f in self.inputs],
            "outputs": [o.describe(system) for o in self.outputs],
        }


def check_signature(where: str, fn: Callable, keys: list[str], skip: int = 0) -> None:
    """ValueError unless `fn` takes exactly the fields `keys` (after `skip` leading
    parameters), by name: a field the function ignores, or a parameter no field fills,
    is a declaration bug."""
    params = list(inspect.signature(fn).parameters.values())[skip:]
    loose = [p.name for p in params if p.kind in (p.VAR_POSITIONAL, p.VAR_KEYWORD)]
    if loose:
        raise ValueError(f"{where}: {fn.__name__} takes *{loose[0]}: name every input")
    names = [p.name for p in params]
    unused = sorted(set(keys) - set(names))
    unfilled = sorted(set(names) - set(keys))
    if unused or unfilled:
        raise ValueError(f"{where}: {fn.__name__} does not fit its fields: "
                         f"fields it does not take {unused}, parameters no field fills "
                         f"{unfilled}")


_TOOLS: dict[str, Tool] = {}


def register(found: Tool) -> None:
    """Add a declared tool or checklist to the catalogue, checking its declaration."""
    where = found.id
    if found.kind not in KINDS:
        raise ValueError(f"{where}: kind must be one of {KINDS}")
    if found.topic not in TOPICS:
        raise ValueError(f"{where}: topic {found.topic!r} is not one of registry.TOPICS")
    keys = [f.key for f in found.inputs]
    if len(set(keys)) != len(keys):
        raise ValueError(f"{where}: duplicate input keys")
    out_keys = [o.key for o in found.outputs]
    if len(set(out_keys)) != len(out_keys):
        raise ValueError(f"{where}: duplicate output keys")
    for f in found.inputs:
        f.check_declaration(where)
    for o in found.outputs:
        o.check_declaration(where)
    gone = list(dict(found.retired)) + [old for old, _new in found.renamed]
    clash = set(gone) & set(keys)
    if clash or len(set(gone)) != len(gone):
        raise ValueError(f"{where}: retired or renamed keys {sorted(clash)} are still inputs, "
                         "or named twice")
    lost = sorted({new for _old, new in found.renamed} - set(keys))
    if lost:
        raise ValueError(f"{where}: keys renamed to {lost}, which are not inputs")
    if not found.headline:
        raise ValueError(f"{where}: no output is marked as the headline")
    known = _TOOLS.get(found.id)
    if known is not None and known.compute is not found.compute:
        raise ValueError(f"tool {found.id!r} declared twice")
    _TOOLS[found.id] = found


def tool(tool_id: str, *, title: str, summary: str, topic: Topic,
         inputs: tuple[Field, ...], outputs: tuple[Output, ...],
         retired: dict[str, str] | None = None, renamed: dict[str, str] | None = None):
    """Declare the decorated function as the tool `tool_id`; its parameters are the inputs.

    `retired` names input keys the tool no longer takes, each with what to type instead;
    `renamed` maps old input keys to their new ones (a saved reading or a script that uses
    an old key keeps working).
    """
    def declare(fn: Callable[..., Result]) -> Callable[..., Result]:
        check_signature(tool_id, fn, [f.key for f in inputs])
        register(Tool(tool_id, title, summary, topic, tuple(inputs), tuple(outputs), fn,
                      retired=tuple((retired or {}).items()),
                      renamed=tuple((renamed or {}).items())))
        return fn

    return declare


_discovered = False


def discover() -> None:
    """Import every module of PACKAGES once; importing a module declares its tools.

    After a memory-snapshot restore the package files may not be on disk yet: the flag,
    set before the snapshot is taken, keeps this from looking again.
    """
    global _discovered
    if _discovered:
        return
    for package_name in PACKAGES:
        package = importlib.import_module(package_name)
        for info in sorted(pkgutil.iter_modules(package.__path__), key=lambda m: m.name):
            importlib.import_module(f"{package_name}.{info.name}")
    _discovered = True


def _order(found: Tool) -> tuple:
    return TOPICS.index(found.topic), found.title.casefold()


_catalogue: dict[str, Tool] = {}


def tools() -> dict[str, Tool]:
    """Every tool and checklist, in catalogue order: by topic (TOPICS), then by title.

    The order is worked out once per set of declarations (a machine page asks for tools a
    few thousand times); the dict returned is a copy, so a caller cannot change it.
    """
    discover()
    if len(_catalogue) != len(_TOOLS) or any(_catalogue.get(k) is not t for k, t in _TOOLS.items()):
        _catalogue.clear()
        _catalogue.update({t.id: t for t in sorted(_TOOLS.values(), key=_order)})
    return dict(_catalogue)


def of_kind(kind: str) -> dict[str, Tool]:
    """The tools (kind "tool") or the checklists (kind "checklist"), in catalogue order."""
    return {i: t for i, t in tools().items() if t.kind == kind}


def get(tool_id: str) -> Tool:
    discover()
    found = _TOOLS.get(tool_id) if isinstance(tool_id, str) else None
    if found is None:
        raise InputError("tool", "no tool {typed}; run `python -m calc tools` for the list",
                         typed=typed(tool_id))
    return found
