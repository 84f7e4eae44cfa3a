// Make the worker's memory snapshot at build time, in Node.js, with the build's own Pyodide;
// or, first, find which files of the standard library the app needs.
//
//   node sitebuild/make_snapshot.mjs survey <dist/pyodide dir> <full python_stdlib.zip>
//   node sitebuild/make_snapshot.mjs snapshot <dist/pyodide dir> <out.bin> <wheel sha256>
//
// Both boot the pinned Pyodide, load the calc wheel from the build's lock file, import every
// module of calc, run calc.bridge.self_check() (every tool on its defaults in both unit
// systems) so every lazy path is warm, warm the unit switch, the log's trend charts and a
// traceback of calc's own (what a bug report formats).
//
// survey boots with Pyodide's whole standard library and loads the wheel with loadPackage,
// as the worker's normal boot does, then prints one JSON line: the stdlib files the
// interpreter imported (sitebuild/stdlib.py ships only those; the snapshot is made with
// that cut zip, which is then the one a restore and a normal boot both find).
//
// snapshot boots with _makeSnapshot, stamps the wheel's sha256 into the interpreter (the
// worker reads it back after a restore to tell a snapshot of another build), and writes
// pyodide.makeMemorySnapshot() to <out.bin>, the same bytes at every run (makeRepeatable).
// Prints one JSON line with what it did, the self-checks among it: the worker runs the
// sample one (self_check(sample=True)) again after a restore and compares.
// _makeSnapshot and makeMemorySnapshot are underscore/private options of Pyodide 314.0.x.
import { readFileSync, writeFileSync } from "node:fs";
import { createRequire } from "node:module";
import path from "node:path";
import { pathToFileURL } from "node:url";

const [mode, pyodideDir, ...rest] = process.argv.slice(2);
const survey = mode === "survey";
const [outFile, wheelSha] = survey ? [null, null] : rest;
if (!pyodideDir || !(survey ? rest[0] : mode === "snapshot" && outFile && /^[0-9a-f]{64}$/.test(wheelSha || ""))) {
  console.error("usage: make_snapshot.mjs survey <dist/pyodide> <python_stdlib.zip>\n"
    + "       make_snapshot.mjs snapshot <dist/pyodide> <out.bin> <wheel sha256>");
  process.exit(2);
}
const indexDir = path.resolve(pyodideDir) + path.sep;
const { loadPyodide } = await import(pathToFileURL(path.join(indexDir, "pyodide.mjs")).href);
const started = process.hrtime.bigint();
makeRepeatable();
const pyodide = await loadPyodide({
  indexURL: indexDir,
  lockFileURL: path.join(indexDir, "pyodide-lock.json"),
  ...(survey ? { stdLibURL: path.resolve(rest[0]) } : { _makeSnapshot: true }),
  // Else Node.js gives this script's path as sys.executable, and a copy of the project
  // elsewhere makes another snapshot; this is what a browser's boot has.
  _sysExecutable: "./this.program",
  stdout: () => {},
  stderr: (line) => console.error(line),
});
if (survey) {
  await pyodide.loadPackage("sumpside", { messageCallback: () => {}, errorCallback: (m) => console.error(m) });
} else {
  // loadPackage would leave JS objects in the interpreter's table, which makeMemorySnapshot
  // refuses ("Unexpected hiwire entry"): unpack the wheel into site-packages from Python instead.
  const lock = JSON.parse(readFileSync(path.join(indexDir, "pyodide-lock.json"), "utf8"));
  const entry = lock.packages.sumpside;
  if (entry.sha256 !== wheelSha) {
    console.error(`snapshot: the lock file's wheel is ${entry.sha256}, not ${wheelSha}`);
    process.exit(1);
  }
  // calc's wheel and the wheels it needs (segno, for the label's QR code).
  for (const name of ["sumpside", ...entry.depends]) {
    pyodide.FS.writeFile("/tmp/package.whl", readFileSync(path.join(indexDir, lock.packages[name].file_name)));
    pyodide.runPython(`
import site, zipfile
with zipfile.ZipFile("/tmp/package.whl") as _wheel:
    _wheel.extractall(site.getsitepackages()[0])
del _wheel`);
  }
}

