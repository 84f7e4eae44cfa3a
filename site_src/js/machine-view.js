// A machine's page, everything from calc's "machine-page" answer: what is due, the latest value
// and verdict of each followed quantity, the tools that take a reading filled from the card,
// the trends against their limits (SVG drawn by calc), the readings and the card.
import { LEVEL_WORD, el } from "./answers.js";
import { ask, deleteMachine, machine, readingsOf, settleCard, today } from "./kit.js";
import { chooseMachine, currentMachine } from "./machine-pick.js";
import { renderReadings } from "./log-view.js";
import { go } from "./routing.js";
import { currentUnits } from "./units.js";

const view = document.querySelector('[data-view="machine"]');
const part = (name) => view.querySelector(`[data-m="${name}"]`);
const PAGE = 20;
let drawing = 0;
let shownCount = PAGE;

// A quantity's latest value on one row, its verdict on the row below, across both columns.
function latestRows(row) {
  const level = row.level ? el("span", { className: "badge level-badge level-" + row.level, textContent: LEVEL_WORD[row.level] }) : "";
  const marked = row.level ? "level-" + row.level + " " : "";
  return [
    el("tr", { className: marked + "condition-value" },
      el("th", { scope: "row", textContent: row.label }),
      el("td", {}, el("strong", { textContent: row.text }), el("br"),
        el("span", { className: "muted", textContent: `${new Date(row.time).toLocaleDateString()}, ${row.tool_title}` }))),
    el("tr", { className: marked + "condition-verdict" }, el("td", { colSpan: 2 }, level, " ", row.message)),
  ];
}

function trendFigure(trend) {
  const figure = el("figure", { className: "trend-figure" });
  const chart = el("div", { className: "trend-chart" });
  chart.innerHTML = trend.svg; // drawn by calc: presentation attributes only, no script
  figure.append(chart, el("figcaption", { textContent: `${trend.title} (${trend.points} readings)` }));
  return figure;
}

// A card changed on two phones apart (calc kept both sides): what differs, and the choice.
// The side chosen becomes the card on every phone it travels to.
async function showConflicts(record) {
  const box = part("conflict");
  const sides = record.conflicts || [];
  box.hidden = !sides.length;
  if (!sides.length) { box.replaceChildren(); return; }
  const button = (text, work) => {
    const b = el("button", { type: "button", textContent: text });
    b.addEventListener("click", () => work().catch((err) => { box.append(el("p", { className: "problem", textContent: "Not settled: " + err.message })); }));
    return b;
  };
  const lines = async (doc) => {
    const shown = await ask("card-view", { machine: doc, units: currentUnits() });
    return new Map((shown.ok ? shown.summary : []).map((l) => [l.label, l.text]));
  };
  const mine = await lines(record);
  const parts = [el("h2", { textContent: "This card was changed on two phones" })];
  for (const other of sides) {
    if (other.deleted) {
      parts.push(el("p", { textContent: "Another phone deleted this machine while this one changed its card." }),
        el("div", { className: "actions" }, button("Keep the machine", () => settleCard(record, record.rev)),
          button("Delete it here too", () => deleteMachine(record.id))));
      continue;
    }
    const theirs = await lines(other);
    const differ = [...new Set([...mine.keys(), ...theirs.keys()])].filter((label) => mine.get(label) !== theirs.get(label));
    parts.push(el("table", { className: "condition" },
      el("thead", {}, el("tr", {}, el("th", { textContent: "Card field" }),
        el("th", { textContent: `Shown now (saved ${new Date(record.updated).toLocaleString()})` }),
        el("th", { textContent: `Other version (saved ${new Date(other.updated).toLocaleString()})` }))),
      el("tbody", {}, ...differ.map((label) => el("tr", {}, el("th", { scope: "row", textContent: label }),
        el("td", { textContent: mine.get(label) || "–" }), el("td", { textContent: theirs.get(label) || "–" }))))),
    el("div", { className: "actions" }, button("Keep the card shown now", () => settleCard(record, record.rev)),
      button("Keep the other version", () => settleCard(record, other.rev))));
  }
  box.replaceChildren(...parts);
}

