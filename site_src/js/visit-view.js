// The visit report of one machine and day ("visit/<id>/<day>"), as calc makes it: the card's
// summary, each reading with what was entered and found, the checklists' ticked symptoms
// and ranked causes, what is due, the notes, who, and a signature line. One printed page.
import { LEVEL_WORD, el } from "./answers.js";
import { ask, machine, readingsOf, today } from "./kit.js";
import { device } from "./store.js";
import { currentUnits } from "./units.js";

const view = document.querySelector('[data-view="visit"]');
const part = (name) => view.querySelector(`[data-v="${name}"]`);
const WHO = "sumpside.visit-who";
let drawing = 0;

const pairs = (items, className) => el("dl", { className }, ...items.map((i) => el("div", {},
  el("dt", { textContent: i.label }), el("dd", { textContent: i.text }))));

function readingBlock(r) {
  const head = el("h3", {}, el("span", { className: "badge level-badge", textContent: LEVEL_WORD[r.level] || "Kept" }),
    ` ${r.time} · ${r.title}`);
  const block = el("section", { className: "visit-reading level-" + (r.level || "stale") }, head);
  if (r.message) block.append(el("p", { textContent: r.message }));
  if (r.inputs.length || r.from_card) {
    block.append(el("p", { className: "visit-sub", textContent: "Entered"
      + (r.from_card ? ` (and ${r.from_card} fact${r.from_card === 1 ? "" : "s"} from the machine card)` : "") }),
    pairs(r.inputs, "visit-pairs"));
  }
  if (r.seen.length) block.append(el("p", { className: "visit-line", textContent: "Seen: " + r.seen.join("; ") }));
  if (r.outputs.length) block.append(el("p", { className: "visit-sub", textContent: "Found" }), pairs(r.outputs, "visit-pairs"));
  if (r.causes.length) {
    block.append(el("p", { className: "visit-line", textContent: "Causes with points, in order: "
      + r.causes.map((c) => `${c.title} (${[c.word, ...c.reasons].join("; ")})`).join(" · ") }));
  }
  const verdicts = el("ul", { className: "visit-verdicts" });
  for (const v of r.verdicts) verdicts.append(el("li", { textContent: (v.level ? LEVEL_WORD[v.level] + ": " : "") + v.message }));
  if (r.verdicts.length) block.append(verdicts);
  if (r.note) block.append(el("p", { className: "visit-line", textContent: "Note: " + r.note }));
  return block;
}

// A day with no readings: say so, and offer the newest days that have some (not printed).
function noReadings(days) {
  const said = [el("p", { textContent: "No readings saved for this machine on this day." })];
  if (days.length) {
    said.push(el("p", { className: "no-print visit-days", textContent: "Days with readings: " },
      ...days.flatMap((d, i) => {
        const link = el("a", { href: "#", textContent: d });
        link.dataset.day = d;
        return [i ? ", " : "", link];
      })));
  }
  return said;
}

async function render() {
  const turn = ++drawing;
  const [id, day] = (view.dataset.param || "").split("/");
  const record = await machine(decodeURIComponent(id || ""));
  const report = part("report");
  if (!record) { report.replaceChildren(el("p", { textContent: "No such machine on this device." })); return; }
  part("back").href = "#/machine/" + encodeURIComponent(record.id);
  const answer = await ask("visit", { machine: record, readings: await readingsOf(record.id), units: currentUnits(),
    day: part("day").value || day || today(), who: part("who").value, notes: part("notes").value });
  if (turn !== drawing) return;
  if (!answer.ok) { report.replaceChildren(el("p", { textContent: answer.errors.map((e) => e.message).join(" ") })); return; }
  report.replaceChildren(
    el("header", { className: "visit-head" },
      el("h1", { textContent: "Visit report · " + answer.machine }),
      el("p", { textContent: `Date ${answer.day} · Checked by ${answer.who || "________________"}`
        + (answer.level ? ` · Worst verdict: ${LEVEL_WORD[answer.level]}` : "") })),
    pairs(answer.card, "visit-card"),
    ...(answer.readings.length ? answer.readings.map(readingBlock) : noReadings(answer.days)),
    el("p", { className: "visit-line", textContent: "Due: " + (answer.due.map((d) => d.says).join(" ") || "no intervals on the card.") }),
    el("p", { className: "visit-line", textContent: "Notes: " + (answer.notes || "") }),
    el("p", { className: "visit-small", textContent: answer.cautions.join(" ") }),
    el("p", { className: "visit-sign", textContent: `${answer.signature}: ______________________________   Date: ____________` }));
}

export function showVisit() {
  const [, day] = (view.dataset.param || "").split("/");
  part("day").value = day || today();
  part("who").value = device.get(WHO, "");
  return render();
}

export function startVisit() {
  let timer = null;
  for (const name of ["day", "who", "notes"]) {
    part(name).addEventListener("input", () => {
      if (name === "who") device.set(WHO, part("who").value);
      clearTimeout(timer);
      timer = setTimeout(render, 250);
    });
  }
  part("print").addEventListener("click", async () => { await render(); window.print(); });
  part("report").addEventListener("click", (event) => {
    const link = event.target.closest("a[data-day]");
    if (!link) return;
    event.preventDefault();
    part("day").value = link.dataset.day;
    render();
  });
}
