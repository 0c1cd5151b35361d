"""What a study panel shows, read off the rendered page and compared with the outcome.

The expected side is computed here, in the test process, from the same design file the
notebook opens (``workbook.design.load_design`` and ``workbook.studies.whole_axis.evaluate``,
the one evaluation path every panel, record and command goes through). The screen side is
read from the page only: the text of the verdict, findings and results tables, the data
sources and glyphs BokehJS draws (``Bokeh.index``), and the pixels of each plot frame.
Nothing here imports the panel or its table and figure code, so a panel that shows
something else than its outcome (a failing finding marked as passing, an invisible curve)
fails these checks.

The level marks are written out here as the panel is meant to show them: a mark and the
level's word, never colour alone (DESIGN.md: levels as a word and a mark).
"""

from __future__ import annotations

import copy
import math
import re
from pathlib import Path

import numpy as np
from lab import bokeh_figures, colour_distance, dominant_colour, frame_pixels, level_rows, pixels_near, table_rows, widget

#: the mark and word of each level, as the panel must show them
MARK = {"fail": "\u2717 FAIL", "caution": "\u25b2 CAUTION", "pass": "\u2713 PASS"}
#: numbers on screen carry 4 significant digits; margins 3 (whole percent from 1000 %)
NUMBER_REL = 5.001e-4
#: fewest pixels of the curves' colours a plot frame must show (a 2.5 px line across a
#: 650 px frame covers well over a thousand; the axes, grid, limit lines and labels none)
MIN_CURVE_PIXELS = 150


def expected_evaluation(design_path: Path, axis: str, overrides: dict | None = None):
    """The whole-axis evaluation of ``axis`` of the design file, with ``overrides``
    (``{"section.key": SI value}``) applied as if typed into the panel."""
    from workbook.design import load_design
    from workbook.studies.whole_axis import evaluate

    values = copy.deepcopy({k: dict(v) for k, v in load_design(design_path).axes[axis].values.items()})
    for name, si in (overrides or {}).items():
        section, key = name.split(".")
        values[section][key] = si
    return evaluate(values)


def shown_number(text: str) -> float | None:
    """The number a table cell starts with (``"267.3 bar"`` -> 267.3); None for a dash."""
    token = text.strip().split(" ")[0] if text.strip() else ""
    if token in ("", "\u2013"):
        return None
    if token in ("\u221e", "+\u221e"):
        return math.inf
    if token == "\u2013\u221e":
        return -math.inf
    return float(token)


def assert_number(shown: str, expected, what: str, rel: float = NUMBER_REL) -> None:
    got = shown_number(shown)
    if expected is None:
        assert got is None, f"{what}: screen shows {shown!r}, the outcome has no value"
        return
    assert got is not None, f"{what}: screen shows {shown!r}, the outcome has {expected!r}"
    if math.isinf(expected) or math.isinf(got):
        assert got == expected, f"{what}: screen {shown!r}, outcome {expected!r}"
        return
    assert abs(got - expected) <= rel * abs(expected) + 1e-12, f"{what}: screen {shown!r}, outcome {expected!r}"


def assert_margin(shown: str, margin, what: str) -> None:
    """A margin cell (``"+12.3 %"``) against the outcome's share (0.123)."""
    got = shown_number(shown)
    if margin is None:
        assert got is None, f"{what}: screen shows margin {shown!r}, the outcome has none"
        return
    assert got is not None and shown.strip().endswith("%"), f"{what}: margin {shown!r}, outcome {margin!r}"
    pct = margin * 100.0
    tol = 0.51 if abs(margin) >= 10 else 5.001e-3 * abs(pct) + 1e-9
    assert abs(got - pct) <= tol, f"{what}: screen margin {shown!r}, outcome {pct:+.4g} %"


def assert_mark(cell: str, level: str, what: str) -> None:
    assert cell == MARK[level], f"{what}: screen shows {cell!r}, the outcome's level is {level!r} ({MARK[level]!r})"


def _counts_text(counts) -> str:
    return f"{counts['fail']} fail, {counts['caution']} caution, {counts['pass']} pass"


def check_verdict(page, ev) -> int:
    """The whole-axis verdict on screen against ``ev.verdict()`` and every outcome's findings.
    Returns the number of rows compared."""
    v = ev.verdict()
    box = widget(page, "wb-verdict-box")
    every = [f for o in ev.outcomes.values() for f in o.findings]
    worst = "fail" if any(f["level"] == "fail" for f in every) else \
        "caution" if any(f["level"] == "caution" for f in every) or ev.refused else "pass"
    assert v.level == worst
    assert box.locator(".wb-verdict-level").inner_text().strip() == MARK[worst], "verdict mark"
    counts = box.locator(".wb-verdict-counts").inner_text().strip()
    assert counts == _counts_text(v.counts), f"verdict counts: screen {counts!r}, outcome {_counts_text(v.counts)!r}"
    rows = level_rows(box, "tr.wb-verdict-item")
    items = list(v.items)
    assert len(rows) == len(items) + len(v.incomplete), (len(rows), len(items), v.incomplete)
    for i, (row, item) in enumerate(zip(rows, items)):
        what = f"verdict row {i} ({item.text[:50]})"
        assert row["level"] == item.level, what
        assert_mark(row["cells"][0], item.level, what)
        assert row["cells"][1].startswith(item.text), (what, row["cells"][1][:120])
        assert_margin(row["cells"][2], item.margin, what)
        assert row["rules"] == " ".join(item.rule_ids), what
        # the level shown is the level the studies found for those rules
        found = {f["level"] for f in every if f["rule_id"] in item.rule_ids}
        assert item.level in found, (what, found)
    return len(rows)


