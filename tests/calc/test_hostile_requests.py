"""Hostile requests through the worker's own entry point, `bridge.run_json`, for every tool.

The page sends calc a JSON text; a file, a sync or a bug elsewhere can send anything. Each
example here is a whole request text: values of every wrong kind (markup, emoji, 100,000
characters, numbers too large or too small for a float, integers of 400 digits, lists,
objects, nesting), unknown keys, and keys given twice in the text. Whatever arrives, the
answer is the bridge's JSON shape: an answer with finite numbers, or errors that each name
a field and say what is wrong, quoting no more than a short prefix of what was typed.

CI runs at least 1,000 examples per tool natively, derandomized (the "ci" profile); a local
run takes fewer, at random, so that a change gets a quick first look. CI's second run of this
module, inside Pyodide (tests/pyodide), takes 100 per tool: there it checks that the same code
answers the same way, and a thousand more per tool would add six minutes to the suite.
"""

import json
import os
import sys

import pytest

hypothesis = pytest.importorskip("hypothesis")
from hypothesis import HealthCheck, given, settings, strategies as st  # noqa: E402

from calc import bridge  # noqa: E402
from calc.kernel import registry  # noqa: E402
from calc.kernel.errors import QUOTE_CHARS  # noqa: E402
from .cases import all_finite  # noqa: E402

TOOLS = registry.tools()
EXAMPLES = (100 if sys.platform == "emscripten" else 1000) if os.environ.get("CI") else 60
LONG = "9" * 100_000
# What an error may quote of a typed entry: the bridge cuts it to a short prefix.
QUOTED_MAX_CHARS = 300
REQUEST_MEMBERS = ("units", "inputs", "request", "tool", "examples")

# JSON number texts a float cannot hold: 1e400 parses to infinity in Python's json module.
NUMBER_TEXTS = ["1e400", "-1e400", "1e-400", "1e308", "-0", "0.0", "4" * 400,
                "-" + "7" * 400, "1.5e-320", "123456789012345678901234567890"]
STRINGS = st.one_of(
    st.text(max_size=12),
    st.sampled_from(["<script>alert(1)</script>", "<img src=x onerror=alert(1)>", "🛢️💧",
                     "NaN", "Infinity", "-inf", "1,200", "1.200", "46,5", " 46 ", "0x2e",
                     "1_000", "٤٦", "46 cSt", "", "   ", "\u0000", "null", LONG, "-" + LONG]),
)
SCALARS = st.one_of(
    STRINGS, st.booleans(), st.none(),
    st.floats(allow_nan=False, allow_infinity=False),
    st.integers(min_value=-10 ** 30, max_value=10 ** 30),
)
VALUES = st.recursive(SCALARS, lambda inner: st.one_of(
    st.lists(inner, max_size=3), st.dictionaries(st.text(max_size=4), inner, max_size=3)),
    max_leaves=6)


def _value_text(draw, found) -> str:
    """One value as JSON text: a JSON value, or a number text no float holds."""
    if draw(st.integers(0, 5)) == 0:
        return draw(st.sampled_from(NUMBER_TEXTS))
    return json.dumps(draw(VALUES), ensure_ascii=draw(st.booleans()))


@st.composite
def requests(draw, tool_id):
    found = TOOLS[tool_id]
    keys = [f.key for f in found.inputs]
    members = []
    for key in draw(st.lists(st.one_of(st.sampled_from(keys), st.text(max_size=6)), max_size=8)):
        members.append(f"{json.dumps(key)}: {_value_text(draw, found)}")
    if members and draw(st.booleans()):  # a key given twice in the text
        members.append(members[0].split(":", 1)[0] + ": " + _value_text(draw, found))
    inputs = "{" + ", ".join(members) + "}"
    if draw(st.integers(0, 9)) == 0:  # inputs of the wrong kind altogether
        inputs = draw(st.sampled_from(["[]", "null", "7", '"kv=46"', "[" * 40 + "]" * 40]))
    units = draw(st.sampled_from(['"metric"', '"us"', '"US"', '"furlongs"', "null", "3", "[]"]))
    examples = draw(st.sampled_from(["true", "false", '"yes"', "1"]))
    return (f'{{"tool": {json.dumps(tool_id)}, "inputs": {inputs}, "units": {units}, '
            f'"examples": {examples}}}')



@pytest.mark.slow
@pytest.mark.parametrize("tool_id", sorted(TOOLS))
def test_any_request_text_gets_the_json_answer_shape(tool_id):
    keys = {f.key for f in TOOLS[tool_id].inputs}

    @settings(max_examples=EXAMPLES, deadline=None,
              suppress_health_check=[HealthCheck.too_slow, HealthCheck.data_too_large])
    @given(requests(tool_id))
    def check(text):
        answer = json.loads(bridge.run_json(text))  # a JSON text, whatever came in
        assert "bug" not in answer, answer.get("bug")
        assert isinstance(answer.get("ok"), bool)
        if answer["ok"]:
            assert all_finite(answer["values"]) and all_finite(answer.get("charts_data", {}))
            assert all(v["message"] and v["level"] in ("ok", "watch", "act")
                       for v in answer["verdicts"])
        else:
            assert answer["errors"]
            for err in answer["errors"]:
                assert err["message"] and len(err["message"]) < QUOTED_MAX_CHARS + 400
                field = err["field"]
                assert field in keys or field in REQUEST_MEMBERS or (
                    len(field) <= QUOTE_CHARS and err["message"].startswith("is not an input")
                ), err

    check()
