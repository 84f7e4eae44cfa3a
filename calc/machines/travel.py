"""The page's requests for records that travel (calc.machines.sync): export, check a
file, merge it, and make the revisions the page stores after an edit, a deletion, a
settled conflict or a ticked checklist. `calc.machines.api` lists them in its OPS; each
takes the request dict and answers a JSON-ready dict with ``"ok": true`` (a refusal is an
InputError, which `api.call` turns into ``{"ok": false, "errors"}``).

Documents go out and come back as calc made them; the page stores ``put`` as it is and
sends stored documents back as they were.

>>> made = export({"machines": [], "readings": [], "checks": [],
...                "time": "2026-03-04T09:15:00+01:00"})
>>> made["file"]["format"], made["file"]["version"], made["left_out"]
('sumpside-export', 2, 0)
>>> merged = merge_file({"local": {}, "incoming": made["file"]})
>>> merged["ok"], merged["message"], merged["put"]
(True, 'nothing new', {'machines': [], 'readings': [], 'checks': []})
"""

from __future__ import annotations

from ..kernel import units
from ..kernel.errors import InputError
from ..kernel.result import Q
from . import card as cards
from . import checkmarks, database, records, revisions, sync


def _docs(request: dict, key: str, field: str | None = None) -> list:
    """A list member of the request (a missing one is empty); InputError, naming it as
    `field`, otherwise."""
    found = request.get(key)
    if found is None:
        return []
    if not isinstance(found, list):
        raise InputError(field or key, "is a list of records")
    return found


def _doc(request: dict, key: str = "doc") -> tuple[dict, str]:
    """The stored document the request names, with a rev, and its kind."""
    doc = request.get(key)
    kind = sync.kind_of(doc)
    if kind is None or not isinstance(doc.get("id"), str):
        raise InputError(key, "is a machine, reading or checklist-results record as stored")
    return sync.upgraded(doc, kind), kind


def export(request: dict) -> dict:
    """``{"machines", "readings", "checks": stored documents, "time"}`` as an export file:
    ``{"file", "left_out", "reasons"}`` (`sync.export_file`)."""
    stored = {kind: _docs(request, kind) for kind in sync.KINDS}
    return {"ok": True, **sync.export_file(stored, request.get("time"))}


def export_check(request: dict) -> dict:
    """``{"file": the file's data, "time"}`` checked (`sync.checked_export`): its clean
    documents per kind, what was refused and why, its version and whether it was
    migrated."""
    return {"ok": True, **sync.checked_export(request.get("file"), request.get("time"))}


def merge_file(request: dict) -> dict:
    """``{"local": {"machines", "readings", "checks": this phone's stored documents},
    "incoming": an export file's data, "time"}`` merged (`sync.merge` after
    `sync.checked_export`): ``{"put": {kind: documents to store}, "added", "updated",
    "deleted", "refused": {kind: n}, "reasons", "conflicts", "open_conflicts",
    "unchanged", "message", "redigest": machine ids whose digest to make again,
    "version", "migrated"}``. A file refused whole puts nothing."""
    held = request.get("local") or {}
    if not isinstance(held, dict):
        raise InputError("local", "holds this phone's machines, readings and checks")
    local = [doc for kind in sync.KINDS for doc in _docs(held, kind, "local." + kind)]
    # What this phone holds at the same revision is not read again (sync.checked_export).
    same = frozenset(sync.held_key(kind, doc) for kind in sync.KINDS for doc in _docs(held, kind)) - {None}
    found = sync.checked_export(request.get("incoming"), request.get("time"), same)
    merged = sync.merge(local, [doc for kind in sync.KINDS for doc in found[kind]])
    merged["unchanged"] += found["held"]
    put = merged["put"]
    replaced = {(kind, doc["id"]) for kind, docs in put.items() for doc in docs}
    still = [doc for doc in local if (sync.kind_of(doc), doc.get("id")) not in replaced]
    counts = {action: merged[action] for action in sync.ACTIONS[:3]}
    return {"ok": True, **merged, "refused": found["refused"], "reasons": found["reasons"],
            "message": sync.said({**counts, "refused": found["refused"]}, merged["conflicts"]),
            "open_conflicts": sum(sync.to_settle(doc) for doc in still if isinstance(doc, dict))
            + sum(sync.to_settle(doc) for docs in put.values() for doc in docs),
            "redigest": sorted({doc["id"] for doc in put["machines"]} | {
                doc["machine"] for doc in put["readings"] if doc.get("machine")}),
            "version": found["version"], "migrated": found["migrated"]}


def _changed_machine(doc: dict, changes: dict, system: str) -> dict:
    return {**doc, "card": cards.parse(changes.get("card"), system)}


def _changed_reading(doc: dict, changes: dict, system: str) -> dict:
    note = changes.get("note")
    note = "" if note is None else str(note).strip()
    if len(note) > records.NOTE_MAX_CHARS:
        raise InputError("note", "is {n} characters long; at most {most}",
                         n=Q(float(len(note)), "count"),
                         most=Q(float(records.NOTE_MAX_CHARS), "count"))
    return {**doc, "note": note}


