"""The log survives reloads and a new build; a new build is offered, then taken whole."""

from __future__ import annotations

import json
import re

from .conftest import BOOT_TIMEOUT_MS, copy_dist, open_app, wait_answer


def _save_one(page):
    wait_answer(page, "viscosity-at-temperature", "kv")
    page.fill("#job-machine", "Press 7, north bay")
    page.click('form[data-tool="viscosity-at-temperature"] [data-action="save"]')
    page.wait_for_function("""() => document.querySelector(
        'form[data-tool="viscosity-at-temperature"] [data-state]').textContent.includes('Saved')""")


def test_log_survives_reload_and_exports(page, base_url, watch):
    open_app(page, base_url, "#/tool/viscosity-at-temperature")
    _save_one(page)
    page.reload()
    open_app(page, base_url, "#/log")
    entry = page.locator("[data-log-list] article")
    entry.first.wait_for()
    assert "Press 7, north bay" in entry.first.inner_text()
    with page.expect_download() as download:
        page.click('[data-log="export-json"]')
    exported = json.loads(open(download.value.path(), encoding="utf-8").read())
    assert exported[0]["tool"] == "viscosity-at-temperature" and exported[0]["text"]["kv"].endswith("cSt")
    with page.expect_download() as download:
        page.click('[data-log="export-csv"]')
    assert "viscosity-at-temperature" in open(download.value.path(), encoding="utf-8").read()
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
    form.locator('[data-action="reset"]').click()
    assert form.locator('[name="kv40"]').input_value() == "46"
    assert not watch.errors


def test_two_saved_readings_draw_a_trend(page, base_url, watch):
    open_app(page, base_url, "#/tool/viscosity-at-temperature")
    _save_one(page)
    page.locator('form[data-tool="viscosity-at-temperature"] [name="temp"]').fill("70")
    page.wait_for_function("""() => document.querySelector(
        'form[data-tool="viscosity-at-temperature"] [data-out="kv"]').textContent !== '30.0 cSt'""")
    _save_one(page)
    open_app(page, base_url, "#/log")
    trend = page.locator("[data-log-list] figure.trend-figure svg polyline")
    trend.wait_for()
    assert len(trend.get_attribute("points").split()) == 2
    assert not watch.errors


def test_new_build_is_offered_then_taken_whole_and_the_log_is_kept(page, dist, serve_dir, tmp_path, watch):
    site = copy_dist(dist, tmp_path)
    base = serve_dir(site)
    open_app(page, base, "#/tool/viscosity-at-temperature")
    page.wait_for_function("() => navigator.serviceWorker.controller !== null", timeout=BOOT_TIMEOUT_MS)
    old_build = page.get_attribute("html", "data-build")
    _save_one(page)

    # A new build arrives: a changed page and a service worker with a new id and cache.
    new_build = "feedfacecafe"
    page_file = site / "index.html"
    page_file.write_text(page_file.read_text(encoding="utf-8").replace(old_build, new_build), encoding="utf-8")
    sw = site / "sw.js"
    sw.write_text(re.sub(r'const BUILD = "[^"]+"', f'const BUILD = "{new_build}"', sw.read_text(encoding="utf-8")),
                  encoding="utf-8")

    page.evaluate("async () => (await navigator.serviceWorker.getRegistration()).update()")
    page.locator("#update-banner").wait_for(state="visible", timeout=BOOT_TIMEOUT_MS)
    # Until the user says so, the old build keeps serving.
    assert page.get_attribute("html", "data-build") == old_build
    with page.expect_navigation(timeout=BOOT_TIMEOUT_MS):
        page.click("#update-apply")
    page.wait_for_selector("html[data-ready]", timeout=BOOT_TIMEOUT_MS)
    assert page.get_attribute("html", "data-build") == new_build
    caches = page.evaluate("() => caches.keys()")
    assert caches == [f"sumpside-{new_build}"]
    open_app(page, base, "#/log")
    page.locator("[data-log-list] article").first.wait_for()
    assert "Press 7, north bay" in page.inner_text("[data-log-list]")
    assert not watch.errors
