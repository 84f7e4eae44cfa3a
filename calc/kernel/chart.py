"""Small SVG chart helpers: axes with any monotonic scale (log, log-log), lines, bands, marks.

The SVG they make scales to its container (viewBox, no fixed pixel size), carries
its text alternative (role="img", <title>, <desc>) and uses presentation attributes
and class names only: no style attribute, no <style>, no script, so a strict
Content-Security-Policy shows it as it is. Lines differ by dash pattern as well as
colour, so a black-and-white print still tells them apart.

>>> ax = Axes((1.0, 100.0), (1.0, 100.0), (50, 10, 300, 200), x_scale=math.log10)
>>> round(ax.x(10.0), 1), round(ax.y(50.5), 1)
(200.0, 110.0)
"""

from __future__ import annotations

import math
from dataclasses import dataclass
from datetime import datetime
from typing import Callable, Iterable, Sequence

from . import units

FONT = "sans-serif"
TEXT_SIZE = 14  # in viewBox units; a 400-unit-wide chart on a 360 px phone shows about 13 px


def identity(v: float) -> float:
    return v


def log_log(v: float) -> float:
    """log10(log10(v)) for v > 1: the ordinate of a Walther-type chart."""
    return math.log10(math.log10(v))


@dataclass(frozen=True)
class Axes:
    """Maps data (x, y) to viewBox coordinates inside `box` = (left, top, width, height).

    `x_scale` and `y_scale` are increasing functions applied before the linear
    mapping (math.log10 for a log axis, `log_log` for a Walther ordinate).
    """

    x_range: tuple[float, float]
    y_range: tuple[float, float]
    box: tuple[float, float, float, float]
    x_scale: Callable[[float], float] = identity
    y_scale: Callable[[float], float] = identity

    def x(self, v: float) -> float:
        left, _, width, _ = self.box
        lo, hi = (self.x_scale(r) for r in self.x_range)
        return left + width * (self.x_scale(v) - lo) / (hi - lo)

    def y(self, v: float) -> float:
        _, top, _, height = self.box
        lo, hi = (self.y_scale(r) for r in self.y_range)
        return top + height * (1.0 - (self.y_scale(v) - lo) / (hi - lo))

    def point(self, xv: float, yv: float) -> tuple[float, float]:
        return self.x(xv), self.y(yv)

    def inside(self, xv: float, yv: float) -> bool:
        (x0, x1), (y0, y1) = self.x_range, self.y_range
        return x0 <= xv <= x1 and y0 <= yv <= y1


def _num(v: float) -> str:
    return f"{v:.1f}".rstrip("0").rstrip(".")


def escape(text: str) -> str:
    """Text made safe for SVG content and attribute values.

    >>> escape('a < b & "c"'), escape("12.5")
    ('a &lt; b &amp; &quot;c&quot;', '12.5')
    """
    # Most of a chart's texts are numbers: four substring tests are cheaper than four copies.
    if "&" not in text and "<" not in text and ">" not in text and '"' not in text:
        return text
    return (text.replace("&", "&amp;").replace("<", "&lt;").replace(">", "&gt;")
            .replace('"', "&quot;"))


_ATTR_NAMES: dict[str, str] = {}


def _attrs(attrs: dict) -> str:
    names = _ATTR_NAMES
    return "".join(f' {names.get(k) or names.setdefault(k, k.replace("_", "-"))}="{escape(str(v))}"'
                   for k, v in attrs.items() if v is not None)


def element(tag: str, content: str = "", **attrs) -> str:
    """One SVG element; attribute names with '_' become '-' (stroke_width -> stroke-width)."""
    if "style" in attrs:
        raise ValueError("no style attributes: use presentation attributes and classes")
    if content:
        return f"<{tag}{_attrs(attrs)}>{content}</{tag}>"
    return f"<{tag}{_attrs(attrs)}/>"


