"""Command line: the scripting interface for engineers.

    python -m calc tools [--json] [--units us]
    python -m calc run ID key=value ... [--units us] [--json] [--svg FILE]
                                        [--machine card.json]

A machine card file is a machine record as the app exports it ({"id", "card": {...}},
metric) or a bare card of typed fields ({"name": "Press 3", "pump_flow": "60", ...}) in
the --units system; its facts fill the tool's bound inputs not given as key=value.

Exit status 0 on an answer, 2 on bad input.
"""

from __future__ import annotations

import argparse
import json
import sys

from . import bridge

LEVEL_MARK = {"ok": "OK   ", "watch": "WATCH", "act": "ACT  "}


class ArgumentsRefused(Exception):
    """The command line itself is wrong (an unknown option, a missing tool id)."""


class _Parser(argparse.ArgumentParser):
    """argparse that raises on a bad command line instead of exiting, so that `main` can
    answer in the JSON error shape when --json was asked for."""

    def error(self, message: str):  # argparse's hook; never returns
        raise ArgumentsRefused(message)


def _units(text: str) -> str:
    return text.strip().lower()


def _parser() -> argparse.ArgumentParser:
    parser = _Parser(prog="python -m calc", description="Sumpside calculators")
    sub = parser.add_subparsers(dest="command", required=True, parser_class=_Parser)
    listing = sub.add_parser("tools", help="list the tools and their inputs")
    listing.add_argument("--json", action="store_true", help="print the catalogue as JSON")
    listing.add_argument("--units", default="metric", type=_units, choices=("metric", "us"))
    run = sub.add_parser("run", help="run one tool: run ID key=value ...")
    run.add_argument("tool", help="tool id, see `python -m calc tools`")
    run.add_argument("pairs", nargs="*", metavar="key=value")
    run.add_argument("--units", default="metric", type=_units, choices=("metric", "us"))
    run.add_argument("--json", action="store_true", help="print the bridge's JSON answer")
    run.add_argument("--svg", metavar="FILE", help="write the tool's chart, if it draws one")
    run.add_argument("--machine", metavar="CARD.json",
                     help="a machine card whose facts fill the inputs not given")
    run.add_argument("--example", action="store_true",
                     help="fill each reading and machine fact not given with the tool's "
                          "example value (each one is named in the output); without it, a "
                          "reading not given is an error")
    return parser


def _print_catalogue(system: str) -> None:
    for item in bridge.catalogue(system):
        print(f"{item['id']}  —  {item['title']}")
        print(f"    {item['summary']}")
        for f in item["inputs"]:
            if f["choices"]:
                detail = "one of " + ", ".join(c[0] for c in f["choices"])
            else:
                detail = f["unit"] or "number"
            default = "" if f["default"] is None else f", default {f['default']:g}" if isinstance(
                f["default"], float) else f", default {f['default']}"
            print(f"    {f['key']:<14} {f['label']} [{detail}{default}]")
        print()


def _machine(path: str | None, system: str, bad: list) -> dict | None:
    """The machine record of a --machine file, or None; a bad file goes on `bad`."""
    if path is None:
        return None
    try:
        with open(path, encoding="utf-8") as handle:
            found = json.load(handle)
    except (OSError, ValueError) as err:
        bad.append({"field": "--machine", "message": f"cannot read {path}: {err}"})
        return None
    if isinstance(found, dict) and isinstance(found.get("card"), dict):
        return found
    checked = bridge.check_card(found, system)
    if not checked["ok"]:
        bad.extend({"field": f"--machine {e['field']}", "message": e["message"]}
                   for e in checked["errors"])
        return None
    return checked["machine"]


def _print_answer(answer: dict, tool_outputs: dict) -> None:
    for key, shown in answer["text"].items():
        print(f"{tool_outputs.get(key, key):<42} {shown}")
    if answer["verdicts"]:
        print()
    for v in answer["verdicts"]:
        print(f"{LEVEL_MARK[v['level']]} {v['message']}  ({v['basis']})")
    for note in answer["notes"]:
        print(f"note: {note}")
    for notice in answer.get("notices", []):
        print(f"check: {notice['message']}")
    if answer.get("from_card"):
        print("from the machine card: " + ", ".join(answer["from_card"]))
    if answer["sources"]:
        print("sources: " + "; ".join(answer["sources"]))


def _arguments(argv: list[str]) -> argparse.Namespace:
    parser = _parser()
    # Options may come between key=value pairs: argparse leaves the later pairs over.
    args, extra = parser.parse_known_args(argv)
    stray = [x for x in extra if x.startswith("-") or args.command != "run"]
    if stray:
        parser.error(f"unrecognized arguments: {' '.join(stray)[:80]}")
    if extra:
        args.pairs = args.pairs + extra
    return args


def main(argv: list[str] | None = None) -> int:
    argv = sys.argv[1:] if argv is None else list(argv)
    try:
        args = _arguments(argv)
    except ArgumentsRefused as err:
        if "--json" in argv:
            print(json.dumps({"ok": False, "errors": [{"field": "command line",
                                                       "message": str(err)}]}, indent=2))
        else:
            _parser().print_usage(sys.stderr)
            print(f"python -m calc: error: {err}", file=sys.stderr)
        return 2
    if args.command == "tools":
        if args.json:
            print(json.dumps(bridge.catalogue(args.units), indent=2, ensure_ascii=False))
        else:
            _print_catalogue(args.units)
        return 0
    inputs, bad = {}, []
    for pair in args.pairs:
        key, sep, value = pair.partition("=")
        key = key.strip()
        if not sep or not key:
            bad.append({"field": pair[:40], "message": "arguments are key=value"})
        elif key in inputs:
            bad.append({"field": key, "message": "is given twice: give it once"})
        inputs[key] = value
    machine = _machine(args.machine, args.units, bad) if args.command == "run" else None
    if bad:
        answer = {"tool": args.tool, "ok": False, "errors": bad}
    elif machine is not None:
        answer = bridge.run_for_machine(args.tool, inputs, args.units, machine, args.example)
    else:
        answer = bridge.run(args.tool, inputs, args.units, args.example)
    if args.json:
        print(json.dumps(answer, indent=2, ensure_ascii=False))
    elif answer["ok"]:
        labels = {o["key"]: o["label"] for t in bridge.catalogue(args.units)
                  if t["id"] == args.tool for o in t["outputs"]}
        _print_answer(answer, labels)
    else:
        for err in answer["errors"]:
            where = f"{err['field']}: " if err["field"] else ""
            print(f"error: {where}{err['message']}", file=sys.stderr)
        if any(err["message"].endswith(" is needed") for err in answer["errors"]):
            print("(give each as key=value, or add --example to use the tool's examples)",
                  file=sys.stderr)
    if answer.get("bug") and not args.json:
        print("bug report (please pass it on):\n" + answer["bug"]["traceback"], file=sys.stderr)
    if not answer["ok"]:
        return 2
    if args.svg:
        charts = answer.get("charts") or {}
        if not charts:
            print(f"error: {args.tool} draws no chart", file=sys.stderr)
            return 2
        with open(args.svg, "w", encoding="utf-8") as handle:
            handle.write(next(iter(charts.values())))
    return 0


if __name__ == "__main__":
    sys.exit(main())
