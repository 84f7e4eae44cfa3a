"""Ranking the likely causes of a fault: the scoring and the declaration shared by every checklist.

A checklist is declared once, in its own module under calc/checklists/, with `checklist`:
its causes (each with its checks and its caution, in the order of its printed page), its
symptoms (tick boxes, each giving points to the causes it points to), its readings
(fields), and a rules function that weighs the readings. Its prose (why each cause
happens) is in site_src/checklists/<name>.md, one section per cause key.

Every symptom ticked and every reading entered adds points to the causes it points to,
and records why:

    STRONG   = 3   a reading beyond its limit, or a symptom that points to one cause
    MODERATE = 2   a symptom that points mainly to this cause
    WEAK     = 1   a symptom shared by several causes
    AGAINST  = -2  a reading inside its limit that speaks against this cause

A cause's score is the plain sum of its points. Causes are ranked by score,
highest first; equal scores keep the checklist's own order (quick, external
checks first). The weights are common practice for a first look at the machine,
not a diagnosis: they say where to start.

>>> board = Scoreboard((("a", "First cause"), ("b", "Second cause")))
>>> board.add("b", STRONG, "reading over its limit")
>>> [c.key for c in board.ranked()]
['b', 'a']
"""

from __future__ import annotations

from typing import NamedTuple

from ..kernel.errors import InputError
from ..kernel.registry import TROUBLESHOOTING, Cause, Check, Field, Output, Tool, check_signature, \
    register
from ..kernel.result import COMMON_PRACTICE, Q, RankedCause, Result, Text, text

__all__ = ("AGAINST", "MODERATE", "STRONG", "WEAK", "READING_BASIS", "Cause", "Check",
           "Scoreboard", "Symptom", "both_or_neither", "checklist", "checklist_result")

STRONG = 3.0
MODERATE = 2.0
WEAK = 1.0
AGAINST = -2.0

BASIS = "weighted scoring of symptoms and readings, common practice"
# The basis of the checklists' own verdicts on a reading against its limit.
READING_BASIS = COMMON_PRACTICE + ", from memory"

# What every checklist shows above its ranked causes.
RANKING_OUTPUTS = (
    Output("top_cause", "Most likely cause", "text", headline=True),
    Output("causes_flagged", "Causes with points", "count"),
)


def flag(key: str, label: str, help_text: str = "") -> Field:
    """A symptom's tick box, unticked to start."""
    return Field(key, label, "flag", False, help=help_text)


class Symptom(NamedTuple):
    """One tick box of a checklist and the points it gives when ticked.

    `gives` holds (cause key or keys, points, reason) in the order they are added.
    """

    key: str
    label: str
    gives: tuple[tuple[str | tuple[str, ...], float, str], ...]
    help: str = ""


def symptom_fields(symptoms: tuple[Symptom, ...]) -> tuple[Field, ...]:
    """The tick boxes of `symptoms`, in their order.

    >>> [f.key for f in symptom_fields((Symptom("noise", "Pump noisy", ()),))]
    ['noise']
    """
    return tuple(flag(s.key, s.label, s.help) for s in symptoms)


class Scoreboard:
    """Points and reasons per cause of one checklist, in the checklist's order."""

    def __init__(self, causes: tuple[tuple[str, str], ...] | tuple[Cause, ...]):
        self.causes = tuple(c if isinstance(c, tuple) else (c.key, c.title) for c in causes)
        self.points = {key: 0.0 for key, _ in self.causes}
        self.reasons: dict[str, list[Text]] = {key: [] for key, _ in self.causes}

    def add(self, key: str, points: float, template: str, /, *args: Q, **named: Q) -> None:
        """Give `points` to cause `key` for the reason `template` (with quantities)."""
        if key not in self.points:
            raise KeyError(f"no cause {key!r} in this checklist")
        self.points[key] += points
        self.reasons[key].append(text(template, *args, **named))

    def add_each(self, keys: tuple[str, ...], points: float, template: str, /, *args: Q,
                 **named: Q) -> None:
        for key in keys:
            self.add(key, points, template, *args, **named)

    def tick(self, symptoms: tuple[Symptom, ...], ticked: dict) -> int:
        """Add what every ticked symptom gives, in table order; return how many are ticked.

        >>> board = Scoreboard((("a", "First cause"), ("b", "Second cause")))
        >>> noise = Symptom("noise", "Pump noisy", ((("a", "b"), WEAK, "noise at the pump"),))
        >>> board.tick((noise,), {"noise": True}), board.points
        (1, {'a': 1.0, 'b': 1.0})
        """
        unknown = set(ticked) - {s.key for s in symptoms}
        if unknown:
            raise TypeError(f"no symptom {min(unknown)!r} in this checklist")
        count = 0
        for symptom in symptoms:
            if not ticked.get(symptom.key):
                continue
            count += 1
            for causes, points, reason in symptom.gives:
                self.add_each((causes,) if isinstance(causes, str) else causes, points, reason)
        return count

    def weigh(self, key: str, beyond: bool, points: float, beyond_reason: str,
              within_reason: str, *args: Q) -> None:
        """A reading against its limit: `points` to `key` when `beyond` it, else AGAINST.

        Both reasons take the same quantities `args`.

        >>> board = Scoreboard((("a", "First cause"),))
        >>> board.weigh("a", False, STRONG, "{0} over the limit", "{0} within the limit",
        ...             Q(1.0, "percent"))
        >>> board.points["a"]
        -2.0
        """
        if beyond:
            self.add(key, points, beyond_reason, *args)
        else:
            self.add(key, AGAINST, within_reason, *args)

    def ranked(self) -> list[RankedCause]:
        """All causes, most likely first; ties keep the checklist's order."""
        order = {key: i for i, (key, _) in enumerate(self.causes)}
        causes = [RankedCause(key, title, self.points[key], tuple(self.reasons[key]))
                  for key, title in self.causes]
        return sorted(causes, key=lambda c: (-c.score, order[c.key]))