def polyline(points: Iterable[tuple[float, float]], cls: str, stroke: str = "#000",
             width: float = 3.0, dash: str | None = None) -> str:
    """An open line through viewBox points."""
    pts = " ".join(f"{_num(px)},{_num(py)}" for px, py in points)
    return element("polyline", points=pts, fill="none", stroke=stroke, stroke_width=_num(width),
                   stroke_dasharray=dash, stroke_linejoin="round", stroke_linecap="round",
                   **{"class": cls})


def hline(axes: Axes, yv: float, cls: str, stroke: str = "#000", width: float = 2.0,
          dash: str | None = None) -> str:
    """A horizontal line across the plot at data value `yv`."""
    left, _, w, _ = axes.box
    y = axes.y(yv)
    return polyline(((left, y), (left + w, y)), cls, stroke, width, dash)


def hband(axes: Axes, y_low: float, y_high: float, cls: str, fill: str = "#ddd") -> str:
    """A shaded horizontal band between data values `y_low` and `y_high`."""
    left, _, w, _ = axes.box
    top, bottom = axes.y(y_high), axes.y(y_low)
    return element("rect", x=_num(left), y=_num(top), width=_num(w), height=_num(bottom - top),
                   fill=fill, **{"class": cls})


def text(x: float, y: float, content: str, cls: str = "label", size: float = TEXT_SIZE,
         anchor: str = "start", weight: str | None = None, fill: str = "#000") -> str:
    return element("text", escape(content), x=_num(x), y=_num(y), font_size=_num(size),
                   font_family=FONT, text_anchor=anchor, font_weight=weight, fill=fill,
                   **{"class": cls})


def marker(x: float, y: float, cls: str, radius: float = 7.0) -> str:
    """A point mark readable without colour: white disc, thick black ring, black centre."""
    ring = element("circle", cx=_num(x), cy=_num(y), r=_num(radius), fill="#fff", stroke="#000",
                   stroke_width="3")
    dot = element("circle", cx=_num(x), cy=_num(y), r=_num(radius / 3), fill="#000")
    return element("g", ring + dot, **{"class": cls})


def short(v: float) -> str:
    """A value to 3 significant figures in few characters, for tick and point labels.

    >>> short(20.589), short(700.0), short(2000.0), short(12000.0), short(7.73e6), short(0.5)
    ('20.6', '700', '2000', '12k', '7.73M', '0.5')
    """
    def sig3(x: float) -> str:
        return f"{float(f'{x:.3g}'):g}"
    for limit, divisor, suffix in ((1e9, 1e9, "G"), (1e6, 1e6, "M"), (1e4, 1e3, "k")):
        if abs(v) >= limit:
            return sig3(v / divisor) + suffix
    return sig3(v)


def ticks_125(lo: float, hi: float) -> list[float]:
    """1-2-5 series values inside [lo, hi] (for a log or log-log axis).

    >>> ticks_125(6.0, 300.0)
    [10.0, 20.0, 50.0, 100.0, 200.0]
    """
    out = []
    decade = 10.0 ** math.floor(math.log10(lo))
    while decade <= hi:
        for m in (1.0, 2.0, 5.0):
            v = m * decade
            if lo <= v <= hi:
                out.append(round(v, 12))
        decade *= 10.0
    return out


def ticks_linear(lo: float, hi: float, most: int = 8) -> list[float]:
    """Round values inside [lo, hi], at most `most` of them, on a 1-2-2.5-5 step.

    >>> ticks_linear(-12.0, 95.0)
    [0.0, 20.0, 40.0, 60.0, 80.0]
    """
    span = hi - lo
    for step in (m * 10.0 ** e for e in range(-2, 6) for m in (1.0, 2.0, 2.5, 5.0)):
        if span / step <= most:
            break
    first = math.ceil(lo / step) * step
    return [round(first + k * step, 9) for k in range(int((hi - first) / step + 1e-9) + 1)]


