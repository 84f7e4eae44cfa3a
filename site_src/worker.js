// The calculator's thread: boots Pyodide from this build's own copy and answers
// {id, op, request} messages with the bridge's JSON. It never touches the page; the page
// never waits on it to be usable.
//
// Fast path: restore the memory snapshot build.py made (an interpreter that already
// imported calc and ran every tool), after checking it belongs to this build: snapshot.json
// names the calc wheel's sha256, which must be the lock file's; the bytes must match the
// size and sha256 it gives; the restored interpreter must carry the same wheel hash and
// give the probe the same answer a fresh one gave at build time. Anything else (missing,
// corrupt, another build, too big for the 30 MiB heap Pyodide 314.0.x restores into)
// falls back to the normal boot, and the status line says why.
// _loadSnapshot is an experimental, underscore-named option of the pinned Pyodide.
import { loadPyodide } from "./pyodide/pyodide.mjs";

const base = new URL("./", import.meta.url);
const pyodideURL = new URL("pyodide/", base);
const DEFAULT_HEAP_BYTES = 30 * 1024 * 1024;
const SNAPSHOT_FILE = "snapshot.bin";
const SPARSE_MAGIC = 0x315a5053; // "SPZ1" little-endian
let runJson = null;
let reexpressJson = null;

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

function hex(buffer) {
  return Array.from(new Uint8Array(buffer), (b) => b.toString(16).padStart(2, "0")).join("");
}

// Pyodide compiles its wasm only once its script has loaded and the snapshot is in hand;
// compiling it here from the start runs that beside both. Pyodide's own instantiation then
// gets this compiled module (a new instance of it, for the fallback boot too); any other
// streaming instantiation, or a failed compile, goes the original way.
const wasmURL = new URL("pyodide.asm.wasm", pyodideURL).href;
const wasmModule = WebAssembly.compileStreaming(fetch(wasmURL));
wasmModule.catch(() => {});
const instantiateStreaming = WebAssembly.instantiateStreaming;
WebAssembly.instantiateStreaming = async (source, imports) => {
  const response = await source;
  if (response && response.url === wasmURL) {
    const module = await wasmModule.catch(() => null);
    if (module) {
      // Pyodide's own download of the same file is not needed: stop it (a first visit
      // would otherwise fetch the 9.6 MB twice, besides the service worker's copy).
      response.body?.cancel().catch(() => {});
      return { instance: await WebAssembly.instantiate(module, imports), module };
    }
  }
  return instantiateStreaming(response, imports);
};

// Everything a restore needs is asked for as soon as the worker starts, and loadPyodide
// starts at once too, with promises of the lock file and the snapshot: reading the snapshot
// from the cache then overlaps with Pyodide loading its own script.
const lockRequest = fetchJSON("pyodide-lock.json");
const metaRequest = fetchJSON("snapshot.json").catch((err) => {
  throw new Error("no snapshot in this build (" + err.message + ")");
});
metaRequest.catch(() => {});
let storedSnapshot = fetch(new URL(SNAPSHOT_FILE, pyodideURL)).then(async (response) => {
  if (!response.ok) throw new Error(`${SNAPSHOT_FILE}: HTTP ${response.status}`);
  return new Uint8Array(await response.arrayBuffer());
});
storedSnapshot.catch(() => {});

// The stored form leaves out the heap's long runs of zero bytes (sitebuild/snapshot.py):
// "SPZ1", the full size, the number of chunks, then per chunk its offset, length and bytes.
function expand(stored) {
  const view = new DataView(stored.buffer, stored.byteOffset, stored.byteLength);
  if (stored.length < 12 || view.getUint32(0, true) !== SPARSE_MAGIC) throw new Error("snapshot is corrupt (not a stored snapshot)");
  const size = view.getUint32(4, true);
  const count = view.getUint32(8, true);
  const out = new Uint8Array(size);
  let at = 12;
  for (let i = 0; i < count; i++) {
    if (at + 8 > stored.length) throw new Error("snapshot is corrupt (chunk table)");
    const offset = view.getUint32(at, true);
    const length = view.getUint32(at + 4, true);
    at += 8;
    if (offset + length > size || at + length > stored.length) throw new Error("snapshot is corrupt (chunk bounds)");
    out.set(stored.subarray(at, at + length), offset);
    at += length;
  }
  if (at !== stored.length) throw new Error("snapshot is corrupt (trailing bytes)");
  return out;
}

