"""The forms on a 360 x 760 phone: the answer in view while typing, blank means not given, a
word beside a mistyped value, a mode's fields only in that mode, a minus key, an example that
can be undone, checklists that keep their results and notes, and the home page's search."""

from __future__ import annotations

import pytest

from calc import bridge
from calc.kernel import registry

from .conftest import BOOT_TIMEOUT_MS, fill_example, open_app, phone_page

PHONE_760 = {"width": 360, "height": 760}
TOOLS = list(registry.tools())


@pytest.fixture(scope="module")
def phone(browser, base_url):
    with phone_page(browser, base_url, PHONE_760) as shared:
        yield shared


def _go(page, tool):
    page.evaluate("id => { location.hash = '#/tool/' + id; }", tool)
    page.wait_for_selector(f'[data-view="tool/{tool}"]:not([hidden])')


def _form(tool):
    return f'form[data-tool="{tool}"]'


def _with_example(page, tool):
    """The tool in view with its examples in the blank fields; its form's selector."""
    _go(page, tool)
    fill_example(page, tool)
    return _form(tool)


@pytest.mark.parametrize("tool", TOOLS)
def test_the_verdict_is_in_view_while_the_first_field_has_focus(phone, tool):
    page, watch = phone
    _go(page, tool)
    fill_example(page, tool)
    first = page.locator(f"{_form(tool)} :is(input, select, textarea)[name]:visible").first
    first.focus()
    bar = page.locator(f"{_form(tool)} [data-bar]")
    box, field = bar.bounding_box(), first.bounding_box()
    assert box["y"] >= 0 and box["y"] + box["height"] <= PHONE_760["height"], (tool, box)
    assert field["y"] >= 0 and field["y"] + field["height"] <= PHONE_760["height"], (tool, field)
    answer = bridge.run(tool, {}, examples=True)
    said = bar.inner_text()
    assert answer["text"][answer["headline"][0]] in said, (tool, said)
    assert {"ok": "OK", "watch": "WATCH", "act": "ACT"}[answer["level"]] in said.upper()
    assert not watch.errors


def test_a_cleared_reading_is_an_error_beside_it_not_the_old_answer(phone):
    page, _ = phone
    tool = "viscosity-at-temperature"
    _with_example(page, tool)
    page.fill(f'{_form(tool)} [name="kv40"]', "")
    page.wait_for_function("f => document.querySelector(f).dataset.level === 'error'", arg=_form(tool))
    error = page.locator(f'{_form(tool)} [data-error-for="kv40"]')
    assert error.is_visible() and error.inner_text() == "Viscosity, reading 1 is needed"
    assert "Viscosity, reading 1 is needed" in page.inner_text(f"{_form(tool)} [data-bar]")


def test_a_form_starts_blank_with_examples_only_as_placeholders(browser, base_url):
    context = browser.new_context(viewport=PHONE_760)
    page = context.new_page()
    open_app(page, base_url, "#/tool/oil-condition")
    form = _form("oil-condition")
    page.wait_for_function("f => document.querySelector(f).dataset.level", arg=form)
    now = page.locator(f'{form} [name="kv40_now"]')
    assert now.input_value() == "" and now.get_attribute("placeholder") == "e.g. 49.5"
    # A limit shows its standard value: blank would take it, so it is in view.
    page.click(f'{form} [data-group="limits"] > summary')
    assert page.locator(f'{form} [name="visc_watch"]').input_value() == "5"
    assert page.locator(f"{form} [data-bar]").inner_text().startswith("2 fields to check")
    # Fill an example, then undo it: the fields are blank again.
    page.click(f'{form} [data-action="example"]')
    assert now.input_value() == "49.5"
    assert "not readings" in page.inner_text(f"{form} [data-example-state]")
    page.click(f'{form} [data-action="undo"]')
    assert now.input_value() == ""
    context.close()


def test_a_mistyped_value_gets_a_word_beside_it(phone):
    page, _ = phone
    tool = "oil-condition"
    _with_example(page, tool)
    page.fill(f'{_form(tool)} [name="kv40_now"]', "6846")
    notice = page.locator(f'{_form(tool)} [data-notice-for="kv40_now"]')
    notice.wait_for(state="visible", timeout=BOOT_TIMEOUT_MS)
    assert "above the usual range" in notice.inner_text() and "check the reading" in notice.inner_text()
    page.fill(f'{_form(tool)} [name="kv40_now"]', "49")
    notice.wait_for(state="hidden", timeout=BOOT_TIMEOUT_MS)


