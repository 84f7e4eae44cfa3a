"""Machines and readings as records kept on the phone: what is stored, and how a stored
reading is shown again.

A machine record holds its card (metric, as `card.parse` gives it). A reading record
holds what calc needs to answer it again, never display text:

    {"format": "sumpside-reading", "version": 1, "id", "machine": machine id or None,
     "tool", "inputs": {key: metric value as parsed}, "from_card": [keys taken from the
     card], "calc": calc's version, "time": ISO 8601 with the local offset, "note",
     "tracked": {followed quantity: metric value}, "level",
     "updated", "rev", "history"}

Both are documents (calc.machines.revisions): ``rev`` and ``history`` say which revision
this is and which it came from, ``updated`` when it was made (a reading's is its time
until its note is edited). They keep version 1: the members are additions that an
earlier build's import leaves out, so a file from this build still reads there.

``tracked`` and ``level`` are what the tool answered when the reading was saved, kept so a
machine page with a thousand readings draws its trends without running a tool again;
everything shown (labels, values, units, verdicts) is computed again from the inputs by
the calc that shows it, in the reader's units.

A log kept by an earlier build (display text, inputs as typed) is migrated by `migrate`:
each entry becomes a reading again from its typed inputs where they still parse, or is
kept as it was (``"as_saved"``) where they no longer do, so nothing is lost.

>>> saved = new_reading("viscosity-at-temperature", {"temp": "60"}, "metric", None,
...                     "2026-03-04T09:15:00+01:00", examples=True)
>>> saved["record"]["inputs"]["temp"], saved["record"]["tracked"]
(60.0, {'oil_temp': 60.0})
>>> view(saved["record"], "us")["text"]["kv"]
'20.6 cSt'
"""

from __future__ import annotations

import math
import uuid

from .. import __version__
from ..kernel import registry, units
from ..kernel.answer import present
from ..kernel.errors import InputError
from ..kernel.result import Q, Result
from . import card as cards
from .condition import when
from .revisions import TOMBSTONE_KEEPS, checked_meta, first_rev

READING = "sumpside-reading"
MACHINE = "sumpside-machine"
VERSION = 1
NOTE_MAX_CHARS = 2000


def new_id() -> str:
    return uuid.uuid4().hex


def checked_time(stamp: object) -> str:
    if when(stamp) is None:
        raise InputError("time", "is a time with its offset from UTC, like "
                                 "2026-03-04T09:15:00+01:00")
    return str(stamp)


def new_machine(raw: dict, system: str, stamp: str, machine_id: str | None = None) -> dict:
    """A machine record from a typed card, as revision 1 (calc.machines.revisions);
    InputError names each bad field."""
    return first_rev({"format": MACHINE, "version": VERSION, "id": machine_id or new_id(),
                      "card": cards.parse(raw, system), "updated": checked_time(stamp)})


def tracked_values(found: registry.Tool, values: dict, result: Result) -> dict[str, float]:
    """The followed quantities a reading measured: inputs first (what was read), then
    outputs (what calc worked out from it)."""
    out: dict[str, float] = {}
    for f in found.inputs:
        value = values.get(f.key)
        if f.tracks and _finite(value):
            out.setdefault(f.tracks, float(value))
    for o in found.outputs:
        value = result.values.get(o.key)
        if o.tracks and _finite(value):
            out.setdefault(o.tracks, float(value))
    return out


def _finite(value: object) -> bool:
    return isinstance(value, (int, float)) and not isinstance(value, bool) and math.isfinite(value)


def new_reading(tool_id: str, raw: dict, system: str, machine: dict | None, stamp: str,
                note: str = "", examples: bool = False) -> dict:
    """Run a tool for a machine and make the reading record of its answer.

    `machine` is a machine record (its card fills the bound inputs left blank) or None.
    Returns ``{"record", "result", "tool"}``; InputError when the inputs do not answer
    (nothing is saved from inputs that give no answer).
    """
    found = registry.get(tool_id)
    system = units.check_system(system)
    facts = cards.facts(machine["card"])[0] if machine else None
    parsed = found.parse_from(dict(raw or {}), system, facts, examples)
    values, from_card = parsed.values, parsed.from_card
    note = "" if note is None else str(note).strip()
    if len(note) > NOTE_MAX_CHARS:
        raise InputError("note", "is {n} characters long; at most {most}",
                         n=Q(float(len(note)), "count"), most=Q(float(NOTE_MAX_CHARS), "count"))
    result = found.run_parsed(values, parsed.notices)
    record = {"format": READING, "version": VERSION, "id": new_id(),
              "machine": machine["id"] if machine else None, "tool": found.id,
              "inputs": values, "from_card": from_card, "calc": __version__,
              "time": checked_time(stamp), "note": note,
              "tracked": tracked_values(found, values, result), "level": result.level,
              "updated": checked_time(stamp)}
    return {"record": first_rev(record), "result": result, "tool": found}


