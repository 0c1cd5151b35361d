"""Live bokeh figures that update by changing their data, never by re-rendering.

A :class:`LivePlot` owns one bokeh figure with a named line per series (each with its own
colour and dash pattern, so lines that coincide can still be told apart in print), dashed
rating or target lines labelled at the right edge and always inside the plotted range, a
hover readout with units, and a legend beside the plot where it hides no curve. Points whose
regime is not the normal one for the curve are overdrawn dotted, so the regime can be read
along the curve; the hover names the regime of every point.

Figures reach the notebook through :class:`jupyter_bokeh.BokehModel`, which uses the
BokehJS that :func:`workbook.ui.panel.load_bokehjs` put into the page from the installed
bokeh package (no CDN).
"""

from __future__ import annotations

import math
from typing import Mapping, Sequence

import numpy as np

#: Okabe-Ito colour-blind-safe palette (Okabe and Ito, 2008), one entry per series
PALETTE = ("#0072B2", "#D55E00", "#009E73", "#CC79A7", "#E69F00", "#56B4E9", "#000000")
#: one dash pattern per series (dotted is kept for "not the normal regime")
DASHES = ("solid", [10, 4], [14, 4, 3, 4], [6, 3], [18, 5], [3, 3, 12, 3], [8, 2, 2, 2, 2, 2])
LIMIT_COLOUR = "#8a0010"