def test_fields_the_mode_does_not_use_are_hidden_and_not_sent(phone):
    page, _ = phone
    tool = "viscosity-at-temperature"
    form = _with_example(page, tool)
    assert page.locator(f'{form} [name="kv40"]').is_visible()
    assert not page.locator(f'{form} [name="vi"]').is_visible()
    page.select_option(f'{form} [name="oil_from"]', "grade")
    page.wait_for_function("f => !document.querySelector(f + ' [name=kv40]').checkVisibility()", arg=form)
    page.locator(f'{form} [name="vi"]').wait_for(state="visible")
    page.wait_for_function("f => document.querySelector(f).dataset.level !== 'error'", arg=form,
                           timeout=BOOT_TIMEOUT_MS)


def test_a_minus_sign_on_every_keypad(phone):
    page, _ = phone
    tool = "viscosity-at-temperature"
    _go(page, tool)
    form = _form(tool)
    page.select_option(f'{form} [name="oil_from"]', "readings")  # as an earlier test may have left it
    fill_example(page, tool)
    temp = page.locator(f'{form} [name="temp"]')
    minus_five = bridge.run(tool, {"temp": "-5"}, examples=True)["text"]["kv"]  # 904 cSt
    temp.fill("")
    temp.type("-5")
    assert temp.input_value() == "-5"
    page.wait_for_function("([f, t]) => document.querySelector(f + ' [data-out=kv]').textContent === t",
                           arg=[form, minus_five], timeout=BOOT_TIMEOUT_MS)
    temp.fill("5")
    page.wait_for_function("([f, t]) => document.querySelector(f + ' [data-out=kv]').textContent !== t",
                           arg=[form, minus_five], timeout=BOOT_TIMEOUT_MS)
    page.click(f'{form} [data-sign-for="temp"]')
    assert temp.input_value() == "-5"
    page.wait_for_function("([f, t]) => document.querySelector(f + ' [data-out=kv]').textContent === t",
                           arg=[form, minus_five], timeout=BOOT_TIMEOUT_MS)


def test_a_checklist_keeps_one_result_per_check_and_its_notes_across_a_reload(browser, base_url):
    context = browser.new_context(viewport=PHONE_760)
    page = context.new_page()
    name = "checklist-water"
    open_app(page, base_url, f"#/tool/{name}")
    view = f"#view-tool-{name}"
    first = page.locator(f"{view} [data-check]").first
    first.locator('[data-check-state][value="pass"]').check()
    first.locator('[data-check-state][value="fail"]').check()
    assert not first.locator('[data-check-state][value="pass"]').is_checked()  # one choice
    first.locator("[data-check-note]").fill("Drain valve opened, 0.2 L of water")
    page.fill(f"{view} [data-checklist-note]", "Checked with the shift lead")
    page.reload()
    page.wait_for_selector("html[data-ready]", timeout=BOOT_TIMEOUT_MS)
    first = page.locator(f"{view} [data-check]").first
    assert first.locator('[data-check-state][value="fail"]').is_checked()
    assert first.locator("[data-check-note]").input_value() == "Drain valve opened, 0.2 L of water"
    assert page.locator(f"{view} [data-checklist-note]").input_value() == "Checked with the shift lead"
    context.close()


def test_a_cause_without_evidence_is_never_called_likely(phone):
    page, _ = phone
    name = "checklist-water"
    _go(page, name)
    form = _form(name)
    page.wait_for_function("f => document.querySelector(f).dataset.level", arg=form, timeout=BOOT_TIMEOUT_MS)
    words = page.locator(f"#view-tool-{name} [data-word]").all_inner_texts()
    assert words and all(w == "(no evidence yet)" for w in words), words
    page.check(f'{form} [name="milky_oil"]')
    page.wait_for_function("f => document.querySelector(f + ' [data-causes] [data-word]').textContent !== '(no evidence yet)'",
                           arg=f"#view-tool-{name}", timeout=BOOT_TIMEOUT_MS)
    answer = bridge.run(name, {"milky_oil": "yes"}, examples=True)
    top = answer["ranked"][0]
    assert page.locator(f"#view-tool-{name} [data-causes] [data-word]").first.inner_text() == f"({top['word']})"


