"""The machine kit's requests, as the page and the CLI make them: JSON-ready dicts in and
out. `calc.bridge.machines_json` is the worker's door to them.

A request is ``{"op": name, "units": "metric" | "us", ...}``; each op below says what else
it reads. Every answer has ``"ok"``; a refused request is ``{"ok": false, "errors":
[{"field", "message"}]}`` with each message in the reader's units. Machines and readings
are records (calc.machines.records); the page stores them as they come and sends them
back as they were stored.

>>> plant = call({"op": "demo", "today": "2026-12-02"})
>>> press = plant["machines"][0]
>>> page = call({"op": "machine-page", "machine": press, "readings": plant["readings"],
...              "units": "us", "today": "2026-12-02"})
>>> page["ok"], page["name"], page["latest"][0]["label"], page["latest"][0]["text"]
(True, 'Press 6 (demo)', 'Oil temperature', '136.4 °F')
"""

from __future__ import annotations

from datetime import date

from ..kernel import registry, units
from ..kernel.answer import present
from ..kernel.errors import InputError
from ..kernel.result import LEVELS, Q
from . import card as cards
from . import condition, demo, label, records, report, travel

SLIM_KEYS = ("id", "machine", "tool", "time", "tracked", "level")


def _system(request: dict) -> str:
    return units.check_system(request.get("units") or "metric")


def _show(system: str):
    return lambda value, quantity: units.show(value, quantity, system)


def _today(request: dict, key: str = "today") -> date:
    try:
        return date.fromisoformat(str(request.get(key)))
    except ValueError:
        raise InputError(key, "is a date written year-month-day, like 2026-03-31") from None


def _machine(request: dict, required: bool = True) -> dict | None:
    machine = request.get("machine")
    if machine is None and not required:
        return None
    if not isinstance(machine, dict) or not isinstance(machine.get("card"), dict):
        raise InputError("machine", "is a machine record as the machines store keeps it")
    # A stored card is checked again: it may come from an older version or a file.
    return {**machine, "card": cards.parse(machine["card"], "metric")}


def _list(request: dict, key: str) -> list[dict]:
    """The records of a list member; deletion markers (calc.machines.revisions) stored
    beside them are no records to show, and are left out."""
    found = request.get(key)
    if not isinstance(found, list):
        raise InputError(key, "is a list of records")
    return [r for r in found if isinstance(r, dict) and r.get("deleted") is not True]


def card_form(request: dict) -> dict:
    """The card's sections and fields, in the reader's units: ``{"sections"}``."""
    return {"ok": True, "sections": cards.describe(_system(request))}


def card_check(request: dict) -> dict:
    """A typed card (``"card"``, in the reader's units) checked and made a machine record
    (``"id"`` kept when editing one, ``"time"`` its local time with offset). Editing a
    stored machine, ``"previous"`` is its record: the answer is then its next revision
    (the stored one itself when the card did not change), so the edit travels as one."""
    raw = request.get("card")
    previous = request.get("previous")
    if previous is None:
        return {"ok": True, "machine": records.new_machine(
            raw if isinstance(raw, dict) else None, _system(request), request.get("time"),
            request.get("id") or None)}
    return {"ok": True, "machine": _revised_card(previous, raw, _system(request),
                                                 request.get("time"))}


def card_view(request: dict) -> dict:
    """A machine's card for its form (``"values"``: as typed in the reader's units) and
    for reading (``"summary"``: labelled lines, derived facts marked)."""
    machine, system = _machine(request), _system(request)
    return {"ok": True, "values": cards.shown(machine["card"], system),
            "summary": cards.summary(machine["card"], system)}


def card_reexpress(request: dict) -> dict:
    """A card being typed (``"card"``) re-expressed from ``"from"`` to ``"to"`` units for
    its form: ``{"values"}``; a field that does not parse is left as typed."""
    raw = request.get("card") if isinstance(request.get("card"), dict) else {}
    for key in ("from", "to"):
        if request.get(key) not in units.SYSTEMS:
            raise InputError(key, "is the unit system, metric or us")
    source, target = request["from"], request["to"]
    values = {}
    for key, typed in raw.items():
        f = cards.FIELDS.get(key)
        if f is None:
            continue
        values[key] = typed
        if f.is_number and typed not in (None, "") and str(typed).strip():
            try:
                metric = units.to_metric(units.parse_number(typed, key), f.quantity, source)
            except InputError:
                continue
            values[key] = units.format_input(units.from_metric(metric, f.quantity, target))
    return {"ok": True, "values": values}


