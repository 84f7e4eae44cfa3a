"""Build the offline app into dist/, and serve it.

    python build.py            build dist/
    python build.py serve      build, then serve dist/ on http://127.0.0.1:8000

Steps: render the page with jinja2 (each tool's form from the registry, help and
checklists from markdown), pack calc as a pure-Python wheel, add it to a copy of
Pyodide's lock file with pyodide-build's lock-file command, copy the pinned
Pyodide core with only the stdlib files the app imports, make the memory
snapshot, write icons, the web manifest and the service worker with its
precache list (each file's hash) and the build id, then the brotli and gzip
twins. Every URL is relative, so dist/ works under any path of any static host.
The same sources give the same bytes (tests/build/test_reproducible.py).
"""

from __future__ import annotations

import argparse
import base64
import hashlib
import json
import os
import shutil
import subprocess
import sys
import tempfile
import tomllib
import zipfile
from pathlib import Path

import jinja2

from sitebuild import compress, content, icons, serve, snapshot, stdlib

ROOT = Path(__file__).resolve().parent
SITE = ROOT / "site_src"
DIST = ROOT / "dist"
PYODIDE_NPM = ROOT / "node_modules" / "pyodide"
# The replication library for sync with the plant's database (js/sync.js), as npm ships it
# for the browser, with its licence; loaded only once the user turns sync on.
POUCHDB_NPM = ROOT / "node_modules" / "pouchdb"
VENDOR = {POUCHDB_NPM / "dist" / "pouchdb.min.js": "pouchdb.min.js",
          POUCHDB_NPM / "LICENSE": "pouchdb.LICENSE.txt"}
# Pure-Python wheels the app ships beside calc's (segno, for the label's QR code), at the
# versions constraints.txt pins; `make setup` downloads them here.
APP_WHEELS = ROOT / ".cache" / "app-wheels"
APP_PACKAGES = ("segno",)
# The page's Python beyond calc (site_src/py: the label's QR code), packed into the same wheel
# as top-level modules; calc itself stays standard-library only.
PAGE_PYTHON = SITE / "py"
# What the worker needs of the Pyodide core: the module loader, the interpreter and its stdlib.
PYODIDE_CORE = ("pyodide.mjs", "pyodide.asm.mjs", "pyodide.asm.wasm", "python_stdlib.zip")
# The wheel's files land in the version's deterministic zip: same sources, same bytes.
ZIP_TIME = (2020, 1, 1, 0, 0, 0)


def project_meta() -> dict:
    with open(ROOT / "pyproject.toml", "rb") as handle:
        return tomllib.load(handle)["project"]


def build_wheel(out_dir: Path) -> Path:
    """calc as a py3-none-any wheel, written directly (pure Python needs no build backend)."""
    meta = project_meta()
    name, version = meta["name"], meta["version"]
    dist_info = f"{name}-{version}.dist-info"
    entries: list[tuple[str, bytes]] = []
    for path in sorted((ROOT / "calc").rglob("*.py")):
        entries.append((path.relative_to(ROOT).as_posix(), path.read_bytes()))
    for path in sorted(PAGE_PYTHON.glob("*.py")):
        entries.append((path.name, path.read_bytes()))
    requires = "".join(f"Requires-Dist: {p}\n" for p in APP_PACKAGES)
    entries.append((f"{dist_info}/METADATA", (
        f"Metadata-Version: 2.1\nName: {name}\nVersion: {version}\n"
        f"Summary: {meta['description']}\nRequires-Python: {meta['requires-python']}\n"
        + requires).encode()))
    entries.append((f"{dist_info}/WHEEL", (
        "Wheel-Version: 1.0\nGenerator: sumpside-build\nRoot-Is-Purelib: true\n"
        "Tag: py3-none-any\n").encode()))
    top = ["calc"] + [p.stem for p in sorted(PAGE_PYTHON.glob("*.py"))]
    entries.append((f"{dist_info}/top_level.txt", ("\n".join(top) + "\n").encode()))
    record = []
    for arcname, data in entries:
        digest = base64.urlsafe_b64encode(hashlib.sha256(data).digest()).rstrip(b"=").decode()
        record.append(f"{arcname},sha256={digest},{len(data)}")
    record.append(f"{dist_info}/RECORD,,")
    entries.append((f"{dist_info}/RECORD", ("\n".join(record) + "\n").encode()))
    out_dir.mkdir(parents=True, exist_ok=True)
    wheel = out_dir / f"{name}-{version}-py3-none-any.whl"
    with zipfile.ZipFile(wheel, "w", zipfile.ZIP_DEFLATED) as archive:
        for arcname, data in entries:
            info = zipfile.ZipInfo(arcname, ZIP_TIME)
            info.compress_type = zipfile.ZIP_DEFLATED
            info.external_attr = 0o644 << 16
            archive.writestr(info, data)
    return wheel


