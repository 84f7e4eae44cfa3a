"""A machine's condition: the latest value of each followed quantity with its verdict, its
trend against the watch and act limits, and what is due next.

Every followed quantity (`registry.TRACKED`) has one rule here that gives its limits for
a machine, from the machine card's facts and the same limits and band tables the tools
grade with, so the machine page and the tools never disagree. A rule returns None where
the card does not say enough (the acid number needs the new oil's; the cleanliness code a
target): the value is then shown without a verdict, and the page says what is missing.

Readings reach this module as records (calc.machines.records): each carries the metric
value of every followed quantity it measured (``"tracked"``), so a page with a thousand
readings draws its trends without running a tool again.

>>> facts = {"kv40_new": 46.0, "an_new": 0.4}
>>> limits_of("acid_number", facts).high
(0.7, 0.9)
>>> judge("water_ppm", 350.0, {}).level
'watch'
"""

from __future__ import annotations

import hashlib
import json
import math
from dataclasses import dataclass
from datetime import date, datetime, timedelta

from .. import __version__
from ..kernel import chart, registry, units
from ..kernel.result import COMMON_PRACTICE, FROM_MEMORY, LEVELS, Q, Text, Verdict, text
from ..methods.viscosity import walther_fit, walther_temperature
from ..tools.condition import SATURATION_BANDS
from ..tools.cleanliness import CLEANLINESS_BANDS
from ..tools.foam import IN_SERVICE_AIR_RELEASE_FACTOR, IN_SERVICE_BASIS
from ..tools.foam import grade_limits as foam_grade_limits
from ..tools.heat import FAST_AGEING_C, HOT_OIL_ACT_C


# A due date this close counts as soon (common practice for planning a round: a week).
SOON_DAYS = 7
# After a watch or act result, sample again at half the usual interval (common practice).
RESAMPLE_SHARE = 0.5
# The quantities only a lab sample of the oil gives: a thermometer or an inline water
# sensor reading is not a sample (water content may be either, so it does not count).
SAMPLE_QUANTITIES = ("kv40", "kv40_change", "iso4406_4", "iso4406_6", "iso4406_14",
                     "acid_number", "acid_rise", "oxidation_reserve", "air_release")


@dataclass(frozen=True)
class Limits:
    """Where a quantity turns watch and act: ``high`` (watch, act) for a value that is bad
    when high, ``low`` (watch, act) for one bad when low; ``reaching`` when reaching the
    limit counts (``at_least``), else only passing it does (``over``)."""

    high: tuple[float, float] | None = None
    low: tuple[float, float] | None = None
    reaching: bool = True
    basis: str = COMMON_PRACTICE

    def level(self, value: float) -> str:
        return self.crossed(value)[0]

    def crossed(self, value: float) -> tuple[str, float | None, str]:
        """(level, the limit crossed, "above" or "below"): ("ok", None, "") inside the
        watch limits."""
        past = (lambda v, limit: v >= limit) if self.reaching else (lambda v, limit: v > limit)
        under = (lambda v, limit: v <= limit) if self.reaching else (lambda v, limit: v < limit)
        for index, level in ((1, "act"), (0, "watch")):
            if self.high is not None and past(value, self.high[index]):
                return level, self.high[index], "above"
            if self.low is not None and under(value, self.low[index]):
                return level, self.low[index], "below"
        return "ok", None, ""

    def lines(self) -> list[tuple[float, str]]:
        """(metric value, level) of every limit line, watch before act."""
        return [(pair[index], level) for pair in (self.high, self.low) if pair is not None
                for index, level in ((0, "watch"), (1, "act"))]


_LIMITS: dict[tuple[str, str], float] = {}


def _limit(tool_id: str, key: str) -> float:
    """A limit input's default: the tools' own limits are the machine page's."""
    if (tool_id, key) not in _LIMITS:
        _LIMITS[tool_id, key] = registry.get(tool_id).field(key).default
    return _LIMITS[tool_id, key]


def _band_bound(bands, level: str) -> float:
    return next(b.at_least for b in bands if b.level == level)


