"""Unit-aware input controls built from field declarations (:mod:`workbook.fields`).

A :class:`QuantityControl` is a labelled text entry that takes a value with a unit
("80 mm" or "3.15 in"), an optional slider in the field's display unit, and a message line
beside it. It validates on Enter or when the entry loses focus: a bad entry shows the
field's message and leaves :attr:`value` at the last valid value, so the study keeps its
last valid results (marked out of date by the panel).

Widgets carry CSS classes so that tests and style sheets can find them:
``wb-field`` and ``wb-field-<section>-<key>`` on the row, ``wb-entry`` on the text box,
``wb-message`` on the message line, ``wb-invalid`` on a row whose entry is refused.
"""

from __future__ import annotations

import html
from typing import Any, Callable

import ipywidgets as W

from ..errors import InputError
from ..fields import Field
from ..record.verdict import pretty_unit

LABEL_WIDTH = "15em"


def css_name(text: str) -> str:
    """A CSS-class-safe name: ``"flow_valve"`` -> ``"flow-valve"``."""
    return "".join(ch if ch.isalnum() else "-" for ch in text.lower()).strip("-")


class QuantityControl:
    """Text entry (with unit), optional slider and message for one :class:`Field`.

    Parameters
    ----------
    section : str
        Section key, used for the CSS class and in messages.
    field : Field
        The declaration that parses and bounds the entry.
    value : Any
        Initial value in SI (or text / choice for non-quantity fields).
    slider : bool
        Show a slider when the field declares a slider range.
    """

    def __init__(self, section: str, field: Field, value: Any, slider: bool = True):
        self.section = section
        self.field = field
        self._value = value
        self._callbacks: list[Callable[["QuantityControl"], None]] = []
        self._syncing = False
        self.valid = True
        self.error_allowed = ""
        label = W.HTML(f"<b>{html.escape(field.label)}</b>",
                       layout=W.Layout(width=LABEL_WIDTH, flex="0 0 auto"), tooltip=field.help)
        self.message = W.HTML("", layout=W.Layout(flex="1 1 auto", min_width="10em"))
        self.message.add_class("wb-message")
        self.entry: W.Widget
        self.slider = None
        if field.dimension == "choice":
            self.entry = W.Dropdown(options=list(field.choices), value=value,
                                    layout=W.Layout(width="14em", flex="0 0 auto"))
            self.entry.observe(self._on_choice, names="value")
        elif field.dimension == "flag":
            self.entry = W.Checkbox(value=bool(value), indent=False, layout=W.Layout(width="14em", flex="0 0 auto"))
            self.entry.observe(self._on_choice, names="value")
        else:
            self.entry = W.Text(value=self._text_of(value), continuous_update=False,
                                placeholder=field.default_text(), layout=W.Layout(width="14em", flex="0 0 auto"))
            self.entry.observe(self._on_text, names="value")
            if slider and field.slider and field.is_quantity and field.dimension != "quantity_list":
                lo, hi, step = field.slider
                self.slider = W.FloatSlider(min=lo, max=hi, step=step, value=self._slider_value(value),
                                            continuous_update=False, readout=False,
                                            layout=W.Layout(width="12em", flex="0 0 auto"))
                self.slider.observe(self._on_slider, names="value")
        self.entry.add_class("wb-entry")
        unit = W.HTML(self._unit_html(), layout=W.Layout(width="9em", flex="0 0 auto"))
        unit.add_class("wb-unit")
        self.unit_label = unit
        parts = [label, self.entry]
        # every row keeps the slider's column, so units and help line up
        parts.append(self.slider if self.slider is not None
                     else W.HTML("", layout=W.Layout(width="12em", flex="0 0 auto")))
        parts += [unit, self.message]
        self.widget = W.HBox(parts, layout=W.Layout(align_items="center"))
        self.widget.add_class("wb-field")
        self.widget.add_class(f"wb-field-{css_name(section)}-{css_name(field.key)}")
        self._show_help()

    # ----------------------------------------------------------------- values
    @property
    def value(self):
        """The last valid value (SI for quantities)."""
        return self._value

    def set_value(self, value, notify: bool = False) -> None:
        """Set a valid value from code (SI), updating entry and slider."""
        self._value = value
        self._syncing = True
        try:
            if isinstance(self.entry, W.Text):
                self.entry.value = self._text_of(value)
            else:
                self.entry.value = value
            if self.slider is not None:
                self.slider.value = self._slider_value(value)
        finally:
            self._syncing = False
        self.unit_label.value = self._unit_html()
        self._set_valid(True)
        if notify:
            self._notify()

    def on_change(self, callback: Callable[["QuantityControl"], None]) -> None:
        """Call ``callback(control)`` after every entry, valid or not."""
        self._callbacks.append(callback)

    def submit(self, text: str) -> bool:
        """Enter ``text`` as if typed; return whether it was accepted."""
        if isinstance(self.entry, W.Text):
            if self.entry.value == text:
                self._on_text({"new": text})
            else:
                self.entry.value = text
        else:
            self.entry.value = text
        return self.valid

    # ----------------------------------------------------------------- events
    def _on_text(self, change) -> None:
        if self._syncing:
            return
        text = change["new"]
        try:
            value = self.field.parse(text)
        except InputError as exc:
            self.error_allowed = exc.allowed
            self._set_valid(False, exc.allowed, text)
        else:
            self._value = value
            self._set_valid(True)
            self.unit_label.value = self._unit_html(text)
            if self.slider is not None:
                self._syncing = True
                try:
                    self.slider.value = self._slider_value(value)
                finally:
                    self._syncing = False
        self._notify()

    def _on_slider(self, change) -> None:
        if self._syncing:
            return
        text = f"{change['new']:g} {self.field.unit}".strip()
        self._syncing = True
        try:
            self.entry.value = text
        finally:
            self._syncing = False
        self._on_text({"new": text})

    def _on_choice(self, change) -> None:
        if self._syncing:
            return
        self._value = change["new"]
        self._set_valid(True)
        self._notify()

    def _notify(self) -> None:
        for cb in self._callbacks:
            cb(self)

    # ----------------------------------------------------------------- display
    def _set_valid(self, ok: bool, allowed: str = "", given: str = "") -> None:
        self.valid = ok
        if ok:
            self.widget.remove_class("wb-invalid")
            self.entry.layout.border = None
            self._show_help()
        else:
            self.widget.add_class("wb-invalid")
            self.entry.layout.border = "2px solid #b00020"
            self.message.value = (
                "<span style='color:#b00020'>&#9888; not accepted: "
                f"{html.escape(given)!s}. Allowed: {html.escape(allowed)}</span>"
            )

    def _show_help(self) -> None:
        self.message.value = f"<span style='color:#666;font-size:90%'>{html.escape(self.field.help)}</span>"

    def _text_of(self, value) -> str:
        """The value as the entry shows it: four significant digits, units as people write
        them ("16 cm³", "40 °C"); the control keeps the full value."""
        if value is None:
            return ""
        return pretty_unit(self.field.as_text(value, digits=4))

    def _unit_html(self, typed: str = "") -> str:
        """The unit beside the entry; when the entry holds a value in another unit ("3 in"),
        what it is in the field's unit ("= 76.2 mm"), so the two never contradict."""
        unit = pretty_unit(self.field.unit)
        shown = self._text_of(self._value) if typed else ""
        if typed and shown and pretty_unit(typed.strip()) != shown and any(ch.isalpha() or ch in "°³²" for ch in typed):
            return f"<span style='color:#555'>= {html.escape(shown)}</span>"
        return f"<span style='color:#555'>{html.escape(unit)}</span>"

    def _slider_value(self, value) -> float:
        lo, hi, _ = self.field.slider
        try:
            shown = float(self.field.to_display(value))
        except (TypeError, ValueError):
            shown = lo
        return min(max(shown, lo), hi)


def control_for(section: str, field: Field, value: Any, slider: bool = True) -> QuantityControl:
    """The control for one field (quantity, list, choice or flag)."""
    return QuantityControl(section, field, value, slider=slider)


__all__ = ["QuantityControl", "control_for", "css_name"]
