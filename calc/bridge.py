"""JSON in, JSON out: the single entry point of the web worker and the CLI.

A request is ``{"tool": ID, "inputs": {key: typed text or number}, "units": "metric"|"us"}``.
The answer is ``{"tool", "ok": true, "values", "units", "text", "headline", "verdicts",
"level", "notes", "sources", "charts", "ranked"}``, or ``{"tool", "ok": false, "errors":
[{"field", "message"}]}``. A fault inside a tool is an answer too: ``"ok": false`` with one
error whose field is None, and a ``"bug"`` member with the traceback for the bug report.

>>> answer = run("viscosity-at-temperature", {"kv40": "46", "kv100": "6,8", "temp": 60})
>>> answer["ok"], answer["text"]["kv"], answer["headline"]
(True, '20.6 cSt', ['kv'])
>>> run("viscosity-at-temperature", {"kv40": "10", "kv100": "20"})["errors"][0]["field"]
'kv100'
"""

from __future__ import annotations

import hashlib
import json
import math
import traceback
from datetime import datetime

from .kernel import chart, registry, units
from .kernel.errors import InputError
from .kernel.result import Result

BUG_MESSAGE = ("The calculator hit a fault of its own with these inputs (a bug, not your "
               "reading). Nothing was computed; please pass on the bug report that comes with "
               "this message.")


def catalogue(system: str = "metric") -> list[dict]:
    """Every tool's declaration, fields in `system` units."""
    return [t.describe(system) for t in registry.tools().values()]


def _bug(tool_id: object, err: BaseException) -> dict:
    return {"tool": tool_id, "ok": False, "errors": [{"field": None, "message": BUG_MESSAGE}],
            "bug": {"error": f"{type(err).__name__}: {err}",
                    "traceback": "".join(traceback.format_exception(err))[-4000:]}}


def _shower(system: str):
    """`show(value, quantity)` in `system`, metric when the system itself is bad."""
    try:
        system = units.check_system(system)
    except InputError:
        system = "metric"
    return lambda value, quantity: units.show(value, quantity, system)


def run(tool_id: str, inputs: dict | None = None, system: str = "metric") -> dict:
    """Run one tool on typed inputs; never raises, whatever the inputs."""
    try:
        found = registry.get(tool_id)
        result = found.run(dict(inputs or {}), units.check_system(system))
        return present(found, result, units.check_system(system))
    except InputError as err:
        return {"tool": tool_id, "ok": False, "errors": err.as_list(_shower(system))}
    except Exception as err:  # noqa: BLE001 - a fault in a tool must reach the page as data
        return _bug(tool_id, err)


def present(found: registry.Tool, result: Result, system: str) -> dict:
    """A metric `Result` as the reader sees it in `system`."""
    show = lambda value, quantity: units.show(value, quantity, system)  # noqa: E731
    values, unit_of, shown = {}, {}, {}
    for out in found.outputs:
        if out.key not in result.values:
            continue
        value = result.values[out.key]
        if isinstance(value, (int, float)) and not isinstance(value, bool):
            values[out.key] = units.from_metric(float(value), out.quantity, system)
            shown[out.key] = show(float(value), out.quantity)
        else:
            values[out.key] = value
            shown[out.key] = "n/a" if value is None else str(value)
        unit_of[out.key] = units.unit_label(out.quantity, system)
    return {
        "tool": found.id,
        "ok": True,
        "units": unit_of,
        "values": values,
        "text": shown,
        "headline": [key for key in found.headline if key in shown],
        "level": result.level,
        "verdicts": [{"level": v.level, "message": v.message.render(show), "basis": v.basis}
                     for v in result.verdicts],
        "notes": [n.render(show) for n in result.notes],
        "sources": list(result.sources),
        "charts": {name: draw(system) for name, draw in result.charts.items()},
        "ranked": [{"key": c.key, "title": c.title, "score": c.score,
                    "reasons": [r.render(show) for r in c.reasons]} for c in result.ranked],
    }


def reexpress(tool_id: str, inputs: dict, from_system: str, to_system: str) -> dict:
    """Typed inputs of one tool re-expressed in another unit system, as text for the form.

    Fields that do not parse are left as typed, so nothing the user entered is lost.

    >>> reexpress("viscosity-at-temperature", {"temp": "60"}, "metric", "us")
    {'temp': '140'}
    """
    found = registry.get(tool_id)
    from_system, to_system = units.check_system(from_system), units.check_system(to_system)
    shown = {}
    for key, raw in inputs.items():
        try:
            f = found.field(key)
        except KeyError:
            continue
        if f.is_choice or raw is None or not str(raw).strip():
            shown[key] = raw
            continue
        try:
            metric = units.to_metric(units.parse_number(raw, key), f.quantity, from_system)
        except InputError:
            shown[key] = raw
            continue
        shown[key] = units.format_input(units.from_metric(metric, f.quantity, to_system))
    return shown


def reexpress_json(request: str) -> str:
    """The worker's entry for a unit switch: {tool, inputs, from, to} -> {key: text}."""
    message = json.loads(request)
    try:
        return json.dumps(reexpress(message["tool"], message.get("inputs") or {},
                                    message.get("from"), message.get("to")), ensure_ascii=False)
    except InputError as err:
        return json.dumps({"errors": err.as_list(_shower(message.get("to")))})


