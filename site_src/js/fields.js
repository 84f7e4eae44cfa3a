// The values of a tool's form: read as the bridge wants them, reset to the defaults of a unit
// system, and kept on the device as typed, so a reload, a killed tab or a new build loses nothing.
// A field the machine card filled (data-from-card) reads as blank: calc takes the card's value
// itself, and says so; only what was typed is kept.
import { device } from "./store.js";

const keptKey = (form) => "sumpside.form." + form.dataset.tool;

export const fieldOf = (form, name) => form.querySelector(`[name="${CSS.escape(name)}"]`);

// The default a text field shows in `units` (the template writes both systems' defaults).
export const defaultOf = (el, units) => el.dataset["default" + (units === "us" ? "Us" : "Metric")];

export function readInputs(form) {
  const inputs = {};
  for (const el of form.querySelectorAll("input[name], select[name], textarea[name]")) {
    if (el.dataset.fromCard) inputs[el.name] = "";
    else inputs[el.name] = el.type === "checkbox" ? (el.checked ? "yes" : "no") : el.value;
  }
  return inputs;
}

export function keepForm(form, units) {
  device.set(keptKey(form), { units, inputs: readInputs(form) });
}

export function restoreForm(form, units) {
  const kept = device.get(keptKey(form), null);
  if (!kept || kept.units !== units) return;
  for (const [name, value] of Object.entries(kept.inputs || {})) {
    const el = fieldOf(form, name);
    if (!el) continue;
    if (el.type === "checkbox") el.checked = value === "yes";
    else if (value === "" && defaultOf(el, units)) continue; // blank means the default: show it
    else if (el.tagName !== "SELECT" || [...el.options].some((o) => o.value === value)) el.value = value;
  }
}

export function resetForm(form, units) {
  for (const el of form.querySelectorAll("input[name]")) {
    if (el.type === "checkbox") el.checked = el.defaultChecked;
    else el.value = defaultOf(el, units) ?? "";
  }
  for (const el of form.querySelectorAll("select[name]")) {
    el.value = [...el.options].find((o) => o.defaultSelected)?.value ?? el.value;
  }
  keepForm(form, units);
}
