"""Property tests for the water tools over their whole input range."""

import math

import pytest

hypothesis = pytest.importorskip("hypothesis")
from hypothesis import given, settings, strategies as st  # noqa: E402

from calc import bridge  # noqa: E402
from calc.methods.drying import drying_time_min, well_mixed_content_ppm  # noqa: E402
from calc.kernel.errors import InputError  # noqa: E402
from calc.methods.water import (OIL_PRESETS, content_ppm, free_water_temp_c,  # noqa: E402
                                relative_saturation_pct)
from calc.tools.water import CALIBRATION_KEYS, saturation_line  # noqa: E402

presets = st.sampled_from([p[0] for p in OIL_PRESETS])
temps = st.floats(min_value=-40.0, max_value=150.0)


@settings(max_examples=300, deadline=None)
@given(presets, temps, st.floats(min_value=0.0, max_value=100.0))
def test_rh_and_ppm_are_inverse(oil, temp, rh):
    line = saturation_line(oil)
    ppm = content_ppm(rh, temp, line.a, line.b)
    assert math.isfinite(ppm) and ppm >= 0.0
    assert relative_saturation_pct(ppm, temp, line.a, line.b) == pytest.approx(rh, abs=1e-9)


@settings(max_examples=300, deadline=None)
@given(presets, st.floats(min_value=0.01, max_value=100000.0))
def test_free_water_temperature_solves_saturation(oil, ppm):
    line = saturation_line(oil)
    t_free = free_water_temp_c(ppm, line.a, line.b)
    assert t_free is not None and math.isfinite(t_free)
    assert line.saturation(t_free) == pytest.approx(ppm, rel=1e-9)


@settings(max_examples=300, deadline=None)
@given(st.floats(min_value=-40.0, max_value=150.0), st.floats(min_value=1.0, max_value=1e5),
       st.floats(min_value=-40.0, max_value=150.0), st.floats(min_value=1.0, max_value=1e5),
       temps, st.floats(min_value=0.0, max_value=100.0))
def test_own_calibration_is_an_answer_or_names_a_calibration_field(t1, s1, t2, s2, temp, rh):
    inputs = {"oil": "own", "cal_temp1": t1, "cal_ppm1": s1, "cal_temp2": t2, "cal_ppm2": s2,
              "temp": temp, "rh": rh}
    for tool_id in ("water-in-oil", "water-drying"):
        answer = bridge.run(tool_id, inputs, examples=True)
        if answer["ok"]:
            assert all(math.isfinite(v) for v in answer["values"].values()
                       if isinstance(v, float))
        else:
            assert {e["field"] for e in answer["errors"]} <= set(CALIBRATION_KEYS)


@settings(max_examples=300, deadline=None)
@given(st.floats(min_value=0.0, max_value=1e5), st.floats(min_value=1.0, max_value=1e5),
       st.floats(min_value=0.1, max_value=1e4), st.floats(min_value=1.0, max_value=100.0),
       st.floats(min_value=1.0, max_value=1e6))
def test_drying_time_is_finite_and_reaches_target(c0, target, flow, eff, volume):
    minutes = drying_time_min(c0, target, flow, eff, volume)
    assert math.isfinite(minutes) and minutes >= 0.0
    if minutes > 0.0:
        reached = well_mixed_content_ppm(c0, minutes, flow, eff, volume)
        assert reached == pytest.approx(target, rel=1e-6)


@pytest.mark.parametrize("tool_id", ["water-in-oil", "water-drying"])
@pytest.mark.parametrize("temp", ["-41", "151", "-300"])
def test_temperature_beyond_the_fields_names_the_field(tool_id, temp):
    answer = bridge.run(tool_id, {"temp": temp}, examples=True)
    assert not answer["ok"] and answer["errors"][0]["field"] == "temp"


def test_missing_calibration_is_not_a_traceback():
    with pytest.raises(InputError):
        saturation_line("own")
