"""The one error type that every bad input raises.

A :class:`InputError` names the field that was wrong, what was given and what is allowed,
so that a notebook can show it beside the field and a command line can print it without a
traceback.
"""

from __future__ import annotations

import re

_EXCERPTED = re.compile(r"\.\.\. \(\d+ characters\)$")


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
        super().__init__(self.field, self.given, self.allowed)

    def __str__(self) -> str:
        # built on demand from the stored attributes, so a re-qualified copy reads right
        return f"{self.field}: got {self.given}; allowed: {self.allowed}"

    def __reduce__(self):
        # pickling (a worker process, a cached result) keeps the type and every attribute
        return _rebuild, (type(self), self.__dict__.copy())

    def qualified(self, field: str) -> "InputError":
        """The same error (same type, given and allowed) for the field named ``field``.

        Use it where a caller knows where a part sits (``"axes.lift." + exc.field``), instead
        of rebuilding the error by hand.

        >>> e = InputError("bore", "-5 mm", "a length greater than 0 mm").qualified("axes.lift.cylinder.bore")
        >>> type(e).__name__, str(e)
        ('InputError', 'axes.lift.cylinder.bore: got -5 mm; allowed: a length greater than 0 mm')
        """
        copy = type(self).__new__(type(self))
        copy.__dict__.update(self.__dict__)
        copy.field = _excerpt(str(field), 200)
        Exception.__init__(copy, copy.field, copy.given, copy.allowed)
        return copy


def _rebuild(cls, state: dict) -> "InputError":
    err = cls.__new__(cls)
    err.__dict__.update(state)
    Exception.__init__(err, state.get("field", ""), state.get("given", ""), state.get("allowed", ""))
    return err


class InternalDefect(RuntimeError):
    """A fault of the workbook itself, not of the input (a non-finite result, say).

    Never shown as bad input: the command line exits with its own code
    (:data:`workbook.cli.EXIT_DEFECT`) and a panel says to report it.

    >>> str(InternalDefect("results.speed", "a value that is not finite"))
    'results.speed: a value that is not finite (an internal defect of the workbook: please report it)'
    """

    def __init__(self, where: str, what: str):
        self.where, self.what = str(where), str(what)
        super().__init__(self.where, self.what)

    def __str__(self) -> str:
        return f"{self.where}: {self.what} (an internal defect of the workbook: please report it)"


def _excerpt(text: str, limit: int) -> str:
    """``text`` cut to ``limit`` characters with its length said (see :func:`workbook.safetext.excerpt`)."""
    if len(text) <= limit or _EXCERPTED.search(text[limit:]) and len(text) <= limit + 40:
        return text   # short, or already an excerpt
    return f"{text[:limit]}... ({len(text)} characters)"


class ModelValidityError(InputError):
    """An input inside the general bounds but outside a model's stated validity.

    For example an oil temperature below the declared pour point, or a viscosity below
    the 2 mm²/s where the ASTM D341 constant 0.7 stops holding.
    """


__all__ = ["InputError", "ModelValidityError", "InternalDefect"]