def _oil_temp(facts: dict) -> Limits:
    """Hot oil against the ageing and hot-oil lines, tightened by the pump's viscosity
    limits on this oil's D341 line when the card gives them; too cold against the pump's
    start-up and optimum limits."""
    watch, act = FAST_AGEING_C, HOT_OIL_ACT_C
    low = None
    basis = FROM_MEMORY
    line = _viscosity_line(facts)
    if line is not None:
        at = lambda kv: walther_temperature(kv, *line)  # noqa: E731
        if facts.get("visc_opt_low") is not None:
            watch = min(watch, at(facts["visc_opt_low"]))
        if facts.get("visc_min") is not None:
            act = min(act, at(facts["visc_min"]))
        act = max(act, watch)
        if facts.get("visc_opt_high") is not None and facts.get("visc_start") is not None:
            low = (at(facts["visc_opt_high"]), at(facts["visc_start"]))
        basis = "the pump maker's viscosity limits on the oil's ASTM D341 line; " + FROM_MEMORY
    return Limits(high=(watch, act), low=low, reaching=False, basis=basis)


def _viscosity_line(facts: dict) -> tuple[float, float] | None:
    kv40, kv100 = facts.get("kv40_new"), facts.get("kv100_new")
    if kv40 is None or kv100 is None or not kv100 < kv40:
        return None
    return walther_fit(40.0, kv40, 100.0, kv100)


def _kv40(facts: dict) -> Limits | None:
    new = facts.get("kv40_new")
    if new is None:
        return None
    watch, act = (_limit("oil-condition", k) / 100.0 for k in ("visc_watch", "visc_act"))
    return Limits(high=(new * (1 + watch), new * (1 + act)),
                  low=(new * (1 - watch), new * (1 - act)))


def _kv40_change(_facts: dict) -> Limits:
    watch, act = (_limit("oil-condition", k) for k in ("visc_watch", "visc_act"))
    return Limits(high=(watch, act), low=(-watch, -act))


def _water_ppm(_facts: dict) -> Limits:
    return Limits(high=(_limit("oil-condition", "water_watch"),
                        _limit("oil-condition", "water_act")))


def _water_saturation(_facts: dict) -> Limits:
    return Limits(high=(_band_bound(SATURATION_BANDS, "watch"),
                        _band_bound(SATURATION_BANDS, "act")))


def _cleanliness(size: str):
    def rule(facts: dict) -> Limits | None:
        target = facts.get("target" + size)
        if target is None:
            return None
        return Limits(high=(target + _band_bound(CLEANLINESS_BANDS, "watch"),
                            target + _band_bound(CLEANLINESS_BANDS, "act")))
    return rule


def _acid_number(facts: dict) -> Limits | None:
    new = facts.get("an_new")
    if new is None:
        return None
    rise = _acid_rise(facts).high
    return Limits(high=(round(new + rise[0], 6), round(new + rise[1], 6)), basis=FROM_MEMORY)


def _acid_rise(_facts: dict) -> Limits:
    return Limits(high=(_limit("oil-condition", "an_watch"), _limit("oil-condition", "an_act")),
                  basis=FROM_MEMORY)


def _reserve(_facts: dict) -> Limits:
    return Limits(low=(_limit("oil-condition", "reserve_watch"),
                       _limit("oil-condition", "reserve_act")), basis=FROM_MEMORY)


def _air_release(facts: dict) -> Limits | None:
    grade = facts.get("grade")
    try:
        new = foam_grade_limits(grade).air_release_min
    except Exception:  # noqa: BLE001 - no preset for this grade (or none given): no limits
        return None
    return Limits(high=(new, IN_SERVICE_AIR_RELEASE_FACTOR * new), reaching=False,
                  basis=IN_SERVICE_BASIS)


