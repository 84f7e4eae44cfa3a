// Service worker: the whole build under one versioned cache, offline after the first visit.
// build.py fills in BUILD and PRECACHE. A new build is cached whole while the old one keeps
// serving; it takes over only when the page asks (the user tapped "Use it now") and then
// the old caches are deleted. Requests to other origins are never made or answered here.
const BUILD = "__BUILD_ID__";
const PRECACHE = [/* __PRECACHE__ */];
const CACHE = "sumpside-" + BUILD;

self.addEventListener("install", (event) => {
  event.waitUntil((async () => {
    const cache = await caches.open(CACHE);
    // cache: "no-cache" revalidates every file with the server, so a new build never mixes in
    // old files, while a file the page has just loaded comes back as a small 304.
    await cache.addAll(PRECACHE.map((url) => new Request(url, { cache: "no-cache" })));
  })());
});

self.addEventListener("activate", (event) => {
  event.waitUntil((async () => {
    const names = await caches.keys();
    await Promise.all(names.filter((n) => n.startsWith("sumpside-") && n !== CACHE)
      .map((n) => caches.delete(n)));
    await self.clients.claim();
  })());
});

self.addEventListener("message", (event) => {
  if (event.data === "activate-new-build") self.skipWaiting();
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
