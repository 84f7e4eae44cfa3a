"""JSON in, JSON out: the single entry point of the web worker and the CLI.

A request is ``{"tool": ID, "inputs": {key: typed text or number}, "units": "metric"|"us"}``.
The answer is ``{"tool", "ok": true, "values", "units", "text", "headline", "verdicts",
"level", "notes", "sources", "charts", "ranked"}``, or ``{"tool", "ok": false, "errors":
[{"field", "message"}]}``. A fault inside a tool is an answer too: ``"ok": false`` with one
error whose field is None, and a ``"bug"`` member with the traceback for the bug report.

>>> answer = run("viscosity-at-temperature", {"kv40": "46", "kv100": "6,8", "temp": 60},
...              examples=True)
>>> answer["ok"], answer["text"]["kv"], answer["headline"]
(True, '20.6 cSt', ['kv'])
>>> run("viscosity-at-temperature", {"kv40": "10", "kv100": "20"}, examples=True)["errors"][0]["field"]
'kv100'
>>> run("viscosity-at-temperature", {"kv40": "46", "kv100": "6.8", "temp1": 40, "temp2": 100})
{'tool': 'viscosity-at-temperature', 'ok': False, 'errors': [{'field': 'temp', 'message': 'Oil temperature now is needed'}]}
"""

from __future__ import annotations

import hashlib
import json
import traceback
from datetime import datetime

from .kernel import jsontext, registry, units
from .kernel.errors import InputError
from .kernel.answer import present
from .machines import api as machines_api

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


def run(tool_id: str, inputs: dict | None = None, system: str = "metric",
        examples: bool = False) -> dict:
    """Run one tool on typed inputs; never raises, whatever the inputs.

    A blank reading is not given (an error beside its field); ``examples`` fills blank
    readings and machine facts with the declared examples (calc.kernel.registry)."""
    try:
        found = registry.get(tool_id)
        result = found.run(dict(inputs or {}), units.check_system(system), examples=examples)
        return present(found, result, units.check_system(system))
    except InputError as err:
        return {"tool": tool_id, "ok": False, "errors": err.as_list(_shower(system))}
    except Exception as err:  # noqa: BLE001 - a fault in a tool must reach the page as data
        return _bug(tool_id, err)


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


# Deeper than this is no request of the page's: refused before the parser, whose recursion
# would overflow the much smaller stack of the interpreter in the browser.
REQUEST_DEPTH_MAX = 32


def _request(request: str) -> tuple[dict | None, dict | None]:
    """(the request object, None) or (None, the error answer): any text at all, however
    deep or malformed, gives one or the other."""
    if not isinstance(request, str) or jsontext.too_deep(request, REQUEST_DEPTH_MAX):
        return None, {"ok": False, "errors": [{"field": "request",
                                               "message": "nested too deeply, or not text"}]}
    try:
        message = json.loads(request)
    except (ValueError, RecursionError, TypeError) as err:
        text = "nested too deeply" if isinstance(err, RecursionError) else str(err)[:200]
        return None, {"ok": False, "errors": [{"field": "request", "message": text}]}
    if not isinstance(message, dict):
        return None, {"ok": False, "errors": [{"field": "request", "message": "must be an object"}]}
    return message, None


def reexpress_json(request: str) -> str:
    """The worker's entry for a unit switch: {tool, inputs, from, to} -> {key: text}."""
    message, bad = _request(request)
    if bad:
        return json.dumps({"errors": bad["errors"]})
    inputs = message.get("inputs")
    try:
        return json.dumps(reexpress(str(message.get("tool")), inputs if isinstance(inputs, dict) else {},
                                    message.get("from"), message.get("to")), ensure_ascii=False)
    except InputError as err:
        return json.dumps({"errors": err.as_list(_shower(message.get("to")))})


def run_json(request: str) -> str:
    """The worker's entry point: one JSON request string in, one JSON answer string out."""
    message, bad = _request(request)
    if bad:
        return json.dumps({"tool": None, **bad})
    inputs = message.get("inputs")
    answer = run(str(message.get("tool")), inputs if isinstance(inputs, dict) else {},
                 str(message.get("units") or "metric"), message.get("examples") is True)
    return json.dumps(answer, ensure_ascii=False)


def run_for_machine(tool_id: str, inputs: dict, system: str, machine: dict,
                    examples: bool = False) -> dict:
    """`run` with a machine record's card filling the bound inputs not given; the answer
    adds ``"from_card"`` (the keys it filled) and ``"inputs"`` (all, metric)."""
    return _machine_call({"op": "run", "tool": tool_id, "inputs": inputs, "units": system,
                          "machine": machine, "examples": examples})


def check_card(card: object, system: str) -> dict:
    """A typed card checked: ``{"ok", "machine"}`` or ``{"ok": false, "errors"}``."""
    return _machine_call({"op": "card-check", "card": card, "units": system,
                          "time": datetime.now().astimezone().isoformat(timespec="seconds")})


def _machine_call(request: dict) -> dict:
    try:
        answer = machines_api.call(request)
    except Exception as err:  # noqa: BLE001 - a fault in calc must reach the page as data
        return _bug(request.get("tool"), err)
    if "tool" in request:
        answer.setdefault("tool", request["tool"])
    return answer


def machines_json(request: str) -> str:
    """The worker's entry for the machine kit: one JSON request {"op", ...} in, one JSON
    answer out (calc.machines.api lists the ops). Never raises: a fault of calc's own is
    an answer with a bug report, as in `run`."""
    message, bad = _request(request)
    if bad:
        return json.dumps(bad)
    return json.dumps(_machine_call(message), ensure_ascii=False)


def self_check(sample: bool = False) -> str:
    """Every tool run once on its examples in both unit systems, as one JSON line.

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
            answer = run_json(json.dumps({"tool": tool_id, "inputs": {}, "units": system,
                                          "examples": True}))
            digest.update(answer.encode())
            if not json.loads(answer)["ok"]:
                failed.append(f"{tool_id}/{system}")
    return json.dumps({"ok": not failed, "tools": len(found), "failed": failed,
                       "digest": digest.hexdigest()})
