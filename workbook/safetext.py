"""Text that is safe to store, to name a file with and to print on a terminal.

A design file or a record can come from a supplier or a colleague. Three kinds of
character in its text do harm without being seen:

* **control characters** (Unicode category Cc: NUL, ESC, BEL, DEL, the C1 block): an ESC
  starts a terminal escape sequence that can clear the screen, move the cursor or hide the
  lines that follow; NUL ends a file name in the operating system;
* **format characters** (category Cf): zero-width spaces and joiners, the byte-order mark,
  and the bidirectional overrides and isolates (U+202A..U+202E, U+2066..U+2069) that make
  text display in another order than it is stored;
* **lone surrogates** (category Cs) and the line and paragraph separators (Zl, Zp), which
  UTF-8 cannot encode or a terminal shows as a line break.

:func:`check` refuses them in an input (with an :class:`~workbook.errors.InputError`
naming the field, the character and where it is); :func:`printable` escapes them for a
terminal (``\\x1b``, ``\\u202e``); :func:`excerpt` shortens what an error message echoes.

>>> first_unsafe("BT-2 \\u202eevil")
(5, '\\u202e')
>>> printable("\\x1b[2JALL PASS")
'\\\\x1b[2JALL PASS'
>>> excerpt("x" * 500, 20)
'xxxxxxxxxxxxxxxxxxxx... (500 characters)'
>>> check("80\\x00 mm", "cylinder.bore")
Traceback (most recent call last):
...
workbook.errors.InputError: cylinder.bore: got '80\\x00 mm'; allowed: text without control, zero-width or bidirectional characters (found U+0000 NULL at position 3)
"""

from __future__ import annotations

import unicodedata

from .errors import InputError, _excerpt

#: Unicode general categories refused in input text and escaped on a terminal
UNSAFE_CATEGORIES = frozenset({"Cc", "Cf", "Cs", "Zl", "Zp"})
#: the longest excerpt of a given value that an error message echoes, in characters
EXCERPT = 120

ALLOWED = "text without control, zero-width or bidirectional characters"


def is_unsafe(ch: str) -> bool:
    """True when the character ``ch`` is a control, format, surrogate or separator character."""
    return unicodedata.category(ch) in UNSAFE_CATEGORIES


def first_unsafe(text: str, allow: str = "") -> tuple[int, str] | None:
    """``(index, character)`` of the first unsafe character of ``text`` not in ``allow``, or None."""
    for i, ch in enumerate(text):
        if ch not in allow and is_unsafe(ch):
            return i, ch
    return None


def describe(ch: str) -> str:
    """``"U+001B ESCAPE"``: the code point of ``ch`` and its Unicode name where it has one.

    >>> describe("\\u200b")
    'U+200B ZERO WIDTH SPACE'
    """
    name = unicodedata.name(ch, "")
    if not name and ch == "\x00":
        name = "NULL"
    elif not name and unicodedata.category(ch) == "Cc":
        name = "CONTROL"
    return f"U+{ord(ch):04X} {name}".rstrip()


def check(text: str, field: str, allow: str = "") -> str:
    """Return ``text`` if it holds no unsafe character (besides those in ``allow``).

    Raises :class:`~workbook.errors.InputError` naming ``field``, the character and its
    position (1-based).
    """
    found = first_unsafe(text, allow)
    if found is None:
        return text
    i, ch = found
    raise InputError(field, repr(excerpt(text)), f"{ALLOWED} (found {describe(ch)} at position {i + 1})")


def printable(text: str, keep: str = "\n") -> str:
    """``text`` with every unsafe character except those in ``keep`` written as an escape.

    ``\\x1b`` for a control character below U+0100, ``\\u202e`` for the others, so that a
    terminal shows what is there instead of obeying it.
    """
    text = str(text)
    if first_unsafe(text, keep) is None:
        return text
    out = []
    for ch in text:
        if ch in keep or not is_unsafe(ch):
            out.append(ch)
        elif ord(ch) < 0x100:
            out.append(f"\\x{ord(ch):02x}")
        elif ord(ch) < 0x10000:
            out.append(f"\\u{ord(ch):04x}")
        else:
            out.append(f"\\U{ord(ch):08x}")
    return "".join(out)


def excerpt(text: str, limit: int = EXCERPT) -> str:
    """``text`` cut to ``limit`` characters, saying how long it was.

    An error message echoes what was given; a whole megabyte line helps nobody.
    """
    return _excerpt(str(text), limit)


__all__ = ["UNSAFE_CATEGORIES", "EXCERPT", "ALLOWED", "is_unsafe", "first_unsafe", "describe", "check",
           "printable", "excerpt"]
