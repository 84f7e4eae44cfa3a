// The troubleshooting checklists: the causes in ranked order with their reasons and the word
// calc gives their score; each check's result (pass, fail, not done) and note, and the
// checklist's own note, kept on the device for the machine chosen and the day; a check's
// tool opened with the checklist's readings, and the way back to that same check with the
// tool's latest answer beside it.
import { device, tab } from "./store.js";
import { LEVEL_WORD, fillList, headlineText } from "./answers.js";
import { currentMachine, onMachineChange } from "./machine-pick.js";
import { fieldOf, readInputs } from "./fields.js";
import { today } from "./kit.js";

const READINGS = "sumpside.readings";
const FROM = "sumpside.from";
const viewOf = (id) => document.querySelector(`[data-view="tool/${CSS.escape(id)}"]`);
let returnTo = null; // the check come back to, kept in view while the ranking reorders

function showCheck(li) {
  li.scrollIntoView({ block: "center" });
  li.querySelector("[data-check-state]:checked")?.focus({ preventScroll: true });
}

function showRanking(view, form, answer) {
  const holder = view.querySelector("[data-causes]");
  const sections = new Map([...holder.querySelectorAll("[data-cause]")].map((s) => [s.dataset.cause, s]));
  answer.ranked.forEach((cause, index) => {
    const section = sections.get(cause.key);
    if (!section) return;
    section.querySelector("[data-rank]").textContent = `${index + 1}. `;
    section.querySelector("[data-word]").textContent = `(${cause.word})`;
    const reasons = section.querySelector("[data-reasons]");
    reasons.textContent = cause.reasons.join(" · ");
    reasons.hidden = cause.reasons.length === 0;
    section.classList.toggle("flagged", cause.score > 0);
    holder.append(section); // ranked order, most likely first
  });
  if (returnTo && view.contains(returnTo)) showCheck(returnTo); // until the user moves on
  fillList(form.querySelector("[data-ranking]"), answer.ranked.filter((c) => c.score > 0), (li, c) => {
    const strong = document.createElement("strong");
    strong.textContent = `${c.title} (${c.word})`;
    li.append(strong, c.reasons.length ? ": " + c.reasons.join("; ") : "");
  });
  printSummary(form);
}

// On paper, the ticked symptoms and the readings typed, in the form's own words.
function printSummary(form) {
  const ticked = [], readings = [];
  for (const el of form.querySelectorAll("input[name], select[name]")) {
    const label = form.querySelector(`label[for="${CSS.escape(el.id)}"]`)?.textContent.trim() ?? el.name;
    if (el.type === "checkbox") { if (el.checked) ticked.push(label); }
    else if (el.value.trim()) readings.push(`${label}: ${el.tagName === "SELECT" ? el.selectedOptions[0].textContent : el.value}`);
  }
  const line = (title, items) => Object.assign(document.createElement("p"), { textContent: `${title}: ${items.join("; ") || "none"}` });
  form.querySelector("[data-print-summary]").replaceChildren(line("Seen", ticked), line("Readings", readings));
}

// Every good answer of a form: a checklist's ranks its causes; any answer is kept as the
// tool's latest reading, its headline outputs as the tool declares them.
export function answered(form, answer) {
  const view = form.closest(".checklist");
  if (view) showRanking(view, form, answer);
  const worst = answer.verdicts.find((v) => v.level === answer.level);
  const readings = tab.get(READINGS, {});
  readings[form.dataset.tool] = { text: headlineText(answer), level: answer.level, verdict: worst ? worst.message : "" };
  tab.set(READINGS, readings);
}

// --- Check results and notes, per checklist, machine and day --------------------------------

const keptKey = (view) => `sumpside.checks.${view.dataset.checklist}.${currentMachine()?.id || "none"}.${today()}`;

function keepChecks(view) {
  const states = {}, notes = {};
  for (const li of view.querySelectorAll("[data-check]")) {
    const key = li.closest("[data-cause]").dataset.cause + "/" + li.dataset.check;
    const chosen = li.querySelector("[data-check-state]:checked");
    if (chosen && chosen.value !== "not-done") states[key] = chosen.value;
    const note = li.querySelector("[data-check-note]").value;
    if (note.trim()) notes[key] = note;
  }
  device.set(keptKey(view), { states, notes, note: view.querySelector("[data-checklist-note]").value });
}

