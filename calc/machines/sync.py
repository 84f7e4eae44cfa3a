"""Records that travel: the export file, and the merge of another phone's records with
this one's.

Machines, readings and checklist results are documents (calc.machines.revisions): an id,
a rev "N-h", a history of earlier revs and an update time; a deletion is a marker with
``deleted: true``. A document may also hold ``conflicts``: the other sides of edits made
apart, kept until the user settles them (`revisions.settle`).

The merge rules. For each id, the sides both phones hold (the shown revision and its
conflicts) are pooled, and:

1. a document only one phone holds is kept (a deletion marker too, so it travels on);
2. the same rev is the same revision (a rev names one content);
3. a revision in another's history is older: the one that descends from it wins (a
   reading deleted on one phone and untouched on the other is deleted everywhere);
4. what is left was made apart (concurrent). A side that is not a deletion is shown
   before a deletion, so an edit is never lost to a deletion made apart: an edited card
   or reading note comes back, with the deletion kept beside it for the user to confirm;
   among the rest the winner is, for a card, the higher N and then the higher hash; for a
   reading or checklist result (whose content is what was measured or ticked), the later
   ``updated``, then N, then hash. Every other side is kept, in that order, under
   ``conflicts`` (at most CONFLICTS_MAX): nothing is dropped, and "1 conflict to settle"
   is said until the user chooses.

The outcome is a function of the pooled sides alone, so merging is commutative (A into B
gives what B into A gives), idempotent (merging the same file again changes nothing) and
the order in which phones swap files does not matter: they all end the same.

The export file:

    {"format": "sumpside-export", "version": 2, "exported": time,
     "machines": [...], "readings": [...], "checks": [...]}   (deletion markers included)

`checked_export` reads it (and version 1: machines and readings without revs, each read
as revision 1 of its content; and a bare list, the log of an earlier build, migrated by
`records.migrate`); a file that is not one, or not whole, raises InputError and gives
nothing; a record in it that does not hold to its shape is refused, with a reason.

>>> from calc.machines import records
>>> card = records.new_machine({"name": "Saw 4"}, "metric", "2026-03-04T09:15:00+01:00",
...                            machine_id="saw-4")
>>> mine = revisions.revised({**card, "card": {"name": "Saw 4 (north)"}},
...                          "2026-03-05T08:00:00+01:00")
>>> theirs = revisions.revised({**card, "card": {"name": "Saw 4, bay 2"}},
...                            "2026-03-05T09:00:00+01:00")
>>> merge([mine], [theirs])["message"]
'1 card updated, 1 conflict to settle'
>>> merge([theirs], [mine])["message"]
'1 conflict to settle'
>>> shown = merge([theirs], [mine])["put"]["machines"][0]
>>> shown["card"]["name"], [side["card"]["name"] for side in shown["conflicts"]]
('Saw 4, bay 2', ['Saw 4 (north)'])
"""

from __future__ import annotations

from dataclasses import dataclass
from typing import Callable

from ..kernel.errors import InputError
from ..kernel.result import Q
from . import records, revisions
from .checkmarks import CHECKS, checked_results
from .condition import when
from .revisions import leaves, rev_order, with_rev

EXPORT = "sumpside-export"
EXPORT_VERSION = 2
CONFLICTS_MAX = 20
DOCS_MAX = 200_000
# The deepest a whole export nests: file, list, record, conflicts, record, member, value.
EXPORT_DEPTH_MAX = 8
REASONS_MAX = 5
# The page's mark on a document of a file that this phone holds the same (`checked_export`).
HELD_HERE = "held_here"


def _instant(doc: dict) -> float:
    found = when(doc.get("updated"))
    return found.timestamp() if found else float("-inf")


def _card_order(doc: dict) -> tuple:
    return rev_order(doc["rev"])


def _measured_order(doc: dict) -> tuple:
    return (_instant(doc), *rev_order(doc["rev"]))


@dataclass(frozen=True)
class Kind:
    """One kind of document: its format, its checker (a clean copy, or InputError) and the
    order of its concurrent sides (the first is shown)."""

    format: str
    check: Callable[[object], dict]
    order: Callable[[dict], tuple]


KINDS = {
    "machines": Kind(records.MACHINE, records.checked_machine, _card_order),
    "readings": Kind(records.READING, records.checked_reading, _measured_order),
    "checks": Kind(CHECKS, checked_results, _measured_order),
}
BY_FORMAT = {k.format: name for name, k in KINDS.items()}
ACTIONS = ("added", "updated", "deleted", "refused")
# A record of each kind named by its place in a file: "reading 2: ...".
ONE = {"machines": "card", "readings": "reading", "checks": "checklist result"}

