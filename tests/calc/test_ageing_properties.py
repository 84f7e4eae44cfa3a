"""Property tests of the ageing arithmetic (hypothesis, tests only)."""

import pytest

hypothesis = pytest.importorskip("hypothesis")
from hypothesis import given, strategies as st  # noqa: E402

from calc.methods.ageing import equivalent_hours, equivalent_temperature_doubling, life_doubling  # noqa: E402

rows = st.lists(st.tuples(st.floats(min_value=0.0, max_value=1e5),
                          st.floats(min_value=-40.0, max_value=200.0)), min_size=1, max_size=4)


@given(rows, st.floats(min_value=0.0, max_value=150.0))
def test_profile_sum_is_the_closed_form(profile, ref_temp):
    # Miner-style sum, doubling rule: sum h_i * 2^((T_i - T_ref) / 10).
    closed = sum(h * 2.0 ** ((t - ref_temp) / 10.0) for h, t in profile)
    model = lambda t, life: life_doubling(t, life, ref_temp)  # noqa: E731
    assert equivalent_hours(profile, ref_temp, model) == pytest.approx(closed, rel=1e-9, abs=1e-9)


@given(rows, st.floats(min_value=0.0, max_value=150.0))
def test_equivalent_temperature_lies_within_the_profile(profile, ref_temp):
    used = [(h, t) for h, t in profile if h > 1e-3]
    if not used:
        return
    total = sum(h for h, _t in used)
    model = lambda t, life: life_doubling(t, life, ref_temp)  # noqa: E731
    t_eq = equivalent_temperature_doubling(total, equivalent_hours(used, ref_temp, model), ref_temp)
    temps = [t for _h, t in used]
    assert min(temps) - 1e-6 <= t_eq <= max(temps) + 1e-6
