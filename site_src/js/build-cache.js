// The worker's reads of this build's large files, straight from the service worker's cache.
//
// A response the service worker answers from its cache is piped through that worker to the
// one that asked; read from CacheStorage here, the same bytes arrive without that hop. For the
// 12 MB snapshot that is the difference between about 90 ms and 30 ms on an idle page, and
// more while the wasm compiles beside it. Only this build's cache is read, by its name
// (sw.js: "sumpside-" and the build id the page hands over in the worker's address), and
// what it holds was checked against its hash before it was stored. No cache, no such file in
// it (a first visit, a cache cleared by the phone), no CacheStorage: the usual fetch, through
// the service worker or the network.
const build = new URL(self.location.href).searchParams.get("build");
const cacheName = build ? "sumpside-" + build : null;

export async function buildFile(url) {
  if (cacheName && self.caches) {
    try {
      // CacheStorage.match with a cacheName never creates the cache (open would).
      const hit = await caches.match(url, { cacheName });
      if (hit) return hit;
    } catch {
      // an unreadable cache (storage failing): the service worker or the network answers
    }
  }
  return fetch(url);
}
