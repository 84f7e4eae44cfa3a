"""Every troubleshooting checklist: its printed page matches its rules, and the scoring is plain."""

import pathlib
import re

import pytest

from calc import bridge
from calc.kernel import registry
from calc.checklists.scoreboard import AGAINST, STRONG, WEAK, Scoreboard, checklist_result

CHECKLISTS = sorted(registry.of_kind("checklist"))
SITE = pathlib.Path(__file__).resolve().parents[2] / "site_src" / "checklists"
SECTION = re.compile(r"^## \{#([a-z0-9-]+)\}$")


def _sections(tool_id):
    """The cause keys of the checklist's prose file, in order."""
    if not SITE.is_dir():
        pytest.skip("site_src is not here (inside Pyodide)")
    text = (SITE / f"{tool_id}.md").read_text(encoding="utf-8")
    return [m.group(1) for m in map(SECTION.match, text.splitlines()) if m]


def test_checklists_are_declared_as_such():
    assert CHECKLISTS, "the registry finds the checklist modules"
    troubleshooting = sorted(t for t, found in registry.tools().items()
                             if found.topic is registry.TROUBLESHOOTING)
    assert CHECKLISTS == troubleshooting
    assert all(registry.get(t).causes for t in CHECKLISTS)
    assert not any(found.causes for found in registry.of_kind("tool").values())


@pytest.mark.parametrize("tool_id", CHECKLISTS)
def test_prose_sections_are_the_declared_causes_in_order(tool_id):
    # Both ways: every declared cause has a section, every section is a cause; same order,
    # which is also the ranking's tie-break when nothing is entered.
    declared = [c.key for c in registry.get(tool_id).causes]
    assert _sections(tool_id) == declared
    assert [c["key"] for c in bridge.run(tool_id, {}, examples=True)["ranked"]] == declared


@pytest.mark.parametrize("tool_id", CHECKLISTS)
def test_declaration_is_printable(tool_id):
    causes = registry.get(tool_id).causes
    assert 4 <= len(causes) <= 7
    for cause in causes:
        assert cause.title and 2 <= len(cause.checks) <= 4, cause.key
        assert cause.caution, f"{cause.key} has no caution"
        for check in cause.checks:
            assert check.text.endswith((".", "?")), check.key
            if check.tool:
                assert registry.get(check.tool).kind == "tool", check.tool


@pytest.mark.parametrize("tool_id", CHECKLISTS)
def test_cautions_name_the_usual_hazards(tool_id):
    found = registry.get(tool_id)
    cautions = " ".join(c.caution for c in found.causes).lower()
    cautions += " ".join(n for n in bridge.run(tool_id, {}, examples=True)["notes"]).lower()
    assert "lock" in cautions and "pressure" in cautions


@pytest.mark.parametrize("tool_id", CHECKLISTS)
def test_ranking_is_sorted_and_flagged_causes_have_reasons(tool_id):
    found = registry.get(tool_id)
    every_flag = {f.key: True for f in found.inputs if f.is_flag}
    answer = bridge.run(tool_id, every_flag, examples=True)
    scores = [c["score"] for c in answer["ranked"]]
    assert scores == sorted(scores, reverse=True)
    for cause in answer["ranked"]:
        assert (cause["score"] != 0) <= bool(cause["reasons"])
    assert answer["values"]["top_cause"] == answer["ranked"][0]["title"]
    assert answer["values"]["causes_flagged"] == sum(1 for s in scores if s > 0)


def test_scores_are_plain_sums_and_ties_keep_the_list_order():
    board = Scoreboard((("a", "A"), ("b", "B"), ("c", "C")))
    board.add("c", STRONG, "reading over its limit")
    board.add("c", AGAINST, "other reading inside its limit")
    board.add("b", WEAK, "symptom")
    ranked = board.ranked()
    assert [(c.key, c.score) for c in ranked] == [("b", 1.0), ("c", 1.0), ("a", 0.0)]
    assert [r.template for r in ranked[1].reasons] == ["reading over its limit",
                                                       "other reading inside its limit"]


def test_nothing_entered_is_an_ok_start_in_list_order():
    result = checklist_result(Scoreboard((("a", "A"), ("b", "B"))), 0, "Lock out first.")
    assert result.level == "ok"
    assert result.values == {"top_cause": "none flagged yet", "causes_flagged": 0.0}
    assert "Lock out first." in [n.template for n in result.notes]


def test_unknown_cause_is_a_bug():
    with pytest.raises(KeyError):
        Scoreboard((("a", "A"),)).add("z", WEAK, "x")
