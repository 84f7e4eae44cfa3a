// The machine kit on this device: machines, readings and digests in the database (js/db.js),
// made and checked by calc (calc.machines.api, through the worker). Nothing here computes:
// records come from calc and go back to calc as they were stored.
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

export const allMachines = () => getAll("machines");
export const machine = (id) => (id ? getOne("machines", id) : Promise.resolve(undefined));
export const digests = async () => Object.fromEntries((await getAll("digests")).map(({ machine: id, ...d }) => [id, d]));
export const readingsOf = async (id) => (await getAll("readings", "machine", id)).map(plain);
export const allReadings = async () => (await getAll("readings")).map(plain);

// A machine record calc made (card-check, to-card); its digest follows its card.
export async function saveMachine(record) {
  await transact(["machines"], "readwrite", (s) => { s.machines.put(record); });
  await redigest(record.id);
  changed();
}

export async function deleteMachine(id) {
  await transact(["machines", "readings", "digests"], "readwrite", async (s, done) => {
    const keys = await done(s.readings.index("machine").getAllKeys(id));
    for (const key of keys) s.readings.delete(key);
    s.digests.delete(id);
    s.machines.delete(id);
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
  await transact(["readings"], "readwrite", (s) => { s.readings.delete(record.id); });
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

export async function removeDemo() {
  for (const m of (await allMachines()).filter((m) => m.demo)) await deleteMachine(m.id);
  // Readings of the demo saved without a machine, if any, go too.
  const strays = (await getAll("readings")).filter((r) => r.demo);
  if (strays.length) await transact(["readings"], "readwrite", (s) => { for (const r of strays) s.readings.delete(r.id); });
  changed();
}

// Everything on this device as one file, to keep or to move to another phone.
export async function exportAll() {
  return { format: "sumpside-export", version: 1, exported: localStamp(),
    machines: await allMachines(), readings: await allReadings() };
}

// A file of exportAll (merged by id: nothing on this device is lost), or an earlier build's
// log export (a list of entries, migrated by calc). Returns what was added.
export async function importFile(data) {
  if (Array.isArray(data)) {
    const moved = await ask("migrate", { entries: data, time: localStamp() });
    if (!moved.ok) throw new Error(moved.errors.map((e) => e.message).join("; "));
    await keepAll(moved);
    return { machines: moved.machines.length, readings: moved.readings.length };
  }
  if (!data || data.format !== "sumpside-export" || !Array.isArray(data.machines) || !Array.isArray(data.readings)) {
    throw new Error("the file is not a Sumpside export");
  }
  const known = new Set((await getAll("readings")).map((r) => r.id));
  const knownMachines = new Set((await allMachines()).map((m) => m.id));
  // Every card from a file is checked by calc before it is kept; one that fails is named.
  const machines = [];
  for (const m of data.machines.filter((m) => m && typeof m.id === "string" && !knownMachines.has(m.id))) {
    const checked = await ask("card-check", { card: m.card, units: "metric", id: m.id, time: m.updated || localStamp() });
    if (!checked.ok) throw new Error(`the card of ${JSON.stringify(m.card && m.card.name)}: `
      + checked.errors.map((e) => `${e.field}: ${e.message}`).join("; "));
    machines.push(m.demo ? { ...checked.machine, demo: true } : checked.machine);
  }
  // Every reading is checked by calc against the record's shape before it is kept; the
  // refused ones are counted and the first reasons said.
  const checked = await ask("check-readings", { readings: data.readings });
  if (!checked.ok) throw new Error(checked.errors.map((e) => e.message).join("; "));
  const readings = checked.readings.filter((r) => !known.has(r.id));
  await keepAll({ machines, readings });
  for (const id of new Set([...machines.map((m) => m.id), ...readings.map((r) => r.machine).filter(Boolean)])) {
    await redigest(id);
  }
  changed();
  return { machines: machines.length, readings: readings.length, refused: checked.refused, reasons: checked.reasons };
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
