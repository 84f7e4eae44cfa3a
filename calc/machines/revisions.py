"""Records as documents that travel between phones: a revision, the revisions it came
from, an update time, and a deletion kept as a marker.

Every record the kit keeps (a machine, a reading, a checklist's results) is a document:

    {"id", "format", "version", ..., "updated": ISO 8601 with offset,
     "rev": "N-h", "history": [earlier revs, newest first, at most HISTORY_MAX]}

``N`` counts the edits that led to this revision (1 for a new record); ``h`` is the first
HASH_CHARS hex digits of the sha256 of the record's content (every member but ``rev``,
``history`` and ``conflicts``, as canonical JSON) and of the revisions it was made from.
Two phones that make the same record from the same content give it the same rev; that is
how a record of an earlier build, which has no rev, is read (`with_rev`): as revision 1 of
its content, the same on every phone. ``history`` lets a merge tell "this one descends from
that one" (the newer wins) from "these two were made apart" (calc.machines.sync decides).

A revision N always has a larger N than every revision in its history; a checked document
holds to that (`checked_meta`), so a history can never loop.

>>> made = first_rev({"id": "m1", "format": "f", "updated": "2026-03-04T09:15:00+01:00"})
>>> made["rev"][:2], made["history"]
('1-', [])
>>> edited = revised({**made, "note": "topped up"}, "2026-03-05T10:00:00+01:00")
>>> edited["rev"][:2], edited["history"] == [made["rev"]]
('2-', True)
>>> gone = deleted(edited, "2026-03-06T08:00:00+01:00")
>>> sorted(gone), gone["rev"][:2]
(['deleted', 'format', 'history', 'id', 'rev', 'updated'], '3-')
"""

from __future__ import annotations

import hashlib
import json
import re

from ..kernel.errors import InputError
from ..kernel.result import Q
from .condition import when

HISTORY_MAX = 50
HASH_CHARS = 16
REV_MAX_N = 999_999_999
REV = re.compile(r"[1-9][0-9]{0,8}-[0-9a-f]{16}")
# Members that describe a revision rather than the record: never part of its hash.
META = ("rev", "history", "conflicts")
# A deletion marker keeps only what says which record it was and where it belonged (a
# reading's machine, a checklist result's checklist, machine and day), so the page can
# tidy what it showed.
TOMBSTONE_KEEPS = ("id", "format", "version", "machine", "checklist", "day")


def _plain(value: object) -> object:
    """`value` as JSON text from the page gives it back: a whole float as an int (the page
    writes 60.0 as 60), so a record hashes the same before and after a trip through it."""
    if isinstance(value, float) and value.is_integer():
        return int(value)
    if isinstance(value, dict):
        return {str(k): _plain(v) for k, v in value.items()}
    if isinstance(value, (list, tuple)):
        return [_plain(v) for v in value]
    return value


def canonical(doc: dict) -> str:
    """The record's content (without its revision members) as canonical JSON: keys sorted,
    no spaces, whole numbers without a decimal point."""
    body = {k: v for k, v in doc.items() if k not in META}
    return json.dumps(_plain(body), sort_keys=True, separators=(",", ":"),
                      ensure_ascii=False, allow_nan=False)


def content_hash(doc: dict, parents: tuple[str, ...] | list[str] = ()) -> str:
    """The short hash of a revision: its content and the revisions it was made from."""
    text = canonical(doc) + "\n" + " ".join(parents)
    return hashlib.sha256(text.encode("utf-8")).hexdigest()[:HASH_CHARS]


def rev_number(rev: str) -> int:
    """N of a rev "N-h": how many edits led to it."""
    return int(rev.split("-", 1)[0])


def rev_order(rev: str) -> tuple[int, str]:
    """A rev's place among revisions: by N, then by its hash (a deterministic tie-break)."""
    number, digest = rev.split("-", 1)
    return int(number), digest


def _history(revs) -> list[str]:
    """Earlier revisions without repeats, newest first, the oldest dropped past the cap."""
    return sorted(set(revs), key=rev_order, reverse=True)[:HISTORY_MAX]


def first_rev(doc: dict) -> dict:
    """`doc` as revision 1 of its content (a new record, or an old one read for the first
    time): the same content gives the same rev on every phone."""
    body = {k: v for k, v in doc.items() if k not in META}
    return {**body, "rev": f"1-{content_hash(body)}", "history": []}


def with_rev(doc: dict) -> dict:
    """`doc` as a document: itself when it has a rev, else revision 1 of its content, its
    ``updated`` taken from its ``time`` when it has none (a reading of an earlier build)."""
    if "rev" in doc:
        return doc
    if "updated" not in doc and "time" in doc:
        doc = {**doc, "updated": doc["time"]}
    return first_rev(doc)


def leaves(doc: dict) -> list[dict]:
    """The revisions a document holds: the one shown, then those in conflict with it."""
    shown = {k: v for k, v in doc.items() if k != "conflicts"}
    return [shown, *doc.get("conflicts", ())]