def check_findings(page, outcome) -> int:
    """The study's findings table against ``outcome.findings``: level class, mark, rule,
    statement, value, limit and margin of every row, and the counts above the table."""
    box = widget(page, "wb-findings-box")
    want = {lvl: sum(1 for f in outcome.findings if f["level"] == lvl) for lvl in MARK}
    head = re.search(r"(\d+) fail, (\d+) caution, (\d+) pass", box.inner_text())
    assert head is not None, box.inner_text()[:200]
    assert head.group(0) == _counts_text(want), f"findings counts: screen {head.group(0)!r}, outcome {want}"
    rows = level_rows(box, "tr.wb-finding")
    assert len(rows) == len(outcome.findings), (len(rows), len(outcome.findings))
    for i, (row, f) in enumerate(zip(rows, outcome.findings)):
        what = f"finding {i} {f['rule_id']} ({f['level']})"
        cells = row["cells"]
        assert row["level"] == f["level"], what
        assert_mark(cells[0], f["level"], what)
        assert cells[1] == f["rule_id"], (what, cells[1])
        assert cells[2].startswith(f["statement"]), (what, cells[2][:120])
        assert_number(cells[3], f.get("value"), what + " value")
        assert_number(cells[4], f.get("limit"), what + " limit")
        assert_margin(cells[5], f.get("margin"), what)
    return len(rows)


def check_results(page, outcome) -> int:
    """Every row of the results table against ``outcome.results`` (label, number)."""
    rows = table_rows(widget(page, "wb-results-box"))
    want = list(outcome.results.values())
    assert len(rows) == len(want), (len(rows), len(want))
    for row, r in zip(rows, want):
        assert row[0] == r["label"], (row, r)
        value = r["value"]
        if isinstance(value, (int, float)) and not isinstance(value, bool):
            assert_number(row[1], float(value), f"result {r['label']}")
    return len(rows)


def _same_curve(drawn, expected) -> bool:
    got = np.array([np.nan if v is None else v for v in drawn], dtype=float)
    exp = np.asarray(expected, dtype=float).ravel()
    if got.shape != exp.shape:
        return False
    if not np.array_equal(np.isfinite(got), np.isfinite(exp)):
        return False
    ok = np.isfinite(exp)
    return bool(np.allclose(got[ok], exp[ok], rtol=1e-9, atol=0.0))


def check_figures(page, panel, outcome, pixels: bool = True) -> dict:
    """The figures BokehJS draws against ``outcome.figures``: one figure per outcome figure
    (by title), every series a named, visible line (alpha and width above zero) whose x and
    y columns are the outcome's curve (same length, a null exactly where the outcome has a
    gap, the same numbers), and, with ``pixels``, each plot frame showing the curves'
    colours on screen. Returns ``{title: pixels of the curves' colours in its frame}``."""
    drawn = [f for f in bokeh_figures(page) or [] if f["in_wb_plot"]]
    titles = [fig["title"] for fig in outcome.figures.values()]
    assert sorted(f["title"] for f in drawn) == sorted(titles), ([f["title"] for f in drawn], titles)
    plots = panel.locator(".wb-plots .wb-plot")
    ink = {}
    for idx, fig in enumerate(outcome.figures.values()):
        shown = next(f for f in drawn if f["title"] == fig["title"])
        colours = []
        finite_series = 0
        for name, ys in fig["series"].items():
            lines = [r for r in shown["renderers"] if r["name"] == name]
            assert len(lines) == 1, (fig["title"], name, [r["name"] for r in shown["renderers"]])
            line = lines[0]
            what = f"{fig['title']!r} series {name!r}"
            assert line["visible"] is True, what + " hidden"
            assert isinstance(line["line_alpha"], (int, float)) and line["line_alpha"] > 0, (what, line["line_alpha"])
            assert isinstance(line["line_width"], (int, float)) and line["line_width"] > 0, (what, line["line_width"])
            assert line["x"] is not None and line["y"] is not None, what + " has no x / y column"
            assert len(line["x"]) == len(fig["x"]) and len(line["y"]) == len(ys), \
                (what, len(line["x"]), len(line["y"]), len(fig["x"]))
            assert _same_curve(line["x"], fig["x"]), what + ": x is not the outcome's"
            assert _same_curve(line["y"], ys), what + ": y is not the outcome's"
            if sum(v is not None for v in line["y"]) >= 2:
                finite_series += 1
                colours.append(line["line_color"])
        assert finite_series >= 1, f"{fig['title']!r}: no series has two points to draw"
        if pixels:
            image = frame_pixels(page, plots.nth(idx), fig["title"])
            background = dominant_colour(image)
            for c in set(colours):
                # a curve drawn in (nearly) the frame's own colour is no curve the user sees
                assert colour_distance(c, background) > 100, (fig["title"], c, background)
            others = [c for c in set(shown["other_colours"]) if c not in colours]
            count = sum(pixels_near(image, c, foreign=others, background=background) for c in set(colours))
            ink[fig["title"]] = count
            assert count >= MIN_CURVE_PIXELS, \
                f"{fig['title']!r}: the plot frame shows {count} pixels of its curves' colours {sorted(set(colours))}"
    return ink


def check_screen(page, panel, ev, kind: str, pixels: bool = True) -> dict:
    """Verdict, findings, results and figures of the panel of study ``kind`` against ``ev``."""
    outcome = ev.outcomes[kind]
    counted = {"verdict rows": check_verdict(page, ev), "finding rows": check_findings(page, outcome),
               "result rows": check_results(page, outcome)}
    counted["curve pixels"] = check_figures(page, panel, outcome, pixels=pixels)
    return counted
