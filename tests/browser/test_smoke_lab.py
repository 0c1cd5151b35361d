"""Smoke test of the harness: widgets and a live bokeh figure in JupyterLab.

The notebook is built here with nbformat and written into the server's
temporary root dir.  It shows a Text field, a Label and a bokeh figure
wrapped in ``jupyter_bokeh.BokehModel``; submitting a number in the field
rewrites the label and the figure's ColumnDataSource from the kernel.
"""

from __future__ import annotations

import time

import nbformat
import pytest
from lab import (
    assert_no_cell_errors,
    open_notebook,
    run_all_cells,
    screenshot,
    type_into_field,
    wait_for_idle,
    widget,
)

SETUP = """\
import ipywidgets as widgets
from bokeh.io import output_notebook
from bokeh.resources import INLINE

# BokehJS must be in the page before a BokehModel renders; INLINE serves it
# from the kernel instead of a CDN, so nothing leaves the machine.
output_notebook(resources=INLINE, hide_banner=True)
"""

BUILD = """\
from bokeh.models import ColumnDataSource
from bokeh.plotting import figure
from jupyter_bokeh import BokehModel

xs = [i / 4 for i in range(17)]
source = ColumnDataSource(data={"x": xs, "y": [x * x for x in xs]}, name="smoke-source")
fig = figure(width=520, height=320, title="smoke: y = k x^2", name="smoke-figure")
fig.line("x", "y", source=source, line_width=3, color="#1f6fb4")
fig.scatter("x", "y", source=source, size=7, color="#d2492a")

plot = BokehModel(fig)
plot.add_class("wb-smoke-plot")

gain = widgets.Text(value="1", description="Gain k", continuous_update=False)
gain.add_class("wb-smoke-gain")
status = widgets.Label(value="k = 1")
status.add_class("wb-smoke-status")


def on_gain(change):
    try:
        k = float(change["new"])
    except ValueError:
        status.value = f"not a number: {change['new']!r}"
        return
    source.data = {"x": xs, "y": [k * x * x for x in xs]}
    status.value = f"k = {k:g}, y max = {k * xs[-1] ** 2:g}"


gain.observe(on_gain, names="value")
widgets.VBox([gain, status, plot])
"""

JS_SOURCE_Y = """
() => {
  const B = window.Bokeh;
  if (!B || !B.documents) return null;
  for (const doc of B.documents) {
    const src = doc.get_model_by_name('smoke-source');
    if (src) return Array.from(src.get_column('y'));
  }
  return null;
}
"""

JS_INK = """
(canvas) => {
  const ctx = canvas.getContext('2d');
  const {width, height} = canvas;
  const data = ctx.getImageData(0, 0, width, height).data;
  let ink = 0;
  for (let i = 0; i < data.length; i += 4) {
    const a = data[i + 3], r = data[i], g = data[i + 1], b = data[i + 2];
    if (a > 0 && (r < 200 || g < 200 || b < 200)) ink++;
  }
  return {width, height, ink};
}
"""


def smoke_notebook():
    nb = nbformat.v4.new_notebook()
    nb.metadata["kernelspec"] = {
        "name": "python3",
        "display_name": "Python 3 (ipykernel)",
        "language": "python",
    }
    nb.cells = [nbformat.v4.new_code_cell(SETUP), nbformat.v4.new_code_cell(BUILD)]
    return nb


@pytest.fixture
def smoke_name(lab_server):
    return lab_server.write_notebook(smoke_notebook(), "smoke.ipynb")


def test_widgets_and_bokeh_render_and_react(lab_server, page, browser_log, smoke_name):
    t0 = time.monotonic()
    open_notebook(page, lab_server, smoke_name)
    t_open = time.monotonic()
    run_all_cells(page, via="menu")
    t_run = time.monotonic()

    gain = widget(page, "wb-smoke-gain")
    status = widget(page, "wb-smoke-status")
    plot = widget(page, "wb-smoke-plot")
    gain.wait_for(state="visible")
    status.wait_for(state="visible")
    plot.wait_for(state="visible")
    assert status.inner_text().strip() == "k = 1"

    # The figure drew: bokeh's canvas is there, sized, and has ink on it.
    canvas = plot.locator(".bk-Canvas canvas").first
    canvas.wait_for(state="visible")
    page.wait_for_function(
        "(c) => (" + JS_INK + ")(c).ink > 500", arg=canvas.element_handle(), polling=200
    )
    ink_before = canvas.evaluate(JS_INK)
    assert ink_before["width"] > 100 and ink_before["height"] > 100, ink_before
    assert ink_before["ink"] > 500, f"bokeh canvas looks blank: {ink_before}"
    assert page.evaluate(JS_SOURCE_Y)[-1] == pytest.approx(16.0)
    picture_before = canvas.screenshot()

    # Typing a number and pressing Enter goes through the kernel and back.
    type_into_field(page, "wb-smoke-gain", "0.5")
    page.wait_for_function(
        "() => { const e = document.querySelector('.wb-smoke-status');"
        " return e && e.textContent.includes('k = 0.5'); }"
    )
    assert status.inner_text().strip() == "k = 0.5, y max = 8"
    page.wait_for_function(
        "() => { const y = (" + JS_SOURCE_Y + ")(); return y && y[y.length - 1] === 8; }"
    )
    page.wait_for_timeout(300)  # let BokehJS repaint after the data patch
    assert canvas.screenshot() != picture_before, "figure did not redraw after new data"

    # The label field can also be found by its description text.
    type_into_field(page, "Gain k", "oops")
    page.wait_for_function(
        "() => document.querySelector('.wb-smoke-status').textContent.includes('not a number')"
    )
    wait_for_idle(page)
    assert_no_cell_errors(page)
    t_done = time.monotonic()

    shot = screenshot(page, "smoke_lab")
    assert shot.stat().st_size > 10_000

    browser_log.assert_clean()
    assert any("/api/kernels/" in url for url in browser_log.requests)
    print(
        f"\nsmoke timings: server start {lab_server.start_seconds:.1f} s, "
        f"open notebook {t_open - t0:.1f} s, run all {t_run - t_open:.1f} s, "
        f"interact {t_done - t_run:.1f} s; {len(browser_log.requests)} requests"
    )
