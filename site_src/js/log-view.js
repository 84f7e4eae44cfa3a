// The log: every saved reading, newest first, a page at a time, as calc shows it now in the
// units chosen; the bug reports below. Saving a form's answer as a reading is here too.
import { allMachines, ask, deleteReading, digests, keepReading, localStamp, onKitChange, storageProblem } from "./kit.js";
import { getOne, newestReadings } from "./db.js";
import { currentMachine } from "./machine-pick.js";
import { readingCard } from "./reading-view.js";
import { showBugReports } from "./bug-reports.js";
import { device } from "./store.js";

export const LAST_EXPORT = "sumpside.last-export";
import { currentUnits } from "./units.js";

const PAGE = 50;
let drawing = 0; // the newest render; an older one stops where it is
let shownCount = PAGE;
let saving = Promise.resolve(); // saves one after another: each digest builds on the last

// `kept` is the form's last good answer with what was asked ({answer, inputs, units}).
export function saveReading(form, kept) {
  const state = form.querySelector("[data-saved]");
  if (!kept) { state.textContent = "Nothing to save yet: fix the inputs first."; return Promise.resolve(); }
  const machine = currentMachine();
  saving = saving.then(async () => {
    const digest = machine ? (await digests())[machine.id] || null : null;
    const saved = await ask("save", { tool: form.dataset.tool, inputs: kept.inputs, units: kept.units,
      machine, time: localStamp(), digest });
    if (!saved.ok) {
      state.textContent = "Not saved: " + saved.errors.map((e) => e.message).join(" ");
      return;
    }
    await keepReading(saved);
    await keepForGood();
    state.textContent = "";
    const where = machine ? "Saved to the readings of " + machine.card.name + ". " : "Saved to the log (no machine chosen). ";
    const link = Object.assign(document.createElement("a"), {
      href: machine ? "#/machine/" + encodeURIComponent(machine.id) : "#/log",
      textContent: machine ? "Open its page" : "Open the log" });
    state.append(where, link);
  }).catch((err) => { state.textContent = "Not saved: " + storageProblem(err) + "."; });
  return saving;
}

export async function renderReadings(list, records, names, units, onDeleted) {
  const answer = await ask("readings", { records, units });
  if (!answer.ok) return false;
  list.append(...answer.views.map((view, i) => readingCard(view, names.get(view.machine) || "",
    async () => { await deleteReading(records[i]); onDeleted(); })));
  return true;
}

// Ask the browser, at the first save, to keep this site's storage under storage pressure (it
// may clear an unused site's data otherwise); the log page says what it answered.
async function keepForGood() {
  try {
    if (navigator.storage && navigator.storage.persist && !(await navigator.storage.persisted())) await navigator.storage.persist();
  } catch { /* not offered: the log page says so */ }
}

async function showStorage() {
  const line = document.querySelector("[data-log-storage]");
  let kept = false;
  try { kept = Boolean(navigator.storage && (await navigator.storage.persisted())); } catch { kept = false; }
  const last = device.get(LAST_EXPORT, null);
  line.textContent = kept
    ? "This browser keeps the readings on this device for good (it will not clear them to save space)."
    : "This browser may clear the readings if the phone runs short of space or the app goes unused for long: "
      + "export them from the machines page now and then (" + (last ? "last export " + new Date(last).toLocaleDateString() : "no export yet") + ").";
  line.dataset.kept = String(kept);
}

export async function renderLog() {
  const turn = ++drawing;
  showBugReports();
  showStorage();
  const list = document.querySelector("[data-log-list]");
  const more = document.querySelector('[data-log="more"]');
  // Deletion markers carry no time, so the "at" index never holds them.
  const records = (await newestReadings(0, shownCount + 1)).map(({ at, ...r }) => r);
  const moved = await getOne("meta", "log-migrated");
  if (moved && moved.readings) {
    document.querySelector("[data-log-status]").textContent = `The ${moved.readings} results saved by the `
      + `earlier version moved in on ${new Date(moved.at).toLocaleDateString()}, each under its machine; `
      + "the earlier log is kept on this device too.";
  }
  const names = new Map((await allMachines()).map((m) => [m.id, m.card.name]));
  if (turn !== drawing) return;
  more.hidden = records.length <= shownCount;
  const page = records.slice(0, shownCount);
  if (!page.length) {
    list.replaceChildren(Object.assign(document.createElement("p"), { textContent: "No saved readings yet." }));
    return;
  }
  const fresh = document.createElement("div");
  await renderReadings(fresh, page, names, currentUnits(), renderLog);
  if (turn === drawing) list.replaceChildren(...fresh.children);
}

export function startLog() {
  document.querySelector('[data-log="print"]').addEventListener("click", () => window.print());
  document.querySelector('[data-log="more"]').addEventListener("click", () => { shownCount += PAGE; renderLog(); });
  onKitChange(() => { if (!document.querySelector('[data-view="log"]').hidden) renderLog(); });
}
