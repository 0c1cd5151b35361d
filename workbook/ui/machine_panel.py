"""The machine cycle's panel: the cycle's inputs, the machine verdict, the cycle table, a
timeline of power and heat (steps shaded by axis), the oil warming to its steady value, the
findings and the alternatives compared (no physics here: :mod:`workbook.studies.machine_cycle`).

The panel opens on the design file's ``[cycle]`` table and its axes. Its entries are the
cycle's own inputs (tank, cooling, idle state, cycles per hour); an axis input is changed in
the axis's own study. A refused entry is explained beside its field and the last valid
results stay, marked out of date. **Record machine** writes the machine record
(``<design>.machine.json`` beside the axis records) with its HTML review copy; it is refused
while the results are out of date. It does not write into the design file (edit ``[cycle]``
by hand).

>>> p = open_machine("notebooks/designs/bin-tipper.toml")
>>> p.controls["cooler_duty"].submit("6 kW")
True
>>> p.outcome.results["oil_temperature"]["value"]
60.0
>>> p.controls["tank_volume"].submit("-3 L")
False
>>> p.stale
True
"""

from __future__ import annotations

import copy
import html
from pathlib import Path

import ipywidgets as W

from ..errors import InputError
from ..inputs import CYCLE
from ..record import export_html, save
from ..record.verdict import verdict
from ..studies import machine_cycle
from .controls import control_for
from .plots import LivePlot
from .tables import HtmlBox, caution_html, findings_html, results_html, verdict_html

#: fill colours of the steps of each axis in the timeline (dwells stay white)
AXIS_FILLS = ("#4c78a8", "#f58518", "#54a24b", "#b279a2", "#9d755d")
KEY_FIELDS = ("cycles_per_hour", "idle", "ambient", "oil_max", "tank_volume", "tank_surface", "cooler_duty")


def machine_record_paths(design_path, records_dir=None) -> tuple[Path, Path]:
    """``(record.json, record.html)`` of the machine of the design at ``design_path``: the
    axis records' folder (``WORKBOOK_RECORDS_DIR`` moves it), ``<stem>.machine.json``."""
    from .opening import record_paths

    design_path = Path(design_path)
    folder = record_paths(design_path, "machine", records_dir)[0].parent   # the axis records' folder
    return folder / f"{design_path.stem}.machine.json", folder / f"{design_path.stem}.machine.html"


def open_machine(design_path, records_dir=None) -> "MachinePanel":
    """A :class:`MachinePanel` on the design file's cycle (refused without a ``[cycle]``)."""
    from ..design import load_design

    design = load_design(design_path)
    if design.cycle is None:
        raise InputError("cycle", f"a design without a [cycle] table ({design.source})",
                         "a design file with [cycle] and [[cycle.steps]] (see the README)")
    rec, html_path = machine_record_paths(design_path, records_dir)
    return MachinePanel({k: a.values for k, a in design.axes.items()}, design.cycle,
                        identity=design.identity_for(next(iter(design.axes))), record_path=rec, export_path=html_path)