def stored_inputs(found: registry.Tool, inputs: dict) -> dict:
    """A record's metric inputs made whole for today's tool: renamed keys under their new
    names, inputs added since at their defaults; InputError when a value no longer fits."""
    given, errors = found.rename_old_keys(inputs if isinstance(inputs, dict) else {})
    unknown = sorted(set(given) - {f.key for f in found.inputs})
    errors += [InputError(k, "was an input when this reading was saved and is no longer one")
               for k in unknown]
    values = {}
    for f in found.inputs:
        if f.key not in given:
            values[f.key] = bool(f.default) if f.is_flag else f.default
        elif given[f.key] is None and (f.optional or f.is_flag):
            values[f.key] = None if not f.is_flag else False
        elif f.accepts(given[f.key]):
            values[f.key] = given[f.key]
        else:
            errors.append(InputError(f.key, "holds a value this version does not accept"))
    if errors:
        raise InputError.combine(errors)
    return values


def answer(record: dict) -> tuple[registry.Tool, dict, Result]:
    """(tool, inputs, the answer) of a stored reading, computed again now."""
    found = registry.get(str(record.get("tool")))
    values = stored_inputs(found, record.get("inputs"))
    return found, values, found.run_parsed(values)


def shown_inputs(found: registry.Tool, values: dict, from_card: list, system: str) -> list[dict]:
    """The inputs of a reading as the reader reads them: label and value in `system`
    units, taken from the card or typed; a tick box only when ticked, blanks left out."""
    rows = []
    for f in found.inputs:
        value = values.get(f.key)
        if value is None or (f.is_flag and not value):
            continue
        if f.is_flag:
            shown = "yes"
        elif f.is_choice:
            shown = dict(f.choices).get(value, str(value))
        elif f.is_text:
            shown = str(value)
        else:
            shown = units.show(float(value), f.quantity, system)
        rows.append({"key": f.key, "label": f.label, "text": shown, "group": f.group,
                     "flag": f.is_flag, "from_card": f.key in (from_card or []),
                     "at_default": value == f.default, "tracks": f.tracks})
    return rows


def meta(record: dict) -> dict:
    """What a view of a reading carries besides the answer."""
    return {"id": record.get("id"), "machine": record.get("machine"),
            "time": record.get("time"), "note": record.get("note") or "",
            "calc": record.get("calc")}


def view(record: dict, system: str) -> dict:
    """A stored reading as the reader sees it now, in `system` units: the tool's answer
    computed again from the stored inputs, with those inputs shown. A reading that no
    longer computes (or was migrated as it was) is shown as saved, and says so."""
    system = units.check_system(system)
    if record.get("as_saved") is not None:
        return {**meta(record), **_as_saved(record)}
    try:
        found, values, result = answer(record)
    except InputError as err:
        return {**meta(record), "tool": record.get("tool"), "ok": False, "stale": True,
                "title": str(record.get("tool")),
                "message": "This reading was saved by calc " + str(record.get("calc")) +
                           " and its inputs no longer fit this version (" + str(err) +
                           "); its followed values are kept.",
                "tracked": record.get("tracked") or {}}
    shown = present(found, result, system)
    return {**meta(record), **shown, "title": found.title, "kind": found.kind,
            "inputs": shown_inputs(found, values, record.get("from_card"), system),
            "outputs": [{"key": o.key, "label": o.label, "text": shown["text"][o.key],
                         "headline": o.headline, "tracks": o.tracks}
                        for o in found.outputs if o.key in shown["text"]]}


def _as_saved(record: dict) -> dict:
    kept = record["as_saved"]
    return {"tool": record.get("tool"), "ok": False, "stale": True,
            "title": str(kept.get("title") or record.get("tool")),
            "message": "Saved by an earlier version and kept as it was saved: its inputs no "
                       "longer fit this version's tool.",
            "text": kept.get("text") or {}, "verdicts_as_saved": kept.get("verdicts") or [],
            "level": kept.get("level"), "tracked": record.get("tracked") or {}}


def migrate(entries: list, stamp: str) -> dict:
    """The log of an earlier build (IndexedDB store "entries") as machines and readings.

    An entry is ``{"at", "machine": free-text name, "tool", "title", "units", "inputs":
    typed text, "text", "values", "level", "verdicts"}``. Each named machine becomes a
    machine with that name; each entry becomes a reading of it, from its typed inputs
    where this version still takes them, else kept as it was saved. Returns
    ``{"machines", "readings", "recomputed", "kept_as_saved", "skipped"}``.
    """
    machines: dict[str, dict] = {}
    readings, recomputed, kept, skipped = [], 0, 0, 0
    for entry in entries if isinstance(entries, list) else []:
        if not isinstance(entry, dict) or when(entry.get("at")) is None:
            skipped += 1
            continue
        name = " ".join(str(entry.get("machine") or "").split())[:80]
        machine = None
        if name:
            machine = machines.get(name.casefold())
            if machine is None:
                machine = new_machine({"name": name}, "metric", stamp)
                machines[name.casefold()] = machine
        record = _migrated(entry, machine)
        if record.get("as_saved") is None:
            recomputed += 1
        else:
            kept += 1
        readings.append(record)
    return {"machines": list(machines.values()), "readings": readings,
            "recomputed": recomputed, "kept_as_saved": kept, "skipped": skipped}


