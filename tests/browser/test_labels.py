"""Labels for the tanks: the QR code the page draws (segno, in the worker) is read back from
a screenshot by zxing-cpp (tests only) as the app's own address with the card in its
fragment; a second phone that opens that address gets the card as text and adds it, and a
phone that holds another version of the card is asked before anything is replaced."""

from __future__ import annotations

import io

import pytest

from .conftest import BOOT_TIMEOUT_MS, PHONE, Watch, add_machine, open_app

zxingcpp = pytest.importorskip("zxingcpp")
Image = pytest.importorskip("PIL.Image")

CARD = {"name": "Press 12, east hall", "site": "Riverside works, bay 3", "oil_name": "Invented HM 46",
        "grade": "VG 46", "vi": "102", "pump_flow": "120", "working_pressure": "210", "component": "piston",
        "tank_volume": "600", "sample_days": "90"}
MM_PX = 96 / 25.4  # CSS pixels in a millimetre


def _scan(page) -> str:
    code = page.locator(".label .label-code svg").first
    code.wait_for(timeout=BOOT_TIMEOUT_MS)
    shot = Image.open(io.BytesIO(code.screenshot(scale="device")))
    found = zxingcpp.read_barcodes(shot)
    assert len(found) == 1 and found[0].format == zxingcpp.BarcodeFormat.QRCode
    return found[0].text


def test_a_label_is_read_by_a_camera_and_gives_another_phone_the_card(page, browser, base_url, watch):
    open_app(page, base_url, "#/machines")
    press = add_machine(page, CARD)
    open_app(page, base_url, f"#/labels/{press}")
    address = _scan(page)
    assert address.startswith(base_url) and "#/label/1." in address
    label = page.locator(".label").first
    assert int(label.get_attribute("data-qr-version")) <= 15
    words = label.inner_text()
    for said in ("Press 12, east hall", "Invented HM 46", "VG 46", "Cleanliness target, ISO 4406"):
        assert said in words
    # Printed, the code is 4 cm square and two labels fit across A4 or Letter.
    page.emulate_media(media="print")
    box = page.locator(".label .label-code svg").first.bounding_box()
    assert abs(box["width"] / MM_PX - 40) < 1 and abs(box["height"] / MM_PX - 40) < 1
    assert page.locator(".label").first.bounding_box()["width"] / MM_PX <= 95
    page.emulate_media(media="screen")

    other_watch = Watch()
    other = browser.new_context(viewport=PHONE)
    other_watch.attach(other)
    try:
        phone = other.new_page()
        phone.goto(address)
        phone.wait_for_selector("html[data-ready]", timeout=BOOT_TIMEOUT_MS)
        state = phone.locator("[data-label-state]")
        state.filter(has_text="not on this phone yet").wait_for(timeout=BOOT_TIMEOUT_MS)
        assert "Riverside works, bay 3" in phone.inner_text("[data-label-card]")
        phone.click("text=Add this machine")
        phone.wait_for_function("() => location.hash.startsWith('#/machine/')", timeout=BOOT_TIMEOUT_MS)
        phone.locator('[data-m="name"]', has_text="Press 12, east hall").wait_for(timeout=BOOT_TIMEOUT_MS)

        # The same label again: nothing to do. After a local edit: asked, never replaced.
        open_app(phone, base_url, address[len(base_url):])
        state.filter(has_text="already").wait_for(timeout=BOOT_TIMEOUT_MS)
        phone.evaluate("""async (id) => {
          const kit = await import(new URL("js/kit.js", document.baseURI).href);
          const previous = await kit.machine(id);
          const shown = await kit.ask("card-view", { machine: previous, units: "metric" });
          const made = await kit.ask("card-check", { card: { ...shown.values, site: "Riverside works, bay 4" },
            units: "metric", id, time: kit.localStamp(), previous });
          await kit.saveMachine(made.machine);
        }""", press)
        open_app(phone, base_url, address[len(base_url):])
        state.filter(has_text="another version").wait_for(timeout=BOOT_TIMEOUT_MS)
        phone.click("text=Keep this phone's card")
        phone.locator('[data-m="site"]', has_text="bay 4").wait_for(timeout=BOOT_TIMEOUT_MS)
        assert not other_watch.errors
    finally:
        other.close()
    assert not watch.errors


def test_a_label_that_is_not_one_says_so_and_changes_nothing(page, base_url, watch):
    open_app(page, base_url, "#/label/1.not-a-real-label")
    page.locator("[data-label-state]", has_text="cannot be read").wait_for(timeout=BOOT_TIMEOUT_MS)
    assert page.locator("[data-label-actions] button").count() == 0
    assert page.evaluate("""async () => (await (await import(new URL("js/kit.js", document.baseURI).href))
                            .allMachines()).length""") == 0
    assert not watch.errors
