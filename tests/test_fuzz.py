"""A fuzzer of our own for design files and records (hypothesis), run in every test run.

Mutated design files go to ``axisbook evaluate``; damaged, re-signed or re-typed records go
to ``axisbook export``, ``compare`` and ``recheck``. Whatever the mutation, each case must

* end with exit code 0, 1 or 2 (an exception escaping ``cli.main`` is a finding),
* write nothing outside its output folder,
* print no raw control, zero-width or bidirectional character,
* finish within :data:`CASE_SECONDS` of wall time and keep the process below
  :data:`MAX_RSS_MB` of resident memory.

The normal run is bounded to about a minute. Set ``WORKBOOK_FUZZ=long`` (or run
``make fuzz``) for the long profile a nightly job runs; ``WORKBOOK_FUZZ_STATS=<file>``
writes the counts (cases, outcomes by exit code, slowest case) as JSON.

The expected outcomes are the command line's contract (``workbook/cli.py``: 0 all is
well, 1 a check did not pass, 2 bad input) and the hardening rules of DEVELOPERS.md.
"""

from __future__ import annotations

import atexit
import contextlib
import io
import json
import os
import re
import resource
import signal
import tempfile
import time
from pathlib import Path

import pytest
from hypothesis import HealthCheck, given, settings
from hypothesis import strategies as st

from workbook import cli
from workbook.record import store

PROFILE = os.environ.get("WORKBOOK_FUZZ", "normal")
#: examples per fuzz test: (design files, records)
EXAMPLES = {"normal": (150, 300), "long": (5000, 10000)}[PROFILE]
CASE_SECONDS = 60
MAX_RSS_MB = 3000
RAW_CONTROL = re.compile(r"[\x00-\x08\x0b-\x1f\x7f-\x9f\u200b-\u200f\u202a-\u202e\u2066-\u2069\ufeff]")
#: the normal run is the same every time (derandomised); the long profile explores afresh
FUZZ = dict(deadline=None, derandomize=PROFILE == "normal", database=None, suppress_health_check=list(HealthCheck))

DESIGN = """\
[machine]
name = "BT-2 bin tipper"
revision = "A"
author = "M. Lindqvist"

[defaults.oil]
nu40 = "46 cSt"
nu100 = "6.8 cSt"

[axes.lift]
title = "Lift"

[axes.lift.cylinder]
bore = "80 mm"
rod = "45 mm"
stroke = "1200 mm"

[axes.lift.flow_valve]
arrangement = "meter-in"
direction = "retract"
setting = "16.5 L/min"

[axes.lift.holding]
kind = "counterbalance"
setting = "30 bar"
pilot_ratio = 3

[axes.lift.operation]
loads = ["2 kN", "5.5 kN", "9 kN"]
friction = "0.4 kN"

[axes.tip.cylinder]
bore = "63 mm"
rod = "36 mm"

[axes.tip.holding]
kind = "none"

[axes.tip.operation]
loads = ["6 kN", "-3 kN"]

[axes.tip.study]
points = 40
"""

HOSTILE_VALUES = [
    "1 mm**9**9**9", "1 mm**(9**9)", "1e400 mm", "nan mm", "-inf bar", "1e303 kN", "80 bar", "3 deg", "0x10 mm",
    "1" * 400, "1 " + "m" * 300, "", " ", "80 mm)", "80 mm**", "(", "1/0 mm", "1e-400 mm", "20.5", "-80 mm",
    "80\\u0000 mm", "80\\u200b mm", "\\u202e80 mm", "\\u001b[2J", "80 \\ud800", "1.0000000000000002 kN",
    "5e4 kN", "-5e4 kN", "1e5 kN", "900 bar", "0 L/min", "60 cSt", "20.5 %", "1e-300 mm", "4e-324 kN",
]
HOSTILE_KEYS = ['"old/../../../escaped"', '".."', '"a\\u0000b"', '"\\u001b[2J"', '"' + "k" * 200 + '"',
                '"lift.json"', '"con"', '"x y"', '"\\u202etip"', "lift", "tip", "nope"]
