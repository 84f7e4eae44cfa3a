// The page's start-up: wires the modules, each with one job (DEVELOPERS.md lists them).
// No formula, label, tool id or chart lives in the page: every number, word about a tool and
// drawing comes from calc through the worker.
import { startCalculator } from "./calc-client.js";
import { showStatus } from "./status.js";
import { startUnits } from "./units.js";
import { computeVisible, startForms } from "./forms.js";
import { showBackLink, showReadings, startChecklists } from "./checklists.js";
import { renderLog, startLog } from "./log-view.js";
import { startBugReports } from "./bug-reports.js";
import { startJob } from "./job.js";
import { shownView, startRouting } from "./routing.js";
import { startUpdates } from "./updates.js";

const calculator = startCalculator((msg) => {
  showStatus(msg);
  if (msg.state === "ready") computeVisible();
});

function showView(view) {
  if (view.dataset.view === "log") renderLog();
  if (view.classList.contains("tool")) showBackLink(view);
  if (view.classList.contains("checklist")) showReadings(view);
  computeVisible();
}

startUnits(calculator, () => {
  if (shownView()?.dataset.view === "log") renderLog(); // the trends, redrawn in the new units
  computeVisible();
});
startForms(calculator);
startJob();
startChecklists();
startLog(calculator);
startBugReports();
startRouting(showView);
startUpdates(calculator.ready);
document.documentElement.dataset.shell = "ready";