def run_json(request: str) -> str:
    """The worker's entry point: one JSON request string in, one JSON answer string out."""
    try:
        message = json.loads(request)
        if not isinstance(message, dict):
            raise ValueError("request must be an object")
    except ValueError as err:
        return json.dumps({"tool": None, "ok": False,
                           "errors": [{"field": "request", "message": str(err)}]})
    inputs = message.get("inputs")
    answer = run(str(message.get("tool")), inputs if isinstance(inputs, dict) else {},
                 str(message.get("units") or "metric"))
    return json.dumps(answer, ensure_ascii=False)


def self_check(sample: bool = False) -> str:
    """Every tool run once on its defaults in both unit systems, as one JSON line.

    ``{"ok", "tools", "failed", "digest"}``: the digest is the sha256 of all the answers,
    so an interpreter restored from a memory snapshot can be compared with the one that
    made it (the worker, the snapshot maker and the benchmark all call this). With
    ``sample=True`` only the catalogue's first tool of each topic runs, in both systems:
    every part of the kernel, units both ways and a checklist, in a tenth of the time. The
    worker checks a restored snapshot that way (its bytes are checked by their sha256
    first); the snapshot maker and the normal boot run every tool.

    >>> check = json.loads(self_check())
    >>> check["ok"], check["failed"]
    (True, [])
    >>> quick = json.loads(self_check(sample=True))
    >>> quick["ok"], quick["tools"] == len({t.topic for t in registry.tools().values()})
    (True, True)
    """
    digest, failed = hashlib.sha256(), []
    found = registry.tools()
    if sample:
        firsts: dict[registry.Topic, str] = {}
        for tool_id, declared in found.items():
            firsts.setdefault(declared.topic, tool_id)
        found = {tool_id: found[tool_id] for tool_id in firsts.values()}
    for tool_id in found:
        for system in units.SYSTEMS:
            answer = run_json(json.dumps({"tool": tool_id, "inputs": {}, "units": system}))
            digest.update(answer.encode())
            if not json.loads(answer)["ok"]:
                failed.append(f"{tool_id}/{system}")
    return json.dumps({"ok": not failed, "tools": len(found), "failed": failed,
                       "digest": digest.hexdigest()})


def _when(stamp: object) -> datetime | None:
    try:
        when = datetime.fromisoformat(str(stamp).replace("Z", "+00:00"))
    except ValueError:
        return None
    return when if when.tzinfo is not None else None


def trends(entries: list, system: str = "metric") -> list[dict]:
    """Trend charts of saved results: one per machine and followed quantity with two or more
    points, drawn in `system` units. An entry is ``{"at": ISO time with offset, "machine",
    "tool", "values": {output: number}, "units": the system its values are in}``; entries
    that do not fit (unknown tool, bad time, no number) are left out, never fatal.

    >>> e = [{"at": f"2026-0{m}-01T08:00:00Z", "machine": "Press 2", "tool": "viscosity-grade",
    ...       "values": {"kv40": kv}, "units": "metric"} for m, kv in ((1, 46.0), (3, 49.0))]
    >>> [(t["machine"], t["tracks"], t["points"]) for t in trends(e)]
    [('Press 2', 'kv40', 2)]
    """
    system = units.check_system(system)
    found = registry.tools()
    series: dict[tuple[str, str], list[tuple[datetime, float]]] = {}
    for entry in entries if isinstance(entries, list) else []:
        if not isinstance(entry, dict) or entry.get("tool") not in found:
            continue
        when, values = _when(entry.get("at")), entry.get("values")
        entry_system = entry.get("units") if entry.get("units") in units.SYSTEMS else "metric"
        if when is None or not isinstance(values, dict):
            continue
        machine = str(entry.get("machine") or "")[:200]
        for out in found[entry["tool"]].outputs:
            value = values.get(out.key)
            if out.tracks is None or isinstance(value, bool) or not isinstance(value, (int, float)):
                continue
            metric = units.to_metric(float(value), out.quantity, entry_system)
            if math.isfinite(metric):
                series.setdefault((machine, out.tracks), []).append((when, metric))
    drawn = []
    for (machine, tracks), points in series.items():
        if len(points) < 2:
            continue
        tracked = registry.TRACKED[tracks]
        title = f"{tracked.label}{' · ' + machine if machine else ''}"
        drawn.append({"machine": machine, "tracks": tracks, "title": title,
                      "points": len(points),
                      "svg": chart.trend(sorted(points), tracked.quantity, system, title)})
    return drawn


def trends_json(request: str) -> str:
    """The worker's entry for the log: {entries, units} -> [{machine, tracks, title, svg}]."""
    try:
        message = json.loads(request)
        entries = message.get("entries") if isinstance(message, dict) else None
        system = message.get("units") if isinstance(message, dict) else None
        return json.dumps(trends(entries or [], system or "metric"), ensure_ascii=False)
    except (ValueError, InputError):
        return json.dumps([])
