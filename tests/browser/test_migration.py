"""The log of the build before machines is migrated, not lost.

The earlier page is built from this repository's history (the last commit that had its log,
site_src/js/log.js), served, and fills its log with 500 entries the way it saved them; then
this build is installed over it at the same address, as a phone would get it, and every
entry must be found again as a reading, under a machine of its name.
"""

from __future__ import annotations

import io
import os
import shutil
import subprocess
import sys
import tarfile
from pathlib import Path

import pytest

from .conftest import BOOT_TIMEOUT_MS, open_app, wait_answer

ROOT = Path(__file__).resolve().parents[2]
ENTRIES = 500
KIT = 'await import(new URL("js/kit.js", document.baseURI).href)'


def _git(*args: str) -> str:
    return subprocess.run(["git", *args], cwd=ROOT, capture_output=True, text=True,
                          check=True).stdout.strip()


def _earlier_commit() -> str:
    """The last commit whose page kept the log of display text (js/log.js)."""
    if _git("rev-parse", "--is-shallow-repository") == "true":
        pytest.skip("a shallow clone holds no earlier build to migrate from")
    removed = _git("log", "-1", "--format=%H", "--diff-filter=D", "--", "site_src/js/log.js")
    return removed + "^" if removed else "HEAD"


@pytest.fixture(scope="module")
def earlier_dist(tmp_path_factory) -> Path:
    where = tmp_path_factory.mktemp("earlier")
    archive = subprocess.run(["git", "archive", "--format=tar", _earlier_commit()], cwd=ROOT,
                             capture_output=True, check=True).stdout
    with tarfile.open(fileobj=io.BytesIO(archive)) as tar:
        tar.extractall(where, filter="data")
    os.symlink(ROOT / "node_modules", where / "node_modules")
    run = subprocess.run([sys.executable, "build.py", "--dist", str(where / "dist")], cwd=where,
                         capture_output=True, text=True, timeout=900)
    assert run.returncode == 0, (run.stdout + run.stderr)[-3000:]
    return where / "dist"


def _fill_the_earlier_log(page, tool_saves):
    """Save through the earlier page's own buttons, then copy those entries (as that page's
    log module stores them) up to ENTRIES, each at its own time."""
    for tool, key, machine in tool_saves:
        page.goto(page.url.split("#")[0] + "#/tool/" + tool)
        wait_answer(page, tool, key)
        page.fill("#job-machine", machine)
        page.click(f'form[data-tool="{tool}"] [data-action="save"]')
        page.wait_for_function("""t => document.querySelector(
            `form[data-tool="${t}"] [data-state]`).textContent.includes('Saved')""", arg=tool)
    return page.evaluate("""async (total) => {
      const log = await import(new URL("js/log.js", document.baseURI).href);
      const saved = await log.allEntries();
      for (let i = saved.length; i < total; i++) {
        const { id, ...entry } = saved[i % saved.length];
        const at = new Date(Date.UTC(2025, 0, 1) + i * 3600e3).toISOString();
        await log.addEntry({ ...entry, at });
      }
      return (await log.allEntries()).map((e) => ({ at: e.at, tool: e.tool, machine: e.machine }));
    }""", ENTRIES)


@pytest.mark.slow
def test_the_earlier_log_of_500_entries_is_migrated(page, dist, earlier_dist, serve_dir, tmp_path,
                                                    watch):
    site = tmp_path / "site"
    shutil.copytree(earlier_dist, site)
    base = serve_dir(site)
    open_app(page, base, "#/tool/viscosity-at-temperature")
    page.wait_for_function("() => navigator.serviceWorker.controller !== null", timeout=BOOT_TIMEOUT_MS)
    saves = [("viscosity-at-temperature", "kv", "Press 7, north bay"),
             ("water-in-oil", "ppm", "Press 7, north bay"),
             ("tank-sizing", "flow_minutes", "Crane 2"),
             ("oil-condition", "visc_change", ""),
             ("suction-check", "p_inlet", "Crane 2")]
    earlier = _fill_the_earlier_log(page, saves)
    assert len(earlier) == ENTRIES
    old_build = page.get_attribute("html", "data-build")

    # This build arrives at the same address; the earlier page offers it, the user takes it.
    shutil.rmtree(site)
    # Fresh file times, as a deploy gives them: the earlier build's are newer than this one's.
    shutil.copytree(dist, site, copy_function=shutil.copy)
    page.evaluate("async () => (await navigator.serviceWorker.getRegistration()).update()")
    page.locator("#update-banner").wait_for(state="visible", timeout=BOOT_TIMEOUT_MS)
    with page.expect_navigation(timeout=BOOT_TIMEOUT_MS):
        page.click("#update-apply")
    page.wait_for_selector("html[data-ready]", timeout=BOOT_TIMEOUT_MS)
    assert page.get_attribute("html", "data-build") != old_build

    open_app(page, base, "#/log")
    page.locator("[data-log-list] article").first.wait_for(timeout=BOOT_TIMEOUT_MS)
    readings = page.evaluate(f"async () => ({KIT}).allReadings()")
    machines = {m["id"]: m["card"]["name"] for m in page.evaluate(f"async () => ({KIT}).allMachines()")}
    assert len(readings) == ENTRIES
    assert sorted(machines.values()) == ["Crane 2", "Press 7, north bay"]
    found = sorted((r["time"], r["tool"], machines.get(r["machine"], "")) for r in readings)
    wanted = sorted((e["at"].replace("Z", "+00:00"), e["tool"], e["machine"]) for e in earlier)
    assert found == wanted  # every entry, at its time, of its tool, under its machine
    # Shown by calc in the reader's units, labels and all.
    assert "Viscosity at oil temperature" in page.inner_text("[data-log-list]")
    assert "earlier version" in page.inner_text("[data-log-status]")
    # Once only: a reload does not migrate again.
    open_app(page, base, "#/log")
    assert len(page.evaluate(f"async () => ({KIT}).allReadings()")) == ENTRIES
    assert not watch.errors
