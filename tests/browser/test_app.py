"""The built app in headless Chromium: every tool computes what the CLI computes, bad input
is shown beside its field, it works offline, nothing leaves 127.0.0.1, no console errors."""

from __future__ import annotations

from urllib.parse import urlparse

import pytest

from calc import bridge
from calc.kernel import registry

from .conftest import (BOOT_TIMEOUT_MS, PHONE, add_machine, choose_machine, fill_example,
                       open_app, phone_page, wait_answer)

TOOLS = [t for t in registry.tools() if not t.startswith("checklist-")]


@pytest.fixture(scope="module")
def shared_page(browser, base_url):
    """One page for the sweep over every tool: the worker boots once."""
    with phone_page(browser, base_url) as shared:
        yield shared


def _answer_of(page, tool):
    page.evaluate("id => { location.hash = '#/tool/' + id; }", tool)
    form = f'form[data-tool="{tool}"]'
    fill_example(page, tool)
    return {el.get_attribute("data-out"): el.inner_text()
            for el in page.query_selector_all(f"{form} [data-out]")}


@pytest.mark.parametrize("tool", TOOLS)
def test_every_tool_shows_the_cli_answer(shared_page, tool):
    page, watch = shared_page
    shown = _answer_of(page, tool)
    expected = bridge.run(tool, {}, examples=True)
    assert expected["ok"]
    for key, text in expected["text"].items():
        assert shown[key] == text, f"{tool}.{key}"
    assert page.locator(f'form[data-tool="{tool}"] [data-verdicts] li').count() == len(expected["verdicts"])
    assert not watch.errors


def test_first_tool_numbers_match_the_issue_example(page, base_url, watch):
    open_app(page, base_url, "#/tool/viscosity-at-temperature")
    fill_example(page, "viscosity-at-temperature")
    form = page.locator('form[data-tool="viscosity-at-temperature"]')
    form.locator('[name="kv40"]').fill("46")
    form.locator('[name="kv100"]').fill("6,8")  # a decimal comma, as typed on many phones
    form.locator('[name="temp"]').fill("60")
    page.wait_for_function("""() => document.querySelector(
        'form[data-tool="viscosity-at-temperature"] [data-out="kv"]').textContent === '20.6 cSt'""")
    cli = bridge.run("viscosity-at-temperature", {"kv40": "46", "kv100": "6.8", "temp": "60"}, examples=True)
    for key in ("t_start", "t_opt_cold", "t_opt_hot", "t_min"):
        assert form.locator(f'[data-out="{key}"]').inner_text() == cli["text"][key]
    assert form.locator('input[name="kv40"]').get_attribute("inputmode") == "decimal"
    assert not watch.errors


@pytest.mark.parametrize("field, typed, message", [
    ("kv100", "60", "lower viscosity"),           # thicker when warmer
    ("kv40", "lots", "must be a number"),          # text in a number field
    ("temp", "-300", "absolute zero"),             # below absolute zero
])
def test_bad_input_is_shown_beside_its_field(page, base_url, watch, field, typed, message):
    open_app(page, base_url, "#/tool/viscosity-at-temperature")
    fill_example(page, "viscosity-at-temperature")
    form = page.locator('form[data-tool="viscosity-at-temperature"]')
    wait_answer(page, "viscosity-at-temperature", "kv")
    form.locator(f'[name="{field}"]').fill(typed)
    error = form.locator(f'[data-error-for="{field}"]')
    error.wait_for(state="visible", timeout=BOOT_TIMEOUT_MS)
    assert message in error.inner_text()
    assert form.locator(f'[name="{field}"]').get_attribute("aria-invalid") == "true"
    # Nothing broke: a good value brings the answer back.
    form.locator(f'[name="{field}"]').fill({"kv100": "6.8", "kv40": "46", "temp": "60"}[field])
    error.wait_for(state="hidden")
    assert wait_answer(page, "viscosity-at-temperature", "kv").endswith("cSt")
    assert not watch.errors


def test_us_units_convert_fields_and_answers(page, base_url, watch):
    open_app(page, base_url, "#/tool/viscosity-at-temperature")
    fill_example(page, "viscosity-at-temperature")
    form = page.locator('form[data-tool="viscosity-at-temperature"]')
    form.locator('[name="temp"]').fill("60")
    page.wait_for_function("""() => document.querySelector(
        'form[data-tool="viscosity-at-temperature"] [data-out="kv"]').textContent === '20.6 cSt'""")
    page.click('.unit-switch button[data-units="us"]')
    page.wait_for_function("""() => document.querySelector(
        'form[data-tool="viscosity-at-temperature"] [name="temp"]').value === '140'""")
    page.wait_for_function("""() => document.querySelector(
        'form[data-tool="viscosity-at-temperature"] [data-out="t_min"]').textContent.endsWith('°F')""")
    assert form.locator('[data-out="kv"]').inner_text() == "20.6 cSt"
    # The choice is kept across a reload.
    open_app(page, base_url, "#/tool/viscosity-at-temperature")
    fill_example(page, "viscosity-at-temperature")
    assert page.get_attribute("html", "data-units") == "us"
    assert not watch.errors


def test_shell_is_usable_before_python(page, base_url):
    # Navigation, cautions and checklists are static HTML: reachable before the worker answers.
    page.goto(base_url)
    page.wait_for_selector("html[data-shell]")
    page.click("text=Cautions")
    assert page.locator("#view-cautions").is_visible()
    assert "Injection injuries" in page.inner_text("#view-cautions")


