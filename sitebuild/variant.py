"""Other builds of this project, made from a copy of its sources: what the update test and the
benchmark hand a phone that holds dist/, and what the registry test builds with one more tool.

    copy_sources(where)              the sources build.py reads, in a new folder
    build_with_one_help_change(where)  a build that differs from this one in one help page
    UPDATE_CHECK                     page script: ask for an update, say what became of it
"""

from __future__ import annotations

import os
import shutil
import subprocess
import sys
from pathlib import Path

ROOT = Path(__file__).resolve().parent.parent
# What build.py reads; node_modules (the pinned Pyodide) and .cache (the brotli twins,
# addressed by content) are shared, not copied.
SOURCES = ("calc", "site_src", "sitebuild")
FILES = ("build.py", "pyproject.toml")
SHARED = ("node_modules", ".cache")
# One sentence more in one help page: the smallest change a writer makes.
HELP_FIX = "\nRead the value at the temperature the oil has in the tank, not at the gauge.\n"

# Resolves with what became of the service worker an update check finds: "installed" (it
# holds the whole new build and waits) or "redundant" (its install failed); "none" if the
# check found nothing new, "timeout" if the worker never settled.
UPDATE_CHECK = """async () => {
  const registration = await navigator.serviceWorker.getRegistration();
  let incoming = null;
  registration.addEventListener("updatefound", () => { incoming = registration.installing; }, { once: true });
  await registration.update();
  incoming = incoming || registration.installing || registration.waiting;
  if (!incoming) return "none";
  const settled = () => ["installed", "activated", "redundant"].includes(incoming.state);
  if (settled()) return incoming.state;
  return Promise.race([
    new Promise((resolve) => incoming.addEventListener("statechange", () => {
      if (settled()) resolve(incoming.state);
    })),
    new Promise((resolve) => setTimeout(() => resolve("timeout"), 60000)),
  ]);
}"""


class VariantError(RuntimeError):
    """A variant build failed; the message holds the end of its output."""


def copy_sources(where: Path) -> Path:
    """The project's sources in `where` (made if missing), ready for `python build.py`."""
    where.mkdir(parents=True, exist_ok=True)
    for name in SOURCES:
        shutil.copytree(ROOT / name, where / name, ignore=shutil.ignore_patterns("__pycache__", "*.pyc"))
    for name in FILES:
        shutil.copy2(ROOT / name, where / name)
    for name in SHARED:
        (ROOT / name).mkdir(exist_ok=True)
        os.symlink(ROOT / name, where / name)
    return where


def build(sources: Path, dist: Path) -> Path:
    """Run build.py in `sources` into `dist`; returns `dist`."""
    run = subprocess.run([sys.executable, "build.py", "--dist", str(dist)], cwd=sources,
                         capture_output=True, text=True, timeout=900)
    if run.returncode != 0:
        raise VariantError((run.stdout + run.stderr)[-3000:])
    return dist


def changed_help_page(sources: Path) -> Path:
    """The help page the variant changes: the first by name, whichever tool it is."""
    return sorted((sources / "site_src" / "help").glob("*.md"))[0]


def build_with_one_help_change(where: Path) -> Path:
    """dist/ as this project builds it with one sentence added to one help page."""
    sources = copy_sources(where / "sources")
    page = changed_help_page(sources)
    page.write_text(page.read_text(encoding="utf-8") + HELP_FIX, encoding="utf-8")
    return build(sources, where / "dist")
