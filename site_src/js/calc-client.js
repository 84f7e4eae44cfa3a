// The page's side of the worker: one request, one answer, matched by id.
// The worker boots Pyodide; nothing here waits for it except the answers themselves.

export function startCalculator(onStatus) {
  const early = window.sumpsideWorker; // started by js/boot.js, if it could
  const address = new URL("../worker.js", import.meta.url);
  address.searchParams.set("build", document.documentElement.dataset.build || "");
  const worker = early ? early.worker : new Worker(address, { type: "module" });
  const pending = new Map();
  let nextId = 1;
  let readyResolve;
  const ready = new Promise((resolve) => { readyResolve = resolve; });

  worker.onmessage = (event) => {
    const msg = event.data;
    if (msg.type === "status") onStatus(msg);
    else if (msg.type === "ready") { onStatus({ state: "ready", ...msg }); readyResolve(msg); }
    else if (msg.type === "answer" && pending.has(msg.id)) {
      pending.get(msg.id)(msg.answer);
      pending.delete(msg.id);
    }
  };
  worker.onerror = (event) => {
    onStatus({ state: "failed", text: "Calculator failed to start: " + (event.message || "worker error") });
  };
  // Both handlers are in place in this same task, so no message falls between the two.
  for (const event of early ? early.takeEarly() : []) {
    (event.type === "error" ? worker.onerror : worker.onmessage)(event);
  }

  function ask(op, request) {
    const id = nextId++;
    return new Promise((resolve) => {
      pending.set(id, resolve);
      worker.postMessage({ id, op, request });
    });
  }

  return {
    ready,
    run: (tool, inputs, units) => ask("run", { tool, inputs, units }),
    reexpress: (tool, inputs, from, to) => ask("reexpress", { tool, inputs, from, to }),
    // The machine kit's requests (calc.machines.api): op and its request -> its answer.
    machines: (op, request) => ask("machines", { op, ...request }),
    // The QR code of a text ({text} -> {ok, svg, version}), for a machine's label.
    qr: (text) => ask("qr", { text }),
  };
}