def fill(request: dict) -> dict:
    """What a machine's card puts into one tool's form: ``"values"`` {key: text in the
    reader's units} for every bound input the card knows and this tool takes, ``"misfits"``
    [{field, message}] for card values this tool cannot take (the run then refuses them,
    naming the card), ``"bound"`` {key: card field} for every bound input."""
    found, system = registry.get(str(request.get("tool"))), _system(request)
    machine = _machine(request)
    facts = cards.facts(machine["card"])[0]
    values, misfits = {}, []
    for f in found.inputs:
        fact = facts.get(f.binds) if f.binds else None
        if fact is None:
            continue
        try:
            f.parse(fact, "metric")
        except InputError as err:
            misfits += err.as_list(_show(system))
            continue
        values[f.key] = (units.format_input(units.from_metric(fact, f.quantity, system))
                         if f.is_number else fact)
    return {"ok": True, "values": values, "misfits": misfits,
            "bound": {f.key: f.binds for f in found.inputs if f.binds}}


def to_card(request: dict) -> dict:
    """Save one input's typed value (``"tool"``, ``"key"``, ``"value"``) to the machine's
    card field it is bound to; the updated machine record."""
    found, system = registry.get(str(request.get("tool"))), _system(request)
    machine = _machine(request)
    key = str(request.get("key"))
    try:
        f = found.field(key)
    except KeyError:
        raise InputError(key, "is not an input of {tool}", tool=Q(found.id, "text")) from None
    if not f.binds or f.binds not in cards.FIELDS:
        raise InputError(key, "is not a fact of the machine card")
    value = f.parse(request.get("value"), system)
    card = {k: v for k, v in machine["card"].items() if k != f.binds}
    if value is not None:
        card[f.binds] = value
    # The card's own field and cross-checks judge the value again (metric in, metric out);
    # the record that comes back is the stored one's next revision.
    return {"ok": True, "machine": _revised_card(request["machine"], card, "metric",
                                                 request.get("time"))}


def _revised_card(stored: dict, card: dict, system: str, stamp: object) -> dict:
    """A stored machine record's next revision with `card` (typed in `system`)."""
    return travel.revise({"doc": stored, "changes": {"card": card}, "time": stamp,
                          "units": system})["doc"]


def run(request: dict) -> dict:
    """One tool's answer (as `bridge.run`), with a machine's card filling the bound inputs
    left blank: ``"from_card"`` lists them, ``"inputs"`` has every input as parsed
    (metric)."""
    found, system = registry.get(str(request.get("tool"))), _system(request)
    machine = _machine(request, required=False)
    facts = cards.facts(machine["card"])[0] if machine else None
    raw = request.get("inputs") if isinstance(request.get("inputs"), dict) else {}
    parsed = found.parse_from(raw, system, facts, request.get("examples") is True)
    return {**present(found, found.run_parsed(parsed.values, parsed.notices), system),
            "from_card": parsed.from_card, "inputs": parsed.values}


def save(request: dict) -> dict:
    """Make the reading record of a tool's answer (``"tool"``, ``"inputs"`` as typed,
    ``"machine"`` or none, ``"time"``, ``"note"``): ``{"record", "answer", "digest"}``, the
    digest being the machine's ``"digest"`` sent with one more reading. The inputs are
    parsed again here, so only an answer to what was typed is ever saved."""
    system = _system(request)
    made = records.new_reading(str(request.get("tool")),
                               request.get("inputs") if isinstance(request.get("inputs"), dict)
                               else {}, system, _machine(request, required=False),
                               request.get("time"), request.get("note") or "")
    return {"ok": True, "record": made["record"],
            "answer": present(made["tool"], made["result"], system),
            "digest": condition.digest_add(request.get("digest"), made["record"],
                                           *_facts_and_card(made["record"], request))}


def _facts_and_card(record: dict, request: dict) -> tuple[dict | None, dict | None]:
    machine = _machine(request, required=False)
    if machine is None:
        return None, None
    return cards.facts(machine["card"])[0], machine["card"]


def digest(request: dict) -> dict:
    """A machine's digest made again from all its ``"readings"`` and its ``"machine"`` record
    (after a delete, an import or a change of its card): ``{"digest"}``."""
    machine = _machine(request)
    return {"ok": True, "digest": condition.digest(_list(request, "readings"),
                                                   cards.facts(machine["card"])[0],
                                                   machine["card"])}


def reading(request: dict) -> dict:
    """A stored reading shown now, in the reader's units: ``{"view"}`` (`records.view`;
    the view's own ``"ok"`` is false for a reading kept as saved)."""
    record = request.get("record")
    if not isinstance(record, dict) or record.get("deleted") is True:
        raise InputError("record", "is a reading record (not a deletion marker)")
    return {"ok": True, "view": records.view(record, _system(request))}


