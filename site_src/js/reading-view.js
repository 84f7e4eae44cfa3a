// One saved reading as calc shows it now (a view of the "readings" op): the tool, the machine,
// when, the verdicts, the values and, folded, the inputs with those from the card marked.
import { LEVEL_WORD, el, fillList, verdictItem } from "./answers.js";

export function readingCard(view, machineName, onDelete) {
  const level = view.ok ? view.level : (view.level || "stale");
  const card = el("article", { className: "reading level-" + level });
  card.dataset.reading = view.id;
  const title = view.title + (machineName ? " · " + machineName : "");
  card.append(el("h3", { textContent: title }),
    el("p", { className: "reading-when", textContent: new Date(view.time).toLocaleString() + (view.note ? " · " + view.note : "") }));
  if (!view.ok) {
    card.append(el("p", { className: "reading-stale", textContent: view.message }));
    const kept = el("dl", { className: "outputs" });
    for (const [label, text] of Object.entries(view.text || {})) {
      kept.append(el("div", { className: "output" }, el("dt", { textContent: label }), el("dd", { textContent: text })));
    }
    const said = el("ul", { className: "verdicts" });
    fillList(said, view.verdicts_as_saved || [], (li, v) => { li.textContent = v; });
    card.append(said, kept);
  } else {
    const verdicts = el("ul", { className: "verdicts" });
    fillList(verdicts, view.verdicts, verdictItem);
    const outputs = el("dl", { className: "outputs" });
    for (const o of view.outputs) {
      if (o.text === "n/a") continue;
      outputs.append(el("div", { className: "output" }, el("dt", { textContent: o.label }), el("dd", { textContent: o.text })));
    }
    const flagged = (view.ranked || []).filter((c) => c.score > 0);
    card.append(verdicts, outputs);
    if (flagged.length) {
      const causes = el("ol", { className: "ranking" });
      fillList(causes, flagged, (li, c) => li.append(el("strong", { textContent: `${c.title} (${c.word})` }), c.reasons.length ? ": " + c.reasons.join("; ") : ""));
      card.append(el("p", { className: "reading-sub", textContent: "Causes with points" }), causes);
    }
    const inputs = el("ul", { className: "reading-inputs" });
    fillList(inputs, view.inputs, (li, i) => {
      li.textContent = i.flag ? i.label : `${i.label}: ${i.text}`;
      if (i.from_card) li.append(el("span", { className: "card-mark", textContent: " (card)" }));
    });
    card.append(el("details", { className: "reading-more" }, el("summary", { textContent: "What was entered" }), inputs));
  }
  if (onDelete) {
    const remove = el("button", { type: "button", className: "no-print", textContent: "Delete reading" });
    remove.addEventListener("click", () => { if (confirm(`Delete this reading (${title})?`)) onDelete(); });
    card.append(remove);
  }
  card.querySelector("h3").prepend(el("span", { className: "badge level-badge", textContent: LEVEL_WORD[level] || "Kept" }), " ");
  return card;
}