# What a merge says, per action and kind: (one, several). Whole phrases, never nouns
# stitched to verbs, so each reads right (and can be put into another language whole).
SAID = {
    ("added", "machines"): ("{n} card added", "{n} cards added"),
    ("added", "readings"): ("{n} reading added", "{n} readings added"),
    ("added", "checks"): ("{n} checklist result added", "{n} checklist results added"),
    ("updated", "machines"): ("{n} card updated", "{n} cards updated"),
    ("updated", "readings"): ("{n} reading updated", "{n} readings updated"),
    ("updated", "checks"): ("{n} checklist result updated", "{n} checklist results updated"),
    ("deleted", "machines"): ("{n} card deleted", "{n} cards deleted"),
    ("deleted", "readings"): ("{n} reading deleted", "{n} readings deleted"),
    ("deleted", "checks"): ("{n} checklist result deleted", "{n} checklist results deleted"),
    ("refused", "machines"): ("{n} card refused", "{n} cards refused"),
    ("refused", "readings"): ("{n} reading refused", "{n} readings refused"),
    ("refused", "checks"): ("{n} checklist result refused", "{n} checklist results refused"),
}
CONFLICTS_SAID = ("{n} conflict to settle", "{n} conflicts to settle")
NOTHING_SAID = "nothing new"


def said(counts: dict[str, dict[str, int]], conflicts: int) -> str:
    """The merge's outcome in plain words: "12 readings added, 1 card updated, 1 conflict
    to settle", or "nothing new".

    >>> said({"added": {"readings": 1}, "deleted": {"machines": 2}}, 0)
    '1 reading added, 2 cards deleted'
    """
    parts = [SAID[action, kind][counts[action][kind] != 1].format(n=counts[action][kind])
             for action in ACTIONS for kind in KINDS
             if counts.get(action, {}).get(kind)]
    if conflicts:
        parts.append(CONFLICTS_SAID[conflicts != 1].format(n=conflicts))
    return ", ".join(parts) or NOTHING_SAID


def kind_of(doc: object) -> str | None:
    """The kind ("machines", "readings" or "checks") of a document, else None."""
    return BY_FORMAT.get(doc.get("format")) if isinstance(doc, dict) else None


def to_settle(doc: dict) -> bool:
    """Whether a document holds a conflict for the user: a side that is not a deletion is
    shown, and another side is kept beside it."""
    return bool(doc.get("conflicts")) and doc.get("deleted") is not True


# --- The merge ------------------------------------------------------------------------------

def resolve(sides: list[dict], kind: str) -> dict:
    """One document from all the sides known of it (each with a rev, none holding
    conflicts): the merge rules of this module, as a function of the set of sides."""
    by_rev: dict[str, dict] = {}
    for side in sides:
        by_rev.setdefault(side["rev"], side)
    if len(by_rev) == 1:
        return next(iter(by_rev.values()))
    older = {rev for side in by_rev.values() for rev in side.get("history", ())}
    # A history that loops (only a forged one could) leaves no tip: all sides are kept.
    tips = [s for rev, s in by_rev.items() if rev not in older] or list(by_rev.values())
    order = KINDS[kind].order
    tips.sort(key=lambda s: (s.get("deleted") is not True, order(s)), reverse=True)
    if len(tips) == 1:
        return tips[0]
    return {**tips[0], "conflicts": tips[1:1 + CONFLICTS_MAX]}


def upgraded(doc: dict, kind: str) -> dict:
    """A stored document as a document with a rev: itself, or (a record of an earlier
    build) checked into its clean copy and read as revision 1 of it."""
    return doc if "rev" in doc else with_rev(KINDS[kind].check(doc))


def _side_revs(doc: dict | None) -> list[str] | None:
    return None if doc is None or "rev" not in doc else [s["rev"] for s in leaves(doc)]


def _count(counts: dict, kind: str, mine: dict | None, merged: dict) -> None:
    """Count one changed document as this phone sees it: added, updated or deleted."""
    dead = merged.get("deleted") is True
    was_dead = mine is not None and mine.get("deleted") is True
    if mine is None:
        action = None if dead else "added"  # a marker of a record this phone never had
    elif dead:
        action = None if was_dead else "deleted"
    else:
        action = "updated" if was_dead or mine["rev"] != merged["rev"] else None
    if action:
        counts[action][kind] += 1


