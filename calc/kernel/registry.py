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
from .errors import QUOTE_CHARS, InputError, typed
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

# What a blank field means, one rule for the page, the bridge and the CLI:
# - a reading or a machine fact left blank is not given: an error beside the field (unless
#   the field is optional). Its declared default is only an example, used when the caller
#   asks for examples on purpose (the form's "Fill an example", `--example` in the CLI,
#   the self-check);
# - a limit or option left blank takes its standard value, which the form shows in the
#   field from the start (a choice or a tick box always has a value).
#
# A field used only in some modes declares `when=(mode key, values)`. An input the chosen
# mode does not use is refused, naming the field and the mode that uses it; when the mode
# itself was not given and the inputs given all point to one mode, that mode is chosen
# and a notice says so (the page never sends a hidden field, so it never relies on this).

# The range usual in hydraulic work for each quantity (common practice, metric): a value
# outside it still computes, with a notice beside the field asking to check the reading.
# A field whose usual range differs from its quantity's declares its own `usual`.
USUAL = {
    "temperature": (-30.0, 100.0),  # cold start outdoors to a hot circuit
    "temperature_difference": (5.0, 15.0),
    "kinematic_viscosity": (2.0, 2000.0),
    "absolute_pressure": (0.5, 3.0),
    "pressure": (0.0, 420.0),  # working pressures of industrial and mobile hydraulics
    "acid_number": (0.0, 4.0),
    "density": (820.0, 1100.0),  # mineral oils to phosphate esters and water glycols
    "flow": (1.0, 2000.0),
    "foam_ml": (0.0, 600.0),
    "hours": (1.0, 100000.0),
    "minutes": (0.1, 30.0),
    "molar_energy": (40.0, 150.0),
    "per_bar": (0.8e-3, 4.0e-3),  # Barus coefficient of mineral and synthetic oils
    "per_ml": (0.0, 1.0e6),
    "percent": (0.0, 100.0),
    "power": (0.1, 500.0),
    "ppm": (0.0, 10000.0),
    "velocity": (0.2, 10.0),
    "vi": (50.0, 300.0),
    "volume": (1.0, 100000.0),
    "force": (10.0, 2.0e6),
    "length_m": (0.0, 10.0),
}


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
    when : (mode key, values): the field is used only while the choice field `mode key`
        holds one of `values` (see the blank and mode rules above)
    usual : (low, high) metric, the range usual in hydraulic work when it is not the
        quantity's own (USUAL); common practice, a value outside it gets a notice
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
    when: tuple[str, tuple[str, ...]] | None = None
    usual: tuple[float, float] | None = None

    def __post_init__(self):
        if self.binds is not None and self.group == "reading":
            object.__setattr__(self, "group", "machine")
        if self.when is not None and isinstance(self.when[1], str):
            object.__setattr__(self, "when", (self.when[0], (self.when[1],)))

    @property
    def usual_range(self) -> tuple[float, float] | None:
        """The range usual in hydraulic work (common practice), metric; None for a field
        that is not a number."""
        if not self.is_number:
            return None
        return self.usual or USUAL.get(self.quantity)

    def notice(self, value: float) -> InputError | None:
        """A word beside a value that computes but is outside the usual range, else None."""
        usual = self.usual_range
        if usual is None or usual[0] <= value <= usual[1]:
            return None
        side = "above" if value > usual[1] else "below"
        return InputError(self.key, "{value} is {side} the usual range of {label}, {low} to "
                          "{high} (common practice): check the reading",
                          value=Q(value, self.quantity), side=Q(side, "text"),
                          label=Q(self.label, "text"), low=Q(usual[0], self.quantity),
                          high=Q(usual[1], self.quantity))

    @property
    def blank_takes_default(self) -> bool:
        """A blank limit or option takes its standard value; a blank reading or machine
        fact is not given (its default is only an example)."""
        return self.group == "limits" or self.is_choice

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
        if self.usual_range is None:
            raise ValueError(f"{where}: field {self.key!r} needs a usual range: its quantity "
                             f"{self.quantity!r} has none in registry.USUAL")
        low, high = self.usual_range
        if not low <= high or (self.min is not None and high < self.min) or (
                self.max is not None and low > self.max):
            raise ValueError(f"{where}: field {self.key!r} usual range {self.usual_range} "
                             "does not overlap its limits")
        if self.default is None and not self.optional:
            return
        if self.default is not None:
            self.check_range(float(self.default), "metric")

    def parse(self, raw: object, system: str, examples: bool = False) -> float | str | None:
        """The metric value of what was typed, or InputError naming this field.

        Blank: the example (the declared default) with ``examples``, also of an optional
        field that has one; else None when optional; a limit's or option's standard value;
        else an error.
        """
        if self.is_flag:
            return _parse_flag(raw, self.key)
        if _blank(raw):
            if self.optional and not (examples and self.default is not None):
                return None
            if self.default is None or not (examples or self.blank_takes_default):
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
        value = self.at_shown_limit(value, system)
        self.check_range(value, system)
        return value

    def at_shown_limit(self, value: float, system: str) -> float:
        """A value just past a limit that reads the same as the limit in `system` (the limit
        as a message shows it, rounded: 264200 US gal for 1 000 000 L) is the limit itself:
        limits are compared before rounding, so the figure the form shows is accepted."""
        for limit, past in ((self.min, lambda: value < self.min), (self.max, lambda: value > self.max)):
            if limit is not None and past() and (units.show_number(value, self.quantity, system)
                                                 == units.show_number(limit, self.quantity, system)):
                return float(limit)
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

    def choice_label(self, value: str) -> str:
        return dict(self.choices).get(value, value)

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
                  "binds": self.binds, "tracks": self.tracks,
                  "when": None if self.when is None else {"key": self.when[0],
                                                          "values": list(self.when[1])}}
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
            "usual": None if self.usual_range is None else [convert(v) for v in self.usual_range],
        }


