"""A new build reaches a phone by difference: build B, which differs from the served build A
in one help page, costs only its changed files and its service worker; it is offered, taken
whole, and every saved reading is still there. A file whose bytes do not match the hash the
new build lists is refused, and build A stays in use, whole."""

from __future__ import annotations

import hashlib
import json
import re
import shutil
from pathlib import Path
from urllib.parse import urlparse

import pytest

from sitebuild import serve, variant

from .conftest import BOOT_TIMEOUT_MS, copy_dist, open_app
from .test_log_and_updates import _save_one

# Saved the way the log's own tests save one (test_log_and_updates._save_one).
READINGS = (("viscosity-at-temperature", "kv"), ("viscosity-grade", "kv40"))



@pytest.fixture(scope="module")
def build_b(tmp_path_factory) -> Path:
    return variant.build_with_one_help_change(tmp_path_factory.mktemp("build-b"))


def _precached(folder: Path) -> dict[str, str]:
    """url -> integrity, as the build's service worker lists them."""
    text = (folder / "sw.js").read_text(encoding="utf-8")
    listed = re.search(r"const PRECACHE = (\[.*?\n\]);", text, re.S).group(1)
    return {entry["url"]: entry["integrity"] for entry in json.loads(listed)}


def _swap(site: Path, build: Path) -> None:
    """The host now serves `build` where it served the old one."""
    shutil.rmtree(site)
    shutil.copytree(build, site)


@pytest.fixture
def host():
    """A static host that keeps what it sent: host(folder) -> (base URL, list of Sent)."""
    servers = []

    def start(root: Path):
        server, base = serve.start_in_thread(root, record=True)
        servers.append(server)
        return base, server.sent

    yield start
    for server in servers:
        server.shutdown()


def _served_build_a(page, dist, host, tmp_path) -> tuple[Path, str, list]:
    """Build A served and cached whole, readings saved: (its folder, base URL, what the host sent)."""
    site = copy_dist(dist, tmp_path)
    base, sent = host(site)
    machine = None
    for tool, key in READINGS:
        open_app(page, base, f"#/tool/{tool}")
        machine = _save_one(page, tool, key, machine)
    page.wait_for_function("() => navigator.serviceWorker.controller !== null", timeout=BOOT_TIMEOUT_MS)
    return site, base, sent


def _paths(sent) -> list[str]:
    return sorted(urlparse(s.path).path.lstrip("/") for s in sent)


def _log_lists_every_reading(page, base: str) -> None:
    open_app(page, base, "#/log")
    entries = page.locator("[data-log-list] article")
    entries.first.wait_for()
    assert entries.count() == len(READINGS)
    assert "Press 7, north bay" in page.inner_text("[data-log-list]")


def test_a_help_fix_costs_only_the_changed_files(page, dist, build_b, host, tmp_path, watch):
    site, base, sent = _served_build_a(page, dist, host, tmp_path)
    old_build = page.get_attribute("html", "data-build")
    before, after = _precached(dist), _precached(build_b)
    changed = sorted(url for url in after if before.get(url) != after[url])
    # One help page is shown in the page itself; the snapshot, Pyodide and calc stay the same.
    assert changed == ["build.json", "index.html"], changed

    del sent[:]
    _swap(site, build_b)
    assert page.evaluate(variant.UPDATE_CHECK) == "installed"
    page.locator("#update-banner").wait_for(state="visible", timeout=BOOT_TIMEOUT_MS)
    # The new build's list and its changed files, each once, in full: nothing else.
    assert _paths(sent) == sorted(["sw.js"] + changed), sent
    assert all(s.status == 200 for s in sent), sent
    # Until the user says so, build A keeps serving.
    assert page.get_attribute("html", "data-build") == old_build

    with page.expect_navigation(timeout=BOOT_TIMEOUT_MS):
        page.click("#update-apply")
    page.wait_for_selector("html[data-ready]", timeout=BOOT_TIMEOUT_MS)
    new_build = page.get_attribute("html", "data-build")
    assert new_build != old_build and new_build in (build_b / "index.html").read_text(encoding="utf-8")
    assert page.evaluate("() => caches.keys()") == [f"sumpside-{new_build}"]
    assert variant.HELP_FIX.strip() in page.content()
    _log_lists_every_reading(page, base)
    assert not watch.errors


@pytest.mark.parametrize("damage", ["altered", "truncated"])
def test_a_file_that_does_not_match_its_hash_is_refused(page, context, dist, build_b, host, tmp_path,
                                                       watch, damage):
    site, base, sent = _served_build_a(page, dist, host, tmp_path)
    old_build = page.get_attribute("html", "data-build")
    del sent[:]
    _swap(site, build_b)
    # The host serves other bytes than build B's list says (a bad upload, a cut connection).
    bad = site / "index.html"
    data = bad.read_bytes()
    bad.write_bytes(data.replace(b"</body>", b"<p>not this build</p></body>") if damage == "altered"
                    else data[: len(data) // 2])
    for twin in site.glob("index.html.*"):
        twin.unlink()  # the host has no compressed twins of the bad file: it serves it as it is
    assert hashlib.sha256(bad.read_bytes()).digest() != hashlib.sha256(data).digest()

    assert page.evaluate(variant.UPDATE_CHECK) == "redundant"
    assert "index.html" in _paths(sent)  # fetched, checked and refused
    assert page.locator("#update-banner").is_hidden()
    # Build A stays in use, whole: its cache is untouched and serves the reload, offline too.
    old_cache = f"sumpside-{old_build}"
    assert old_cache in page.evaluate("() => caches.keys()")
    assert page.evaluate("""async ([name, url]) => {
        for (const key of await caches.keys())
          if (key !== name && await (await caches.open(key)).match(url)) return true;
        return false; }""", [old_cache, "index.html"]) is False
    context.set_offline(True)
    open_app(page, base, "#/tool/viscosity-at-temperature")
    assert page.get_attribute("html", "data-build") == old_build
    _log_lists_every_reading(page, base)
    assert not watch.errors
