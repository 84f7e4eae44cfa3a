// Starts the calculator's worker at the page's first moment, before the body is parsed:
// Pyodide's start is the long pole of every load. What the worker says before app.js
// listens is kept and handed over (js/calc-client.js). A classic script, so it runs at once.
(function () {
  try {
    // The build id tells the worker which of the service worker's caches is this build's.
    var address = new URL("../worker.js", document.currentScript.src);
    address.searchParams.set("build", document.documentElement.dataset.build || "");
    var worker = new Worker(address, { type: "module" });
    var early = [];
    var keep = function (event) { early.push(event); };
    worker.addEventListener("message", keep);
    worker.addEventListener("error", keep);
    window.sumpsideWorker = {
      worker: worker,
      takeEarly: function () {
        worker.removeEventListener("message", keep);
        worker.removeEventListener("error", keep);
        return early;
      },
    };
  } catch (err) {
    // js/calc-client.js starts the worker itself.
  }
})();
