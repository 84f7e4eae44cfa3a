// A chosen machine's card in every form: each input bound to a card field (data-bound) shows
// the card's value, marked "from the card". Typing over one changes it for this reading only;
// "Save to the card" beside it makes it the card's. With no machine, the tool's own defaults.
import { ask, localStamp, saveMachine } from "./kit.js";
import { currentMachine } from "./machine-pick.js";
import { fieldOf, startOf } from "./fields.js";
import { currentUnits } from "./units.js";

const FROM_CARD = "from the card";
const CHANGED = "changed for this reading";

function mark(field, text) {
  const tag = field.querySelector("[data-card-mark]");
  if (!tag) return;
  tag.textContent = text;
  tag.hidden = !text;
  field.classList.toggle("from-card", text === FROM_CARD);
  field.classList.toggle("card-changed", text === CHANGED);
  const save = field.querySelector("[data-to-card]");
  if (save) save.hidden = text !== CHANGED;
}

function setValue(el, value) {
  if (el.type === "checkbox") el.checked = value === true || value === "yes";
  else if (el.tagName === "SELECT" && ![...el.options].some((o) => o.value === value)) return false;
  else el.value = value;
  return true;
}

// The form as it is without a card: marks gone, the card's values cleared (limits back to
// their standard values); the machine's facts unfolded, to be typed.
function clearCard(form, units) {
  form.querySelector("[data-for-machine]").hidden = true;
  const facts = form.querySelector('[data-group="machine"]');
  if (facts) { facts.open = true; facts.querySelector("[data-group-note]").textContent = ""; }
  delete form.dataset.foldedFor;
  for (const field of form.querySelectorAll("[data-bound]")) {
    const el = field.querySelector("[name]");
    if (el.dataset.fromCard) {
      delete el.dataset.fromCard;
      if (el.type === "checkbox") el.checked = el.defaultChecked;
      else if (el.tagName === "SELECT") el.value = [...el.options].find((o) => o.defaultSelected)?.value ?? el.value;
      else el.value = startOf(el, units);
    }
    mark(field, "");
  }
}

// Fill `form` from the chosen machine's card (or clear it); resolves once the fields are set.
export async function fillForm(form) {
  const machine = currentMachine();
  const units = currentUnits();
  form.dataset.cardFor = (machine ? machine.id + "@" + machine.updated : "") + "|" + units;
  if (!machine) { clearCard(form, units); return; }
  const filled = await ask("fill", { tool: form.dataset.tool, machine, units });
  if (!filled.ok || currentMachine() !== machine) return;
  const line = form.querySelector("[data-for-machine]");
  line.textContent = `For ${machine.card.name}: the marked fields are from its card.`;
  line.hidden = false;
  const facts = form.querySelector('[data-group="machine"]');
  const filledCount = Object.keys(filled.values).length;
  if (facts && filledCount) { // filled from the card: folded away, one tap to look or change
    if (form.dataset.foldedFor !== machine.id) facts.open = false; // once per machine chosen
    form.dataset.foldedFor = machine.id;
    facts.querySelector("[data-group-note]").textContent = `(${filledCount} from the card of ${machine.card.name})`;
  }
  for (const field of form.querySelectorAll("[data-bound]")) {
    const el = field.querySelector("[name]");
    const value = filled.values[el.name];
    if (value === undefined) {
      if (el.dataset.fromCard) clearCard(form, units); // the card no longer knows it
      mark(field, el.dataset.changed ? CHANGED : "");
      continue;
    }
    if (el.dataset.changed) continue; // typed over for this reading: kept
    if (setValue(el, value)) { el.dataset.fromCard = "1"; mark(field, FROM_CARD); }
  }
}

async function saveToCard(form, key, button) {
  const machine = currentMachine();
  const el = fieldOf(form, key);
  if (!machine || !el) return;
  const value = el.type === "checkbox" ? (el.checked ? "yes" : "no") : el.value;
  const answer = await ask("to-card", { machine, tool: form.dataset.tool, key, value, units: currentUnits(), time: localStamp() });
  const slot = form.querySelector(`[data-error-for="${CSS.escape(key)}"]`);
  if (!answer.ok) {
    slot.textContent = answer.errors.map((e) => e.message).join(" ");
    slot.hidden = false;
    return;
  }
  delete el.dataset.changed;
  button.hidden = true;
  await saveMachine(answer.machine); // the picker takes the new record; every form refills
}

export function startCardFill(recompute) {
  document.addEventListener("input", (event) => {
    const el = event.target;
    const field = el.closest && el.closest("[data-bound]");
    if (!field || !el.form || !el.dataset.fromCard) return;
    delete el.dataset.fromCard;
    el.dataset.changed = "1";
    mark(field, CHANGED);
  }, true);
  document.addEventListener("change", (event) => {
    const el = event.target;
    const field = el.closest && el.closest("[data-bound]");
    if (!field || !el.dataset.fromCard) return;
    delete el.dataset.fromCard;
    el.dataset.changed = "1";
    mark(field, CHANGED);
  }, true);
  document.addEventListener("click", (event) => {
    const button = event.target.closest && event.target.closest("[data-to-card]");
    if (button) saveToCard(button.form, button.dataset.toCard, button).then(recompute);
  });
}

// A new machine (or none): typed-over values go back to the card's; the forms in view refill
// now, the others when they are next shown (fillVisible).
export async function refillAll() {
  for (const form of document.querySelectorAll("form[data-tool]")) {
    for (const el of form.querySelectorAll("[data-changed]")) delete el.dataset.changed;
    delete form.dataset.cardFor;
  }
  await fillVisible();
}

// Fill the forms in view whose card values are not those of the chosen machine and units.
export async function fillVisible() {
  const machine = currentMachine();
  const wanted = (machine ? machine.id + "@" + machine.updated : "") + "|" + currentUnits();
  const stale = [...document.querySelectorAll(".view:not([hidden]) form[data-tool]")]
    .filter((form) => form.dataset.cardFor !== wanted);
  await Promise.all(stale.map(fillForm));
}