HOSTILE_LINES = [
    "x = " + "[" * 300 + "]" * 300, '[axes."../up".cylinder]', "[defaults.oil]", 'nu100 = "60 cSt"',
    'friction = "1e5 kN"', "[axes.lift.study]", 'load_min = "1 kN"', 'load_max = "1.0000000000000002 kN"',
    "points = 20.5", "pilot_ratio = \"3 deg\"", "bore = 1e400", "bore = " + "9" * 500, "[[axes]]", "[machine]",
    'name = "\\u001b[1;32mALL CHECKS PASS"', "\ufeff", "a = {b = {c = {d = 1}}}", "loads = []",
    'setting = "900 bar"', 'kind = "back-pressure"', 'arrangement = "bleed-off"', 'inclination = "90 deg"',
    'mass = "1e7 kg"', 'rated_pressure = "1 bar"', 'temp_min = "-60 degC"', 'temp_max = "150 degC"',
]


# ---------------------------------------------------------------------------- bookkeeping
STATS: dict = {"profile": PROFILE, "cases": 0, "by_exit": {}, "slowest": {"seconds": 0.0, "case": ""},
               "by_test": {}}


def _write_stats():
    target = os.environ.get("WORKBOOK_FUZZ_STATS")
    if target and STATS["cases"]:
        Path(target).write_text(json.dumps(STATS, indent=2), encoding="utf-8")


atexit.register(_write_stats)


class CaseTimeout(Exception):
    """A fuzz case ran longer than :data:`CASE_SECONDS`."""


def _on_alarm(signum, frame):
    raise CaseTimeout(f"a case ran longer than {CASE_SECONDS} s")


def _run(test: str, argv: list, what: str, root: Path, allowed: list[Path]) -> int:
    """Run ``axisbook argv`` in this process under the bounds; return the exit code."""
    before = {p for p in root.rglob("*")}
    out, err = io.StringIO(), io.StringIO()
    previous = signal.signal(signal.SIGALRM, _on_alarm)
    signal.alarm(CASE_SECONDS)
    started = time.perf_counter()
    try:
        with contextlib.redirect_stdout(out), contextlib.redirect_stderr(err):
            code = cli.main([str(a) for a in argv])
    finally:
        signal.alarm(0)
        signal.signal(signal.SIGALRM, previous)
    seconds = time.perf_counter() - started
    STATS["cases"] += 1
    STATS["by_exit"][str(code)] = STATS["by_exit"].get(str(code), 0) + 1
    per_test = STATS["by_test"].setdefault(test, {})
    per_test[str(code)] = per_test.get(str(code), 0) + 1
    if seconds > STATS["slowest"]["seconds"]:
        STATS["slowest"] = {"seconds": round(seconds, 3), "case": what[:300]}
    STATS["seconds"] = round(STATS.get("seconds", 0.0) + seconds, 3)
    assert code in (0, 1, 2), f"exit {code} for {what}"
    printed = out.getvalue() + err.getvalue()
    assert not RAW_CONTROL.search(printed), f"raw control character printed for {what}: {printed[:300]!r}"
    if code == 2:
        assert err.getvalue().startswith("axisbook: error: ") and err.getvalue().count("\n") == 1, printed[-500:]
    new = {p for p in root.rglob("*")} - before
    stray = [p for p in new if not any(p == a or a in p.parents for a in allowed)]
    assert not stray, f"files written outside the output folder for {what}: {stray[:3]}"
    rss_mb = resource.getrusage(resource.RUSAGE_SELF).ru_maxrss / 1024
    assert rss_mb < MAX_RSS_MB, f"resident memory {rss_mb:.0f} MB after {what}"
    return code