class LivePlot:
    """A bokeh figure with named series whose data can be replaced in place.

    Parameters
    ----------
    title, x_label, y_label : str
        Words on the figure.
    x_unit, y_unit : str
        Units shown in the axis labels and the hover readout.
    series : sequence of str
        Names of the lines, in legend order.
    limits : sequence of str
        Names of horizontal limit lines (ratings, targets).
    normal_regime : str or None
        Regime label drawn plain; other regimes are overdrawn dotted.
    """

    def __init__(self, title: str, x_label: str, x_unit: str, y_label: str, y_unit: str,
                 series: Sequence[str], limits: Sequence[str] = (), normal_regime: str | None = None,
                 width: int = 900, height: int = 340):
        from bokeh.models import BoxAnnotation, ColumnDataSource, HoverTool, Label, Legend, Span
        from bokeh.plotting import figure

        self.series = tuple(series)
        self.limit_names = tuple(limits)
        self.normal_regime = normal_regime
        fig = figure(title=title, width=width, height=height, tools="pan,box_zoom,wheel_zoom,reset,save",
                     x_axis_label=f"{x_label} [{x_unit}]", y_axis_label=f"{y_label} [{y_unit}]",
                     toolbar_location="below")   # never over a long title
        fig.title.text_font_size = "12pt"
        self.sources = {}
        items = []
        hover_renderers = []
        for i, name in enumerate(self.series):
            colour = PALETTE[i % len(PALETTE)]
            src = ColumnDataSource({"x": [], "y": [], "y_alt": [], "regime": []})
            line = fig.line("x", "y", source=src, line_width=2.5, color=colour, line_dash=DASHES[i % len(DASHES)])
            fig.line("x", "y_alt", source=src, line_width=5, color=colour, line_dash="dotted", alpha=0.9)
            self.sources[name] = src
            items.append((name, [line]))
            hover_renderers.append(line)
        # the limits as invisible points, so the automatic range always includes them
        self.limit_source = ColumnDataSource({"x": [], "y": []})
        fig.scatter("x", "y", source=self.limit_source, alpha=0.0, size=1)
        self.limit_spans = {}
        self.limit_labels = {}
        for name in self.limit_names:
            span = Span(location=0, dimension="width", line_color=LIMIT_COLOUR, line_dash="dashed",
                        line_width=1.5, visible=False)
            fig.add_layout(span)
            # on a white box, so a curve under the label never hides it
            label = Label(x=0, y=0, text=name, text_font_size="9pt", text_color=LIMIT_COLOUR,
                          text_align="right", text_baseline="bottom", visible=False,
                          background_fill_color="white", background_fill_alpha=0.85)
            fig.add_layout(label)
            self.limit_spans[name] = span
            self.limit_labels[name] = label
        # one shaded x range (a regime band, e.g. a throttle's transition band), hidden when absent
        self.band = BoxAnnotation(left=0, right=0, fill_color="#999999", fill_alpha=0.18, visible=False)
        fig.add_layout(self.band)
        self.band_label = Label(x=0, y=0, y_units="screen", text="", text_font_size="9pt", text_color="#444444",
                                text_font_style="italic", visible=False)
        fig.add_layout(self.band_label)
        legend = Legend(items=items, click_policy="hide", label_text_font_size="10pt",
                        title="dotted: not simply metering" if normal_regime else None,
                        title_text_font_size="9pt", title_text_font_style="italic")
        fig.add_layout(legend, "right")
        fig.add_tools(HoverTool(renderers=hover_renderers, tooltips=[
            ("series", "$name"),
            (x_label, f"@x{{0.[000]}} {x_unit}"),
            (y_label, f"@y{{0.[000]}} {y_unit}"),
            ("regime", "@regime"),
        ], mode="mouse"))
        for name, line in zip(self.series, hover_renderers):
            line.name = name
        self.figure = fig
        self._widget = None

    @property
    def widget(self):
        """The figure as a live Jupyter widget (created on first use)."""
        if self._widget is None:
            from jupyter_bokeh import BokehModel

            self._widget = BokehModel(self.figure)
            self._widget.add_class("wb-plot")
        return self._widget

    def set_title(self, title: str) -> None:
        """Change the title (only when it changed: every change travels to the page)."""
        if self.figure.title.text != title:
            self.figure.title.text = title

    def update(self, x, ys: Mapping[str, np.ndarray], regimes: Mapping[str, Sequence[str]] | None = None,
               limits: Mapping[str, float] | None = None, xs: Mapping[str, np.ndarray] | None = None,
               title: str | None = None, bands: Mapping[str, Sequence[float]] | None = None) -> None:
        """Replace the data of every series (and the limit lines and the shaded band) in place."""
        if title is not None:
            self.set_title(title)
        band = next(iter((bands or {}).items()), None)
        if band is None:
            if self.band.visible:
                self.band.visible = self.band_label.visible = False
        else:
            name, (lo, hi) = band
            if (self.band.left, self.band.right, self.band_label.text) != (lo, hi, name) or not self.band.visible:
                self.band.left, self.band.right, self.band.visible = float(lo), float(hi), True
                self.band_label.x, self.band_label.y = float(lo), 4
                self.band_label.text, self.band_label.visible = f"shaded: {name}", True
        x_hi = -math.inf
        x_lo = math.inf
        for name in self.series:
            src = self.sources[name]
            if name not in ys:
                src.data = {"x": [], "y": [], "y_alt": [], "regime": []}
                continue
            xx = np.asarray(xs[name] if xs and name in xs else x, dtype=float)
            y = np.asarray(ys[name], dtype=float)
            if xx.size and np.isfinite(xx).any():
                x_hi = max(x_hi, float(np.nanmax(xx)))
                x_lo = min(x_lo, float(np.nanmin(xx)))
            reg = list(regimes[name]) if regimes and name in regimes else [""] * len(y)
            alt = np.full_like(y, np.nan)
            if self.normal_regime is not None and regimes and name in regimes:
                off = np.array([r != self.normal_regime for r in reg])
                # widen by one point each side so short dotted runs stay visible and joined
                grow = off | np.roll(off, 1) | np.roll(off, -1)
                grow[0] = off[0] or (len(off) > 1 and off[1])
                grow[-1] = off[-1] or (len(off) > 1 and off[-2])
                alt = np.where(grow, y, np.nan)
            # numpy arrays travel to the browser as binary buffers, far cheaper than lists
            src.data = {"x": xx, "y": _clean(y), "y_alt": _clean(alt), "regime": reg}
        shown = {k: float(v) for k, v in (limits or {}).items()
                 if k in self.limit_spans and v is not None and math.isfinite(v)}
        if shown and math.isfinite(x_hi):
            values = list(shown.values())
            self.limit_source.data = {"x": np.full(len(values), x_lo), "y": np.array(values)}
        for name, value in shown.items():
            span, label = self.limit_spans[name], self.limit_labels[name]
            if span.location != value or not span.visible:  # only what changed is sent
                span.location = value
                span.visible = True
                label.y = value
                label.visible = True
            if math.isfinite(x_hi) and label.x != x_hi:
                label.x = x_hi

    def data(self, name: str) -> dict:
        """The current data of one series as lists (for tests and benchmarks)."""
        return {k: (v.tolist() if isinstance(v, np.ndarray) else list(v)) for k, v in self.sources[name].data.items()}


def _clean(values: np.ndarray) -> np.ndarray:
    """Float array for bokeh with NaN kept as NaN (a gap in the line) and no infinities."""
    return np.where(np.isfinite(values), values, np.nan).astype(float)


__all__ = ["LivePlot", "PALETTE", "DASHES"]
