// The values of a tool's form: read as the bridge wants them, kept on the device as typed (a
// reload, a killed tab or a new build loses nothing), the fields a mode does not use hidden and
// never sent, and "Fill an example" with its undo.
// A field the machine card filled (data-from-card) reads as blank: calc takes the card's value
// itself, and says so; only what was typed is kept.
// A reading or a machine fact starts blank (its declared value is an example, in the
// placeholder); a limit starts at its standard value (data-start="standard"): calc's rule.
import { device } from "./store.js";

const keptKey = (form) => "sumpside.form." + form.dataset.tool;

export const fieldOf = (form, name) => form.querySelector(`[name="${CSS.escape(name)}"]`);

// The example or standard value of a text field in `units` (the template writes both systems').
export const defaultOf = (el, units) => el.dataset["default" + (units === "us" ? "Us" : "Metric")];

// What a field shows before anything is typed: a limit's standard value, else nothing.
export const startOf = (el, units) => (el.dataset.start === "standard" ? defaultOf(el, units) ?? "" : "");

// A field its mode does not use: hidden, so neither read nor sent.
const unused = (el) => Boolean(el.closest("[data-when][hidden]"));

export function readInputs(form) {
  const inputs = {};
  for (const el of form.querySelectorAll("input[name], select[name], textarea[name]")) {
    if (unused(el)) continue;
    if (el.dataset.fromCard) inputs[el.name] = "";
    else inputs[el.name] = el.type === "checkbox" ? (el.checked ? "yes" : "no") : el.value;
  }
  return inputs;
}

// Show the fields the chosen modes use, hide the others (registry: Field.when).
export function showModes(form) {
  for (const field of form.querySelectorAll("[data-when]")) {
    const mode = fieldOf(form, field.dataset.when);
    field.hidden = Boolean(mode) && !field.dataset.whenValues.split(" ").includes(mode.value);
  }
}

export function keepForm(form, units) {
  device.set(keptKey(form), { units, inputs: readInputs(form) });
}

export function restoreForm(form, units) {
  const kept = device.get(keptKey(form), null);
  if (kept && kept.units === units) {
    for (const [name, value] of Object.entries(kept.inputs || {})) {
      const el = fieldOf(form, name);
      if (!el) continue;
      if (el.type === "checkbox") el.checked = value === "yes";
      else if (value === "" && startOf(el, units)) continue; // a blank limit shows its standard value
      else if (el.tagName !== "SELECT" || [...el.options].some((o) => o.value === value)) el.value = value;
    }
  }
  showModes(form);
}

// Every value of the form, to put back with `putValues` (the undo of an example or a clear).
function takeValues(form) {
  return [...form.querySelectorAll("input[name], select[name], textarea[name]")].map((el) =>
    [el, el.type === "checkbox" ? el.checked : el.value, el.dataset.fromCard]);
}

function putValues(values) {
  for (const [el, value, fromCard] of values) {
    if (el.type === "checkbox") el.checked = value; else el.value = value;
    if (fromCard) el.dataset.fromCard = fromCard; else delete el.dataset.fromCard;
  }
}

// `change(form, units)` rewrites the form; the Undo button beside it puts back what was there.
// Returns the undo, or null when nothing changed.
function undoable(form, units, change, said) {
  const before = takeValues(form);
  change(form, units);
  const changed = takeValues(form).some(([, value], i) => value !== before[i][1]);
  const undo = form.querySelector('[data-action="undo"]');
  const state = form.querySelector("[data-example-state]");
  if (!changed || !undo) return null;
  undo.hidden = false;
  undo.onclick = () => {
    putValues(before);
    undo.hidden = true;
    state.hidden = true;
    showModes(form);
    keepForm(form, units);
    form.dispatchEvent(new Event("change"));
  };
  state.textContent = said;
  state.hidden = false;
  showModes(form);
  keepForm(form, units);
  return undo;
}

// Blank readings and facts in view take the tool's example values; what was typed stays.
export function fillExample(form, units) {
  return undoable(form, units, () => {
    for (const el of form.querySelectorAll("input[name][data-start='example']")) {
      if (!unused(el) && !el.value.trim() && !el.dataset.fromCard && defaultOf(el, units)) el.value = defaultOf(el, units);
    }
  }, "Example values are in the blank fields: they are not readings. Type yours over them, or undo.");
}

// A checklist's Clear: every field back to blank (limits to their standard), with an undo.
export function clearForm(form, units) {
  return undoable(form, units, () => {
    for (const el of form.querySelectorAll("input[name], textarea[name]")) {
      if (el.type === "checkbox") el.checked = el.defaultChecked;
      else el.value = startOf(el, units);
    }
    for (const el of form.querySelectorAll("select[name]")) {
      el.value = [...el.options].find((o) => o.defaultSelected)?.value ?? el.value;
    }
  }, "Cleared. Undo puts back what was there.");
}

// The minus key beside a field that may be negative (some phone keypads have none).
export function flipSign(el) {
  const text = el.value.trim();
  el.value = text.startsWith("-") || text.startsWith("−") ? text.slice(1) : "-" + text;
  el.focus();
  el.dispatchEvent(new Event("input", { bubbles: true }));
}