def _finite(value: object) -> bool:
    return isinstance(value, (int, float)) and not isinstance(value, bool) and math.isfinite(value)


@dataclass(frozen=True)
class Parsed:
    """A tool's inputs parsed: metric values, the keys the card filled, the parse's notices."""

    values: dict
    from_card: list[str]
    notices: list[InputError]


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
    # Tools that answer a neighbouring question, each with why and which governs (one answer
    # per question: where two tools weigh the same decision, each says so and links the other).
    related: tuple[tuple[str, str], ...] = ()

    def field(self, key: str) -> Field:
        for f in self.inputs:
            if f.key == key:
                return f
        raise KeyError(key)

    @property
    def headline(self) -> tuple[str, ...]:
        return tuple(o.key for o in self.outputs if o.headline)

    def parse(self, raw: dict, system: str = "metric", facts: dict | None = None,
              examples: bool = False) -> dict:
        """All inputs in metric units, every bad field reported at once.

        `facts` are a machine card's facts (metric, calc.machines.card): a bound input left
        blank takes its card field's value, checked like a typed one; one that does not fit
        this tool is an error naming the input and saying the value came from the card
        (never a silent fall-back to the tool's default). Blank fields and modes follow the
        rules at the top of this module; ``examples`` fills blank readings and facts with
        the declared examples.
        """
        return self.parse_from(raw, system, facts, examples).values

    def parse_from(self, raw: dict, system: str = "metric", facts: dict | None = None,
                   examples: bool = False) -> Parsed:
        """The inputs in metric, the keys that came from the card and the notices of the
        parse (a mode chosen from the inputs given): see `parse`."""
        raw, errors = self.rename_old_keys(raw)
        facts = facts or {}
        chosen, from_card, notices = self._choose_modes(raw, system, facts, errors)
        for f in self.inputs:
            if (f.key not in chosen and f.binds and facts.get(f.binds) is not None
                    and _blank(raw.get(f.key)) and self.uses(f, chosen)):
                from_card.append(f.key)
        metric = {k: facts[self.field(k).binds] for k in from_card if k not in chosen}
        values = self._parse(raw, system, metric, errors, chosen, examples, notices)
        return Parsed(values, [f.key for f in self.inputs if f.key in from_card], notices)

    def without_unused(self, raw: dict) -> dict:
        """`raw` without the inputs its own modes (as typed, else their defaults) do not use:
        a form of an earlier build sent every field, used or not."""
        modes = {key: str(raw.get(key) or "").strip() or default
                 for key, default in self.default_modes().items()}
        return {k: v for k, v in raw.items()
                if not any(f.key == k and not self.uses(f, modes) for f in self.inputs)}

    def default_modes(self) -> dict:
        """{mode key: its default choice}: the modes a form starts in."""
        return {f.when[0]: self.field(f.when[0]).default for f in self.inputs if f.when}

    @staticmethod
    def uses(f: Field, chosen: dict) -> bool:
        """Whether field `f` is used by the modes `chosen` ({mode key: value})."""
        return f.when is None or chosen.get(f.when[0]) in f.when[1]

    def _choose_modes(self, raw: dict, system: str, facts: dict,
                      errors: list[InputError]) -> tuple[dict, list[str], list[InputError]]:
        """({mode key: value}, mode keys the card gave, notices): each mode typed, else
        the card's, else the one mode every input given points to, else its default; an
        input its mode does not use is an error (the rule at the top of this module)."""
        chosen, from_card, notices = {}, [], []
        for mode_key in dict.fromkeys(f.when[0] for f in self.inputs if f.when):
            mode = self.field(mode_key)
            fact = facts.get(mode.binds) if mode.binds else None
            given = True
            if not _blank(raw.get(mode_key)):
                try:
                    chosen[mode_key] = mode.parse(raw[mode_key], system)
                except InputError as err:
                    errors.append(err)
                    chosen[mode_key] = mode.default
            elif fact is not None and mode.accepts(fact):
                chosen[mode_key], given = fact, True
                from_card.append(mode_key)
            else:
                chosen[mode_key], given = mode.default, False
            users = [f for f in self.inputs
                     if f.when and f.when[0] == mode_key and not _blank(raw.get(f.key))]
            common = set.intersection(*(set(f.when[1]) for f in users)) if users else set()
            if not given and chosen[mode_key] not in common and len(common) == 1:
                chosen[mode_key] = common.pop()
                notices.append(InputError(mode_key, "{mode} set to “{value}”: the "
                                          "only choice that uses {keys}",
                                          mode=Q(mode.label, "text"),
                                          value=Q(mode.choice_label(chosen[mode_key]), "text"),
                                          keys=Q(", ".join(f.key for f in users), "text")))
            for f in users:
                if chosen[mode_key] not in f.when[1]:
                    errors.append(InputError(
                        f.key, "{label} is used only when {mode} is {values}, and it is "
                        "“{now}”: leave it blank or choose that",
                        label=Q(f.label, "text"), mode=Q(mode.label, "text"),
                        values=Q(" or ".join(f"“{mode.choice_label(v)}”"
                                            for v in f.when[1]), "text"),
                        now=Q(mode.choice_label(chosen[mode_key]), "text")))
        return chosen, from_card, notices

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

    def _parse(self, raw: dict, system: str, metric: dict, errors: list[InputError],
               chosen: dict, examples: bool, notices: list[InputError]) -> dict:
        unknown = sorted(set(raw) - {f.key for f in self.inputs})
        retired = dict(self.retired)
        inputs = Q(", ".join(f.key for f in self.inputs), "text")
        errors += [InputError(k, "is no longer an input of {tool}: {instead}",
                             tool=Q(self.id, "text"), instead=Q(retired[k], "text"))
                  if k in retired else
                  InputError(k[:QUOTE_CHARS], "is not an input of {tool}; inputs are {inputs}",
                             tool=Q(self.id, "text"), inputs=inputs) for k in unknown]
        values = {}
        for f in self.inputs:
            if f.key in chosen:
                values[f.key] = chosen[f.key]
                continue
            if not self.uses(f, chosen):
                values[f.key] = f.default  # not used in the chosen mode: never read
                continue
            if f.key in metric:
                try:
                    values[f.key] = f.parse(metric[f.key], "metric")
                except InputError as err:
                    errors.append(InputError(f.key, Text(
                        err.text.template + " (this value is the machine card's: type one for "
                        "this reading, or correct the card)", err.text.args, err.text.named)))
                continue
            try:
                values[f.key] = f.parse(raw.get(f.key), system, examples)
            except InputError as err:
                errors.append(err)
                continue
            if (examples and _blank(raw.get(f.key)) and values[f.key] is not None
                    and not f.is_flag and not f.blank_takes_default):
                shown = Q(values[f.key], f.quantity if f.is_number else "text")
                notices.append(InputError(f.key, "{label}: the example {value}, not a reading",
                                          label=Q(f.label, "text"), value=shown))
        if errors:
            raise InputError.combine(errors)
        return values

    def run(self, raw: dict, system: str = "metric", facts: dict | None = None,
            examples: bool = False) -> Result:
        parsed = self.parse_from(raw, units.check_system(system), facts, examples)
        return self.run_parsed(parsed.values, parsed.notices)

    def run_parsed(self, values: dict, notices: list[InputError] = ()) -> Result:
        """The answer to inputs already parsed to metric (as `parse` gives them), with the
        notices of the parse and one beside each value outside its usual range."""
        result = self.compute(**values)
        self._check(result)
        chosen = {f.when[0]: values.get(f.when[0]) for f in self.inputs if f.when}
        unusual = [f.notice(float(values[f.key])) for f in self.inputs
                   if f.is_number and self.uses(f, chosen) and _finite(values.get(f.key))]
        result.notices = [(n.field, n.text) for n in [*notices, *unusual] if n is not None]
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
            "modes": sorted({f.when[0] for f in self.inputs if f.when}),
            "related": [{"tool": other, "why": why} for other, why in self.related],
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
         retired: dict[str, str] | None = None, renamed: dict[str, str] | None = None,
         related: dict[str, str] | None = None):
    """Declare the decorated function as the tool `tool_id`; its parameters are the inputs.

    `retired` names input keys the tool no longer takes, each with what to type instead;
    `renamed` maps old input keys to their new ones (a saved reading or a script that uses
    an old key keeps working); `related` maps the ids of tools that weigh the same decision
    to a sentence on which one governs and why.
    """
    def declare(fn: Callable[..., Result]) -> Callable[..., Result]:
        check_signature(tool_id, fn, [f.key for f in inputs])
        register(Tool(tool_id, title, summary, topic, tuple(inputs), tuple(outputs), fn,
                      retired=tuple((retired or {}).items()),
                      renamed=tuple((renamed or {}).items()),
                      related=tuple((related or {}).items())))
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
