// The machine being worked on: chosen in the bar at the top (kept on the device), its record
// at hand for the forms (js/card-fill.js), its name in every print head.
import { allMachines, machine, onKitChange } from "./kit.js";
import { device } from "./store.js";

const KEY = "sumpside.machine-id";
const pick = document.querySelector("[data-machine-pick]");
const link = document.querySelector("[data-machine-link]");
const listeners = new Set();
let current = null;

export const currentMachine = () => current;
export const onMachineChange = (fn) => listeners.add(fn);

const nameOf = (m) => (m && m.card && m.card.name) || "";

function showName() {
  for (const span of document.querySelectorAll("[data-job-show=machine]")) span.textContent = nameOf(current) || "________________";
  link.href = current ? "#/machine/" + encodeURIComponent(current.id) : "#/machines";
  link.textContent = current ? "Its page" : "Machines";
}

async function fillChoices() {
  const machines = (await allMachines()).sort((a, b) => nameOf(a).localeCompare(nameOf(b)));
  const keep = pick.options[0];
  pick.replaceChildren(keep, ...machines.map((m) => new Option(nameOf(m), m.id)));
  pick.value = current ? current.id : "";
}

// Choose a machine (or none, with null); every form is filled from its card.
export async function chooseMachine(id) {
  current = (id && (await machine(id))) || null;
  device.set(KEY, current ? current.id : "");
  pick.value = current ? current.id : "";
  showName();
  for (const fn of listeners) fn(current);
}

export async function startMachinePick() {
  for (const span of document.querySelectorAll("[data-today]")) span.textContent = new Date().toLocaleDateString();
  pick.addEventListener("change", () => chooseMachine(pick.value));
  onKitChange(async () => {
    // A card edited or a machine deleted: the record in hand follows.
    const fresh = current ? await machine(current.id) : null;
    await fillChoices();
    if (JSON.stringify(fresh || null) !== JSON.stringify(current)) await chooseMachine(fresh ? fresh.id : "");
  });
  try {
    current = (await machine(device.get(KEY, ""))) || null;
    await fillChoices();
  } catch (err) {
    console.warn("machines are not available on this device:", err);
  }
  showName();
}
