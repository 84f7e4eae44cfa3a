"""Property tests for calc.air: stiffness bounds and trends."""

import pytest

hypothesis = pytest.importorskip("hypothesis")
from hypothesis import assume, example, given, strategies as st  # noqa: E402

from calc.methods.air import load_pressure_bar  # noqa: E402
from calc.tools.air import LOAD_PRESSURE_MAX_BAR, air_stiffness  # noqa: E402

cases = st.fixed_dictionaries({
    "air": st.floats(min_value=0.0, max_value=50.0),
    "pressure": st.floats(min_value=0.0, max_value=700.0),
    "process": st.sampled_from(["isothermal", "adiabatic"]),
    "k_oil": st.floats(min_value=1000.0, max_value=50000.0),
    "atmosphere": st.floats(min_value=0.5, max_value=1.1),
    "bore": st.floats(min_value=20.0, max_value=500.0),
    "stroke": st.floats(min_value=1.0, max_value=5000.0),
    "line_volume": st.floats(min_value=0.0, max_value=50.0),
    "load": st.floats(min_value=0.0, max_value=1000.0),
})


@example({"air": 1.0, "pressure": 160.0, "process": "isothermal", "k_oil": 16000.0,
          "atmosphere": 1.013, "bore": 100.0, "stroke": 500.0, "line_volume": 0.0,
          "load": 2.6e-14}, 1.0)
@given(cases, st.floats(min_value=0.1, max_value=10.0))
def test_more_air_is_softer_and_gives_more(inputs, extra):
    # Holds down to vanishing loads (2.6e-14 kN once lost its precision in 1 - air - oil;
    # calc.methods.air.column_compression now works in expm1 and log1p).
    assume(load_pressure_bar(inputs["load"], inputs["bore"]) <= LOAD_PRESSURE_MAX_BAR)
    base = air_stiffness(**inputs)
    more = air_stiffness(**{**inputs, "air": min(inputs["air"] + extra, 50.0)})
    assert 0.0 < base.values["k_eff"] <= inputs["k_oil"] * (1.0 + 1e-12)
    assert more.values["k_eff"] <= base.values["k_eff"] * (1.0 + 1e-12)
    assert more.values["lost_motion"] >= base.values["lost_motion"] * (1.0 - 1e-12)
    assert base.values["lost_motion"] >= base.values["lost_motion_air_free"] * (1.0 - 1e-12)


@given(cases, st.floats(min_value=1.0, max_value=300.0))
def test_higher_pressure_is_stiffer(inputs, rise):
    assume(load_pressure_bar(inputs["load"], inputs["bore"]) <= LOAD_PRESSURE_MAX_BAR)
    # Air shrinks (Boyle) and stiffens (K_air = n p) as pressure rises.
    low = air_stiffness(**inputs)
    high = air_stiffness(**{**inputs, "pressure": inputs["pressure"] + rise})
    assert high.values["k_eff"] >= low.values["k_eff"] * (1.0 - 1e-12)
