// Sync with the plant's database (off by default). Once the user turns it on and names the
// database's path, this phone's records (machines, readings, checklist results, deletion markers
// too) replicate both ways with a CouchDB-protocol database served under the app's own origin
// (the plant's reverse proxy: the page's Content-Security-Policy allows no other), whenever the
// network is there. Nothing is sent, and the library is not even loaded, before that.
//
// PouchDB does the replication: a database on this phone mirrors the plant's, and replication's
// checkpoints let a sync that was cut go on where it stopped. calc decides what the documents
// mean (calc.machines.database): every version the database holds of what changed goes through
// the kit's merge, as a file does (a card edited on two phones is kept both ways to settle), and
// what this phone then holds is written back over them. One round:
//   1. pull the plant's changes into the mirror;
//   2. merge every version of each document that changed since the last round into the kit;
//   3. write the kit's records that the mirror lacks or holds at another revision;
//   4. push the mirror to the plant.
import { databaseWrites, localStamp, mergeLeaves, onKitChange, problemWords } from "./kit.js";
import { checklistDocs, keepChecklistDocs } from "./check-docs.js";
import { device } from "./store.js";

const SETTINGS = "sumpside.sync"; // {on, path, seq: {<path>: last change merged}, last, said, failed, problem}
// A path on this origin: a slash, then the characters CouchDB names and a proxy's path take.
const PATH = /^\/(?!\/)[A-Za-z0-9._~$()+\-/]{1,199}$/;
const BATCH = 200;
const CHANGES_PAGE = 2000;
const AFTER_CHANGE_MS = 15000;
const EVERY_MS = 5 * 60 * 1000;

const settings = () => ({ seq: {}, ...device.get(SETTINGS, {}) });
const keep = (changes) => device.set(SETTINGS, { ...settings(), ...changes });
const part = (name) => document.querySelector(`[data-sync="${name}"]`);

// The path typed, checked: a path on this app's own server, never another address.
export function checkedPath(text) {
  const path = String(text || "").trim();
  if (!path) return { problem: "Type the database's path on this server, as the plant's IT gave it (like /db/sumpside)." };
  if (/^[a-z][a-z0-9+.-]*:/i.test(path) || path.startsWith("//")) {
    return { problem: "Only a path on this app's own server is allowed (like /db/sumpside), not another address: the plant's proxy serves the database beside the app." };
  }
  if (!PATH.test(path) || path.split("/").includes("..")) {
    return { problem: "A path starts with / and holds letters, digits and . _ ~ $ ( ) + - / only (like /db/sumpside)." };
  }
  return { path: path.replace(/\/+$/, "") };
}

let library = null;
function pouchdb() {
  library ||= new Promise((resolve, reject) => {
    const script = Object.assign(document.createElement("script"), { src: "js/vendor/pouchdb.min.js" });
    script.onload = () => (globalThis.PouchDB ? resolve(globalThis.PouchDB) : reject(new Error("the sync library did not start")));
    script.onerror = () => { library = null; script.remove(); reject(new Error("the sync library is not on this phone: open the app once with the network")); };
    document.head.append(script);
  });
  return library;
}

// Every version the mirror holds of each document changed since the last round, merged into
// the kit, a page at a time; the place reached is kept after each page, so a cut round goes on
// from there. Resolves with what the merges said.
async function takeChanges(mirror, path) {
  const said = [];
  let since = settings().seq[path] || 0;
  for (;;) {
    const page = await mirror.changes({ since, limit: CHANGES_PAGE, include_docs: true, conflicts: true });
    if (!page.results.length) break;
    // Each version as its JSON text: calc reads them one by one, so that one document too deep or
    // too long is refused alone and never stops the rest.
    const leaves = [];
    for (const row of page.results) {
      if (!row.doc || row.deleted) continue;
      leaves.push(JSON.stringify(row.doc));
      if (Array.isArray(row.doc._conflicts) && row.doc._conflicts.length) {
        for (const other of await mirror.get(row.id, { open_revs: row.doc._conflicts })) if (other.ok) leaves.push(JSON.stringify(other.ok));
      }
    }
    if (leaves.length) {
      const merged = await mergeLeaves(leaves, await checklistDocs());
      keepChecklistDocs(merged.put.checks);
      if (merged.message !== "nothing new") said.push(merged.message + (merged.reasons.length ? ` (${merged.reasons.slice(0, 2).join("; ")})` : ""));
      if (merged.open_conflicts) said.push(`${merged.open_conflicts} card(s) changed on two phones: open the machine to choose`);
    }
    since = page.last_seq;
    keep({ seq: { ...settings().seq, [path]: since } });
  }
  return said;
}

// The kit's records written into the mirror where it lacks them or holds another revision,
// the mirror's other versions of them closed (calc's database-writes).
async function writeBack(mirror) {
  const all = await mirror.allDocs({ include_docs: true, conflicts: true });
  const heads = all.rows.filter((row) => row.doc).map(({ doc }) => ({
    _id: doc._id, _rev: doc._rev, rev: typeof doc.rev === "string" ? doc.rev : null,
    sides: Array.isArray(doc.conflicts) ? doc.conflicts.map((s) => (s && typeof s.rev === "string" ? s.rev : "?")) : [],
    _conflicts: Array.isArray(doc._conflicts) ? doc._conflicts : [],
  }));
  const made = await databaseWrites(heads, await checklistDocs());
  if (!made.docs.length) return 0;
  const refused = (await mirror.bulkDocs(made.docs)).filter((r) => r.error);
  if (refused.length) throw new Error(`${refused.length} record(s) were not written to this phone's copy of the database (${refused[0].message || refused[0].name}); the next sync tries again`);
  return made.docs.length - made.closed;
}

