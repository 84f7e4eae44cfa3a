"""What leaves the phone: the visit report of one machine and day, and the CSV of readings.

Both are made from the stored readings answered again (calc.machines.records), in the
reader's units, with the labels the screen shows.

The CSV has one row per reading and output: value and unit in columns of their own, the
inputs and verdicts in words, the time as recorded (local, with its offset). A cell a
spreadsheet would run as a formula (one starting with =, +, -, @, a tab or a carriage
return) is written with a leading apostrophe; a plain number, negative ones included, is
written as the number, since a spreadsheet reads it as one and runs nothing.

>>> csv_cell("=HYPERLINK(1)"), csv_cell("-3.5"), csv_cell("Press 3, bay 2")
("'=HYPERLINK(1)", '-3.5', '"Press 3, bay 2"')
"""

from __future__ import annotations

import re
from datetime import date

from ..kernel import units
from ..kernel.errors import InputError
from ..kernel.result import LEVELS
from . import card as cards
from .condition import due, when
from .records import answer, shown_inputs, view

# Cautions printed on every visit report (common practice; the maker's manual and the
# site's rules come first).
CAUTIONS = (
    "Before opening any part of the circuit: lock out and tag out the power, lower or block "
    "loads, and release stored pressure (accumulators, trapped lines) as the machine maker "
    "describes.",
    "Keep hands away from leaks on a pressurised line: an oil jet can inject oil under the "
    "skin, which needs a surgeon at once. Hot oil and surfaces burn.",
    "These figures support, and do not replace, the equipment maker's limits, local codes "
    "and licensed practice.",
)
# The card facts a one-page visit report shows, in this order (the rest is on the machine
# page).
CARD_LINES = ("site", "oil_name", "grade", "vi", "oil_volume", "tank_volume", "pump_type",
              "pump_flow", "working_pressure", "component", "target4", "target6", "target14",
              "temp_running")


def on_day(readings: list[dict], day: date) -> list[dict]:
    """The readings taken on `day`, local time as recorded, oldest first."""
    found = [(when(r.get("time")), r) for r in readings]
    return [r for t, r in sorted((p for p in found if p[0] is not None), key=lambda p: p[0])
            if t.date() == day]


# How many days with readings a visit report offers when its own day has none.
READING_DAYS = 6


def reading_days(readings: list[dict], most: int = READING_DAYS) -> list[str]:
    """The newest `most` days that have readings, newest first, local time as recorded.

    >>> reading_days([{"time": "2026-03-02T17:00:00+01:00"}, {"time": "2026-01-05T08:00:00Z"},
    ...               {"time": "2026-03-02T09:00:00+01:00"}, {"time": "not a time"}])
    ['2026-03-02', '2026-01-05']
    """
    days = {t.date() for t in (when(r.get("time")) for r in readings) if t is not None}
    return [d.isoformat() for d in sorted(days, reverse=True)[:most]]


def visit(machine: dict, readings: list[dict], system: str, day: date, who: str = "",
          notes: str = "") -> dict:
    """The visit report of one machine on one day: the card's summary, each reading with
    its inputs, values and verdicts, the checklists' ticked symptoms and ranked causes,
    what is due, notes, who, and the cautions. The page prints it on one page. ``"days"``:
    the newest days that have readings, for a report whose day has none. `readings` may be
    all readings: only this machine's are used."""
    system = units.check_system(system)
    card = machine.get("card") or {}
    readings = [r for r in readings if r.get("machine") == machine.get("id")]
    lines = {line["key"]: line for line in cards.summary(card, system)}
    taken = on_day(readings, day)
    shown = [_reading(view(r, system)) for r in taken]
    levels = [s["level"] for s in shown if s.get("level") in LEVELS]
    show = _shower(system)
    return {
        "machine": card.get("name", ""), "day": day.isoformat(), "who": str(who).strip(),
        "notes": str(notes).strip(),
        "card": [{"label": lines[k]["label"], "text": lines[k]["text"]}
                 for k in CARD_LINES if k in lines],
        "readings": shown,
        "days": [] if shown else reading_days(readings),
        "level": max(levels, key=LEVELS.index) if levels else None,
        "due": [{"label": d.label, "state": d.state, "says": d.says.render(show)}
                for d in due(cards.facts(card)[0], readings, day)],
        "cautions": list(CAUTIONS),
        "signature": "Signature",
    }


def _shower(system: str):
    return lambda value, quantity: units.show(value, quantity, system)