class MachinePanel:
    """Interactive panel of the machine cycle (see the module text)."""

    def __init__(self, axes_values, cycle, identity=None, record_path=None, export_path=None):
        self.axes_values = copy.deepcopy({k: {s: dict(v) for s, v in vals.items()} for k, vals in axes_values.items()})
        self.cycle = {"values": dict(cycle["values"]), "steps": tuple(cycle["steps"])}
        self.identity = dict(identity or {})
        self.record_path = Path(record_path) if record_path else None
        self.export_path = Path(export_path) if export_path else None
        self.outcome = None
        self.stale = False
        self.error: InputError | None = None
        self.controls = {}
        self._build()
        self.recompute()

    def _build(self) -> None:
        for f in CYCLE.fields:
            ctl = control_for("cycle", f, self.cycle["values"][f.key])
            ctl.on_change(self._on_entry)
            self.controls[f.key] = ctl
        shown = [self.controls[k].widget for k in KEY_FIELDS]
        more = W.Accordion([W.VBox([self.controls[f.key].widget for f in CYCLE.fields if f.key not in KEY_FIELDS])])
        more.set_title(0, "More cycle and tank inputs")
        more.selected_index = None
        self.verdict_box = HtmlBox("wb-verdict-box")
        self.note = W.HTML("")
        self.cycle_box = HtmlBox("wb-cycle-table")
        self.results_box = HtmlBox("wb-results-box")
        self.findings_box = HtmlBox("wb-findings-box")
        self.alternatives_box = HtmlBox("wb-alternatives-box")
        self.timeline = LivePlot("Power and heat over one cycle", "time in the cycle", "s", "power", "kW",
                                 ("shaft power", "heat into the oil", "work on the load"), limits=("installed drive",))
        self.warm = LivePlot("Oil temperature from a cold start", "running time", "h", "oil temperature", "°C",
                             ("oil temperature",), limits=("highest allowed",))
        self._boxes = []
        self.record_button = W.Button(description="Record machine", tooltip="write the machine record and its "
                                      "HTML review copy")
        self.record_button.on_click(lambda _b: self._guarded(self.record))
        self.action_note = W.HTML("")
        self.widget = W.VBox([W.HTML(caution_html()), self.verdict_box.widget, self.note, W.VBox(shown), more,
                              self.cycle_box.widget, self.timeline.widget, self.warm.widget,
                              self.alternatives_box.widget, self.results_box.widget, self.findings_box.widget,
                              W.HBox([self.record_button, self.action_note])])
        self.widget.add_class("wb-machine-panel")

    def show(self):
        from IPython.display import display

        from .panel import load_bokehjs

        load_bokehjs()
        display(self.widget)
        return None

    # ----------------------------------------------------------------- compute
    def _on_entry(self, ctl) -> None:
        if not ctl.valid:
            self._mark_stale(f"cycle.{ctl.field.key}: {ctl.entry.value!r} was not accepted ({ctl.error_allowed})")
            return
        self.recompute()

    def recompute(self) -> bool:
        bad = [c for c in self.controls.values() if not c.valid]
        if bad:
            self._mark_stale(f"cycle.{bad[0].field.key} was not accepted")
            return False
        values = {k: c.value for k, c in self.controls.items()}
        try:
            out = machine_cycle.run_machine(self.axes_values, {"values": values, "steps": self.cycle["steps"]})
        except InputError as exc:
            self.error = exc
            self._mark_stale(str(exc))
            return False
        self.cycle["values"] = values
        self.outcome, self.error, self.stale = out, None, False
        self.note.value = ""
        for box in (self.verdict_box, self.results_box, self.findings_box, self.cycle_box, self.alternatives_box):
            box.mark_stale(False)
        self.verdict_box.update(verdict_html(self.verdict(), title="Machine cycle"))
        self.cycle_box.update(_table_html("The cycle (one period)", out.step_rows()))
        self.alternatives_box.update(_alternatives_html(out.alternatives))
        self.results_box.update(results_html(out.results))
        self.findings_box.update(findings_html(out.findings))
        self._draw(out)
        return True

    def verdict(self):
        """The machine verdict (:func:`workbook.record.verdict.verdict` of the study's findings)."""
        return verdict({machine_cycle.KIND: self.outcome.findings})

    def _draw(self, out) -> None:
        from bokeh.models import BoxAnnotation

        fig = out.figures["timeline"]
        s = fig["series"]
        self.timeline.update(fig["x"], {k: s[k] for k in ("shaft power", "heat into the oil", "work on the load")},
                             limits=fig["limits"])
        axes = list(self.axes_values)
        now = 0.0
        steps = out.machine.result.steps
        while len(self._boxes) < len(steps):
            box = BoxAnnotation(left=0, right=0, fill_alpha=0.12, visible=False)
            self.timeline.figure.add_layout(box)
            self._boxes.append(box)
        for box, st in zip(self._boxes, steps):
            box.left, box.right = now, now + st.duration
            box.fill_color = AXIS_FILLS[axes.index(st.step.axis) % len(AXIS_FILLS)] if st.step.axis else "#ffffff"
            box.visible = st.step.axis is not None
            now += st.duration
        for box in self._boxes[len(steps):]:
            box.visible = False
        w = out.figures["warm_up"]
        self.warm.update(w["x"], w["series"], limits=w["limits"])

    def _mark_stale(self, why: str) -> None:
        self.stale = True
        self.note.value = (f"<div class='wb-stale-note' style='color:#8a0010;font-weight:bold'>Out of date: "
                           f"{html.escape(why)}. The results below are the last valid ones.</div>")
        for box in (self.verdict_box, self.results_box, self.findings_box, self.cycle_box, self.alternatives_box):
            box.mark_stale()

    # ----------------------------------------------------------------- actions
    def _guarded(self, action) -> None:
        try:
            path = action()
            self.action_note.value = f"Wrote {html.escape(str(path))}"
        except InputError as exc:
            self.action_note.value = f"<span style='color:#8a0010'>{html.escape(str(exc))}</span>"

    def record(self) -> Path:
        """Write the machine record and its HTML review copy; refused while out of date."""
        if self.stale or self.outcome is None:
            raise InputError("Record", "results that are out of date", "correct the refused entry first")
        if self.record_path is None:
            raise InputError("Record", "no record path", "a panel opened with open_machine")
        rec = machine_cycle.to_record(self.outcome, self.identity, notes=["Recorded from the machine cycle panel."])
        self.record_path.parent.mkdir(parents=True, exist_ok=True)
        save(rec, self.record_path)
        if self.export_path is not None:
            export_html(machine_cycle.review_record(rec), self.export_path)
        return self.record_path

    def summary(self) -> str:
        """Deterministic plain text: the machine verdict, then the study's summary."""
        v = self.verdict()
        lines = [f"Machine verdict: {v.headline()}"] + ["  " + item.to_line() for item in v.items]
        if self.stale:
            lines.append("(out of date: the last valid results)")
        return "\n".join(lines) + "\n\n" + self.outcome.summary()


def _table_html(title: str, rows) -> str:
    if not rows:
        return ""
    head = "".join(f"<th style='padding:2px 6px'>{html.escape(k)}</th>" for k in rows[0])
    body = ""
    for r in rows:
        cells = "".join(f"<td style='padding:2px 6px;text-align:{'right' if isinstance(v, float) else 'left'}'>"
                        f"{html.escape(f'{v:.4g}' if isinstance(v, float) else str(v))}</td>" for v in r.values())
        body += f"<tr>{cells}</tr>"
    return (f"<div><b>{html.escape(title)}</b><table style='border-collapse:collapse;font-size:92%'>"
            f"<tr>{head}</tr>{body}</table></div>")


def _alternatives_html(rows) -> str:
    best = machine_cycle.best_alternative(rows)
    lines = "\n".join(machine_cycle.alternatives_text(rows))
    tail = (f"<div>Helps most: <b>{html.escape(best['key'])}</b> ({best['heat_kw']:.3g} kW mean heat, oil "
            f"{best['oil_c']:.4g} °C)</div>" if best else "")
    return (f"<div class='wb-alternatives'><b>What would help (same cycle)</b><pre>{html.escape(lines)}</pre>"
            f"{tail}</div>")


__all__ = ["MachinePanel", "open_machine", "machine_record_paths", "AXIS_FILLS"]
