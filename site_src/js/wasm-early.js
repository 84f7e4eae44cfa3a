// Pyodide compiles its wasm only once its script has loaded and the snapshot is in hand;
// compiling it from the worker's start runs that beside both. Pyodide's own instantiation then
// gets this compiled module (a new instance of it, for the fallback boot too); any other
// streaming instantiation, or a failed compile, goes the original way.
import { timed } from "./boot-phases.js";

export function compileEarly(wasmURL) {
  const wasmModule = timed("wasm compile", WebAssembly.compileStreaming(fetch(wasmURL)));
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
        return { instance: await timed("wasm instantiate", WebAssembly.instantiate(module, imports)), module };
      }
    }
    return instantiateStreaming(response, imports);
  };
}
