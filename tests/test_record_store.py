"""The JSON exchange form of the design record: round trip, digest, refusals, atomic write.

Sources of the expected behaviour: the JSON Schema Draft 2020-12 meta-schema (checked by the
`jsonschema` library), the SHA-256 of the standard library's `hashlib`, and the record
format documented in workbook/record/store.py (canonical JSON: keys sorted, separators
',' and ':').
"""

from __future__ import annotations

import dataclasses
import hashlib
import json
import math
import os
import tempfile
from pathlib import Path

import jsonschema
import pytest
from hypothesis import HealthCheck, given, settings
from hypothesis import strategies as st

from workbook.inputs import AXIS_SECTIONS, BY_KEY, SECTIONS
from workbook.record import Record, RecordError, Study, load, loads, record_schema, save, store, to_json

#: the sections a record holds once (the axis inputs); every other section stays with a study
AXIS_KEYS = {sec.key for sec in AXIS_SECTIONS if sec.key != "study"}

HOSTILE = ["<script>alert(1)</script>", "\"quoted\" & 'single'", "emoji \U0001F6A7", "back\\slash", "}]\"{",
           "line\nbreak\r\n", ""]
# control, zero-width and bidirectional characters are refused on save (tests/test_hardening.py)
chars = st.one_of(st.characters(exclude_categories=("Cc", "Cf", "Cs", "Zl", "Zp")), st.sampled_from("\n\r\t"))
texts = st.one_of(st.sampled_from(HOSTILE), st.text(chars, max_size=30))
floats = st.one_of(st.floats(allow_nan=False, allow_infinity=False),
                   st.sampled_from([5e-324, -5e-324, 1.7976931348623157e308, -0.0, 0.1 + 0.2, 1e-300]))


@st.composite
def input_entries(draw):
    """Random input entries for random catalogue fields (structure only; any finite floats)."""
    out = {}
    for sec in draw(st.lists(st.sampled_from(SECTIONS), max_size=3, unique_by=lambda s: s.key)):
        fields = draw(st.lists(st.sampled_from(sec.fields), max_size=4, unique_by=lambda f: f.key))
        entries = {}
        for f in fields:
            if f.dimension == "text":
                entries[f.key] = {"value": draw(texts)}
            elif f.dimension == "choice":
                entries[f.key] = {"value": draw(st.sampled_from(f.choices))}
            elif f.dimension == "flag":
                entries[f.key] = {"value": draw(st.booleans())}
            elif f.dimension == "quantity_list":
                n = draw(st.integers(1, 4))
                entries[f.key] = {"value": draw(st.lists(floats, min_size=n, max_size=n)), "unit": f.unit,
                                  "si": draw(st.lists(floats, min_size=n, max_size=n))}
            elif f.optional and draw(st.booleans()):
                entries[f.key] = {"value": None}
            else:
                entries[f.key] = {"value": draw(floats), "unit": f.unit, "si": draw(floats)}
        out[sec.key] = entries
    return out


levels = st.sampled_from(["pass", "caution", "fail"])
maybe_float = st.one_of(st.none(), floats)


@st.composite
def studies(draw):
    n = draw(st.integers(0, 6))
    x = draw(st.lists(floats, min_size=n, max_size=n))
    series = draw(st.dictionaries(texts, st.lists(st.one_of(st.none(), floats), min_size=n, max_size=n), max_size=2))
    return Study(
        kind=draw(st.text(chars, min_size=1, max_size=20).filter(lambda s: s.strip())),
        title=draw(texts),
        inputs=draw(input_entries()),
        results=draw(st.dictionaries(texts, st.fixed_dictionaries({"value": floats, "unit": texts, "label": texts}),
                                     max_size=3)),
        findings=draw(st.lists(st.fixed_dictionaries({
            "rule_id": texts, "statement": texts, "quantity": texts, "value": maybe_float, "limit": maybe_float,
            "unit": texts, "margin": maybe_float, "level": levels, "source": texts, "detail": texts}), max_size=3)),
        figures=draw(st.dictionaries(texts, st.fixed_dictionaries({
            "title": texts, "x_label": texts, "y_label": texts, "x": st.just(x), "series": st.just(series),
            "limits": st.dictionaries(texts, floats, max_size=2)}), max_size=2)),
        notes=draw(st.lists(texts, max_size=3)),
    )


