// Faults of calc's own (an answer carrying "bug"): each is written to the console, the newest
// reports are kept on the device and listed on the log page, to copy or export for whoever
// maintains calc. A report holds the tool, the time, the build, what was asked, the error and
// Python's traceback.
import { device, download } from "./store.js";

const KEY = "sumpside.bugs";
const KEEP = 20;

export const keptBugReports = () => device.get(KEY, []);

const sameFault = (a, b) => a && a.tool === b.tool && a.error === b.error && a.units === b.units
  && JSON.stringify(a.inputs) === JSON.stringify(b.inputs);

export function keepBugReport(fault) {
  const report = { build: document.documentElement.dataset.build, ...fault };
  console.error(`calculator fault in ${report.tool}: ${report.error}\n${report.traceback}`);
  const kept = keptBugReports();
  if (sameFault(kept[0], report)) return; // the same inputs asked again (a view shown again)
  device.set(KEY, [report, ...kept].slice(0, KEEP)); // listed when the log is next shown
}

const reportText = (r) => [`Sumpside bug report`, `tool: ${r.tool}`, `time: ${r.at}`, `build: ${r.build}`,
  `units: ${r.units}`, `inputs: ${JSON.stringify(r.inputs)}`, `error: ${r.error}`, "", r.traceback].join("\n");

function reportCard(r) {
  const card = Object.assign(document.createElement("article"), { className: "bug-report" });
  const h = Object.assign(document.createElement("h3"), { textContent: `${r.tool} · ${new Date(r.at).toLocaleString()}` });
  const error = Object.assign(document.createElement("p"), { className: "bug-error", textContent: r.error });
  const text = Object.assign(document.createElement("pre"), { className: "bug-text", textContent: reportText(r) });
  const copy = Object.assign(document.createElement("button"), { type: "button", textContent: "Copy report" });
  copy.addEventListener("click", async () => {
    try {
      await navigator.clipboard.writeText(text.textContent);
      copy.textContent = "Copied";
    } catch {
      getSelection().selectAllChildren(text); // no clipboard here: selected, to copy by hand
    }
  });
  card.append(h, error, text, copy);
  return card;
}

export function showBugReports() {
  const box = document.querySelector("[data-bugs]");
  const reports = keptBugReports();
  box.hidden = reports.length === 0;
  box.querySelector("[data-bug-list]").replaceChildren(...reports.map(reportCard));
}

export function startBugReports() {
  const stamp = () => new Date().toISOString().slice(0, 10);
  document.querySelector('[data-bugs-action="export"]').addEventListener("click", () =>
    download(`sumpside-bug-reports-${stamp()}.json`, "application/json", JSON.stringify(keptBugReports(), null, 2)));
  document.querySelector('[data-bugs-action="clear"]').addEventListener("click", () => {
    if (confirm("Delete every bug report?")) { device.set(KEY, []); showBugReports(); }
  });
}
