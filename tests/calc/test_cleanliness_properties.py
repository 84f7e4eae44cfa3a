"""Property tests of ISO 4406 coding (hypothesis, tests only)."""

import pytest

hypothesis = pytest.importorskip("hypothesis")
from hypothesis import given, strategies as st  # noqa: E402

from calc.methods.cleanliness import SCALE_TABLE, format_code, parse_code, scale_number, scale_range  # noqa: E402


@given(st.floats(min_value=0.0, max_value=2.5e6))
def test_every_count_falls_inside_its_scale_range(count):
    # ISO 4406 table 1: "more than" low, "up to and including" high.
    number = scale_number(count)
    low, high = scale_range(number)
    assert (low < count or (number == 0 and count == 0.0)) and count <= high


@given(st.tuples(*[st.integers(min_value=0, max_value=len(SCALE_TABLE) - 1)] * 3))
def test_code_text_round_trip(numbers):
    code = tuple(sorted(numbers, reverse=True))
    assert parse_code(format_code(code)) == code
