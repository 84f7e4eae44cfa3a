"""Every message, error, note, verdict and reason is shown in the reader's units.

calc's metric units appear in US answers only where the US unit is the same (cSt, mL of
foam, ppm): a metric unit label next to a number in a US answer is a message that did not
keep its quantities as quantities.
"""

import re

import pytest

from calc import bridge
from calc.kernel import units

from .cases import cases

# Metric unit labels that a US reader never sees (mL of foam stays mL in US practice).
US_LABELS = {q.us for q in units.QUANTITIES.values()}
METRIC_ONLY = sorted({q.metric for q in units.QUANTITIES.values()
                      if q.metric and q.metric not in US_LABELS}, key=len, reverse=True)
METRIC_NUMBER = re.compile(r"(?<![\w/])\d[\d.,]*\s?(" + "|".join(map(re.escape, METRIC_ONLY))
                           + r")(?![\w²³/])")
CASES = cases()


def _messages(answer):
    return ([e["message"] for e in answer.get("errors", [])]
            + [v["message"] for v in answer.get("verdicts", [])] + answer.get("notes", [])
            + [r for c in answer.get("ranked", []) for r in c["reasons"]])


def test_the_pattern_finds_what_it_looks_for():
    assert METRIC_NUMBER.search("inlet at 0.8 bar absolute") is not None
    assert METRIC_NUMBER.search("heats to 60.0 °C") is not None
    assert METRIC_NUMBER.search("at 11.6 psi absolute, 46.0 cSt, 150 mL of foam") is None


@pytest.mark.parametrize("tool_id", sorted({t for t, _ in CASES}))
def test_us_answers_carry_no_metric_unit(tool_id):
    found = []
    for case_tool, inputs in CASES:
        if case_tool != tool_id:
            continue
        for message in _messages(bridge.run(tool_id, inputs, "us", examples=True)):
            if METRIC_NUMBER.search(message):
                found.append(message)
    assert not found, found[:3]
