// The page: routes between views, binds the registry-generated forms to the calculator,
// shows answers and errors, keeps the log and the unit choice, offers new builds.
// No formula lives here: every number comes from calc through the worker.
import { startCalculator } from "./calc-client.js";
import { addEntry, allEntries, deleteEntry, importEntries, toCsv } from "./log.js";

const DEBOUNCE_MS = 250;
const LEVEL_WORD = { ok: "OK", watch: "Watch", act: "Act" };
const root = document.documentElement;
const statusLine = document.getElementById("boot-status");
const store = {
  get: (key, fallback) => { try { return JSON.parse(localStorage.getItem(key)) ?? fallback; } catch { return fallback; } },
  set: (key, value) => { try { localStorage.setItem(key, JSON.stringify(value)); } catch { /* private mode */ } },
};
const session = {
  get: (key, fallback) => { try { return JSON.parse(sessionStorage.getItem(key)) ?? fallback; } catch { return fallback; } },
  set: (key, value) => { try { sessionStorage.setItem(key, JSON.stringify(value)); } catch { /* private mode */ } },
};

let units = store.get("sumpside.units", "metric");
const lastAnswers = new Map(); // form -> last ok answer

// ---- calculator -------------------------------------------------------------------------
const calculator = startCalculator((msg) => {
  statusLine.dataset.state = msg.state;
  if (msg.state === "ready") {
    statusLine.textContent = msg.note ? "Calculator ready (started the slow way: " + msg.note + ")" : "Calculator ready";
    statusLine.title = `started in ${msg.ms} ms (${msg.mode})` + (msg.checkMs != null ? `, self-check ${msg.checkMs} ms` : "")
      + (msg.note ? ": " + msg.note : "");
    root.dataset.ready = msg.mode || "normal";
    computeVisible();
  } else {
    statusLine.textContent = msg.text;
  }
});

// ---- views ------------------------------------------------------------------------------
const views = new Map([...document.querySelectorAll("[data-view]")].map((v) => [v.dataset.view, v]));

