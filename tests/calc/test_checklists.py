"""Every troubleshooting checklist: its printed page matches its rules, and the scoring is plain."""

import pathlib
import re

import pytest

from calc import bridge, registry
from calc.checklists import AGAINST, STRONG, WEAK, Scoreboard, checklist_result

CHECKLISTS = sorted(t for t in registry.tools() if t.startswith("checklist-"))
SITE = pathlib.Path(__file__).resolve().parents[2] / "site_src" / "checklists"
CORE_TOOLS = {"viscosity-at-temperature", "viscosity-grade", "water-in-oil", "tank-volume",
              "tank-sizing", "tank-heat", "line-velocity", "suction-check", "air-stiffness",
              "foam-air-tests", "oxidation-life", "oil-condition", "iso-4406"}
HEADING = re.compile(r"^## (.+?) \{#([a-z0-9-]+)\}$")


def _page(tool_id):
    if not SITE.is_dir():
        pytest.skip("site_src is not here (inside Pyodide)")
    return (SITE / (tool_id.removeprefix("checklist-") + ".md")).read_text(encoding="utf-8")


def _sections(text):
    """(key, title, check lines, caution lines) per `## Title {#key}` section."""
    sections = []
    for line in text.splitlines():
        m = HEADING.match(line)
        if m:
            sections.append((m.group(2), m.group(1), [], []))
        elif sections and line.startswith("- [ ] Check:"):
            sections[-1][2].append(line)
        elif sections and line.startswith("> **Caution:**"):
            sections[-1][3].append(line)
    return sections


def test_the_six_checklists_are_registered():
    assert CHECKLISTS == sorted(f"checklist-{n}" for n in (
        "aeration", "water", "overheating", "contamination", "spongy", "noisy-pump"))
    assert all(registry.get(t).topic == "Troubleshooting" for t in CHECKLISTS)


@pytest.mark.parametrize("tool_id", CHECKLISTS)
def test_page_sections_are_the_rules_causes_in_order(tool_id):
    # Both ways: every Cause key has a section, every section is a Cause; same order (tie-break).
    sections = _sections(_page(tool_id))
    ranked = bridge.run(tool_id, {})["ranked"]
    assert [(s[0], s[1]) for s in sections] == [(c["key"], c["title"]) for c in ranked]


@pytest.mark.parametrize("tool_id", CHECKLISTS)
def test_page_format_is_printable(tool_id):
    text = _page(tool_id)
    lines = text.splitlines()
    assert lines[0].startswith("# ") and not lines[0].startswith("## ")
    sections = _sections(text)
    assert 4 <= len(sections) <= 7
    for key, _, checks, cautions in sections:
        assert 2 <= len(checks) <= 4, key
        assert cautions, f"{key} has no caution"
        for check in checks:
            for used in re.findall(r"\{tool=([a-z0-9-]+)\}", check):
                assert used in CORE_TOOLS and used in registry.tools(), used
            if "{tool=" in check:  # the tool reference closes the line
                assert re.search(r"\{tool=[a-z0-9-]+\}$", check.rstrip()), check


@pytest.mark.parametrize("tool_id", CHECKLISTS)
def test_page_names_the_usual_cautions(tool_id):
    text = _page(tool_id).lower()
    assert "lock" in text and "pressure" in text


@pytest.mark.parametrize("tool_id", CHECKLISTS)
def test_ranking_is_sorted_and_flagged_causes_have_reasons(tool_id):
    found = registry.get(tool_id)
    every_flag = {f.key: True for f in found.inputs if f.is_flag}
    answer = bridge.run(tool_id, every_flag)
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
