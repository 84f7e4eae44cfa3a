"""The field kit by machine, on a phone: a card made once fills every tool; readings, trends,
what is due and the visit report come from calc and stay true offline and in US units."""

from __future__ import annotations

import io
import json
import re
from datetime import date, timedelta

import pytest

from .conftest import BOOT_TIMEOUT_MS, add_machine, choose_machine, open_app, wait_answer

KIT = 'await import(new URL("js/kit.js", document.baseURI).href)'
# The card a technician types once (an invented machine): nothing here is typed again.
CARD = {"name": "Saw line 3", "site": "Invented Works, bay 4", "grade": "VG 46", "vi": "100",
        "oil_family": "mineral-aw", "tank_shape": "rectangular", "tank_length": "1000",
        "tank_width": "600", "tank_height": "700", "working_level": "500", "pump_flow": "60",
        "temp_cold_start": "10", "temp_running": "45", "component": "piston",
        "working_pressure": "200", "sample_days": "90", "filter_days": "180", "density": "870"}
# The card's facts each reading below takes rather than having them typed.
FACTS = {"water-in-oil": {"oil", "temp_cold", "oil_volume", "density"},
         "oil-condition": {"kv40_new", "oil", "target4", "target6", "target14"},
         "checklist-water": {"oil"}}


def _readings(page, machine_id):
    return page.evaluate(f"async (id) => ({KIT}).readingsOf(id)", machine_id)


def _stored_machine(page, machine_id):
    return page.evaluate(f"async (id) => ({KIT}).machine(id)", machine_id)


def _make_card_by_hand(page, base_url):
    open_app(page, base_url, "#/card/new")
    form = page.locator("[data-card-form]")
    for key, value in CARD.items():
        field = form.locator(f'[name="{key}"]')
        if field.evaluate("el => el.tagName") == "SELECT":
            field.select_option(value)
        else:
            field.fill(value)
    changed = (date.today() - timedelta(days=175)).isoformat()
    form.locator('[name="filter_changed"]').fill(changed)
    form.locator('button[type="submit"]').click()
    page.wait_for_function("() => location.hash.startsWith('#/machine/')", timeout=BOOT_TIMEOUT_MS)
    return page.evaluate("() => decodeURIComponent(location.hash.split('/')[2])")


def _take(page, tool, typed, ticks=()):
    """Open `tool` from the machine page, type only the reading, save it."""
    page.click(f'[data-m="tools"] a[href="#/tool/{tool}"]')
    form = page.locator(f'form[data-tool="{tool}"]')
    form.locator("[data-for-machine]:not([hidden])").wait_for(timeout=BOOT_TIMEOUT_MS)
    for key in FACTS[tool]:  # filled from the card, marked so, not typed
        field = form.locator(f'[name="{key}"]')
        assert field.get_attribute("data-from-card") == "1", (tool, key)
        # Marked (in the machine's facts, folded away once the card filled them).
        assert "from the card" in form.locator(f'[data-bound]:has([name="{key}"]) [data-card-mark]').text_content()
    for key, value in typed.items():
        field = form.locator(f'[name="{key}"]')
        if not field.is_visible():  # a machine fact, folded away: opened to type over it
            form.locator(f'details:has([name="{key}"]) > summary').click()
        field.fill(value)
    for key in ticks:
        form.locator(f'[name="{key}"]').check()
    page.wait_for_timeout(400)  # past the debounce: the answer is to what was typed
    form.locator('[data-action="save"]').click()
    form.locator("[data-saved]").filter(has_text="Saved").wait_for(timeout=BOOT_TIMEOUT_MS)
    form.locator('[data-saved] a').click()  # "Open its page"
    page.wait_for_selector('[data-m="latest"] tr', timeout=BOOT_TIMEOUT_MS)


