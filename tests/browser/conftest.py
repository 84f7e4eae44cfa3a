"""Browser fixtures: the built dist/ served on 127.0.0.1, Debian's Chromium driven by Playwright."""

from __future__ import annotations

import os
import shutil
from contextlib import contextmanager
from pathlib import Path

import pytest

ROOT = Path(__file__).resolve().parents[2]
# SUMPSIDE_DIST tests another build folder (python build.py --dist DIR).
DIST = Path(os.environ.get("SUMPSIDE_DIST", ROOT / "dist"))
CHROMIUM = os.environ.get("SUMPSIDE_CHROMIUM", "/usr/bin/chromium")
# Chromium's own background traffic would be refused by this closed network; keep it quiet.
CHROMIUM_ARGS = ["--no-sandbox", "--disable-background-networking", "--disable-component-update",
                 "--disable-sync", "--no-first-run", "--disable-gpu", "--disable-quic"]
BOOT_TIMEOUT_MS = 120_000
PHONE = {"width": 360, "height": 740}


def pytest_collection_modifyitems(items):
    for item in items:
        if "tests/browser" in str(item.fspath):
            item.add_marker(pytest.mark.browser)


@pytest.fixture(scope="session")
def dist() -> Path:
    if not (DIST / "index.html").exists():
        pytest.fail("dist/ is not built: run `make test` (it builds first) or `python build.py`")
    return DIST


@pytest.fixture(scope="session")
def serve_dir():
    """Start a static server for a folder; every server is shut down at the end."""
    from sitebuild import serve
    servers = []

    def start(root: Path) -> str:
        server, base = serve.start_in_thread(root)
        servers.append(server)
        return base

    yield start
    for server in servers:
        server.shutdown()


@pytest.fixture(scope="session")
def base_url(dist, serve_dir) -> str:
    return serve_dir(dist)


@pytest.fixture(scope="session")
def browser():
    sync_api = pytest.importorskip("playwright.sync_api")
    if not Path(CHROMIUM).exists():
        pytest.fail(f"{CHROMIUM} is missing: `make test` installs Debian's chromium as root")
    with sync_api.sync_playwright() as playwright:
        browser = playwright.chromium.launch(executable_path=CHROMIUM, headless=True, args=CHROMIUM_ARGS)
        yield browser
        browser.close()


class Watch:
    """Everything a page asked for and every console error, for assertions at the end."""

    def __init__(self):
        self.requests: list[str] = []
        self.errors: list[str] = []

    def attach(self, context):
        context.on("request", lambda r: self.requests.append(r.url))
        context.on("page", self.attach_page)
        for page in context.pages:
            self.attach_page(page)

    def attach_page(self, page):
        page.on("console", lambda m: m.type == "error" and self.errors.append(m.text))
        page.on("pageerror", lambda e: self.errors.append(str(e)))


@pytest.fixture
def watch():
    return Watch()


@pytest.fixture
def context(browser, watch):
    context = browser.new_context(viewport=PHONE, service_workers="allow")
    watch.attach(context)
    yield context
    context.close()


@pytest.fixture
def page(context):
    return context.new_page()


def open_app(page, base: str, route: str = "") -> None:
    """A full load of the app at `route` (never a mere hash change), then wait for Python."""
    if page.url.startswith(base):
        page.goto("about:blank")  # else a hash-only change would not reload the page
    page.goto(base + route)
    page.wait_for_selector("html[data-ready]", timeout=BOOT_TIMEOUT_MS)


@contextmanager
def phone_page(browser, base_url: str, viewport: dict = PHONE):
    """One page on a phone-sized screen with the app booted, watched; for a module's sweep
    (the worker boots once)."""
    watch = Watch()
    context = browser.new_context(viewport=viewport)
    watch.attach(context)
    page = context.new_page()
    open_app(page, base_url)
    try:
        yield page, watch
    finally:
        context.close()


def fill_example(page, tool: str) -> None:
    """The tool's form with its example values in the blank fields ("Fill an example"), once
    it has answered them: a form starts with its readings blank (calc's rule)."""
    form = f'form[data-tool="{tool}"]'
    page.wait_for_function("f => { const el = document.querySelector(f); return el && el.dataset.level; }",
                           arg=form, timeout=BOOT_TIMEOUT_MS)
    # The level goes in the same task as the click, so only the answer to the filled form can
    # set it again (the click's computation outdates any answer still on its way). A
    # checklist has no example button: its level is its own.
    page.evaluate("""f => { const el = document.querySelector(f);
                            const example = el.querySelector('[data-action="example"]');
                            if (example) { delete el.dataset.level; example.click(); } }""", form)
    page.wait_for_function(
        "f => { const el = document.querySelector(f); return el.dataset.level && el.dataset.level !== 'error'; }",
        arg=form, timeout=BOOT_TIMEOUT_MS)


def wait_answer(page, tool: str, key: str) -> str:
    """The shown text of one output once the tool has answered; a form whose readings are
    still blank (it starts so) gets its examples first, as "Fill an example" gives them."""
    form = f'form[data-tool="{tool}"]'
    selector = f'{form} [data-out="{key}"]'
    page.wait_for_function("f => { const el = document.querySelector(f); return el && el.dataset.level; }",
                           arg=form, timeout=BOOT_TIMEOUT_MS)
    if page.get_attribute(form, "data-level") == "error":
        fill_example(page, tool)
    page.wait_for_function(
        "s => { const el = document.querySelector(s); return el && el.textContent.trim() !== '–'"
        " && el.closest('form').dataset.level !== 'error'; }",
        arg=selector, timeout=BOOT_TIMEOUT_MS)
    return page.inner_text(selector)


def copy_dist(dist: Path, where: Path) -> Path:
    target = where / "dist"
    shutil.copytree(dist, target)
    return target


def add_machine(page, card: dict, units: str = "metric") -> str:
    """A machine made through the page's own kit (calc checks the card); returns its id."""
    return page.evaluate("""async ([card, units]) => {
      const kit = await import(new URL("js/kit.js", document.baseURI).href);
      const made = await kit.ask("card-check", { card, units, time: kit.localStamp() });
      if (!made.ok) throw new Error(JSON.stringify(made.errors));
      await kit.saveMachine(made.machine);
      return made.machine.id;
    }""", [card, units])


def choose_machine(page, machine_id: str) -> None:
    """Pick a machine in the bar, then wait until the forms in view are filled from its card."""
    page.wait_for_function("id => [...document.querySelectorAll('#job-machine option')].some(o => o.value === id)",
                           arg=machine_id)
    page.select_option("#job-machine", machine_id)
    page.wait_for_function("() => [...document.querySelectorAll('.view:not([hidden]) form[data-tool] "
                           "[data-for-machine]')].every(p => !p.hidden)", timeout=BOOT_TIMEOUT_MS)

