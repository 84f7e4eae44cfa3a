// The device's database (IndexedDB "sumpside"): machines, their readings and the digests
// calc keeps of them, plus the log of earlier builds. It survives reloads, offline use and
// new builds (the service worker's cache does not hold it).
//
// Version 1 had one store, "entries" (the log of display text). Version 2 adds:
//   machines  {id, card, updated, demo?}          calc's machine records
//   readings  {id, machine, tool, inputs, ... at} calc's reading records; `at` (ms since
//             1970) is added here to index them by time, whatever their offset
//   digests   {machine, count, last, readings}    calc's digest of each machine's readings
//   meta      {key, ...}                          what this device has done once (migration)
// The old store stays: the migration (js/kit.js) copies from it and never deletes it.
const NAME = "sumpside";
const VERSION = 2;

let opened = null;

function upgrade(db) {
  if (!db.objectStoreNames.contains("entries")) {
    db.createObjectStore("entries", { keyPath: "id", autoIncrement: true }).createIndex("at", "at");
  }
  if (!db.objectStoreNames.contains("machines")) db.createObjectStore("machines", { keyPath: "id" });
  if (!db.objectStoreNames.contains("readings")) {
    const readings = db.createObjectStore("readings", { keyPath: "id" });
    readings.createIndex("machine", "machine");
    readings.createIndex("at", "at");
  }
  if (!db.objectStoreNames.contains("digests")) db.createObjectStore("digests", { keyPath: "machine" });
  if (!db.objectStoreNames.contains("meta")) db.createObjectStore("meta", { keyPath: "key" });
}

function open() {
  if (opened) return opened;
  opened = new Promise((resolve, reject) => {
    const request = indexedDB.open(NAME, VERSION);
    request.onupgradeneeded = () => upgrade(request.result);
    request.onsuccess = () => {
      const db = request.result;
      // Another tab with a newer build wants to upgrade: step aside, open again when asked.
      db.onversionchange = () => { db.close(); opened = null; };
      resolve(db);
    };
    request.onerror = () => { opened = null; reject(request.error); };
    request.onblocked = () => console.warn("database upgrade waits for another Sumpside tab to close");
  });
  return opened;
}

const done = (request) => new Promise((resolve, reject) => {
  request.onsuccess = () => resolve(request.result);
  request.onerror = () => reject(request.error);
});

// Run `work(stores)` in one transaction over `names`; resolves with what `work` returned
// (awaited) once the transaction has committed, so a write is on disk when this resolves.
export async function transact(names, mode, work) {
  const db = await open();
  const tx = db.transaction(names, mode);
  const stores = Object.fromEntries(names.map((n) => [n, tx.objectStore(n)]));
  const committed = new Promise((resolve, reject) => {
    tx.oncomplete = resolve;
    tx.onerror = () => reject(tx.error);
    tx.onabort = () => reject(tx.error || new Error("the database refused the change"));
  });
  const result = await work(stores, done);
  await committed;
  return result;
}

export const getAll = (name, index, key) => transact([name], "readonly",
  (s) => done(index ? s[name].index(index).getAll(key) : s[name].getAll()));
export const getOne = (name, key) => transact([name], "readonly", (s) => done(s[name].get(key)));
export const count = (name) => transact([name], "readonly", (s) => done(s[name].count()));

// The newest `limit` readings from the `skip`-th on, newest first, by the "at" index.
export function newestReadings(skip, limit) {
  return transact(["readings"], "readonly", (s) => new Promise((resolve, reject) => {
    const found = [];
    let skipped = false;
    const request = s.readings.index("at").openCursor(null, "prev");
    request.onerror = () => reject(request.error);
    request.onsuccess = () => {
      const cursor = request.result;
      if (!cursor || found.length >= limit) { resolve(found); return; }
      if (skip && !skipped) { skipped = true; cursor.advance(skip); return; }
      found.push(cursor.value);
      cursor.continue();
    };
  }));
}