# ---------------------------------------------------------------------------- design files
def _mutate_design(draw_ops, text: str) -> str:
    lines = text.split("\n")
    for op, a, b in draw_ops:
        if not lines:
            lines = [""]
        i = a % len(lines)
        if op == "value":
            line = lines[i]
            if "=" in line:
                key = line.split("=", 1)[0]
                value = HOSTILE_VALUES[b % len(HOSTILE_VALUES)]
                lines[i] = f"{key}= \"{value}\"" if b % 3 else f"{key}= [\"{value}\"]"
        elif op == "key":
            line = lines[i]
            new = HOSTILE_KEYS[b % len(HOSTILE_KEYS)]
            lines[i] = re.sub(r"axes\.(lift|tip)", lambda m: "axes." + new, line)
        elif op == "line":
            lines.insert(i, HOSTILE_LINES[b % len(HOSTILE_LINES)])
        elif op == "delete":
            del lines[i]
        elif op == "duplicate":
            lines.insert(i, lines[i])
        elif op == "char":
            line = lines[i]
            j = b % (len(line) + 1)
            lines[i] = line[:j] + chr(b % 0x110000) + line[j:]
        elif op == "truncate":
            joined = "\n".join(lines)
            lines = joined[: (a * 7919 + b) % (len(joined) + 1)].split("\n")
    return "\n".join(lines)


design_ops = st.lists(st.tuples(st.sampled_from(["value", "value", "key", "line", "delete", "duplicate", "char",
                                                 "truncate"]),
                                st.integers(0, 10 ** 6), st.integers(0, 10 ** 6)), min_size=1, max_size=4)


@settings(max_examples=EXAMPLES[0], **FUZZ)
@given(ops=design_ops, full=st.integers(0, 11), markdown=st.booleans(), name=st.sampled_from(["d", "bin-tipper.v2"]))
def test_fuzzed_design_files_end_in_a_documented_exit(ops, full, markdown, name):
    text = _mutate_design(ops, DESIGN)
    with tempfile.TemporaryDirectory() as tmp:
        root = Path(tmp)
        design = root / f"{name}.toml"
        design.write_bytes(text.encode("utf-8", "surrogatepass"))
        out = root / "out"
        argv = ["evaluate", design, "--out", out]
        if full:   # one case in twelve runs every study; the rest the design rules alone
            argv += ["--study", "axis-check"]
        if markdown:
            argv.append("--markdown")
        _run("design", argv, f"design mutations {ops} (all studies: {not full})", root, [out, design])


# ---------------------------------------------------------------------------- records
@pytest.fixture(scope="module")
def seed_record(tmp_path_factory):
    folder = tmp_path_factory.mktemp("fuzz-seed")
    design = folder / "d.toml"
    design.write_text(DESIGN.replace("points = 40", "points = 30"), encoding="utf-8")
    code = cli.main(["evaluate", str(design), "--out", str(folder / "out"), "--axis", "tip"])
    assert code in (0, 1)
    return (folder / "out" / "d-tip.json").read_text(encoding="utf-8")


RAW = ["1e400", "-1e400", "9" * 400, "-0.0", "1.7976931348623157e308", "5e-324", "null", "true", "\"\"",
       "\"\\u202e\"", "\"\\u001b[2J\"", "\"\\ud800\"", "\"smoots\"", "\"m)(\"", "\"bar\"", "\"deg\"",
       "[" * 2000 + "]" * 2000, "{}", "[]", "\"" + "x" * 200_000 + "\"", "[" + ",".join(["0"] * 50_000) + "]",
       "\"rod-pressure\"", "\"axis-check\"", "\"speed-vs-load\"", "\"no-such-kind\"", "\"fail\"", "\"pass\"",
       "1", "0", "-1", "2", "1e300", "\"https://example.com\""]


def _paths(node, prefix=()):
    """Every path of a JSON document, leaves and inner nodes."""
    yield prefix
    if isinstance(node, dict):
        for k, v in node.items():
            yield from _paths(v, prefix + (k,))
    elif isinstance(node, list):
        for i, v in enumerate(node[:40]):
            yield from _paths(v, prefix + (i,))


