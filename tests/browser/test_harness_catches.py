"""The harness must be able to say no.

These tests feed it broken notebooks and check that the failure is seen:
a cell that raises, a widget that does not display, and a notebook that loads BokehJS from a CDN (the
request is blocked, recorded, and the figure does not render).
"""

from __future__ import annotations

import nbformat
import pytest
from lab import assert_offline, open_notebook, run_all_cells, widget

KERNELSPEC = {"name": "python3", "display_name": "Python 3 (ipykernel)", "language": "python"}


def notebook(*sources):
    nb = nbformat.v4.new_notebook()
    nb.metadata["kernelspec"] = dict(KERNELSPEC)
    nb.cells = [nbformat.v4.new_code_cell(src) for src in sources]
    return nb


def test_run_all_cells_reports_a_raising_cell(lab_server, page, browser_log):
    name = lab_server.write_notebook(
        notebook("x = 1", "1 / 0", "print('never reached')"), "raises.ipynb"
    )
    open_notebook(page, lab_server, name)
    with pytest.raises(AssertionError, match=r"cell 1: ZeroDivisionError"):
        run_all_cells(page)
    browser_log.assert_clean()


def test_run_all_cells_fails_on_a_widget_that_does_not_display(lab_server, page, browser_log):
    """A widget output whose model the front end never gets shows "Error displaying widget:
    model not found"; run_all_cells fails on it at once (no re-run hides a first-open failure)."""
    name = lab_server.write_notebook(
        notebook("from IPython.display import display\n"
                 "display({'application/vnd.jupyter.widget-view+json': "
                 "{'model_id': '0' * 32, 'version_major': 2, 'version_minor': 0}}, raw=True)"),
        "no-model.ipynb",
    )
    open_notebook(page, lab_server, name)
    with pytest.raises(AssertionError, match="a widget did not display on first open"):
        run_all_cells(page)


@pytest.mark.allow_offsite
def test_bokeh_from_cdn_is_blocked_and_reported(lab_server, page, browser_log):
    name = lab_server.write_notebook(
        notebook(
            "from bokeh.io import output_notebook\noutput_notebook(hide_banner=True)",
            "from bokeh.plotting import figure\nfrom jupyter_bokeh import BokehModel\n"
            "fig = figure(width=300, height=200)\nfig.line([0, 1], [0, 1])\n"
            "w = BokehModel(fig)\nw.add_class('wb-cdn-plot')\nw",
        ),
        "cdn.ipynb",
    )
    open_notebook(page, lab_server, name)
    run_all_cells(page)
    page.wait_for_timeout(2000)

    assert any("cdn.bokeh.org" in url for url in browser_log.blocked), browser_log.blocked
    with pytest.raises(AssertionError, match="cdn.bokeh.org"):
        browser_log.assert_offline()
    with pytest.raises(AssertionError, match="cdn.bokeh.org"):
        assert_offline(browser_log.requests)
    with pytest.raises(AssertionError):
        browser_log.assert_no_failed_requests()
    assert widget(page, "wb-cdn-plot").locator("canvas").count() == 0
