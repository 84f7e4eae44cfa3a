// The calculator's thread: boots Pyodide from this build's own copy, loads the calc
// wheel, and answers {id, request} messages with the bridge's JSON. It never touches
// the page; the page never waits on it to be usable.
import { loadPyodide } from "./pyodide/pyodide.mjs";

const base = new URL("./", import.meta.url);
let runJson = null;
let reexpressJson = null;

function status(state, text, extra = {}) {
  postMessage({ type: "status", state, text, ...extra });
}

async function boot() {
  const started = performance.now();
  status("starting", "Starting calculator…");
  const pyodide = await loadPyodide({
    indexURL: new URL("pyodide/", base).href,
    lockFileURL: new URL("pyodide/pyodide-lock.json", base).href,
    stdout: () => {},
    stderr: (line) => console.warn(line),
  });
  await pyodide.loadPackage("sumpside", { messageCallback: () => {}, errorCallback: (m) => console.warn(m) });
  const bridge = pyodide.pyimport("calc.bridge");
  runJson = (text) => bridge.run_json(text);
  reexpressJson = (text) => bridge.reexpress_json(text);
  // One real answer before saying "ready": a broken wheel shows here, not at the first tap.
  const probe = JSON.parse(runJson(JSON.stringify({ tool: "viscosity-at-temperature", inputs: {} })));
  if (!probe.ok) throw new Error("calculator self-check failed");
  postMessage({ type: "ready", ms: Math.round(performance.now() - started), mode: "normal" });
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