def unit_ticks(lo: float, hi: float, quantity: str, system: str,
               most: int = 8) -> list[tuple[float, str]]:
    """Ticks at round numbers in the unit shown in `system`, for an axis drawn in metric.

    `lo`, `hi` are the axis range in calc's metric unit; each tick is (metric value, label),
    so the axis mapping stays metric and only the labels change. 50 degF sits at 10 degC:

    >>> [(round(c, 2), label) for c, label in unit_ticks(0.0, 100.0, "temperature", "us", 5)]
    [(10.0, '50'), (37.78, '100'), (65.56, '150'), (93.33, '200')]
    >>> unit_ticks(-12.0, 95.0, "temperature", "metric")[:2]
    [(0.0, '0'), (20.0, '20')]
    """
    shown_lo, shown_hi = sorted(units.from_metric(v, quantity, system) for v in (lo, hi))
    return [(units.to_metric(v, quantity, system), short(v))
            for v in ticks_linear(shown_lo, shown_hi, most)]


Ticks = Sequence[float] | Sequence[tuple[float, str]]


def _labelled(ticks: Ticks, fmt: Callable[[float], str]) -> list[tuple[float, str]]:
    return [t if isinstance(t, tuple) else (t, fmt(t)) for t in ticks]


def frame(axes: Axes, x_ticks: Ticks, y_ticks: Ticks, x_label: str,
          y_label: str, fmt: Callable[[float], str] = lambda v: f"{v:g}") -> str:
    """Plot border, grid lines at the ticks, tick labels and the two axis labels.

    A tick is a data value (labelled with `fmt`) or a (data value, label) pair, as
    `unit_ticks` gives for an axis shown in another unit than it is drawn in.
    """
    left, top, w, h = axes.box
    parts = [element("rect", x=_num(left), y=_num(top), width=_num(w), height=_num(h),
                     fill="none", stroke="#000", stroke_width="1.5", **{"class": "frame"})]
    for xv, label in _labelled(x_ticks, fmt):
        x = axes.x(xv)
        parts.append(polyline(((x, top), (x, top + h)), "grid", "#999", 0.8))
        parts.append(text(x, top + h + TEXT_SIZE + 4, label, "tick", anchor="middle"))
    last_y = math.inf
    for yv, label in _labelled(y_ticks, fmt):
        y = axes.y(yv)
        if abs(last_y - y) < TEXT_SIZE + 2:
            continue  # labels would overlap where a log-log scale crowds them
        last_y = y
        parts.append(polyline(((left, y), (left + w, y)), "grid", "#999", 0.8))
        parts.append(text(left - 5, y + TEXT_SIZE / 3, label, "tick", anchor="end"))
    parts.append(text(left + w / 2, top + h + 2 * TEXT_SIZE + 10, x_label, "axis-label",
                      anchor="middle"))
    parts.append(text(left, top - 10, y_label, "axis-label", anchor="start"))
    return element("g", "".join(parts), **{"class": "axes"})


def document(width: float, height: float, title: str, desc: str, body: Iterable[str],
             cls: str = "chart") -> str:
    """The whole SVG: scalable viewBox, role="img" with <title> and <desc> first."""
    inner = element("title", escape(title)) + element("desc", escape(desc)) + "".join(body)
    return element("svg", inner, xmlns="http://www.w3.org/2000/svg",
                   viewBox=f"0 0 {_num(width)} {_num(height)}", role="img",
                   aria_label=title, font_family=FONT, **{"class": cls})


TREND_W, TREND_H = 400.0, 240.0
_TREND_BOX = (58.0, 34.0, 300.0, 150.0)  # left, top, width, height; dates fit under both ends
_DAY_S = 86400.0
# A trend marks each reading up to this many; past it, only the newest few (the line shows
# the rest): a machine with a thousand readings draws one line, not a thousand dots.
TREND_MARKS_MAX = 24


# A trend's line holds at most this many slices of time; a slice with more readings draws
# its lowest and highest (in time order), so no peak is lost at the chart's width.
TREND_SLICES = 160