@st.composite
def records(draw):
    identity = {f.key: draw(texts) for f in BY_KEY["identity"].fields}
    study_list = draw(st.lists(studies(), max_size=3))
    keys = draw(st.lists(st.text(chars, min_size=1, max_size=12).filter(lambda s: s.strip()), min_size=len(study_list),
                         max_size=len(study_list), unique=True))
    # one design per record: the axis inputs once, each study only its own settings
    axis_inputs = {sec: e for sec, e in draw(input_entries()).items() if sec in AXIS_KEYS}
    study_list = [dataclasses.replace(s, inputs={sec: e for sec, e in s.inputs.items() if sec not in AXIS_KEYS})
                  for s in study_list]
    return Record(identity, dict(zip(keys, study_list)), notes=draw(st.lists(texts, max_size=3)),
                  inputs=axis_inputs)


def _same_floats(a, b):
    """== plus bit-for-bit sameness of every float (so -0.0 and 0.0 differ)."""
    if isinstance(a, float):
        return isinstance(b, float) and math.copysign(1, a) == math.copysign(1, b) and a == b
    if isinstance(a, dict):
        return a.keys() == b.keys() and all(_same_floats(a[k], b[k]) for k in a)
    if isinstance(a, list):
        return len(a) == len(b) and all(_same_floats(x, y) for x, y in zip(a, b))
    return a == b


@settings(max_examples=60, deadline=None, suppress_health_check=[HealthCheck.too_slow, HealthCheck.data_too_large])
@given(records())
def test_any_record_survives_save_and_load_unchanged(record):
    with tempfile.TemporaryDirectory() as d:
        path = Path(d) / "axis.json"
        save(record, path)
        back = load(path)
    assert back == record
    assert _same_floats(back.to_dict(), record.to_dict())
    assert list(back.studies) == list(record.studies)   # study order is content


def test_shipped_schema_is_valid_draft_2020_12():
    # source: the Draft 2020-12 meta-schema, via jsonschema
    jsonschema.Draft202012Validator.check_schema(record_schema())
    shipped = json.loads((Path(store.__file__).parent / "schema" / "record-1.json").read_text(encoding="utf-8"))
    jsonschema.Draft202012Validator.check_schema(shipped)
    assert shipped["$schema"] == "https://json-schema.org/draft/2020-12/schema"


def _demo_record():
    from workbook.record import inputs_from_values
    s = Study("restrictor-sizing", "Lowering", inputs=inputs_from_values({"cylinder": {"bore": 0.08, "rod": 0.045}}),
              results={"q": {"value": 5.0265e-4, "unit": "m**3/s", "label": "Cap outflow"}},
              findings=[{"rule_id": "P1", "statement": "cap pressure below rating", "value": 18.0, "limit": 210.0,
                         "unit": "bar", "margin": 0.914, "level": "pass", "source": "user's data sheet"}])
    return Record({"machine": "BT-2 bin tipper", "axis": "lift", "date": "2026-11-30"}, {"sizing": s})


def test_saved_file_is_valid_and_its_digest_follows_the_documented_recipe(tmp_path):
    path = save(_demo_record(), tmp_path / "lift.json")
    doc = json.loads(path.read_text(encoding="utf-8"))
    jsonschema.validate(doc, record_schema(), cls=jsonschema.Draft202012Validator)
    stored = doc.pop("digest")
    # source: hashlib.sha256 over the canonical JSON described in store.py
    canonical = json.dumps(doc, sort_keys=True, separators=(",", ":"), ensure_ascii=False).encode("utf-8")
    assert stored == "sha256:" + hashlib.sha256(canonical).hexdigest()


def _non_ascii_record():
    from workbook.record import inputs_from_values
    s = Study("restrictor-sizing", "Absenken: Drossel Ø 1,4 mm",
              inputs=inputs_from_values({"cylinder": {"bore": 0.08, "rod": 0.045}}),
              results={"q": {"value": 5.0265e-4, "unit": "m**3/s", "label": "Abfluss Kolbenseite (kalt, 20 °C)"}},
              findings=[{"rule_id": "P1", "statement": "Druck unter der Nenngröße ±0 %", "value": 18.0,
                         "limit": 210.0, "unit": "bar", "margin": 0.914, "level": "pass",
                         "source": "Datenblatt des Herstellers; 油圧 \U0001F6A7"}],
              notes=["Öl: VG46, ν40 = 46 mm²/s", "Hubvolumen 6032 cm³"])
    return Record({"machine": "Kipper für Müllbehälter", "axis": "lift", "author": "Åsa Ødegård",
                   "date": "2026-11-30"}, {"sizing": s})


