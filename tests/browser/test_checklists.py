"""Checklists in the browser: ranked causes from ticks and readings, printed to PDF on at most
two pages, offline too, with no console errors."""

from __future__ import annotations

import io

import pytest
from playwright.sync_api import expect

from calc import bridge
from calc.kernel import registry

from .conftest import BOOT_TIMEOUT_MS, fill_example, open_app

CHECKLISTS = list(registry.of_kind("checklist"))
LEVEL_WORD = {"ok": "OK", "watch": "Watch", "act": "Act"}  # as the page shows a level


def _first_flag(tool_id):
    return next(f.key for f in registry.get(tool_id).inputs if f.is_flag)


def _rank(page, tool):
    view = f'#view-tool-{tool}'
    flag = _first_flag(tool)
    page.locator(f'{view} input[name="{flag}"]').check()
    page.wait_for_function(
        "s => document.querySelectorAll(s + ' [data-ranking] li').length > 0",
        arg=view, timeout=BOOT_TIMEOUT_MS)
    return bridge.run(tool, {flag: "yes"}, examples=True)


def _pdf_pages_and_text(pdf: bytes):
    pypdf = pytest.importorskip("pypdf")
    reader = pypdf.PdfReader(io.BytesIO(pdf))
    return len(reader.pages), " ".join(p.extract_text() for p in reader.pages)


@pytest.mark.parametrize("name", CHECKLISTS)
@pytest.mark.parametrize("paper", ["A4", "Letter"])
def test_checklist_ranks_and_prints_on_two_pages(page, base_url, watch, name, paper):
    open_app(page, base_url, f"#/tool/{name}")
    expected = _rank(page, name)
    first = next(c for c in expected["ranked"])
    shown_first = page.locator(f"#view-tool-{name} [data-causes] > section").first
    assert shown_first.get_attribute("data-cause") == first["key"]
    page.emulate_media(media="print")
    pages, text = _pdf_pages_and_text(page.pdf(format=paper, print_background=False))
    assert 1 <= pages <= 2, f"{name} prints on {pages} pages"
    squashed = " ".join(text.split())
    assert " ".join(first["title"].split()) in squashed
    assert "Pass" in squashed and "Caution" in squashed
    assert not watch.errors


def test_checklist_works_offline(page, context, base_url, watch):
    name = CHECKLISTS[0]
    open_app(page, base_url, f"#/tool/{name}")
    page.wait_for_function("() => navigator.serviceWorker.controller !== null", timeout=BOOT_TIMEOUT_MS)
    context.set_offline(True)
    try:
        open_app(page, base_url, f"#/tool/{name}")
        _rank(page, name)
    finally:
        context.set_offline(False)
    assert not watch.errors


def test_tool_result_flows_back_into_the_checklist(page, base_url):
    name = CHECKLISTS[0]
    open_app(page, base_url, f"#/tool/{name}")
    link = page.locator(f"#view-tool-{name} a[data-from-checklist]").first
    if not link.count():
        pytest.skip("this checklist links no tool")
    tool = link.get_attribute("href").rsplit("/", 1)[-1]
    link.click()
    fill_example(page, tool)
    page.click("[data-back] a")
    reading = page.locator(f'#view-tool-{name} [data-reading-of="{tool}"]').first
    # The tool's headline outputs, as the tool declares them, and the level of its answer.
    answer = bridge.run(tool, {}, examples=True)
    headline = ", ".join(answer["text"][key] for key in answer["headline"])
    # The way back is a route change: the checklist shows the reading once it has run.
    expect(reading).to_have_text(f"Latest: {headline} ({LEVEL_WORD[answer['level']]})",
                                 timeout=BOOT_TIMEOUT_MS)
