"""The log survives reloads and draws trends; a new build keeps it (test_updates.py)."""

from __future__ import annotations

import json
from xml.etree import ElementTree

from calc.machines import card, condition

from .conftest import add_machine, choose_machine, open_app, wait_answer


READINGS_OF = """async (id) => (await import(new URL("js/kit.js", document.baseURI).href)).readingsOf(id)"""


def _save_one(page, tool="viscosity-at-temperature", key="kv", machine=None):
    """Save the tool's answer as a reading of `machine` (made and chosen here if not given)."""
    wait_answer(page, tool, key)
    if machine is None:
        machine = add_machine(page, {"name": "Press 7, north bay"})
        choose_machine(page, machine)
    page.click(f'form[data-tool="{tool}"] [data-action="save"]')
    page.wait_for_function("""t => document.querySelector(
        `form[data-tool="${t}"] [data-saved]`).textContent.includes('Saved')""", arg=tool)
    return machine


def test_log_survives_reload_and_exports(page, base_url, watch):
    open_app(page, base_url, "#/tool/viscosity-at-temperature")
    _save_one(page)
    page.reload()
    open_app(page, base_url, "#/log")
    entry = page.locator("[data-log-list] article")
    entry.first.wait_for()
    text = entry.first.inner_text()
    assert "Press 7, north bay" in text and "Viscosity at oil temperature" in text  # labels, not keys
    open_app(page, base_url, "#/machines")
    with page.expect_download() as download:
        page.click('[data-kit="export-json"]')
    exported = json.loads(open(download.value.path(), encoding="utf-8").read())
    assert exported["format"] == "sumpside-export"
    assert exported["readings"][0]["tool"] == "viscosity-at-temperature"
    assert exported["machines"][0]["card"]["name"] == "Press 7, north bay"
    with page.expect_download() as download:
        page.click('[data-kit="export-csv"]')
    csv_text = open(download.value.path(), encoding="utf-8-sig").read()
    assert csv_text.startswith("Time,Machine,") and "Viscosity at temperature" in csv_text
    assert not watch.errors


def test_typed_values_survive_a_reload(page, base_url, watch):
    open_app(page, base_url, "#/tool/viscosity-at-temperature")
    form = page.locator('form[data-tool="viscosity-at-temperature"]')
    form.locator('[name="kv40"]').fill("68")
    form.locator('[name="pump"]').select_option("gear")
    page.wait_for_timeout(400)  # past the debounce
    page.reload()
    page.wait_for_selector("html[data-ready]")
    assert form.locator('[name="kv40"]').input_value() == "68"
    assert form.locator('[name="pump"]').input_value() == "gear"
    # "Fill an example" fills only the blank fields, and can be undone.
    form.locator('[data-action="example"]').click()
    assert form.locator('[name="temp1"]').input_value() == "40"
    assert form.locator('[name="kv40"]').input_value() == "68"  # what was typed stays
    form.locator('[data-action="undo"]').click()
    assert form.locator('[name="temp1"]').input_value() == ""
    assert not watch.errors


def _svg_text(svg: str) -> str:
    return "".join(ElementTree.fromstring(svg).itertext())


def test_two_saved_readings_draw_a_trend_on_the_machine_page(page, base_url, watch):
    # viscosity-grade's kv40 is a followed quantity: two saved readings make calc draw a trend.
    tool = "viscosity-grade"
    open_app(page, base_url, f"#/tool/{tool}")
    machine = _save_one(page, tool, "kv40")
    first = wait_answer(page, tool, "kv40")
    page.locator(f'form[data-tool="{tool}"] [name="kv"]').fill("52")
    page.wait_for_function("""([t, old]) => document.querySelector(
        `form[data-tool="${t}"] [data-out="kv40"]`).textContent !== old""", arg=[tool, first])
    _save_one(page, tool, "kv40", machine)
    open_app(page, base_url, f"#/machine/{machine}")
    figure = page.locator('[data-m="trends"] figure.trend-figure')
    figure.locator("svg").first.wait_for()
    saved = page.evaluate(READINGS_OF, machine)
    stored = page.evaluate("""async (id) => (await import(new URL("js/kit.js", document.baseURI).href)).machine(id)""",
                           machine)
    expected = condition.trends(card.facts(stored["card"])[0], saved, "metric")
    assert [t["points"] for t in expected] == [2]
    assert figure.count() == 1
    assert figure.locator("figcaption").inner_text().startswith(expected[0]["title"])
    svg = figure.locator("svg")
    assert "chart-trend" in svg.get_attribute("class")
    assert svg.locator(".trend-point").count() == 2
    # Every word and number of the chart as calc drew it (ticks, dates, title, description).
    assert svg.evaluate("el => el.textContent") == _svg_text(expected[0]["svg"])
    assert not watch.errors
