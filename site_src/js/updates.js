// New builds: registers the service worker (sw.js: the whole build cached, offline after the
// first visit) and, when a new build has been cached whole, offers it. The offer's one button
// tells the waiting worker to take over; the page reloads once it has.
//
// Whether this phone can open the app with no network is said in the header, and only said
// once the worker confirms that its cache holds every file of the build; it is asked again at
// each start and each time the page comes back into view. Missing files (a cleared cache) are
// fetched again at once when the network is there, else as soon as it is back.
const OFFLINE_CACHE_LATEST_MS = 20000;

function showOffline(state, text) {
  const line = document.getElementById("offline-status");
  line.dataset.offline = state;
  line.textContent = text;
}

const failedWords = (why) => "Not saved for offline use: " + (/quota/i.test(why || "")
  ? "the phone's storage for this app is full. Free some space; the app needs the network until then"
  : "a file could not be fetched (" + (why || "the download stopped") + "). It is tried again when the network is back");

function watchOffline(registration) {
  const ask = (what) => registration.active?.postMessage(what);
  navigator.serviceWorker.addEventListener("message", (event) => {
    const m = event.data || {};
    if (m.type === "offline-failed") {
      // A new build that could not be cached leaves the one in use as it was: ask about that.
      if (registration.active) ask("offline-check"); else showOffline("failed", failedWords(m.reason));
    } else if (m.type === "offline-state") {
      if (!m.missing) showOffline("ready", "Works offline");
      else if (m.reason) showOffline("failed", failedWords(m.reason));
      else {
        showOffline("missing", `Not ready for offline use: ${m.missing} of its ${m.files} files are missing`
          + (navigator.onLine ? ", fetching them again…" : "; they are fetched again when the network is back"));
        if (navigator.onLine) ask("offline-repair");
      }
    }
  });
  const installing = registration.installing;
  installing?.addEventListener("statechange", () => {
    if (installing.state === "redundant" && !registration.active
        && document.getElementById("offline-status").dataset.offline !== "failed") showOffline("failed", failedWords(""));
  });
  if (registration.active) ask("offline-check");
  else {
    showOffline("saving", "Saving for offline use…");
    navigator.serviceWorker.ready.then(() => ask("offline-check"));
  }
  window.addEventListener("online", () => {
    if (registration.active) ask("offline-repair"); else registration.update().catch(() => {});
  });
  document.addEventListener("visibilitychange", () => { if (!document.hidden) ask("offline-check"); });
}

async function register() {
  if (!("serviceWorker" in navigator)) {
    showOffline("none", "This browser cannot keep the app for offline use: it needs the network");
    return;
  }
  const registration = await navigator.serviceWorker.register("sw.js");
  watchOffline(registration);
  const banner = document.getElementById("update-banner");
  let requested = false;
  document.getElementById("update-apply").addEventListener("click", () => {
    requested = true;
    registration.waiting?.postMessage("activate-new-build");
  });
  const offer = () => { banner.hidden = false; };
  if (registration.waiting && navigator.serviceWorker.controller) offer();
  registration.addEventListener("updatefound", () => {
    const incoming = registration.installing;
    incoming?.addEventListener("statechange", () => {
      if (incoming.state === "installed" && navigator.serviceWorker.controller) offer();
    });
  });
  let reloading = false;
  navigator.serviceWorker.addEventListener("controllerchange", () => {
    if (requested && !reloading && navigator.serviceWorker.controller) { reloading = true; location.reload(); }
  });
}

// The offline cache is filled once the calculator has booted (its files are then in the HTTP
// cache and revalidate cheaply), or after a while if it never does.
export function startUpdates(calculatorReady) {
  let registering = null;
  const once = () => {
    registering ??= register().catch((err) => {
      console.warn("offline cache unavailable:", err);
      showOffline("failed", failedWords(String(err && err.message)));
    });
  };
  calculatorReady.then(once);
  setTimeout(once, OFFLINE_CACHE_LATEST_MS);
}
