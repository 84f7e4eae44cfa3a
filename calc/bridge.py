"""JSON in, JSON out: the single entry point of the web worker and the CLI.

A request is ``{"tool": ID, "inputs": {key: typed text or number}, "units": "metric"|"us"}``.
The answer is ``{"tool", "ok": true, "values", "units", "text", "verdicts", "level",
"notes", "sources", "charts", "ranked"}``, or ``{"tool", "ok": false, "errors": [{"field", "message"}]}``.

>>> answer = run("viscosity-at-temperature", {"kv40": "46", "kv100": "6,8", "temp": 60})
>>> answer["ok"], answer["text"]["kv"]
(True, '20.6 cSt')
>>> run("viscosity-at-temperature", {"kv40": "10", "kv100": "20"})["errors"][0]["field"]
'kv100'
"""

from __future__ import annotations

import json

from . import registry, units
from .errors import InputError
from .result import Result


def catalogue(system: str = "metric") -> list[dict]:
    """Every tool's declaration, fields in `system` units."""
    return [t.describe(system) for t in registry.tools().values()]


def run(tool_id: str, inputs: dict | None = None, system: str = "metric") -> dict:
    """Run one tool on typed inputs; never raises for bad input."""
    try:
        system = units.check_system(system)
        found = registry.get(tool_id)
        result = found.run(dict(inputs or {}), system)
    except InputError as err:
        return {"tool": tool_id, "ok": False, "errors": err.as_list()}
    return present(found, result, system)


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
        return json.dumps({"errors": err.as_list()})


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
