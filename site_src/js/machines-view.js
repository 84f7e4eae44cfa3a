// The machines list (each machine's worst latest verdict and what is due first, from calc),
// the demo plant, export and import; and the card form, to make a machine or edit its card.
import { LEVEL_WORD, el } from "./answers.js";
import { allMachines, allReadings, ask, digests, exportAll, importFile, loadDemo, localStamp,
  machine, redigest, removeDemo, saveMachine, problemWords, today } from "./kit.js";
import { chooseMachine } from "./machine-pick.js";
import { go } from "./routing.js";
import { device, download, share } from "./store.js";
import { checklistDocs, keepChecklistDocs } from "./check-docs.js";
import { LAST_EXPORT } from "./log-view.js";
import { currentUnits } from "./units.js";

const status = document.querySelector("[data-kit-status]");

// A file's text: UTF-16 when it starts with its byte-order mark, else UTF-8, strictly (a
// Latin-1 or other file is refused, never stored garbled).
function decodeText(buffer) {
  const head = new Uint8Array(buffer.slice(0, 2));
  const utf16 = head[0] === 0xff && head[1] === 0xfe ? "utf-16le" : head[0] === 0xfe && head[1] === 0xff ? "utf-16be" : null;
  try {
    return new TextDecoder(utf16 || "utf-8", { fatal: true }).decode(buffer);
  } catch {
    throw new Error("the file is not UTF-8 or UTF-16 text: save it again as UTF-8 and import that");
  }
}
const list = document.querySelector("[data-machine-list]");
const cardForm = document.querySelector("[data-card-form]");
let drawing = 0;

function machineItem(row) {
  const level = row.level || "none";
  const link = el("a", { href: "#/machine/" + encodeURIComponent(row.id), className: "machine-item level-" + level });
  const badge = el("span", { className: "badge level-badge", textContent: LEVEL_WORD[row.level] || "No verdict" });
  const due = row.due ? el("span", { className: "machine-due due-" + row.due.state, textContent: row.due.says }) : "";
  const facts = `${row.readings} reading${row.readings === 1 ? "" : "s"}`
    + (row.last ? ", the last on " + new Date(row.last).toLocaleDateString() : "");
  link.append(el("span", { className: "menu-title" }, badge, " ", row.name),
    row.site ? el("span", { className: "menu-summary", textContent: row.site }) : "",
    el("span", { className: "menu-summary", textContent: facts }), due);
  return el("li", {}, link);
}

export async function renderMachines() {
  const turn = ++drawing;
  const machines = await allMachines();
  document.querySelector('[data-kit="demo-remove"]').hidden = !machines.some((m) => m.demo);
  document.querySelector('[data-kit="demo-load"]').hidden = machines.some((m) => m.demo);
  if (!machines.length) {
    list.replaceChildren(el("li", { className: "muted", textContent: "No machines yet: make one, or load the demo plant to see a full machine page." }));
    return;
  }
  // The digests without the readings they keep: calc asks for those only when a digest's
  // verdicts no longer hold (then they are made again and the list drawn once more).
  const held = Object.fromEntries(Object.entries(await digests()).map(([id, { readings, ...d }]) => [id, d]));
  const answer = await ask("machines", { machines, digests: held, units: currentUnits(), today: today() });
  if (turn !== drawing || !answer.ok) return;
  list.replaceChildren(...answer.machines.map(machineItem));
  if (answer.stale.length) {
    for (const id of answer.stale) await redigest(id);
    if (turn === drawing) renderMachines();
  }
}

const stamp = () => new Date().toISOString().slice(0, 10);