def _changed_checks(doc: dict, changes: dict, system: str) -> dict:
    marks, notes, note = checkmarks.checked_marks(changes.get("marks", doc.get("marks")),
                                                  changes.get("notes", doc.get("notes")),
                                                  changes.get("note", doc.get("note")))
    return {**doc, "marks": marks, "notes": notes, "note": note}


# What an edit may change in each kind, and how the change is checked.
EDITS = {"machines": (("card",), _changed_machine),
         "readings": (("note",), _changed_reading),
         "checks": (("marks", "notes", "note"), _changed_checks)}


def revise(request: dict) -> dict:
    """``{"doc": a stored document, "changes": {member: new value}, "time", "units"}``: its
    next revision (`revisions.revised`) as ``{"doc", "changed"}``; the document itself and
    ``"changed": false`` when the changes change nothing. A card's changes are
    ``{"card": the typed card, in "units"}``; a reading's ``{"note"}``; a checklist
    result's ``{"marks", "notes", "note"}``."""
    doc, kind = _doc(request)
    changes, (allowed, change) = request.get("changes"), EDITS[kind]
    if not isinstance(changes, dict) or not changes or set(changes) - set(allowed):
        raise InputError("changes", "names what changes: {allowed}",
                         allowed=Q(", ".join(allowed), "text"))
    if doc.get("deleted") is True:  # revised() refuses it too; said before the changes
        raise InputError("doc", "was deleted; a deleted record is not edited")
    edited = change(doc, changes, units.check_system(request.get("units") or "metric"))
    if revisions.canonical(edited) == revisions.canonical(doc):
        return {"ok": True, "doc": doc, "changed": False}
    return {"ok": True, "doc": revisions.revised(edited, request.get("time")), "changed": True}


def delete(request: dict) -> dict:
    """``{"doc", "time"}`` (or ``{"docs": [...], "time"}``: a machine with its readings) as
    deletion markers (`revisions.deleted`): ``{"doc"}`` or ``{"docs"}``."""
    if "docs" in request:
        docs = [_doc({"doc": d})[0] for d in _docs(request, "docs")]
        return {"ok": True, "docs": [revisions.deleted(d, request.get("time")) for d in docs]}
    return {"ok": True, "doc": revisions.deleted(_doc(request)[0], request.get("time"))}


def settle(request: dict) -> dict:
    """``{"doc": a document holding conflicts, "rev": the side the user chose, "time"}``:
    ``{"doc"}``, the settled revision that wins wherever it travels."""
    doc = _doc(request)[0]
    return {"ok": True, "doc": revisions.settle(doc, request.get("rev"), request.get("time"))}


def checks_save(request: dict) -> dict:
    """``{"checklist", "machine": id or null, "day", "marks", "notes", "note", "time",
    "previous": the stored results of that checklist, machine and day, or null}``: the
    results document to store, ``{"doc", "changed"}`` (unchanged: the previous one)."""
    marks, notes, note = (request.get("marks") or {}, request.get("notes") or {},
                          request.get("note") or "")
    previous = request.get("previous")
    made = checkmarks.new_results(request.get("checklist"), request.get("machine"),
                                  request.get("day"), marks, notes, note, request.get("time"))
    if previous is None:
        return {"ok": True, "doc": made, "changed": True}
    previous, kind = _doc(request, "previous")
    if kind != "checks" or previous["id"] != made["id"]:
        raise InputError("previous", "is not the stored results of this checklist, machine "
                                     "and day")
    kept = checkmarks.saved(previous, marks, notes, note, request.get("time"))
    return {"ok": True, "doc": kept, "changed": kept is not previous}


def database_merge(request: dict) -> dict:
    """``{"local": as for merge, "leaves": documents of the plant's database (every leaf of
    each, as replicated), "time"}`` merged as a file would be (`merge_file`, after
    `database.from_database`); documents that are not the kit's records are refused, counted
    and said with the others."""
    found = database.from_database(request.get("leaves"))
    merged = merge_file({**request, "incoming": found["file"]})
    if found["refused"]:
        said = database.NOT_KIT_SAID[found["refused"] != 1].format(n=found["refused"])
        merged["message"] = said if merged["message"] == sync.NOTHING_SAID \
            else merged["message"] + ", " + said
    merged["reasons"] = (found["reasons"] + merged["reasons"])[:sync.REASONS_MAX]
    merged["not_records"] = found["refused"]
    return merged


def database_writes(request: dict) -> dict:
    """``{"machines", "readings", "checks": this phone's stored documents, "heads": what
    the database holds of each}``: ``{"docs": the database documents to write, "closed"}``
    (`database.writes`)."""
    stored = {kind: _docs(request, kind) for kind in sync.KINDS}
    heads = request.get("heads")
    if not isinstance(heads, list):
        raise InputError("heads", "is a list of what the database holds (empty for an empty "
                                  "database)")
    return {"ok": True, **database.writes(stored, heads)}


OPS = {"export": export, "export-check": export_check, "merge": merge_file,
       "revise": revise, "delete": delete, "settle": settle, "checks-save": checks_save,
       "database-merge": database_merge, "database-writes": database_writes}
