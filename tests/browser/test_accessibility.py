"""Accessibility: axe-core (npm, pinned in package.json) over every view of the app in both
unit systems on a phone, with a machine and its readings so the machine views are full. No
serious or critical violation; every chart has a text equivalent.

axe is injected into the page for the test only (the context bypasses the page's CSP for
that one script; the app itself never loads it)."""

from __future__ import annotations

from pathlib import Path

import pytest

from calc.kernel import registry

from .conftest import BOOT_TIMEOUT_MS, add_machine, choose_machine, fill_example, open_app

AXE = Path(__file__).resolve().parents[2] / "node_modules" / "axe-core" / "axe.min.js"
PHONE_760 = {"width": 360, "height": 760}
SERIOUS = ("serious", "critical")


def _views(machine_id):
    tools = [f"tool/{t}" for t in registry.tools()]
    return (["home", "machines", f"machine/{machine_id}", f"card/{machine_id}",
             f"visit/{machine_id}", "checklists", "log", "cautions"] + tools)


def _violations(page):
    found = page.evaluate("""async () => {
      const run = await axe.run(document.querySelector('.view:not([hidden])') || document,
                                { resultTypes: ["violations"] });
      return run.violations.map((v) => ({ id: v.id, impact: v.impact, help: v.help,
        nodes: v.nodes.slice(0, 3).map((n) => n.target.join(" ")) }));
    }""")
    return [v for v in found if v["impact"] in SERIOUS]


@pytest.mark.slow
@pytest.mark.parametrize("units", ["metric", "us"])
def test_no_serious_violation_on_any_view(browser, base_url, units):
    if not AXE.exists():
        pytest.fail(f"{AXE} is missing: `make setup` installs axe-core from npm")
    context = browser.new_context(viewport=PHONE_760, bypass_csp=True)
    page = context.new_page()
    open_app(page, base_url, "#/tool/water-in-oil")
    if units == "us":
        page.click('.unit-switch button[data-units="us"]')
    machine_id = add_machine(page, {"name": "Press 14, bay 2", "grade": "VG 46", "pump_flow": "80",
                                    "oil_volume": "300", "tank_volume": "400", "temp_cold_start": "5",
                                    "density": "870" if units == "metric" else "54.3",
                                    "sample_days": "90"}, units)
    choose_machine(page, machine_id)
    page.fill('form[data-tool="water-in-oil"] [name="rh"]', "40")
    page.fill('form[data-tool="water-in-oil"] [name="temp"]', "50" if units == "metric" else "122")
    page.wait_for_function("() => document.querySelector('form[data-tool=\"water-in-oil\"]').dataset.level !== 'error'",
                           timeout=BOOT_TIMEOUT_MS)
    page.click('form[data-tool="water-in-oil"] [data-action="save"]')
    page.wait_for_selector('form[data-tool="water-in-oil"] [data-saved] a', timeout=BOOT_TIMEOUT_MS)
    page.add_script_tag(path=str(AXE))
    problems = {}
    for view in _views(machine_id):
        page.evaluate("v => { location.hash = '#/' + v; }", view)
        page.wait_for_selector(f'[data-view="{view.split("/")[0] if not view.startswith("tool/") else view}"]:not([hidden])')
        if view.startswith("tool/"):
            fill_example(page, view[5:])
        else:
            page.wait_for_timeout(300)  # the view draws what the kit holds
        found = _violations(page)
        if found:
            problems[view] = found
        # Every chart says in words what it draws.
        for svg in page.locator(".view:not([hidden]) svg").all():
            label = svg.get_attribute("aria-label") or svg.get_attribute("aria-labelledby") or (
                svg.locator("title").count() and svg.locator("title").first.text_content())
            assert label, f"{view}: a chart without a text equivalent"
    context.close()
    assert not problems, {view: [(v["id"], v["help"], v["nodes"][:1]) for v in found] for view, found in problems.items()}