RULES = {
    "oil_temp": _oil_temp,
    "kv40": _kv40,
    "kv40_change": _kv40_change,
    "water_ppm": _water_ppm,
    "water_saturation": _water_saturation,
    "iso4406_4": _cleanliness("4"),
    "iso4406_6": _cleanliness("6"),
    "iso4406_14": _cleanliness("14"),
    "acid_number": _acid_number,
    "acid_rise": _acid_rise,
    "oxidation_reserve": _reserve,
    "air_release": _air_release,
}
# What a rule that gives no limits is waiting for, said on the machine page.
NEEDS = {
    "kv40": "the new oil's KV40 (or its grade) on the card",
    "iso4406_4": "a cleanliness target (or the component) on the card",
    "iso4406_6": "a cleanliness target (or the component) on the card",
    "iso4406_14": "a cleanliness target (or the component) on the card",
    "acid_number": "the new oil's acid number on the card",
    "air_release": "the oil's ISO VG grade on the card",
}


def limits_of(tracks: str, facts: dict) -> Limits | None:
    return RULES[tracks](facts)


_SAYS = {
    "act above": "{what} {value}: above the act limit {limit}.",
    "act below": "{what} {value}: below the act limit {limit}.",
    "watch above": "{what} {value}: above the watch limit {limit}.",
    "act at": "{what} {value}: at the act limit {limit}.",
    "watch at": "{what} {value}: at the watch limit {limit}.",
    "watch below": "{what} {value}: below the watch limit {limit}.",
    "ok": "{what} {value}: within the watch limit {limit}.",
    "ok-band": "{what} {value}: within the watch limits {low} and {limit}.",
    "none": "{what} {value}: no limits without {needs}.",
}


def judge(tracks: str, value: float, facts: dict) -> Verdict | None:
    """The verdict of one value of a followed quantity for this machine, or None when the
    card does not give its limits."""
    tracked = registry.TRACKED[tracks]
    limits = limits_of(tracks, facts)
    if limits is None:
        return None
    level, crossed, side = limits.crossed(value)
    side = "at" if crossed == value else side
    q = tracked.quantity
    named = {"what": Q(tracked.label, "text"), "value": Q(value, q)}
    if level == "ok":
        if limits.high is not None and limits.low is not None:
            return Verdict("ok", text(_SAYS["ok-band"], **named, low=Q(limits.low[0], q),
                                      limit=Q(limits.high[0], q)), limits.basis)
        pair = limits.high or limits.low
        return Verdict("ok", text(_SAYS["ok"], **named, limit=Q(pair[0], q)), limits.basis)
    return Verdict(level, text(_SAYS[f"{level} {side}"], **named, limit=Q(crossed, q)),
                   limits.basis)


def _missing(tracks: str, value: float) -> Text:
    tracked = registry.TRACKED[tracks]
    return text(_SAYS["none"], what=Q(tracked.label, "text"), value=Q(value, tracked.quantity),
                needs=Q(NEEDS.get(tracks, "limits"), "text"))


def when(stamp: object) -> datetime | None:
    """An ISO 8601 time with its offset, or None (a time without an offset is not kept)."""
    try:
        found = datetime.fromisoformat(str(stamp).replace("Z", "+00:00"))
    except ValueError:
        return None
    return found if found.tzinfo is not None else None


def series(readings: list[dict]) -> dict[str, list[tuple[datetime, float, dict]]]:
    """Every followed quantity's points (time, metric value, reading), oldest first."""
    found: dict[str, list[tuple[datetime, float, dict]]] = {}
    for reading in readings:
        at = when(reading.get("time"))
        tracked = reading.get("tracked")
        if at is None or not isinstance(tracked, dict):
            continue
        for key, value in tracked.items():
            if key in registry.TRACKED and _number(value):
                found.setdefault(key, []).append((at, float(value), reading))
    for points in found.values():
        points.sort(key=lambda p: p[0])
    return found


def _number(value: object) -> bool:
    return isinstance(value, (int, float)) and not isinstance(value, bool) and math.isfinite(value)


def latest(facts: dict, readings: list[dict], points: dict | None = None) -> list[dict]:
    """The newest value of each followed quantity, in TRACKED order, with its verdict
    (metric; `shown` renders it)."""
    out = []
    points = series(readings) if points is None else points
    for key in registry.TRACKED:
        if key not in points:
            continue
        at, value, reading = points[key][-1]
        found = judge(key, value, facts)
        out.append({"tracks": key, "value": value, "time": at, "reading": reading,
                    "verdict": found, "missing": None if found else _missing(key, value)})
    return out


