// Runs the native calc test suite and calc's doctests inside Pyodide under Node.js, against
// the wheel the build ships: the code that ships is the code that was tested.
//
//   node tests/pyodide/run_calc_tests.mjs WHEEL TEST_WHEEL_DIR [pytest args...]
//
// The pinned Pyodide comes from node_modules; pytest and its pure-Python dependencies
// are unpacked from wheels downloaded by `make` (Pyodide's own package wheels are not
// reachable offline). Test files that need libraries Pyodide lacks skip themselves.
import { readFileSync, readdirSync } from "node:fs";
import { dirname, join, resolve } from "node:path";
import { fileURLToPath } from "node:url";
import { loadPyodide } from "pyodide";

const here = dirname(fileURLToPath(import.meta.url));
const repo = resolve(here, "..", "..");
const [wheel, wheelDir, ...pytestArgs] = process.argv.slice(2);
if (!wheel || !wheelDir) {
  console.error("usage: run_calc_tests.mjs WHEEL TEST_WHEEL_DIR [pytest args...]");
  process.exit(2);
}

const pyodide = await loadPyodide();
// Python's output byte for byte, so that pytest's progress dots stay on their lines.
const passOn = (stream) => ({ write: (bytes) => { stream.write(Buffer.from(bytes)); return bytes.length; } });
pyodide.setStdout(passOn(process.stdout));
pyodide.setStderr(passOn(process.stderr));
const sitePackages = pyodide.runPython("import site; site.getsitepackages()[0]");
const install = (path) => pyodide.unpackArchive(new Uint8Array(readFileSync(path)), "wheel",
  { extractDir: sitePackages });
for (const name of readdirSync(wheelDir).filter((n) => n.endsWith(".whl"))) install(join(wheelDir, name));
install(resolve(wheel));
// The tests (and the checklist pages some of them read) come from the repository as they
// are; the calc they import is the wheel's.
for (const dir of ["tests", "site_src"]) {
  pyodide.FS.mkdirTree(`/repo/${dir}`);
  pyodide.FS.mount(pyodide.FS.filesystems.NODEFS, { root: join(repo, dir) }, `/repo/${dir}`);
}
pyodide.globals.set("pytest_args", pyodide.toPy(pytestArgs));
const status = await pyodide.runPythonAsync(`
import os, sys
os.chdir("/repo")
from pathlib import Path
import calc, pytest
package = Path(calc.__file__).parent
assert package.is_relative_to(sys.prefix) or "site-packages" in package.parts, package
print("calc from", package, "on Python", sys.version.split()[0], sys.platform)
# --import-mode=importlib keeps /repo off sys.path: calc can only come from the wheel, and
# its doctests are those of the installed package.
code = pytest.main(["-q", "-p", "no:cacheprovider", "--import-mode=importlib", "--rootdir=/repo",
                    "-o", "addopts=", "--doctest-modules", str(package), "tests/calc", *pytest_args])
int(code)
`);
process.exit(status);
