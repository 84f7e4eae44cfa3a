// Runs the native calc test suite and calc's doctests inside Pyodide under Node.js, against
// the wheel the build ships: the code that ships is the code that was tested.
//
//   node tests/pyodide/run_calc_tests.mjs WHEEL TEST_WHEEL_DIR OUTCOMES_JSON [pytest args...]
//
// The pinned Pyodide comes from node_modules; pytest, Hypothesis and their dependencies
// are unpacked from wheels downloaded by `make` (Pyodide's own package wheels are not
// reachable offline). Test files that need libraries Pyodide lacks skip themselves.
// OUTCOMES_JSON receives {passed: [id...], skipped: {id: reason}}, each id as the native
// run names it: a path from the repository (tests) or from site-packages (calc's doctests).
import { readFileSync, readdirSync, writeFileSync } from "node:fs";
import { dirname, join, resolve } from "node:path";
import { fileURLToPath } from "node:url";
import { loadPyodide } from "pyodide";

const here = dirname(fileURLToPath(import.meta.url));
const repo = resolve(here, "..", "..");
const [wheel, wheelDir, outcomesFile, ...pytestArgs] = process.argv.slice(2);
if (!wheel || !wheelDir || !outcomesFile) {
  console.error("usage: run_calc_tests.mjs WHEEL TEST_WHEEL_DIR OUTCOMES_JSON [pytest args...]");
  process.exit(2);
}

// CI chooses Hypothesis's profile (tests/calc/conftest.py) in here as it does natively.
const pyodide = await loadPyodide({ env: "CI" in process.env ? { CI: process.env.CI } : {} });
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
const [status, outcomes] = (await pyodide.runPythonAsync(`
import json, os, sys
from pathlib import Path
os.chdir("/repo")
import calc, pytest
package = Path(calc.__file__).parent
assert package.is_relative_to(sys.prefix) or "site-packages" in package.parts, package
print("calc from", package, "on Python", sys.version.split()[0], sys.platform)


class Outcomes:
    """Passed and skipped ids, named as the native run names them."""

    def __init__(self):
        self.ids, self.passed, self.skipped = {}, [], {}

    def pytest_itemcollected(self, item):
        # calc's files from site-packages, the tests' from the repository: as natively.
        path = item.path.relative_to(package.parent if item.path.is_relative_to(package) else Path.cwd())
        self.ids[item.nodeid] = f"{path.as_posix()}::{item.nodeid.split('::', 1)[1]}"

    def pytest_collectreport(self, report):
        if report.skipped:
            self.skipped[report.nodeid] = why(report)

    def pytest_runtest_logreport(self, report):
        if report.passed and report.when == "call":
            self.passed.append(self.ids[report.nodeid])
        elif report.skipped:
            self.skipped[self.ids[report.nodeid]] = why(report)


def why(report):
    """The reason of a skip, or of an expected failure."""
    return report.longrepr[2] if isinstance(report.longrepr, tuple) else f"xfail: {report.wasxfail}"


outcomes = Outcomes()
# --import-mode=importlib keeps /repo off sys.path: calc can only come from the wheel, and
# its doctests are those of the installed package.
code = pytest.main(["-q", "-p", "no:cacheprovider", "--import-mode=importlib", "--rootdir=/repo",
                    "-o", "addopts=", "-o", "markers=slow: as in pyproject.toml",
                    "--doctest-modules", str(package), "tests/calc", *pytest_args],
                   plugins=[outcomes])
hypothesis = sys.modules.get("hypothesis")
print("Hypothesis profile:", hypothesis and hypothesis.settings.get_current_profile_name())
int(code), json.dumps({"passed": outcomes.passed, "skipped": outcomes.skipped})
`)).toJs();
writeFileSync(outcomesFile, outcomes);
process.exit(status);