def _thinned(points: list[tuple[float, float]]) -> list[tuple[float, float]]:
    """`points` (time, value), oldest first, cut to the lowest and highest of each of
    TREND_SLICES slices of time when there are more points than that.

    >>> pts = [(float(t), float(t % 7)) for t in range(1000)]
    >>> thin = _thinned(pts)
    >>> len(thin) <= 2 * TREND_SLICES and max(v for _, v in thin) == 6.0 and thin[0] == pts[0]
    True
    """
    if len(points) <= 2 * TREND_SLICES:
        return points
    t0, t1 = points[0][0], points[-1][0]
    width = (t1 - t0) / TREND_SLICES or 1.0
    slices: dict[int, list[tuple[float, float]]] = {}
    for point in points:
        slices.setdefault(min(int((point[0] - t0) / width), TREND_SLICES - 1), []).append(point)
    kept = []
    for _key, found in sorted(slices.items()):
        lowest, highest = min(found, key=lambda p: p[1]), max(found, key=lambda p: p[1])
        kept += sorted({lowest, highest}, key=lambda p: p[0])
    return kept


def _date_ticks(t0: float, t1: float, tz, most: int = 4) -> list[tuple[float, str]]:
    """Up to `most` evenly spaced dates between two times [s since the epoch] in zone `tz`."""
    day = lambda t: datetime.fromtimestamp(t, tz).date().isoformat()  # noqa: E731
    if t1 - t0 < _DAY_S:
        return [(t0, day(t0))]
    return [(t, day(t)) for t in (t0 + (t1 - t0) * k / (most - 1) for k in range(most))]


def trend(points: Sequence[tuple[datetime, float]], quantity: str, system: str, title: str,
          limits: Sequence[tuple[float, str, str]] = ()) -> str:
    """SVG of a quantity over time: dated axis across, the quantity up in `system` units.

    `points` are (time with its offset, metric value), oldest first; `limits` are
    (metric value, level, label) lines such as a watch and an act limit.

    >>> from datetime import timezone
    >>> t = [datetime(2026, m, 1, tzinfo=timezone.utc) for m in (1, 2)]
    >>> svg = trend(list(zip(t, (46.0, 49.0))), "kinematic_viscosity", "metric", "KV40")
    >>> svg.startswith("<svg") and "2026-01-01" in svg and "<polyline" in svg
    True
    """
    times = [p[0].timestamp() for p in points]
    values = [p[1] for p in points]
    t0, t1 = min(times), max(times)
    if t1 == t0:
        t0, t1 = t0 - _DAY_S, t1 + _DAY_S
    low = min(values + [v for v, _, _ in limits])
    high = max(values + [v for v, _, _ in limits])
    pad = (high - low) * 0.15 or abs(high) * 0.1 or 1.0
    ax = Axes((t0, t1), (low - pad, high + pad), _TREND_BOX)
    unit = units.unit_label(quantity, system)
    body = [frame(ax, _date_ticks(t0, t1, points[-1][0].tzinfo), unit_ticks(low - pad, high + pad, quantity, system, 5),
                  "Date", f"{title}{', ' + unit if unit else ''}", short)]
    for value, level, label in limits:
        body.append(hline(ax, value, f"limit limit-{level}", "#8b1a1a",
                          2.5 if level == "act" else 1.5, "12 5" if level == "act" else "4 4"))
        body.append(text(_TREND_BOX[0] + _TREND_BOX[2] - 4, ax.y(value) - 5, label,
                         "limit-label", anchor="end"))
    drawn = list(zip(times, values))
    line = [ax.point(t, v) for t, v in _thinned(drawn)]
    body.append(polyline(line, "trend-line", "#12357a", 3.0))
    body += [marker(*ax.point(t, v), "trend-point", radius=5.0)
             for t, v in drawn[-TREND_MARKS_MAX:]]
    shown = ", ".join(f"{p[0].date().isoformat()}: {units.show(p[1], quantity, system)}"
                      for p in points[-6:])
    desc = f"{len(points)} readings, oldest first; the latest: {shown}."
    return document(TREND_W, TREND_H, f"Trend of {title}", desc, body, "chart chart-trend")
