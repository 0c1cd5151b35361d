"""A study panel: input controls, live results, findings and figures, record and export.

The panel holds no physics. On every entry it runs every study of the axis on its values
through :func:`workbook.studies.whole_axis.evaluate` (the call the command line and the
record make, about a second for all of them at most) and shows, at the top, the verdict of
the whole axis (every fail and caution once, worded as the breach), then its own study's
results, findings and figures. When an entry is refused, the field shows why and the last
valid results stay on screen, marked out of date.

One design per axis: **Record study** re-runs every study on the panel's inputs and writes
the axis record (the inputs once, every study; atomic), and writes the inputs that differ
from the design file back into it (comments and layout kept, :mod:`workbook.design_edit`);
before that the panel lists those differences. **Export HTML** writes the review copy of
the record. Both are refused, with the reason, while the results are out of date; Export
also while the record holds other inputs than the panel.

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

import base64
import copy
import html
import os
from pathlib import Path
from typing import Mapping

import ipywidgets as W
import numpy as np

from .. import inputs
from ..design_edit import design_changes, write_inputs
from ..errors import InputError, InternalDefect
from ..studies.whole_axis import DEFAULT_STUDIES, evaluate
from .controls import QuantityControl, control_for, css_name
from .plots import LivePlot
from .tables import HtmlBox, caution_html, differences_html, findings_html, results_html, verdict_html

#: record notes written by the workbook itself (replaced, not kept, when a panel records)
_AUTO_NOTES = ("Evaluated from ", "Recorded from the ", "Migrated from record schema")


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
                 record_path: str | os.PathLike | None = None, export_path: str | os.PathLike | None = None,
                 *, design_values: Mapping | None = None, design_path: str | os.PathLike | None = None,
                 axis_key: str | None = None, record_values: Mapping | None = None, record_problem: str = "",
                 kinds=DEFAULT_STUDIES):
        self.study = study
        self.values = copy.deepcopy({k: dict(v) for k, v in values.items()})
        # what the design file says: the panel lists where its inputs differ from it
        self.design_values = copy.deepcopy({k: dict(v) for k, v in (design_values or values).items()})
        self.design_path = Path(design_path) if design_path else None
        self.axis_key = axis_key or (identity or {}).get("axis", "")
        # the record's values, when they differ from the design file (offered, never applied)
        self.record_values = copy.deepcopy(record_values) if record_values else None
        self.record_problem = record_problem
        self.kinds = tuple(kinds)
        self.identity = dict(identity or {})
        self.record_path = Path(record_path) if record_path else None
        self.export_path = Path(export_path) if export_path else None
        self.outcome = None
        self.evaluation = None
        self.error: InputError | None = None
        self.stale = False
        self.compute_count = 0
        self.controls: dict[tuple[str, str], QuantityControl] = {}
        self.plots: dict[str, LivePlot] = {}
        self._build()
        self._show_record_notice()
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
        # which fold holds each folded field (a refusal caused by a folded field opens it)
        self._fold_of = {(sec, key): i for i, sec in enumerate(groups) for s2, key in fields
                         if s2 == sec and (s2, key) not in key_fields}
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
        # the record's values, when they differ from the design file: said, never applied
        self.notice = W.HTML("")
        self.notice.add_class("wb-record-notice")
        self.use_record_button = W.Button(description="Use the record's values", icon="history",
                                          tooltip="load the values of the axis record into this panel")
        self.use_record_button.add_class("wb-use-record")
        self.keep_file_button = W.Button(description="Keep the design file's values",
                                         tooltip="dismiss this notice; the panel keeps the design file's values")
        self.keep_file_button.add_class("wb-keep-file")
        self.use_record_button.on_click(lambda _b: self.load_record_values())
        self.keep_file_button.on_click(lambda _b: self.dismiss_record_notice())
        self.notice_box = W.VBox([self.notice, W.HBox([self.use_record_button, self.keep_file_button])])
        self.notice_box.add_class("wb-record-notice-box")
        self.verdict_box = HtmlBox("wb-verdict-box")
        # while the live panel is on the page, its saved snapshot (a separate output) is hidden
        self.live_style = W.HTML("<style>.wb-snapshot { display: none !important; }</style>")
        self.live_style.add_class("wb-live-style")
        self.changes_box = HtmlBox("wb-changes-box")
        # the notebook's first cell states the caution; the panel repeats it beside the record
        # actions (once on the first screen, and with whatever the panel is saved or shown in)
        self.widget = W.VBox([
            self.live_style, self.notice_box, self.verdict_box.widget, self.form, self.status,
            self.results_box.widget, self.findings_box.widget,
            self.plot_note, self.plot_area, self.changes_box.widget,
            W.HBox([self.note, W.VBox([self.record_button, self.export_button])]),
            self.record_status, caution,
        ])
        self.widget.add_class("wb-panel")
        self.widget.add_class(f"wb-study-{css_name(self.study.KIND)}")

    def _ipython_display_(self):  # pragma: no cover - notebook only
        self.show()

    def show(self):
        """Display the panel in a notebook (loading the installed BokehJS inline first), and
        beside it its static snapshot (:meth:`snapshot_html`), which the notebook saves: a
        reviewer who opens the saved notebook without a kernel, or converts it with
        nbconvert, reads the same verdict, results, findings and figures. While the live panel
        is shown, its style sheet hides the snapshot; the snapshot follows every new result."""
        from IPython.display import HTML, display

        load_bokehjs()
        display(self.widget)
        self._snapshot = display(HTML(self.snapshot_html()), display_id=True)

    def _refresh_snapshot(self) -> None:
        handle = getattr(self, "_snapshot", None)
        if handle is not None:
            from IPython.display import HTML

            handle.update(HTML(self.snapshot_html()))

    def snapshot_html(self) -> str:
        """The panel as static HTML: the caution, the whole axis's verdict, the inputs that
        differ from the design file, this study's results and findings, its figures as SVG
        (as the review copy draws them). Deterministic: no widget id, address or time; out of
        date results are said to be so."""
        from ..record.svg import line_chart
        from ..studies.base import figures_for_record

        title = f"{self.study.TITLE}: axis {self.axis_key or self.identity.get('axis', '')}"
        parts = [f"<div class='wb-snapshot'><h3 style='margin:4px 0'>{html.escape(title)} "
                 "<span style='font-weight:normal;color:#555;font-size:80%'>(saved view of the panel)</span></h3>",
                 caution_html()]
        if self.outcome is None:
            parts.append(f"<p><b>No valid result:</b> {html.escape(str(self.error))}</p></div>")
            return "".join(parts)
        if self.stale:
            parts.append("<div style='color:#8a0010;font-weight:bold;border:2px solid #8a0010;padding:4px 8px'>"
                         "&#9888; OUT OF DATE: an entry was not accepted when this was saved; what follows are "
                         f"the last valid results. ({html.escape(self.status_text())})</div>")
        if self.evaluation is not None:
            parts.append(verdict_html(self.evaluation.verdict()))
        parts.append(self.changes_box._body)
        parts.append(results_html(self.outcome.results))
        parts.append(findings_html(self.outcome.findings, title=f"Checks of this study ({self.study.TITLE})"))
        for fig in figures_for_record(self.outcome.figures).values():
            # an image of the SVG: a notebook opened without trust keeps images but strips inline
            # SVG, and the image is one line of the saved file
            svg = line_chart(fig).replace("<svg ", '<svg xmlns="http://www.w3.org/2000/svg" '
                                                   'font-family="DejaVu Sans, Helvetica, Arial, sans-serif" ', 1)
            data = base64.b64encode(svg.encode("utf-8")).decode("ascii")
            parts.append(f"<figure style='margin:6px 0'><figcaption><b>{html.escape(fig['title'])}</b></figcaption>"
                         f"<img class='wb-snapshot-figure' alt='{html.escape(fig['title'], quote=True)}' "
                         f"style='max-width:100%' src='data:image/svg+xml;base64,{data}'></figure>")
        parts.append("</div>")
        # a table row or a drawn element a line: a changed input moves a few lines of the saved
        # notebook, not one long line
        return "\n".join(parts).replace("</tr>", "</tr>\n").replace("/>", "/>\n")

    def status_text(self) -> str:
        """The status line as plain text."""
        import re

        return html.unescape(re.sub(r"<[^>]+>", "", self.status.value)).strip()

    # ----------------------------------------------------------------- compute
    def _on_control(self, ctl: QuantityControl) -> None:
        if not ctl.valid:
            self._mark_stale(f"{_where(ctl)}: {ctl.entry.value!r} was not accepted ({ctl.error_allowed}); "
                             "showing the last valid results.")
            return
        self.values[ctl.section][ctl.field.key] = ctl.value
        self.recompute()

    def recompute(self) -> bool:
        """Run every study of the axis on the current values; return whether this panel's
        study succeeded (the verdict then covers the whole axis at these inputs)."""
        bad = [c for c in self.controls.values() if not c.valid]
        if bad:
            self._mark_stale(f"{_where(bad[0])}: {bad[0].entry.value!r} was not accepted.")
            return False
        kind = self.study.KIND
        try:
            ev = evaluate(self.values, self.kinds)
        except InternalDefect as exc:
            self._mark_stale(str(exc) + ".")
            return False
        try:
            if kind in ev.refused:
                raise ev.refused[kind]
            outcome = ev.outcomes.get(kind)
            if outcome is None:
                # a study that does not apply to the axis as designed (the counterbalance
                # study on an axis without one) still answers in its own panel
                outcome = self.study.run(copy.deepcopy(self.values))
        except InputError as exc:
            self.error = exc
            target = self._control_named(exc.field)
            why = str(exc)
            if target is not None:
                # name the field as the user sees it and echo what was typed, not a converted value
                typed = target.entry.value if isinstance(target.entry, W.Text) else str(exc.given)
                why = f"{_where(target)}: {typed!r} is refused by the {self.study.TITLE.lower()} study; allowed: " \
                      f"{exc.allowed}"
                target._set_valid(False, exc.allowed, typed)
                target.valid = True  # a cross-field refusal: the entry itself parsed
                fold = self._fold_of.get((target.section, target.field.key))
                if fold is not None:
                    self.folds.selected_index = fold   # never blame a field the user cannot see
            self._mark_stale(why)   # the last valid verdict stays, marked out of date
            return False
        self.error = None
        self.outcome = outcome
        self.evaluation = ev
        self.compute_count += 1
        self.stale = False
        self.status.value = ""
        self.plot_note.value = ""
        self.verdict_box.update(verdict_html(ev.verdict()))
        self.results_box.update(results_html(outcome.results))
        self.findings_box.update(findings_html(outcome.findings, title=f"Checks of this study ({self.study.TITLE})"))
        self._update_plots(outcome)
        self._show_changes()
        self._refresh_snapshot()
        return True

    # ----------------------------------------------------------------- design file and record
    def _difference_rows(self, first: Mapping, second: Mapping) -> list[tuple]:
        rows = []
        for sec, key, a, b in design_changes(first, second):
            f = inputs.section(sec)[key]
            rows.append((f.label, inputs.section(sec).title, _text(f, a), _text(f, b)))
        return rows

    def changes_from_design(self) -> list[tuple]:
        """``[(section, key, file value, panel value)]``: the inputs Record would write into
        the design file."""
        return design_changes(self.design_values, self.values)

    def _show_changes(self) -> None:
        rows = self._difference_rows(self.design_values, self.values)
        name = self.design_path.name if self.design_path else "the design file"
        self.changes_box.update(differences_html(
            rows, (f"Inputs that differ from {name} (Record study writes them into it):", "Design file", "This panel"),
            empty=f"Every input is as {name} gives it."))

    def _show_record_notice(self) -> None:
        if self.record_problem:
            self.notice.value = ("<div style='border-left:4px solid #8a0010;padding:4px 10px;background:#fde7e9'>"
                                 f"&#9888; The axis record could not be read: {html.escape(self.record_problem)}. "
                                 "The panel shows the design file's values; Record study is refused until the "
                                 "record is repaired or moved away, so nothing recorded is lost.</div>")
            self.use_record_button.layout.display = "none"
            self.keep_file_button.layout.display = "none"
            self.notice_box.layout.display = None
            return
        if not self.record_values:
            self.notice_box.layout.display = "none"
            return
        rows = self._difference_rows(self.design_values, self.record_values)
        name = self.record_path.name if self.record_path else "the axis record"
        file = self.design_path.name if self.design_path else "the design file"
        self.notice.value = (
            "<div style='border-left:4px solid #6b4a00;padding:4px 10px;background:#fff4d6'>"
            f"&#9650; <b>The axis record {html.escape(name)} holds other values than {html.escape(file)}.</b> "
            "The panel shows the design file's values; nothing of the record is applied unless you choose it."
            + differences_html(rows, ("", "Design file", "Record")) + "</div>")
        self.use_record_button.layout.display = None
        self.keep_file_button.layout.display = None
        self.notice_box.layout.display = None

    def load_record_values(self) -> bool:
        """Put the record's values into the panel (the design file is written only on Record)."""
        if not self.record_values:
            return False
        for sec, fields in self.record_values.items():
            for key, value in fields.items():
                if sec not in self.values:
                    continue
                self.values[sec][key] = value
                ctl = self.controls.get((sec, key))
                if ctl is not None:
                    ctl.set_value(value)
        self.record_values = None
        self.notice_box.layout.display = "none"
        ok = self.recompute()
        self.record_status.value = ("<span class='wb-loaded'>Loaded the record's values. The design file changes "
                                    "only when you press Record study.</span>")
        return ok

    def dismiss_record_notice(self) -> None:
        """Keep the design file's values and hide the notice."""
        self.record_values = None
        self.notice_box.layout.display = "none"

    def _control_named(self, name: str):
        for (section, key), ctl in self.controls.items():
            if name in (key, f"{section}.{key}") or name.endswith(f".{section}.{key}"):
                return ctl
        return None

    def _mark_stale(self, why: str) -> None:
        self.stale = True
        self.status.value = (f"<div style='color:#8a0010'>&#9888; {html.escape(why)} "
                             "Results below are out of date.</div>")
        self.verdict_box.mark_stale()
        self.results_box.mark_stale()
        self.findings_box.mark_stale()
        self.plot_note.value = ("<div class='wb-stale-note' style='color:#8a0010;font-weight:bold'>"
                                "&#9888; Out of date: the curves below are the last valid results.</div>")
        self._refresh_snapshot()

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
                        regimes=outcome.regimes.get(key), limits=fig.get("limits"), title=fig["title"],
                        bands=fig.get("bands"))
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
        from ..record import load

        if self.record_path is not None and self.record_path.exists():
            return load(self.record_path)
        return None

    def _refuse_if_stale(self, action: str) -> None:
        if self.stale or self.outcome is None:
            why = f" ({self.error})" if self.error is not None else ""
            raise InputError(action, "out-of-date results" + why,
                             f"valid entries in every field before you {action.lower()} (fix the marked field)")
        if self.evaluation is not None and self.evaluation.refused:
            kind, exc = next(iter(self.evaluation.refused.items()))
            raise InputError(action, f"inputs the {kind} study refuses ({exc})",
                             "inputs every study of the axis accepts")

    def record(self):
        """Re-run every study of the axis on the panel's inputs and write the axis record
        (atomic); write the changed inputs into the design file first. Return the record."""
        from ..record import save

        if self.record_path is None:
            raise InputError("record file", "none", "a panel opened with a record path")
        self._refuse_if_stale("Record")
        existing = self._current_record()   # a damaged record refuses here: nothing is lost
        # the evaluation behind the results on screen: every study already ran on these inputs
        # (every entry recomputes it; a stale or refused one was turned away just above)
        ev = self.evaluation
        note = self.note.value.strip()
        study_notes = {k: list(s.notes) for k, s in (existing.studies.items() if existing else ())}
        if note:
            study_notes.setdefault(self.study.KIND, []).append(note)
        kept = [n for n in (existing.notes if existing else ()) if not n.startswith(_AUTO_NOTES)
                and " study left out: " not in n]
        source = self.design_path.name if self.design_path else "a design file"
        notes = [f"Recorded from the {self.study.TITLE} panel on {source}, axis {self.axis_key}; every study "
                 "re-run on these inputs.", *kept]
        rec = ev.to_record(self.identity, notes=notes, study_notes=study_notes)
        written = []
        if self.design_path is not None and self.changes_from_design():
            typed = {k: c.entry.value for k, c in self.controls.items() if isinstance(c.entry, W.Text)}
            try:
                written = write_inputs(self.design_path, self.axis_key, self.values, typed)
            except InternalDefect as exc:
                self.record_status.value = (f"<span class='wb-refused'>Not recorded: {html.escape(str(exc))}; "
                                            "the design file and the record are unchanged.</span>")
                return None
        self.record_path.parent.mkdir(parents=True, exist_ok=True)
        save(rec, self.record_path)
        self.design_values = copy.deepcopy(self.values)
        self.record_values = None
        self.notice_box.layout.display = "none"
        self.note.value = ""
        self._show_changes()
        also = ""
        if written:
            keys = ", ".join(k.rsplit(".", 2)[-2] + "." + k.rsplit(".", 1)[-1] for k in written)
            also = f"; wrote {len(written)} changed input(s) into {html.escape(self.design_path.name)}: {html.escape(keys)}"
        self.record_status.value = (f"<span class='wb-recorded'>Recorded the axis into "
                                    f"{html.escape(self.record_path.name)}: {len(rec.studies)} studies, all on "
                                    f"these inputs{also}.</span>")
        return rec

    def export(self):
        """Write the HTML review copy of the axis record; return its path.

        Refused while the results are out of date, when nothing is recorded yet, and when the
        record holds other inputs than the panel (record first, so the copy shows this design).
        """
        from ..record import export_html

        if self.export_path is None:
            raise InputError("export file", "none", "a panel opened with an export path")
        self._refuse_if_stale("Export")
        rec = self._current_record()
        if rec is None:
            raise InputError("Export", "no axis record yet", "a recorded axis: press Record study first")
        recorded = rec.study_values(self.study.KIND) if self.study.KIND in rec.studies else rec.values()
        moved = [(s, k) for s, k, _a, _b in design_changes(recorded, self.values) if k in recorded.get(s, {})]
        if moved:
            s, k = moved[0]
            label = inputs.section(s)[k].label
            raise InputError("Export", f"a record made with other inputs than this panel ({label} and "
                             f"{len(moved) - 1} more)" if len(moved) > 1 else
                             f"a record made with another {label} than this panel",
                             "a record of these inputs: press Record study first, so the review copy shows this design")
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
        """Deterministic plain text: the whole axis's verdict, the inputs that differ from the
        design file, then this study's inputs, results and findings."""
        if self.outcome is None:
            return f"{self.study.TITLE}: no valid result yet ({self.error})"
        lines = []
        if self.evaluation is not None:
            lines += ["Whole-axis verdict (every study of this axis at these inputs):",
                      self.evaluation.verdict().to_text(), ""]
        # the inputs of the results shown (the last valid ones while an entry is refused)
        shown = self.evaluation.values if self.evaluation is not None else self.outcome.values
        changes = self._difference_rows(self.design_values, shown)
        if changes:
            lines.append("Inputs that differ from the design file:")
            lines += [f"  {lbl} ({sec}): {a} in the file, {b} here" for lbl, sec, a, b in changes]
        else:
            lines.append("Every input is as the design file gives it.")
        text = "\n".join(lines) + "\n\n" + self.outcome.summary()
        if self.stale:
            text += "\n\n(out of date: an entry was not accepted)"
        return text


def _where(ctl) -> str:
    """A field as the user sees it: its label and the section it sits in."""
    return f"{ctl.field.label} ({inputs.section(ctl.section).title})"


def _text(f, value) -> str:
    if value is None:
        return "(not given)"
    try:
        return f.as_text(value, digits=4)
    except (TypeError, ValueError, InputError):
        return str(value)


__all__ = ["StudyPanel"]
