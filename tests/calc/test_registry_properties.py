"""Property tests over every tool: no input, however bad, gives a traceback, NaN or infinity."""


import pytest

hypothesis = pytest.importorskip("hypothesis")
from hypothesis import given, settings, strategies as st  # noqa: E402

from calc import bridge  # noqa: E402
from calc.kernel import registry, units
from .cases import all_finite  # noqa: E402

TOOLS = registry.tools()

typed_values = st.one_of(
    st.floats(allow_nan=True, allow_infinity=True),
    st.floats(min_value=-1e6, max_value=1e6),
    st.integers(min_value=-10**6, max_value=10**6),
    st.text(max_size=8),
    st.sampled_from(["", "0", "-0", "1e308", "46,5", "NaN", "-273.15", "1e-300"]),
)


def _inputs_strategy(found):
    def value_for(f):
        if f.is_flag:
            return st.one_of(st.booleans(), st.sampled_from(["yes", "no", "on", ""]), st.text(max_size=3))
        if f.is_choice:
            return st.one_of(st.sampled_from([c[0] for c in f.choices]), st.text(max_size=4))
        if f.min is not None and f.max is not None:
            return st.one_of(st.floats(min_value=f.min, max_value=f.max), typed_values)
        return typed_values
    return st.fixed_dictionaries({}, optional={f.key: value_for(f) for f in found.inputs})



@pytest.mark.parametrize("tool_id", sorted(TOOLS))
def test_any_input_gives_an_answer_or_named_errors(tool_id):
    found = TOOLS[tool_id]
    keys = {f.key for f in found.inputs}

    @settings(max_examples=150, deadline=None)
    @given(_inputs_strategy(found))
    def check(inputs):
        answer = bridge.run(tool_id, inputs, examples=True)
        assert "bug" not in answer, answer.get("bug")
        if answer["ok"]:
            assert all_finite(answer["values"])
            assert all(v["message"] for v in answer["verdicts"])
            for out in found.outputs:  # no absolute pressure below zero, no temperature below
                value = answer["values"].get(out.key)  # absolute zero, no level over 100 %
                low, high = out.bounds
                if isinstance(value, float):
                    metric = units.to_metric(value, out.quantity, "metric")
                    assert low is None or metric >= low, (out.key, metric)
                    assert high is None or metric <= high, (out.key, metric)
        else:
            assert answer["errors"]
            for err in answer["errors"]:
                assert err["field"] in keys and err["message"]

    check()