def _reading(shown: dict) -> dict:
    """One reading of the report: what it asked, what it found, kept short for paper."""
    at = when(shown.get("time"))
    base = {"title": shown.get("title"), "time": at.strftime("%H:%M") if at else "",
            "note": shown.get("note", ""), "level": shown.get("level"), "ok": shown["ok"]}
    if not shown["ok"]:
        return {**base, "message": shown.get("message", ""),
                "outputs": [{"label": k, "text": v} for k, v in (shown.get("text") or {}).items()],
                "verdicts": [{"level": None, "message": v}
                             for v in shown.get("verdicts_as_saved", [])],
                "inputs": [], "from_card": 0, "seen": [], "causes": []}
    inputs = shown.get("inputs", [])
    typed = [i for i in inputs if not i["flag"] and not i["from_card"]
             and (i["tracks"] or not i["at_default"])]
    return {
        **base,
        # What was read: what the reading measured and what differs from the tool's own
        # starting values; the card's facts are at the head of the report.
        "inputs": [{"label": i["label"], "text": i["text"]} for i in typed],
        "from_card": sum(1 for i in inputs if i["from_card"]),
        "seen": [i["label"] for i in inputs if i["flag"]],
        # What it found at a glance: the headline values and the followed quantities (the
        # machine page and the CSV have every value).
        "outputs": [{"label": o["label"], "text": o["text"]} for o in shown["outputs"]
                    if o["text"] != "n/a" and (o["headline"] or o["tracks"])],
        "verdicts": [{"level": v["level"], "message": v["message"]} for v in shown["verdicts"]],
        "causes": [{"title": c["title"], "word": c["word"], "reasons": c["reasons"]}
                   for c in shown.get("ranked", []) if c["score"] > 0],
    }


CSV_HEADER = ("Time", "Machine", "Site", "Tool", "Output", "Value", "Unit",
              "Reading verdict", "Verdicts", "Inputs", "Note", "Reading id")
_NUMBER = re.compile(r"-?\d+(\.\d+)?")
_RUNS = ("=", "+", "-", "@", "\t", "\r")


def csv_cell(value: object) -> str:
    """One cell, quoted where it must be and never run as a formula."""
    cell = "" if value is None else str(value)
    if cell.startswith(_RUNS) and not _NUMBER.fullmatch(cell):
        cell = "'" + cell
    if any(c in cell for c in ',"\n\r;'):
        cell = '"' + cell.replace('"', '""') + '"'
    return cell


def csv_rows(machines: list[dict], readings: list[dict], system: str) -> list[list[str]]:
    """Every reading's outputs as rows (header first), oldest first, in `system` units."""
    system = units.check_system(system)
    show = _shower(system)
    by_id = {m.get("id"): (m.get("card") or {}) for m in machines if isinstance(m, dict)}
    rows = [list(CSV_HEADER)]
    dated = sorted(((when(r.get("time")), r) for r in readings if isinstance(r, dict)),
                   key=lambda p: (p[0] is None, p[0] or 0))
    for _at, record in dated:
        card = by_id.get(record.get("machine"), {})
        head = [record.get("time", ""), card.get("name", ""), card.get("site", "")]
        try:
            found, values, result = answer(record)
        except InputError:
            shown = view(record, system)
            for label, text in (shown.get("text") or {"(no output)": ""}).items():
                rows.append(head + [shown.get("title"), label, text, "", shown.get("level") or "",
                                    " | ".join(shown.get("verdicts_as_saved", [])) or
                                    shown.get("message", ""), "", record.get("note", ""),
                                    record.get("id", "")])
            continue
        inputs = "; ".join(f"{i['label']} = {i['text']}{' (card)' if i['from_card'] else ''}"
                           for i in shown_inputs(found, values, record.get("from_card"), system))
        verdicts = " | ".join(f"{v.level}: {v.message.render(show)}" for v in result.verdicts)
        for out in found.outputs:
            value = result.values.get(out.key)
            if value is None:
                continue
            if isinstance(value, (int, float)) and not isinstance(value, bool):
                number, unit = (units.show_number(float(value), out.quantity, system),
                                units.unit_label(out.quantity, system))
            else:
                number, unit = str(value), ""
            rows.append(head + [found.title, out.label, number, unit, result.level, verdicts,
                                inputs, record.get("note", ""), record.get("id", "")])
    return rows


def csv_text(machines: list[dict], readings: list[dict], system: str) -> str:
    """The CSV file: UTF-8 with a byte-order mark (so spreadsheets read °C and µm right),
    CRLF line ends (RFC 4180)."""
    body = "\r\n".join(",".join(csv_cell(c) for c in row)
                       for row in csv_rows(machines, readings, system))
    return "\ufeff" + body + "\r\n"