def checklist_result(board: Scoreboard, readings: int, caution: str,
                     found: Result | None = None) -> Result:
    """The checklist's answer: ranked causes, the top one, and an overall verdict.

    `readings` counts the symptoms ticked and readings entered; `caution` is the
    list's own safety sentence, always shown. `found` holds what the checklist's rules
    concluded from its readings (their verdicts, values, notes and sources), added after
    the ranking's own.

    >>> board = Scoreboard((("a", "First cause"), ("b", "Second cause")))
    >>> board.add("b", WEAK, "noise at the pump")
    >>> r = checklist_result(board, 1, "Lock out first.")
    >>> r.values["top_cause"], r.values["causes_flagged"]
    ('Second cause', 1.0)
    """
    ranked = board.ranked()
    flagged = [c for c in ranked if c.score > 0]
    top = ranked[0]
    result = Result(values={"top_cause": top.title if flagged else "none flagged yet",
                            "causes_flagged": float(len(flagged))}, ranked=ranked)
    if not readings:
        result.add("ok", COMMON_PRACTICE,
                   "Nothing ticked or entered yet: the causes stand in the order to check them, "
                   "quick outside checks first.")
    elif not flagged:
        result.add("ok", BASIS,
                   "What you entered points to none of the listed causes above the others: "
                   "work through the list in order.")
    else:
        runner_up = ranked[1].score if len(ranked) > 1 else 0.0
        result.add("watch", BASIS, "Start with: {cause}; it stands well clear of the other "
                   "causes." if top.score - runner_up >= STRONG else "Start with: {cause}; then "
                   "the next causes in the list, which score close.", cause=Q(top.title, "text"))
    result.note(caution)
    result.note("The ranking says where to start, not what is wrong: confirm each cause with its "
                "checks, and follow the equipment maker's manual, local codes and licensed "
                "practice.")
    result.sources.append("Ranking: " + BASIS)
    if found is not None:
        result.values.update(found.values)
        result.verdicts += found.verdicts
        result.notes += found.notes
        result.sources += found.sources
    return result


def both_or_neither(message: str, **readings) -> None:
    """Raise InputError on the first blank of readings that only mean something together.

    >>> both_or_neither("enter both or neither", oil_volume=200.0, pump_flow=None)
    Traceback (most recent call last):
    ...
    calc.kernel.errors.InputError: pump_flow: enter both or neither
    """
    blank = [key for key, value in readings.items() if value is None]
    if blank and len(blank) < len(readings):
        raise InputError(blank[0], message)


def count_entered(*values) -> int:
    """How many symptoms are ticked and readings entered (None and False do not count).

    >>> count_entered(True, False, None, 0.0, 12.5)
    3
    """
    return sum(1 for v in values if v is not None and v is not False)


def checklist(tool_id: str, *, title: str, summary: str, causes: tuple[Cause, ...],
              symptoms: tuple[Symptom, ...], readings: tuple[Field, ...], caution: str,
              sources: tuple[str, ...], outputs: tuple[Output, ...] = (),
              renamed: dict[str, str] | None = None):
    """Declare the decorated rules function as the checklist `tool_id`.

    The rules are called as ``rules(board, found, **readings)`` after the ticked symptoms
    have given their points: they weigh the readings on `board` and put their own
    verdicts, values and notes on `found` (a Result). Every symptom a cause names, and
    every cause of the checklist, is checked when the module is imported.

    The decorated name becomes the whole checklist as a function of its inputs (symptoms
    unticked and readings at their defaults unless given), returning the Result.
    """
    keys = {c.key for c in causes}
    if len(keys) != len(causes):
        raise ValueError(f"{tool_id}: duplicate cause keys")
    for c in causes:
        check_keys = [k.key for k in c.checks]
        if len(set(check_keys)) != len(check_keys):
            raise ValueError(f"{tool_id}: duplicate check keys in cause {c.key!r}")
    for symptom in symptoms:
        for named, _points, _reason in symptom.gives:
            unknown = {named} if isinstance(named, str) else set(named)
            if unknown - keys:
                raise ValueError(f"{tool_id}: symptom {symptom.key!r} gives points to "
                                 f"unknown causes {sorted(unknown - keys)}")
    counted = [f.key for f in readings if f.group == "reading" and not f.is_choice]

    def declare(rules):
        check_signature(tool_id, rules, [f.key for f in readings], skip=2)

        def compute(**inputs) -> Result:
            board = Scoreboard(causes)
            ticked = board.tick(symptoms, {s.key: inputs.pop(s.key) for s in symptoms})
            found = Result(values={})
            rules(board, found, **inputs)
            weighed = any(score != 0 for score in board.points.values())
            entered = ticked + count_entered(*(inputs[k] for k in counted)) + weighed
            result = checklist_result(board, entered, caution, found)
            result.sources[1:1] = list(sources)
            return result

        fields = symptom_fields(symptoms) + tuple(readings)
        register(Tool(tool_id, title, summary, TROUBLESHOOTING, fields,
                      RANKING_OUTPUTS + tuple(outputs), compute, kind="checklist",
                      causes=tuple(causes), renamed=tuple((renamed or {}).items())))

        def run(**given) -> Result:
            unknown = set(given) - {f.key for f in fields}
            if unknown:
                raise TypeError(f"{tool_id} has no input {min(unknown)!r}")
            return compute(**{f.key: given.get(f.key, f.default) for f in fields})

        run.__name__, run.__doc__, run.rules = rules.__name__, rules.__doc__, rules
        return run

    return declare
