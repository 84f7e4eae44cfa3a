// Pyodide compiles its wasm only once its script has loaded; compiling it from the worker's
// start runs that beside the script and the snapshot. Pyodide's own instantiation then gets
// this compiled module (a new instance of it, for the fallback boot too); any other
// streaming instantiation, or a failed compile, goes the original way.
//
// The instance's memory as its data segments lay it out, before any code has run, is kept
// too (`pristineMemory`): the stored snapshot is the difference from it (js/snapshot-check.js).
import { timed } from "./boot-phases.js";
import { buildFile } from "./build-cache.js";

let keepPristine;
const pristine = new Promise((resolve) => { keepPristine = resolve; });

// The first bytes of the wasm's memory at instantiation (its static data, up to the stack),
// or null if it was never instantiated here the expected way.
export function pristineMemory() {
  return pristine;
}

function kept(instance) {
  const memory = instance.exports.memory;
  const end = instance.exports.__stack_low?.value;
  keepPristine(memory && end ? new Uint8Array(memory.buffer.slice(0, end)) : null);
  return instance;
}

export function compileEarly(wasmURL) {
  const wasmModule = timed("wasm compile", WebAssembly.compileStreaming(buildFile(wasmURL)));
  wasmModule.catch(() => {});
  const instantiateStreaming = WebAssembly.instantiateStreaming;
  WebAssembly.instantiateStreaming = async (source, imports) => {
    const response = await source;
    if (!response || response.url !== wasmURL) return instantiateStreaming(response, imports);
    const module = await wasmModule.catch(() => null);
    try {
      if (!module) {
        const result = await instantiateStreaming(response, imports);
        return { instance: kept(result.instance), module: result.module };
      }
      // Pyodide's own download of the same file is not needed: stop it (a first visit
      // would otherwise fetch the 9.6 MB twice, besides the service worker's copy).
      response.body?.cancel().catch(() => {});
      return { instance: kept(await timed("wasm instantiate", WebAssembly.instantiate(module, imports))), module };
    } finally {
      keepPristine(null); // a no-op once kept; else whatever waits on it is told
    }
  };
}
