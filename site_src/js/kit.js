// The machine kit on this device: machines, readings and digests in the database (js/db.js),
// made and checked by calc (calc.machines.api, through the worker). Nothing here computes:
// records come from calc and go back to calc as they were stored.
//
// Records travel between phones (calc.machines.sync): each has a revision, and a deletion is
// kept as a marker ({id, rev, deleted: true, ...}) so that it travels too. The stores hold the
// markers; everything shown reads only the live records.
import { getAll, getOne, transact } from "./db.js";

let calculator = null;
const listeners = new Set();

export const ask = (op, request) => calculator.machines(op, request);

// Something changed (a machine, a reading): views that show the kit draw again.
export const onKitChange = (fn) => listeners.add(fn);
const changed = () => { for (const fn of listeners) fn(); };

// The local time with its offset from UTC, as calc keeps times: 2026-03-04T09:15:00.250+01:00
// (milliseconds, so two readings saved in the same second still keep their order).
export function localStamp(date = new Date()) {
  const pad = (n) => String(Math.floor(Math.abs(n))).padStart(2, "0");
  const offset = -date.getTimezoneOffset();
  return `${date.getFullYear()}-${pad(date.getMonth() + 1)}-${pad(date.getDate())}T`
    + `${pad(date.getHours())}:${pad(date.getMinutes())}:${pad(date.getSeconds())}.${String(date.getMilliseconds()).padStart(3, "0")}`
    + `${offset >= 0 ? "+" : "-"}${pad(offset / 60)}:${pad(offset % 60)}`;
}
export const today = () => localStamp().slice(0, 10);

// Why the device refused to store something, in words a technician can act on.
export function storageProblem(err) {
  const name = err && err.name;
  if (name === "QuotaExceededError") return "the phone's storage for this app is full: export the readings, delete old ones or free space, then try again";
  if (name === "InvalidStateError" || name === "SecurityError" || name === "UnknownError" || !("indexedDB" in globalThis)) {
    return "this browser does not let the app keep data here (a private window, or storage switched off): nothing was stored";
  }
  return "this device refused to store it (" + ((err && err.message) || name || "no reason given") + ")";
}

// What went wrong, in words: the device's storage refusing (a DOMException, or no database
// at all) in storageProblem's words, anything else by its own message.
export const problemWords = (err) => (err instanceof DOMException || !("indexedDB" in globalThis)
  ? storageProblem(err) : (err && err.message) || String(err));

const stored = (record) => ({ ...record, at: Date.parse(record.time) });
const plain = ({ at, ...record }) => record; // calc's record, without the page's index field

const live = (docs) => docs.filter((d) => d && !d.deleted);
const fail = (answer) => new Error(answer.errors.map((e) => (e.field ? e.field + ": " : "") + e.message).join("; "));

export const allMachines = async () => live(await getAll("machines"));
export const machine = async (id) => {
  const found = id ? await getOne("machines", id) : undefined;
  return found && !found.deleted ? found : undefined;
};
export const digests = async () => Object.fromEntries((await getAll("digests")).map(({ machine: id, ...d }) => [id, d]));
export const readingsOf = async (id) => live(await getAll("readings", "machine", id)).map(plain);
export const allReadings = async () => live(await getAll("readings")).map(plain);
// Every stored document, deletion markers too: what a merge or an export needs.
const everything = async (checks) => ({ machines: await getAll("machines"),
  readings: (await getAll("readings")).map(plain), checks });

// A machine record calc made (card-check, to-card); its digest follows its card.
export async function saveMachine(record) {
  await transact(["machines"], "readwrite", (s) => { s.machines.put(record); });
  await redigest(record.id);
  changed();
}

// A machine and its readings deleted: each becomes calc's deletion marker, so that the
// deletion reaches the other phones with the next file or sync.
export async function deleteMachine(id) {
  const record = await machine(id);
  if (!record) return;
  const marked = await ask("delete", { docs: [record, ...(await readingsOf(id))], time: localStamp() });
  if (!marked.ok) throw fail(marked);
  await transact(["machines", "readings", "digests"], "readwrite", (s) => {
    for (const doc of marked.docs) {
      if (doc.format === record.format) s.machines.put(doc); else s.readings.put(stored(doc));
    }
    s.digests.delete(id);
  });
  changed();
}

// Save a reading calc made ({record, digest} of the "save" op) with its machine's digest.
export async function keepReading(saved) {
  await transact(["readings", "digests"], "readwrite", (s) => {
    s.readings.put(stored(saved.record));
    if (saved.record.machine) s.digests.put({ machine: saved.record.machine, ...saved.digest });
  });
  changed();
}

