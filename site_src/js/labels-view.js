// Labels for the tanks, and a card that arrives from one.
//
// A label (a sheet of them for every machine, or one machine's) prints the machine's name, site,
// oil, grade and cleanliness target in words beside a QR code of the app's own address with the
// card in its fragment (calc.machines.label; drawn by segno through the worker). Opening that
// address ("#/label/<fragment>", which no server ever sees) shows the card calc read from it,
// as text, and offers to add the machine or, where this phone holds another revision of it, to
// replace this phone's card: never without asking.
import { el } from "./answers.js";
import { allMachines, ask, localStamp, machine, saveMachine } from "./kit.js";
import { chooseMachine } from "./machine-pick.js";
import { go } from "./routing.js";
import { currentUnits } from "./units.js";

let calculator = null;
let drawing = 0;
const sheet = document.querySelector("[data-labels]");
const sheetStatus = document.querySelector("[data-labels-status]");

// The app's own address, without the fragment: where a label's code sends the camera.
const appAddress = () => location.href.split("#")[0];

async function labelFor(record) {
  const made = await ask("label", { machine: record, units: currentUnits() });
  if (!made.ok) throw new Error(made.errors.map((e) => e.message).join("; "));
  const drawn = await calculator.qr(appAddress() + "#/label/" + made.fragment);
  if (!drawn.ok) throw new Error(drawn.errors.map((e) => e.message).join("; "));
  const code = el("div", { className: "label-code" });
  code.innerHTML = drawn.svg; // segno's SVG: a path with presentation attributes, no script
  const words = el("dl", { className: "label-words" });
  for (const line of made.words) words.append(el("dt", { textContent: line.label }), el("dd", { textContent: line.text }));
  const label = el("figure", { className: "label" }, code, words,
    el("figcaption", { textContent: "Scan with the phone's camera to open this machine's card in Sumpside." }));
  label.dataset.machine = record.id;
  label.dataset.qrVersion = String(drawn.version);
  return label;
}

export async function renderLabels(param) {
  const turn = ++drawing;
  const one = param ? await machine(param) : null;
  const records = one ? [one] : (await allMachines()).sort((a, b) => a.card.name.localeCompare(b.card.name));
  sheetStatus.textContent = records.length ? "Drawing the labels…" : "No machines yet: make one first.";
  const labels = [];
  for (const record of records) labels.push(await labelFor(record));
  if (turn !== drawing) return;
  sheet.replaceChildren(...labels);
  sheetStatus.textContent = records.length ? `${records.length} label(s), on A4 or Letter: print at 100 % (no "fit to page") so each code stays 4 cm wide.` : sheetStatus.textContent;
}

// "#/label/<fragment>": the card a scanned label holds.
export async function showFromLabel(fragment) {
  const state = document.querySelector("[data-label-state]");
  const card = document.querySelector("[data-label-card]");
  const actions = document.querySelector("[data-label-actions]");
  card.replaceChildren();
  actions.replaceChildren();
  state.textContent = "Reading the label…";
  const id = await labelId(fragment);
  const local = id ? await machine(id) : null;
  const read = await ask("label-read", { fragment, units: currentUnits(), local: local || null });
  if (!read.ok) { state.textContent = "This label cannot be read: " + read.errors.map((e) => e.message).join("; ") + "."; return; }
  for (const line of read.summary) card.append(el("div", {}, el("dt", { textContent: line.label }), el("dd", { textContent: line.text })));
  const button = (text, primary, work) => {
    const b = el("button", { type: "button", className: primary ? "primary" : "", textContent: text });
    b.addEventListener("click", async () => {
      try { await work(); } catch (err) { state.textContent = "Not saved: " + err.message; }
    });
    actions.append(b);
  };
  const open = async (record) => { await chooseMachine(record.id); go("#/machine/" + encodeURIComponent(record.id)); };
  if (read.state === "new") {
    state.textContent = `${read.machine.card.name} is not on this phone yet.`;
    button("Add this machine", true, async () => { await saveMachine(read.machine); await open(read.machine); });
  } else if (read.state === "same") {
    state.textContent = `This phone has this card of ${read.machine.card.name} already, as the label holds it.`;
    button("Open the machine", true, () => open(local));
  } else {
    state.textContent = `This phone holds another version of ${local.card.name}'s card (saved ${new Date(read.local_updated).toLocaleString()}); `
      + `the label's was saved ${new Date(read.machine.updated).toLocaleString()}. Keep this phone's, or take the label's?`;
    button("Keep this phone's card", true, () => open(local));
    button("Take the label's card", false, async () => {
      // The label's card as the next revision of this phone's, so that the change travels.
      const shown = await ask("card-view", { machine: read.machine, units: "metric" });
      const made = await ask("card-check", { card: { ...shown.values, notes: local.card.notes || "" }, units: "metric",
        id: local.id, time: localStamp(), previous: local });
      if (!made.ok) throw new Error(made.errors.map((e) => e.message).join("; "));
      await saveMachine(made.machine);
      await open(made.machine);
    });
  }
}

// The machine id a label names, read by calc (nothing on this phone is looked up by text).
async function labelId(fragment) {
  const read = await ask("label-read", { fragment, units: "metric", local: null });
  return read.ok ? read.machine.id : null;
}

export function startLabels(calc) {
  calculator = calc;
  document.querySelector("[data-labels-print]").addEventListener("click", () => window.print());
}
