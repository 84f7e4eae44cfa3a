"""The one error type calc raises for bad input."""

from __future__ import annotations


class InputError(ValueError):
    """Bad input: names the field, says what is wrong and what is allowed.

    One error may carry several (``errors``) when a whole form is checked at
    once, so the page can show each message beside its own field.

    >>> str(InputError("kv100", "must be lower than KV40"))
    'kv100: must be lower than KV40'
    >>> [e.field for e in InputError.combine([InputError("a", "x"), InputError("b", "y")]).errors]
    ['a', 'b']
    """

    def __init__(self, field: str, message: str):
        super().__init__(f"{field}: {message}")
        self.field = field
        self.message = message
        self.errors: list[InputError] = [self]

    @classmethod
    def combine(cls, errors: list[InputError]) -> InputError:
        first = errors[0]
        first.errors = [e for err in errors for e in err.errors]
        return first

    def as_list(self) -> list[dict]:
        return [{"field": e.field, "message": e.message} for e in self.errors]