def trends(facts: dict, readings: list[dict], system: str, title_suffix: str = "",
           points: dict | None = None) -> list[dict]:
    """A chart of each followed quantity with two or more points, against its limits,
    drawn in `system` units."""
    show = lambda v, q: units.show(v, q, system)  # noqa: E731
    drawn = []
    for key, points in (series(readings) if points is None else points).items():
        if len(points) < 2:
            continue
        tracked = registry.TRACKED[key]
        limits = limits_of(key, facts)
        lines = [] if limits is None else [
            (value, level, f"{level} {show(value, tracked.quantity)}")
            for value, level in limits.lines()]
        title = tracked.label + title_suffix
        drawn.append({"tracks": key, "title": title, "points": len(points),
                      "svg": chart.trend([(t, v) for t, v, _ in points], tracked.quantity,
                                         system, title, lines)})
    order = list(registry.TRACKED)
    return sorted(drawn, key=lambda d: order.index(d["tracks"]))


@dataclass(frozen=True)
class Due:
    key: str
    label: str
    on: date | None
    state: str  # overdue, soon, later or unknown
    says: Text


def _due(key: str, label: str, last: date | None, every: float | None, today: date,
         never: str, sooner: bool = False) -> Due | None:
    if every is None:
        return None
    if last is None:
        return Due(key, label, None, "unknown", text(never))
    step = every * (RESAMPLE_SHARE if sooner else 1.0)
    on = last + timedelta(days=round(step))
    days = (on - today).days
    state = "overdue" if days < 0 else "soon" if days <= SOON_DAYS else "later"
    why = (" (half the usual interval after a watch or act result, common practice)"
           if sooner else "")
    template = {"overdue": "{label} was due on {on}, {days} ago{why}.",
                "soon": "{label} is due on {on}, in {days}{why}.",
                "later": "{label} is due on {on}, in {days}{why}."}[state]
    return Due(key, label, on, state, text(template, label=Q(label, "text"),
                                           on=Q(on.isoformat(), "text"),
                                           days=Q(float(abs(days)), "days"),
                                           why=Q(why, "text")))


def last_sample(facts: dict, readings: list[dict]) -> tuple[datetime | None, bool]:
    """(The time of the newest oil sample, or None; whether any of its results was past a
    watch or act limit, which brings the next sample forward)."""
    samples = [(when(r.get("time")), r) for r in readings
               if any(k in SAMPLE_QUANTITIES for k in (r.get("tracked") or {}))]
    samples = [(t, r) for t, r in samples if t is not None]
    if not samples:
        return None, False
    at, reading = max(samples, key=lambda s: s[0])
    verdicts = [judge(k, float(v), facts) for k, v in reading["tracked"].items()
                if k in SAMPLE_QUANTITIES and _number(v)]
    return at, any(v is not None and v.level != "ok" for v in verdicts)


def due(facts: dict, readings: list[dict], today: date,
        sample: tuple[datetime | None, bool] | None = None) -> list[Due]:
    """The next oil sample, filter change and oil change, soonest first, from the card's
    intervals and dates (`facts`, as `card.facts` gives them) and the newest sample on
    record (`sample`, as `last_sample` gives it, when already known)."""
    at, sooner = last_sample(facts, readings) if sample is None else sample
    found = [
        _due("sample", "Oil sample", at.date() if at else None,
             facts.get("sample_days"), today, "No oil sample on record yet: take one.",
             sooner),
        _due("filter", "Filter change", _date(facts.get("filter_changed")),
             facts.get("filter_days"), today,
             "The last filter change is not on the card: add its date."),
        _due("oil", "Oil change", _date(facts.get("oil_changed")), facts.get("oil_days"), today,
             "The last oil change is not on the card: add its date."),
    ]
    found = [d for d in found if d is not None]
    return sorted(found, key=lambda d: (d.on is not None, d.on or today))