def _next(body: dict, parents: list[str], earlier: list[str], number: int) -> dict:
    """A revision of `body` made from `parents` (their own histories in `earlier`)."""
    if number > REV_MAX_N:
        raise InputError("rev", "has been edited more times than a record can count")
    body = {k: v for k, v in body.items() if k not in META}
    return {**body, "rev": f"{number}-{content_hash(body, parents)}",
            "history": _history([*parents, *earlier])}


def _stamp(stamp: object) -> str:
    if when(stamp) is None:
        raise InputError("time", "is a time with its offset from UTC, like "
                                 "2026-03-04T09:15:00+01:00")
    return str(stamp)


def revised(doc: dict, stamp: str) -> dict:
    """The next revision of a document after an edit (`doc` holds the edited content and
    the revision it was edited from); conflicts it holds stay for the user to settle.
    A stored record of an earlier build is read with its rev (`sync.upgraded`) before it
    is edited, so that its edit descends from the rev other phones give it.

    A deleted record is not edited (InputError): its deletion is settled first."""
    doc = with_rev(doc)
    if doc.get("deleted") is True:
        raise InputError("doc", "was deleted; a deleted record is not edited")
    made = _next({**doc, "updated": _stamp(stamp)}, [doc["rev"]], doc.get("history", []),
                 rev_number(doc["rev"]) + 1)
    if doc.get("conflicts"):
        made["conflicts"] = doc["conflicts"]
    return made


def _from_all(doc: dict) -> tuple[list[str], list[str], int]:
    """(the revs of every side of `doc`, their histories, the next N after all of them)."""
    sides = leaves(with_rev(doc))
    return ([s["rev"] for s in sides], [r for s in sides for r in s.get("history", [])],
            max(rev_number(s["rev"]) for s in sides) + 1)


def deleted(doc: dict, stamp: str) -> dict:
    """The deletion marker of a document: a revision that keeps only TOMBSTONE_KEEPS,
    ``updated`` and ``deleted: true``. It descends from every side of the document, so
    deleting a record in conflict settles the conflict as a deletion. A marker is
    returned as it is."""
    doc = with_rev(doc)
    if doc.get("deleted") is True and not doc.get("conflicts"):
        return doc
    body = {k: doc[k] for k in TOMBSTONE_KEEPS if k in doc}
    parents, earlier, number = _from_all(doc)
    return _next({**body, "updated": _stamp(stamp), "deleted": True}, parents, earlier, number)


def settle(doc: dict, chosen_rev: str, stamp: str) -> dict:
    """The user's choice between the sides of a conflict: a new revision of the chosen side
    that descends from every side, so the settlement wins on every phone it reaches."""
    doc = with_rev(doc)
    sides = leaves(doc)
    if len(sides) < 2:
        raise InputError("rev", "this record has no conflict to settle")
    chosen = next((s for s in sides if s.get("rev") == chosen_rev), None)
    if chosen is None:
        raise InputError("rev", "is not one of the sides of this record's conflict")
    parents, earlier, number = _from_all(doc)
    parents.remove(chosen_rev)
    return _next({**chosen, "updated": _stamp(stamp)}, [chosen_rev, *parents], earlier, number)


# --- Revision members of a document from outside calc ---------------------------------------

def checked_meta(record: dict) -> dict:
    """The revision members of a record from outside calc, checked: ``rev`` (N-h),
    ``history`` (at most HISTORY_MAX revs, each older than ``rev``), ``updated`` (a time
    with its offset) and ``deleted`` (true when given). Returns those present; a record
    without a rev may have ``updated`` only (`with_rev` gives it the rest)."""
    clean = {}
    if "updated" in record:
        if not isinstance(record["updated"], str) or when(record["updated"]) is None:
            raise InputError("updated", "is not a time with its offset from UTC")
        clean["updated"] = record["updated"]
    if "deleted" in record and record["deleted"] is not True:
        raise InputError("deleted", "is true when given")
    rev = record.get("rev")
    if rev is None:
        if "history" in record or "deleted" in record:
            raise InputError("rev", "is missing: a history or a deletion needs its revision")
        return clean
    if not isinstance(rev, str) or not REV.fullmatch(rev):
        raise InputError("rev", "is not a revision (a count, a dash and {n} hex digits)",
                         n=Q(float(HASH_CHARS), "count"))
    if "updated" not in clean:
        raise InputError("updated", "is missing: a revision needs its time")
    history = record.get("history", [])
    number = rev_number(rev)
    if not isinstance(history, list) or len(history) > HISTORY_MAX or not all(
            isinstance(r, str) and REV.fullmatch(r) and rev_number(r) < number
            for r in history):
        raise InputError("history", "is not a list of at most {most} earlier revisions",
                         most=Q(float(HISTORY_MAX), "count"))
    clean.update(rev=rev, history=list(history))
    if record.get("deleted") is True:
        clean["deleted"] = True
    return clean
