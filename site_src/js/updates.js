// New builds: registers the service worker (sw.js: the whole build cached, offline after the
// first visit) and, when a new build has been cached whole, offers it. The offer's one button
// tells the waiting worker to take over; the page reloads once it has.
const OFFLINE_CACHE_LATEST_MS = 20000;

async function register() {
  if (!("serviceWorker" in navigator)) return;
  const registration = await navigator.serviceWorker.register("sw.js");
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
    registering ??= register().catch((err) => console.warn("offline cache unavailable:", err));
  };
  calculatorReady.then(once);
  setTimeout(once, OFFLINE_CACHE_LATEST_MS);
}