function route() {
  const wanted = decodeURIComponent(location.hash.replace(/^#\/?/, "")) || "home";
  const view = views.get(wanted) || views.get("home");
  for (const v of views.values()) v.hidden = v !== view;
  const heading = view.querySelector("h1");
  document.title = (heading && view.dataset.view !== "home" ? heading.textContent + " · " : "") + "Sumpside";
  if (view.dataset.view === "log") renderLog();
  if (view.classList.contains("tool")) showBackLink(view);
  if (view.classList.contains("checklist")) showReadings(view);
  window.scrollTo(0, 0);
  computeVisible();
}

function computeVisible() {
  if (!root.dataset.ready) return;
  for (const form of document.querySelectorAll(".view:not([hidden]) form[data-tool]")) compute(form);
}

// ---- forms ------------------------------------------------------------------------------
function readInputs(form) {
  const inputs = {};
  for (const el of form.querySelectorAll("input[name], select[name]")) {
    if (el.type === "checkbox") inputs[el.name] = el.checked ? "yes" : "no";
    else inputs[el.name] = el.value;
  }
  return inputs;
}

async function compute(form) {
  const seq = (Number(form.dataset.seq) || 0) + 1;
  form.dataset.seq = String(seq);
  const state = form.querySelector("[data-state]");
  if (!root.dataset.ready) { state.textContent = "The calculator is starting; your answer follows."; }
  const answer = await calculator.run(form.dataset.tool, readInputs(form), units);
  if (form.dataset.seq !== String(seq)) return; // a newer request is on its way
  show(form, answer);
}

function clearErrors(form) {
  for (const p of form.querySelectorAll("[data-error-for]")) { p.hidden = true; p.textContent = ""; }
  for (const el of form.querySelectorAll("[aria-invalid]")) el.removeAttribute("aria-invalid");
}

function show(form, answer) {
  const state = form.querySelector("[data-state]");
  clearErrors(form);
  form.dataset.level = answer.ok ? answer.level : "error";
  if (!answer.ok) {
    const loose = [];
    for (const err of answer.errors) {
      const slot = form.querySelector(`[data-error-for="${CSS.escape(err.field)}"]`);
      const input = form.querySelector(`[name="${CSS.escape(err.field)}"]`);
      if (slot) { slot.textContent = err.message; slot.hidden = false; } else loose.push(err.message);
      if (input) input.setAttribute("aria-invalid", "true");
    }
    state.textContent = loose.length ? loose.join(" ") : "Check the marked field" + (answer.errors.length > 1 ? "s." : ".");
    state.dataset.kind = "error";
    return;
  }
  delete state.dataset.kind;
  state.textContent = "";
  lastAnswers.set(form, answer);
  for (const dd of form.querySelectorAll("[data-out]")) dd.textContent = answer.text[dd.dataset.out] ?? "–";
  fillList(form.querySelector("[data-verdicts]"), answer.verdicts, (li, v) => {
    li.className = "verdict level-" + v.level;
    const badge = document.createElement("span");
    badge.className = "badge";
    badge.textContent = LEVEL_WORD[v.level];
    const basis = document.createElement("span");
    basis.className = "basis";
    basis.textContent = " (" + v.basis + ")";
    li.append(badge, " " + v.message, basis);
  });
  fillList(form.querySelector("[data-notes]"), answer.notes, (li, n) => { li.textContent = n; });
  form.querySelector("[data-sources]").textContent = answer.sources.length ? "Sources: " + answer.sources.join("; ") : "";
  const chart = form.querySelector("[data-chart]");
  const svg = Object.values(answer.charts || {})[0];
  chart.innerHTML = svg || ""; // drawn by calc: presentation attributes only, no script
  if (answer.ranked && form.closest(".checklist")) showRanking(form.closest(".checklist"), form, answer);
  rememberReading(form.dataset.tool, answer);
}

function fillList(list, items, fill) {
  list.replaceChildren(...items.map((item) => { const li = document.createElement("li"); fill(li, item); return li; }));
}

// What was typed is kept on the device, so a reload, a killed tab or a new build loses nothing.
const formKey = (form) => "sumpside.form." + form.dataset.tool;

function keepForm(form) {
  store.set(formKey(form), { units, inputs: readInputs(form) });
}

function restoreForm(form) {
  const kept = store.get(formKey(form), null);
  if (!kept || kept.units !== units) return;
  for (const [name, value] of Object.entries(kept.inputs || {})) {
    const el = form.querySelector(`[name="${CSS.escape(name)}"]`);
    if (!el) continue;
    if (el.type === "checkbox") el.checked = value === "yes";
    else if (el.tagName !== "SELECT" || [...el.options].some((o) => o.value === value)) el.value = value;
  }
}

function bindForm(form) {
  let timer = null;
  const soon = () => { clearTimeout(timer); keepForm(form); timer = setTimeout(() => compute(form), DEBOUNCE_MS); };
  form.addEventListener("input", soon);
  form.addEventListener("change", soon);
  form.addEventListener("submit", (event) => { event.preventDefault(); clearTimeout(timer); compute(form); });
  form.querySelector('[data-action="reset"]')?.addEventListener("click", () => {
    for (const el of form.querySelectorAll("input[name]")) {
      if (el.type === "checkbox") el.checked = el.defaultChecked;
      else el.value = el.dataset["default" + (units === "us" ? "Us" : "Metric")] ?? "";
    }
    for (const el of form.querySelectorAll("select[name]")) {
      el.value = [...el.options].find((o) => o.defaultSelected)?.value ?? el.value;
    }
    keepForm(form);
    compute(form);
  });
  form.querySelector('[data-action="save"]')?.addEventListener("click", () => saveToLog(form));
  form.querySelector('[data-action="print"]')?.addEventListener("click", () => window.print());
}

// ---- units ------------------------------------------------------------------------------
function showUnitLabels() {
  root.dataset.units = units;
  for (const b of document.querySelectorAll("[data-units] button, .unit-switch button")) {
    b.setAttribute("aria-pressed", String(b.dataset.units === units));
  }
  for (const span of document.querySelectorAll(".unit")) {
    span.textContent = units === "us" ? span.dataset.unitUs : span.dataset.unitMetric;
  }
}

async function switchUnits(next) {
  if (next === units) return;
  const previous = units;
  units = next;
  store.set("sumpside.units", units);
  showUnitLabels();
  await Promise.all([...document.querySelectorAll("form[data-tool]")].map(async (form) => {
    const inputs = readInputs(form);
    const typed = {};
    for (const el of form.querySelectorAll("input[name]:not([type=checkbox])")) {
      const oldDefault = el.dataset["default" + (previous === "us" ? "Us" : "Metric")];
      if (el.value === oldDefault) el.value = el.dataset["default" + (units === "us" ? "Us" : "Metric")];
      else if (el.value.trim()) typed[el.name] = inputs[el.name];
    }
    if (Object.keys(typed).length) {
      const shown = await calculator.reexpress(form.dataset.tool, typed, previous, units);
      for (const [key, value] of Object.entries(shown)) {
        const el = form.querySelector(`[name="${CSS.escape(key)}"]`);
        if (el && typeof value === "string") el.value = value;
      }
    }
    keepForm(form);
  }));
  computeVisible();
}

// ---- checklists -------------------------------------------------------------------------
function showRanking(view, form, answer) {
  const holder = view.querySelector("[data-causes]");
  const sections = new Map([...holder.querySelectorAll("[data-cause]")].map((s) => [s.dataset.cause, s]));
  answer.ranked.forEach((cause, index) => {
    const section = sections.get(cause.key);
    if (!section) return;
    section.querySelector("[data-rank]").textContent = `${index + 1}. `;
    const reasons = section.querySelector("[data-reasons]");
    reasons.textContent = cause.reasons.join(" · ");
    reasons.hidden = cause.reasons.length === 0;
    section.classList.toggle("flagged", cause.score > 0);
    holder.append(section); // ranked order, most likely first
  });
  fillList(form.querySelector("[data-ranking]"), answer.ranked.filter((c) => c.score > 0), (li, c) => {
    const strong = document.createElement("strong");
    strong.textContent = c.title;
    li.append(strong, c.reasons.length ? ": " + c.reasons.join("; ") : "");
  });
  printSummary(form);
}

function printSummary(form) {
  const ticked = [], readings = [];
  for (const el of form.querySelectorAll("input[name], select[name]")) {
    const label = form.querySelector(`label[for="${CSS.escape(el.id)}"]`)?.textContent.trim() ?? el.name;
    if (el.type === "checkbox") { if (el.checked) ticked.push(label); }
    else if (el.value.trim()) readings.push(`${label}: ${el.tagName === "SELECT" ? el.selectedOptions[0].textContent : el.value}`);
  }
  const box = form.querySelector("[data-print-summary]");
  const line = (title, items) => { const p = document.createElement("p"); p.textContent = `${title}: ${items.join("; ") || "none"}`; return p; };
  box.replaceChildren(line("Seen", ticked), line("Readings", readings));
}

function rememberReading(tool, answer) {
  const first = Object.entries(answer.text)[0];
  const worst = answer.verdicts.find((v) => v.level === answer.level);
  const readings = session.get("sumpside.readings", {});
  readings[tool] = { text: first ? first[1] : "", level: answer.level, verdict: worst ? worst.message : "" };
  session.set("sumpside.readings", readings);
}

function showReadings(view) {
  const readings = session.get("sumpside.readings", {});
  for (const span of view.querySelectorAll("[data-reading-of]")) {
    const r = readings[span.dataset.readingOf];
    span.textContent = r ? `Latest: ${r.text} (${LEVEL_WORD[r.level]})` : "";
  }
}

function showBackLink(view) {
  const from = session.get("sumpside.from", null);
  const slot = view.querySelector("[data-back]");
  if (!slot) return;
  const checklist = from && views.get("tool/" + from);
  slot.hidden = !checklist;
  if (checklist) {
    const a = document.createElement("a");
    a.href = "#/tool/" + from;
    a.textContent = "← Back to " + checklist.querySelector("h1").textContent + " (the result is carried over)";
    slot.replaceChildren(a);
  }
}

document.addEventListener("click", (event) => {
  const link = event.target.closest("a[data-from-checklist]");
  if (link) session.set("sumpside.from", link.dataset.fromChecklist);
  else if (event.target.closest("a[href^='#/']") && !event.target.closest("[data-back]")) session.set("sumpside.from", null);
});

// ---- log --------------------------------------------------------------------------------
const machineInput = document.querySelector("[data-job=machine]");

function showMachine() {
  for (const span of document.querySelectorAll("[data-job-show=machine]")) span.textContent = machineInput.value || "________________";
}

async function saveToLog(form) {
  const answer = lastAnswers.get(form);
  const state = form.querySelector("[data-state]");
  if (!answer) { state.textContent = "Nothing to save yet: fix the inputs first."; return; }
  const title = form.closest("[data-view]").querySelector("h1").textContent;
  await addEntry({
    at: new Date().toISOString(), machine: machineInput.value.trim(), tool: answer.tool, title,
    units, inputs: readInputs(form), text: answer.text, values: answer.values, unitOf: answer.units,
    level: answer.level,
    verdicts: answer.verdicts.map((v) => `${LEVEL_WORD[v.level]}: ${v.message}`),
  });
  state.textContent = "Saved to the log.";
}

async function renderLog() {
  const list = document.querySelector("[data-log-list]");
  const entries = (await allEntries()).sort((a, b) => b.at.localeCompare(a.at));
  if (!entries.length) { list.replaceChildren(Object.assign(document.createElement("p"), { textContent: "No saved results yet." })); return; }
  list.replaceChildren(...trends(entries), ...entries.map((e) => {
    const card = document.createElement("article");
    card.className = "log-entry level-" + e.level;
    const h = document.createElement("h2");
    h.textContent = `${e.title}${e.machine ? " · " + e.machine : ""}`;
    const when = document.createElement("p");
    when.className = "log-when";
    when.textContent = new Date(e.at).toLocaleString();
    const dl = document.createElement("dl");
    for (const [key, value] of Object.entries(e.text || {})) {
      const div = document.createElement("div");
      div.append(Object.assign(document.createElement("dt"), { textContent: key }),
                 Object.assign(document.createElement("dd"), { textContent: value }));
      dl.append(div);
    }
    const verdicts = document.createElement("ul");
    for (const v of e.verdicts || []) verdicts.append(Object.assign(document.createElement("li"), { textContent: v }));
    const remove = Object.assign(document.createElement("button"), { type: "button", textContent: "Delete", className: "no-print" });
    remove.addEventListener("click", async () => { if (confirm("Delete this entry?")) { await deleteEntry(e.id); renderLog(); } });
    card.append(h, when, dl, verdicts, remove);
    return card;
  }));
}

// A trend per machine and tool with two or more saved results: the first numeric output
// against time, drawn as SVG (presentation attributes only: the CSP forbids inline style).
const SVG_NS = "http://www.w3.org/2000/svg";

function svgEl(name, attrs, text) {
  const el = document.createElementNS(SVG_NS, name);
  for (const [k, v] of Object.entries(attrs)) el.setAttribute(k, String(v));
  if (text !== undefined) el.textContent = text;
  return el;
}

function trends(entries) {
  const groups = new Map();
  for (const e of entries) {
    const key = Object.entries(e.values || {}).find(([, v]) => typeof v === "number");
    if (!key) continue;
    const id = `${e.machine}|${e.tool}|${key[0]}|${e.units}`;
    if (!groups.has(id)) groups.set(id, { e, key: key[0], points: [] });
    groups.get(id).points.push([Date.parse(e.at), e.values[key[0]]]);
  }
  const charts = [];
  for (const { e, key, points } of groups.values()) {
    if (points.length < 2) continue;
    points.sort((a, b) => a[0] - b[0]);
    const [w, h, pad] = [320, 150, 34];
    const xs = points.map((p) => p[0]), ys = points.map((p) => p[1]);
    const [x0, x1] = [Math.min(...xs), Math.max(...xs)];
    let [y0, y1] = [Math.min(...ys), Math.max(...ys)];
    if (y0 === y1) { y0 -= 1; y1 += 1; }
    const px = (x) => pad + (x1 === x0 ? 0.5 : (x - x0) / (x1 - x0)) * (w - 2 * pad);
    const py = (y) => h - pad + -((y - y0) / (y1 - y0)) * (h - 2 * pad);
    const label = `${e.title}${e.machine ? " · " + e.machine : ""}: ${key} (${(e.unitOf || {})[key] || ""})`;
    const svg = svgEl("svg", { viewBox: `0 0 ${w} ${h}`, role: "img", class: "trend" });
    svg.append(svgEl("title", {}, "Trend of " + label));
    svg.append(svgEl("line", { x1: pad, y1: h - pad, x2: w - pad, y2: h - pad, stroke: "#000", "stroke-width": 1 }));
    svg.append(svgEl("line", { x1: pad, y1: pad, x2: pad, y2: h - pad, stroke: "#000", "stroke-width": 1 }));
    svg.append(svgEl("polyline", { points: points.map((p) => `${px(p[0]).toFixed(1)},${py(p[1]).toFixed(1)}`).join(" "),
      fill: "none", stroke: "#0b3954", "stroke-width": 3 }));
    for (const p of points) svg.append(svgEl("circle", { cx: px(p[0]).toFixed(1), cy: py(p[1]).toFixed(1), r: 4, fill: "#0b3954" }));
    const fmt = (v) => Number(v.toPrecision(3)).toString();
    svg.append(svgEl("text", { x: pad - 4, y: pad + 4, "text-anchor": "end", "font-size": 11 }, fmt(y1)));
    svg.append(svgEl("text", { x: pad - 4, y: h - pad + 4, "text-anchor": "end", "font-size": 11 }, fmt(y0)));
    svg.append(svgEl("text", { x: pad, y: h - 10, "font-size": 11 }, new Date(x0).toLocaleDateString()));
    svg.append(svgEl("text", { x: w - pad, y: h - 10, "text-anchor": "end", "font-size": 11 }, new Date(x1).toLocaleDateString()));
    const figure = document.createElement("figure");
    figure.className = "trend-figure";
    figure.append(svg, Object.assign(document.createElement("figcaption"), { textContent: label }));
    charts.push(figure);
  }
  return charts;
}

function download(name, type, text) {
  const url = URL.createObjectURL(new Blob([text], { type }));
  const a = Object.assign(document.createElement("a"), { href: url, download: name });
  document.body.append(a);
  a.click();
  a.remove();
  setTimeout(() => URL.revokeObjectURL(url), 1000);
}

function bindLog() {
  const status = document.querySelector("[data-log-status]");
  const stamp = () => new Date().toISOString().slice(0, 10);
  document.querySelector('[data-log="export-json"]').addEventListener("click", async () =>
    download(`sumpside-log-${stamp()}.json`, "application/json", JSON.stringify(await allEntries(), null, 2)));
  document.querySelector('[data-log="export-csv"]').addEventListener("click", async () =>
    download(`sumpside-log-${stamp()}.csv`, "text/csv", toCsv(await allEntries())));
  document.querySelector('[data-log="print"]').addEventListener("click", () => window.print());
  document.querySelector('[data-log="import"]').addEventListener("change", async (event) => {
    const file = event.target.files[0];
    if (!file) return;
    try {
      const added = await importEntries(JSON.parse(await file.text()));
      status.textContent = `Imported ${added} entr${added === 1 ? "y" : "ies"}.`;
    } catch (err) {
      status.textContent = "Import failed: " + err.message;
    }
    event.target.value = "";
    renderLog();
  });
}

// ---- new builds -------------------------------------------------------------------------
function offerUpdate(registration) {
  const banner = document.getElementById("update-banner");
  banner.hidden = false;
  document.getElementById("update-apply").onclick = () => registration.waiting?.postMessage("activate-new-build");
}

async function registerServiceWorker() {
  if (!("serviceWorker" in navigator)) return;
  const registration = await navigator.serviceWorker.register("sw.js");
  if (registration.waiting && navigator.serviceWorker.controller) offerUpdate(registration);
  registration.addEventListener("updatefound", () => {
    const incoming = registration.installing;
    incoming?.addEventListener("statechange", () => {
      if (incoming.state === "installed" && navigator.serviceWorker.controller) offerUpdate(registration);
    });
  });
  let reloading = false;
  navigator.serviceWorker.addEventListener("controllerchange", () => {
    if (!reloading && navigator.serviceWorker.controller && root.dataset.updateRequested) { reloading = true; location.reload(); }
  });
  document.getElementById("update-apply").addEventListener("click", () => { root.dataset.updateRequested = "1"; });
}

// ---- start ------------------------------------------------------------------------------
for (const form of document.querySelectorAll("form[data-tool]")) bindForm(form);
for (const b of document.querySelectorAll(".unit-switch button")) b.addEventListener("click", () => switchUnits(b.dataset.units));
machineInput.value = store.get("sumpside.machine", "");
machineInput.addEventListener("input", () => { store.set("sumpside.machine", machineInput.value); showMachine(); });
for (const span of document.querySelectorAll("[data-today]")) span.textContent = new Date().toLocaleDateString();
showMachine();
bindLog();
window.addEventListener("hashchange", route);
if (units !== "metric") {
  // Forms are rendered in metric: put the US defaults in before anything is computed.
  for (const el of document.querySelectorAll("input[name]:not([type=checkbox])")) el.value = el.dataset.defaultUs ?? el.value;
}
for (const form of document.querySelectorAll("form[data-tool]")) restoreForm(form);
showUnitLabels();
route();
// The offline cache is filled once the calculator has booted (its files are then in the HTTP
// cache and revalidate cheaply), or after a while if it never does.
let registering = null;
const registerOnce = () => {
  registering ??= registerServiceWorker().catch((err) => console.warn("offline cache unavailable:", err));
};
calculator.ready.then(registerOnce);
setTimeout(registerOnce, 20000);
root.dataset.shell = "ready";
