"""Download the wheels that the in-Pyodide test run unpacks: each package at the version
installed here, built for the pinned Pyodide (pure Python, or compiled to WebAssembly, as
Hypothesis's core is), with the platform and Python its lock file names.

    python tests/pyodide/download_wheels.py DIR PACKAGE...
"""

import importlib.metadata
import json
import subprocess
import sys
from pathlib import Path

LOCK = Path(__file__).resolve().parents[2] / "node_modules" / "pyodide" / "pyodide-lock.json"


def main(target: str, *packages: str) -> None:
    info = json.loads(LOCK.read_text())["info"]
    python = "".join(info["python"].split(".")[:2])
    subprocess.run([sys.executable, "-m", "pip", "download", "--quiet", "--no-deps", "--only-binary=:all:",
                    "--platform", f"pyemscripten_{info['abi_version']}_{info['arch']}",
                    "--python-version", python, "--implementation", "cp", "--abi", f"cp{python}",
                    "-d", target, *(f"{p}=={importlib.metadata.version(p)}" for p in packages)], check=True)


if __name__ == "__main__":
    main(*sys.argv[1:])
