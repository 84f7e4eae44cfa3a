// Checklist results as documents that travel (calc.machines.checkmarks): what a technician
// marked on a checklist for a machine and a day. The checklist view keeps them on this device
// (localStorage "sumpside.checks.<checklist>.<machine id|none>.<day>": {states, notes, note}),
// each with the document calc last made of it (`doc`), so that an unchanged result keeps its
// revision and an export carries the same document every time.
import { ask, localStamp } from "./kit.js";
import { device } from "./store.js";

const PREFIX = "sumpside.checks.";

function keptResults() {
  const found = [];
  try {
    for (let i = 0; i < localStorage.length; i++) {
      const key = localStorage.key(i);
      if (key && key.startsWith(PREFIX)) found.push(key);
    }
  } catch { /* storage refused: nothing kept to send */ }
  return found;
}

// Every checklist result on this device as calc's documents, made again where it changed.
export async function checklistDocs() {
  const docs = [];
  for (const key of keptResults()) {
    const kept = device.get(key, {});
    const [checklist, machine, day] = key.slice(PREFIX.length).split(".");
    if (kept.doc && kept.doc.deleted) { docs.push(kept.doc); continue; }
    const made = await ask("checks-save", { checklist, machine: machine === "none" ? null : machine, day,
      marks: kept.states || {}, notes: kept.notes || {}, note: kept.note || "", time: localStamp(), previous: kept.doc || null });
    if (!made.ok) continue; // a result this version cannot read stays as it is, on this device only
    if (made.changed) device.set(key, { ...kept, doc: made.doc });
    docs.push(made.doc);
  }
  return docs;
}

// Checklist results a merge chose (calc's `put.checks`) kept where the checklist view reads them.
export function keepChecklistDocs(docs) {
  for (const doc of docs || []) {
    const marks = Object.fromEntries(Object.entries(doc.marks || {}).filter(([, v]) => v !== "not-done"));
    device.set(PREFIX + doc.id, doc.deleted ? { doc } : { states: marks, notes: doc.notes || {}, note: doc.note || "", doc });
  }
}
