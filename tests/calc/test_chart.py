"""SVG charts: well-formed, accessible, CSP-safe, and showing what they claim."""

import math
import xml.etree.ElementTree as ET

import pytest

from calc import bridge
from calc.kernel import chart

SVG = "{http://www.w3.org/2000/svg}"


def _parse(svg):
    return ET.fromstring(svg)


def _classes(root):
    return [c for el in root.iter() for c in el.get("class", "").split()]


def _assert_csp_safe(root):
    for el in root.iter():
        assert el.tag not in (SVG + "style", SVG + "script")
        assert "style" not in el.attrib
        assert not any(k.startswith("on") for k in el.attrib)


def test_viscosity_chart_has_line_band_and_point():
    answer = bridge.run("viscosity-at-temperature", {"kv40": 46, "kv100": 6.8, "temp": 60}, examples=True)
    root = _parse(answer["charts"]["viscosity"])
    assert root.tag == SVG + "svg"
    assert root.get("role") == "img" and root.get("viewBox")
    assert root.get("width") is None  # scales to the phone's width
    assert root[0].tag == SVG + "title" and "20.6 cSt" in root[0].text
    classes = _classes(root)
    for needed in ("oil-line", "band-optimum", "operating-point", "limit-start", "limit-min"):
        assert needed in classes
    _assert_csp_safe(root)


def test_limits_differ_by_dash_pattern_not_only_colour():
    answer = bridge.run("viscosity-at-temperature", {}, examples=True)
    root = _parse(answer["charts"]["viscosity"])
    dashes = {el.get("class"): el.get("stroke-dasharray") for el in root.iter()
              if el.get("class", "").startswith("limit ")}
    assert len(set(dashes.values())) == 2 and None not in dashes.values()


def test_point_sits_on_the_line():
    # The operating point is drawn at the oil's viscosity at that temperature, so it lies on
    # the polyline: some segment of the line passes within a pixel of the marker's centre.
    answer = bridge.run("viscosity-at-temperature", {"temp": 35}, examples=True)
    root = _parse(answer["charts"]["viscosity"])
    line = next(el for el in root.iter() if el.get("class") == "oil-line")
    pts = [tuple(map(float, p.split(","))) for p in line.get("points").split()]
    ring = next(el for el in root.iter() if el.get("class") == "operating-point")[0]
    cx, cy = float(ring.get("cx")), float(ring.get("cy"))

    def dist(p, q):
        (x1, y1), (x2, y2) = p, q
        t = max(0.0, min(1.0, ((cx - x1) * (x2 - x1) + (cy - y1) * (y2 - y1))
                         / ((x2 - x1) ** 2 + (y2 - y1) ** 2)))
        return ((x1 + t * (x2 - x1) - cx) ** 2 + (y1 + t * (y2 - y1) - cy) ** 2) ** 0.5
    assert min(dist(p, q) for p, q in zip(pts, pts[1:])) < 1.0


@pytest.mark.parametrize("inputs", [
    {"temp": -60}, {"temp": 250}, {"kv40": 3200, "kv100": 100, "temp": -30},
    {"oil_from": "grade", "grade": "VG 10", "vi": 160, "temp": 90, "pump": "piston"},
    {"visc_start": 2000, "visc_opt_high": 80, "visc_opt_low": 20, "visc_min": 12},
])
def test_chart_is_well_formed_at_the_edges(inputs):
    answer = bridge.run("viscosity-at-temperature", inputs, examples=True)
    assert answer["ok"], answer
    root = _parse(answer["charts"]["viscosity"])
    _assert_csp_safe(root)
    for el in root.iter():
        for name in ("x", "y", "cx", "cy", "width", "height"):
            if el.get(name) is not None:
                float(el.get(name))  # a number, never "nan" or "inf"
                assert "nan" not in el.get(name) and "inf" not in el.get(name)


def test_helpers_refuse_style_and_escape_text():
    with pytest.raises(ValueError):
        chart.element("rect", style="fill:red")
    root = _parse(chart.document(100, 50, "a < b & c", "d", [chart.text(1, 2, "<x>")]))
    assert root[0].text == "a < b & c"


