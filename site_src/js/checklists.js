// The troubleshooting checklists: the causes in ranked order with their reasons, what a linked
// tool last answered ("Latest: ..." beside its check, for this tab) and the way back from it.
import { tab } from "./store.js";
import { LEVEL_WORD, fillList, headlineText } from "./answers.js";

const READINGS = "sumpside.readings";
const FROM = "sumpside.from";
const viewOf = (id) => document.querySelector(`[data-view="tool/${CSS.escape(id)}"]`);

function showRanking(view, form, answer) {
  const holder = view.querySelector("[data-causes]");
  const sections = new Map([...holder.querySelectorAll("[data-cause]")].map((s) => [s.dataset.cause, s]));
  answer.ranked.forEach((cause, index) => {
    const section = sections.get(cause.key);
    if (!section) return;
    section.querySelector("[data-rank]").textContent = `${index + 1}. `;
    const reasons = section.querySelector("[data-reasons]");
    reasons.textContent = cause.reasons.join(" · ");
    reasons.hidden = cause.reasons.length === 0;
    section.classList.toggle("flagged", cause.score > 0);
    holder.append(section); // ranked order, most likely first
  });
  fillList(form.querySelector("[data-ranking]"), answer.ranked.filter((c) => c.score > 0), (li, c) => {
    const strong = document.createElement("strong");
    strong.textContent = c.title;
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

export function showReadings(view) {
  const readings = tab.get(READINGS, {});
  for (const span of view.querySelectorAll("[data-reading-of]")) {
    const r = readings[span.dataset.readingOf];
    span.textContent = r ? `Latest: ${r.text} (${LEVEL_WORD[r.level]})` : "";
  }
}

// A tool opened from a checklist's check links back to it.
export function showBackLink(view) {
  const slot = view.querySelector("[data-back]");
  if (!slot) return;
  const from = tab.get(FROM, null);
  const checklist = from && viewOf(from);
  slot.hidden = !checklist;
  if (checklist) {
    const a = Object.assign(document.createElement("a"), { href: "#/tool/" + from });
    a.textContent = "← Back to " + checklist.querySelector("h1").textContent + " (the result is carried over)";
    slot.replaceChildren(a);
  }
}

export function startChecklists() {
  document.addEventListener("click", (event) => {
    const link = event.target.closest("a[data-from-checklist]");
    if (link) tab.set(FROM, link.dataset.fromChecklist);
    else if (event.target.closest("a[href^='#/']") && !event.target.closest("[data-back]")) tab.set(FROM, null);
  });
}
