"""What every tool returns: values, verdicts, notes and sources.

Verdict and note texts may hold ``{0}``, ``{1}`` placeholders filled with
quantities (`Q`), so the edge can show them in the reader's unit system:
calc never formats a unit itself.
"""

from __future__ import annotations

from dataclasses import dataclass, field
from typing import Callable, NamedTuple

LEVELS = ("ok", "watch", "act")

# Bases of a rule, as the design asks every verdict to carry one.
COMMON_PRACTICE = "common practice"
FROM_MEMORY = "from memory"


class Q(NamedTuple):
    """A metric value with its quantity, for a placeholder in a message."""

    value: float
    quantity: str


@dataclass(frozen=True)
class Text:
    """A sentence with ``{n}`` placeholders and the quantities that fill them."""

    template: str
    args: tuple[Q, ...] = ()

    def render(self, show) -> str:
        """`show(value, quantity)` formats one quantity."""
        return self.template.format(*(show(a.value, a.quantity) for a in self.args))


def text(template: str, *args: Q) -> Text:
    return Text(template, tuple(args))


@dataclass(frozen=True)
class Verdict:
    """One finding: level ok / watch / act, a plain sentence, and its basis."""

    level: str
    message: Text
    basis: str

    def __post_init__(self):
        if self.level not in LEVELS:
            raise ValueError(f"verdict level must be one of {LEVELS}, not {self.level!r}")


def verdict(level: str, basis: str, template: str, *args: Q) -> Verdict:
    return Verdict(level, Text(template, tuple(args)), basis)


@dataclass(frozen=True)
class Cause:
    """One likely cause in a troubleshooting ranking, with the reasons for its rank."""

    key: str
    title: str
    score: float
    reasons: tuple[Text, ...] = ()


@dataclass
class Result:
    """A tool's answer, all in calc's metric units."""

    values: dict[str, float | str | None]
    verdicts: list[Verdict] = field(default_factory=list)
    notes: list[Text] = field(default_factory=list)
    sources: list[str] = field(default_factory=list)
    # SVG charts, each drawn by a function of the unit system ("metric" / "us"), so the
    # edge can ask for the reader's units; calc itself never picks them.
    charts: dict[str, Callable[[str], str]] = field(default_factory=dict)
    ranked: list[Cause] = field(default_factory=list)  # most likely first

    def note(self, template: str, *args: Q) -> None:
        self.notes.append(Text(template, tuple(args)))

    def add(self, level: str, basis: str, template: str, *args: Q) -> None:
        self.verdicts.append(verdict(level, basis, template, *args))

    @property
    def level(self) -> str:
        """The worst verdict level, "ok" when there is none."""
        return max((v.level for v in self.verdicts), key=LEVELS.index, default="ok")
