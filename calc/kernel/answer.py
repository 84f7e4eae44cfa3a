"""A tool's metric answer as the reader sees it: values in their units, text, verdicts.

The one place an answer is made readable, for the bridge (a fresh answer) and for the
machine records (a stored reading answered again).
"""

from __future__ import annotations

from . import units
from .registry import Tool, get
from .result import Result


def present(found: Tool, result: Result, system: str) -> dict:
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
        "notices": [{"field": key, "message": n.render(show)} for key, n in result.notices],
        "sources": list(result.sources),
        "charts": {name: draw(system) for name, draw in result.charts.items()},
        "related": [{"tool": other, "title": get(other).title, "why": why}
                    for other, why in found.related],
        "ranked": [{"key": c.key, "title": c.title, "score": c.score, "word": c.word,
                    "reasons": [r.render(show) for r in c.reasons]} for c in result.ranked],
    }
