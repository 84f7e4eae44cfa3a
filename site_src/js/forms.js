// The tool forms: each computes through the worker a short pause after typing, at once on
// submit, and when its view is shown; only the newest answer of a form is shown. Save, print,
// "Fill an example" (or a checklist's Clear) with its undo, and the minus key are its buttons.
import { clearForm, fillExample, flipSign, keepForm, readInputs, restoreForm, showModes } from "./fields.js";
import { currentUnits } from "./units.js";
import { showAnswer } from "./answers.js";
import { answered } from "./checklists.js";
import { keepBugReport } from "./bug-reports.js";
import { saveReading } from "./log-view.js";
import { ask } from "./kit.js";
import { currentMachine } from "./machine-pick.js";

const DEBOUNCE_MS = 250;
const root = document.documentElement;
const lastAnswers = new WeakMap(); // form -> { answer, inputs, units } of its last good answer
let calculator = null;

export function computeVisible() {
  if (!calculator || !root.dataset.ready) return;
  for (const form of document.querySelectorAll(".view:not([hidden]) form[data-tool]")) compute(form);
}

async function compute(form) {
  const seq = (Number(form.dataset.seq) || 0) + 1;
  form.dataset.seq = String(seq);
  if (!root.dataset.ready) form.querySelector("[data-state]").textContent = "The calculator is starting; your answer follows.";
  const asked = { inputs: readInputs(form), units: currentUnits() };
  const machine = currentMachine();
  // With a machine chosen, calc fills the inputs left to the card from the card itself.
  const answer = machine
    ? await ask("run", { tool: form.dataset.tool, inputs: asked.inputs, units: asked.units, machine })
    : await calculator.run(form.dataset.tool, asked.inputs, asked.units);
  if (form.dataset.seq !== String(seq)) return; // a newer request is on its way
  receive(form, answer, asked);
  delete form.dataset.stale;
}

// Save only an answer to exactly what is in the form now: a pending computation runs first,
// and a form with a field in error saves nothing (calc parses the saved inputs again too).
async function saveNow(form, timer) {
  clearTimeout(timer);
  const saved = form.querySelector("[data-saved]");
  if (!calculator || !root.dataset.ready) { saved.textContent = "Not saved: the calculator is still starting."; return; }
  await compute(form);
  const kept = lastAnswers.get(form);
  const now = JSON.stringify(readInputs(form));
  if (form.dataset.level === "error" || !kept || JSON.stringify(kept.inputs) !== now) {
    saved.textContent = "Not saved: fix the marked fields first; nothing was stored.";
    return;
  }
  await saveReading(form, kept);
}

// What a form does with the answer to `asked` ({inputs, units}): shows it; keeps the report of
// a fault of calc's own; remembers a good one for the log and the checklists.
export function receive(form, answer, asked) {
  showAnswer(form, answer);
  if (answer.bug) keepBugReport({ tool: form.dataset.tool, at: new Date().toISOString(), ...asked, ...answer.bug });
  if (!answer.ok) {
    lastAnswers.delete(form); // nothing to save until the inputs give an answer again
    return;
  }
  lastAnswers.set(form, { answer, ...asked });
  answered(form, answer);
}

function bindForm(form) {
  let timer = null;
  const saved = form.querySelector("[data-saved]");
  const soon = (event) => {
    if (event.type === "input") saved.textContent = ""; // a new reading is being typed
    form.dataset.stale = "1"; // the answer shown is to the inputs before this change
    if (event.type === "change") showModes(form);
    clearTimeout(timer);
    keepForm(form, currentUnits());
    timer = setTimeout(() => compute(form), DEBOUNCE_MS);
  };
  form.addEventListener("input", soon);
  form.addEventListener("change", soon);
  form.addEventListener("submit", (event) => { event.preventDefault(); clearTimeout(timer); compute(form); });
  const rewrite = (change) => () => {
    clearTimeout(timer);
    if (change(form, currentUnits())) saved.textContent = "";
    compute(form);
  };
  form.querySelector('[data-action="example"]')?.addEventListener("click", rewrite(fillExample));
  form.querySelector('[data-action="reset"]')?.addEventListener("click", rewrite(clearForm));
  form.addEventListener("click", (event) => {
    const key = event.target.closest("[data-sign-for]");
    if (key) flipSign(form.querySelector(`[name="${CSS.escape(key.dataset.signFor)}"]`));
  });
  form.querySelector('[data-action="save"]')?.addEventListener("click", () => saveNow(form, timer));
  form.querySelector('[data-action="print"]')?.addEventListener("click", () => window.print());
}

// Call once the unit system's defaults are in the fields (units.js): what was typed comes back.
export function startForms(calc) {
  calculator = calc;
  for (const form of document.querySelectorAll("form[data-tool]")) {
    restoreForm(form, currentUnits());
    bindForm(form);
  }
}
