"""Property tests of calc.kernel.jsontext (hypothesis, tests only): the nesting measured
before the parser is the nesting of the value the parser gives, whatever the strings hold,
and the string pattern drops exactly what the plainer pattern it replaced dropped."""

import json
import re

import pytest

hypothesis = pytest.importorskip("hypothesis")
from hypothesis import given, strategies as st  # noqa: E402

from calc.kernel import jsontext  # noqa: E402

# The pattern jsontext used before, written as JSON's grammar reads (RFC 8259, section 7).
PLAIN_STRINGS = re.compile(r'"(?:[^"\\]|\\.)*"')
# Characters that try the patterns: quotes, escapes and brackets, inside strings and out.
CHARS = '"\\[]{}ab\u00e9\n'
TRICKY = st.text(alphabet=CHARS, max_size=60)
VALUES = st.recursive(
    st.none() | st.booleans() | st.integers() | st.floats(allow_nan=False, allow_infinity=False)
    | st.text(CHARS, max_size=12),
    lambda inner: st.lists(inner, max_size=4) | st.dictionaries(st.text(CHARS, max_size=4), inner, max_size=4),
    max_leaves=30)


def nesting(value) -> int:
    if isinstance(value, list):
        return 1 + max(map(nesting, value), default=0)
    if isinstance(value, dict):
        return 1 + max(map(nesting, value.values()), default=0)
    return 0


@given(VALUES, st.booleans())
def test_the_measured_nesting_is_the_parsed_values(value, ascii_only):
    text = json.dumps(value, ensure_ascii=ascii_only)
    assert jsontext.depth(text) == nesting(value)
    assert jsontext.loads(text, nesting(value)) == value
    if nesting(value):
        assert jsontext.loads(text, nesting(value) - 1) is None


@given(TRICKY)
def test_the_string_pattern_drops_what_the_plain_one_dropped(text):
    assert jsontext._STRINGS.sub("", text) == PLAIN_STRINGS.sub("", text)