def test_one_card_three_readings_offline_machine_page_us_units_and_visit(page, context, base_url, watch):
    pypdf = pytest.importorskip("pypdf")
    machine_id = _make_card_by_hand(page, base_url)
    _take(page, "water-in-oil", {"rh": "40", "temp": "50"})
    _take(page, "oil-condition", {"kv40_now": "49", "an_new": "0.4", "an_now": "0.6", "ppm": "300",
                                  "temp": "55", "code4": "19", "code6": "17", "code14": "13"})
    _take(page, "checklist-water", {"ppm": "300"}, ticks=("milky_oil",))

    # Saved as calc parsed them: metric inputs, the card's facts named as taken from it.
    saved = {r["tool"]: r for r in _readings(page, machine_id)}
    assert set(saved) == set(FACTS)
    for tool, facts in FACTS.items():
        assert facts <= set(saved[tool]["from_card"]), tool
        assert saved[tool]["machine"] == machine_id and re.search(r"[+-]\d\d:\d\d$", saved[tool]["time"])
    # 1000 x 600 mm at 500 mm is 300 L (by hand); VG 46's mid-point is 46 cSt (ISO 3448).
    assert saved["water-in-oil"]["inputs"]["oil_volume"] == pytest.approx(300.0)
    assert saved["oil-condition"]["inputs"]["kv40_new"] == 46.0

    # Offline, after a reload: the machine page from what is on the phone.
    context.set_offline(True)
    page.reload()
    open_app(page, base_url, f"#/machine/{machine_id}")
    page.wait_for_selector('[data-m="latest"] tr', timeout=BOOT_TIMEOUT_MS)
    latest = page.inner_text('[data-m="latest"]')
    assert "Water, % of saturation" in latest and "Viscosity change from new" in latest
    assert page.locator('[data-m="trends"] figure svg').count() >= 1  # oil temperature, twice
    assert "Filter change is due on" in page.inner_text('[data-m="due"]')
    page.locator('[data-m="readings"] article').nth(2).wait_for(timeout=BOOT_TIMEOUT_MS)
    assert page.locator('[data-m="readings"] article').count() == 3

    # The US switch shows the same readings in US units.
    assert "55.0 °C" in latest
    page.click('.unit-switch [data-units="us"]')
    page.wait_for_function("() => document.querySelector('[data-m=\"latest\"]').textContent.includes('131.0 °F')",
                           timeout=BOOT_TIMEOUT_MS)  # 55 degC = 131 degF (NIST SP 811, B.9)
    page.wait_for_function("() => document.querySelector('[data-m=\"readings\"]').textContent.includes('US fl oz')",
                           timeout=BOOT_TIMEOUT_MS)  # the water in the tank, saved in mL

    # The visit report: one A4 page that holds the readings' values.
    page.click('[data-m="visit"]')
    page.wait_for_selector(".visit-reading", timeout=BOOT_TIMEOUT_MS)
    page.fill('[data-v="who"]', "P. Example")
    page.wait_for_function("() => document.querySelector('.visit-head').textContent.includes('P. Example')",
                           timeout=BOOT_TIMEOUT_MS)
    page.emulate_media(media="print")
    reader = pypdf.PdfReader(io.BytesIO(page.pdf(format="A4")))
    text = " ".join(" ".join(p.extract_text() for p in reader.pages).split())
    assert len(reader.pages) == 1
    assert "Saw line 3" in text and "P. Example" in text and "Signature" in text
    assert "300 ppm" in text and "40 %" in text and "131.0 °F" in text
    assert page.locator(".visit-reading").count() == 3
    assert not watch.errors


def test_a_typed_value_is_for_this_reading_unless_saved_to_the_card(page, base_url, watch):
    open_app(page, base_url, "#/tool/tank-sizing")
    machine_id = add_machine(page, {"name": "Press 9", "tank_volume": "500", "oil_volume": "400",
                                    "pump_flow": "100"})
    choose_machine(page, machine_id)
    form = page.locator('form[data-tool="tank-sizing"]')
    flow = form.locator('[name="pump_flow"]')
    assert flow.input_value() == "100" and flow.get_attribute("data-from-card") == "1"
    assert not flow.is_visible()  # the machine's facts fold away once the card fills them
    form.locator('[data-group="machine"] > summary').click()
    flow.fill("120")
    mark = form.locator('[data-bound]:has([name="pump_flow"]) [data-card-mark]')
    assert mark.inner_text() == "changed for this reading"
    wait_answer(page, "tank-sizing", "flow_minutes")
    page.wait_for_function("() => document.querySelector('form[data-tool=\"tank-sizing\"] [data-out=\"flow_minutes\"]')"
                           ".textContent.startsWith('4.17')", timeout=BOOT_TIMEOUT_MS)  # 500 L / 120 L/min
    form.locator('[data-action="save"]').click()
    form.locator("[data-saved]").filter(has_text="Saved").wait_for()
    (record,) = _readings(page, machine_id)
    assert record["inputs"]["pump_flow"] == 120.0 and "pump_flow" not in record["from_card"]
    assert _stored_machine(page, machine_id)["card"]["pump_flow"] == 100.0  # the card is unchanged

    form.locator('[data-to-card="pump_flow"]').click()
    page.wait_for_function("() => document.querySelector('form[data-tool=\"tank-sizing\"] [name=\"pump_flow\"]')"
                           ".dataset.fromCard === '1'", timeout=BOOT_TIMEOUT_MS)
    assert _stored_machine(page, machine_id)["card"]["pump_flow"] == 120.0
    assert mark.inner_text() == "from the card"
    # Another tool takes the new fact from the card at once.
    open_app(page, base_url, "#/tool/line-velocity")
    line = page.locator('form[data-tool="line-velocity"] [name="line_flow"]')
    page.wait_for_function("() => document.querySelector('form[data-tool=\"line-velocity\"] [name=\"line_flow\"]')"
                           ".dataset.fromCard === '1'", timeout=BOOT_TIMEOUT_MS)
    assert line.input_value() == "120"
    assert not watch.errors


