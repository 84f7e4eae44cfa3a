"""JSON text from outside, read without trusting its shape: its nesting is measured before
the parser sees it, because the parser's recursion would overflow the much smaller stack of
the interpreter in the browser long before CPython's.

>>> depth('{"a": [1, {"b": "[[["}]}'), depth("[" * 5)
(3, 5)
>>> loads('{"a": [1]}', 4), loads("[" * 40 + "]" * 40, 32)
({'a': [1]}, None)
"""

from __future__ import annotations

import json
import re

# A JSON string, written as runs of plain characters between escapes ("unrolling the
# loop", after Friedl's Mastering Regular Expressions): the same strings as
# '"(?:[^"\\]|\\.)*"', matched in less than half the time in the browser's interpreter.
_STRINGS = re.compile(r'"[^"\\]*(?:\\.[^"\\]*)*"')
_NOT_BRACKETS = re.compile(r"[^\[\]{}]+")


def depth(text: str) -> int:
    """The deepest nesting of [ and { in JSON text, outside strings (the strings and all
    but the brackets dropped by regular expressions first: a large text stays cheap)."""
    level = deepest = 0
    for char in _NOT_BRACKETS.sub("", _STRINGS.sub("", text)):
        level += 1 if char in "[{" else -1
        deepest = max(deepest, level)
    return deepest


def too_deep(text: str, most: int) -> bool:
    """Whether JSON text nests deeper than `most` (counted only when it could)."""
    return text.count("[") + text.count("{") > most and depth(text) > most


def loads(text: object, most: int) -> object | None:
    """The value of JSON text nested at most `most` deep; None for anything else (not text,
    too deep, not JSON)."""
    if not isinstance(text, str) or too_deep(text, most):
        return None
    try:
        return json.loads(text)
    except (ValueError, RecursionError):
        return None