def readings(request: dict) -> dict:
    """Several stored readings shown now (a page of the log): ``{"views"}``."""
    system = _system(request)
    return {"ok": True, "views": [records.view(r, system) for r in _list(request, "records")]}


def _latest_rows(facts: dict, found: list[dict], system: str,
                 points: dict | None = None) -> list[dict]:
    show = _show(system)
    rows = []
    for p in condition.latest(facts, found, points):
        tracked = registry.TRACKED[p["tracks"]]
        verdict = p["verdict"]
        tool_id = p["reading"].get("tool")
        rows.append({
            "tracks": p["tracks"], "label": tracked.label,
            "text": units.show(p["value"], tracked.quantity, system),
            "level": verdict.level if verdict else None,
            "message": (verdict.message if verdict else p["missing"]).render(show),
            "basis": verdict.basis if verdict else None,
            "time": p["reading"].get("time"), "reading": p["reading"].get("id"),
            "tool": tool_id,
            "tool_title": registry.get(tool_id).title if tool_id in registry.tools() else tool_id,
        })
    return rows


def _due_rows(facts: dict, found: list[dict], today: date, system: str) -> list[dict]:
    show = _show(system)
    return [{"key": d.key, "label": d.label, "on": d.on.isoformat() if d.on else None,
             "state": d.state, "says": d.says.render(show)}
            for d in condition.due(facts, found, today)]


def machine_page(request: dict) -> dict:
    """Everything a machine's page shows: the card's summary, the latest value and verdict
    of each followed quantity, a trend of each against its limits, what is due, and the
    tools that can take a reading filled from the card. ``"readings"`` may be all
    readings: only this machine's are used."""
    machine, system, today = _machine(request), _system(request), _today(request)
    found = [r for r in _list(request, "readings") if r.get("machine") == machine["id"]]
    facts = cards.facts(machine["card"])[0]
    points = condition.series(found)  # once, for the latest values and the trends
    latest = _latest_rows(facts, found, system, points)
    levels = [row["level"] for row in latest if row["level"]]
    return {
        "ok": True, "id": machine["id"], "name": machine["card"].get("name", ""),
        "site": machine["card"].get("site", ""),
        "summary": cards.summary(machine["card"], system),
        "level": max(levels, key=LEVELS.index) if levels else None,
        "latest": latest,
        "trends": condition.trends(facts, found, system, points=points),
        "due": _due_rows(facts, found, today, system),
        "count": len(found),
        "tools": [{"id": t.id, "title": t.title, "kind": t.kind,
                   "bound": sum(1 for f in t.inputs if f.binds and f.binds in facts)}
                  for t in registry.tools().values() if any(f.binds for f in t.inputs)],
    }


def machine_list(request: dict) -> dict:
    """The machines list: for each machine its name, site, worst latest verdict, number of
    readings, newest reading and the first thing due. ``"digests"`` {machine id: digest
    (`condition.digest`)} stand for each machine's readings; without them, ``"readings"``
    (all, or slim: ``"machine"``, ``"time"``, ``"tracked"``) are used. A digest may come
    without its ``"readings"``: when its verdicts no longer hold (a new calc, a card edited),
    its machine is listed in ``"stale"``, for the page to send its digest whole."""
    system, today = _system(request), _today(request)
    digests, stale = request.get("digests"), []
    if not isinstance(digests, dict):
        by_machine: dict[str, list[dict]] = {}
        for r in _list(request, "readings"):
            by_machine.setdefault(r.get("machine"), []).append(r)
        digests = {key: condition.digest(found) for key, found in by_machine.items()}
    rows = []
    for machine in _list(request, "machines"):
        card = machine.get("card") if isinstance(machine.get("card"), dict) else {}
        known = digests.get(machine.get("id"))
        known = known if isinstance(known, dict) else condition.digest([])
        found = [r for r in known.get("readings") or [] if isinstance(r, dict)]
        # The verdicts the digest holds for this card and this calc; else worked out again
        # from the readings it keeps (a card edited elsewhere, a new version of calc).
        held = condition.fresh_summary(known, card)
        try:
            facts = cards.facts(card if held else cards.parse(card, "metric"))[0]
        except InputError:
            facts = {}
        if held is None and "readings" not in known and known.get("count"):
            stale.append(machine.get("id"))  # sent without its readings: ask for them again
            held = {"level": None, "sample": {"time": None, "sooner": False}}
        elif held is None:
            held = condition.summary(facts, found, card)
        sample = held["sample"]
        at = condition.when(sample.get("time")) if sample.get("time") else None
        show = _show(system)
        due = [{"key": d.key, "label": d.label, "on": d.on.isoformat() if d.on else None,
                "state": d.state, "says": d.says.render(show)}
               for d in condition.due(facts, found, today, (at, bool(sample.get("sooner"))))]
        rows.append({"id": machine.get("id"), "name": card.get("name", ""),
                     "site": card.get("site", ""), "demo": bool(machine.get("demo")),
                     "level": held["level"],
                     "readings": int(known.get("count") or 0), "last": known.get("last"),
                     "due": due[0] if due else None,
                     "overdue": sum(d["state"] == "overdue" for d in due)})
    rows.sort(key=lambda r: (r["name"].casefold(), r["id"] or ""))
    return {"ok": True, "machines": rows, "stale": stale}


