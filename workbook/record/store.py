"""Saving and loading records as JSON, with a digest, schema validation and atomic writes.

The file is the record's :meth:`~workbook.record.Record.to_dict` plus ``"digest"``:
``"sha256:"`` and the hex SHA-256 of the canonical JSON of everything else (UTF-8, keys
sorted, separators ``","`` and ``":"``). Python writes floats in their shortest exact form,
so a record survives save and load unchanged.

Loading refuses, each with a :class:`~workbook.record.errors.RecordError` naming the file:
a file that is not UTF-8 JSON or ends early, an unknown schema version, a part that the
schema does not allow or that is missing, and content that no longer matches its digest.

Writing is atomic: the text goes to a temporary file in the same directory, is flushed
and synced to disk, then renamed over the target (:func:`os.replace`). If anything fails
the temporary file is removed and the previous record is left as it was.

>>> import tempfile, pathlib
>>> from workbook.record import Record
>>> path = pathlib.Path(tempfile.mkdtemp()) / "lift.json"
>>> r = Record({"machine": "BT-2", "axis": "lift"})
>>> save(r, path) == path and load(path) == r
True
"""

from __future__ import annotations

import hashlib
import json
import os
import tempfile
from pathlib import Path
from typing import Any

from .. import __version__
from ..errors import InputError
from .errors import RecordError
from .model import SUPPORTED_SCHEMA_VERSIONS, Record
from .schema import SCHEMA_FILE, first_problem

#: the rename step of an atomic write; tests replace it to inject a failure
_replace = os.replace


def canonical_json(content: Any) -> str:
    """Canonical JSON text of ``content`` (keys sorted, no spaces, NaN refused).

    >>> canonical_json({"b": 1.5, "a": [1, "é"]})
    '{"a":[1,"é"],"b":1.5}'
    """
    return json.dumps(content, sort_keys=True, separators=(",", ":"), ensure_ascii=False, allow_nan=False)


def digest(content: Any) -> str:
    """``"sha256:"`` and the hex SHA-256 of :func:`canonical_json` of ``content`` (UTF-8).

    >>> digest({})
    'sha256:44136fa355b3678a1146ad16f7e8649e94fb4fc21fe77e8310c060f61caaff8a'
    """
    return "sha256:" + hashlib.sha256(canonical_json(content).encode("utf-8")).hexdigest()


def to_json(record: Record) -> str:
    """The JSON exchange text of ``record`` (indented, with its digest)."""
    content = record.to_dict()
    document = dict(content, digest=digest(content))
    return json.dumps(document, indent=2, ensure_ascii=False, allow_nan=False) + "\n"


def _file_mode(path: Path) -> int:
    try:
        return os.stat(path).st_mode & 0o777
    except FileNotFoundError:
        mask = os.umask(0)
        os.umask(mask)
        return 0o666 & ~mask


def atomic_write_text(path, text: str) -> Path:
    """Write ``text`` (UTF-8) to ``path`` atomically; return the path.

    A temporary file in the same directory is written, flushed, synced and renamed over
    ``path``; on any failure it is removed and an existing file at ``path`` is untouched.
    """
    path = Path(path)
    directory = path.parent if str(path.parent) else Path(".")
    if not directory.is_dir():
        raise InputError(str(path), "a path in a folder that does not exist", "a path in an existing folder")
    mode = _file_mode(path)
    fd, tmp = tempfile.mkstemp(prefix=f".{path.name}.", suffix=".tmp", dir=directory)
    try:
        with os.fdopen(fd, "w", encoding="utf-8", newline="\n") as fh:
            fh.write(text)
            fh.flush()
            os.fsync(fh.fileno())
        os.chmod(tmp, mode)
        _replace(tmp, path)
    except BaseException:
        try:
            os.unlink(tmp)
        except FileNotFoundError:
            pass
        raise
    try:  # make the rename itself durable where the platform allows it
        dfd = os.open(directory, os.O_RDONLY)
    except OSError:
        return path
    try:
        os.fsync(dfd)
    except OSError:
        pass
    finally:
        os.close(dfd)
    return path


def save(record: Record, path) -> Path:
    """Save ``record`` as JSON at ``path`` (atomic); return the path."""
    if not isinstance(record, Record):
        raise InputError("record", f"a {type(record).__name__}", "a workbook.record.Record")
    return atomic_write_text(path, to_json(record))


def _no_duplicates(pairs):
    out = {}
    for key, value in pairs:
        if key in out:
            raise ValueError(f"the key {key!r} appears twice in one object")
        out[key] = value
    return out


def _no_constant(name):
    raise ValueError(f"{name} is not a number JSON allows")


def loads(text: str, name: str = "record") -> Record:
    """A record from JSON text; ``name`` (a file name) prefixes every message."""
    supported = ", ".join(map(str, SUPPORTED_SCHEMA_VERSIONS))
    allowed_file = f"a design record saved by the workbook (JSON, schema version {supported})"
    if not text.strip():
        raise RecordError(name, "an empty file", allowed_file)
    try:
        document = json.loads(text, object_pairs_hook=_no_duplicates, parse_constant=_no_constant)
    except json.JSONDecodeError as exc:
        if exc.pos >= len(text.rstrip()):
            given = f"a file that ends early at line {exc.lineno} (truncated or damaged)"
        else:
            given = f"text that is not JSON: {exc.msg} at line {exc.lineno}, column {exc.colno}"
        raise RecordError(name, given, allowed_file) from None
    except ValueError as exc:
        raise RecordError(name, f"JSON that a record cannot hold: {exc}", allowed_file) from None
    if not isinstance(document, dict):
        raise RecordError(name, f"a JSON {type(document).__name__}, not an object", allowed_file)
    version = document.get("schema_version")
    if "schema_version" in document and (isinstance(version, bool) or version not in SUPPORTED_SCHEMA_VERSIONS):
        raise RecordError(f"{name}, schema_version", f"a record of schema version {version!r}",
                          f"schema version {supported} (the versions workbook {__version__} reads)")
    problem = first_problem(document)
    if problem is not None:
        path, message, part = problem
        where = f"{name}, {path}" if path else name
        if message.endswith("is a required property"):
            given = f"a record without its required part '{part}'"
        else:
            given = f"a part that schema {SCHEMA_FILE} does not allow ({message})"
        raise RecordError(where, given, f"a record as schema {SCHEMA_FILE} describes it")
    stored = document.pop("digest")
    if digest(document) != stored:
        raise RecordError(f"{name}, digest",
                          "a record where the content no longer matches its digest: it was edited or damaged",
                          "a record as the workbook saved it; record the study again instead of editing the file")
    try:
        return Record.from_dict(document)
    except InputError as exc:
        raise RecordError(f"{name}, {exc.field}", exc.given, exc.allowed) from None


def load(path) -> Record:
    """Load and check the record saved at ``path``."""
    path = Path(path)
    name = path.name
    try:
        raw = path.read_bytes()
    except FileNotFoundError:
        raise RecordError(str(path), "no such file", "the path of a saved design record") from None
    except IsADirectoryError:
        raise RecordError(str(path), "a folder", "the path of a saved design record") from None
    try:
        text = raw.decode("utf-8")
    except UnicodeDecodeError as exc:
        raise RecordError(name, f"bytes that are not UTF-8 text (at byte {exc.start})",
                          "a design record saved by the workbook (UTF-8 JSON)") from None
    return loads(text, name)


__all__ = ["save", "load", "loads", "to_json", "digest", "canonical_json", "atomic_write_text"]
