"""ISO 3448 grades, the viscosity-grade check and the grade selector."""

import pytest

from calc import bridge
from calc.kernel.errors import InputError
from calc.methods.viscosity import grade_at_temperatures, kv40_from_reading
from calc.tools.grades import fit_status, grade_selector, viscosity_grade
from calc.methods.iso3448 import (ISO_VG_GRADES, grade_containing, grade_limits, nearest_grade,
                                  neighbours)
from calc.methods.viscosity_index import kv100_from_vi, viscosity_index
from calc.methods.viscosity import walther_fit, walther_viscosity

VANE = (700.0, 40.0, 16.0, 10.0)  # calc.viscosity.PUMP_WINDOWS["vane"], common practice


def test_vg46_limits():
    # ISO 3448:1992 Table 1 (from memory): VG 46 is 41.4 to 50.6 cSt at 40 degC.
    assert grade_limits("VG 46") == (41.4, 50.6)


def test_every_grade_is_mid_point_plus_minus_ten_percent():
    # ISO 3448: the limits are the mid-point -10 % and +10 %; 20 grades from VG 2 to VG 3200.
    assert len(ISO_VG_GRADES) == 20
    assert ISO_VG_GRADES[0][0] == "VG 2" and ISO_VG_GRADES[-1][0] == "VG 3200"
    for _name, mid, low, high in ISO_VG_GRADES:
        assert low == pytest.approx(0.9 * mid, rel=1e-12) and high == pytest.approx(1.1 * mid)
    mids = [g[1] for g in ISO_VG_GRADES]
    assert mids == sorted(mids)


@pytest.mark.parametrize("kv40, inside, nearest", [
    (46.0, "VG 46", "VG 46"), (41.4, "VG 46", "VG 46"), (50.6, "VG 46", "VG 46"),
    (55.0, None, "VG 46"), (58.0, None, "VG 68"), (2.0, "VG 2", "VG 2"), (3300.0, "VG 3200", "VG 3200"),
])
def test_classification(kv40, inside, nearest):
    # ISO 3448 Table 1 bands; nearest by log distance (55 is nearer 46 than 68 on a log scale:
    # ln(55/46) = 0.179 < ln(68/55) = 0.212).
    assert grade_containing(kv40) == inside
    assert nearest_grade(kv40)[0] == nearest


def test_between_grades_names_both():
    assert neighbours(55.0) == ("VG 46", "VG 68")
    answer = bridge.run("viscosity-grade", {"kv": 55}, examples=True)
    assert answer["values"]["band"] == "between VG 46 and VG 68"


@pytest.mark.parametrize("temp", [0.0, 25.0, 60.0, 80.0, 100.0, 120.0])
def test_reading_at_another_temperature_traces_back_to_40c(temp):
    # Round trip (definition): an oil KV40 46, VI 105 read at `temp` on its D341 line is
    # traced back to KV40 46 and the KV100 that D2270 gives for VI 105.
    kv100 = kv100_from_vi(46.0, 105.0)
    reading = walther_viscosity(temp, *walther_fit(40.0, 46.0, 100.0, kv100))
    kv40, kv100_back = kv40_from_reading(reading, temp, 105.0)
    assert kv40 == pytest.approx(46.0, rel=1e-9)
    assert kv100_back == pytest.approx(kv100, rel=1e-9)
    assert viscosity_index(kv40, kv100_back) == pytest.approx(105.0, abs=1e-6)


def test_wrong_oil_is_a_finding_past_ten_percent():
    # Common practice: more than 10 % off the expected grade's mid-point is a finding.
    right = viscosity_grade(44.0, 40.0, 100.0, "VG 46")
    assert right.level == "ok"
    wrong = viscosity_grade(68.0, 40.0, 100.0, "VG 46")  # a VG 68 in a VG 46 tank: +47.8 %
    assert wrong.level == "act"
    assert wrong.values["off_expected"] == pytest.approx(100 * (68 / 46 - 1))
    message = wrong.verdicts[0].message.template
    assert "top-up records" in message and "lab" in message and "heavier" in message
    thin = viscosity_grade(40.0, 40.0, 100.0, "VG 46")  # -13 %
    assert thin.level == "act" and "lighter" in thin.verdicts[0].message.template


def test_no_expected_grade_gives_no_verdict():
    result = viscosity_grade(46.0, 40.0, 100.0, "none")
    assert result.values["off_expected"] is None and not result.verdicts


def test_grade_too_thin_for_d2270_names_kv():
    with pytest.raises(InputError) as err:
        kv40_from_reading(1.0, 100.0, 100.0)  # KV100 of 1 cSt is below D2270's 2 cSt
    assert err.value.field == "kv"


def test_fit_status_reasons():
    # Vane pump preset (common practice): 700 start-up / 40-16 optimum / 10 minimum cSt.
    assert fit_status(800.0, 20.0, VANE) == "thick_cold"
    assert fit_status(500.0, 12.0, VANE) == "thin"
    assert fit_status(500.0, 45.0, VANE) == "thick_hot"
    assert fit_status(500.0, 20.0, VANE) == "fit"


