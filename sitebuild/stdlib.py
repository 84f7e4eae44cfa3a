"""The standard library the app ships: the files of Pyodide's python_stdlib.zip that the app
imports, and no others.

Pyodide's zip holds 614 files (2.5 MB, stored compressed, so no twin shrinks it on the wire);
every phone downloads it and every boot, quick or normal, reads it from the cache. The app
imports about a quarter of them: the interpreter's start-up, Pyodide's own runtime, its
package loader (the normal boot loads the calc wheel with it) and what calc imports.
``write_stdlib`` asks sitebuild/make_snapshot.mjs (survey mode) which files an interpreter
that boots the normal way, loads the wheel and runs everything the snapshot maker runs has
imported, and writes dist/pyodide/python_stdlib.zip with only those, in the original order
with the original entries' dates: the same input gives the same bytes.

The snapshot is then made with the cut zip, so its import caches describe the zip a restore
finds; the normal boot finds the same zip. calc must import its stdlib modules at the top of
its modules (every module of calc is imported by the survey): a module imported only inside
a function that the survey does not run would be missing.
"""

from __future__ import annotations

import json
import shutil
import subprocess
import sys
import zipfile
from pathlib import Path

HERE = Path(__file__).resolve().parent
SCRIPT = HERE / "make_snapshot.mjs"
NAME = "python_stdlib.zip"


def survey(pyodide_dir: Path, full_zip: Path) -> list[str]:
    """The stdlib files (paths inside the zip) that a normal boot with calc imports."""
    node = shutil.which("node")
    if not node:
        sys.exit("build: `node` is missing: the stdlib survey runs in Node.js (install nodejs, then `npm ci`)")
    run = subprocess.run([node, str(SCRIPT), "survey", str(pyodide_dir), str(full_zip)],
                         capture_output=True, text=True)
    if run.returncode != 0:
        tail = "\n".join((run.stderr or run.stdout).strip().splitlines()[-15:])
        sys.exit(f"build: the stdlib survey failed:\n{tail}")
    return json.loads(run.stdout.strip().splitlines()[-1])["stdlib"]


def cut(full_zip: Path, out: Path, keep: set[str]) -> dict:
    """`full_zip` with only the files in `keep` (and every folder entry), written to `out`."""
    kept = []
    with zipfile.ZipFile(full_zip) as source, zipfile.ZipFile(out, "w") as target:
        for info in source.infolist():
            if info.is_dir() or info.filename in keep:
                target.writestr(info, source.read(info), compress_type=zipfile.ZIP_DEFLATED, compresslevel=9)
                kept.append(info.filename)
        missing = keep - set(kept)
        total = len([i for i in source.infolist() if not i.is_dir()])
    if missing:
        sys.exit(f"build: the stdlib survey named files the zip lacks: {sorted(missing)[:5]}")
    return {"files": len(keep), "of_files": total, "bytes": out.stat().st_size,
            "of_bytes": full_zip.stat().st_size}


def write_stdlib(pyodide_dir: Path, full_zip: Path) -> dict:
    """dist/pyodide/python_stdlib.zip cut to what the app imports; returns what was kept."""
    out = pyodide_dir / NAME
    kept = cut(full_zip, out, set(survey(pyodide_dir, full_zip)))
    print(f"stdlib: {kept['files']} of {kept['of_files']} files, {kept['bytes']:,} of "
          f"{kept['of_bytes']:,} bytes")
    return kept
