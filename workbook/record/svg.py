"""Line charts as inline SVG from a figure's stored curve data (no plotting library).

Series are drawn as solid lines, each with its own marker shape so that they can be told
apart in black-and-white print; limit lines are dashed and carry their label. All text is
escaped. Axis ticks use Heckbert's "nice numbers" (Graphics Gems, 1990).

>>> fig = {"title": "Speed", "x_label": "load [kN]", "y_label": "speed [mm/s]",
...        "x": [0.0, 1.0, 2.0], "series": {"20 degC": [1.0, 2.0, None]}, "limits": {"max": 2.5}}
>>> svg = line_chart(fig)
>>> svg.startswith("<svg") and "stroke-dasharray" in svg and "<script" not in svg
True
"""

from __future__ import annotations

import html
import math

ACCENT = "#1d5b79"
_COLOURS = ("#000000", ACCENT, "#555555", ACCENT, "#000000", "#555555")
_MARKERS = ("circle", "square", "triangle", "diamond", "cross", "bar")
W, H = 640, 340
LEFT, RIGHT, TOP, BOTTOM = 70, 16, 16, 48


def _esc(text) -> str:
    return html.escape(str(text), quote=True)


def _nice(x: float, round_: bool) -> float:
    if x <= 0:
        return 1.0
    exp = math.floor(math.log10(x))
    f = x / 10 ** exp
    if round_:
        nf = 1 if f < 1.5 else 2 if f < 3 else 5 if f < 7 else 10
    else:
        nf = 1 if f <= 1 else 2 if f <= 2 else 5 if f <= 5 else 10
    return nf * 10 ** exp


#: a range narrower than this share of its magnitude is drawn as a flat one, widened
_FLAT = 1e-9
#: the largest magnitude drawn; a record's numbers beyond it are clipped to it
_HUGE = 1e300


def nice_ticks(lo: float, hi: float, count: int = 6) -> list[float]:
    """Round tick values covering ``lo``..``hi``, at least two, strictly increasing.

    A range one ulp wide (or flat) is widened by a tenth of its magnitude; values beyond
    ±1e300 are clipped there so that the span of the range stays a finite float.

    >>> nice_ticks(0.0, 9.3)
    [0.0, 2.0, 4.0, 6.0, 8.0, 10.0]
    >>> nice_ticks(1.0, 1.0000000000000002)
    [0.85, 0.9, 0.95, 1.0, 1.05, 1.1, 1.15]
    >>> len(nice_ticks(-1.7e308, 1.7e308)) >= 2
    True
    """
    if not (math.isfinite(lo) and math.isfinite(hi)):
        return [0.0, 1.0]
    lo, hi = max(-_HUGE, min(_HUGE, lo)), max(-_HUGE, min(_HUGE, hi))
    if hi < lo:
        lo, hi = hi, lo
    size = max(abs(lo), abs(hi))
    if size < 1e-290:  # subnormal numbers: nothing to tell apart, draw around zero
        lo = hi = size = 0.0
    if hi - lo <= _FLAT * size or hi == lo:
        pad = size * 0.1 or 1.0
        lo, hi = lo - pad, hi + pad
    # the step from the data's own span (not a rounded-up span): the axis ends at most one
    # step beyond the data and the limits
    step = _nice((hi - lo) / max(count - 1, 1), True)
    start = math.floor(lo / step) * step
    stop = math.ceil(hi / step) * step
    n = max(1, min(int(round((stop - start) / step)), 50))
    ticks = []
    for i in range(n + 1):
        v = float(f"{start + i * step:.12g}") + 0.0
        if not ticks or v > ticks[-1]:
            ticks.append(v)
    if len(ticks) < 2:
        ticks = [lo, hi]
    return ticks


def _scale(lo: float, hi: float, out_lo: float, out_hi: float):
    """A function mapping ``lo..hi`` onto ``out_lo..out_hi``, finite for any finite input."""
    size = max(abs(lo), abs(hi), 1e-300)
    a, b = lo / size, hi / size

    def to(v: float) -> float:
        v = max(-_HUGE, min(_HUGE, v)) / size
        return out_lo + (v - a) / (b - a) * (out_hi - out_lo)

    return to