def test_no_machine_means_the_facts_are_blank_with_examples_as_placeholders(page, base_url, watch):
    open_app(page, base_url, "#/tool/tank-sizing")
    machine_id = add_machine(page, {"name": "Press 9", "pump_flow": "250"})
    choose_machine(page, machine_id)
    form = page.locator('form[data-tool="tank-sizing"]')
    assert form.locator('[name="pump_flow"]').input_value() == "250"
    page.select_option("#job-machine", "")
    page.wait_for_function("() => document.querySelector('form[data-tool=\"tank-sizing\"] [name=\"pump_flow\"]').value === ''",
                           timeout=BOOT_TIMEOUT_MS)
    assert form.locator('[name="pump_flow"]').get_attribute("placeholder") == "e.g. 100"
    assert form.locator('[name="pump_flow"]').is_visible()  # unfolded, to be typed
    assert form.locator("[data-for-machine]").is_hidden()
    assert not watch.errors


def test_the_demo_plant_loads_and_goes_again(page, base_url, watch):
    open_app(page, base_url, "#/machines")
    own = add_machine(page, {"name": "My own press"})
    page.click('[data-kit="demo-load"]')
    page.locator(".machine-item").nth(3).wait_for(timeout=BOOT_TIMEOUT_MS)
    names = page.locator(".machine-item .menu-title").all_inner_texts()
    assert sum("(demo)" in n for n in names) == 3
    page.locator(".machine-item", has_text="Crane 9 (demo)").click()
    page.wait_for_selector('[data-m="latest"] tr', timeout=BOOT_TIMEOUT_MS)
    assert page.locator('[data-m="trends"] figure svg').count() >= 3
    assert "Filter change was due" in page.inner_text('[data-m="due"]')
    open_app(page, base_url, "#/machines")
    page.once("dialog", lambda d: d.accept())
    page.click('[data-kit="demo-remove"]')
    page.wait_for_function("() => document.querySelectorAll('.machine-item').length === 1", timeout=BOOT_TIMEOUT_MS)
    assert page.inner_text("[data-machine-list]").strip().endswith("0 readings")
    assert page.evaluate(f"async () => ({KIT}).allMachines()")[0]["id"] == own
    assert not page.evaluate(f"async () => ({KIT}).allReadings()")
    assert not watch.errors


def test_everything_exports_and_imports_without_loss(page, browser, base_url, watch, tmp_path):
    open_app(page, base_url, "#/machines")
    page.click('[data-kit="demo-load"]')
    page.locator(".machine-item").nth(2).wait_for(timeout=BOOT_TIMEOUT_MS)
    with page.expect_download() as download:
        page.click('[data-kit="export-json"]')
    exported = json.loads(open(download.value.path(), encoding="utf-8").read())
    with page.expect_download() as download:
        page.click('[data-kit="export-csv"]')
    rows = open(download.value.path(), encoding="utf-8-sig").read().splitlines()
    assert rows[0].startswith("Time,Machine,Site,Tool,Output,Value,Unit")
    assert not any(cell.startswith(("=", "+", "@")) for row in rows for cell in row.split(","))

    # Another phone: a fresh context, the same file imported, nothing lost or doubled.
    other = browser.new_context(viewport={"width": 360, "height": 740})
    watch.attach(other)
    phone = other.new_page()
    open_app(phone, base_url, "#/machines")
    path = tmp_path / "all.json"
    path.write_text(json.dumps(exported), encoding="utf-8")
    for _ in range(2):
        phone.set_input_files('[data-kit="import"]', str(path))
        phone.locator("[data-kit-status]").filter(has_text="Imported").wait_for(timeout=BOOT_TIMEOUT_MS)
    assert len(phone.evaluate(f"async () => ({KIT}).allReadings()")) == len(exported["readings"])
    phone.locator(".machine-item").nth(2).wait_for()
    assert phone.locator(".machine-item").count() == 3
    other.close()
    assert not watch.errors