def test_offline_reload_computes_and_no_request_leaves_the_origin(page, context, base_url, watch):
    open_app(page, base_url, "#/tool/viscosity-at-temperature")
    fill_example(page, "viscosity-at-temperature")
    # The worker precaches the whole build, then claims the page.
    page.wait_for_function("() => navigator.serviceWorker.controller !== null", timeout=BOOT_TIMEOUT_MS)
    context.set_offline(True)
    try:
        open_app(page, base_url, "#/tool/viscosity-at-temperature")
        fill_example(page, "viscosity-at-temperature")
        page.locator('form[data-tool="viscosity-at-temperature"] [name="temp"]').fill("60")
        page.wait_for_function("""() => document.querySelector(
            'form[data-tool="viscosity-at-temperature"] [data-out="kv"]').textContent === '20.6 cSt'""")
    finally:
        context.set_offline(False)
    assert watch.requests, "the page made requests"
    foreign = [u for u in watch.requests if not u.startswith(base_url) and not u.startswith(("blob:", "data:"))]
    assert not foreign
    assert not watch.errors


def test_page_declares_a_strict_content_security_policy(page, base_url):
    page.goto(base_url)
    policy = page.get_attribute('meta[http-equiv="Content-Security-Policy"]', "content")
    assert "script-src 'self' 'wasm-unsafe-eval'" in policy and "unsafe-inline" not in policy
    assert page.locator("script:not([src])").count() == 0
    assert page.locator("[style]").count() == 0


def test_viscosity_chart_is_drawn(page, base_url):
    open_app(page, base_url, "#/tool/viscosity-at-temperature")
    fill_example(page, "viscosity-at-temperature")
    wait_answer(page, "viscosity-at-temperature", "kv")
    page.wait_for_selector('form[data-tool="viscosity-at-temperature"] [data-chart] svg')
    box = page.locator('form[data-tool="viscosity-at-temperature"] [data-chart] svg').bounding_box()
    assert box["width"] <= PHONE["width"] and box["height"] > 150


def test_landscape_phone_has_no_sideways_scroll(browser, base_url):
    context = browser.new_context(viewport={"width": 740, "height": 360})
    page = context.new_page()
    open_app(page, base_url, "#/tool/viscosity-at-temperature")
    fill_example(page, "viscosity-at-temperature")
    wait_answer(page, "viscosity-at-temperature", "kv")
    assert page.evaluate("() => document.documentElement.scrollWidth <= window.innerWidth + 1")
    context.close()


def test_touch_targets_are_large(page, base_url):
    page.goto(base_url + "#/tool/viscosity-at-temperature")
    page.wait_for_selector("html[data-shell]")
    for selector in ('form[data-tool="viscosity-at-temperature"] input[name="kv40"]',
                     'form[data-tool="viscosity-at-temperature"] button[type="submit"]',
                     ".unit-switch button"):
        box = page.locator(selector).first.bounding_box()
        assert box["height"] >= 44, selector  # 44 px: the usual minimum for a fingertip


def test_no_answer_blocks_the_page(page, base_url):
    # Typing fast never freezes the page: Python runs in the worker, never in the page, and
    # the page renders only the newest answer: in the end all of it is the last value's.
    open_app(page, base_url, "#/tool/viscosity-at-temperature")
    fill_example(page, "viscosity-at-temperature")
    form = page.locator('form[data-tool="viscosity-at-temperature"]')
    field = form.locator('[name="temp"]')
    for value in ("1", "12", "-5", "70", "45"):
        field.fill(value)
    expected = bridge.run("viscosity-at-temperature", {"temp": "45"}, examples=True)
    page.wait_for_function("""() => document.querySelector(
        'form[data-tool="viscosity-at-temperature"] [data-out="kv"]').textContent === %r""" % (
        expected["text"]["kv"],))
    for key, text in expected["text"].items():
        assert form.locator(f'[data-out="{key}"]').inner_text() == text, key
    shown = [li.inner_text() for li in form.locator("[data-verdicts] li").all()]
    assert len(shown) == len(expected["verdicts"])
    assert all(v["message"] in text for v, text in zip(expected["verdicts"], shown)), shown
    assert any(urlparse(w.url).path.endswith("/worker.js") for w in page.workers)
    assert page.evaluate("() => typeof loadPyodide === 'undefined' && typeof pyodide === 'undefined'")


def test_a_tool_prints_with_machine_date_and_verdict(page, base_url, watch):
    pypdf = pytest.importorskip("pypdf")
    import io
    open_app(page, base_url, "#/tool/viscosity-at-temperature")
    fill_example(page, "viscosity-at-temperature")
    choose_machine(page, add_machine(page, {"name": "Container handler 12, quay 3"}))
    kv = wait_answer(page, "viscosity-at-temperature", "kv")
    page.emulate_media(media="print")
    reader = pypdf.PdfReader(io.BytesIO(page.pdf(format="A4")))
    text = " ".join(" ".join(p.extract_text() for p in reader.pages).split())
    assert len(reader.pages) <= 2
    assert "Container handler 12, quay 3" in text and kv in text
    assert "Compute" not in text  # no buttons on paper
    assert not watch.errors
