// An answer of the calculator shown in its form: outputs, verdicts, notes, sources and the
// chart calc drew; or the errors, each beside its field, and the form-wide ones (a fault of
// calc's own among them) in the form's state line. Text only: nothing here knows a tool.
import { fieldOf } from "./fields.js";

export const LEVEL_WORD = { ok: "OK", watch: "Watch", act: "Act" };

// An element with its properties and children: el("p", { className: "x" }, "text", child).
export const el = (tag, props = {}, ...children) => {
  const node = Object.assign(document.createElement(tag), props);
  node.append(...children);
  return node;
};

export function fillList(list, items, fill) {
  list.replaceChildren(...items.map((item) => { const li = document.createElement("li"); fill(li, item); return li; }));
}

// The headline outputs as shown ("20.6 cSt, 1.2 %"): the few the tool declares for a glance.
export const headlineText = (answer) => (answer.headline || []).map((key) => answer.text[key]).join(", ");

function clearErrors(form) {
  for (const p of form.querySelectorAll("[data-error-for], [data-notice-for]")) { p.hidden = true; p.textContent = ""; }
  for (const el of form.querySelectorAll("[aria-invalid]")) el.removeAttribute("aria-invalid");
}

// A word beside a field whose value computes but asks for a look (outside the usual range, a
// mode chosen from what was typed); one without a field of its own goes with the notes.
function showNotices(form, notices) {
  const loose = [];
  for (const n of notices || []) {
    const slot = form.querySelector(`[data-notice-for="${CSS.escape(n.field)}"]`);
    if (slot && !slot.parentElement.closest("[hidden]")) { slot.textContent = n.message; slot.hidden = false; } else loose.push(n.message);
  }
  return loose;
}

// The bar that stays in view while typing: the worst verdict and the headline values.
function showBar(form, answer) {
  const bar = form.querySelector("[data-bar]");
  if (!bar) return;
  const badge = bar.querySelector("[data-bar-level]");
  const said = bar.querySelector("[data-bar-text]");
  bar.className = "answer-bar level-" + (answer.ok ? answer.level : "error");
  badge.hidden = !answer.ok;
  if (!answer.ok) {
    const first = (answer.errors || [])[0];
    said.textContent = first ? (answer.errors.length > 1 ? `${answer.errors.length} fields to check. ` : "") + first.message : "";
    return;
  }
  badge.textContent = LEVEL_WORD[answer.level];
  const worst = answer.verdicts.find((v) => v.level === answer.level);
  said.textContent = headlineText(answer) + (worst && answer.level !== "ok" ? " · " + worst.message : "");
}

function showErrors(form, state, errors) {
  const loose = [];
  for (const err of errors) {
    const slot = err.field == null ? null : form.querySelector(`[data-error-for="${CSS.escape(err.field)}"]`);
    const input = err.field == null ? null : fieldOf(form, err.field);
    if (slot) { slot.textContent = err.message; slot.hidden = false; } else loose.push(err.message);
    if (input) input.setAttribute("aria-invalid", "true");
    const folded = slot && slot.closest("details:not([open])");
    if (folded) folded.open = true; // an error is never folded away
  }
  state.textContent = loose.length ? loose.join(" ") : "Check the marked field" + (errors.length > 1 ? "s." : ".");
  state.dataset.kind = "error";
}

export function verdictItem(li, v) {
  li.className = "verdict level-" + v.level;
  const badge = Object.assign(document.createElement("span"), { className: "badge", textContent: LEVEL_WORD[v.level] });
  const basis = Object.assign(document.createElement("span"), { className: "basis", textContent: " (" + v.basis + ")" });
  li.append(badge, " " + v.message, basis);
}

export function showAnswer(form, answer) {
  const state = form.querySelector("[data-state]");
  clearErrors(form);
  form.dataset.level = answer.ok ? answer.level : "error";
  showBar(form, answer);
  if (!answer.ok) {
    showErrors(form, state, answer.errors || []);
    return;
  }
  delete state.dataset.kind;
  state.textContent = "";
  for (const dd of form.querySelectorAll("[data-out]")) dd.textContent = answer.text[dd.dataset.out] ?? "–";
  fillList(form.querySelector("[data-verdicts]"), answer.verdicts, verdictItem);
  const unplaced = showNotices(form, answer.notices);
  fillList(form.querySelector("[data-notes]"), [...unplaced, ...answer.notes], (li, n) => { li.textContent = n; });
  fillList(form.querySelector("[data-related]"), answer.related || [], (li, r) => {
    li.append(el("a", { href: "#/tool/" + r.tool, textContent: r.title + " →" }), " " + r.why);
  });
  form.querySelector("[data-sources]").textContent = answer.sources.length ? "Sources: " + answer.sources.join("; ") : "";
  // Drawn by calc: presentation attributes only, no script.
  form.querySelector("[data-chart]").innerHTML = Object.values(answer.charts || {}).join("");
}
