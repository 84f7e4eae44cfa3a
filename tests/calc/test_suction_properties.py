"""Property tests for calc.suction: the starving temperature and the cold-start trend."""

import pytest

hypothesis = pytest.importorskip("hypothesis")
from hypothesis import assume, given, settings, strategies as st  # noqa: E402

from calc.tools.suction import suction_check  # noqa: E402

systems = st.fixed_dictionaries({
    "pump_flow": st.floats(min_value=5.0, max_value=400.0),
    "suction_bore": st.floats(min_value=15.0, max_value=120.0),
    "suction_length": st.floats(min_value=0.0, max_value=5.0),
    "roughness": st.sampled_from([0.0, 0.0015, 0.045]),
    "suction_head": st.floats(min_value=-2.0, max_value=2.0),
    "entry": st.sampled_from(["sharp", "projecting", "rounded"]),
    "elbows_90": st.integers(min_value=0, max_value=4).map(float),
    "bends_90": st.integers(min_value=0, max_value=4).map(float),
    "elbows_45": st.integers(min_value=0, max_value=2).map(float),
    "tees": st.integers(min_value=0, max_value=1).map(float),
    "suction_valve": st.sampled_from(["none", "full_bore", "butterfly"]),
    "strainer": st.floats(min_value=0.0, max_value=0.2),
    "strainer_model": st.sampled_from(["viscous", "constant"]),
    "bypass": st.sampled_from(["yes", "no"]),
    "bypass_opens": st.floats(min_value=0.05, max_value=0.5),
    "kv40": st.sampled_from([22.0, 32.0, 46.0, 68.0, 100.0]),
    "kv100": st.just(None),
    "density": st.floats(min_value=820.0, max_value=1000.0),
    "temp_running": st.floats(min_value=30.0, max_value=80.0),
    "temp_cold": st.floats(min_value=-30.0, max_value=25.0),
    "atmosphere": st.floats(min_value=0.85, max_value=1.05),
    "pump_min_inlet": st.floats(min_value=0.5, max_value=0.95),
})


def _complete(inputs):
    # A VI-about-100 oil: KV100 near KV40 / 6.8 (typical of mineral hydraulic oils).
    return {**inputs, "kv100": inputs["kv40"] / 6.8}


@settings(max_examples=60, deadline=None)
@given(systems)
def test_starving_temperature_gives_the_minimum(inputs):
    # Definition: at t_starve the inlet pressure is the pump's minimum (to 1e-3 bar).
    inputs = _complete(inputs)
    t = suction_check(**inputs).values["t_starve"]
    assume(t is not None and t < inputs["temp_running"] - 1e-3)
    at_t = suction_check(**{**inputs, "temp_cold": t})
    assert at_t.values["p_inlet_cold"] == pytest.approx(inputs["pump_min_inlet"], abs=1e-3)


@settings(max_examples=60, deadline=None)
@given(systems)
def test_no_negative_absolute_pressure_is_ever_reported(inputs):
    # An absolute pressure below zero is no result: the column breaks and none is shown.
    result = suction_check(**_complete(inputs))
    for key in ("p_inlet", "p_inlet_cold"):
        assert result.values[key] is None or result.values[key] >= 0.3


@settings(max_examples=60, deadline=None)
@given(systems, st.floats(min_value=0.5, max_value=20.0))
def test_colder_is_worse_while_laminar(inputs, colder_by):
    # Laminar friction (64/Re), laminar fitting losses (K1/Re) and the viscous strainer all
    # grow with viscosity; a column that breaks shows no pressure at all.
    inputs = _complete(inputs)
    warm = suction_check(**inputs)
    cold = suction_check(**{**inputs, "temp_cold": inputs["temp_cold"] - colder_by})
    assume(warm.values["re_cold"] < 2300.0 and warm.values["p_inlet_cold"] is not None)
    if cold.values["p_inlet_cold"] is not None:
        assert cold.values["p_inlet_cold"] <= warm.values["p_inlet_cold"] + 1e-12
