// Service worker: every file of the build in one cache per build, offline after the first
// visit. build.py fills in BUILD and PRECACHE: each file's URL and the sha256 of its bytes, as
// a subresource-integrity string.
//
// A new build costs only what changed: its worker copies each file whose hash an older
// build's cache already holds and fetches the others, which the browser checks against their
// hash (fetch's integrity option) before anything is stored. The new build is installed only
// when every file is in place; a refused, failed or partial download leaves the old build
// serving, whole (what did arrive, checked, is kept for the next try). It takes over only
// when the page asks (the user tapped "Use it now"); then the other caches are deleted.
// Requests to other origins are never made or answered here.
//
// The page asks at each start whether this build's cache still holds every file ("offline
// check": the phone or the user may have cleared it) and, when some are missing and the
// network is there, has them fetched again ("offline repair"). It is told when an install
// fails (a full disk), so that it never claims to work offline when it does not.
const BUILD = "__BUILD_ID__";
const PRECACHE = [/* __PRECACHE__ */];
const PREFIX = "sumpside-";
const CACHE = PREFIX + BUILD;
// Each cached response carries the hash it was checked against, so a later build can tell
// whether it may reuse it.
const INTEGRITY = "x-sumpside-integrity";

async function holding(cache, entry) {
  const hit = await cache.match(entry.url);
  return hit && hit.headers.get(INTEGRITY) === entry.integrity ? hit : null;
}

function checkedFetch(entry, mode) {
  return fetch(new Request(entry.url, { cache: mode, integrity: entry.integrity })).then((response) => {
    if (!response.ok) throw new Error(`${entry.url}: HTTP ${response.status}`);
    return response;
  });
}

async function download(entry) {
  // no-cache revalidates with the server, so a file the page has just loaded comes back as a
  // small 304 and a changed one in full. Should the browser's HTTP cache still hold other
  // bytes under a date the server confirms, the check refuses them: ask once more, past it.
  const response = await checkedFetch(entry, "no-cache").catch(() => checkedFetch(entry, "reload"));
  const headers = new Headers(response.headers);
  // The cache holds the decoded bytes: the wire's encoding and length no longer apply.
  headers.delete("content-encoding");
  headers.delete("content-length");
  headers.set(INTEGRITY, entry.integrity);
  return new Response(await response.blob(), { status: 200, statusText: "OK", headers });
}

// Every file of this build into its cache: kept where it is already, copied from an older
// build's cache where that holds the same bytes, else downloaded and checked.
async function fillCache() {
  const older = await Promise.all((await caches.keys())
    .filter((name) => name.startsWith(PREFIX) && name !== CACHE).map((name) => caches.open(name)));
  const cache = await caches.open(CACHE);
  await Promise.all(PRECACHE.map(async (entry) => {
    if (await holding(cache, entry)) return;
    for (const old of older) {
      const copy = await holding(old, entry);
      if (copy) return cache.put(entry.url, copy);
    }
    return cache.put(entry.url, await download(entry));
  }));
}

// How many of this build's files its cache lacks (0: the whole build works offline).
async function lacking() {
  const cache = await caches.open(CACHE);
  const held = await Promise.all(PRECACHE.map((entry) => holding(cache, entry)));
  return held.filter((hit) => !hit).length;
}

const reason = (err) => `${(err && err.name) || "Error"}: ${(err && err.message) || err}`;

async function tell(message, client = null) {
  const to = client ? [client] : await self.clients.matchAll({ includeUncontrolled: true, type: "window" });
  for (const c of to) c.postMessage({ build: BUILD, files: PRECACHE.length, ...message });
}

self.addEventListener("install", (event) => {
  event.waitUntil(fillCache().catch(async (err) => {
    await tell({ type: "offline-failed", reason: reason(err) });
    throw err;
  }));
});

self.addEventListener("activate", (event) => {
  event.waitUntil((async () => {
    const names = await caches.keys();
    await Promise.all(names.filter((n) => n.startsWith(PREFIX) && n !== CACHE)
      .map((n) => caches.delete(n)));
    await self.clients.claim();
  })());
});

self.addEventListener("message", (event) => {
  if (event.data === "activate-new-build") self.skipWaiting();
  if (event.data === "offline-check" || event.data === "offline-repair") {
    event.waitUntil((async () => {
      let failed = null;
      if (event.data === "offline-repair") await fillCache().catch((err) => { failed = reason(err); });
      await tell({ type: "offline-state", missing: await lacking(), reason: failed }, event.source);
    })());
  }
});

self.addEventListener("fetch", (event) => {
  const request = event.request;
  const url = new URL(request.url);
  if (request.method !== "GET" || url.origin !== self.location.origin) return;
  event.respondWith((async () => {
    const cache = await caches.open(CACHE);
    const hit = await cache.match(request, { ignoreSearch: true });
    if (hit) return hit;
    if (request.mode === "navigate") {
      const page = await cache.match("index.html");
      if (page) return page;
    }
    return fetch(request);
  })());
});