def _set(doc, path, value):
    node = doc
    for step in path[:-1]:
        node = node[step]
    node[path[-1]] = value


def _mutate_record(text: str, ops, resign: bool) -> str:
    doc = json.loads(text)
    doc.pop("digest", None)
    raws = {}
    for op, a, b in ops:
        paths = [p for p in _paths(doc) if p]
        path = paths[a % len(paths)]
        if op == "raw":
            token = f"@@RAW{len(raws)}@@"
            raws[token] = RAW[b % len(RAW)]
            _set(doc, path, token)
        elif op == "nudge":   # a plausible edit: a number scaled, a text changed (valid when re-signed)
            node = doc
            for step in path[:-1]:
                node = node[step]
            leaf = node[path[-1]]
            if isinstance(leaf, float) and not isinstance(leaf, bool):
                node[path[-1]] = leaf * (1 + (b % 7) / 4)
            elif isinstance(leaf, str):
                node[path[-1]] = leaf + f" (edited {b % 10})"
        elif op == "delete":
            node = doc
            for step in path[:-1]:
                node = node[step]
            del node[path[-1]]
        elif op == "extra":
            node = doc
            for step in path:
                if not isinstance(node[step], (dict, list)):
                    break
                node = node[step]
            if isinstance(node, dict):
                node[f"extra{b % 7}"] = b
    body = json.dumps(doc, ensure_ascii=True)
    digest_doc = json.loads(body)
    try:
        stamp = store.digest(digest_doc) if resign else "sha256:" + "0" * 64
    except (ValueError, UnicodeEncodeError):
        stamp = "sha256:" + "0" * 64
    doc["digest"] = stamp
    body = json.dumps(doc, indent=1, ensure_ascii=True)
    for token, raw in raws.items():
        body = body.replace(json.dumps(token), raw)
    return body


record_ops = st.lists(st.tuples(st.sampled_from(["raw", "raw", "nudge", "nudge", "delete", "extra"]),
                                st.integers(0, 10 ** 6),
                                st.integers(0, 10 ** 6)), min_size=1, max_size=3)


@settings(max_examples=EXAMPLES[1], **FUZZ)
@given(ops=record_ops, resign=st.booleans(), command=st.sampled_from(["export", "export", "markdown", "compare",
                                                                    "compare", "recheck"]),
       cut=st.one_of(st.none(), st.integers(0, 10 ** 7)), recheck_too=st.integers(0, 4))
def test_fuzzed_records_end_in_a_documented_exit(seed_record, ops, resign, command, cut, recheck_too):
    text = _mutate_record(seed_record, ops, resign)
    if cut is not None and cut % 5 == 0:
        text = text[: cut % (len(text) + 1)]
    if command == "recheck" and recheck_too:   # re-running the studies is slow: one recheck draw in five
        command = "export"
    with tempfile.TemporaryDirectory() as tmp:
        root = Path(tmp)
        out = root / "out"
        out.mkdir()
        seed = root / "seed-tip.json"
        seed.write_text(seed_record, encoding="utf-8")
        bad = out / "bad-tip.json"
        bad.write_bytes(text.encode("utf-8", "surrogatepass"))
        argv = {"export": ["export", bad], "markdown": ["export", bad, "--markdown", out / "bad.md"],
                "compare": ["compare", seed, bad], "recheck": ["recheck", bad]}[command]
        _run("record", argv, f"record mutations {ops} resigned {resign} cut {cut} via {command}", root, [out])


def test_the_fuzzer_tried_cases():
    """Runs after the two fuzz tests in file order: say what they tried (shown with -s or -rA)."""
    if not STATS["cases"]:
        pytest.skip("the fuzz tests did not run in this session")
    print("fuzz counts:", json.dumps(STATS))
    assert STATS["cases"] >= EXAMPLES[0] // 2
