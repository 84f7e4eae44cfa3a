"""A fault of calc's own reaches the page as an answer: its message is shown beside the form,
the report is written to the console, kept on the device, listed on the log page and exported.

No input of today's tools is known to fault (calc's own fuzzing sees to that), so the answer
is made by calc's bridge natively with a tool that raises, then handed to the page's forms
module through its public function, the one every answer of the worker goes through."""

from __future__ import annotations

import json

import pytest

from calc import bridge

from .conftest import BOOT_TIMEOUT_MS, open_app, wait_answer

TOOL = "viscosity-at-temperature"
RECEIVE = """async ([answer, inputs]) => {
  const forms = await import(new URL("js/forms.js", document.baseURI).href);
  forms.receive(document.querySelector(`form[data-tool="${answer.tool}"]`), answer, { inputs, units: "metric" });
}"""


class _Faulty:
    """A tool whose method divides by zero, as a slip in calc would."""

    def run(self, inputs, system, examples=False):
        return {"kv": 1 / 0}


@pytest.fixture
def bug_answer(monkeypatch):
    monkeypatch.setattr(bridge.registry, "get", lambda tool_id: _Faulty())
    answer = bridge.run(TOOL, {"temp": "45"}, examples=True)
    monkeypatch.undo()
    assert answer["ok"] is False and "ZeroDivisionError" in answer["bug"]["error"]
    return answer


def _kept(page):
    return page.evaluate("() => JSON.parse(localStorage.getItem('sumpside.bugs') || '[]')")


def test_a_fault_is_shown_beside_the_form_and_kept(page, base_url, watch, bug_answer):
    open_app(page, base_url, f"#/tool/{TOOL}")
    wait_answer(page, TOOL, "kv")
    form = page.locator(f'form[data-tool="{TOOL}"]')
    page.evaluate(RECEIVE, [bug_answer, {"temp": "45"}])
    assert form.locator("[data-state]").inner_text() == bridge.BUG_MESSAGE
    assert form.get_attribute("data-level") == "error"
    assert not form.locator("[data-error-for]:visible").count()  # no field is to blame
    assert any("ZeroDivisionError" in e and TOOL in e for e in watch.errors), watch.errors
    # The answer before the fault is not saved in its place: Save computes again, and saves
    # only calc's fresh answer to what the form holds.
    form.locator('[data-action="save"]').click()
    form.locator("[data-saved]").filter(has_text="Saved").wait_for(timeout=BOOT_TIMEOUT_MS)
    assert form.get_attribute("data-level") != "error"

    kept = _kept(page)
    assert len(kept) == 1
    report = kept[0]
    assert (report["tool"], report["inputs"], report["units"]) == (TOOL, {"temp": "45"}, "metric")
    assert report["error"] == bug_answer["bug"]["error"] and report["traceback"] == bug_answer["bug"]["traceback"]
    assert report["build"] == page.get_attribute("html", "data-build") and report["at"].endswith("Z")
    # The same fault on the same inputs, shown again, is one report, not two.
    page.evaluate(RECEIVE, [bug_answer, {"temp": "45"}])
    assert len(_kept(page)) == 1

    # Kept on the device: a new load of the log page lists it, to copy or export.
    open_app(page, base_url, "#/log")
    box = page.locator("[data-bugs]")
    box.wait_for(state="visible")
    listed = box.locator(".bug-report")
    assert listed.count() == 1
    text = listed.first.inner_text()
    assert TOOL in text and bug_answer["bug"]["error"] in text and "Traceback" in text and '"temp":"45"' in text
    with page.expect_download() as download:
        box.locator('[data-bugs-action="export"]').click()
    exported = json.loads(open(download.value.path(), encoding="utf-8").read())
    assert exported == kept


def test_only_the_newest_twenty_reports_are_kept(page, base_url, bug_answer):
    open_app(page, base_url, f"#/tool/{TOOL}")
    for temp in range(25):
        page.evaluate(RECEIVE, [bug_answer, {"temp": str(temp)}])
    kept = _kept(page)
    assert [r["inputs"]["temp"] for r in kept] == [str(t) for t in range(24, 4, -1)]
    open_app(page, base_url, "#/log")
    assert page.locator("[data-bugs] .bug-report").count() == 20
    page.once("dialog", lambda dialog: dialog.accept())
    page.click('[data-bugs-action="clear"]')
    assert page.locator("[data-bugs]").is_hidden() and _kept(page) == []