// Everything runs in Python and returns a string: no JS proxy may be alive at snapshot time.
const report = pyodide.runPython(`
import gc, json, pkgutil, importlib, sys, traceback
import calc, calc.bridge, calc.kernel.registry
# Every module of the package, not only the registered topics: a lazy import after a
# restore would need the wheel's files, which a memory snapshot does not hold.
for info in pkgutil.walk_packages(calc.__path__, "calc."):
    if info.name != "calc.__main__":
        importlib.import_module(info.name)
_tools = calc.kernel.registry.tools()
# Every tool's answers (each must pass), and the sample of them the worker runs again after
# a restore and compares.
_check = calc.bridge.self_check()
_quick = calc.bridge.self_check(sample=True)
for _id in _tools:
    calc.bridge.reexpress_json(json.dumps({"tool": _id, "inputs": {}, "from": "metric", "to": "us"}))
calc.bridge.catalogue()
# The demo plant's machine pages warm the machine kit (its trend charts among them).
_plant = json.loads(calc.bridge.machines_json(json.dumps({"op": "demo", "today": "2026-01-01"})))
for _machine in _plant["machines"]:
    calc.bridge.machines_json(json.dumps({"op": "machine-page", "machine": _machine, "units": "us",
                                          "readings": _plant["readings"], "today": "2026-01-01"}))
# The label's QR code (segno, outside calc), every module of it, and one code drawn.
import segno, qr_label
for info in pkgutil.walk_packages(segno.__path__, "segno."):
    if not info.name.endswith("__main__") and ".cli" not in info.name:
        importlib.import_module(info.name)
assert json.loads(qr_label.svg_json(json.dumps({"text": "https://sumpside.invalid/#/label/1.x"})))["ok"]
# A traceback through calc's own code, as a bug report formats one (linecache reads the source).
try:
    calc.kernel.registry.get("")
except Exception as _err:
    traceback.format_exception(_err)
import random
sys.modules["calc"]._snapshot_wheel_sha256 = ${JSON.stringify(wheelSha || "")}
_zip = next(p for p in sys.path if p.endswith(".zip")) + "/"
_report = json.dumps({"tools": len(_tools), "self_check": json.loads(_check), "quick_check": json.loads(_quick),
                      "modules": sorted(m for m in sys.modules if m == "calc" or m.startswith("calc.")),
                      "stdlib": sorted({m.__file__[len(_zip):] for m in list(sys.modules.values())
                                        if (getattr(m, "__file__", None) or "").startswith(_zip)})})
del _tools, _check, _quick, _id, _plant, _machine, _zip
gc.collect()
_report
`);
const parsed = JSON.parse(report);
if (!parsed.self_check.ok) {
  console.error(`${mode}: tools failed on their defaults: ` + parsed.self_check.failed.join(", "));
  process.exit(1);
}
if (survey) {
  console.log(JSON.stringify({ stdlib: parsed.stdlib, tools: parsed.tools }));
  process.exit(0);
}
pyodide.runPython("del _report; import gc; gc.collect()");
const zeroed = zeroFreeMemory(pyodide._module);
const heap = heapFigures(pyodide._module);
const snapshot = pyodide.makeMemorySnapshot();
writeFileSync(outFile, snapshot);
console.log(JSON.stringify({ bytes: snapshot.length, tools: parsed.tools, self_check: parsed.self_check,
  quick_check: parsed.quick_check, modules: parsed.modules.length, heap, zeroed, ms: Number((process.hrtime.bigint() - started) / 1000000n) }));

// Freed memory keeps what it last held, and every byte that is not zero is stored, sent to
// every phone and read at every boot. So each free chunk of the allocator is taken (the
// largest first; a request that moves the break is given back, and that size is done),
// cleared and given back; only the chunks' own headers stay. Returns the bytes cleared.
function zeroFreeMemory(module) {
  const taken = [];
  let cleared = 0;
  for (let size = 1 << 20; size >= 16; size >>= 2) {
    for (;;) {
      const brk = module._sbrk(0);
      const at = module._malloc(size);
      if (!at || module._sbrk(0) !== brk) {
        if (at) module._free(at);
        break;
      }
      module.HEAPU8.fill(0, at, at + size);
      taken.push(at);
      cleared += size;
    }
  }
  for (const at of taken) module._free(at);
  return cleared;
}

// What the allocator holds in the memory being saved: its "arena" (bytes it took from the
// system with sbrk, from the heap's start to its break) and, of that, the bytes in use, from
// dlmalloc's mallinfo (a struct of ten ints returned through a pointer: arena first,
// uordblks eighth). Everything above the heap's start is what malloc may ever have.
function heapFigures(module) {
  const saved = module.stackSave();
  const info = module.stackAlloc(40);
  module._mallinfo(info);
  const words = Int32Array.from(new Int32Array(module.HEAP8.buffer, info, 10));
  module.stackRestore(saved);
  const memory = module.HEAP8.length;
  const brk = module._sbrk(0);
  return { memory, heap_start: brk - words[0], break: brk, arena: words[0], in_use: words[7] };
}

// Two builds of the same commit must give the same snapshot, byte for byte, or every phone
// downloads it again. What the interpreter's memory takes from this machine is its entropy
// (the str hash secret, the random module's seed, the allocator's canaries: all from
// node:crypto's randomFillSync in Pyodide's Node.js glue) and its clocks (file times, the
// import system's directory caches, time.monotonic's base). So the entropy comes from a
// seeded generator and both clocks count their own calls from a fixed start: the same run
// then reads the same values. Only this Node.js process is affected; the worker gives the
// restored interpreter fresh entropy and the browser's clocks.
function makeRepeatable() {
  const nodeCrypto = createRequire(import.meta.url)("node:crypto");
  let block = 0;
  nodeCrypto.randomFillSync = (view) => {
    const bytes = new Uint8Array(view.buffer, view.byteOffset, view.byteLength);
    for (let at = 0; at < bytes.length; at += 32) {
      const digest = nodeCrypto.createHash("sha256").update(`sumpside snapshot ${block++}`).digest();
      bytes.set(digest.subarray(0, Math.min(32, bytes.length - at)), at);
    }
    return view;
  };
  const EPOCH_MS = Date.UTC(2020, 0, 1);
  let wallCalls = 0;
  let monotonicCalls = 0;
  Date.now = () => EPOCH_MS + wallCalls++;
  performance.now = () => 0.01 * monotonicCalls++;
}
