"""The plant's database: the kit's documents as documents of a CouchDB-protocol database,
and back.

The phone replicates with the plant's database through a replication library (PouchDB, in
the page); calc decides what the documents mean. Each record of the kit (calc.machines.sync:
a machine, a reading, a checklist's results, deletion markers too) is one database document,
stored whole, with its own rev, history and conflicts:

    {"_id": "machine:<id>" | "reading:<id>" | "checklist:<id>", "_rev": the database's own,
     ...the record as the phone stores it}

The database's revision tree only carries the records; the kit's merge rules (sync.merge)
decide between versions. When two phones wrote the same document apart, the database holds
both as leaves; the next phone to sync pools every leaf into its own merge, writes the
merged record over the winning leaf and closes the others (`writes`). The merged record
keeps a card edited on two phones as a conflict for the user, as a file would; two phones
that close the same leaves apart write the same record, so they settle the next time round.

A document from the database is data from outside. The page hands each over as its JSON
text, read here one by one (nested too deep, too long or not JSON, it is refused alone and
never reaches the parser of the request); its id must name its record's kind and id, its
members must check as a file's would (sync.checked_export), and one that does not is
refused with its reason while the others are taken.

>>> import json
>>> from calc.machines import records
>>> card = records.new_machine({"name": "Saw 4"}, "metric", "2026-03-04T09:15:00+01:00",
...                            machine_id="saw-4")
>>> doc = to_database("machines", card)
>>> doc["_id"]
'machine:saw-4'
>>> found = from_database([json.dumps({**doc, "_rev": "1-abc"})])
>>> [m["id"] for m in found["file"]["machines"]], found["refused"]
(['saw-4'], 0)
>>> from_database([json.dumps({"_id": "machine:other", **card})])["reasons"]
['database document machine:other: its id is not the id of the record it holds']
"""

from __future__ import annotations

from ..kernel import jsontext
from ..kernel.errors import InputError
from ..kernel.result import Q
from . import sync

# The database id of a record: what kind of record it is, a colon, its id.
PREFIX = {"machines": "machine", "readings": "reading", "checks": "checklist"}
KIND_OF_PREFIX = {prefix: kind for kind, prefix in PREFIX.items()}
# A record inside an export file sits two levels down (file, list): its own nesting may be
# what is left of the file's.
RECORD_DEPTH_MAX = sync.EXPORT_DEPTH_MAX - 2
# The longest text of one document: a card with CONFLICTS_MAX sides in conflict is far less.
DOCUMENT_CHARS_MAX = 500_000
ID_SHOWN_CHARS = 60
NOT_KIT_SAID = ("{n} database document refused", "{n} database documents refused")


def database_id(kind: str, record_id: str) -> str:
    """The database id of the record `record_id` of `kind`."""
    return f"{PREFIX[kind]}:{record_id}"


def to_database(kind: str, doc: dict) -> dict:
    """A stored record as its database document (without ``_rev``: the database's own)."""
    record = sync.upgraded(doc, kind)
    return {"_id": database_id(kind, record["id"]), **record}


def _shown(value: object) -> str:
    text = value if isinstance(value, str) else repr(type(value).__name__)
    return text if len(text) <= ID_SHOWN_CHARS else text[:ID_SHOWN_CHARS] + "…"


def _record(leaf: object) -> tuple[str, dict]:
    """(kind, record) of one database document, or InputError saying why it is not one."""
    if not isinstance(leaf, dict):
        raise InputError("document", "is not a document")
    prefix, colon, record_id = str(leaf.get("_id", "")).partition(":")
    kind = KIND_OF_PREFIX.get(prefix) if colon else None
    if kind is None:
        raise InputError("document", "its id does not name a machine, reading or checklist record")
    record = {k: v for k, v in leaf.items() if not k.startswith("_")}
    if sync.kind_of(record) != kind:
        raise InputError("document", "does not hold the kind of record its id names")
    if record.get("id") != record_id:
        raise InputError("document", "its id is not the id of the record it holds")
    return kind, record


