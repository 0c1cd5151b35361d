"""A study panel: input controls, live results, findings and figures, record and export.

The panel holds no physics: it collects the values of its study's fields, calls the study's
``run`` (the same function the tests and the command line call) and shows the outcome. When
an entry is refused, the field shows why and the last valid results stay on screen, marked
out of date. The record action writes the study into the axis's design record atomically;
the export action writes the HTML review copy beside it.

>>> from workbook import inputs
>>> from workbook.studies import sizing
>>> values = {s.key: s.defaults() for s in inputs.AXIS_SECTIONS}
>>> p = StudyPanel(sizing, values, identity={"machine": "demo", "axis": "lift"})
>>> p.controls[("study", "target_flow")].submit("10 L/min")
True
>>> p.outcome.results["orifice_drill_flow"]["unit"]
'L/min'
>>> p.controls[("study", "target_flow")].submit("-3 L/min")
False
>>> p.stale
True
"""

from __future__ import annotations

import copy
import html
import os
from pathlib import Path
from typing import Mapping

import ipywidgets as W
import numpy as np

from .. import inputs
from ..errors import InputError
from .controls import QuantityControl, control_for, css_name
from .plots import LivePlot
from .tables import HtmlBox, caution_html, findings_html, results_html


_BOKEHJS_LOADED = False


def load_bokehjs() -> None:
    """Put the installed BokehJS into the page once per kernel (no CDN: plots work offline).

    jupyter_bokeh's widgets draw with the BokehJS that the notebook page holds; loading it
    inline from the installed bokeh package keeps every request on the notebook server.
    """
    global _BOKEHJS_LOADED
    if _BOKEHJS_LOADED:
        return
    from bokeh.io import output_notebook
    from bokeh.resources import INLINE

    output_notebook(resources=INLINE, hide_banner=True)
    _BOKEHJS_LOADED = True


def _split_label(label: str) -> tuple[str, str]:
    """``"Load [kN]"`` -> ``("Load", "kN")``."""
    if label.endswith("]") and " [" in label:
        name, unit = label[:-1].rsplit(" [", 1)
        return name, unit
    return label, ""


