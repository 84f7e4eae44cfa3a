"""What the page template needs, derived from the registry and the markdown under site_src/.

Nothing here describes a tool: labels, units, defaults and ranges come from
calc.registry; prose comes from site_src/help/<tool-id>.md, site_src/pages/*.md
and site_src/checklists/<name>.md.
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

from calc import registry, units  # noqa: E402

CHECKLIST_PREFIX = "checklist-"


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
    kind: str  # number, choice, flag
    help: str
    unit_metric: str = ""
    unit_us: str = ""
    default_metric: str = ""
    default_us: str = ""
    optional: bool = False
    choices: list = field(default_factory=list)
    checked: bool = False


@dataclass
class ToolView:
    id: str
    title: str
    summary: str
    topic: str
    inputs: list[InputView]
    outputs: list[dict]
    help_html: str


@dataclass
class Item:
    kind: str  # check or caution
    html: str
    tool: str | None = None
    tool_title: str | None = None


@dataclass
class CauseView:
    key: str
    title: str
    about_html: str
    items: list[Item]


@dataclass
class ChecklistView:
    name: str
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


def tool_view(found: registry.Tool, help_dir: Path) -> ToolView:
    """The tool as the template shows it; a checklist's own markdown is its help."""
    help_file = help_dir / f"{found.id}.md"
    is_checklist = found.id.startswith(CHECKLIST_PREFIX)
    if not help_file.exists() and not is_checklist:
        raise SystemExit(f"build: {help_file.relative_to(ROOT)} is missing: every tool has help")
    inputs = []
    for f in found.inputs:
        view = InputView(f.key, f.label, "flag" if f.is_flag else "choice" if f.is_choice else "number",
                         f.help, optional=f.optional)
        if f.is_flag:
            view.checked = bool(f.default)
        elif f.is_choice:
            view.choices = list(f.choices)
            view.default_metric = view.default_us = str(f.default)
        else:
            view.unit_metric = units.unit_label(f.quantity, "metric")
            view.unit_us = units.unit_label(f.quantity, "us")
            view.default_metric = _shown_default(f, "metric")
            view.default_us = _shown_default(f, "us")
        inputs.append(view)
    outputs = [{"key": o.key, "label": o.label, "help": o.help,
                "unit_metric": units.unit_label(o.quantity, "metric"),
                "unit_us": units.unit_label(o.quantity, "us")} for o in found.outputs]
    return ToolView(found.id, found.title, found.summary, found.topic, inputs, outputs,
                    render_markdown(help_file.read_text(encoding="utf-8")) if help_file.exists() else "")


_CAUSE = re.compile(r"^##\s+(?P<title>.+?)\s*\{#(?P<key>[a-z0-9-]+)\}\s*$")
_CHECK = re.compile(r"^-\s*\[ \]\s*Check:\s*(?P<text>.+?)\s*(\{tool=(?P<tool>[a-z0-9-]+)\})?\s*$")
_CAUTION = re.compile(r"^>\s?(?P<text>.*)$")


def parse_checklist(text: str, source: str, tool_titles: dict[str, str]) -> tuple[str, str, list[CauseView]]:
    """(title, intro html, causes) of a checklist file; see DEVELOPERS.md for the format."""
    title, intro, causes = None, [], []
    about: list[str] = []
    caution: list[str] | None = None

    def close_caution():
        nonlocal caution
        if caution is not None:
            causes[-1].items.append(Item("caution", render_inline(" ".join(caution))))
            caution = None

    for number, line in enumerate(text.splitlines(), 1):
        where = f"{source}:{number}"
        if caution is not None and not line.startswith(">"):
            close_caution()
        if line.startswith("# ") and title is None:
            title = line[2:].strip()
        elif m := _CAUSE.match(line):
            if causes:
                causes[-1].about_html = render_markdown("\n".join(about))
            causes.append(CauseView(m["key"], m["title"], "", []))
            about = []
        elif m := _CHECK.match(line):
            if not causes:
                raise SystemExit(f"build: {where}: a check before the first cause heading")
            tool = m["tool"]
            if tool and tool not in tool_titles:
                raise SystemExit(f"build: {where}: no tool {tool!r}")
            causes[-1].items.append(Item("check", render_inline(m["text"]), tool,
                                         tool_titles.get(tool) if tool else None))
        elif m := _CAUTION.match(line):
            if not causes:
                raise SystemExit(f"build: {where}: a caution before the first cause heading")
            caution = (caution or []) + [m["text"]]
        elif causes:
            about.append(line)
        else:
            intro.append(line)
    close_caution()
    if causes:
        causes[-1].about_html = render_markdown("\n".join(about))
    if title is None or not causes:
        raise SystemExit(f"build: {source}: a checklist needs a '# title' and '## cause {{#key}}' sections")
    return title, render_markdown("\n".join(intro)), causes


def load(site_dir: Path) -> Site:
    found = registry.tools()
    views = {tool_id: tool_view(t, site_dir / "help") for tool_id, t in found.items()}
    titles = {tool_id: v.title for tool_id, v in views.items()}
    topics: dict[str, list[ToolView]] = {}
    checklists = []
    for tool_id, view in views.items():
        if tool_id.startswith(CHECKLIST_PREFIX):
            name = tool_id[len(CHECKLIST_PREFIX):]
            path = site_dir / "checklists" / f"{name}.md"
            if not path.exists():
                raise SystemExit(f"build: {path.relative_to(ROOT)} is missing for {tool_id}")
            title, intro, causes = parse_checklist(path.read_text(encoding="utf-8"),
                                                   str(path.relative_to(ROOT)), titles)
            checklists.append(ChecklistView(name, view, title, intro, causes))
        else:
            topics.setdefault(view.topic, []).append(view)
    pages = {p.stem: render_markdown(p.read_text(encoding="utf-8"))
             for p in sorted((site_dir / "pages").glob("*.md"))}
    return Site(list(topics.items()), checklists, pages, views)
