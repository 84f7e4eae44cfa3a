"""The catalogue of tools: each declared once, beside the function that computes it.

A topic module declares a tool with the `tool` decorator::

    @tool("viscosity-at-temperature", title=..., summary=..., topic="Viscosity",
          inputs=(Field("kv40", "KV at 40 °C", "kinematic_viscosity", 46.0, min=0.5),),
          outputs=(Output("kv", "Viscosity at temp", "kinematic_viscosity"),))
    def viscosity_at_temperature_tool(kv40, ...): ...

The page's forms, the CLI's arguments, the web worker's dispatch and the
tests are all derived from these declarations.
"""

from __future__ import annotations

import importlib
import math
from dataclasses import dataclass
from typing import Callable

from . import units
from .errors import InputError
from .result import Result

# Topic modules, in the order the page lists them. Importing one registers its tools.
TOPIC_MODULES = (
    "calc.viscosity",
    "calc.vi",
    "calc.grades",
    "calc.blend",
    "calc.pressure",
    "calc.water",
    "calc.drying",
    "calc.tank",
    "calc.heat",
    "calc.lines",
    "calc.suction",
    "calc.air",
    "calc.foam",
    "calc.ageing",
    "calc.condition",
    "calc.cleanliness",
    "calc.convert",
    "calc.troubleshoot_aeration",
    "calc.troubleshoot_water",
    "calc.troubleshoot_overheating",
    "calc.troubleshoot_contamination",
    "calc.troubleshoot_spongy",
    "calc.troubleshoot_noisy_pump",
)

ABSOLUTE_ZERO_C = -273.15


