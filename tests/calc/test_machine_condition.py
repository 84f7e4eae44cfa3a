"""A machine's condition: each followed quantity's limits, the latest value's verdict, the
trends against the limits, and what is due."""

import xml.etree.ElementTree as ET
from datetime import date

import pytest

from calc.kernel import registry
from calc.machines import condition
from calc.machines.condition import judge, limits_of
from calc.methods.iso3448 import grade_limits
from calc.methods.viscosity import walther_fit, walther_viscosity

SVG = "{http://www.w3.org/2000/svg}"
VG46 = {"kv40_new": 46.0, "kv100_new": 6.8, "grade": "VG 46"}


def _reading(time, tracked, tool="oil-condition", rid=None):
    return {"id": rid or time, "tool": tool, "time": time, "tracked": tracked}


def test_every_followed_quantity_has_a_rule():
    assert set(condition.RULES) == set(registry.TRACKED)
    for key in registry.TRACKED:
        if limits_of(key, {}) is None:
            assert key in condition.NEEDS, key


def test_limits_are_the_tools_own():
    # The oil-condition tool's defaults (common practice): water 200 / 500 ppm, viscosity
    # change 5 / 10 %, acid number rise 0.3 / 0.5, oxidation reserve 50 / 25 %.
    tool = registry.get("oil-condition")
    assert limits_of("water_ppm", {}).high == (tool.field("water_watch").default,
                                              tool.field("water_act").default) == (200.0, 500.0)
    assert limits_of("kv40_change", {}).high == (5.0, 10.0)
    assert limits_of("kv40_change", {}).low == (-5.0, -10.0)
    assert limits_of("acid_rise", {}).high == (0.3, 0.5)
    assert limits_of("oxidation_reserve", {}).low == (50.0, 25.0)


def test_viscosity_act_limits_are_the_grade_band():
    # 46 cSt +-10 % is VG 46's band, 41.4 to 50.6 cSt (ISO 3448 Table 1).
    limits = limits_of("kv40", VG46)
    assert (limits.low[1], limits.high[1]) == pytest.approx(grade_limits("VG 46"))
    assert judge("kv40", 50.6, VG46).level == "act"  # reaching the limit counts, as in the tool
    assert judge("kv40", 48.2, VG46).level == "ok"
    assert judge("kv40", 43.0, VG46).level == "watch"
    assert "below the watch limit" in judge("kv40", 43.0, VG46).message.template


def test_cleanliness_limits_are_one_and_two_codes_over_target():
    # One code over the target is about twice the particles (ISO 4406 scale), watch; two,
    # act: the iso-4406 tool's bands.
    facts = {"target6": 16.0}
    assert [judge("iso4406_6", code, facts).level for code in (16.0, 17.0, 18.0)] == [
        "ok", "watch", "act"]
    assert judge("iso4406_6", 17.0, {}) is None  # no target on the card: no verdict


def test_acid_number_limits_follow_the_new_oil():
    assert limits_of("acid_number", {"an_new": 0.45}).high == pytest.approx((0.75, 0.95))
    assert limits_of("acid_number", {}) is None


def test_air_release_limits_are_the_grade_preset_and_twice_it():
    # VG 46: 10 min for a new oil (ISO 11158 HM / DIN 51524-2, from memory), act past twice
    # that (the foam tool's in-service margin, common practice).
    limits = limits_of("air_release", VG46)
    assert limits.high == (10.0, 20.0) and not limits.reaching
    assert [judge("air_release", m, VG46).level for m in (10.0, 10.5, 20.5)] == [
        "ok", "watch", "act"]
    assert limits_of("air_release", {"grade": "VG 680"}) is None


def test_oil_temperature_limits_follow_the_pumps_viscosity_window():
    # Without pump limits: 70 degC watch (fast ageing, from memory), 80 degC act.
    assert limits_of("oil_temp", {}).high == (70.0, 80.0)
    # With a maker's minimum of 13 cSt and optimum bottom of 16 cSt, VG 46 VI 100 thins to
    # them well before 80 degC: the limits are where its D341 line crosses them.
    facts = {**VG46, "visc_opt_low": 16.0, "visc_min": 13.0, "visc_opt_high": 36.0,
             "visc_start": 1000.0}
    watch, act = limits_of("oil_temp", facts).high
    line = walther_fit(40.0, 46.0, 100.0, 6.8)
    assert walther_viscosity(watch, *line) == pytest.approx(16.0, rel=1e-9)
    assert walther_viscosity(act, *line) == pytest.approx(13.0, rel=1e-9)
    assert 60.0 < watch < act < 80.0
    cold_watch, cold_act = limits_of("oil_temp", facts).low
    assert walther_viscosity(cold_act, *line) == pytest.approx(1000.0, rel=1e-9)
    assert judge("oil_temp", cold_act - 1.0, facts).level == "act"