def _fmt(v: float) -> str:
    if v == 0:
        return "0"
    a = abs(v)
    if 1e-3 <= a < 1e6:
        return f"{v:.6g}"
    return f"{v:.3g}"


def _marker(kind: str, x: float, y: float, colour: str) -> str:
    s = 3.5
    if kind == "circle":
        return f'<circle cx="{x:.1f}" cy="{y:.1f}" r="{s:.1f}" fill="#fff" stroke="{colour}" stroke-width="1.5"/>'
    if kind == "square":
        return (f'<rect x="{x - s:.1f}" y="{y - s:.1f}" width="{2 * s:.1f}" height="{2 * s:.1f}" '
                f'fill="{colour}"/>')
    if kind == "triangle":
        pts = f"{x:.1f},{y - s - 1:.1f} {x - s - 0.5:.1f},{y + s:.1f} {x + s + 0.5:.1f},{y + s:.1f}"
        return f'<polygon points="{pts}" fill="#fff" stroke="{colour}" stroke-width="1.5"/>'
    if kind == "diamond":
        pts = f"{x:.1f},{y - s - 1:.1f} {x + s + 1:.1f},{y:.1f} {x:.1f},{y + s + 1:.1f} {x - s - 1:.1f},{y:.1f}"
        return f'<polygon points="{pts}" fill="{colour}"/>'
    if kind == "cross":
        return (f'<path d="M{x - s:.1f},{y - s:.1f}L{x + s:.1f},{y + s:.1f}M{x - s:.1f},{y + s:.1f}'
                f'L{x + s:.1f},{y - s:.1f}" stroke="{colour}" stroke-width="1.8"/>')
    return f'<path d="M{x - s:.1f},{y:.1f}H{x + s:.1f}" stroke="{colour}" stroke-width="3"/>'