def _parsed(text: object) -> object:
    if not isinstance(text, str):
        raise InputError("document", "is not the text of a document")
    if len(text) > DOCUMENT_CHARS_MAX:
        raise InputError("document", "is longer than a record is")
    leaf = jsontext.loads(text, RECORD_DEPTH_MAX)
    if not isinstance(leaf, dict):
        raise InputError("document", "is not a document, or is nested deeper than a record is")
    return leaf


def from_database(leaves: list) -> dict:
    """Documents of the database (every leaf of each, as replicated, each as its JSON text)
    as an export file for `sync.checked_export`: ``{"file", "refused": how many are not the
    kit's records, "reasons": the first few}``. Documents the database itself deleted are
    left out (the kit deletes with markers, which travel as records)."""
    if not isinstance(leaves, list) or len(leaves) > sync.DOCS_MAX:
        raise InputError("leaves", "is a list of at most {most} database documents",
                         most=Q(float(sync.DOCS_MAX), "count"))
    out = {kind: [] for kind in sync.KINDS}
    refused, reasons = 0, []
    for text in leaves:
        leaf = None
        try:
            leaf = _parsed(text)
            if leaf.get("_deleted") is True:
                continue
            kind, record = _record(leaf)
        except InputError as err:
            refused += 1
            if len(reasons) < sync.REASONS_MAX:
                named = _shown(leaf.get("_id")) if isinstance(leaf, dict) else "?"
                reasons.append(f"database document {named}: {err.message}")
            continue
        out[kind].append(record)
    return {"file": {"format": sync.EXPORT, "version": sync.EXPORT_VERSION, "exported": None,
                     **out}, "refused": refused, "reasons": reasons}


def _checked_head(head: object) -> tuple[str, dict]:
    if not isinstance(head, dict) or not isinstance(head.get("_id"), str) \
            or not isinstance(head.get("_rev"), str):
        raise InputError("heads", "holds each database document's _id, _rev, rev, sides "
                                  "and _conflicts")
    return head["_id"], head


def writes(stored: dict[str, list], heads: list) -> dict:
    """What to write to the database so that it holds this phone's records, after a merge
    of everything the database held (`from_database`, then sync.merge).

    `stored` holds this phone's documents per kind; `heads` says what the database holds of
    each: ``{"_id", "_rev": its winning leaf, "rev": the record's rev in that leaf, "sides":
    the revs of the conflicts that record keeps, "_conflicts": the database's other
    leaves}``. Returns ``{"docs": documents to write (bulk), "closed": how many of the
    database's other leaves are closed}``: a record the database lacks is added, one it holds
    at another revision (or in several leaves) is written over the winning leaf, and every
    other leaf is closed (deleted) - its content is in the merged record."""
    held = dict(_checked_head(h) for h in heads or [])
    docs, closed = [], 0
    for kind in sync.KINDS:
        for doc in stored.get(kind) or []:
            if sync.kind_of(doc) != kind or not isinstance(doc.get("id"), str):
                continue
            try:
                record = to_database(kind, doc)
            except (InputError, TypeError, ValueError):
                continue  # a stored record that no longer checks stays on this phone only
            head = held.get(record["_id"])
            if head is None:
                docs.append(record)
                continue
            others = [r for r in head.get("_conflicts") or [] if isinstance(r, str)]
            sides = sorted(s["rev"] for s in record.get("conflicts", ()))
            if not others and head.get("rev") == record["rev"] \
                    and sorted(map(str, head.get("sides") or [])) == sides:
                continue
            docs.append({**record, "_rev": head["_rev"]})
            docs.extend({"_id": record["_id"], "_rev": rev, "_deleted": True} for rev in others)
            closed += len(others)
    return {"docs": docs, "closed": closed}
