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
the temporary file is removed and the previous record is left as it was. The writer holds
an advisory lock (``fcntl.flock``) on its temporary file while it writes; a process killed
mid-write leaves its ``.<name>.<random>.tmp`` behind unlocked, and the next write to that
folder removes every such file of our own naming that no live writer holds.
:func:`folder_lock` serialises writers of one folder, so that a record and its review
copies written under it always come from one run.

Reading is bounded: a file above :data:`MAX_RECORD_BYTES` is refused before it is parsed,
numbers beyond a float's range (``1e400``), values nested too deeply, lone surrogates and
control, zero-width or bidirectional characters in text are refused with the part named.

>>> import tempfile, pathlib
>>> from workbook.record import Record
>>> path = pathlib.Path(tempfile.mkdtemp()) / "lift.json"
>>> r = Record({"machine": "BT-2", "axis": "lift"})
>>> save(r, path) == path and load(path) == r
True
"""

from __future__ import annotations

import contextlib
import hashlib
import json
import os
import re
import tempfile
from pathlib import Path
from typing import Any

try:
    import fcntl
except ImportError:  # not on this platform: no locks, stale temporary files are left alone
    fcntl = None

from .. import __version__, safetext
from ..errors import InputError
from ..formatting import kind_of
from .errors import RecordError
from .model import SUPPORTED_SCHEMA_VERSIONS, Record
from .schema import SCHEMA_FILE, SCHEMA_FILES, first_problem

#: the rename step of an atomic write; tests replace it to inject a failure
_replace = os.replace
#: the largest record file read (a record of 5000-point curves is under 10 MB)
MAX_RECORD_BYTES = 16 * 2 ** 20
#: the name of the lock file :func:`folder_lock` keeps in a folder
LOCK_NAME = ".workbook-write.lock"
#: characters a record's text may hold besides printable ones (notes may run over lines; the
#: command line escapes them when it prints)
TEXT_ALLOW = "\n\r\t"
#: what ``tempfile.mkstemp(prefix=".<name>.", suffix=".tmp")`` names: ours to clean up
_OUR_TEMP = re.compile(r"^\..+\.[A-Za-z0-9_]{8}\.tmp$")


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


def _pretty(value: Any, indent: int = 0) -> str:
    """JSON text for review in a diff: one key a line, but a list of numbers (a curve, the
    loads of an input) or a small entry on a line of its own, so that a changed input or
    result moves one line and a changed curve one line per series."""
    pad = "  " * indent
    inner = "  " * (indent + 1)
    if isinstance(value, dict):
        if not value:
            return "{}"
        flat = json.dumps(value, ensure_ascii=False, allow_nan=False)
        if all(not isinstance(v, (dict, list)) or (isinstance(v, list) and not any(isinstance(x, (dict, list))
                                                                                      for x in v))
               for v in value.values()) and len(flat) <= 100:
            return flat
        items = [f"{inner}{json.dumps(k, ensure_ascii=False)}: {_pretty(v, indent + 1)}" for k, v in value.items()]
        return "{\n" + ",\n".join(items) + "\n" + pad + "}"
    if isinstance(value, list):
        if not any(isinstance(v, (dict, list)) for v in value):
            return json.dumps(value, ensure_ascii=False, allow_nan=False)
        items = [f"{inner}{_pretty(v, indent + 1)}" for v in value]
        return "[\n" + ",\n".join(items) + "\n" + pad + "]"
    return json.dumps(value, ensure_ascii=False, allow_nan=False)


def to_json(record: Record) -> str:
    """The JSON exchange text of ``record`` (indented for review, with its digest).

    Objects have one key a line; lists of numbers and small flat entries stay on one line,
    so a reviewer's diff reads line by line (see :func:`_pretty`). The digest covers the
    canonical form, not this layout.
    """
    content = record.to_dict()
    document = dict(content, digest=digest(content))
    return _pretty(document) + "\n"


def _file_mode(path: Path) -> int:
    try:
        return os.stat(path).st_mode & 0o777
    except FileNotFoundError:
        mask = os.umask(0)
        os.umask(mask)
        return 0o666 & ~mask


@contextlib.contextmanager
def folder_lock(directory):
    """Hold an exclusive advisory lock on ``directory`` (its :data:`LOCK_NAME` file) while inside.

    Two evaluations writing into one folder take turns, so each record and its review
    copies are written by one of them. The lock file is left in place (removing it would
    let a third writer lock a different file); the lock ends with the process.
    """
    directory = Path(directory)
    if fcntl is None:
        yield directory
        return
    fd = os.open(directory / LOCK_NAME, os.O_RDWR | os.O_CREAT, 0o666)
    try:
        fcntl.flock(fd, fcntl.LOCK_EX)
        yield directory
    finally:
        os.close(fd)   # closing releases the lock


def remove_stale_temporaries(directory) -> list[Path]:
    """Remove the temporary files of our own naming in ``directory`` that no writer holds.

    A writer holds an exclusive lock on its temporary file from creation to rename; a file
    whose lock can be taken belongs to a writer that died. Returns the files removed.
    """
    if fcntl is None:
        return []
    removed = []
    try:
        names = [n for n in os.listdir(directory) if _OUR_TEMP.match(n)]
    except OSError:
        return []
    for name in names:
        path = Path(directory) / name
        try:
            fd = os.open(path, os.O_RDONLY | getattr(os, "O_NOFOLLOW", 0))
        except OSError:
            continue
        try:
            if not os.path.isfile(path):
                continue
            try:
                fcntl.flock(fd, fcntl.LOCK_EX | fcntl.LOCK_NB)
            except OSError:
                continue   # a live writer holds it
            try:
                if os.stat(path).st_ino == os.fstat(fd).st_ino:
                    os.unlink(path)
                    removed.append(path)
            except OSError:
                pass
        finally:
            os.close(fd)
    return removed


def _locked_temporary(path: Path, directory: Path) -> tuple[int, str]:
    """A new temporary file beside ``path``, locked by this process (see :func:`remove_stale_temporaries`)."""
    while True:
        fd, tmp = tempfile.mkstemp(prefix=f".{path.name}.", suffix=".tmp", dir=directory)
        if fcntl is None:
            return fd, tmp
        fcntl.flock(fd, fcntl.LOCK_EX)
        try:
            if os.stat(tmp).st_ino == os.fstat(fd).st_ino:
                return fd, tmp
        except FileNotFoundError:
            pass
        os.close(fd)   # a cleaner took it in the instant before the lock: make another


def atomic_write_text(path, text: str) -> Path:
    """Write ``text`` (UTF-8) to ``path`` atomically; return the path.

    A temporary file in the same directory is written, flushed, synced and renamed over
    ``path``; on any failure it is removed and an existing file at ``path`` is untouched.
    Stale temporary files of earlier writers that died are removed first.
    """
    path = Path(path)
    directory = path.parent if str(path.parent) else Path(".")
    if not directory.is_dir():
        raise InputError(str(path), "a path in a folder that does not exist", "a path in an existing folder")
    mode = _file_mode(path)
    remove_stale_temporaries(directory)
    fd, tmp = _locked_temporary(path, directory)
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
    """Save ``record`` as JSON at ``path`` (atomic); return the path.

    Text that :func:`load` would refuse (control, zero-width or bidirectional characters,
    lone surrogates) is refused here, before anything is written.
    """
    if not isinstance(record, Record):
        raise InputError("record", kind_of(record), "a workbook.record.Record")
    problem = _unsafe_text(record.to_dict())
    if problem is not None:
        where, given, allowed = problem
        raise InputError(f"record, {where}" if where else "record", given, allowed)
    return atomic_write_text(path, to_json(record))


def _unsafe_text(document: Any) -> tuple[str, str, str] | None:
    """``(dotted part, given, allowed)`` of the first text or key of ``document`` that is not safe text."""
    stack = [("", document)]
    while stack:
        where, node = stack.pop()
        if isinstance(node, dict):
            items = list(node.items())
            for key, value in reversed(items):
                if isinstance(key, str) and safetext.first_unsafe(key, TEXT_ALLOW) is not None:
                    stack = [(where, key)]
                    break
                stack.append((f"{where}.{key}" if where else str(key), value))
        elif isinstance(node, list):
            stack.extend((f"{where}[{i}]", v) for i, v in reversed(list(enumerate(node))))
        elif isinstance(node, str):
            found = safetext.first_unsafe(node, TEXT_ALLOW)
            if found is not None:
                i, ch = found
                return (where, repr(safetext.excerpt(node, 60)),
                        f"{safetext.ALLOWED} (found {safetext.describe(ch)} at position {i + 1})")
    return None


def _finite_float(text: str) -> float:
    value = float(text)
    if value in (float("inf"), float("-inf")):
        raise ValueError(f"the number {safetext.excerpt(text, 40)} is beyond the range of a float")
    return value


def _bounded_int(text: str) -> int:
    if len(text.lstrip("-")) > 308:
        raise ValueError(f"a whole number of {len(text)} digits is beyond the range of a float")
    return int(text)


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
    if len(text) > MAX_RECORD_BYTES:
        raise RecordError(name, f"a file of {len(text)} characters",
                          f"{allowed_file}, of at most {MAX_RECORD_BYTES // 2 ** 20} MB")
    if not text.strip():
        raise RecordError(name, "an empty file", allowed_file)
    try:
        return _loads(text, name, allowed_file)
    except RecursionError:
        raise RecordError(name, "values nested too deeply to read", allowed_file) from None


def _loads(text: str, name: str, allowed_file: str) -> Record:
    supported = ", ".join(map(str, SUPPORTED_SCHEMA_VERSIONS))
    try:
        document = json.loads(text, object_pairs_hook=_no_duplicates, parse_constant=_no_constant,
                              parse_float=_finite_float, parse_int=_bounded_int)
    except json.JSONDecodeError as exc:
        rest = text[exc.pos:].rstrip()
        # the end of the file, or a number cut short there ("82." or "1e")
        if not rest.strip("0123456789.eE+-") or (exc.msg.startswith("Unterminated string")
                                             and '"' not in text[exc.pos + 1:]):
            given = f"a file that ends early at line {exc.lineno} (truncated or damaged)"
        else:
            given = f"text that is not JSON: {exc.msg} at line {exc.lineno}, column {exc.colno}"
        raise RecordError(name, given, allowed_file) from None
    except ValueError as exc:
        raise RecordError(name, f"JSON that a record cannot hold: {exc}", allowed_file) from None
    if not isinstance(document, dict):
        raise RecordError(name, f"a JSON {type(document).__name__}, not an object", allowed_file)
    unsafe = _unsafe_text(document)
    if unsafe is not None:
        where, given, allowed = unsafe
        raise RecordError(f"{name}, {where}" if where else name, given, allowed)
    version = document.get("schema_version")
    if "schema_version" in document and (isinstance(version, bool) or version not in SUPPORTED_SCHEMA_VERSIONS):
        raise RecordError(f"{name}, schema_version", f"a record of schema version {version!r}",
                          f"schema version {supported} (the versions workbook {__version__} reads)")
    problem = first_problem(document)
    schema_file = SCHEMA_FILES.get(version, SCHEMA_FILE) if not isinstance(version, bool) else SCHEMA_FILE
    if problem is not None:
        path, message, part = problem
        where = f"{name}, {path}" if path else name
        if message.endswith("is a required property"):
            given = f"a record without its required part '{part}'"
        else:
            given = f"a part that schema {schema_file} does not allow ({message})"
        raise RecordError(where, given, f"a record as schema {schema_file} describes it")
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
    name = safetext.printable(path.name, keep="")
    try:
        size = path.stat().st_size
    except FileNotFoundError:
        raise RecordError(str(path), "no such file", "the path of a saved design record") from None
    if size > MAX_RECORD_BYTES:
        raise RecordError(name, f"a file of {size} bytes",
                          f"a design record saved by the workbook, of at most {MAX_RECORD_BYTES // 2 ** 20} MB")
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


__all__ = ["save", "load", "loads", "to_json", "digest", "canonical_json", "atomic_write_text", "folder_lock",
           "remove_stale_temporaries", "MAX_RECORD_BYTES", "LOCK_NAME"]