function restoreChecks(view) {
  const kept = device.get(keptKey(view), {});
  for (const li of view.querySelectorAll("[data-check]")) {
    const key = li.closest("[data-cause]").dataset.cause + "/" + li.dataset.check;
    const state = (kept.states || {})[key] || "not-done";
    for (const radio of li.querySelectorAll("[data-check-state]")) radio.checked = radio.value === state;
    li.dataset.state = state;
    li.querySelector("[data-check-note]").value = (kept.notes || {})[key] || "";
  }
  view.querySelector("[data-checklist-note]").value = kept.note || "";
}

// --- The way to a check's tool and back ------------------------------------------------------

export function showReadings(view) {
  restoreChecks(view);
  const readings = tab.get(READINGS, {});
  for (const span of view.querySelectorAll("[data-reading-of]")) {
    const r = readings[span.dataset.readingOf];
    span.textContent = r ? `Latest: ${r.text} (${LEVEL_WORD[r.level]})` : "";
  }
  const from = tab.get(FROM, null);
  const back = from && from.check && view.dataset.checklist === from.checklist
    && view.querySelector(`#${CSS.escape(from.checklist + "--" + from.cause)} [data-check="${CSS.escape(from.check)}"]`);
  if (back) { returnTo = back; requestAnimationFrame(() => showCheck(back)); }
}

// A tool opened from a checklist's check links back to that check.
export function showBackLink(view) {
  const slot = view.querySelector("[data-back]");
  if (!slot) return;
  const from = tab.get(FROM, null);
  const checklist = from && viewOf(from.checklist);
  slot.hidden = !checklist;
  if (checklist) {
    const a = Object.assign(document.createElement("a"), { href: "#/tool/" + from.checklist });
    a.textContent = "← Back to the check in " + checklist.querySelector("h1").textContent + " (this answer is written beside it)";
    slot.replaceChildren(a);
  }
}

// The checklist's readings go into the tool's blank fields of the same key (its ppm, its
// temperature): the tool opens with what was already typed.
function carryReadings(checklist, toolId) {
  const from = checklist.querySelector("form[data-tool]");
  const to = viewOf(toolId)?.querySelector("form[data-tool]");
  if (!from || !to) return;
  for (const [key, value] of Object.entries(readInputs(from))) {
    const el = fieldOf(to, key);
    if (!el || el.type === "checkbox" || el.tagName === "SELECT" || !String(value).trim()) continue;
    if (!el.value.trim() || el.dataset.start === "example") el.value = value;
  }
}

export function startChecklists() {
  document.addEventListener("click", (event) => {
    const link = event.target.closest("a[data-from-checklist]");
    if (link) {
      const li = link.closest("[data-check]");
      const checklist = link.closest(".checklist");
      tab.set(FROM, { checklist: link.dataset.fromChecklist, cause: li.closest("[data-cause]").dataset.cause, check: li.dataset.check });
      carryReadings(checklist, link.getAttribute("href").replace("#/tool/", ""));
    } else if (event.target.closest("a[href^='#/']") && !event.target.closest("[data-back]")) tab.set(FROM, null);
  });
  for (const view of document.querySelectorAll(".checklist")) {
    const kept = () => keepChecks(view);
    view.querySelector("[data-causes]").addEventListener("change", (event) => {
      const li = event.target.closest("[data-check]");
      if (li && event.target.matches("[data-check-state]")) li.dataset.state = event.target.value;
      kept();
    });
    view.addEventListener("input", (event) => { if (event.target.matches("[data-check-note], [data-checklist-note]")) kept(); });
  }
  for (const kind of ["pointerdown", "keydown", "wheel", "touchstart", "hashchange"]) {
    window.addEventListener(kind, () => { returnTo = null; }, { passive: true });
  }
  onMachineChange(() => { for (const view of document.querySelectorAll(".checklist:not([hidden])")) restoreChecks(view); });
}