export async function renderMachine(id) {
  const turn = ++drawing;
  const record = await machine(id);
  if (!record) {
    part("name").textContent = "No such machine on this device";
    for (const name of ["site", "level", "conflict", "due", "latest", "tools", "trends", "readings", "card"]) part(name).replaceChildren();
    return;
  }
  const readings = await readingsOf(id);
  // The page needs of each reading only what it measured and when (calc keeps "tracked").
  const slim = readings.map(({ id: rid, machine: mid, tool, time, tracked }) => ({ id: rid, machine: mid, tool, time, tracked }));
  const page = await ask("machine-page", { machine: record, readings: slim, units: currentUnits(), today: today() });
  if (turn !== drawing || !page.ok) return;
  part("name").textContent = page.name;
  await showConflicts(record);
  document.title = page.name + " · Sumpside";
  part("site").textContent = page.site;
  part("level").textContent = page.level ? `Worst latest verdict: ${LEVEL_WORD[page.level]}` : "";
  part("level").className = "machine-level" + (page.level ? " level-" + page.level : "");
  part("visit").href = `#/visit/${encodeURIComponent(id)}/${today()}`;
  part("edit").href = "#/card/" + encodeURIComponent(id);
  part("label").href = "#/labels/" + encodeURIComponent(id);
  part("due").replaceChildren(...(page.due.length ? page.due.map((d) => el("li", { className: "due-" + d.state, textContent: d.says }))
    : [el("li", { className: "muted", textContent: "No service intervals on the card: add them to see what is due." })]));
  part("no-readings").hidden = page.count > 0;
  part("latest-table").hidden = !page.latest.length;
  part("latest").replaceChildren(...page.latest.flatMap(latestRows));
  part("tools").replaceChildren(...page.tools.map((t) => el("li", {}, el("a", {
    href: "#/tool/" + t.id, textContent: t.title + (t.bound ? ` (${t.bound} from the card)` : "") }))));
  for (const a of part("tools").querySelectorAll("a")) a.dataset.forMachine = id;
  part("trends").replaceChildren(...(page.trends.length ? page.trends.map(trendFigure)
    : [el("p", { className: "muted", textContent: "A trend is drawn once a quantity has two readings." })]));
  part("card").replaceChildren(...page.summary.map((line) => el("div", {},
    el("dt", { textContent: line.label }), el("dd", { textContent: line.text + (line.derived ? " (follows from the card)" : "") }))));
  const newest = readings.sort((a, b) => Date.parse(b.time) - Date.parse(a.time));
  const list = el("div");
  // Every reading here is this machine's: its name is the only one the list needs.
  await renderReadings(list, newest.slice(0, shownCount), new Map([[id, record.card.name]]), currentUnits(),
    () => renderMachine(id));
  if (turn !== drawing) return;
  part("readings").replaceChildren(...list.children);
  part("more").hidden = newest.length <= shownCount;
}

export function startMachineView() {
  part("more").addEventListener("click", () => { shownCount += PAGE; renderMachine(view.dataset.param); });
  part("delete").addEventListener("click", async () => {
    const id = view.dataset.param;
    const record = await machine(id);
    if (!record || !confirm(`Delete ${record.card.name} and all its readings from this device?`)) return;
    await deleteMachine(id);
    await chooseMachine(null);
    go("#/machines");
  });
  // A tool opened from a machine's page works for that machine.
  document.addEventListener("click", (event) => {
    const link = event.target.closest && event.target.closest("a[data-for-machine]");
    if (link) chooseMachine(link.dataset.forMachine);
  }, true);
}

export async function showMachine(id) {
  shownCount = PAGE;
  // The machine whose page is open is the one being worked on.
  if (id && currentMachine()?.id !== id && (await machine(id))) await chooseMachine(id);
  return renderMachine(id);
}
