"""Property tests for calc.lines: continuity both ways, friction factor shape."""

import math

import pytest

hypothesis = pytest.importorskip("hypothesis")
from hypothesis import given, settings, strategies as st  # noqa: E402

from calc.methods.lines import (bore_for_velocity, friction_factor, line_velocity,  # noqa: E402
                               next_hose_size)

flows = st.floats(min_value=0.1, max_value=20000.0)
bores = st.floats(min_value=1.0, max_value=600.0)


@given(flows, bores)
def test_velocity_times_area_is_the_flow(flow, bore):
    # Continuity: v * pi/4 d^2 * 60 000 = Q [L/min].
    v = line_velocity(flow, bore)
    assert v * math.pi / 4.0 * (bore / 1000.0) ** 2 * 60000.0 == pytest.approx(flow, rel=1e-12)
    assert bore_for_velocity(flow, v) == pytest.approx(bore, rel=1e-12)


@given(flows, st.floats(min_value=0.1, max_value=20.0))
def test_next_hose_is_never_faster_than_the_target(flow, target):
    size = next_hose_size(bore_for_velocity(flow, target))
    if size is not None:
        assert line_velocity(flow, size[1]) <= target * (1.0 + 1e-9)


@settings(max_examples=200)
@given(st.floats(min_value=5000.0, max_value=1e8), st.floats(min_value=0.0, max_value=0.05),
       st.floats(min_value=1.01, max_value=10.0))
def test_turbulent_friction_falls_with_re_and_rises_with_roughness(re, ed, factor):
    # Moody chart shape: f falls with Re at fixed roughness, rises with roughness. Churchill's
    # transition hump ends by about Re 4600 on the roughest pipe (e/D 0.05), so from 5000.
    f = friction_factor(re, ed)
    assert 0.005 < f < 0.1
    assert friction_factor(re * factor, ed) <= f * (1.0 + 1e-12)
    assert friction_factor(re, ed + 1e-4) > f


@given(st.floats(min_value=1e-3, max_value=1e9), st.floats(min_value=0.0, max_value=0.05))
def test_friction_is_finite_and_positive(re, ed):
    f = friction_factor(re, ed)
    assert math.isfinite(f) and f > 0.0
