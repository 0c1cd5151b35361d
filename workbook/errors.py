"""The one error type that every bad input raises.

A :class:`InputError` names the field that was wrong, what was given and what is allowed,
so that a notebook can show it beside the field and a command line can print it without a
traceback.
"""

from __future__ import annotations


class InputError(ValueError):
    """Bad input to the workbook.

    Attributes
    ----------
    field : str
        Name of the input that was wrong (for example ``"bore"``).
    given : str
        What the user gave, as text.
    allowed : str
        What would have been accepted, in plain words.

    >>> e = InputError("bore", "-5 mm", "a length greater than 0 mm")
    >>> str(e)
    'bore: got -5 mm; allowed: a length greater than 0 mm'
    """

    def __init__(self, field: str, given: object, allowed: str):
        # echo a short excerpt only: a megabyte line in a message helps nobody
        self.field = _excerpt(str(field), 200)
        self.given = _excerpt(str(given), 160)
        self.allowed = str(allowed)
        super().__init__(f"{self.field}: got {self.given}; allowed: {self.allowed}")


def _excerpt(text: str, limit: int) -> str:
    """``text`` cut to ``limit`` characters with its length said (see :func:`workbook.safetext.excerpt`)."""
    if len(text) <= limit:
        return text
    return f"{text[:limit]}... ({len(text)} characters)"


class ModelValidityError(InputError):
    """An input inside the general bounds but outside a model's stated validity.

    For example an oil temperature below the declared pour point, or a viscosity below
    the 2 mm²/s where the ASTM D341 constant 0.7 stops holding.
    """


__all__ = ["InputError", "ModelValidityError"]