def line_chart(figure: dict) -> str:
    """An ``<svg>`` element drawing ``figure`` (the record's figure form)."""
    xs = [float(v) for v in figure.get("x", [])]
    series = figure.get("series", {})
    limits = figure.get("limits", {})
    title = figure.get("title", "")
    ys_all = [v for ys in series.values() for v in ys if v is not None] + list(limits.values())
    n_legend = len(series) + (1 if limits else 0)
    legend_rows = max(1, math.ceil(n_legend / 3)) if n_legend else 0
    height = H + (18 * legend_rows + 8 if legend_rows else 0)
    plot_w, plot_h = W - LEFT - RIGHT, H - TOP - BOTTOM
    parts = [f'<svg class="chart" viewBox="0 0 {W} {height}" width="{W}" height="{height}" role="img" '
             f'aria-label="{_esc(title)}">', f"<title>{_esc(title)}</title>",
             f'<rect x="0" y="0" width="{W}" height="{height}" fill="#fff"/>']
    if not xs or not ys_all:
        parts.append(f'<text x="{W / 2:.0f}" y="{H / 2:.0f}" text-anchor="middle" font-size="13">'
                     "no curve data recorded</text></svg>")
        return "".join(parts)
    xt = nice_ticks(min(xs), max(xs))
    yt = nice_ticks(min(ys_all), max(ys_all))
    x0, x1, y0, y1 = xt[0], xt[-1], yt[0], yt[-1]

    px = _scale(x0, x1, LEFT, LEFT + plot_w)
    py = _scale(y0, y1, TOP + plot_h, TOP)

    # grid and ticks
    for t in xt:
        parts.append(f'<line x1="{px(t):.1f}" y1="{TOP}" x2="{px(t):.1f}" y2="{TOP + plot_h}" stroke="#ddd"/>')
        parts.append(f'<text x="{px(t):.1f}" y="{TOP + plot_h + 16}" text-anchor="middle" font-size="11">'
                     f"{_esc(_fmt(t))}</text>")
    for t in yt:
        parts.append(f'<line x1="{LEFT}" y1="{py(t):.1f}" x2="{LEFT + plot_w}" y2="{py(t):.1f}" stroke="#ddd"/>')
        parts.append(f'<text x="{LEFT - 6}" y="{py(t) + 4:.1f}" text-anchor="end" font-size="11">'
                     f"{_esc(_fmt(t))}</text>")
    parts.append(f'<rect x="{LEFT}" y="{TOP}" width="{plot_w}" height="{plot_h}" fill="none" stroke="#000"/>')
    parts.append(f'<text x="{LEFT + plot_w / 2:.1f}" y="{TOP + plot_h + 36}" text-anchor="middle" '
                 f'font-size="12">{_esc(figure.get("x_label", ""))}</text>')
    parts.append(f'<text transform="translate(16,{TOP + plot_h / 2:.1f}) rotate(-90)" text-anchor="middle" '
                 f'font-size="12">{_esc(figure.get("y_label", ""))}</text>')
    # shaded x ranges (a regime band), under the curves, labelled at their top left
    for label, (b_lo, b_hi) in figure.get("bands", {}).items():
        bx0, bx1 = sorted((max(LEFT, min(LEFT + plot_w, px(b_lo))), max(LEFT, min(LEFT + plot_w, px(b_hi)))))
        parts.append(f'<rect class="band" x="{bx0:.1f}" y="{TOP}" width="{max(bx1 - bx0, 1.0):.1f}" '
                     f'height="{plot_h}" fill="#999" fill-opacity="0.22"/>')
        parts.append(f'<text x="{bx0 + 3:.1f}" y="{TOP + plot_h - 6}" font-size="10" font-style="italic" '
                     f'fill="#333">shaded: {_esc(label)}</text>')
    # limits: dashed, labelled inside the plot at the right end, just above the line (on a
    # white halo so a curve under the label does not hide it); never cut off at the edge
    for label, value in limits.items():
        y = py(value)
        parts.append(f'<line class="limit" x1="{LEFT}" y1="{y:.1f}" x2="{LEFT + plot_w}" y2="{y:.1f}" '
                     f'stroke="#000" stroke-width="1.5" stroke-dasharray="7 4"/>')
        ty = y - 4 if y - 14 > TOP else y + 13
        parts.append(f'<text class="limit-label" x="{LEFT + plot_w - 4}" y="{ty:.1f}" text-anchor="end" '
                     f'font-size="11" paint-order="stroke" stroke="#fff" stroke-width="3">'
                     f"{_esc(label)} {_esc(_fmt(value))}</text>")
    # series: solid lines, gaps at None, markers at no more than 12 points
    for i, (label, ys) in enumerate(series.items()):
        colour, marker = _COLOURS[i % len(_COLOURS)], _MARKERS[i % len(_MARKERS)]
        runs, run = [], []
        for x, y in zip(xs, ys):
            if y is None:
                if run:
                    runs.append(run)
                run = []
            else:
                run.append((px(x), py(y)))
        if run:
            runs.append(run)
        for r in runs:
            pts = " ".join(f"{a:.1f},{b:.1f}" for a, b in r)
            parts.append(f'<polyline points="{pts}" fill="none" stroke="{colour}" stroke-width="1.8"/>')
        points = [(px(x), py(y)) for x, y in zip(xs, ys) if y is not None]
        step = max(1, math.ceil(len(points) / 12))
        parts.extend(_marker(marker, a, b, colour) for a, b in points[::step])
    # legend below the plot, three to a row
    col_w = W // 3
    entries = [(lbl, i) for i, lbl in enumerate(series)] + ([("limit (dashed)", -1)] if limits else [])
    for n, (label, i) in enumerate(entries):
        lx = 10 + (n % 3) * col_w
        ly = H + 6 + 18 * (n // 3)
        if i < 0:
            parts.append(f'<line x1="{lx}" y1="{ly}" x2="{lx + 26}" y2="{ly}" stroke="#000" stroke-width="1.5" '
                         f'stroke-dasharray="7 4"/>')
        else:
            colour, marker = _COLOURS[i % len(_COLOURS)], _MARKERS[i % len(_MARKERS)]
            parts.append(f'<line x1="{lx}" y1="{ly}" x2="{lx + 26}" y2="{ly}" stroke="{colour}" stroke-width="1.8"/>')
            parts.append(_marker(marker, lx + 13, ly, colour))
        parts.append(f'<text x="{lx + 32}" y="{ly + 4}" font-size="11">{_esc(label)}</text>')
    parts.append("</svg>")
    return "".join(parts)


__all__ = ["line_chart", "nice_ticks", "ACCENT"]
