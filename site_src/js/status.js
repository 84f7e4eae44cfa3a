// The status line in the header: what the calculator's worker says while it starts. Once it
// is ready, <html data-ready> holds how it started ("snapshot" or "normal").
const root = document.documentElement;
const line = document.getElementById("boot-status");

export function showStatus(msg) {
  line.dataset.state = msg.state;
  if (msg.state !== "ready") {
    line.textContent = msg.text;
    return;
  }
  line.textContent = msg.note ? "Calculator ready (started the slow way: " + msg.note + ")" : "Calculator ready";
  line.title = `started in ${msg.ms} ms (${msg.mode})` + (msg.checkMs != null ? `, self-check ${msg.checkMs} ms` : "")
    + (msg.note ? ": " + msg.note : "");
  root.dataset.ready = msg.mode || "normal";
}
