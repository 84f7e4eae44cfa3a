"""The one error type calc raises for bad input."""

from __future__ import annotations

from .result import Q, Text, text


# An error quotes at most this much of what was typed.
QUOTE_CHARS = 40


def typed(raw: object) -> Q:
    """What was typed, quoted and cut short, as a placeholder for a message.

    >>> typed("abc").value, typed("x" * 100).value[-3:]
    ("'abc'", "x…'")
    """
    shown = str(raw).strip()
    if len(shown) > QUOTE_CHARS:
        shown = shown[:QUOTE_CHARS] + "…"
    return Q(repr(shown), "text")


class InputError(ValueError):
    """Bad input: names the field, says what is wrong and what is allowed.

    The message is a sentence with quantities (as verdicts are), so the edge shows it in the
    reader's units. One error may carry several (``errors``) when a whole form is checked at
    once, so the page can show each message beside its own field.

    >>> str(InputError("kv100", "must be lower than KV40"))
    'kv100: must be lower than KV40'
    >>> err = InputError("temp2", "the readings must be {gap} apart", gap=Q(1.0, "temperature_difference"))
    >>> err.as_list(lambda v, q: f"{v * 1.8:g} °F")
    [{'field': 'temp2', 'message': 'the readings must be 1.8 °F apart'}]
    >>> [e.field for e in InputError.combine([InputError("a", "x"), InputError("b", "y")]).errors]
    ['a', 'b']
    """

    def __init__(self, field: str | None, message: str | Text, /, *args: Q, **named: Q):
        self.field = field
        self.text = message if isinstance(message, Text) else text(message, *args, **named)
        super().__init__(f"{field}: {self.message}")
        self.errors: list[InputError] = [self]

    @property
    def message(self) -> str:
        """The message in calc's metric units (the CLI and the bridge render their own)."""
        from . import units  # units imports this module: look it up at call time
        return self.text.render(lambda v, q: units.show(v, q, "metric"))

    @classmethod
    def combine(cls, errors: list[InputError]) -> InputError:
        first = errors[0]
        first.errors = [e for err in errors for e in err.errors]
        return first

    def as_list(self, show=None) -> list[dict]:
        """Every error as {"field", "message"}, quantities shown by `show(value, quantity)`."""
        return [{"field": e.field, "message": e.message if show is None else e.text.render(show)}
                for e in self.errors]
