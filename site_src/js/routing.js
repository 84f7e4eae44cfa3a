// Views and the address: "#/<name>" shows the one <section data-view="<name>"> (every tool and
// checklist is "tool/<id>"); an unknown or empty address shows home.
const views = new Map([...document.querySelectorAll("[data-view]")].map((v) => [v.dataset.view, v]));
let shown = null;

export const shownView = () => shown;

// `onShow(view)` runs each time a view is shown, the first one included.
export function startRouting(onShow) {
  const route = () => {
    const wanted = decodeURIComponent(location.hash.replace(/^#\/?/, "")) || "home";
    shown = views.get(wanted) || views.get("home");
    for (const v of views.values()) v.hidden = v !== shown;
    const heading = shown.querySelector("h1");
    document.title = (heading && shown.dataset.view !== "home" ? heading.textContent + " · " : "") + "Sumpside";
    window.scrollTo(0, 0);
    onShow(shown);
  };
  window.addEventListener("hashchange", route);
  route();
}
