"""What the page template needs, derived from the registry and the markdown under site_src/.

Nothing here describes a tool: labels, units, defaults and ranges come from
calc.kernel.registry (a checklist's causes, checks and cautions too); prose comes from
site_src/help/<tool-id>.md, site_src/pages/*.md and site_src/checklists/<checklist-id>.md.
"""

from __future__ import annotations

import re
import sys
from dataclasses import dataclass, field
from pathlib import Path

import markdown as md

ROOT = Path(__file__).resolve().parent.parent
if str(ROOT) not in sys.path:
    sys.path.insert(0, str(ROOT))

from calc.kernel import registry, units  # noqa: E402
from calc.machines import card as machine_card  # noqa: E402


def render_markdown(text: str) -> str:
    return md.markdown(text, extensions=["tables", "sane_lists", "attr_list"], output_format="html")


def render_inline(text: str) -> str:
    html = render_markdown(text).strip()
    return html[3:-4] if html.startswith("<p>") and html.endswith("</p>") else html


def _shown_default(f: registry.Field, system: str) -> str:
    if f.default is None or f.is_choice:
        return "" if f.default is None else str(f.default)
    return units.format_input(units.from_metric(float(f.default), f.quantity, system))


@dataclass
class InputView:
    key: str
    label: str
    kind: str  # number, choice, flag, text, longtext, date
    help: str
    unit_metric: str = ""
    unit_us: str = ""
    default_metric: str = ""
    default_us: str = ""
    optional: bool = False
    choices: list = field(default_factory=list)
    checked: bool = False
    binds: str = ""  # the machine card field this input takes
    max_chars: int = 0  # a text field's most characters
    group: str = "reading"  # reading, machine or limits (registry.GROUPS)
    # A limit shows its standard value from the start; a reading or fact starts blank,
    # its declared value only an example (registry: "what a blank field means").
    start: str = "example"
    when_key: str = ""  # the choice field whose value decides whether this one is used
    when_values: str = ""  # those values, space-separated
    signed: bool = False  # may be negative (a cold-start temperature): the form offers a minus


# A text field allowed more than this many characters is a box of lines.
LONG_TEXT_CHARS = 200


def input_view(f: registry.Field) -> InputView:
    """One field (a tool's input or the machine card's) as the template shows it."""
    kind = ("flag" if f.is_flag else "choice" if f.is_choice else
            f.quantity if f.quantity == "date" else
            ("longtext" if (f.max or registry.TEXT_MAX_CHARS) > LONG_TEXT_CHARS else "text")
            if f.is_text else "number")
    view = InputView(f.key, f.label, kind, f.help, optional=f.optional, binds=f.binds or "",
                     group=f.group, start="standard" if f.blank_takes_default else "example",
                     when_key=f.when[0] if f.when else "",
                     when_values=" ".join(f.when[1]) if f.when else "",
                     signed=f.is_number and (f.min is None or f.min < 0.0))
    if f.is_flag:
        view.checked = bool(f.default)
    elif f.is_choice:
        view.choices = list(f.choices)
        view.default_metric = view.default_us = str(f.default)
    elif f.is_text:
        view.max_chars = int(f.max or registry.TEXT_MAX_CHARS)
    else:
        view.unit_metric = units.unit_label(f.quantity, "metric")
        view.unit_us = units.unit_label(f.quantity, "us")
        view.default_metric = _shown_default(f, "metric")
        view.default_us = _shown_default(f, "us")
    return view


@dataclass
class SectionView:
    key: str
    title: str
    inputs: list[InputView]


@dataclass
class ToolView:
    id: str
    kind: str
    title: str
    summary: str
    topic: str
    inputs: list[InputView]
    outputs: list[dict]
    help_html: str
    words: str = ""  # the search index: every word of its title, summary and help, once


@dataclass
class CheckView:
    key: str
    html: str
    tool: str | None = None
    tool_title: str | None = None


@dataclass
class CauseView:
    key: str
    title: str
    about_html: str
    checks: list[CheckView]
    caution_html: str


@dataclass
class ChecklistView:
    id: str
    tool: ToolView
    title: str
    intro_html: str
    causes: list[CauseView]


@dataclass
class Site:
    topics: list[tuple[str, list[ToolView]]]
    checklists: list[ChecklistView]
    pages: dict[str, str]
    tools: dict[str, ToolView]
    card: list[SectionView]