def test_selector_near_40c_picks_the_grades_whose_mid_point_is_in_the_band():
    # From 40 to 41 degC the oil is at about its KV40: with the vane band 16-40 cSt only VG 22
    # and VG 32 (ISO 3448 mid-points 22 and 32 cSt) can fit; VG 15 is thin, VG 46 too thick.
    result = grade_selector(40.0, 41.0, "vane", "common", "hydraulic")
    fits = result.values["fits"]
    assert "VG 22" in fits and "VG 32" in fits
    assert "VG 15" not in fits and "VG 46" not in fits
    assert result.values["best_grade"] in ("VG 22", "VG 32")


def test_selector_best_grade_agrees_with_viscosity_at_temperature():
    # The two tools share D2270 and D341: the selector's numbers must be what
    # viscosity-at-temperature computes for the same grade and VI.
    result = grade_selector(0.0, 60.0, "vane", "common", "hydraulic")
    v = result.values
    assert v["best_grade"] == "VG 46" and v["vi_pick"] == 95.0
    check = bridge.run("viscosity-at-temperature", {"oil_from": "grade", "grade": v["best_grade"],
                                                    "vi": v["vi_pick"], "temp": 0}, examples=True)
    assert check["values"]["kv"] == pytest.approx(v["kv_cold"], rel=1e-9)
    assert v["kv_cold"] <= 700.0 and 16.0 <= v["kv_hot"] <= 40.0


def test_least_vi_is_the_edge_of_fitting():
    result = grade_selector(-5.0, 70.0, "vane", "common", "hydraulic")
    v = result.values
    assert v["best_grade"] != "none"
    assert v["best_vi"] <= v["vi_pick"]
    at = grade_at_temperatures(v["best_grade"], v["best_vi"], -5.0, 70.0)
    below = grade_at_temperatures(v["best_grade"], v["best_vi"] - 0.05, -5.0, 70.0)
    assert fit_status(*at, VANE) == "fit" and fit_status(*below, VANE) != "fit"


def test_no_grade_fits_a_window_too_wide():
    result = grade_selector(-40.0, 110.0, "vane", "common", "hydraulic")
    assert result.values["best_grade"] == "none" and result.level == "act"
    assert any("too thick to start" in n.template for n in result.notes)
    assert any("too thin" in n.template for n in result.notes)


def test_hot_below_cold_is_refused():
    with pytest.raises(InputError) as err:
        grade_selector(50.0, 40.0, "vane", "common", "hydraulic")
    assert err.value.field == "temp_hot"


def test_all_grades_include_undefined_thin_ones_with_a_reason():
    answer = bridge.run("grade-selector", {"grades": "all", "vi_set": "sweep"}, examples=True)
    assert answer["ok"]
    assert any(n.startswith("VG 2 has no oil") for n in answer["notes"])


def test_reading_elsewhere_too_thin_for_its_vi_names_the_reading():
    # 1 cSt at 60 degC traces back to a KV40 below H = 6.394 cSt at KV100 2 cSt (D2270
    # Table 1): no VI 100 oil reads that, and the reading is named.
    answer = bridge.run("viscosity-grade", {"kv": 1.0, "kv_temp": 60, "vi": 100},
                         examples=True)
    assert not answer["ok"] and answer["errors"][0]["field"] == "kv"


def test_a_40c_reading_classifies_without_a_kv100():
    # VG 2 to VG 10 at 40 degC need no KV100 to classify (ISO 3448 grades are by KV40 alone);
    # D2270 has no KV100 for a VI-100 oil of 2.2 cSt, so none is given, and it says why.
    answer = bridge.run("viscosity-grade", {"kv": 2.2, "grade": "VG 2", "vi": 100},
                         examples=True)
    assert answer["ok"] and answer["values"]["band"] == "inside VG 2"
    assert answer["values"]["kv100"] is None and answer["level"] == "ok"
    assert any("2 cSt" in n or "D2270" in n for n in answer["notes"])


def test_a_limit_of_the_standard_is_compared_as_written():
    # 50.6 cSt is VG 46's upper limit (ISO 3448 Table 1); 50.6 / 46 - 1 computes as
    # 10.0000000000001 %, which must not read as over it (ASTM E29 rounding method).
    answer = bridge.run("viscosity-grade", {"kv": 50.6, "grade": "VG 46"}, examples=True)
    assert answer["values"]["band"] == "inside VG 46" and answer["level"] == "ok"
    assert bridge.run("viscosity-grade", {"kv": 50.7, "grade": "VG 46"}, examples=True)["level"] == "act"


def test_a_40c_reading_needs_no_vi():
    # ISO 3448 grades by KV40 alone (Table 1): a lab KV40 classifies with the VI left blank,
    # and the KV100 (which needs the VI, ASTM D2270) is left out rather than guessed.
    answer = bridge.run("viscosity-grade", {"kv": 46.0, "kv_temp": 40, "grade": "VG 46"})
    assert answer["ok"], answer
    assert answer["values"]["band"] == "inside VG 46" and answer["values"]["kv100"] is None
    assert answer["level"] == "ok"


def test_a_reading_elsewhere_without_a_vi_asks_for_it():
    # Tracing a reading at 60 degC back to 40 degC needs the oil's VI (ASTM D341 line through
    # a D2270 pair): without it the VI field is named, not a guess made.
    answer = bridge.run("viscosity-grade", {"kv": 20.6, "kv_temp": 60, "grade": "VG 46"})
    assert not answer["ok"]
    assert [e["field"] for e in answer["errors"]] == ["vi"]
    assert "back to 40" in answer["errors"][0]["message"]
