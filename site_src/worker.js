// The calculator's thread: boots Pyodide from this build's own copy and answers
// {id, op, request} messages with the bridge's JSON. It never touches the page; the page
// never waits on it to be usable.
//
// Fast path: restore the memory snapshot build.py made (an interpreter that already imported
// calc and ran every tool), once js/snapshot-check.js has found it to be this build's; else
// the normal boot, and the status line says why. Either way calc.bridge.self_check() passes
// before the worker says "ready": its sample (the first tool of each topic) on a restored
// snapshot, whose bytes are checked already; every tool on a normal boot. js/boot-phases.js
// keeps when each step ran. _loadSnapshot is an experimental, underscore-named option of the
// pinned Pyodide.
import { loadPyodide } from "./pyodide/pyodide.mjs";
import { requestSnapshot } from "./js/snapshot-check.js";
import { compileEarly } from "./js/wasm-early.js";
import { phases, timed } from "./js/boot-phases.js";
import { buildFile } from "./js/build-cache.js";

const base = new URL("./", import.meta.url);
const pyodideURL = new URL("pyodide/", base);
// The entry point for each op the page sends (js/calc-client.js): calc's bridge, and the
// label's QR code (qr_label, segno: outside calc, which stays standard-library only).
const ENTRIES = { run: "run_json", reexpress: "reexpress_json", machines: "machines_json", qr: "svg_json" };
let bridge = null;
let label = null;

function status(state, text, extra = {}) {
  postMessage({ type: "status", state, text, ...extra });
}

function options(lock) {
  return {
    indexURL: pyodideURL.href,
    lockFileContents: lock,
    packageBaseUrl: pyodideURL.href,
    stdout: () => {},
    stderr: (line) => console.warn(line),
  };
}

async function fetchJSON(name) {
  const response = await fetch(new URL(name, pyodideURL));
  if (!response.ok) throw new Error(`${name}: HTTP ${response.status}`);
  return response.json();
}

// Pyodide's wasm compiles from the start, beside its script and the snapshot (js/wasm-early.js).
compileEarly(new URL("pyodide.asm.wasm", pyodideURL).href);

// Everything a restore needs is asked for as soon as the worker starts, and loadPyodide
// starts at once too, with promises of the lock file and the snapshot's buffer: reading and
// decoding the snapshot then overlap with Pyodide loading its script and instantiating.
const lockRequest = fetchJSON("pyodide-lock.json");
let snapshot = requestSnapshot(pyodideURL, lockRequest);

async function bootSnapshot() {
  const load = loadPyodide({ ...options(lockRequest), _loadSnapshot: snapshot.buffer(), fsInit: snapshot.filled });
  // A refused fill leaves Pyodide a buffer it rejects ("invalid magic number"): say why instead.
  const pyodide = await timed("pyodide load", load).catch((err) => { throw snapshot.failure() || err; });
  const checkMs = await snapshot.verify(pyodide);
  // A restored interpreter starts with the snapshot's random state: give it a fresh one.
  pyodide.runPython("import random; random.seed()");
  bridge = pyodide.pyimport("calc.bridge");
  label = pyodide.pyimport("qr_label");
  // The snapshot holds memory, not files: lay the wheel's files down again once idle, so
  // tracebacks and anything reading the package's files find them. Every module is
  // imported already, so nothing waits on this.
  const lock = await lockRequest;
  setTimeout(() => layDownWheel(pyodide, lock).catch((err) => console.warn("wheel files:", err)), 1500);
  return checkMs;
}

async function layDownWheel(pyodide, lock) {
  const entry = lock.packages.sumpside;
  const response = await buildFile(new URL(entry.file_name, pyodideURL));
  if (!response.ok) throw new Error(`${entry.file_name}: HTTP ${response.status}`);
  pyodide.FS.writeFile("/tmp/sumpside.whl", new Uint8Array(await response.arrayBuffer()));
  pyodide.runPython("import site, zipfile\nwith zipfile.ZipFile('/tmp/sumpside.whl') as w:\n"
    + "    w.extractall(site.getsitepackages()[0])");
  pyodide.FS.unlink("/tmp/sumpside.whl");
}

async function bootNormal(lock) {
  const pyodide = await timed("pyodide load", loadPyodide(options(lock)));
  await timed("calc load", pyodide.loadPackage("sumpside", { messageCallback: () => {}, errorCallback: (m) => console.warn(m) }));
  bridge = pyodide.pyimport("calc.bridge");
  label = pyodide.pyimport("qr_label");
  // Every tool answers once before "ready": a broken wheel shows here, not at the first tap.
  const started = performance.now();
  const check = JSON.parse(timed("self-check", () => bridge.self_check()));
  if (!check.ok) throw new Error("calculator self-check failed (" + check.failed.join(", ") + ")");
  return Math.round(performance.now() - started);
}

async function boot() {
  // ms in "ready" count from the worker's creation (its time origin), script loading included.
  status("starting", "Starting calculator…");
  let note = "";
  try {
    const checkMs = await bootSnapshot().finally(() => { snapshot.release(); snapshot = null; });
    postMessage({ type: "ready", ms: Math.round(performance.now()), mode: "snapshot", checkMs, phases });
    return;
  } catch (err) {
    note = String(err && err.message ? err.message : err);
    console.warn("snapshot boot failed, booting the normal way:", note);
    bridge = null;
    label = null;
    status("starting", "Starting calculator the slow way (quick start unavailable: " + note + ")…",
      { mode: "normal", note });
  }
  const checkMs = await bootNormal(await lockRequest);
  postMessage({ type: "ready", ms: Math.round(performance.now()), mode: "normal", note, checkMs, phases });
}

const booted = boot().catch((err) => {
  status("failed", "Calculator failed to start: " + (err && err.message ? err.message : err));
  throw err;
});

let firstCall = true;

self.onmessage = async (event) => {
  const { id, op, request } = event.data || {};
  try {
    await booted;
    if (!(op in ENTRIES)) throw new Error("unknown request " + op);
    const call = () => JSON.parse((op === "qr" ? label : bridge)[ENTRIES[op]](JSON.stringify(request)));
    const answer = firstCall && op === "run" ? timed("first call", call) : call();
    if (op === "run") firstCall = false;
    postMessage({ type: "answer", id, answer });
  } catch (err) {
    postMessage({ type: "answer", id, answer: { tool: request && request.tool, ok: false,
      errors: [{ field: "calculator", message: String(err && err.message ? err.message : err) }] } });
  }
};