def test_digest_recipe_holds_for_a_non_ascii_record(tmp_path):
    """The recipe on text beyond ASCII: the canonical JSON keeps the characters themselves
    (``ensure_ascii=False``), encoded as UTF-8 (RFC 3629), and the digest is the SHA-256 of
    those bytes, here computed by coreutils' ``sha256sum`` outside Python as well."""
    import shutil
    import subprocess

    path = save(_non_ascii_record(), tmp_path / "lift.json")
    doc = json.loads(path.read_text(encoding="utf-8"))
    stored = doc.pop("digest")
    canonical = json.dumps(doc, sort_keys=True, separators=(",", ":"), ensure_ascii=False).encode("utf-8")
    # the characters themselves, not \u escapes: Ø is C3 98, ü C3 BC, ° C2 B0, ³ C2 B3, 油 E6 B2 B9,
    # 🚧 F0 9F 9A A7 (RFC 3629, and the code points from the Unicode code charts)
    for raw in (b"\xc3\x98 1,4 mm", b"f\xc3\xbcr", b"20 \xc2\xb0C", b"cm\xc2\xb3", b"\xe6\xb2\xb9",
                b"\xf0\x9f\x9a\xa7"):
        assert raw in canonical, raw
    assert b"\\u" not in canonical
    # source: hashlib.sha256 over the canonical JSON described in store.py
    assert stored == "sha256:" + hashlib.sha256(canonical).hexdigest()
    if shutil.which("sha256sum"):
        out = subprocess.run(["sha256sum"], input=canonical, capture_output=True, check=True).stdout
        assert stored == "sha256:" + out.split()[0].decode("ascii")
    assert load(path) == _non_ascii_record()


def test_digest_of_a_small_non_ascii_document_by_hand():
    """A known answer: the canonical bytes written out by hand (keys sorted, no spaces, UTF-8
    per RFC 3629: é = C3 A9, Ø = C3 98), hashed outside the code under test."""
    canonical = b'{"a":"\xc3\x98 80 mm","b":["\xc3\xa9",1.5]}'
    expected = "sha256:" + hashlib.sha256(canonical).hexdigest()
    assert store.digest({"b": ["é", 1.5], "a": "Ø 80 mm"}) == expected
    # an escaped form (ensure_ascii=True) would hash other bytes: the recipe is not that
    assert store.digest({"b": ["é", 1.5], "a": "Ø 80 mm"}) != \
        "sha256:" + hashlib.sha256(b'{"a":"\\u00d8 80 mm","b":["\\u00e9",1.5]}').hexdigest()


def _edit(path, change):
    doc = json.loads(path.read_text(encoding="utf-8"))
    change(doc)
    path.write_text(json.dumps(doc, indent=2), encoding="utf-8")


def test_an_edited_value_is_refused_as_tampered(tmp_path):
    path = save(_demo_record(), tmp_path / "lift.json")
    _edit(path, lambda d: d["inputs"]["cylinder"]["bore"].update(value=81.0))
    with pytest.raises(RecordError, match="the content no longer matches its digest: it was edited or damaged"):
        load(path)
    path = save(_demo_record(), tmp_path / "lift.json")
    _edit(path, lambda d: d["identity"].update(author="someone else"))
    with pytest.raises(RecordError) as info:
        load(path)
    assert str(info.value).startswith("lift.json, digest: ")


def test_an_unknown_schema_version_is_refused_saying_which(tmp_path):
    path = save(_demo_record(), tmp_path / "lift.json")
    _edit(path, lambda d: d.update(schema_version=7))
    with pytest.raises(RecordError) as info:
        load(path)
    msg = str(info.value)
    assert "schema version 7" in msg and "allowed: schema version 1" in msg


