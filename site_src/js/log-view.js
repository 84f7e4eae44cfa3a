// The log view: the trend charts calc draws of the followed quantities, then the saved
// results, newest first; export, import and print. The entries live in log.js (IndexedDB).
import { addEntry, allEntries, deleteEntry, importEntries, toCsv } from "./log.js";
import { LEVEL_WORD } from "./answers.js";
import { showBugReports } from "./bug-reports.js";
import { machineName } from "./job.js";
import { download } from "./store.js";
import { currentUnits } from "./units.js";

let calculator = null;
let drawing = 0; // the newest render; an older one stops where it is

// `kept` is the form's last good answer with what was asked ({answer, inputs, units}).
export async function saveToLog(form, kept) {
  const state = form.querySelector("[data-state]");
  if (!kept) { state.textContent = "Nothing to save yet: fix the inputs first."; return; }
  const { answer, inputs, units } = kept;
  await addEntry({
    at: new Date().toISOString(), machine: machineName(), tool: answer.tool,
    title: form.closest("[data-view]").querySelector("h1").textContent,
    units, inputs, text: answer.text, values: answer.values, unitOf: answer.units, level: answer.level,
    verdicts: answer.verdicts.map((v) => `${LEVEL_WORD[v.level]}: ${v.message}`),
  });
  state.textContent = "Saved to the log.";
}

function entryCard(e) {
  const card = Object.assign(document.createElement("article"), { className: "log-entry level-" + e.level });
  const h = Object.assign(document.createElement("h2"), { textContent: `${e.title}${e.machine ? " · " + e.machine : ""}` });
  const when = Object.assign(document.createElement("p"), { className: "log-when", textContent: new Date(e.at).toLocaleString() });
  const dl = document.createElement("dl");
  for (const [key, value] of Object.entries(e.text || {})) {
    const div = document.createElement("div");
    div.append(Object.assign(document.createElement("dt"), { textContent: key }),
               Object.assign(document.createElement("dd"), { textContent: value }));
    dl.append(div);
  }
  const verdicts = document.createElement("ul");
  for (const v of e.verdicts || []) verdicts.append(Object.assign(document.createElement("li"), { textContent: v }));
  const remove = Object.assign(document.createElement("button"), { type: "button", textContent: "Delete", className: "no-print" });
  remove.addEventListener("click", async () => { if (confirm("Delete this entry?")) { await deleteEntry(e.id); renderLog(); } });
  card.append(h, when, dl, verdicts, remove);
  return card;
}

function trendFigure(trend) {
  const figure = Object.assign(document.createElement("figure"), { className: "trend-figure" });
  const chart = Object.assign(document.createElement("div"), { className: "trend-chart" });
  chart.innerHTML = trend.svg; // drawn by calc: presentation attributes only, no script
  figure.append(chart, Object.assign(document.createElement("figcaption"), { textContent: trend.title }));
  return figure;
}

export async function renderLog() {
  const turn = ++drawing;
  showBugReports();
  const list = document.querySelector("[data-log-list]");
  const entries = (await allEntries()).sort((a, b) => b.at.localeCompare(a.at));
  if (turn !== drawing) return;
  if (!entries.length) {
    list.replaceChildren(Object.assign(document.createElement("p"), { textContent: "No saved results yet." }));
    return;
  }
  const trends = Object.assign(document.createElement("div"), { className: "trends" });
  list.replaceChildren(trends, ...entries.map(entryCard));
  // The entries at once; the charts once the calculator has drawn them, in the units shown now.
  const asked = entries.map(({ at, machine, tool, values, units }) => ({ at, machine, tool, values, units }));
  const drawn = await calculator.trends(asked, currentUnits());
  if (turn === drawing && Array.isArray(drawn)) trends.replaceChildren(...drawn.map(trendFigure));
}

export function startLog(calc) {
  calculator = calc;
  const status = document.querySelector("[data-log-status]");
  const stamp = () => new Date().toISOString().slice(0, 10);
  document.querySelector('[data-log="export-json"]').addEventListener("click", async () =>
    download(`sumpside-log-${stamp()}.json`, "application/json", JSON.stringify(await allEntries(), null, 2)));
  document.querySelector('[data-log="export-csv"]').addEventListener("click", async () =>
    download(`sumpside-log-${stamp()}.csv`, "text/csv", toCsv(await allEntries())));
  document.querySelector('[data-log="print"]').addEventListener("click", () => window.print());
  document.querySelector('[data-log="import"]').addEventListener("change", async (event) => {
    const file = event.target.files[0];
    if (!file) return;
    try {
      const added = await importEntries(JSON.parse(await file.text()));
      status.textContent = `Imported ${added} entr${added === 1 ? "y" : "ies"}.`;
    } catch (err) {
      status.textContent = "Import failed: " + err.message;
    }
    event.target.value = "";
    renderLog();
  });
}