// A machine's digest made again by calc from all its readings (after a delete, an import, a
// card changed, or a digest whose verdicts no longer hold).
export async function redigest(id) {
  const record = id && (await machine(id));
  if (!record) return;
  const answer = await ask("digest", { machine: record, readings: await readingsOf(id) });
  if (answer.ok) await transact(["digests"], "readwrite", (s) => { s.digests.put({ machine: id, ...answer.digest }); });
}

export async function deleteReading(record) {
  const marked = await ask("delete", { doc: record, time: localStamp() });
  if (!marked.ok) throw fail(marked);
  await transact(["readings"], "readwrite", (s) => { s.readings.put(stored(marked.doc)); });
  await redigest(record.machine);
  changed();
}

// Machines, readings and digests as calc made them (demo, migration, import), in one go.
async function keepAll({ machines = [], readings = [], digests: made = {} }, meta = null) {
  await transact(["machines", "readings", "digests", "meta"], "readwrite", (s) => {
    for (const m of machines) s.machines.put(m);
    for (const r of readings) s.readings.put(stored(r));
    for (const [id, d] of Object.entries(made)) s.digests.put({ machine: id, ...d });
    if (meta) s.meta.put(meta);
  });
  changed();
}

export async function loadDemo() {
  const plant = await ask("demo", { today: today() });
  if (!plant.ok) throw new Error(plant.errors.map((e) => e.message).join("; "));
  await keepAll(plant);
  return plant.machines.length;
}

// The demo plant goes for good (no deletion markers: nothing of it needs to travel).
export async function removeDemo() {
  const demo = new Set((await getAll("machines")).filter((m) => m.demo).map((m) => m.id));
  const readings = (await getAll("readings")).filter((r) => r.demo || demo.has(r.machine));
  await transact(["machines", "readings", "digests"], "readwrite", (s) => {
    for (const r of readings) s.readings.delete(r.id);
    for (const id of demo) { s.machines.delete(id); s.digests.delete(id); }
  });
  changed();
}

// Everything on this device as one file (calc's export, version 2: machines, readings and
// the checklist results `checks`, deletion markers included), to keep or to move to another phone.
export async function exportAll(checks) {
  const made = await ask("export", { ...(await everything(checks)), time: localStamp() });
  if (!made.ok) throw fail(made);
  return made.file;
}

// A file from another phone (or this one), an earlier version's export, or an earlier build's
// log: checked whole by calc, then merged with what is here (calc.machines.sync: the newer
// revision wins, nothing on this device is lost, a card edited on both phones is kept both
// ways to settle). Only calc's `put` is written, in one transaction: a file refused whole
// changes nothing. Resolves with calc's answer (its `message` says what it did; `put.checks`
// are the checklist results for the page to keep).
export const importFile = (data, checks) => mergeInto("merge", { incoming: data }, checks);

// What the plant's database holds (js/sync.js): every version of each document that changed,
// merged as a file is (calc.machines.database), and kept the same way.
export const mergeLeaves = (leaves, checks) => mergeInto("database-merge", { leaves }, checks);

async function mergeInto(op, request, checks) {
  const merged = await ask(op, { ...request, local: await everything(checks), time: localStamp() });
  if (!merged.ok) throw fail(merged);
  await keepAll({ machines: merged.put.machines, readings: merged.put.readings });
  for (const id of merged.redigest) await redigest(id);
  changed();
  return merged;
}

// What to write to the plant's database so that it holds what this phone holds, given what it
// holds now (`heads`): calc's {docs, closed}.
export async function databaseWrites(heads, checks) {
  const made = await ask("database-writes", { ...(await everything(checks)), heads });
  if (!made.ok) throw fail(made);
  return made;
}

// A card edited on two phones apart: the side the user chose becomes the card everywhere.
export async function settleCard(record, rev) {
  const settled = await ask("settle", { doc: record, rev, time: localStamp() });
  if (!settled.ok) throw fail(settled);
  await saveMachine(settled.doc);
}

// The earlier build's log (store "entries") moved into machines and readings once, by calc;
// the old store is left as it was. Resolves with what was moved, or null if nothing was to.
export async function migrateOldLog() {
  if (await getOne("meta", "log-migrated")) return null;
  const entries = await getAll("entries");
  const meta = { key: "log-migrated", at: localStamp(), entries: entries.length };
  if (!entries.length) {
    await transact(["meta"], "readwrite", (s) => { s.meta.put(meta); });
    return null;
  }
  const moved = await ask("migrate", { entries, time: localStamp() });
  if (!moved.ok) throw new Error(moved.errors.map((e) => e.message).join("; "));
  await keepAll(moved, { ...meta, readings: moved.readings.length, kept_as_saved: moved.kept_as_saved });
  return moved;
}

export function startKit(calc) {
  calculator = calc;
}
