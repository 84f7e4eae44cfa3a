// Views and the address: "#/<name>" shows the one <section data-view="<name>"> (every tool and
// checklist is "tool/<id>"); "#/<name>/<rest>" shows the view <name> for <rest> when no view
// has the whole name (a machine's page is "machine/<id>", its card "card/<id>", a visit
// "visit/<id>/<day>"); an unknown or empty address shows home.
const views = new Map([...document.querySelectorAll("[data-view]")].map((v) => [v.dataset.view, v]));
let shown = null;

export const shownView = () => shown;

export function go(address) {
  if (location.hash === address) window.dispatchEvent(new HashChangeEvent("hashchange"));
  else location.hash = address;
}

function find(wanted) {
  if (views.has(wanted)) return [views.get(wanted), ""];
  const cut = wanted.indexOf("/");
  if (cut > 0 && views.has(wanted.slice(0, cut)) && !wanted.startsWith("tool/")) {
    return [views.get(wanted.slice(0, cut)), wanted.slice(cut + 1)];
  }
  return [views.get("home"), ""];
}

// `onShow(view, param)` runs each time a view is shown, the first one included.
export function startRouting(onShow) {
  const route = () => {
    let wanted = "home", garbled = false;
    try { wanted = decodeURIComponent(location.hash.replace(/^#\/?/, "")) || "home"; } catch { garbled = true; }
    const [view, param] = find(wanted);
    const note = document.querySelector("[data-route-note]");
    const lost = garbled || (view.dataset.view === "home" && wanted !== "home");
    if (note) {
      note.hidden = !lost;
      note.textContent = lost ? "That address is not one of this app's pages, so here is the start page." : "";
    }
    shown = view;
    shown.dataset.param = param;
    for (const v of views.values()) v.hidden = v !== shown;
    const heading = shown.querySelector("h1");
    document.title = (heading && shown.dataset.view !== "home" ? heading.textContent + " · " : "") + "Sumpside";
    window.scrollTo(0, 0);
    onShow(shown, param);
  };
  window.addEventListener("hashchange", route);
  route();
}