def _pooled(docs: list) -> dict[tuple[str, str], list[dict]]:
    """Every side of every document in `docs`, by (kind, id); documents of no known kind,
    or that do not check, are left out."""
    pooled: dict[tuple[str, str], list[dict]] = {}
    for doc in docs:
        kind = kind_of(doc)
        if kind is None or not isinstance(doc.get("id"), str):
            continue
        try:
            sides = leaves(upgraded(doc, kind))
        except (InputError, TypeError, ValueError):
            continue
        pooled.setdefault((kind, doc["id"]), []).extend(sides)
    return pooled


def merge(local: list, incoming: list) -> dict:
    """This phone's documents (`local`, as stored) merged with another's (`incoming`,
    checked: `checked_export`), by the rules above; any kinds, mixed.

    Returns ``{"put": {kind: documents to write on this phone, only those that change},
    "added", "updated", "deleted": {kind: n}, "conflicts": documents newly holding a
    conflict to settle, "unchanged": incoming documents that changed nothing,
    "message"}``. A stored record of an earlier build (no rev) is put back with its rev
    when the other phone holds it too."""
    mine: dict[tuple[str, str], dict] = {}
    for doc in local:
        kind = kind_of(doc)
        if kind is not None and isinstance(doc.get("id"), str):
            mine[kind, doc["id"]] = doc
    counts = {action: dict.fromkeys(KINDS, 0) for action in ACTIONS[:3]}
    put: dict[str, list[dict]] = {kind: [] for kind in KINDS}
    conflicts = unchanged = 0
    for (kind, key), sides in _pooled(incoming).items():
        stored = mine.get((kind, key))
        try:
            held = upgraded(stored, kind) if stored is not None else None
        except (InputError, TypeError, ValueError):
            held = None  # a stored record that no longer checks gives way to the file's
        merged = resolve(sides + (leaves(held) if held else []), kind)
        if _side_revs(merged) == _side_revs(stored):
            unchanged += 1
            continue
        put[kind].append(merged)
        _count(counts, kind, held, merged)
        if to_settle(merged) and (held is None or _side_revs(held) != _side_revs(merged)):
            conflicts += 1
    return {"put": put, **counts, "conflicts": conflicts, "unchanged": unchanged,
            "message": said(counts, conflicts)}


# --- The export file ------------------------------------------------------------------------

def export_file(stored: dict[str, list], stamp: str) -> dict:
    """Everything on this phone as an export file: ``{"file", "left_out", "reasons"}``.
    `stored` holds the documents of each kind as stored (deletion markers too); a stored
    record of an earlier build goes out with its rev; one that no longer checks is left
    out (the other phone would refuse it) and said so."""
    out = {kind: [] for kind in KINDS}
    left_out, reasons = 0, []
    for kind in KINDS:
        for place, doc in enumerate(stored.get(kind) or [], 1):
            try:
                if kind_of(doc) != kind:
                    raise InputError("format", "is not of this kind")
                out[kind].append(upgraded(doc, kind))
            except (InputError, TypeError, ValueError) as err:
                left_out += 1
                if len(reasons) < REASONS_MAX:
                    reasons.append(f"{ONE[kind]} {place}: {err}")
    return {"file": {"format": EXPORT, "version": EXPORT_VERSION,
                     "exported": records.checked_time(stamp), **out},
            "left_out": left_out, "reasons": reasons}


def deepest(data: object, most: int) -> int:
    """How deep `data` nests (a scalar is 0), level by level without recursion and given up
    past `most`, so that no nesting however deep costs more than its size.

    >>> deepest({"a": [1, {"b": "text"}]}, 8), deepest([[[[[]]]]], 3)
    (3, 4)
    """
    level, depth = [data], 0
    while True:
        level = [v for v in level if type(v) in (dict, list)]
        if not level:
            return depth
        depth += 1
        if depth > most:
            return depth
        deeper = []
        for value in level:
            deeper.extend(value.values() if type(value) is dict else value)
        level = deeper


def checked_doc(doc: object, kind: str) -> dict:
    """One document from a file checked by its kind's checker, with a rev, its conflicts
    checked the same way (same id, at most CONFLICTS_MAX)."""
    check = KINDS[kind].check
    clean = with_rev(check(doc))
    found = doc.get("conflicts")
    if found is None:
        return clean
    if not isinstance(found, list) or len(found) > CONFLICTS_MAX:
        raise InputError("conflicts", "is not a list of at most {most} records",
                         most=Q(float(CONFLICTS_MAX), "count"))
    sides = [with_rev(check(side)) for side in found]
    if any(side["id"] != clean["id"] for side in sides):
        raise InputError("conflicts", "holds a record with another id")
    return resolve([clean, *sides], kind)