def card_key(card: dict) -> str:
    """A short fingerprint of a card: a digest's verdicts hold for the card they were
    worked out with. Numbers count by value (a card that went through JavaScript comes
    back with 2 where it had 2.0).

    >>> card_key({"name": "A", "tees": 2.0}) == card_key({"tees": 2, "name": "A"})
    True
    """
    same = {k: float(v) if isinstance(v, (int, float)) and not isinstance(v, bool) else v
            for k, v in card.items()}
    return hashlib.sha256(json.dumps(same, sort_keys=True).encode()).hexdigest()[:16]


def digest(readings: list[dict], facts: dict | None = None, card: dict | None = None,
           count: int | None = None) -> dict:
    """What the machines list needs of one machine's readings, small enough to keep beside
    the machine: ``{"count", "last", "readings"}`` where ``readings`` are the few (slim)
    readings that decide `latest` and `due` (the newest of each followed quantity and the
    newest sample), so the list never reads every reading. Given the machine's `card` and
    its `facts`, also what the list shows of them, worked out now: ``"level"`` (the worst
    latest verdict), ``"sample"`` (the newest sample's time and whether it brings the next
    forward), and the ``"calc"`` version and ``"card"`` fingerprint they hold for.

    >>> r = [{"id": str(d), "time": f"2026-01-0{d}T08:00:00Z", "tool": "t",
    ...       "tracked": {"water_ppm": 100.0 * d}} for d in (1, 2, 3)]
    >>> small = digest(r, {}, {"name": "Saw 2"})
    >>> small["count"], [x["id"] for x in small["readings"]], small["level"]
    (3, ['3'], 'watch')
    """
    dated = [(when(r.get("time")), i, r) for i, r in enumerate(readings)]
    dated = sorted((d for d in dated if d[0] is not None), key=lambda d: (d[0], d[1]))
    keep: dict[str, tuple[int, dict]] = {}
    for _at, index, reading in dated:
        tracked = reading.get("tracked") if isinstance(reading.get("tracked"), dict) else {}
        for key in tracked:
            keep[key] = (index, reading)
        if any(k in SAMPLE_QUANTITIES for k in tracked):
            keep[" sample"] = (index, reading)
    chosen = sorted({index: reading for index, reading in keep.values()}.items())
    slim = [{k: reading.get(k) for k in ("id", "tool", "time", "tracked", "machine")}
            for _index, reading in chosen]
    made = {"count": len(readings) if count is None else count,
            "last": dated[-1][2].get("time") if dated else None, "readings": slim}
    if facts is not None and card is not None:
        made.update(summary(facts, slim, card))
    return made


def summary(facts: dict, readings: list[dict], card: dict) -> dict:
    """The digest's verdict part (see `digest`)."""
    levels = [p["verdict"].level for p in latest(facts, readings) if p["verdict"]]
    at, sooner = last_sample(facts, readings)
    return {"level": max(levels, key=LEVELS.index) if levels else None,
            "sample": {"time": at.isoformat() if at else None, "sooner": sooner},
            "calc": __version__, "card": card_key(card)}


def digest_add(known: dict | None, reading: dict, facts: dict | None = None,
               card: dict | None = None) -> dict:
    """`known` (a digest) with one more reading."""
    known = known if isinstance(known, dict) else {}
    kept = [r for r in known.get("readings") or [] if isinstance(r, dict)]
    return digest(kept + [reading], facts, card, int(known.get("count") or 0) + 1)


def fresh_summary(known: dict, card: dict) -> dict | None:
    """A digest's verdict part if it still holds (same calc, same card), else None."""
    if known.get("calc") != __version__ or known.get("card") != card_key(card):
        return None
    sample = known.get("sample") if isinstance(known.get("sample"), dict) else None
    if sample is None or known.get("level") not in (None, *LEVELS):
        return None
    return {"level": known.get("level"), "sample": sample}


def _date(value: object) -> date | None:
    try:
        return date.fromisoformat(str(value)) if value else None
    except ValueError:
        return None
