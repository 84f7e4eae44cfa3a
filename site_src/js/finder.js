// The home page's search and its "used lately" list. The index is the build's own (each menu
// item's data-words: its title, summary, fields and help), so it works offline; a tool is
// found when every word typed begins one of its words.
import { device } from "./store.js";

const RECENT = "sumpside.recent";
const RECENT_MAX = 5;
const home = document.querySelector('[data-view="home"]');

const itemOf = (id) => home.querySelector(`.menu:not([data-recent-list]) a[href="#/tool/${CSS.escape(id)}"]`)?.closest("li");

function find(query) {
  const wanted = query.toLowerCase().split(/[^\p{L}\p{N}°µ]+/u).filter(Boolean);
  let found = 0;
  for (const li of home.querySelectorAll(".menu:not([data-recent-list]) li[data-words]")) {
    const own = li.dataset.words.split(" ");
    const hit = wanted.every((w) => own.some((o) => o.startsWith(w)));
    li.hidden = !hit;
    if (hit) found += 1;
  }
  for (const head of home.querySelectorAll("[data-topic-head]")) {
    const list = head.nextElementSibling;
    head.hidden = list.querySelectorAll("li:not([hidden])").length === 0;
  }
  home.querySelector("[data-find-count]").textContent = wanted.length
    ? (found ? `${found} found` : "Nothing found: try another word (water, foam, tank, pump, cold).") : "";
}

function showRecent() {
  const ids = device.get(RECENT, []).filter(itemOf);
  const list = home.querySelector("[data-recent-list]");
  list.replaceChildren(...ids.map((id) => { const li = itemOf(id).cloneNode(true); li.hidden = false; return li; }));
  home.querySelector("[data-recent]").hidden = ids.length === 0;
}

// A tool or checklist opened: first in the list next time.
export function used(id) {
  if (!itemOf(id)) return;
  device.set(RECENT, [id, ...device.get(RECENT, []).filter((x) => x !== id)].slice(0, RECENT_MAX));
  showRecent();
}

export function startFinder() {
  const box = home.querySelector("[data-find]");
  box.addEventListener("input", () => find(box.value));
  showRecent();
}
