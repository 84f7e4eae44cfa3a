// The worker's quick start, checked: is the memory snapshot build.py made (sitebuild/snapshot.py)
// this build's, whole and restorable, and does the restored interpreter answer as the one that
// made it? snapshot.json names the calc wheel's sha256, which must be the lock file's; the bytes
// must match the size and sha256 it gives; the restored interpreter must carry the same wheel
// hash, and calc.bridge.self_check(sample=True) must give the digest the snapshot maker
// recorded. Anything else (missing, corrupt, another build, too big for the 30 MiB heap
// Pyodide 314.0.x restores into) rejects with the reason, and the worker boots the normal way.
import { timed } from "./boot-phases.js";
import { buildFile } from "./build-cache.js";
import { pristineMemory } from "./wasm-early.js";

const FORMAT = 5; // sitebuild/snapshot.py's FORMAT
const DEFAULT_HEAP_BYTES = 30 * 1024 * 1024;
const SNAPSHOT_FILE = "snapshot.bin";
const SPARSE_MAGIC = 0x325a5053; // "SPZ2" little-endian

function hex(buffer) {
  return Array.from(new Uint8Array(buffer), (b) => b.toString(16).padStart(2, "0")).join("");
}

// Pyodide's snapshot starts with its magic number: a buffer whose first bytes are zero is one
// Pyodide refuses outright ("invalid magic number"), so a fill that fails leaves them zero.
const HEADER_BYTES = 16;

// The stored form is the difference from what a fresh instance holds (sitebuild/snapshot.py):
// "SPZ2", the full size, the base's offset and length, the number of chunks, then per chunk
// its offset, length and bytes. Outside the chunks the snapshot is the base (the wasm's
// static data, from `pristine`, its memory at instantiation) or zero. Written into `out`, a
// zeroed buffer of the full size.
function expand(stored, pristine, out) {
  const view = new DataView(stored.buffer, stored.byteOffset, stored.byteLength);
  if (stored.length < 20 || view.getUint32(0, true) !== SPARSE_MAGIC) throw new Error("snapshot is corrupt (not a stored snapshot)");
  const [size, baseOffset, baseLength, count] = [4, 8, 12, 16].map((at) => view.getUint32(at, true));
  if (size !== out.length) throw new Error(`snapshot expands to ${size} bytes, not ${out.length}`);
  if (!pristine || baseLength > pristine.length || baseOffset + baseLength > size) throw new Error("snapshot's base is not this wasm's memory");
  out.set(pristine.subarray(0, baseLength), baseOffset);
  let at = 20;
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
  const heap = size - new DataView(out.buffer).getUint32(4, true);
  if (heap > DEFAULT_HEAP_BYTES) throw new Error(`snapshot heap of ${heap} bytes outgrows the restore's ${DEFAULT_HEAP_BYTES}`);
}

// Asks for snapshot.json and snapshot.bin at once (call it as the worker starts). Pyodide gets
// the snapshot's buffer as soon as snapshot.json gives its size, so it loads its script,
// instantiates the wasm and sets its runtime up while the snapshot is still being read and
// decoded into that buffer; `filled()`, given to Pyodide as its fsInit hook, holds the restore
// itself back until the buffer is whole. `lockRequest` is the promise of pyodide-lock.json.
export function requestSnapshot(pyodideURL, lockRequest) {
  const metaRequest = fetch(new URL("snapshot.json", pyodideURL)).then((response) => {
    if (!response.ok) throw new Error(`snapshot.json: HTTP ${response.status}`);
    return response.json();
  }).catch((err) => {
    throw new Error("no snapshot in this build (" + err.message + ")");
  });
  let storedRequest = timed("snapshot read", buildFile(new URL(SNAPSHOT_FILE, pyodideURL)).then(async (response) => {
    if (!response.ok) throw new Error(`${SNAPSHOT_FILE}: HTTP ${response.status}`);
    return new Uint8Array(await response.arrayBuffer());
  }));
  // This build's snapshot.json, else a rejection saying why.
  const meta = (async () => {
    const [lock, found] = await Promise.all([lockRequest, metaRequest]);
    if (found.format !== FORMAT) throw new Error("snapshot format " + found.format + " is not known here");
    if (found.wheel_sha256 !== lock.packages.sumpside.sha256) throw new Error("snapshot is from another build");
    if (found.heap_bytes > DEFAULT_HEAP_BYTES) throw new Error(`snapshot heap of ${found.heap_bytes} bytes outgrows the restore's ${DEFAULT_HEAP_BYTES}`);
    return found;
  })();
  // This build's stored bytes, else a rejection saying why.
  let stored = Promise.all([meta, storedRequest]).then(([found, data]) => {
    if (data.length !== found.stored_bytes) throw new Error(`snapshot is ${data.length} bytes, not ${found.stored_bytes}`);
    return data;
  });
  // The digest runs beside the restore; verify() checks it before the interpreter is used.
  const digest = stored.then((data) => timed("snapshot digest", crypto.subtle.digest("SHA-256", data))).then(hex);
  let buffer = meta.then((found) => new Uint8Array(found.bytes));
  const fill = Promise.all([buffer, stored, pristineMemory()]).then(([out, data, base]) => timed("snapshot decode", () => {
    try {
      expand(data, base, out);
    } catch (err) {
      out.fill(0, 0, HEADER_BYTES);
      throw err;
    }
  }));
  let fillError = null;
  fill.catch((err) => { fillError = err; });
  // Awaited only later: marked handled so an early rejection is not reported as unhandled
  // (it still fails the restore, which falls back).
  for (const promise of [metaRequest, storedRequest, meta, stored, digest, buffer, fill]) promise.catch(() => {});

  return {
    // The full snapshot's buffer, for loadPyodide's _loadSnapshot (filled while Pyodide starts).
    buffer: () => buffer,
    // Settles, never rejects, once the buffer is whole or the fill has failed: Pyodide's fsInit.
    filled: () => fill.then(() => undefined, () => undefined),
    // Why the fill failed, if it has: the reason a refused restore reports.
    failure: () => fillError,
    // Throws unless the restored interpreter is this build's and answers as its maker did;
    // returns how long the self-check took.
    async verify(pyodide) {
      const [lock, found] = await Promise.all([lockRequest, meta, fill]);
      if (await digest !== found.sha256) throw new Error("snapshot is corrupt (sha256 differs)");
      const stamped = pyodide.runPython("getattr(__import__('calc'), '_snapshot_wheel_sha256', '')");
      if (stamped !== lock.packages.sumpside.sha256) throw new Error("restored interpreter is from another build");
      const started = performance.now();
      // The sample self-check (the first tool of each topic, both unit systems): the bytes
      // are this build's already; this proves the restored interpreter answers as its maker did.
      const selfCheck = pyodide.pyimport("calc.bridge").self_check;
      const check = JSON.parse(timed("self-check", () => selfCheck.callKwargs({ sample: true })));
      selfCheck.destroy();
      if (!check.ok) throw new Error("restored calculator failed its self-check (" + check.failed.join(", ") + ")");
      if (check.digest !== found.quick_check.digest) throw new Error("restored calculator answered its self-check differently");
      return Math.round(performance.now() - started); // ms of the self-check, for the status line
    },
    // Lets the snapshot's bytes go (15 MB stored, 30 MB expanded) once the restore has used
    // or refused them.
    release() { storedRequest = stored = buffer = null; },
  };
}