let running = null;
let queued = null;
const mirrors = {};

async function round() {
  const { on, path } = settings();
  if (!on || !path) return;
  if (!navigator.onLine) { keep({ problem: "no network: sync goes on when the network is back", failed: localStamp() }); return; }
  show("Syncing with the plant's database…");
  try {
    const PouchDB = await pouchdb();
    const remote = new PouchDB(new URL(path, location.origin).href);
    // The mirror is named after the database it mirrors: another path, another mirror.
    const mirror = mirrors[path] ||= new PouchDB("sumpside-sync:" + path, { auto_compaction: true });
    await mirror.replicate.from(remote, { batch_size: BATCH });
    const said = await takeChanges(mirror, path);
    const sent = await writeBack(mirror);
    await mirror.replicate.to(remote, { batch_size: BATCH });
    keep({ last: localStamp(), said: said.join("; ") || "nothing new", sent, problem: null, failed: null });
  } catch (err) {
    keep({ problem: reasonOf(err), failed: localStamp() });
  }
}

function reasonOf(err) {
  const status = err && (err.status || err.statusCode);
  if (status === 401 || status === 403) return "the database refused this phone (ask the plant's IT for access)";
  if (status === 404) return "there is no database at this path";
  if (err && (err.name === "TypeError" || err.message === "Failed to fetch" || status === 0 || status >= 500)) {
    return "the database could not be reached";
  }
  return problemWords(err);
}

// One round now, as "Sync now" asks; rounds never overlap, in this tab or another. Asked
// while one is under way (which may have read this phone's records before the latest
// change), one more round follows it: one, however often it is asked meanwhile. A round
// that starts makes a pending timed one needless.
export function syncNow() {
  if (running) {
    const next = () => { queued = null; return syncNow(); };
    queued ||= running.then(next, next);
    return queued;
  }
  clearTimeout(soon);
  const go = () => round();
  running = (navigator.locks ? navigator.locks.request("sumpside-sync", go) : go())
    .finally(() => { running = null; show(); });
  return running;
}

const when = (stamp) => {
  const at = new Date(stamp);
  return at.toDateString() === new Date().toDateString() ? "today at " + at.toLocaleTimeString([], { hour: "2-digit", minute: "2-digit" })
    : at.toLocaleString([], { dateStyle: "medium", timeStyle: "short" });
};

function show(doing = null) {
  const s = settings();
  const status = part("status");
  part("now").disabled = !s.on;
  if (doing) { status.textContent = doing; return; }
  if (!s.on) { status.textContent = s.last ? `Sync is off: nothing is sent. Last synced ${when(s.last)}.` : "Sync is off: nothing is sent."; return; }
  const sent = s.sent ? `; ${s.sent} record${s.sent === 1 ? "" : "s"} of this phone sent` : "";
  const last = s.last ? `Last synced ${when(s.last)}: ${s.said}${sent}.` : "Not synced yet.";
  status.textContent = s.problem ? `${last} The last try, ${when(s.failed)}, stopped: ${s.problem}. It goes on from where it stopped at the next try.` : last;
}

let soon = 0;
function later(ms) {
  clearTimeout(soon);
  // A timed round is not asked for while one is under way: that one covers it.
  soon = setTimeout(() => { if (!running && settings().on && document.visibilityState === "visible") syncNow(); }, ms);
}

export function startSync(ready) {
  const s = settings();
  part("path").value = s.path || "";
  part("on").checked = Boolean(s.on && s.path);
  const turn = () => {
    const error = part("path-error");
    const input = part("path");
    if (!part("on").checked) { keep({ on: false }); error.hidden = true; input.removeAttribute("aria-invalid"); show(); return; }
    const checked = checkedPath(input.value);
    error.hidden = !checked.problem;
    error.textContent = checked.problem || "";
    if (checked.problem) {
      input.setAttribute("aria-invalid", "true");
      part("on").checked = false;
      keep({ on: false });
      input.focus();
      show();
      return;
    }
    input.removeAttribute("aria-invalid");
    input.value = checked.path;
    keep({ on: true, path: checked.path });
    ready.then(syncNow);
  };
  part("on").addEventListener("change", turn);
  part("path").addEventListener("change", () => { if (part("on").checked) turn(); });
  part("now").addEventListener("click", () => ready.then(syncNow));
  window.addEventListener("online", () => later(1000));
  document.addEventListener("visibilitychange", () => { if (document.visibilityState === "visible") later(1000); });
  // A change made on this phone goes out a little later (one round for a burst of readings);
  // the rounds' own changes do not ask for another.
  onKitChange(() => { if (!running) later(AFTER_CHANGE_MS); });
  setInterval(() => later(0), EVERY_MS);
  show();
  if (s.on && s.path) ready.then(syncNow);
}