@dataclass(frozen=True)
class Field:
    """One input of a tool.

    quantity : a key of `units.QUANTITIES`, "choice" for a pick from `choices`, or
        "flag" for a tick box (reaches the function as True / False)
    default : what the form starts with, metric; None with ``optional`` means blank
    min, max : the allowed range, metric, inclusive
    choices : (value, label) pairs of a choice field
    optional : a blank entry is allowed and reaches the function as None
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

    @property
    def is_choice(self) -> bool:
        return self.quantity in ("choice", "flag")

    @property
    def is_flag(self) -> bool:
        return self.quantity == "flag"

    def parse(self, raw: object, system: str) -> float | str | None:
        """The metric value of what was typed, or InputError naming this field."""
        if self.is_flag:
            return _parse_flag(raw, self.key)
        if raw is None or (isinstance(raw, str) and not raw.strip()):
            if self.optional:
                return None
            if self.default is None:
                raise InputError(self.key, f"{self.label} is needed")
            return self.default
        if self.is_choice:
            value = str(raw).strip()
            allowed = [c[0] for c in self.choices]
            if value not in allowed:
                raise InputError(self.key, f"must be one of {', '.join(allowed)}, not {value!r}")
            return value
        value = units.to_metric(units.parse_number(raw, self.key), self.quantity, system)
        self.check_range(value, system)
        return value

    def check_range(self, value: float, system: str) -> None:
        if self.quantity == "temperature" and value <= ABSOLUTE_ZERO_C:
            raise InputError(self.key, "is at or below absolute zero (-273.15 °C, -459.67 °F)")
        low_ok = self.min is None or value >= self.min
        high_ok = self.max is None or value <= self.max
        if low_ok and high_ok:
            return
        show = lambda v: units.show(v, self.quantity, system)  # noqa: E731
        if self.min is not None and self.max is not None:
            allowed = f"between {show(self.min)} and {show(self.max)}"
        elif self.min is not None:
            allowed = f"at least {show(self.min)}"
        else:
            allowed = f"at most {show(self.max)}"
        raise InputError(self.key, f"{self.label} must be {allowed}, not {show(value)}")

    def describe(self, system: str = "metric") -> dict:
        """This field for the catalogue, in `system` units."""
        convert = (lambda v: v) if self.is_choice else (
            lambda v: None if v is None else units.from_metric(v, self.quantity, system))
        if self.is_flag:
            return {"key": self.key, "label": self.label, "quantity": "flag", "unit": "",
                    "default": bool(self.default), "min": None, "max": None, "help": self.help,
                    "choices": [], "optional": True}
        return {
            "key": self.key,
            "label": self.label,
            "quantity": self.quantity,
            "unit": "" if self.is_choice else units.unit_label(self.quantity, system),
            "default": self.default if self.is_choice or self.default is None
            else convert(self.default),
            "min": None if self.is_choice else convert(self.min),
            "max": None if self.is_choice else convert(self.max),
            "help": self.help,
            "choices": [list(c) for c in self.choices],
            "optional": self.optional,
        }


_TRUE = ("1", "true", "yes", "on", "y")
_FALSE = ("", "0", "false", "no", "off", "n")


def _parse_flag(raw: object, key: str) -> bool:
    if raw is None or isinstance(raw, bool):
        return bool(raw)
    word = str(raw).strip().lower()
    if word in _TRUE:
        return True
    if word in _FALSE:
        return False
    raise InputError(key, f"is a tick box: yes or no, not {str(raw).strip()!r}")


@dataclass(frozen=True)
class Output:
    """One shown result of a tool."""

    key: str
    label: str
    quantity: str
    help: str = ""

    def describe(self, system: str = "metric") -> dict:
        return {"key": self.key, "label": self.label, "quantity": self.quantity,
                "unit": units.unit_label(self.quantity, system), "help": self.help}


@dataclass(frozen=True)
class Tool:
    id: str
    title: str
    summary: str
    topic: str
    inputs: tuple[Field, ...]
    outputs: tuple[Output, ...]
    compute: Callable[..., Result]

    def field(self, key: str) -> Field:
        for f in self.inputs:
            if f.key == key:
                return f
        raise KeyError(key)

    def parse(self, raw: dict, system: str = "metric") -> dict:
        """All inputs in metric units, every bad field reported at once."""
        unknown = sorted(set(raw) - {f.key for f in self.inputs})
        errors = [InputError(k, f"is not an input of {self.id}; inputs are "
                                f"{', '.join(f.key for f in self.inputs)}") for k in unknown]
        values = {}
        for f in self.inputs:
            try:
                values[f.key] = f.parse(raw.get(f.key), system)
            except InputError as err:
                errors.append(err)
        if errors:
            raise InputError.combine(errors)
        return values

    def run(self, raw: dict, system: str = "metric") -> Result:
        result = self.compute(**self.parse(raw, units.check_system(system)))
        self._check(result)
        return result

    def _check(self, result: Result) -> None:
        """A tool that returns a non-finite or undeclared value is a bug, not an answer."""
        declared = {o.key for o in self.outputs}
        extra = set(result.values) - declared
        if extra:
            raise RuntimeError(f"{self.id} returned undeclared outputs {sorted(extra)}")
        for key, value in result.values.items():
            if isinstance(value, float) and not math.isfinite(value):
                raise RuntimeError(f"{self.id} computed a non-finite {key}")

    def describe(self, system: str = "metric") -> dict:
        return {
            "id": self.id, "title": self.title, "summary": self.summary, "topic": self.topic,
            "inputs": [f.describe(system) for f in self.inputs],
            "outputs": [o.describe(system) for o in self.outputs],
        }


_TOOLS: dict[str, Tool] = {}


def tool(tool_id: str, *, title: str, summary: str, topic: str,
         inputs: tuple[Field, ...], outputs: tuple[Output, ...]):
    """Declare the decorated function as the tool `tool_id`."""
    keys = [f.key for f in inputs]
    if len(set(keys)) != len(keys):
        raise ValueError(f"{tool_id}: duplicate input keys")

    def register(fn: Callable[..., Result]) -> Callable[..., Result]:
        if tool_id in _TOOLS and _TOOLS[tool_id].compute is not fn:
            raise ValueError(f"tool {tool_id!r} declared twice")
        _TOOLS[tool_id] = Tool(tool_id, title, summary, topic, tuple(inputs), tuple(outputs), fn)
        return fn

    return register


def tools() -> dict[str, Tool]:
    """Every tool, in catalogue order."""
    for name in TOPIC_MODULES:
        importlib.import_module(name)
    return dict(_TOOLS)


def get(tool_id: str) -> Tool:
    found = tools().get(tool_id)
    if found is None:
        raise InputError("tool", f"no tool {tool_id!r}; run `python -m calc tools` for the list")
    return found