def visit(request: dict) -> dict:
    """The visit report of one machine and day (``"day"``), with ``"who"`` and ``"notes"``."""
    machine = _machine(request)
    return {"ok": True, **report.visit(machine, _list(request, "readings"), _system(request),
                                       _today(request, "day"),
                                       str(request.get("who") or ""),
                                       str(request.get("notes") or ""))}


def csv(request: dict) -> dict:
    """The CSV of readings (``"machines"`` name them): ``{"text"}``."""
    return {"ok": True, "text": report.csv_text(_list(request, "machines"),
                                                _list(request, "readings"), _system(request))}


def _with_digests(made: dict) -> dict:
    """`made` ({"machines", "readings", ...}) with each machine's digest."""
    by_machine: dict[str, list[dict]] = {m["id"]: [] for m in made["machines"]}
    for r in made["readings"]:
        by_machine.setdefault(r.get("machine"), []).append(r)
    by_id = {m["id"]: m for m in made["machines"]}
    return {"ok": True, **made, "digests": {
        key: condition.digest(found, cards.facts(by_id[key]["card"])[0], by_id[key]["card"])
        for key, found in by_machine.items() if key in by_id}}


def demo_plant(request: dict) -> dict:
    """The demo plant's machines, readings and digests, dated back from ``"today"``."""
    return _with_digests(demo.plant(_today(request)))


def migrate(request: dict) -> dict:
    """An earlier build's log entries (``"entries"``) as machines, readings and digests."""
    return _with_digests(records.migrate(_list(request, "entries"), request.get("time")))


def check_readings(request: dict) -> dict:
    """Readings from a file (``"readings"``) checked against the record's shape: the clean
    ones and how many were refused, with the first reasons (calc.machines.records)."""
    _list(request, "readings")  # a list, or refused naming the member
    return {"ok": True, **records.checked_readings(request["readings"])}


def label_of(request: dict) -> dict:
    """A machine's label (``"machine"``): ``{"fragment"}`` for the app's address after
    ``#/label/``, and ``{"words"}`` printed beside its code (calc.machines.label)."""
    machine = _machine(request)
    return {"ok": True, "fragment": label.fragment(machine),
            "words": label.words(machine, _system(request))}


def label_read(request: dict) -> dict:
    """A scanned label's ``"fragment"`` checked, with this phone's record of the same
    machine (``"local"``, or null): ``{"machine", "summary", "state"}``, where state is
    "new" (not on this phone), "same" (this revision is here) or "differs" (this phone
    holds another revision: the technician chooses, nothing is replaced without asking)."""
    found = label.read(request.get("fragment"))
    local = request.get("local")
    state = ("new" if not isinstance(local, dict) or local.get("deleted") else
             "same" if local.get("rev") == found["rev"] else "differs")
    return {"ok": True, "machine": found, "state": state,
            "summary": cards.summary(found["card"], _system(request)),
            "local_updated": local.get("updated") if state == "differs" else None}


OPS = {
    "label": label_of, "label-read": label_read,
    "check-readings": check_readings,
    "card-form": card_form, "card-check": card_check, "card-view": card_view,
    "card-reexpress": card_reexpress, "fill": fill,
    "to-card": to_card, "run": run, "save": save, "reading": reading, "readings": readings,
    "machine-page": machine_page, "machines": machine_list, "visit": visit, "csv": csv,
    "demo": demo_plant, "migrate": migrate, "digest": digest,
    **travel.OPS,
}


def call(request: dict) -> dict:
    """Answer one request; InputError (the request's own fault) becomes a refusal."""
    if not isinstance(request, dict) or request.get("op") not in OPS:
        return {"ok": False, "errors": [{"field": "op", "message": "must be one of " +
                                         ", ".join(OPS)}]}
    try:
        return OPS[request["op"]](request)
    except InputError as err:
        try:
            show = _show(_system(request))
        except InputError:
            show = _show("metric")
        return {"ok": False, "errors": err.as_list(show)}