def _pyodide_cli() -> str:
    beside = Path(sys.executable).with_name("pyodide")
    found = str(beside) if beside.exists() else shutil.which("pyodide")
    if not found:
        sys.exit("build: the `pyodide` command (pyodide-build) is missing: run `make serve` "
                 "or install the dev extra in a Python >= 3.12 environment")
    return found


def app_wheels(out_dir: Path) -> list[Path]:
    """The app's other wheels (APP_PACKAGES) copied beside calc's, as downloaded."""
    found = []
    for package in APP_PACKAGES:
        wheels = sorted(APP_WHEELS.glob(f"{package}-*-py3-none-any.whl"))
        if len(wheels) != 1:
            sys.exit(f"build: expected one {package} wheel in {APP_WHEELS}, found {len(wheels)}: "
                     "run `make setup`")
        found.append(Path(shutil.copy2(wheels[0], out_dir / wheels[0].name)))
    return found


def write_lock_file(wheel: Path, out_dir: Path) -> None:
    """Pyodide's lock file, cut to the packages this build ships, plus the calc wheel and
    the wheels it needs (APP_PACKAGES)."""
    original = json.loads((PYODIDE_NPM / "pyodide-lock.json").read_text())
    # The npm package carries the core only: no package wheel it lists could be loaded.
    cut = {"info": original["info"], "packages": {}}
    with tempfile.TemporaryDirectory() as tmp:
        source = Path(tmp) / "pyodide-lock.json"
        source.write_text(json.dumps(cut))
        subprocess.run([_pyodide_cli(), "lockfile", "add-wheels", "--input", str(source),
                        "--output", str(out_dir / "pyodide-lock.json"),
                        "--base-path", str(out_dir), str(wheel),
                        *map(str, app_wheels(out_dir))],
                       check=True, stdout=subprocess.DEVNULL)


def copy_pyodide(out_dir: Path) -> str:
    if not PYODIDE_NPM.is_dir():
        sys.exit("build: node_modules/pyodide is missing: run `npm ci` first")
    version = json.loads((PYODIDE_NPM / "package.json").read_text())["version"]
    out_dir.mkdir(parents=True, exist_ok=True)
    for name in PYODIDE_CORE:
        shutil.copy2(PYODIDE_NPM / name, out_dir / name)
    return version


BUILD_ID_TOKEN = "__SUMPSIDE_BUILD_ID__"


def render_pages(dist: Path, build_id: str, pyodide_version: str) -> None:
    env = jinja2.Environment(loader=jinja2.FileSystemLoader(SITE / "templates"),
                             autoescape=jinja2.select_autoescape(["html"]),
                             undefined=jinja2.StrictUndefined, trim_blocks=True, lstrip_blocks=True)
    site = content.load(SITE)
    page = env.get_template("index.html").render(
        site=site, build_id=build_id, pyodide_version=pyodide_version,
        version=project_meta()["version"])
    (dist / "index.html").write_text(page, encoding="utf-8")


def copy_static(dist: Path) -> None:
    for sub in ("css", "js"):
        shutil.copytree(SITE / sub, dist / sub, dirs_exist_ok=True)
    (dist / "js" / "vendor").mkdir(exist_ok=True)
    for source, name in VENDOR.items():
        if not source.is_file():
            sys.exit(f"build: {source} is missing: run `npm ci` first")
        text = source.read_text(encoding="utf-8")
        # The map is not shipped: its comment would only send the browser's tools after it.
        text = text.replace("\n//# sourceMappingURL=pouchdb.min.js.map", "\n")
        (dist / "js" / "vendor" / name).write_text(text, encoding="utf-8")
    shutil.copy2(SITE / "worker.js", dist / "worker.js")