def _migrated(entry: dict, machine: dict | None) -> dict:
    system = entry.get("units") if entry.get("units") in units.SYSTEMS else "metric"
    inputs = entry.get("inputs") if isinstance(entry.get("inputs"), dict) else {}
    stamp = str(entry["at"]).replace("Z", "+00:00")
    try:
        # A blank field of the earlier log computed with the tool's default: so it does here;
        # its form sent every field, also those its mode did not use.
        found = registry.get(str(entry.get("tool")))
        made = new_reading(found.id, found.without_unused(inputs), system, None, stamp,
                           examples=True)
        record = made["record"]
        record["machine"] = machine["id"] if machine else None
        record["migrated"] = True
        return first_rev(record)
    except (KeyError, InputError, ValueError, ArithmeticError):
        pass
    record = {"format": READING, "version": VERSION, "id": new_id(),
              "machine": machine["id"] if machine else None, "tool": str(entry.get("tool")),
              "inputs": {}, "from_card": [], "calc": "an earlier build", "time": stamp,
              "note": "", "tracked": _old_tracked(entry, system),
              "level": entry.get("level") if entry.get("level") in ("ok", "watch", "act") else None,
              "migrated": True,
              "as_saved": {"title": str(entry.get("title") or entry.get("tool")),
                           "text": {str(k): str(v) for k, v in (entry.get("text") or {}).items()},
                           "verdicts": [str(v) for v in entry.get("verdicts") or []],
                           "inputs": {str(k): str(v) for k, v in inputs.items()},
                           "units": system, "level": entry.get("level")},
              "updated": stamp}
    return first_rev(record)


def _old_tracked(entry: dict, system: str) -> dict:
    """The followed values of an entry kept as saved, from its numbers in its units."""
    found = registry.tools().get(str(entry.get("tool")))
    if found is None:
        return {}
    values = entry.get("values") if isinstance(entry.get("values"), dict) else {}
    out = {}
    for o in found.outputs:
        value = values.get(o.key)
        if o.tracks and _finite(value):
            out[o.tracks] = units.to_metric(float(value), o.quantity, system)
    return out


# --- A reading that comes from outside calc (a file, later a sync) -------------------------

ID_MAX_CHARS = 64
TEXT_VALUE_MAX_CHARS = 2000
INPUTS_MAX = 200


def _finite_number(value: object) -> bool:
    return isinstance(value, (int, float)) and not isinstance(value, bool) and math.isfinite(value)


def _is_tool(tool_id: str) -> bool:
    """Whether a tool of this version has this id (a lookup: an import checks thousands)."""
    try:
        registry.get(tool_id)
    except InputError:
        return False
    return True


def checked_head(record: object, kind: str, fmt: str, version: int = VERSION,
                 id_max: int = ID_MAX_CHARS) -> dict:
    """What every document from outside calc begins with, checked: a record of `fmt` and
    `version` with an id, and its revision members (`revisions.checked_meta`). Returns
    ``{"format", "version", "id", ...revision members}``."""
    if not isinstance(record, dict):
        raise InputError(kind, "is not a record")
    if record.get("format") != fmt or record.get("version") != version:
        raise InputError("format", "is not a {kind} of this version ({format} {version})",
                         kind=Q(kind, "text"), format=Q(fmt, "text"),
                         version=Q(float(version), "count"))
    value = record.get("id")
    if not isinstance(value, str) or not 0 < len(value) <= id_max:
        raise InputError("id", "is not an id (text of 1 to {most} characters)",
                         most=Q(float(id_max), "count"))
    return {"format": fmt, "version": version, "id": value, **checked_meta(record)}


def tombstone(head: dict, record: dict) -> dict:
    """A deletion marker's clean copy: its head and the members a marker keeps, checked
    already by its kind's checker."""
    return {**{k: record[k] for k in TOMBSTONE_KEEPS if k in record}, **head}


def checked_machine_id(record: dict) -> str | None:
    machine = record.get("machine")
    if machine is not None and (not isinstance(machine, str) or len(machine) > ID_MAX_CHARS):
        raise InputError("machine", "is not a machine's id")
    return machine


