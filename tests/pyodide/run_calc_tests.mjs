// Runs the native calc test suite inside Pyodide under Node.js, against the wheel the
// build ships: the code that ships is the code that was tested.
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

const pyodide = await loadPyodide({ stdout: (s) => console.log(s), stderr: (s) => console.error(s) });
const sitePackages = pyodide.runPython("import site; site.getsitepackages()[0]");
const install = (path) => pyodide.unpackArchive(new Uint8Array(readFileSync(path)), "wheel",
  { extractDir: sitePackages });
for (const name of readdirSync(wheelDir).filter((n) => n.endsWith(".whl"))) install(join(wheelDir, name));
install(resolve(wheel));
// The tests are read from the repository as they are; the calc they import is the wheel's.
pyodide.FS.mkdirTree("/repo/tests");
pyodide.FS.mount(pyodide.FS.filesystems.NODEFS, { root: join(repo, "tests") }, "/repo/tests");
pyodide.globals.set("pytest_args", pyodide.toPy(pytestArgs));
const status = await pyodide.runPythonAsync(`
import os, sys
os.chdir("/repo")
import calc, pytest
assert calc.__file__.startswith(sys.prefix) or "site-packages" in calc.__file__, calc.__file__
print("calc from", calc.__file__, "on Python", sys.version.split()[0], sys.platform)
# --import-mode=importlib keeps /repo off sys.path: calc can only come from the wheel.
code = pytest.main(["-q", "-p", "no:cacheprovider", "--import-mode=importlib", "--rootdir=/repo",
                    "-o", "addopts=", "tests/calc", *pytest_args])
int(code)
`);
process.exit(status);
