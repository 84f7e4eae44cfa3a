"""What every tool returns: values, verdicts, notes and sources.

A verdict or note is a `Text`: a sentence whose ``{name}`` (or ``{0}``) placeholders are
filled with quantities (`Q`) only when the edge renders it in the reader's unit system;
calc never formats a unit itself.

Verdicts come from grading a value against its bands (`calc.kernel.grading`):

>>> from calc.kernel.grading import Band
>>> r = Result(values={})
>>> r.grade(7.0, (Band("act", "Loss {loss} is large.", at_least=5.0),
...               Band("ok", "Loss {loss} is small.")), COMMON_PRACTICE,
...         loss=Q(7.0, "percent")).level
'act'
>>> r.verdicts[0].message.render(lambda v, q: f"{v:g} %")
'Loss 7 % is large.'
"""

from __future__ import annotations

import math
from dataclasses import dataclass, field
from typing import Callable, NamedTuple

from .grading import Band, pick

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
    """A sentence with ``{0}`` / ``{name}`` placeholders and the quantities that fill them."""

    template: str
    args: tuple[Q, ...] = ()
    named: tuple[tuple[str, Q], ...] = ()

    def render(self, show) -> str:
        """`show(value, quantity)` formats one quantity."""
        return self.template.format(*(show(a.value, a.quantity) for a in self.args),
                                    **{k: show(q.value, q.quantity) for k, q in self.named})


def text(template: str, /, *args: Q, **named: Q) -> Text:
    return Text(template, tuple(args), tuple(named.items()))


@dataclass(frozen=True)
class Verdict:
    """One finding: level ok / watch / act, a plain sentence, and its basis."""

    level: str
    message: Text
    basis: str

    def __post_init__(self):
        if self.level not in LEVELS:
            raise ValueError(f"verdict level must be one of {LEVELS}, not {self.level!r}")


def verdict(level: str, basis: str, template: str, /, *args: Q, **named: Q) -> Verdict:
    return Verdict(level, text(template, *args, **named), basis)


# How a cause's score reads in words (calc.checklists.scoreboard gives the points: 3 for a
# reading past its limit or a sign that points to one cause, 2 for a sign that points mainly
# to it, 1 for a shared sign, -2 against). No points is no evidence, never "likely".
SCORE_WORDS = ((5.0, "strong evidence"), (3.0, "likely"), (1.0, "possible"),
               (-math.inf, "no evidence yet"))


def score_word(score: float) -> str:
    """The words for a cause's score.

    >>> [score_word(s) for s in (0.0, 1.0, 2.0, 3.0, 6.0, -2.0)]
    ['no evidence yet', 'possible', 'possible', 'likely', 'strong evidence', 'no evidence yet']
    """
    return next(word for least, word in SCORE_WORDS if score >= least)


@dataclass(frozen=True)
class RankedCause:
    """One cause in a troubleshooting ranking, with its points and the reasons for them."""

    key: str
    title: str
    score: float
    reasons: tuple[Text, ...] = ()

    @property
    def word(self) -> str:
        return score_word(self.score)


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
    ranked: list[RankedCause] = field(default_factory=list)  # most likely first
    # (input key, message) of a value that computes but asks for a look: outside the range
    # usual in hydraulic work, or a mode chosen from the inputs given (registry sets these).
    notices: list[tuple[str, Text]] = field(default_factory=list)

    def note(self, template: str, /, *args: Q, **named: Q) -> None:
        self.notes.append(text(template, *args, **named))

    def add(self, level: str, basis: str, template: str, /, *args: Q, **named: Q) -> None:
        self.verdicts.append(verdict(level, basis, template, *args, **named))

    def grade(self, value: float, bands: tuple[Band, ...], basis: str | None = None, /,
              **named: Q) -> Band | None:
        """Add the verdict of the first band that holds `value`; returns that band, or None
        (and adds nothing) when no band holds it.

        A band's own basis wins over `basis`. Bounds that name a quantity ("act") are
        read from `named`, which also fills the sentence's placeholders.
        """
        band = pick(value, bands, {k: q.value for k, q in named.items()})
        if band is None:
            return None
        chosen = band.basis or basis
        if chosen is None:
            raise ValueError(f"no basis for the verdict {band.says!r}")
        self.add(band.level, chosen, band.says, **named)
        return band

    @property
    def level(self) -> str:
        """The worst verdict level, "ok" when there is none."""
        return max((v.level for v in self.verdicts), key=LEVELS.index, default="ok")