def test_latest_is_the_newest_by_time_with_its_offset():
    # 09:00 at UTC+1 is 08:00 UTC: earlier than 08:30 UTC, whatever the list order.
    readings = [_reading("2026-03-04T08:30:00+00:00", {"water_ppm": 250.0}, rid="b"),
                _reading("2026-03-04T09:00:00+01:00", {"water_ppm": 150.0}, rid="a")]
    (row,) = condition.latest({}, readings)
    assert row["reading"]["id"] == "b" and row["verdict"].level == "watch"


def test_latest_says_what_the_card_is_missing():
    (row,) = condition.latest({}, [_reading("2026-03-04T08:30:00+00:00", {"acid_number": 0.9})])
    assert row["verdict"] is None and "acid number" in row["missing"].render(lambda v, q: str(v))


def test_readings_without_a_time_or_with_junk_are_left_out():
    readings = [_reading("yesterday", {"water_ppm": 900.0}),
                _reading("2026-03-04T08:30:00", {"water_ppm": 900.0}),  # no offset
                _reading("2026-03-04T08:30:00Z", {"water_ppm": "lots", "nothing": 3.0}),
                {"time": "2026-03-04T08:30:00Z", "tracked": None}]
    assert condition.latest({}, readings) == []


def test_trend_is_drawn_against_its_limits_on_a_dated_axis():
    readings = [_reading(f"2026-0{m}-01T08:00:00+01:00", {"water_ppm": ppm})
                for m, ppm in ((1, 120.0), (3, 260.0), (5, 540.0))]
    (drawn,) = condition.trends({}, readings, "us")
    root = ET.fromstring(drawn["svg"])
    classes = [c for el in root.iter() for c in el.get("class", "").split()]
    assert "limit-watch" in classes and "limit-act" in classes and "trend-line" in classes
    texts = " ".join(el.text or "" for el in root.iter(SVG + "text"))
    assert "2026-01-01" in texts and "watch 200 ppm" in texts and "act 500 ppm" in texts
    assert drawn["points"] == 3
    # One point is no trend.
    assert condition.trends({}, readings[:1], "metric") == []


def _due(facts, readings, today=date(2026, 12, 2)):
    return {d.key: d for d in condition.due(facts, readings, today)}


def test_what_is_due_from_intervals_and_dates():
    facts = {"sample_days": 90.0, "filter_days": 180.0, "filter_changed": "2026-06-10",
             "oil_days": 1460.0}
    readings = [_reading("2026-09-10T09:00:00+01:00", {"kv40": 46.5, "water_ppm": 90.0})]
    due = _due(facts, readings)
    assert due["sample"].on == date(2026, 12, 9) and due["sample"].state == "soon"
    assert due["filter"].on == date(2026, 12, 7) and due["filter"].state == "soon"
    assert due["oil"].state == "unknown" and due["oil"].on is None
    later = _due(facts, readings, date(2026, 12, 20))
    assert later["sample"].state == "overdue" and later["filter"].state == "overdue"
    # Soonest first, unknown first of all (it needs a date on the card).
    assert [d.key for d in condition.due(facts, readings, date(2026, 12, 2))] == [
        "oil", "filter", "sample"]


def test_a_thermometer_or_water_sensor_reading_is_not_a_sample():
    facts = {"sample_days": 90.0}
    readings = [_reading("2026-09-10T09:00:00+01:00", {"kv40": 46.5}),
                _reading("2026-12-01T09:00:00+01:00", {"oil_temp": 55.0,
                                                       "water_saturation": 30.0})]
    assert _due(facts, readings)["sample"].on == date(2026, 12, 9)
    assert _due(facts, [])["sample"].state == "unknown"


def test_a_bad_result_brings_the_next_sample_forward():
    # Half the interval after a watch or act (common practice).
    facts = {"sample_days": 90.0, "kv40_new": 46.0}
    readings = [_reading("2026-11-01T09:00:00+01:00", {"kv40": 49.0})]  # +6.5 %: watch
    assert _due(facts, readings)["sample"].on == date(2026, 12, 16)
    assert "half the usual interval" in _due(facts, readings)["sample"].says.render(
        lambda v, q: str(v))