def _checked_version(data: dict) -> int:
    if data.get("format") != EXPORT:
        raise InputError("format", "the file is not a Sumpside export")
    version = data.get("version")
    if version not in (1, EXPORT_VERSION) or isinstance(version, bool):
        if isinstance(version, int) and not isinstance(version, bool) and version > 2:
            raise InputError("version", "the file was written by a newer Sumpside: update "
                                        "the app on this phone, then import it again")
        raise InputError("version", "is not a version of the export this app reads (1 or 2)")
    for kind in KINDS if version == EXPORT_VERSION else ("machines", "readings"):
        if not isinstance(data.get(kind), list):
            raise InputError(kind, "is missing or not a list: the file is not whole")
        if len(data[kind]) > DOCS_MAX:
            raise InputError(kind, "holds more than {most} records",
                             most=Q(float(DOCS_MAX), "count"))
    if deepest(data, EXPORT_DEPTH_MAX) > EXPORT_DEPTH_MAX:
        raise InputError("file", "is nested deeper than an export is")
    return version


def held_key(kind: str, doc: object) -> tuple | None:
    """What says that two copies of a document are the same: its kind, id and revision,
    and the revisions of the sides it keeps in conflict (a rev hashes the content, not the
    conflicts kept beside it). None for a document without a revision."""
    if not isinstance(doc, dict) or not isinstance(doc.get("rev"), str):
        return None
    sides = doc.get("conflicts") or []
    if not isinstance(sides, list):
        return None
    return (kind, doc.get("id"), doc["rev"],
            tuple(sorted(str(s.get("rev")) if isinstance(s, dict) else "?" for s in sides)))


def checked_export(data: object, stamp: str | None = None, held: frozenset = frozenset()) -> dict:
    """A whole export file checked: ``{"version", "exported", "migrated", "machines",
    "readings", "checks" (clean documents, each with a rev), "refused": {kind: n},
    "reasons": the first few, each with its place, "held": how many were left out as
    held already}``.

    `held` is this phone's `held_key` of every document it stores: a document of the file
    with the same key (id, revision, sides in conflict) is one this phone has, so it is left out unread
    (whatever else it says, nothing of it would be stored). On the phone this is most of a
    file from a phone met before, and most of an import's time; so the page, before it
    sends a file, puts in place of each document it holds the same only its key, marked
    ``"held_here": true`` (HELD_HERE), and leaves such documents out of `held` (js/kit.js
    `narrowed`). A document so marked is left out unread as well: the mark can only make a
    document be skipped, never stored.

    A file that is not an export of a version this app reads, or not whole, raises
    InputError, and nothing of it is taken. A bare list is the log of an earlier build:
    migrated (`records.migrate`, its new records made at `stamp`)."""
    refused = dict.fromkeys(KINDS, 0)
    if isinstance(data, list):
        if len(data) > DOCS_MAX or deepest(data, EXPORT_DEPTH_MAX) > EXPORT_DEPTH_MAX:
            raise InputError("file", "is not a log an earlier build exported")
        moved = records.migrate(data, records.checked_time(stamp))
        refused["readings"] = moved["skipped"]
        return {"version": 0, "exported": None, "migrated": True,
                "machines": moved["machines"], "readings": moved["readings"], "checks": [],
                "refused": refused, "reasons": [], "held": 0}
    if not isinstance(data, dict):
        raise InputError("file", "the file is not a Sumpside export")
    version = _checked_version(data)
    out, reasons, skipped = {kind: [] for kind in KINDS}, [], 0
    for kind in KINDS:
        for place, doc in enumerate(data.get(kind) or [], 1):
            if (type(doc) is dict and doc.get(HELD_HERE) is True) or (
                    held and held_key(kind, doc) in held):
                skipped += 1
                continue
            try:
                out[kind].append(checked_doc(doc, kind))
            except (InputError, TypeError, ValueError) as err:
                refused[kind] += 1
                if len(reasons) < REASONS_MAX:
                    reasons.append(f"{ONE[kind]} {place}: {err}")
    exported = data.get("exported")
    return {"version": version, "migrated": version == 1,
            "exported": exported if isinstance(exported, str) and when(exported) else None,
            **out, "refused": refused, "reasons": reasons, "held": skipped}
