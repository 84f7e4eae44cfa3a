// The log: saved results, kept in IndexedDB on this device. Survives reloads, offline use
// and new builds (the database is not part of the service worker's cache).
const DB_NAME = "sumpside";
const STORE = "entries";

function open() {
  return new Promise((resolve, reject) => {
    const request = indexedDB.open(DB_NAME, 1);
    request.onupgradeneeded = () => {
      const store = request.result.createObjectStore(STORE, { keyPath: "id", autoIncrement: true });
      store.createIndex("at", "at");
    };
    request.onsuccess = () => resolve(request.result);
    request.onerror = () => reject(request.error);
  });
}

async function withStore(mode, work) {
  const db = await open();
  return new Promise((resolve, reject) => {
    const tx = db.transaction(STORE, mode);
    const result = work(tx.objectStore(STORE));
    tx.oncomplete = () => { db.close(); resolve(result && "result" in result ? result.result : result); };
    tx.onerror = () => { db.close(); reject(tx.error); };
  });
}

export const addEntry = (entry) => withStore("readwrite", (s) => s.add(entry));
export const deleteEntry = (id) => withStore("readwrite", (s) => s.delete(id));
export const allEntries = () => withStore("readonly", (s) => s.getAll());

export async function importEntries(list) {
  if (!Array.isArray(list)) throw new Error("the file is not a Sumpside log export");
  const known = new Set((await allEntries()).map((e) => e.at + "|" + e.tool + "|" + e.machine));
  let added = 0;
  await withStore("readwrite", (store) => {
    for (const raw of list) {
      if (!raw || typeof raw.tool !== "string" || typeof raw.at !== "string") continue;
      const key = raw.at + "|" + raw.tool + "|" + (raw.machine || "");
      if (known.has(key)) continue;
      const { id, ...entry } = raw;
      store.add({ machine: "", title: raw.tool, text: {}, inputs: {}, verdicts: [], ...entry });
      known.add(key);
      added += 1;
    }
  });
  return added;
}

const csvCell = (value) => {
  const text = value == null ? "" : String(value);
  return /[",\n;]/.test(text) ? '"' + text.replace(/"/g, '""') + '"' : text;
};

export function toCsv(entries) {
  const rows = [["date", "machine", "tool", "level", "output", "value"]];
  for (const e of entries) {
    for (const [key, value] of Object.entries(e.text || {})) {
      rows.push([e.at, e.machine, e.tool, e.level, key, value]);
    }
  }
  return rows.map((r) => r.map(csvCell).join(",")).join("\r\n") + "\r\n";
}