def checked_machine(record: object) -> dict:
    """A machine record from outside calc (a file, a sync), checked: its head, its card
    parsed again by `card.parse` (every bad field named), its ``updated`` time, as a clean
    copy of only those members (and ``demo``); a deletion marker as a marker."""
    head = checked_head(record, "machine", MACHINE)
    if head.get("deleted"):
        return tombstone(head, {})
    checked_time(head.get("updated"))
    clean = {"format": MACHINE, "version": VERSION, "id": head["id"],
             "card": cards.parse(record.get("card"), "metric"), **head}
    if record.get("demo") is True:
        clean["demo"] = True
    return clean


def checked_reading(record: object) -> dict:
    """A reading record from outside calc checked against the record's declared shape (its
    members, their types, sizes and times, every number finite), as a clean copy of only
    those members; InputError with the reason otherwise. It is computed again when shown,
    so a record that fits the shape but not today's tool still shows what it kept. A
    deletion marker keeps its head and its machine only."""
    head = checked_head(record, "reading", READING)
    machine = checked_machine_id(record)
    if head.get("deleted"):
        return tombstone(head, {"machine": machine})
    tool = record.get("tool")
    # A reading kept as an earlier build saved it may name a tool since retired: it is
    # shown as it was saved, so it travels as it is.
    if not isinstance(tool, str) or len(tool) > ID_MAX_CHARS or (
            record.get("as_saved") is None and not _is_tool(tool)):
        raise InputError("tool", "is not a tool of this version")
    checked_time(record.get("time"))
    inputs = record.get("inputs")
    if not isinstance(inputs, dict) or len(inputs) > INPUTS_MAX or not all(
            isinstance(k, str) and len(k) <= ID_MAX_CHARS and (
                v is None or isinstance(v, bool) or _finite_number(v)
                or (isinstance(v, str) and len(v) <= TEXT_VALUE_MAX_CHARS))
            for k, v in inputs.items()):
        raise InputError("inputs", "are not a set of named numbers, texts and ticks")
    from_card = record.get("from_card", [])
    if not isinstance(from_card, list) or not all(isinstance(k, str) and k in inputs
                                                  for k in from_card):
        raise InputError("from_card", "names inputs the reading does not have")
    tracked = record.get("tracked", {})
    if not isinstance(tracked, dict) or not all(
            k in registry.TRACKED and _finite_number(v) for k, v in tracked.items()):
        raise InputError("tracked", "holds values that are not finite numbers of followed "
                                    "quantities")
    note = record.get("note", "")
    if not isinstance(note, str) or len(note) > NOTE_MAX_CHARS:
        raise InputError("note", "is not a note of at most {most} characters",
                         most=Q(float(NOTE_MAX_CHARS), "count"))
    level = record.get("level")
    if level not in (None, "ok", "watch", "act"):
        raise InputError("level", "is not ok, watch or act")
    clean = {"format": READING, "version": VERSION, "id": head["id"], "machine": machine,
             "tool": tool, "inputs": dict(inputs), "from_card": list(from_card),
             "calc": str(record.get("calc", ""))[:40], "time": record["time"], "note": note,
             "tracked": {k: float(v) for k, v in tracked.items()}, "level": level, **head}
    for flag in ("migrated", "demo"):
        if record.get(flag) is True:
            clean[flag] = True
    saved = record.get("as_saved")
    if saved is not None:
        if not isinstance(saved, dict) or len(str(saved)) > 20 * TEXT_VALUE_MAX_CHARS:
            raise InputError("as_saved", "is not the text an earlier build kept")
        clean["as_saved"] = {"title": str(saved.get("title", ""))[:200],
                             "text": {str(k)[:ID_MAX_CHARS]: str(v)[:200]
                                      for k, v in dict(saved.get("text") or {}).items()},
                             "verdicts": [str(v)[:TEXT_VALUE_MAX_CHARS]
                                          for v in list(saved.get("verdicts") or [])],
                             "inputs": {str(k)[:ID_MAX_CHARS]: str(v)[:200]
                                        for k, v in dict(saved.get("inputs") or {}).items()},
                             "units": saved.get("units") if saved.get("units") in units.SYSTEMS
                             else "metric",
                             "level": saved.get("level") if saved.get("level") in
                             ("ok", "watch", "act") else None}
    return clean


def checked_readings(found: list) -> dict:
    """Readings from a file: ``{"readings": the clean ones, "refused": how many, "reasons":
    the first few, each with its place in the file}``."""
    accepted, reasons, refused = [], [], 0
    for place, record in enumerate(found if isinstance(found, list) else [], 1):
        try:
            accepted.append(checked_reading(record))
        except (InputError, TypeError, ValueError) as err:
            refused += 1
            if len(reasons) < 3:
                reasons.append(f"reading {place}: {err}")
    return {"readings": accepted, "refused": refused, "reasons": reasons}
