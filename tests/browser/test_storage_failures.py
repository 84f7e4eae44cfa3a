"""Storage that fails says so, and offline use is claimed only when it is true.

Each test reproduces one failure a phone meets: the app's cache cleared while the page is
open, a storage quota too small for the build, and a browser whose database refuses to open
(a private window). The page must say what happened in words, never show as saved what was
not, and repair what it can once the network is back."""

from __future__ import annotations

import pytest

from .conftest import BOOT_TIMEOUT_MS, PHONE, Watch, open_app, wait_answer

OFFLINE = "#offline-status"


def _offline_state(page, state: str) -> str:
    page.wait_for_function("s => document.querySelector('#offline-status').dataset.offline === s",
                           arg=state, timeout=BOOT_TIMEOUT_MS)
    return page.inner_text(OFFLINE)


def test_works_offline_is_said_once_cached_and_a_cleared_cache_is_refilled(page, context, base_url, watch):
    open_app(page, base_url, "#/tool/viscosity-at-temperature")
    assert _offline_state(page, "ready") == "Works offline"
    # The phone (or the user, in the browser's settings) clears the app's cache with the page open.
    assert page.evaluate("async () => { const names = await caches.keys();"
                         " await Promise.all(names.map((n) => caches.delete(n))); return names.length; }") >= 1
    # The next start finds files missing and, the network being there, fetches them again.
    open_app(page, base_url, "#/tool/viscosity-at-temperature")
    assert _offline_state(page, "ready") == "Works offline"
    assert page.evaluate("async () => (await Promise.all((await caches.keys()).map(async (n) =>"
                         " (await (await caches.open(n)).keys()).length))).reduce((a, b) => a + b, 0)") > 20
    # And it really does: an offline reload starts and computes.
    context.set_offline(True)
    try:
        open_app(page, base_url, "#/tool/viscosity-at-temperature")
        page.locator('form[data-tool="viscosity-at-temperature"] [name="temp"]').fill("60")
        assert wait_answer(page, "viscosity-at-temperature", "kv") == "20.6 cSt"
    finally:
        context.set_offline(False)
    assert not watch.errors


def test_a_cleared_cache_found_offline_is_named_and_refilled_when_the_network_is_back(page, context, base_url):
    open_app(page, base_url, "#/")
    _offline_state(page, "ready")
    page.evaluate("async () => { for (const n of await caches.keys()) await caches.delete(n); }")
    context.set_offline(True)
    try:
        # The page is open; it comes back into view with the network gone: the state is checked again.
        page.evaluate("() => document.dispatchEvent(new Event('visibilitychange'))")
        text = _offline_state(page, "missing")
        assert "missing" in text and "when the network is back" in text
    finally:
        context.set_offline(False)
    page.evaluate("() => window.dispatchEvent(new Event('online'))")
    assert _offline_state(page, "ready") == "Works offline"


def _cdp_quota(context, page, base_url: str, size: int):
    session = context.new_cdp_session(page)
    session.send("Storage.overrideQuotaForOrigin", {"origin": base_url.rstrip("/"), "quotaSize": size})
    return session


def test_a_quota_too_small_for_the_build_never_claims_offline_use(browser, base_url):
    # Chromium's quota override (DevTools protocol Storage.overrideQuotaForOrigin): 3 MB, far
    # less than the build's cache needs. The install fails; the page says so and keeps working.
    watch = Watch()
    context = browser.new_context(viewport=PHONE, service_workers="allow")
    watch.attach(context)
    try:
        page = context.new_page()
        page.goto("about:blank")
        _cdp_quota(context, page, base_url, 3 * 1024 * 1024)
        open_app(page, base_url, "#/tool/viscosity-at-temperature")
        text = _offline_state(page, "failed")
        assert text.startswith("Not saved for offline use") and "storage" in text
        assert "Works offline" not in page.inner_text("header")
        assert wait_answer(page, "viscosity-at-temperature", "kv")  # the calculator still answers
    finally:
        context.close()


# A browser whose database cannot open, as a private window of some browsers does: the
# request fails with InvalidStateError.
NO_DATABASE = """
IDBFactory.prototype.open = function () {
  const request = { result: undefined, error: null };
  setTimeout(() => {
    request.error = new DOMException("A mutation operation was attempted on a database that did not allow mutations.", "InvalidStateError");
    if (request.onerror) request.onerror({ target: request });
  });
  return request;
};
"""
CANNOT_KEEP = "does not let the app keep data here"


@pytest.fixture
def no_database(browser):
    watch = Watch()
    context = browser.new_context(viewport=PHONE, service_workers="block")
    context.add_init_script(NO_DATABASE)
    watch.attach(context)
    yield context.new_page(), watch
    context.close()


def test_without_a_database_save_log_machines_and_export_say_so(no_database, base_url):
    page, watch = no_database
    tool = "viscosity-at-temperature"
    open_app(page, base_url, f"#/tool/{tool}")
    wait_answer(page, tool, "kv")
    page.click(f'form[data-tool="{tool}"] [data-action="save"]')
    state = f'form[data-tool="{tool}"] [data-saved]'
    page.wait_for_function("s => document.querySelector(s).textContent.startsWith('Not saved')", arg=state)
    assert CANNOT_KEEP in page.inner_text(state)

    open_app(page, base_url, "#/log")
    page.wait_for_function("t => document.querySelector('[data-view=log]').textContent.includes(t)", arg=CANNOT_KEEP)
    assert "No saved readings yet" not in page.inner_text("[data-view=log]")

    open_app(page, base_url, "#/machines")
    page.wait_for_function("t => document.querySelector('[data-view=machines]').textContent.includes(t)", arg=CANNOT_KEEP)
    page.click('[data-kit="export-json"]')
    page.wait_for_function("t => document.querySelector('[data-kit-status]').textContent.includes(t)", arg=CANNOT_KEEP)
    assert not [e for e in watch.errors if "does not let" not in e], watch.errors


def _big_export(readings: int) -> bytes:
    """An export of `readings` copies of one real reading (calc made it), each with a long note."""
    import json
    import uuid

    from calc.machines import records

    made = records.new_reading("viscosity-at-temperature", {"temp": "60"}, "metric", None,
                               "2026-03-04T09:15:00+01:00", examples=True)["record"]
    return json.dumps({"format": "sumpside-export", "version": 1, "exported": made["time"],
                       "machines": [], "readings": [
                           {**made, "id": uuid.uuid4().hex, "note": "Sample valve 3, hot. " * 95}
                           for _ in range(readings)]}).encode()


def test_an_import_larger_than_the_quota_fails_in_words_and_adds_nothing(browser, base_url):
    context = browser.new_context(viewport=PHONE, service_workers="block")
    try:
        page = context.new_page()
        page.goto("about:blank")
        _cdp_quota(context, page, base_url, 1024 * 1024)
        open_app(page, base_url, "#/machines")
        page.set_input_files('[data-kit="import"]', files=[{
            "name": "big.json", "mimeType": "application/json", "buffer": _big_export(1500)}])
        page.wait_for_function("() => document.querySelector('[data-kit-status]').textContent.startsWith('Import failed')",
                               timeout=BOOT_TIMEOUT_MS)
        assert "storage for this app is full" in page.inner_text("[data-kit-status]")
        assert page.evaluate("""async () => (await (await import(new URL("js/kit.js", document.baseURI).href))
                                .allReadings()).length""") == 0
    finally:
        context.close()
