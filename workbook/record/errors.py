"""Errors of the design record.

A :class:`RecordError` is an :class:`~workbook.errors.InputError` (so every caller that
shows bad input shows it too) whose ``field`` names the file and the part of the record
that was wrong.

>>> str(RecordError("lift.json, digest", "a record whose content no longer matches its digest",
...                 "a record saved by the workbook and not changed since"))
'lift.json, digest: got a record whose content no longer matches its digest; allowed: a record saved by the workbook and not changed since'
"""

from __future__ import annotations

from ..errors import InputError


class RecordError(InputError):
    """A record file that cannot be read: not JSON, truncated, tampered, wrong version."""


__all__ = ["RecordError"]