def test_a_hostile_import_adds_what_is_sound_and_says_what_it_refused(page, base_url, watch):
    # Once, "verdicts": 5 in one entry hid the whole log; now each reading is checked by calc.
    open_app(page, base_url, "#/machines")
    good = page.evaluate(f"""async () => {{
      const kit = {KIT};
      const made = await kit.ask("save", {{ tool: "viscosity-index", inputs: {{ kv40: "46", kv100: "6.8" }},
                                        units: "metric", machine: null, time: kit.localStamp() }});
      return made.record;
    }}""")
    hostile = [{**good, "id": "bad-1", "tracked": {"kv40": "1e999"}},
               {**good, "id": "bad-2", "time": "yesterday"},
               {**good, "id": "bad-3", "inputs": {"kv40": {"toString": 1}}}, "junk"]
    data = {"format": "sumpside-export", "version": 1, "machines": [], "readings": [good, *hostile]}
    page.set_input_files('[data-kit="import"]', files=[{"name": "hostile.json", "mimeType": "application/json",
                                                        "buffer": json.dumps(data).encode()}])
    status = page.locator("[data-kit-status]")
    status.filter(has_text="Imported").wait_for(timeout=BOOT_TIMEOUT_MS)
    said = status.inner_text()
    assert "1 reading added, 4 readings refused" in said and "reading 2: tracked" in said
    open_app(page, base_url, "#/log")
    page.locator("[data-log-list] article").first.wait_for(timeout=BOOT_TIMEOUT_MS)
    assert page.locator("[data-log-list] article").count() == 1
    assert not watch.errors


def test_a_file_that_is_not_utf8_changes_nothing_and_says_why(page, base_url, watch):
    open_app(page, base_url, "#/machines")
    latin1 = '{"format": "sumpside-export", "machines": [{"id": "m", "card": {"name": "Presse \u00e0 chaud"}}]}'
    page.set_input_files('[data-kit="import"]', files=[{"name": "latin1.json", "mimeType": "application/json",
                                                        "buffer": latin1.encode("latin-1")}])
    status = page.locator("[data-kit-status]")
    status.filter(has_text="Import failed").wait_for(timeout=BOOT_TIMEOUT_MS)
    assert "not UTF-8 or UTF-16" in status.inner_text()
    assert page.evaluate(f"async () => ({KIT}).allMachines()") == []
    assert not watch.errors


@pytest.mark.parametrize("units", ["metric", "us"])
def test_no_machine_view_pushes_a_phone_sideways(page, base_url, units):
    # With the demo plant's full pages, on the narrowest phone still common (320 px): the
    # condition table once stood 28 to 32 px wider than a 360 px screen, so the whole machine
    # page scrolled sideways, and a label 19 px wider than a 320 px one.
    page.set_viewport_size({"width": 320, "height": 740})
    open_app(page, base_url, "#/machines")
    if units == "us":
        page.click('.unit-switch button[data-units="us"]')
    page.click('[data-kit="demo-load"]')
    page.locator(".machine-item").nth(2).wait_for(timeout=BOOT_TIMEOUT_MS)
    ids = page.locator(".machine-item").evaluate_all("els => els.map((a) => a.hash.split('/').pop())")
    # Each view, and what shows it has drawn what calc sent.
    drawn = {"machine": '[data-m="latest"] tr', "visit": '[data-v="report"] *',
             "card": '[data-card-form] [name="name"]', "labels": "[data-labels] svg"}
    wide = {}
    for machine_id in ids:
        for view, part in drawn.items():
            page.evaluate("h => { location.hash = h; }", f"#/{view}/{machine_id}")
            page.wait_for_selector(f'[data-view="{view}"]:not([hidden]) {part}', timeout=BOOT_TIMEOUT_MS)
            page.wait_for_timeout(300)  # the rest of the view draws
            over = page.evaluate("() => document.documentElement.scrollWidth - window.innerWidth")
            if over > 1:
                wide[f"{view}/{machine_id}"] = over
    assert not wide, f"px wider than the phone: {wide}"


def test_a_visit_day_without_readings_offers_the_days_with_some(page, base_url, watch):
    open_app(page, base_url, "#/machines")
    page.click('[data-kit="demo-load"]')
    page.locator(".machine-item").nth(2).wait_for(timeout=BOOT_TIMEOUT_MS)
    crane = page.locator(".machine-item", has_text="Crane 9 (demo)").evaluate("a => a.hash.split('/').pop()")
    page.evaluate("h => { location.hash = h; }", f"#/visit/{crane}/2001-01-01")
    days = page.locator('[data-v="report"] a[data-day]')
    days.first.wait_for(timeout=BOOT_TIMEOUT_MS)
    assert "No readings saved" in page.inner_text('[data-v="report"]')
    newest = days.first.inner_text()
    shown = days.all_inner_texts()
    assert shown == sorted(shown, reverse=True) and re.fullmatch(r"\d{4}-\d\d-\d\d", newest)
    days.first.click()
    page.wait_for_selector('[data-v="report"] .visit-reading', timeout=BOOT_TIMEOUT_MS)
    assert page.input_value('[data-v="day"]') == newest
    assert "No readings saved" not in page.inner_text('[data-v="report"]')
    assert not watch.errors
