"""Hostile values typed into every field of every tool and checklist, on a phone.

Each round puts one value into every field the form shows (text, emoji, markup, a number of
100,000 digits, 1e308) and asks for the answer at once; every number field must then show
a message beside it (short, whatever was typed), no markup may run, and the page must raise
no error. After the rounds the form is cleared and given its examples: its answer must be
calc's own for those examples, so nothing typed before is left behind."""

from __future__ import annotations

import pytest

from calc import bridge
from calc.kernel import registry

from .conftest import fill_example, phone_page

TOOLS = registry.tools()
HOSTILE = ("abc", "🛢️💧", "<img src=x onerror=\"window.__xss=1\">", "9" * 100_000, "1e308")
MESSAGE_MAX_CHARS = 400


@pytest.fixture(scope="module")
def phone(browser, base_url):
    with phone_page(browser, base_url) as shared:
        yield shared


TYPE_INTO_EVERY_FIELD = """([form, value]) => {
  const el = document.querySelector(form);
  const typed = [];
  for (const input of el.querySelectorAll("input[name]:not([type=checkbox]), textarea[name]")) {
    if (input.closest(".field").hidden) continue; // a field the chosen mode does not use
    input.value = value;
    input.dispatchEvent(new Event("input", { bubbles: true }));
    typed.push({ key: input.name, number: input.inputMode === "decimal" });
  }
  el.requestSubmit();
  return typed;
}"""
CLEAR_EVERY_FIELD = """form => {
  const el = document.querySelector(form);
  for (const input of el.querySelectorAll("input[name]:not([type=checkbox]), textarea[name]")) {
    input.value = input.dataset.start === "standard" ? input.dataset.defaultMetric : "";
    input.dispatchEvent(new Event("input", { bubbles: true }));
  }
  el.requestSubmit();
}"""
ANSWERED = "f => { const el = document.querySelector(f); return el.dataset.level && !el.dataset.stale; }"
ERRORS = """f => Object.fromEntries([...document.querySelectorAll(f + " [data-error-for]")]
  .map((p) => [p.dataset.errorFor, p.hidden ? "" : p.textContent]))"""


def _no_max(tool_id: str) -> set[str]:
    return {f.key for f in TOOLS[tool_id].inputs if f.is_number and f.max is None}


@pytest.mark.slow
@pytest.mark.parametrize("tool_id", sorted(TOOLS))
def test_hostile_values_in_every_field_are_answered_beside_it(phone, tool_id):
    page, watch = phone
    form = f'form[data-tool="{tool_id}"]'
    page.evaluate("id => { location.hash = '#/tool/' + id; }", tool_id)
    page.wait_for_selector(f"{form}:not([hidden])", state="attached")
    page.wait_for_function("f => document.querySelector(f).dataset.level", arg=form)
    for value in HOSTILE:
        typed = page.evaluate(TYPE_INTO_EVERY_FIELD, [form, value])
        page.wait_for_function(ANSWERED, arg=form)
        errors = page.evaluate(ERRORS, form)
        for field in typed:
            message = errors.get(field["key"], "")
            assert len(message) <= MESSAGE_MAX_CHARS, (tool_id, field, len(message))
            if field["number"] and not (value == "1e308" and field["key"] in _no_max(tool_id)):
                assert message, (tool_id, field["key"], value[:20])
        assert page.get_attribute(form, "data-level") == "error" or not any(f["number"] for f in typed)
        assert page.evaluate("() => window.__xss") is None, (tool_id, value)
    page.evaluate(CLEAR_EVERY_FIELD, form)
    page.wait_for_function(ANSWERED, arg=form)
    fill_example(page, tool_id)
    answer = bridge.run(tool_id, {}, examples=True)
    if answer["headline"]:
        key = answer["headline"][0]
        assert page.inner_text(f'{form} [data-out="{key}"]') == answer["text"][key], tool_id
    assert page.get_attribute(form, "data-level") == answer["level"]
    assert not watch.errors, watch.errors