class StudyPanel:
    """Interactive panel of one study on one axis.

    Parameters
    ----------
    study : module
        A study module of :mod:`workbook.studies` (``KIND``, ``TITLE``, ``FIELDS``, ``run``).
    values : mapping
        ``{section: {field: SI}}`` for every axis section (a design file's axis values).
    identity : mapping
        Machine, axis, revision, author, date for the record.
    record_path, export_path : path, optional
        Where the record action writes the JSON record and the HTML review copy.
    """

    def __init__(self, study, values: Mapping, identity: Mapping | None = None,
                 record_path: str | os.PathLike | None = None, export_path: str | os.PathLike | None = None):
        self.study = study
        self.values = copy.deepcopy({k: dict(v) for k, v in values.items()})
        self.identity = dict(identity or {})
        self.record_path = Path(record_path) if record_path else None
        self.export_path = Path(export_path) if export_path else None
        self.outcome = None
        self.error: InputError | None = None
        self.stale = False
        self.compute_count = 0
        self.controls: dict[tuple[str, str], QuantityControl] = {}
        self.plots: dict[str, LivePlot] = {}
        self._build()
        self.recompute()

    # ----------------------------------------------------------------- layout
    def _build(self) -> None:
        fields = tuple(self.study.FIELDS)
        key_fields = tuple(k for k in getattr(self.study, "KEY_FIELDS", fields[:6]) if k in fields)
        for section, key in fields:
            f = inputs.section(section)[key]
            ctl = control_for(section, f, self.values[section][key])
            ctl.on_change(self._on_control)
            self.controls[(section, key)] = ctl
        # the inputs that drive this study stay in view; the rest fold away by section
        main = W.VBox([W.HTML("<h4 style='margin:6px 0 2px 0'>Main inputs</h4>")]
                      + [self.controls[k].widget for k in key_fields])
        main.add_class("wb-main-inputs")
        groups: dict[str, list] = {}
        for section, key in fields:
            if (section, key) not in key_fields:
                groups.setdefault(section, []).append(self.controls[(section, key)].widget)
        folds = W.Accordion(children=[W.VBox(rows) for rows in groups.values()],
                            titles=tuple(inputs.section(sec).title for sec in groups))
        folds.selected_index = None
        folds.add_class("wb-more-inputs")
        self.folds = folds
        self.form = W.VBox([main, W.HTML("<h4 style='margin:8px 0 2px 0'>All other inputs</h4>"), folds])
        self.form.add_class("wb-form")
        self.status = W.HTML("")
        self.status.add_class("wb-status")
        self.results_box = HtmlBox("wb-results-box")
        self.findings_box = HtmlBox("wb-findings-box")
        self.plot_area = W.VBox([])
        self.plot_area.add_class("wb-plots")
        self.plot_note = W.HTML("")
        self.plot_note.add_class("wb-plot-note")
        self.note = W.Textarea(placeholder="Note for the record (optional)", layout=W.Layout(width="40em"))
        self.note.add_class("wb-note")
        self.record_button = W.Button(description="Record study", button_style="", icon="save",
                                      tooltip="write this study into the axis's design record")
        self.record_button.add_class("wb-record")
        self.export_button = W.Button(description="Export HTML", icon="file",
                                      tooltip="write the HTML review copy of the record")
        self.export_button.add_class("wb-export")
        self.record_status = W.HTML("")
        self.record_status.add_class("wb-record-status")
        self.record_button.on_click(lambda _b: self._safe(self.record))
        self.export_button.on_click(lambda _b: self._safe(self.export))
        caution = W.HTML(caution_html())
        caution.add_class("wb-caution-box")
        self.widget = W.VBox([
            caution, self.form, self.status,
            self.results_box.widget, self.findings_box.widget,
            self.plot_note, self.plot_area,
            W.HBox([self.note, W.VBox([self.record_button, self.export_button])]),
            self.record_status,
        ])
        self.widget.add_class("wb-panel")
        self.widget.add_class(f"wb-study-{css_name(self.study.KIND)}")

    def _ipython_display_(self):  # pragma: no cover - notebook only
        self.show()

    def show(self):
        """Display the panel in a notebook (loading the installed BokehJS inline first)."""
        from IPython.display import display

        load_bokehjs()
        display(self.widget)

    # ----------------------------------------------------------------- compute
    def _on_control(self, ctl: QuantityControl) -> None:
        if not ctl.valid:
            self._mark_stale(f"{ctl.section}.{ctl.field.key} was not accepted; showing the last valid results.")
            return
        self.values[ctl.section][ctl.field.key] = ctl.value
        self.recompute()

    def recompute(self) -> bool:
        """Run the study on the current values; return whether it succeeded."""
        bad = [c for c in self.controls.values() if not c.valid]
        if bad:
            self._mark_stale(f"{bad[0].section}.{bad[0].field.key} was not accepted.")
            return False
        try:
            # the outcome keeps its own copy: later entries must not rewrite the inputs it shows
            outcome = self.study.run(copy.deepcopy(self.values))
        except InputError as exc:
            self.error = exc
            target = self._control_named(exc.field)
            if target is not None:
                target._set_valid(False, exc.allowed, exc.given)
                target.valid = True  # a cross-field refusal: the entry itself parsed
            self._mark_stale(f"{exc}")
            return False
        self.error = None
        self.outcome = outcome
        self.compute_count += 1
        self.stale = False
        self.status.value = ""
        self.plot_note.value = ""
        self.results_box.update(results_html(outcome.results))
        self.findings_box.update(findings_html(outcome.findings))
        self._update_plots(outcome)
        return True

    def _control_named(self, name: str):
        for (section, key), ctl in self.controls.items():
            if name in (key, f"{section}.{key}") or name.endswith(f".{section}.{key}"):
                return ctl
        return None

    def _mark_stale(self, why: str) -> None:
        self.stale = True
        self.status.value = (f"<div style='color:#8a0010'>&#9888; {html.escape(why)} "
                             "Results below are out of date.</div>")
        self.results_box.mark_stale()
        self.findings_box.mark_stale()
        self.plot_note.value = ("<div class='wb-stale-note' style='color:#8a0010;font-weight:bold'>"
                                "&#9888; Out of date: the curves below are the last valid results.</div>")

    def _update_plots(self, outcome) -> None:
        changed = False
        for key, fig in outcome.figures.items():
            names = tuple(fig["series"])
            plot = self.plots.get(key)
            if plot is None or plot.series != names or plot.limit_names != tuple(fig.get("limits", {})):
                x_label, x_unit = _split_label(fig["x_label"])
                y_label, y_unit = _split_label(fig["y_label"])
                plot = LivePlot(fig["title"], x_label, x_unit, y_label, y_unit, names,
                                tuple(fig.get("limits", {})), normal_regime=getattr(self.study, "NORMAL_REGIME", None))
                self.plots[key] = plot
                changed = True
            ys = {k: np.asarray(vals, dtype=float) for k, vals in fig["series"].items()}
            plot.update(np.asarray(fig["x"], dtype=float), ys,
                        regimes=outcome.regimes.get(key), limits=fig.get("limits"), title=fig["title"])
        if changed:
            self.plot_area.children = [self.plots[k].widget for k in outcome.figures if k in self.plots]

    # ----------------------------------------------------------------- record
    def _safe(self, action) -> None:
        try:
            action()
        except InputError as exc:
            self.record_status.value = f"<span style='color:#8a0010'>&#9888; {html.escape(str(exc))}</span>"
        except OSError as exc:
            self.record_status.value = (f"<span style='color:#8a0010'>&#9888; could not write: "
                                        f"{html.escape(str(exc))}</span>")

    def _current_record(self):
        from ..record import Record, load

        if self.record_path is not None and self.record_path.exists():
            return load(self.record_path)
        return Record(self.identity)

    def record(self):
        """Write this study into the axis record (atomic); return the record."""
        from ..record import save

        if self.record_path is None:
            raise InputError("record file", "none", "a panel opened with a record path")
        if self.stale or self.outcome is None:
            raise InputError("record", "out-of-date results",
                             "valid entries in every field before recording (fix the marked field)")
        notes = [self.note.value.strip()] if self.note.value.strip() else []
        rec = self._current_record().with_study(self.outcome.to_study(notes=notes), key=self.study.KIND)
        self.record_path.parent.mkdir(parents=True, exist_ok=True)
        save(rec, self.record_path)
        self.record_status.value = (f"<span class='wb-recorded'>Recorded <b>{html.escape(self.study.TITLE)}</b> "
                                    f"into {html.escape(self.record_path.name)} "
                                    f"({len(rec.studies)} studies in the record).</span>")
        return rec

    def export(self):
        """Write the HTML review copy of the axis record; return its path."""
        from ..record import export_html

        if self.export_path is None:
            raise InputError("export file", "none", "a panel opened with an export path")
        rec = self._current_record()
        if self.study.KIND not in rec.studies and self.outcome is not None and not self.stale:
            rec = rec.with_study(self.outcome.to_study(), key=self.study.KIND)
        self.export_path.parent.mkdir(parents=True, exist_ok=True)
        export_html(rec, self.export_path)
        self.record_status.value = (f"<span class='wb-exported'>Exported the review copy to "
                                    f"{html.escape(self.export_path.name)}.</span>")
        return self.export_path

    def set(self, name: str, text: str) -> bool:
        """Enter ``text`` into the field ``"section.key"`` as if typed; print why if refused."""
        ctl = self._control_named(name)
        if ctl is None:
            known = ", ".join(f"{s}.{k}" for s, k in self.controls)
            print(f"{name}: not a field of this study; fields: {known}")
            return False
        ok = ctl.submit(text)
        if not ok:
            print(f"{name}: {text!r} was not accepted; allowed: {ctl.field.allowed()}. "
                  "The last valid results stay, marked out of date.")
        elif self.error is not None:
            print(f"{self.error}")
        return ok and self.error is None

    # ----------------------------------------------------------------- text
    def summary(self) -> str:
        """Deterministic plain-text summary of inputs, results and findings."""
        if self.outcome is None:
            return f"{self.study.TITLE}: no valid result yet ({self.error})"
        text = self.outcome.summary()
        if self.stale:
            text += "\n\n(out of date: an entry was not accepted)"
        return text


__all__ = ["StudyPanel"]