# Each tool that draws a chart: (tool id, chart name, axis carrying temperature, the axis's
# scale in degC). The D341 abscissa is log10 of absolute temperature (ASTM D341), the others
# are linear in temperature. Defaults must draw a chart, as the registry tests ask of them.
KELVIN = 273.15  # 0 degC in K, exact (SI definition)
TEMPERATURE_CHARTS = [
    ("viscosity-at-temperature", "viscosity", "x", lambda c: math.log10(c + KELVIN)),
    ("water-in-oil", "saturation", "x", lambda c: c),
    ("tank-heat", "warmup", "y", lambda c: c),
    ("oxidation-life", "life", "x", lambda c: c),
]


def _temperature_ticks(root, axis):
    """(label value, coordinate) of the ticks on the axis that carries temperature."""
    anchor = "middle" if axis == "x" else "end"
    return [(float(el.text), float(el.get(axis)))
            for el in root.iter(SVG + "text")
            if "tick" in el.get("class", "").split() and el.get("text-anchor") == anchor]


def _labels(root):
    return " ".join(el.text or "" for el in root.iter() if el.tag in (
        SVG + "text", SVG + "title", SVG + "desc"))


@pytest.mark.parametrize("tool_id, name, axis, scale", TEMPERATURE_CHARTS)
def test_chart_follows_the_unit_system(tool_id, name, axis, scale):
    from calc.kernel import registry
    result = registry.get(tool_id).run({}, "metric", examples=True)
    draw = result.charts[name]
    assert callable(draw)
    metric, us = _parse(draw("metric")), _parse(draw("us"))
    for root in (metric, us):
        _assert_csp_safe(root)
        assert root.get("role") == "img" and root[0].tag == SVG + "title"
    assert "°C" in _labels(metric) and "°F" not in _labels(metric)
    assert "°F" in _labels(us) and "°C" not in _labels(us)
    # Only the labels change: every drawn line is the same in both systems.
    lines = lambda root: [el.get("points") for el in root.iter(SVG + "polyline")  # noqa: E731
                          if "grid" not in el.get("class", "")]
    assert lines(metric) == lines(us)
    # The metric ticks give the axis mapping, coordinate = p + q * scale(degC); a degF tick
    # must sit where its degC equivalent does, (F - 32) * 5/9 (NIST SP 811, B.9).
    (c0, x0), (c1, x1) = _temperature_ticks(metric, axis)[0], _temperature_ticks(metric, axis)[-1]
    q = (x1 - x0) / (scale(c1) - scale(c0))
    us_ticks = _temperature_ticks(us, axis)
    assert len(us_ticks) >= 3
    for f, x in us_ticks:
        assert f % 5 == 0  # round in degF
        assert x == pytest.approx(x0 + q * (scale((f - 32.0) * 5.0 / 9.0) - scale(c0)), abs=0.2)
    # The bridge draws the reader's system.
    answer = bridge.run(tool_id, {}, "us", examples=True)
    assert answer["charts"][name] == draw("us")
    assert bridge.run(tool_id, {}, "metric", examples=True)["charts"][name] == draw("metric")


def test_us_viscosity_chart_says_fahrenheit_and_keeps_centistokes():
    # 60 degC = 140 degF (NIST SP 811, B.9); viscosity stays in cSt in both systems (calc.units).
    root = _parse(bridge.run("viscosity-at-temperature", {"temp": 140}, "us", examples=True)["charts"]["viscosity"])
    point = next(el for el in root.iter(SVG + "text") if el.get("class") == "point-label")
    assert point.text == "140.0 °F: 20.6 cSt"
    axis_labels = [el.text for el in root.iter(SVG + "text") if el.get("class") == "axis-label"]
    assert axis_labels == ["Oil temperature, °F", "Viscosity, cSt (ASTM D341 scale)"]


def test_cli_writes_the_us_chart(tmp_path, capsys):
    from calc.__main__ import main
    out = tmp_path / "x.svg"
    assert main(["run", "viscosity-at-temperature", "--units", "us", "--svg", str(out), "--example"]) == 0
    capsys.readouterr()
    root = _parse(out.read_text(encoding="utf-8"))
    assert "°F" in _labels(root) and "°C" not in _labels(root)