function startListActions() {
  const act = (name, work) => document.querySelector(`[data-kit="${name}"]`).addEventListener("click", async () => {
    try { await work(); } catch (err) { status.textContent = "Not done: " + problemWords(err) + "."; }
  });
  act("demo-load", async () => {
    status.textContent = "Loading the demo plant…";
    const n = await loadDemo();
    status.textContent = `The demo plant's ${n} machines are loaded: open one to see its page. Remove them again here.`;
  });
  act("demo-remove", async () => {
    if (!confirm("Remove the demo plant's machines and readings? Your own stay.")) return;
    await removeDemo();
    status.textContent = "The demo plant is removed.";
  });
  act("export-json", async () => {
    const file = await exportAll(await checklistDocs());
    const how = await share(`sumpside-${stamp()}.json`, "application/json", JSON.stringify(file, null, 1));
    if (how === "cancelled") { status.textContent = "Not exported: the share was cancelled."; return; }
    device.set(LAST_EXPORT, new Date().toISOString());
    status.textContent = `${how === "shared" ? "Shared" : "Downloaded"}: ${file.machines.length} machine record(s), `
      + `${file.readings.length} reading record(s) and ${file.checks.length} checklist result(s), deletions included. `
      + "Import the file on the other phone: what is new there is added, nothing there is lost.";
  });
  act("export-csv", async () => {
    const answer = await ask("csv", { machines: await allMachines(), readings: await allReadings(), units: currentUnits() });
    if (!answer.ok) throw new Error(answer.errors.map((e) => e.message).join(" "));
    download(`sumpside-readings-${stamp()}.csv`, "text/csv", answer.text);
  });
  document.querySelector('[data-kit="import"]').addEventListener("change", async (event) => {
    const file = event.target.files[0];
    if (!file) return;
    try {
      const merged = await importFile(JSON.parse(decodeText(await file.arrayBuffer())), await checklistDocs());
      keepChecklistDocs(merged.put.checks);
      status.textContent = `Imported: ${merged.message}; nothing on this phone was lost.`
        + (merged.reasons.length ? ` Left out: ${merged.reasons.join("; ")}.` : "")
        + (merged.open_conflicts ? ` ${merged.open_conflicts} card(s) changed on two phones: open the machine to choose.` : "");
    } catch (err) {
      status.textContent = "Import failed, nothing was added: " + (err instanceof SyntaxError
        ? "the file is not JSON (a Sumpside export is a .json file; use UTF-8 or UTF-16 text)" : problemWords(err));
    }
    event.target.value = "";
  });
}

// The card form: "card/new" or "card/<id>", values in the units shown.
function readCard() {
  const typed = {};
  for (const field of cardForm.querySelectorAll("[name]")) typed[field.name] = field.value;
  return typed;
}

function showCardErrors(errors) {
  for (const p of cardForm.querySelectorAll("[data-error-for]")) { p.hidden = true; p.textContent = ""; }
  for (const input of cardForm.querySelectorAll("[aria-invalid]")) input.removeAttribute("aria-invalid");
  const state = cardForm.querySelector("[data-state]");
  state.textContent = errors.length ? "Check the marked fields." : "";
  state.dataset.kind = errors.length ? "error" : "";
  let first = null;
  for (const e of errors) {
    const slot = cardForm.querySelector(`[data-error-for="${CSS.escape(e.field)}"]`);
    const input = cardForm.querySelector(`[name="${CSS.escape(e.field)}"]`);
    if (slot) { slot.textContent = e.message; slot.hidden = false; } else state.textContent += " " + e.message;
    if (input) { input.setAttribute("aria-invalid", "true"); first = first || input; }
  }
  if (first) first.focus();
}

function clearCardForm() {
  for (const field of cardForm.querySelectorAll("[name]")) {
    field.value = field.tagName === "SELECT" ? field.options[0].value : "";
  }
  showCardErrors([]);
}

export async function showCard(param) {
  clearCardForm();
  const editing = param && param !== "new" ? await machine(param) : null;
  cardForm.dataset.id = editing ? editing.id : "";
  document.querySelector("[data-card-title]").textContent = editing ? "Card of " + editing.card.name : "New machine";
  document.querySelector("[data-card-cancel]").href = editing ? "#/machine/" + encodeURIComponent(editing.id) : "#/machines";
  cardForm.dataset.units = currentUnits();
  if (!editing) return;
  const shown = await ask("card-view", { machine: editing, units: currentUnits() });
  if (!shown.ok) return;
  for (const [key, value] of Object.entries(shown.values)) {
    const field = cardForm.querySelector(`[name="${CSS.escape(key)}"]`);
    if (field) field.value = value;
  }
}

// The units switched while the card form is open: what was typed follows.
export async function reexpressCard(to) {
  const from = cardForm.dataset.units || "metric";
  if (from === to) return;
  const answer = await ask("card-reexpress", { card: readCard(), from, to });
  cardForm.dataset.units = to;
  if (!answer.ok) return;
  for (const [key, value] of Object.entries(answer.values)) {
    const field = cardForm.querySelector(`[name="${CSS.escape(key)}"]`);
    if (field) field.value = value;
  }
}

function startCardForm() {
  cardForm.addEventListener("submit", async (event) => {
    event.preventDefault();
    const id = cardForm.dataset.id || null;
    const known = id ? await machine(id) : null;
    // An edit is the stored card's next revision (so that it travels as one), a new card its first.
    const answer = await ask("card-check", { card: readCard(), units: currentUnits(), id, time: localStamp(), previous: known || null });
    if (!answer.ok) { showCardErrors(answer.errors); return; }
    const record = known && known.demo ? { ...answer.machine, demo: true } : answer.machine;
    await saveMachine(record);
    await chooseMachine(record.id);
    go("#/machine/" + encodeURIComponent(record.id));
  });
}

export function startMachines() {
  startListActions();
  startCardForm();
}