def write_manifest(dist: Path) -> None:
    meta = project_meta()
    manifest = {
        "name": "Sumpside — hydraulic oil field kit",
        "short_name": "Sumpside",
        "description": meta["description"],
        "start_url": "./",
        "scope": "./",
        "display": "standalone",
        "orientation": "any",
        "background_color": "#ffffff",
        "theme_color": icons.BACKGROUND_HEX,
        "icons": [
            {"src": "icons/icon-192.png", "sizes": "192x192", "type": "image/png", "purpose": "any"},
            {"src": "icons/icon-512.png", "sizes": "512x512", "type": "image/png", "purpose": "any"},
            {"src": "icons/maskable-512.png", "sizes": "512x512", "type": "image/png",
             "purpose": "maskable"},
        ],
    }
    (dist / "manifest.webmanifest").write_text(json.dumps(manifest, indent=2), encoding="utf-8")


def precache_list(dist: Path) -> list[str]:
    """Every file of the build but the service worker itself, relative to dist/."""
    files = sorted(p.relative_to(dist).as_posix() for p in dist.rglob("*") if p.is_file())
    return [f for f in files if f != "sw.js"]


def precache_manifest(dist: Path) -> list[dict]:
    """Each precached file with the sha256 of its bytes as a subresource-integrity string:
    the service worker fetches a file only when this changed, and checks what it gets."""
    return [{"url": name, "integrity": "sha256-" + base64.b64encode(
                hashlib.sha256((dist / name).read_bytes()).digest()).decode()}
            for name in precache_list(dist)]


def build_hash(manifest: list[dict]) -> str:
    """The build id: a digest of every file's name and hash, so the same sources give the
    same id and any change to any file gives another."""
    lines = "".join(f"{entry['url']} {entry['integrity']}\n" for entry in manifest)
    return hashlib.sha256(lines.encode()).hexdigest()[:12]


def write_service_worker(dist: Path, manifest: list[dict], build_id: str) -> None:
    template = (SITE / "sw.js").read_text(encoding="utf-8")
    text = template.replace('"__BUILD_ID__"', json.dumps(build_id)).replace(
        "[/* __PRECACHE__ */]", json.dumps(manifest, indent=2))
    (dist / "sw.js").write_text(text, encoding="utf-8")


def build(dist: Path = DIST) -> str:
    """Build the whole app into `dist`; returns the build id."""
    if dist.exists():
        shutil.rmtree(dist)
    dist.mkdir(parents=True)
    pyodide_dir = dist / "pyodide"
    pyodide_version = copy_pyodide(pyodide_dir)
    wheel = build_wheel(pyodide_dir)
    write_lock_file(wheel, pyodide_dir)
    # Only the stdlib files the app imports (sitebuild/stdlib.py), before the snapshot is made.
    stdlib.write_stdlib(pyodide_dir, PYODIDE_NPM / stdlib.NAME)
    copy_static(dist)
    # The worker boots from this memory snapshot (sitebuild/snapshot.py); it is precached too.
    snapshot.write_snapshot(pyodide_dir)
    icons.write_icons(dist / "icons")
    write_manifest(dist)
    # The page shows its build id: hash the page with a token in the id's place, then fill it in.
    render_pages(dist, BUILD_ID_TOKEN, pyodide_version)
    build_id = build_hash(precache_manifest(dist))
    page = dist / "index.html"
    page.write_text(page.read_text(encoding="utf-8").replace(BUILD_ID_TOKEN, build_id),
                    encoding="utf-8")
    (dist / "build.json").write_text(json.dumps(
        {"build": build_id, "pyodide": pyodide_version, "version": project_meta()["version"],
         "wheel": wheel.name}, indent=2), encoding="utf-8")
    write_service_worker(dist, precache_manifest(dist), build_id)
    # Wire encodings only, after the precache list: the cache keeps the decoded bytes.
    compress.write_twins(dist)
    return build_id


def main(argv: list[str] | None = None) -> int:
    parser = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    parser.add_argument("command", nargs="?", default="build", choices=("build", "serve"))
    parser.add_argument("--port", type=int, default=int(os.environ.get("PORT", "8000")))
    parser.add_argument("--no-build", action="store_true", help="serve dist/ as it is")
    parser.add_argument("--dist", type=Path, default=DIST, help="where to build (default dist/)")
    parser.add_argument("--database", metavar="URL",
                        help="serve: pass /db/... to this CouchDB-protocol server, as the "
                             "plant's reverse proxy does (e.g. http://127.0.0.1:5984)")
    args = parser.parse_args(argv)
    if not (args.command == "serve" and args.no_build):
        build_id = build(args.dist.resolve())
        print(f"built {args.dist} (build {build_id})")
    if args.command == "serve":
        serve.serve_forever(args.dist.resolve(), port=args.port, database=args.database)
    return 0


if __name__ == "__main__":
    sys.exit(main())
