// The page's start-up: wires the modules, each with one job (DEVELOPERS.md lists them).
// No formula, label, tool id or chart lives in the page: every number, word about a tool and
// drawing comes from calc through the worker.
import { startCalculator } from "./calc-client.js";
import { showStatus } from "./status.js";
import { startUnits, currentUnits } from "./units.js";
import { computeVisible, startForms } from "./forms.js";
import { showBackLink, showReadings, startChecklists } from "./checklists.js";
import { startFinder, used } from "./finder.js";
import { renderLog, startLog } from "./log-view.js";
import { startBugReports } from "./bug-reports.js";
import { migrateOldLog, onKitChange, problemWords, startKit } from "./kit.js";
import { onMachineChange, startMachinePick } from "./machine-pick.js";
import { fillVisible, refillAll, startCardFill } from "./card-fill.js";
import { reexpressCard, renderMachines, showCard, startMachines } from "./machines-view.js";
import { renderMachine, showMachine, startMachineView } from "./machine-view.js";
import { showVisit, startVisit } from "./visit-view.js";
import { renderLabels, showFromLabel, startLabels } from "./labels-view.js";
import { shownView, startRouting } from "./routing.js";
import { startUpdates } from "./updates.js";
import { startSync } from "./sync.js";

const calculator = startCalculator((msg) => {
  showStatus(msg);
  if (msg.state === "ready") ready();
});
startKit(calculator);

// What each view draws when shown (and again when the units or the kit change).
const DRAW = {
  log: () => renderLog(),
  machines: () => renderMachines(),
  machine: (param) => showMachine(param),
  card: (param) => showCard(param),
  visit: () => showVisit(),
  labels: (param) => renderLabels(param),
  label: (param) => showFromLabel(param),
};

// A view drawn from the database; when the database fails, the view says why at its top
// instead of looking empty.
function draw(view, param) {
  const drawing = DRAW[view.dataset.view];
  if (!drawing) return;
  let note = view.querySelector(":scope > [data-view-problem]");
  Promise.resolve().then(() => drawing(param)).then(() => note?.remove(), (err) => {
    note ??= Object.assign(document.createElement("p"), { className: "problem", role: "alert" });
    note.dataset.viewProblem = "";
    note.textContent = "The saved machines and readings cannot be shown: " + problemWords(err) + ".";
    view.prepend(note);
  });
}

async function showView(view, param) {
  draw(view, param);
  if (view.dataset.view.startsWith("tool/")) used(view.dataset.view.slice(5));
  if (view.classList.contains("tool")) showBackLink(view);
  if (view.classList.contains("checklist")) showReadings(view);
  if (view.querySelector("form[data-tool]") && document.documentElement.dataset.ready) await fillVisible();
  computeVisible();
}

// The answer bar of a form sticks just under the top bar, whatever height the top bar wraps to
// (a rule of the page's own style sheet: no style attribute, as the CSP wants).
function keepBarHeight() {
  const bar = document.querySelector("header.bar");
  const sheet = [...document.styleSheets].find((s) => s.href && s.href.endsWith("/css/app.css"));
  if (!sheet) return;
  const at = sheet.insertRule(":root { --head-h: 3.6rem; }", sheet.cssRules.length);
  const set = () => sheet.cssRules[at].style.setProperty("--head-h",
    getComputedStyle(bar).position === "sticky" ? bar.offsetHeight + "px" : "0px");
  new ResizeObserver(set).observe(bar);
  window.addEventListener("resize", set);
  set();
}

async function ready() {
  // The earlier build's log becomes machines and readings once, before anything is shown.
  try {
    await migrateOldLog(); // the log page says so from then on
  } catch (err) {
    console.warn("the earlier log was not moved:", err);
  }
  await refillAll();
  computeVisible();
  const view = shownView();
  if (view) draw(view, view.dataset.param);
}

startUnits(calculator, async () => {
  await fillVisible();
  await reexpressCard(currentUnits());
  const view = shownView();
  if (view && view.dataset.view !== "card") draw(view, view.dataset.param);
  computeVisible();
});
startForms(calculator);
startChecklists();
startFinder();
keepBarHeight();
startLog();
startBugReports();
startMachines();
startMachineView();
startVisit();
startLabels(calculator);
startCardFill(computeVisible);
onMachineChange(async () => { await refillAll(); computeVisible(); });
onKitChange(() => {
  const view = shownView();
  if (view?.dataset.view === "machines") renderMachines();
  if (view?.dataset.view === "machine") renderMachine(view.dataset.param);
});
startUpdates(calculator.ready);
startSync(calculator.ready);
// The chosen machine first (its name in the bar), then the view the address asks for.
startMachinePick().catch((err) => console.warn("no machine chosen:", err)).then(() => {
  startRouting(showView);
  document.documentElement.dataset.shell = "ready";
});
