"""A checklist's results for one machine and day, as a document that travels.

The page keeps what a technician ticked on a checklist per checklist, machine and day.
As a document it is:

    {"format": "sumpside-checks", "version": 1, "id": "<checklist>.<machine id|none>.<day>",
     "checklist": checklist id, "machine": machine id or None, "day": "YYYY-MM-DD",
     "marks": {"<cause key>/<check key>": "pass" | "fail" | "not-done"},
     "notes": {"<cause key>/<check key>": note on that check}, "note": note on the list,
     "updated", "rev", "history"}

The id follows from the checklist, the machine and the day, so two phones that tick the
same checklist for the same machine on the same day hold the same document: their two
sets of marks meet in a merge (calc.machines.sync) instead of passing each other by.

>>> made = new_results("checklist-water", "m1", "2026-03-04", {"free-water/drain": "pass"},
...                    {}, "", "2026-03-04T09:15:00+01:00")
>>> made["id"], made["rev"][:2]
('checklist-water.m1.2026-03-04', '1-')
>>> saved(made, {"free-water/drain": "pass"}, {}, "", "2026-03-04T09:20:00+01:00") is made
True
"""

from __future__ import annotations

import re
from datetime import date

from ..kernel import registry
from ..kernel.errors import InputError
from ..kernel.result import Q
from .records import (ID_MAX_CHARS, NOTE_MAX_CHARS, checked_head, checked_machine_id,
                      checked_time, tombstone)
from .revisions import first_rev, revised

CHECKS = "sumpside-checks"
VERSION = 1
MARKS = ("pass", "fail", "not-done")
# A check's note field holds at most this many characters (its textarea's maxlength).
CHECK_NOTE_MAX_CHARS = 500
MARKS_MAX = 300
CHECK_KEY = re.compile(r"[A-Za-z0-9_-]{1,64}/[A-Za-z0-9_-]{1,64}")
ID_MAX = 3 * ID_MAX_CHARS


def results_id(checklist: str, machine: str | None, day: str) -> str:
    """The document id of a checklist's results for a machine (or none) and a day."""
    return f"{checklist}.{machine or 'none'}.{day}"


def _checked_where(checklist: object, machine: object, day: object) -> tuple:
    if not isinstance(checklist, str) or checklist not in registry.of_kind("checklist"):
        raise InputError("checklist", "is not a checklist of this version")
    machine = checked_machine_id({"machine": machine})
    try:
        if not isinstance(day, str) or len(day) != 10:
            raise ValueError(day)
        date.fromisoformat(day)
    except ValueError:
        raise InputError("day", "is a date written year-month-day, like 2026-03-31") from None
    return checklist, machine, day


def checked_marks(marks: object, notes: object, note: object) -> tuple[dict, dict, str]:
    """Marks, notes on checks and the list's note, checked: keys "cause/check", marks
    pass, fail or not-done, notes of at most their field's length."""
    if not isinstance(marks, dict) or len(marks) > MARKS_MAX or not all(
            isinstance(k, str) and CHECK_KEY.fullmatch(k) and v in MARKS
            for k, v in marks.items()):
        raise InputError("marks", "are not checks marked pass, fail or not-done")
    if not isinstance(notes, dict) or len(notes) > MARKS_MAX or not all(
            isinstance(k, str) and CHECK_KEY.fullmatch(k) and isinstance(v, str)
            and len(v) <= CHECK_NOTE_MAX_CHARS for k, v in notes.items()):
        raise InputError("notes", "are not notes on checks of at most {most} characters",
                         most=Q(float(CHECK_NOTE_MAX_CHARS), "count"))
    if not isinstance(note, str) or len(note) > NOTE_MAX_CHARS:
        raise InputError("note", "is not a note of at most {most} characters",
                         most=Q(float(NOTE_MAX_CHARS), "count"))
    return dict(marks), dict(notes), note


def new_results(checklist: str, machine: str | None, day: str, marks: dict, notes: dict,
                note: str, stamp: str) -> dict:
    """A checklist's results as revision 1 of a document; InputError names a bad member."""
    checklist, machine, day = _checked_where(checklist, machine, day)
    marks, notes, note = checked_marks(marks, notes, note)
    return first_rev({"format": CHECKS, "version": VERSION,
                      "id": results_id(checklist, machine, day), "checklist": checklist,
                      "machine": machine, "day": day, "marks": marks, "notes": notes,
                      "note": note, "updated": checked_time(stamp)})


def saved(previous: dict, marks: dict, notes: dict, note: str, stamp: str) -> dict:
    """The results after the page kept new marks: `previous` itself when nothing changed
    (a page that saves on every tick makes no revision for a tick taken back), else its
    next revision (also after a deletion of them)."""
    marks, notes, note = checked_marks(marks, notes, note)
    if previous.get("deleted") is not True and (previous.get("marks"), previous.get("notes"),
                                                previous.get("note")) == (marks, notes, note):
        return previous
    body = {k: previous[k] for k in ("format", "version", "id", "checklist", "machine", "day",
                                     "rev", "history", "conflicts") if k in previous}
    return revised({**body, "marks": marks, "notes": notes, "note": note}, stamp)


def checked_results(record: object) -> dict:
    """A checklist-results document from outside calc, checked against its shape, as a
    clean copy of its members; a deletion marker keeps where it belonged."""
    head = checked_head(record, "checklist result", CHECKS, VERSION, ID_MAX)
    checklist, machine, day = _checked_where(record.get("checklist"), record.get("machine"),
                                             record.get("day"))
    if head["id"] != results_id(checklist, machine, day):
        raise InputError("id", "does not follow from the checklist, machine and day")
    where = {"checklist": checklist, "machine": machine, "day": day}
    if head.get("deleted"):
        return tombstone(head, where)
    if "updated" not in head:
        raise InputError("updated", "is missing: checklist results need their time")
    marks, notes, note = checked_marks(record.get("marks", {}), record.get("notes", {}),
                                        record.get("note", ""))
    return {**where, "marks": marks, "notes": notes, "note": note, **head}
