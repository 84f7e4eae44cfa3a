// The unit switch: metric or US, kept on the device. Switching re-expresses what was typed in
// every form (the worker converts; an example or standard value becomes the other system's).
import { device } from "./store.js";
import { defaultOf, fieldOf, keepForm, readInputs, startOf } from "./fields.js";

const KEY = "sumpside.units";
const root = document.documentElement;
let units = device.get(KEY, "metric");

export const currentUnits = () => units;

function showUnitLabels() {
  root.dataset.units = units;
  for (const b of document.querySelectorAll(".unit-switch button")) {
    b.setAttribute("aria-pressed", String(b.dataset.units === units));
  }
  for (const span of document.querySelectorAll(".unit")) {
    span.textContent = units === "us" ? span.dataset.unitUs : span.dataset.unitMetric;
  }
  for (const input of document.querySelectorAll("[data-placeholder-metric]")) {
    input.placeholder = units === "us" ? input.dataset.placeholderUs : input.dataset.placeholderMetric;
  }
}

async function reexpress(calculator, form, previous) {
  const inputs = readInputs(form);
  const typed = {};
  for (const el of form.querySelectorAll("input[name]:not([type=checkbox])")) {
    if (el.value && el.value === defaultOf(el, previous)) el.value = defaultOf(el, units);
    else if (el.value.trim()) typed[el.name] = inputs[el.name];
  }
  if (Object.keys(typed).length) {
    const shown = await calculator.reexpress(form.dataset.tool, typed, previous, units);
    for (const [key, value] of Object.entries(shown)) {
      const el = fieldOf(form, key);
      if (el && typeof value === "string") el.value = value;
    }
  }
  keepForm(form, units);
}

// Call before the forms restore what was kept: the page is rendered with metric defaults.
// `switched` runs once every form is in the new units.
export function startUnits(calculator, switched) {
  if (units !== "metric") {
    for (const el of document.querySelectorAll("input[name]:not([type=checkbox])")) el.value = startOf(el, units);
  }
  for (const button of document.querySelectorAll(".unit-switch button")) {
    button.addEventListener("click", async () => {
      const previous = units;
      if (button.dataset.units === previous) return;
      units = button.dataset.units;
      device.set(KEY, units);
      showUnitLabels();
      await Promise.all([...document.querySelectorAll("form[data-tool]")].map((f) => reexpress(calculator, f, previous)));
      switched();
    });
  }
  showUnitLabels();
}