def test_a_checks_tool_opens_with_the_checklists_readings_and_comes_back_to_the_check(phone):
    page, _ = phone
    name = "checklist-water"
    _go(page, name)
    form = _form(name)
    page.fill(f'{form} [name="ppm"]', "650")
    link = page.locator(f'#view-tool-{name} a.check-tool[href="#/tool/water-in-oil"]').first
    check = link.locator("xpath=ancestor::li[@data-check]").get_attribute("data-check")
    cause = link.locator("xpath=ancestor::section[@data-cause]").get_attribute("data-cause")
    link.click()
    page.wait_for_selector('[data-view="tool/water-in-oil"]:not([hidden])')
    assert page.input_value('form[data-tool="water-in-oil"] [name="ppm"]') == "650"
    page.click('[data-view="tool/water-in-oil"] [data-back] a')
    page.wait_for_selector(f'[data-view="tool/{name}"]:not([hidden])')
    back = page.locator(f'#{name}--{cause} [data-check="{check}"]')
    page.wait_for_function("el => { const r = el.getBoundingClientRect(); return r.top >= 0 && r.bottom <= innerHeight; }",
                           arg=back.element_handle(), timeout=BOOT_TIMEOUT_MS)


def test_the_home_page_finds_a_tool_by_any_word_and_lists_those_used_lately(phone):
    page, _ = phone
    page.evaluate("() => { location.hash = '#/'; }")
    page.fill("[data-find]", "foam")
    visible = page.locator('[data-view="home"] .menu:not([data-recent-list]) li:visible a').evaluate_all(
        "links => links.map(a => a.getAttribute('href'))")
    assert "#/tool/foam-air-tests" in visible and "#/tool/tank-volume" not in visible
    page.fill("[data-find]", "qwertyuiop")
    assert "Nothing found" in page.inner_text("[data-find-count]")
    page.fill("[data-find]", "")
    _go(page, "tank-volume")
    page.evaluate("() => { location.hash = '#/'; }")
    recent = page.locator("[data-recent-list] a").first
    assert recent.get_attribute("href") == "#/tool/tank-volume"


def test_save_waits_for_the_answer_to_what_is_typed_and_refuses_an_error(phone):
    # Typed and saved within the pause before computing: the reading is the answer to 90 degC.
    page, _ = phone
    tool = "viscosity-at-temperature"
    form = _with_example(page, tool)
    page.select_option(f'{form} [name="oil_from"]', "readings")
    page.fill(f'{form} [name="temp"]', "90")
    page.click(f'{form} [data-action="save"]')
    page.locator(f"{form} [data-saved]").filter(has_text="Saved").wait_for(timeout=BOOT_TIMEOUT_MS)
    newest = page.evaluate("""async () => {
      const kit = await import(new URL("js/kit.js", document.baseURI).href);
      const all = await kit.allReadings();
      return all.sort((a, b) => Date.parse(b.time) - Date.parse(a.time))[0];
    }""")
    assert newest["tool"] == tool and newest["inputs"]["temp"] == 90.0
    assert page.inner_text(f'{form} [data-out="kv"]') == bridge.run(tool, {"temp": "90"}, examples=True)["text"]["kv"]
    # A field in error saves nothing, and says so.
    page.fill(f'{form} [name="temp"]', "abc")
    page.click(f'{form} [data-action="save"]')
    page.locator(f"{form} [data-saved]").filter(has_text="Not saved").wait_for(timeout=BOOT_TIMEOUT_MS)


def test_a_malformed_address_lands_on_the_start_page_with_a_note(phone):
    page, watch = phone
    for address in ("#/%", "#/%E0%A4%A", "#/no-such-page"):
        page.evaluate("a => { location.hash = a; }", address)
        page.locator("[data-route-note]").wait_for(state="visible")
        assert page.locator('[data-view="home"]').is_visible()
    page.evaluate("() => { location.hash = '#/'; }")
    page.locator("[data-route-note]").wait_for(state="hidden")
    assert not watch.errors
