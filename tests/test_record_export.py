"""Markdown and HTML exports of the record.

Escaping is checked against the standard library's `html.escape(..., quote=True)`; the
structure of the HTML is read back with the standard library's `html.parser`.
"""

from __future__ import annotations

import html
import re
from html.parser import HTMLParser

import pytest

from workbook import CAUTION
from workbook.record import Record, Study, export_html, inputs_from_values, to_html, to_markdown

HOSTILE = "<script>alert(1)</script>"
QUOTED = "O'Neil \"the tipper\" & Sons <b>"


def _record():
    x = [0.0, 2.0, 4.0, 6.0, 8.0, 10.0]
    s = Study(
        "counterbalance", f"Counterbalance {HOSTILE}",
        inputs=inputs_from_values({"cylinder": {"bore": 0.08, "rod": 0.045}, "oil": {"grade": "VG46"},
                                   "operation": {"loads": [2e3, 9e3]}}),
        results={"p1": {"value": 17.9e5, "unit": "Pa", "label": f"cap pressure {QUOTED}"}},
        findings=[
            {"rule_id": "CB-SET", "statement": "setting above 1.3 x load pressure", "value": 30.0, "limit": 23.3,
             "unit": "bar", "margin": 0.29, "level": "pass", "source": "common practice"},
            {"rule_id": "HOSE", "statement": "rod pressure near the hose rating", "value": 240.0, "limit": 250.0,
             "unit": "bar", "margin": 0.04, "level": "caution", "source": "user's data sheet <hose>"},
            {"rule_id": "CAV", "statement": "cap side cavitates", "value": 0.1, "limit": 0.3, "unit": "bar",
             "margin": -0.67, "level": "fail", "source": "from memory", "detail": HOSTILE},
        ],
        figures={"speed": {"title": f"Lowering speed {HOSTILE}", "x_label": "load [kN]", "y_label": "speed [mm/s]",
                           "x": x, "series": {f"20 degC {QUOTED}": [100 - v for v in x],
                                              "60 degC": [None if v == 4 else 101 - v for v in x]},
                           "limits": {"target speed": 100.0, f"lowest {HOSTILE}": 85.0}}},
        notes=[HOSTILE, QUOTED],
    )
    return Record({"machine": QUOTED, "axis": HOSTILE, "author": "Zoë & Ana", "date": "2026-11-30"}, {"cb": s},
                  notes=[f"record note {HOSTILE}"])


class _Collect(HTMLParser):
    def __init__(self):
        super().__init__()
        self.tags, self.attrs, self.text = [], [], []

    def handle_starttag(self, tag, attrs):
        self.tags.append(tag)
        self.attrs += attrs

    def handle_data(self, data):
        self.text.append(data)


def test_html_escapes_everything_a_user_typed():
    page = to_html(_record())
    for raw in (HOSTILE, QUOTED):
        assert raw not in page
        assert html.escape(raw, quote=True) in page   # source: html.escape of the standard library
    assert "<script" not in page.lower()
    assert html.escape("user's data sheet <hose>", quote=True) in page


def test_html_is_self_contained_and_offline():
    page = to_html(_record())
    assert not re.search(r"https?://", page)
    parser = _Collect()
    parser.feed(page)
    assert "script" not in parser.tags and "link" not in parser.tags and "img" not in parser.tags
    assert not any(name in ("src", "href") for name, _ in parser.attrs)
    assert "@media print" in page and "@import" not in page and "url(" not in page
    assert parser.tags.count("svg") == 1


def test_caution_is_near_the_top_of_both_exports():
    r = _record()
    page = to_html(r)
    i = page.index(html.escape(CAUTION, quote=True))
    assert i < page.index("<main>") and i < page.index("<table")
    md = to_markdown(r)
    assert CAUTION.replace("'", "&#x27;") in "\n".join(md.splitlines()[:4])


def test_every_finding_shows_level_word_value_limit_margin_and_source():
    r = _record()
    page, md = to_html(r), to_markdown(r)
    for f in r.findings():
        assert html.escape(f["source"], quote=True) in page
        assert html.escape(f["source"], quote=True) in md
        assert {"pass": "PASS", "caution": "CAUTION", "fail": "FAIL"}[f["level"]] in page
    assert "23.3 bar" in page and "29 %" in page and "-67 %" in page


def test_inputs_are_shown_with_their_units_and_labels():
    page = to_html(_record())
    # the design inputs once, by label with value and unit as people write them; no internal key
    inputs = page[page.index('id="inputs"'):page.index("</section>", page.index('id="inputs"'))]
    assert "Bore D" in inputs and ">80 mm<" in inputs
    assert "2, 9 kN" in inputs and "VG46" in inputs
    assert "<code>bore</code>" not in page and ">bore<" not in page


def test_figures_are_inline_svg_with_dashed_labelled_limits():
    page = to_html(_record())
    svg = page[page.index("<svg"): page.index("</svg>")]
    assert svg.count("stroke-dasharray") >= 2                        # two limit lines (+ legend)
    assert "target speed 100" in svg
    assert html.escape(f"lowest {HOSTILE}", quote=True) in svg
    assert svg.count("<polyline") == 3                               # one series has a gap: two runs


def test_export_html_writes_the_page(tmp_path):
    r = _record()
    path = export_html(r, tmp_path / "lift.html")
    assert path.read_text(encoding="utf-8") == to_html(r)


def test_markdown_escapes_markup_and_html():
    md = to_markdown(_record())
    assert HOSTILE not in md and "&lt;script&gt;" in md
    assert "Zoë &amp; Ana" in md
    assert md.count("| ") > 10


@pytest.mark.parametrize("export", [to_html, to_markdown])
def test_exports_are_reproducible(export):
    assert export(_record()) == export(_record())


def test_motion_inputs_show_only_beside_the_motion_study():
    # the review copy says "every study of this record ran on these inputs": a section only the
    # axis-motion study reads is left out (and named as left out) when that study is absent
    values = {"cylinder": {"bore": 0.08}, "motion": {"ramp_open": 0.15, "impact_speed": 0.1}}
    steady = Record({"machine": "press", "axis": "ram"}, {"rp": Study("rod-pressure", "Rod-side pressure")},
                    inputs=inputs_from_values(values))
    moving = Record({"machine": "press", "axis": "ram"}, {"mo": Study("axis-motion", "The axis in motion")},
                    inputs=inputs_from_values(values))
    for export in (to_html, to_markdown):
        left_out, shown = export(steady), export(moving)
        assert "Directional valve opening ramp" not in left_out and "Bore D" in left_out
        assert "Not shown: Motion in time" in left_out
        assert "Directional valve opening ramp" in shown and "150 ms" in shown
        assert "Not shown" not in shown