// The snapshot's bytes and their digest once they are known to be this build's, else a
// rejection saying why. The digest runs beside the restore; it is checked before use.
function snapshotBytes() {
  const stored = (async () => {
    const lock = await lockRequest;
    const meta = await metaRequest;
    const wheelSha = lock.packages.sumpside.sha256;
    if (meta.format !== 2) throw new Error("snapshot format " + meta.format + " is not known here");
    if (meta.wheel_sha256 !== wheelSha) throw new Error("snapshot is from another build");
    const data = await storedSnapshot;
    if (data.length !== meta.stored_bytes) throw new Error(`snapshot is ${data.length} bytes, not ${meta.stored_bytes}`);
    return data;
  })();
  const digest = stored.then((data) => crypto.subtle.digest("SHA-256", data)).then(hex);
  const bytes = stored.then(async (data) => {
    const meta = await metaRequest;
    const full = expand(data);
    if (full.length !== meta.bytes) throw new Error(`snapshot expands to ${full.length} bytes, not ${meta.bytes}`);
    const heap = full.length - new DataView(full.buffer).getUint32(4, true);
    if (heap > DEFAULT_HEAP_BYTES) throw new Error(`snapshot heap of ${heap} bytes outgrows the restore's ${DEFAULT_HEAP_BYTES}`);
    return full;
  });
  // loadPyodide awaits the bytes only later: mark both handled so an early rejection is not
  // reported as unhandled (it still fails the restore, which falls back).
  digest.catch(() => {});
  bytes.catch(() => {});
  return { bytes, digest };
}

function bind(pyodide) {
  const bridge = pyodide.pyimport("calc.bridge");
  runJson = (text) => bridge.run_json(text);
  reexpressJson = (text) => bridge.reexpress_json(text);
}

async function bootSnapshot() {
  // A rejection of the bytes fails loadPyodide; the digest is checked before any use.
  const { bytes, digest } = snapshotBytes();
  const pyodide = await loadPyodide({ ...options(lockRequest), _loadSnapshot: bytes });
  const lock = await lockRequest;
  const meta = await metaRequest;
  const wheelSha = lock.packages.sumpside.sha256;
  if (await digest !== meta.sha256) throw new Error("snapshot is corrupt (sha256 differs)");
  const stamped = pyodide.runPython("getattr(__import__('calc'), '_snapshot_wheel_sha256', '')");
  if (stamped !== wheelSha) throw new Error("restored interpreter is from another build");
  // A restored interpreter starts with the snapshot's random state: give it a fresh one.
  pyodide.runPython("import random; random.seed()");
  bind(pyodide);
  const answer = runJson(JSON.stringify(meta.probe));
  if (answer !== meta.probe_answer) throw new Error("restored calculator answered the probe differently");
  // The snapshot holds memory, not files: lay the wheel's files down again once idle, so
  // tracebacks and anything reading the package's files find them. Every module is
  // imported already, so nothing waits on this.
  setTimeout(() => layDownWheel(pyodide, lock).catch((err) => console.warn("wheel files:", err)), 1500);
  return pyodide;
}

async function layDownWheel(pyodide, lock) {
  const entry = lock.packages.sumpside;
  const response = await fetch(new URL(entry.file_name, pyodideURL));
  if (!response.ok) throw new Error(`${entry.file_name}: HTTP ${response.status}`);
  pyodide.FS.writeFile("/tmp/sumpside.whl", new Uint8Array(await response.arrayBuffer()));
  pyodide.runPython("import site, zipfile\nwith zipfile.ZipFile('/tmp/sumpside.whl') as w:\n"
    + "    w.extractall(site.getsitepackages()[0])");
  pyodide.FS.unlink("/tmp/sumpside.whl");
}

async function bootNormal(lock) {
  const pyodide = await loadPyodide(options(lock));
  await pyodide.loadPackage("sumpside", { messageCallback: () => {}, errorCallback: (m) => console.warn(m) });
  bind(pyodide);
  // One real answer before saying "ready": a broken wheel shows here, not at the first tap.
  const probe = JSON.parse(runJson(JSON.stringify({ tool: "viscosity-at-temperature", inputs: {} })));
  if (!probe.ok) throw new Error("calculator self-check failed");
  return pyodide;
}

async function boot() {
  // ms in "ready" count from the worker's creation (its time origin), script loading included.
  status("starting", "Starting calculator…");
  let note = "";
  try {
    await bootSnapshot().finally(() => { storedSnapshot = null; }); // let the 15 MB go
    postMessage({ type: "ready", ms: Math.round(performance.now()), mode: "snapshot" });
    return;
  } catch (err) {
    note = String(err && err.message ? err.message : err);
    console.warn("snapshot boot failed, booting the normal way:", note);
    runJson = reexpressJson = null;
    status("starting", "Starting calculator the slow way (quick start unavailable: " + note + ")…",
      { mode: "normal", note });
  }
  await bootNormal(await lockRequest);
  postMessage({ type: "ready", ms: Math.round(performance.now()), mode: "normal", note });
}

const booted = boot().catch((err) => {
  status("failed", "Calculator failed to start: " + (err && err.message ? err.message : err));
  throw err;
});

self.onmessage = async (event) => {
  const { id, op, request } = event.data || {};
  try {
    await booted;
    const call = op === "reexpress" ? reexpressJson : runJson;
    postMessage({ type: "answer", id, answer: JSON.parse(call(JSON.stringify(request))) });
  } catch (err) {
    postMessage({ type: "answer", id, answer: { tool: request && request.tool, ok: false,
      errors: [{ field: "calculator", message: String(err && err.message ? err.message : err) }] } });
  }
};