def tool_view(found: registry.Tool, help_dir: Path) -> ToolView:
    """The tool as the template shows it; a checklist's prose file is its help."""
    help_file = help_dir / f"{found.id}.md"
    if not help_file.exists() and found.kind == "tool":
        raise SystemExit(f"build: {help_file.relative_to(ROOT)} is missing: every tool has help")
    inputs = [input_view(f) for f in found.inputs]
    outputs = [{"key": o.key, "label": o.label, "help": o.help,
                "unit_metric": units.unit_label(o.quantity, "metric"),
                "unit_us": units.unit_label(o.quantity, "us")} for o in found.outputs]
    help_html = render_markdown(help_file.read_text(encoding="utf-8")) if help_file.exists() else ""
    extra = " ".join([c.title for c in found.causes] + [f.label for f in found.inputs])
    return ToolView(found.id, found.kind, found.title, found.summary, found.topic.title, inputs,
                    outputs, help_html,
                    search_words(found.title, found.summary, extra, re.sub(r"<[^>]+>", " ", help_html)))


def search_words(*texts: str) -> str:
    """The home page's search index of a tool: its words, lower case, each once, in order
    (the page finds a tool by any word of its title, summary, fields or help, offline)."""
    words = re.findall(r"[\w°µ]+", " ".join(texts).casefold())
    return " ".join(dict.fromkeys(w for w in words if len(w) > 1 or w.isdigit()))


_SECTION = re.compile(r"^##\s*\{#(?P<key>[a-z0-9-]+)\}\s*$")


def checklist_prose(text: str, source: str) -> tuple[str, dict[str, str]]:
    """(intro html, {cause key: html}) of a checklist's prose file; see DEVELOPERS.md."""
    intro: list[str] = []
    sections: dict[str, list[str]] = {}
    current = intro
    for number, line in enumerate(text.splitlines(), 1):
        if m := _SECTION.match(line):
            if m["key"] in sections:
                raise SystemExit(f"build: {source}:{number}: section {m['key']!r} twice")
            current = sections[m["key"]] = []
        elif line.startswith("#"):
            raise SystemExit(f"build: {source}:{number}: only '## {{#cause-key}}' headings: "
                             "titles, checks and cautions are declared in calc")
        else:
            current.append(line)
    return render_markdown("\n".join(intro)), {k: render_markdown("\n".join(v))
                                               for k, v in sections.items()}


def checklist_view(found: registry.Tool, view: ToolView, site_dir: Path,
                   titles: dict[str, str]) -> ChecklistView:
    """A checklist as the template shows it: the declaration's causes with their prose."""
    path = site_dir / "checklists" / f"{found.id}.md"
    if not path.exists():
        raise SystemExit(f"build: {path.relative_to(ROOT)} is missing for {found.id}")
    source = str(path.relative_to(ROOT))
    intro, about = checklist_prose(path.read_text(encoding="utf-8"), source)
    declared = [c.key for c in found.causes]
    if list(about) != declared:
        raise SystemExit(f"build: {source}: sections {list(about)} must be the declared causes "
                         f"{declared}, in that order")
    causes = [CauseView(c.key, c.title, about[c.key],
                        [CheckView(k.key, render_inline(k.text), k.tool, titles.get(k.tool))
                         for k in c.checks], render_inline(c.caution))
              for c in found.causes]
    return ChecklistView(found.id, view, found.title, intro, causes)


def load(site_dir: Path) -> Site:
    found = registry.tools()
    views = {tool_id: tool_view(t, site_dir / "help") for tool_id, t in found.items()}
    titles = {tool_id: v.title for tool_id, v in views.items()}
    topics: dict[str, list[ToolView]] = {}
    for view in views.values():
        if view.kind == "tool":
            topics.setdefault(view.topic, []).append(view)
    checklists = [checklist_view(t, views[t.id], site_dir, titles)
                  for t in registry.of_kind("checklist").values()]
    pages = {p.stem: render_markdown(p.read_text(encoding="utf-8"))
             for p in sorted((site_dir / "pages").glob("*.md"))}
    card = [SectionView(s.key, s.title, [input_view(f) for f in s.fields])
            for s in machine_card.SECTIONS]
    return Site(list(topics.items()), checklists, pages, views, card)
