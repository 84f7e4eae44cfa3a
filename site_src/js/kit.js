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
export async function importFile(data, checks) {
  const [incoming, local] = narrowed(data, await everything(checks));
  return mergeInto("merge", { incoming }, local);
}

// What the plant's database holds (js/sync.js): every version of each document that changed,
// merged as a file is (calc.machines.database), and kept the same way.
export const mergeLeaves = async (leaves, checks) => mergeInto("database-merge", { leaves }, await everything(checks));

// What says that two copies of a document are the same (calc's sync.held_key: its id, its rev
// and the revs of the sides it keeps in conflict), for a document whose members are all text
// there (else null: calc alone decides about it).
const KINDS = ["machines", "readings", "checks"];
function heldKey(doc) {
  if (!doc || typeof doc !== "object" || typeof doc.id !== "string" || typeof doc.rev !== "string") return null;
  const sides = doc.conflicts == null ? [] : doc.conflicts;
  if (!Array.isArray(sides) || !sides.every((s) => s && typeof s === "object" && typeof s.rev === "string")) return null;
  return [doc.id, doc.rev, ...sides.map((s) => s.rev).sort()].join("\n");
}

// A file and this phone's documents as the merge needs them, carried cheaply: a document of the
// file that this phone holds the same (heldKey) goes as its id and rev marked held_here, which
// calc leaves unread as it would the whole (sync.checked_export; its place in the file is kept,
// so calc's reasons name the right one); of this phone's documents only those the file names
// otherwise, and those holding a conflict (which calc counts as still to settle), go. The merge
// is the same; a file from a phone met before mostly shrinks to ids. A file of an earlier version
// goes whole.
export function narrowed(file, local) {
  if (!file || typeof file !== "object" || file.version !== 2 || !KINDS.every((k) => Array.isArray(file[k]))) return [file, local];
  const held = new Set(KINDS.flatMap((kind) => local[kind].map((doc) => kind + "\n" + heldKey(doc))));
  const named = new Set();
  const out = { ...file };
  for (const kind of KINDS) {
    out[kind] = file[kind].map((doc) => {
      const key = heldKey(doc);
      if (key !== null && held.has(kind + "\n" + key)) return { id: doc.id, rev: doc.rev, held_here: true };
      if (doc && typeof doc === "object" && typeof doc.id === "string") named.add(kind + "\n" + doc.id);
      return doc;
    });
  }
  const mine = Object.fromEntries(KINDS.map((kind) => [kind, local[kind].filter((doc) =>
    named.has(kind + "\n" + doc.id) || (Array.isArray(doc.conflicts) && doc.conflicts.length))]));
  return [out, mine];
}

async function mergeInto(op, request, local) {
  const merged = await ask(op, { ...request, local, time: localStamp() });
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