def test_truncated_empty_and_non_json_files_are_refused(tmp_path):
    text = to_json(_demo_record())
    (tmp_path / "cut.json").write_text(text[: len(text) // 2], encoding="utf-8")
    with pytest.raises(RecordError, match=r"cut\.json: got a file that ends early .*truncated"):
        load(tmp_path / "cut.json")
    (tmp_path / "empty.json").write_text("", encoding="utf-8")
    with pytest.raises(RecordError, match=r"empty\.json: got an empty file"):
        load(tmp_path / "empty.json")
    (tmp_path / "notes.json").write_text("bore = 80 mm\n", encoding="utf-8")
    with pytest.raises(RecordError, match=r"notes\.json: got text that is not JSON.*line 1, column 1"):
        load(tmp_path / "notes.json")
    (tmp_path / "bin.json").write_bytes(b"\xff\xfe{}")
    with pytest.raises(RecordError, match="not UTF-8"):
        load(tmp_path / "bin.json")
    with pytest.raises(RecordError, match="a JSON list, not an object"):
        loads("[1, 2]", "list.json")
    with pytest.raises(RecordError, match="NaN is not a number JSON allows"):
        loads('{"schema_version": NaN}', "nan.json")
    with pytest.raises(RecordError, match="appears twice"):
        loads('{"notes": [], "notes": []}', "dup.json")
    with pytest.raises(RecordError, match="no such file"):
        load(tmp_path / "absent.json")


def test_a_record_missing_a_required_part_is_refused_naming_the_part(tmp_path):
    def drop(part, where=lambda d: d):
        path = save(_demo_record(), tmp_path / "lift.json")

        def change(d):
            d.pop("digest")
            if part != "digest":
                del where(d)[part]  # a fresh digest, so that only the schema can object
                d["digest"] = store.digest(d)
        _edit(path, change)
        with pytest.raises(RecordError) as info:
            load(path)
        return str(info.value)

    assert "required part 'identity'" in drop("identity")
    msg = drop("results", lambda d: d["studies"][0])
    assert msg.startswith("lift.json, studies.sizing: ") and "required part 'results'" in msg
    msg = drop("source", lambda d: d["studies"][0]["findings"][0])
    assert "studies.sizing.findings[0]" in msg and "'source'" in msg
    msg = drop("digest")
    assert "required part 'digest'" in msg


def test_a_part_the_catalogue_does_not_know_is_refused(tmp_path):
    path = save(_demo_record(), tmp_path / "lift.json")

    def change(d):
        d["inputs"]["cylinder"]["bore_size"] = {"value": 80.0, "unit": "mm"}
        d.pop("digest")
        d["digest"] = store.digest(d)
    _edit(path, change)
    with pytest.raises(RecordError, match=r"lift.json, inputs\.cylinder.*'bore_size' was unexpected"):
        load(path)


class Injected(OSError):
    pass


def test_a_failure_between_write_and_rename_leaves_the_previous_record(tmp_path, monkeypatch):
    path = tmp_path / "lift.json"
    old = _demo_record()
    save(old, path)
    new = old.with_note("second revision")

    def fail(src, dst):
        assert Path(src).read_text(encoding="utf-8") == to_json(new)  # the new text was fully written
        raise Injected("disk pulled out (injected)")
    monkeypatch.setattr(store, "_replace", fail)
    with pytest.raises(Injected):
        save(new, path)
    assert load(path) == old
    assert sorted(os.listdir(tmp_path)) == ["lift.json"]          # no temporary file behind


def test_a_failure_while_writing_leaves_no_file(tmp_path, monkeypatch):
    def fail(fd):
        raise Injected("fsync failed (injected)")
    monkeypatch.setattr(store.os, "fsync", fail)
    with pytest.raises(Injected):
        save(_demo_record(), tmp_path / "new.json")
    assert os.listdir(tmp_path) == []


def test_save_writes_what_load_reads_and_replaces_the_old_file(tmp_path):
    path = tmp_path / "lift.json"
    save(_demo_record(), path)
    newer = _demo_record().with_note("after review")
    save(newer, path)
    assert load(path) == newer and load(path).notes == ["after review"]


def test_the_json_exchange_form_carries_the_caution(tmp_path):
    """Every exported record carries the safety caution (ISO 4413 and a qualified engineer),
    the JSON exchange form included; one stripped of it is refused by the shipped schema."""
    from workbook import CAUTION

    path = save(_demo_record(), tmp_path / "r.json")
    document = json.loads(path.read_text(encoding="utf-8"))
    assert document["caution"] == CAUTION and "ISO 4413" in document["caution"]
    del document["caution"]
    document.pop("digest")
    document["digest"] = store.digest(document)
    with pytest.raises(RecordError, match="caution"):
        loads(json.dumps(document), "stripped.json")


def _v1_document(bores):
    """A record as schema version 1 stored it: every study held every axis input."""
    from workbook.record import inputs_from_values

    studies = []
    for n, bore in enumerate(bores):
        entries = inputs_from_values({"cylinder": {"bore": bore, "rod": 0.045}, "study": {"points": 200}})
        studies.append({"key": f"s{n}", "kind": "axis-check", "title": "", "inputs": entries, "results": {},
                        "findings": [], "figures": {}, "notes": []})
    doc = {"schema_version": 1, "library_version": "0.1.0", "caution": "Caution: take care.",
           "identity": {"machine": "BT-2", "axis": "lift"}, "studies": studies, "notes": []}
    doc["digest"] = store.digest(doc)
    return json.dumps(doc)


def test_a_version_1_record_is_migrated_to_one_block_of_axis_inputs():
    rec = loads(_v1_document([0.08, 0.08]), "old.json")
    assert rec.schema_version == 2 and "Migrated from record schema version 1" in rec.notes[-1]
    assert rec.inputs["cylinder"]["bore"]["si"] == 0.08
    assert all(set(s.inputs) == {"study"} for s in rec.studies.values())
    assert rec.study_values("s1")["cylinder"]["bore"] == 0.08 and rec.study_values("s1")["study"]["points"] == 200
    assert json.loads(to_json(rec))["schema_version"] == 2


def test_a_version_1_record_that_mixes_designs_is_refused_with_how_to_regenerate_it():
    with pytest.raises(RecordError) as info:
        loads(_v1_document([0.08, 0.0762]), "old.json")
    text = str(info.value)
    assert text.startswith("old.json, studies.s1.inputs.cylinder.bore")
    assert "76.2 mm" in text and "80 mm" in text and "one design per axis record" in text
    assert "axisbook evaluate" in text


def test_a_record_refuses_a_study_run_on_another_design():
    from workbook.errors import InputError
    from workbook.record import inputs_from_values

    a = Study("axis-check", inputs=inputs_from_values({"cylinder": {"bore": 0.08}}))
    b = Study("rod-pressure", inputs=inputs_from_values({"cylinder": {"bore": 0.1}}))
    rec = Record({"axis": "lift"}).with_study(a)
    with pytest.raises(InputError, match="one design per axis record"):
        rec.with_study(b)


@pytest.fixture(scope="module")
def demo_records(tmp_path_factory):
    """The demo design (demo scenario) evaluated with every study, as the command line saves it."""
    from workbook.design import load_design
    from workbook.review import evaluate_design

    out = tmp_path_factory.mktemp("demo-records")
    design = load_design(Path(__file__).resolve().parents[1] / "notebooks" / "designs" / "bin-tipper.toml")
    return {axis: save(rec, out / f"bin-tipper-{axis}.json") for axis, (rec, _o) in evaluate_design(design).items()}


def _significant_digits(x: float) -> int:
    mantissa = repr(float(x)).lower().split("e")[0].lstrip("-").replace(".", "").lstrip("0").rstrip("0")
    return len(mantissa)


def test_demo_records_are_small_and_read_line_by_line(demo_records):
    for axis, path in demo_records.items():
        text = path.read_text(encoding="utf-8")
        assert len(text.encode("utf-8")) <= 100_000, (axis, len(text))
        # one input a line: a changed bore moves one line of the file
        assert sum('"bore": {"value": ' in line for line in text.splitlines()) == 1
        # load, then save again: the same bytes
        assert to_json(load(path)) == text


def test_no_stored_display_value_carries_float_noise(demo_records):
    """A value typed as "36 mm" is stored as 36, not 36.00000000000001: every display value
    of an input has at most 12 significant digits, as do results and finding numbers."""
    for path in demo_records.values():
        doc = json.loads(path.read_text(encoding="utf-8"))
        numbers = []
        for sec in doc["inputs"].values():
            for entry in sec.values():
                v = entry["value"]
                numbers += v if isinstance(v, list) else [v] if isinstance(v, (int, float)) and not \
                    isinstance(v, bool) else []
        for study in doc["studies"]:
            numbers += [r["value"] for r in study["results"].values()]
            numbers += [f[k] for f in study["findings"] for k in ("value", "limit", "margin") if f[k] is not None]
        assert numbers and all(_significant_digits(v) <= 12 for v in numbers), \
            [v for v in numbers if _significant_digits(v) > 12][:5]
        assert doc["inputs"]["cylinder"]["rod"]["value"] in (45.0, 36.0)
