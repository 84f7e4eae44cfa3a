// Make the worker's memory snapshot at build time, in Node.js, with the build's own Pyodide.
//
//   node sitebuild/make_snapshot.mjs <dist/pyodide dir> <out.bin> <wheel sha256> <probe request JSON>
//
// Boots the pinned Pyodide with _makeSnapshot, loads the calc wheel from the build's lock
// file, imports every tool module, runs every tool once on its defaults (and once in US
// units) so every lazy path is warm, stamps the wheel's sha256 into the interpreter (the
// worker reads it back after a restore to tell a snapshot of another build), and writes
// pyodide.makeMemorySnapshot() to <out.bin>. Prints one JSON line with what it did.
// _makeSnapshot and makeMemorySnapshot are underscore/private options of Pyodide 314.0.x.
import { readFileSync, writeFileSync } from "node:fs";
import path from "node:path";
import { pathToFileURL } from "node:url";

const [pyodideDir, outFile, wheelSha, probe] = process.argv.slice(2);
if (!pyodideDir || !outFile || !/^[0-9a-f]{64}$/.test(wheelSha || "") || !probe) {
  console.error("usage: make_snapshot.mjs <dist/pyodide> <out.bin> <wheel sha256> <probe JSON>");
  process.exit(2);
}
const indexDir = path.resolve(pyodideDir) + path.sep;
const { loadPyodide } = await import(pathToFileURL(path.join(indexDir, "pyodide.mjs")).href);

const started = performance.now();
const pyodide = await loadPyodide({
  indexURL: indexDir,
  lockFileURL: path.join(indexDir, "pyodide-lock.json"),
  _makeSnapshot: true,
  stdout: () => {},
  stderr: (line) => console.error(line),
});
// loadPackage would leave JS objects in the interpreter's table, which makeMemorySnapshot
// refuses ("Unexpected hiwire entry"): unpack the wheel into site-packages from Python instead.
const lock = JSON.parse(readFileSync(path.join(indexDir, "pyodide-lock.json"), "utf8"));
const entry = lock.packages.sumpside;
if (entry.sha256 !== wheelSha) {
  console.error(`snapshot: the lock file's wheel is ${entry.sha256}, not ${wheelSha}`);
  process.exit(1);
}
pyodide.FS.writeFile("/tmp/sumpside.whl", readFileSync(path.join(indexDir, entry.file_name)));

// Everything runs in Python and returns a string: no JS proxy may be alive at snapshot time.
const report = pyodide.runPython(`
import gc, json, pkgutil, importlib, sys, site, zipfile
with zipfile.ZipFile("/tmp/sumpside.whl") as _wheel:
    _wheel.extractall(site.getsitepackages()[0])
import calc, calc.bridge, calc.kernel.registry
# Every module of the package, not only the registered topics: a lazy import after a
# restore would need the wheel's files, which a memory snapshot does not hold.
for info in pkgutil.walk_packages(calc.__path__, "calc."):
    if info.name != "calc.__main__":
        importlib.import_module(info.name)
_tools = calc.kernel.registry.tools()
_failed = []
for _id in _tools:
    for _units in ("metric", "us"):
        _answer = json.loads(calc.bridge.run_json(json.dumps({"tool": _id, "inputs": {}, "units": _units})))
        if not _answer.get("ok"):
            _failed.append(_id + "/" + _units)
    calc.bridge.reexpress_json(json.dumps({"tool": _id, "inputs": {}, "from": "metric", "to": "us"}))
calc.bridge.catalogue()
# The answer a fresh interpreter gives the worker's probe: the worker asks it again after a restore.
_probe_answer = calc.bridge.run_json(${JSON.stringify(probe)})
import random
sys.modules["calc"]._snapshot_wheel_sha256 = ${JSON.stringify(wheelSha)}
_report = json.dumps({"tools": len(_tools), "failed": _failed, "probe_answer": _probe_answer,
                      "modules": sorted(m for m in sys.modules if m == "calc" or m.startswith("calc."))})
del _tools, _failed, _id, _units, _answer, _wheel, _probe_answer
gc.collect()
_report
`);
const parsed = JSON.parse(report);
if (parsed.failed.length) {
  console.error("snapshot: tools failed on their defaults: " + parsed.failed.join(", "));
  process.exit(1);
}
pyodide.runPython("del _report; import gc; gc.collect()");
const snapshot = pyodide.makeMemorySnapshot();
writeFileSync(outFile, snapshot);
console.log(JSON.stringify({ bytes: snapshot.length, tools: parsed.tools, probe_answer: parsed.probe_answer,
  modules: parsed.modules.length, ms: Math.round(performance.now() - started) }));
