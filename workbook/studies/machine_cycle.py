"""Machine study: the cycle of the axes on one power unit, its heat, oil temperature and motor.

Inputs: every axis's values (``{axis: {section: {field: SI}}}``, as for the axis studies)
and the cycle (``{"values": {field: SI} of workbook.inputs.CYCLE, "steps": (Step, ...)}``,
from :func:`workbook.cycle_file.parse_cycle`). The physics is :mod:`workbook.cycle`; this
module grades it and compares the alternatives an engineer weighs, on the same cycle:

* ``meter-in``: every meter-out flow valve moved to the driving chamber, a compensated
  setting scaled by the area ratio so that the speed stays;
* ``unloading``: the pump unloaded to tank during dwells and the idle rest of the period;
* ``smaller pump``: the pump flow cut to the largest flow a metered step takes, plus 10 %
  (common practice margin for the compensator); steps the pump drives directly slow down;
* ``counterbalance``: a back-pressure valve replaced by a counterbalance at the same setting;
* ``all of them``: every change above that applies, together.

Findings (machine level; they replace the axis check's per-point heat share as the verdict
on heat, which stays in the axis records as information):

``CYC-OIL-TEMP``   steady oil temperature at most the highest allowed (fail above)
``CYC-COOLER``     the installed cooler at least the duty needed to hold it (caution below)
``CYC-MOTOR-RMS``  RMS shaft power at most the installed drive (fail; common practice)
``CYC-MOTOR-PEAK`` peak shaft power at most the drive times its short-time overload (fail)
``CYC-TANK-SIZE``  tank volume at least ``tank_minutes`` of pump flow (caution; common practice)
``CYC-STEADY``     every step has a steady state (caution: a runaway step's energy is not balanced)
"""

from __future__ import annotations

import copy
import json
import math
from dataclasses import dataclass, field
from typing import Mapping

import numpy as np

from .. import CAUTION
from ..circuit import axis_from_values
from ..constants import TO_LPM
from ..cycle import HEAT_TERMS, MachineCycle, consistent_cycle, spec_from_values, step_from_data, step_to_data, timeline, warm_up
from ..errors import InputError
from ..inputs import CYCLE
from ..record import Record, Study, inputs_from_values, values_from_inputs
from . import base

KIND = "machine-cycle"
TITLE = "Machine cycle: energy, heat, oil temperature and the power unit"
PURPOSE = ("Over the machine's real cycle, how hot the oil gets, whether the tank sheds the heat, what cooler "
           "is needed, whether the motor is big enough, and which change would help most.")
#: identity axis of the machine record
MACHINE_AXIS = "machine"
#: margin kept over the largest metered flow when a smaller pump is tried (common practice)
PUMP_MARGIN = 0.10
ALTERNATIVES = ("as drawn", "meter-in", "unloading", "smaller pump", "counterbalance", "all of them")
_ALT_WORDS = {
    "as drawn": "the design as drawn",
    "meter-in": "meter-in instead of meter-out",
    "unloading": "pump unloaded during dwells",
    "smaller pump": "a smaller pump, same metered speeds",
    "counterbalance": "counterbalance in place of a back-pressure valve",
    "all of them": "every change above that applies, together",
}
_C0 = 273.15


@dataclass
class MachineOutcome:
    """The machine study's answer: results, findings and figures in the record's forms, the
    cycle (:class:`~workbook.cycle.MachineCycle`) and the alternatives compared."""

    machine: MachineCycle
    results: dict
    findings: list
    figures: dict
    alternatives: list
    notes: list = field(default_factory=list)
    kind: str = KIND
    title: str = TITLE

    def to_study(self, notes=()) -> Study:
        return Study(kind=KIND, title=TITLE, results={k: base._tidy_result(r) for k, r in self.results.items()},
                     findings=[base._tidy_finding(f) for f in self.findings],
                     figures=base.figures_for_record(self.figures), notes=list(self.notes) + list(notes))

    def step_rows(self) -> list[dict]:
        """The cycle as a table: one row per step, display units."""
        rows = []
        for s in self.machine.result.steps:
            rows.append({"step": s.step.label, "axis": s.step.axis or "-",
                         "motion": s.step.direction or ("idle" if s.step.kind == "dwell" else ""),
                         "load kN": s.step.load / 1e3, "time s": s.duration, "speed mm/s": s.speed * 1e3,
                         "pump bar": s.p_pump / 1e5, "flow L/min": s.q_pump * TO_LPM, "shaft kW": s.shaft / 1e3,
                         "useful kW": s.useful / 1e3, "heat kW": s.heat_total / 1e3, "regime": s.regime})
        return rows

    def summary(self) -> str:
        """Deterministic plain text: caution, the cycle, results, findings, alternatives."""
        lines = [TITLE, "=" * len(TITLE), CAUTION, "", "Cycle:"]
        for r in self.step_rows():
            lines.append(f"  {r['step']:<28} {r['axis']:<6} {r['motion']:<8} {r['time s']:7.2f} s "
                         f"{r['pump bar']:6.1f} bar {r['shaft kW']:6.2f} kW shaft {r['heat kW']:6.2f} kW heat "
                         f"({r['regime']})")
        lines += ["", "Results:"]
        for r in self.results.values():
            lines.append(f"  {r['label']:<52} {base._num(r['value'])} {r['unit']}".rstrip())
        lines += ["", "Findings:"]
        for f in self.findings:
            lines.append(f"  [{f['level'].upper():7}] {f['rule_id']}: {f['statement']} ({base._num(f['value'])} vs "
                         f"{base._num(f['limit'])} {f['unit']}; {f['source']})")
        lines += ["", "Alternatives (same cycle):"]
        lines += ["  " + line for line in alternatives_text(self.alternatives)]
        return "\n".join(lines)


#: short names of the alternatives for the table
_ALT_SHORT = {"as drawn": "as drawn", "meter-in": "meter-in for meter-out", "unloading": "unloaded in dwells",
              "smaller pump": "smaller pump", "counterbalance": "counterbalance for back-pr.",
              "all of them": "all of them together"}


def alternatives_text(rows) -> list[str]:
    """The alternatives as aligned text lines (header first), at most 78 characters."""
    out = [f"{'alternative':<27} {'shaft kJ':>9} {'heat kW':>8} {'oil degC':>9} {'cooler kW':>10} {'busy s':>7}"]
    for a in rows:
        if not a["applies"]:
            out.append(f"{_ALT_SHORT[a['key']]:<27} not applicable: {a['why']}")
            continue
        out.append(f"{_ALT_SHORT[a['key']]:<27} {a['shaft_kj']:9.1f} {a['heat_kw']:8.3f} {a['oil_c']:9.1f} "
                   f"{a['cooler_kw']:10.3f} {a['busy_s']:7.1f}")
    return out


# --------------------------------------------------------------------------- evaluation
def _axes(axes_values: Mapping) -> dict:
    out = {}
    for key, values in axes_values.items():
        try:
            out[key] = axis_from_values(values)
        except InputError as exc:
            raise exc.qualified(f"axes.{key}.{exc.field}") from None
    return out


def _machine(axes_values: Mapping, cycle: Mapping) -> MachineCycle:
    spec = spec_from_values(cycle["values"], cycle["steps"])
    return consistent_cycle(_axes(axes_values), spec)


def _alt_values(key: str, axes_values: Mapping, cycle: Mapping, drawn: MachineCycle):
    """(axes_values, cycle) of the alternative ``key``, or a reason it does not apply."""
    av = copy.deepcopy({k: {s: dict(v) for s, v in vals.items()} for k, vals in axes_values.items()})
    cy = {"values": dict(cycle["values"]), "steps": tuple(cycle["steps"])}
    used = {s.axis for s in cycle["steps"] if s.kind == "motion"}
    if key == "meter-in":
        changed = [k for k in used if av[k]["flow_valve"]["arrangement"] == "meter-out"]
        if not changed:
            return "no axis of the cycle meters out"
        for k in changed:
            fv, cyl = av[k]["flow_valve"], av[k]["cylinder"]
            a1 = math.pi * cyl["bore"] ** 2 / 4
            a3 = a1 - math.pi * cyl["rod"] ** 2 / 4
            fv["arrangement"] = "meter-in"
            if fv.get("kind") == "compensated":
                scale = a1 / a3 if fv["direction"] == "extend" else a3 / a1
                fv["setting"] = fv["setting"] * scale
        return av, cy
    if key == "unloading":
        if cy["values"]["idle"] == "unloaded":
            return "the pump already unloads during dwells"
        cy["values"]["idle"] = "unloaded"
        return av, cy
    if key == "smaller pump":
        metered = [s.q_cylinder for s in drawn.result.steps if s.regime in ("metering", "compensator starved")]
        if not metered:
            return "no step is metered by a flow valve"
        q_new = max(metered) * (1.0 + PUMP_MARGIN)
        q_now = drawn.result.steps[0].q_pump
        if q_new >= q_now * 0.99:
            return f"a metered step takes {max(metered) * TO_LPM:.3g} L/min, within 10 % of the pump"
        for vals in av.values():
            eta_v = vals["supply"].get("volumetric_efficiency") or 1.0
            vals["supply"]["pump_flow"] = q_new
            vals["supply"]["volumetric_efficiency"] = eta_v
        return av, cy
    if key == "counterbalance":
        changed = [k for k in used if av[k]["holding"].get("kind") == "back-pressure"]
        if not changed:
            return "no axis of the cycle has a back-pressure valve"
        for k in changed:
            av[k]["holding"]["kind"] = "counterbalance"
            if not av[k]["holding"].get("pilot_ratio"):
                av[k]["holding"]["pilot_ratio"] = 3.0
        return av, cy
    return av, cy


def _row(key: str, m: MachineCycle | None, why: str = "") -> dict:
    if m is None:
        return {"key": key, "applies": False, "why": why}
    r = m.result
    return {"key": key, "applies": True, "why": "", "shaft_kj": r.energy("shaft") / 1e3,
            "heat_kw": r.mean_heat / 1e3, "oil_c": m.steady - _C0, "cooler_kw": m.cooler_needed / 1e3,
            "busy_s": r.busy_time, "rms_kw": r.rms_power / 1e3}


def alternatives(axes_values: Mapping, cycle: Mapping, drawn: MachineCycle) -> list[dict]:
    """Each alternative of :data:`ALTERNATIVES` on the same cycle (a row per alternative)."""
    rows = [_row("as drawn", drawn)]
    together = (axes_values, cycle)
    for key in ALTERNATIVES[1:-1]:
        got = _alt_values(key, *together, drawn)
        together = together if isinstance(got, str) else got
    for key in ALTERNATIVES[1:]:
        if key == "all of them":
            applied = [r for r in rows[1:] if r["applies"]]
            if len(applied) < 2:
                rows.append(_row(key, None, "fewer than two changes apply"))
                continue
            try:
                rows.append(_row(key, _machine(*together)))
            except InputError as exc:
                rows.append(_row(key, None, str(exc)))
            continue
        got = _alt_values(key, axes_values, cycle, drawn)
        if isinstance(got, str):
            rows.append(_row(key, None, got))
            continue
        try:
            rows.append(_row(key, _machine(*got)))
        except InputError as exc:
            rows.append(_row(key, None, str(exc)))
    return rows


def best_alternative(rows) -> dict | None:
    """The single change that lowers the mean heat most against the design as drawn (None if none does)."""
    drawn = rows[0]
    better = [r for r in rows[1:] if r["applies"] and r["key"] != "all of them"
              and r["heat_kw"] < drawn["heat_kw"] * (1 - 1e-9)]
    return min(better, key=lambda r: r["heat_kw"]) if better else None


def _finding(rule, statement, quantity, value, limit, dimension, unit, level, source, detail="", higher=True):
    conv = (lambda v: v - _C0) if dimension == "temperature" else (lambda v: v)
    vv, ll = conv(value), conv(limit)
    # margin as a share of the limit; none against a zero limit (no cooler fitted)
    margin = (((ll - vv) if higher else (vv - ll)) / abs(ll)) if ll else None
    return base.finding(rule, statement, quantity, value, limit, dimension, unit, level, source, margin, detail)


def run_machine(axes_values: Mapping, cycle: Mapping) -> MachineOutcome:
    """The machine study on every axis's values and the cycle (see the module text)."""
    m = _machine(axes_values, cycle)
    spec, r = m.spec, m.result
    axes = _axes(axes_values)
    first = next(iter(axes.values()))
    drive = first.supply.drive_power
    q_pump = first.supply.flow
    res = {
        "period": base.result("Cycle period", spec.period, "time", "s"),
        "busy_time": base.result("Time of the given steps", r.busy_time, "time", "s"),
    }
    res["shaft_energy"] = {"value": r.energy("shaft") / 1e3, "unit": "kJ", "label": "Shaft energy per cycle"}
    res["useful_energy"] = {"value": r.energy("useful") / 1e3, "unit": "kJ", "label": "Work on the loads per cycle"}
    for term in HEAT_TERMS:
        res["heat_" + term.replace(" ", "_")] = {"value": r.energy(term) / 1e3, "unit": "kJ",
                                                  "label": f"Heat per cycle: {term}"}
    res["mean_heat"] = base.result("Mean heat into the oil", r.mean_heat, "power", "kW")
    res["rms_power"] = base.result("RMS shaft power", r.rms_power, "power", "kW")
    res["peak_power"] = base.result("Peak shaft power", r.peak_power, "power", "kW")
    res["oil_temperature"] = base.result("Steady oil temperature", m.steady, "temperature", "degC")
    res["oil_temperature_tank"] = base.result("Steady oil temperature, tank alone", m.steady_tank_alone,
                                              "temperature", "degC")
    res["cooler_needed"] = base.result(f"Cooler duty to hold {spec.oil_max - _C0:g} degC", m.cooler_needed,
                                       "power", "kW")
    res["tank_needed"] = base.result(f"Tank that holds {spec.oil_max - _C0:g} degC alone (5 V^(2/3) surface)",
                                     m.tank_needed, "volume", "L")
    res["time_constant"] = {"value": m.tau / 3600.0, "unit": "h", "label": "Warm-up time constant C/(kA)"}
    res["heat_capacity"] = {"value": m.heat_capacity / 1e3, "unit": "kJ/K", "label": "Heat capacity of oil and steel"}

    beyond = " (beyond the oil model's validity: an estimate)" if m.limited else ""
    f = [
        _finding("CYC-OIL-TEMP", "The steady oil temperature over the cycle stays at most the highest allowed.",
                 "steady oil temperature", m.steady, spec.oil_max, "temperature", "degC",
                 "fail" if m.steady > spec.oil_max + 1e-9 else "pass",
                 "lumped tank balance (from memory); limit common practice for mineral oil",
                 f"mean heat {r.mean_heat / 1e3:.3g} kW, tank k A {spec.tank.conductance:.3g} W/K, ambient "
                 f"{spec.ambient - _C0:g} degC, cooler {spec.cooler / 1e3:g} kW{beyond}"),
        _finding("CYC-COOLER", "The installed cooler takes the heat the tank cannot shed at the highest oil "
                 "temperature.", "cooler duty needed", m.cooler_needed, spec.cooler, "power", "kW",
                 "caution" if m.cooler_needed > spec.cooler + 1e-9 else "pass",
                 "lumped tank balance (from memory)",
                 f"fit a cooler of at least {m.cooler_needed / 1e3:.3g} kW, or a tank of about "
                 f"{m.tank_needed * 1e3:.3g} L" if m.cooler_needed > spec.cooler else "no cooler duty missing"),
        _finding("CYC-TANK-SIZE", "The tank holds at least the stated minutes of pump flow.", "tank oil volume",
                 spec.tank.volume, spec.tank_minutes * q_pump * 60.0, "volume", "L",
                 "caution" if spec.tank.volume < spec.tank_minutes * q_pump * 60.0 * (1 - 1e-12) else "pass",
                 "common practice (3 to 5 times the pump flow per minute)",
                 f"pump {q_pump * TO_LPM:.3g} L/min x {spec.tank_minutes:g} min", higher=False),
    ]
    if math.isfinite(drive):
        f.append(_finding("CYC-MOTOR-RMS", "The RMS shaft power over the cycle stays within the installed drive.",
                          "RMS shaft power", r.rms_power, drive, "power", "kW",
                          "fail" if r.rms_power > drive * (1 + 1e-12) else "pass",
                          "RMS power for motor thermal sizing (common practice)"))
        f.append(_finding("CYC-MOTOR-PEAK", "The peak shaft power stays within the drive's short-time overload.",
                          "peak shaft power", r.peak_power, drive * spec.motor_overload, "power", "kW",
                          "fail" if r.peak_power > drive * spec.motor_overload * (1 + 1e-12) else "pass",
                          "motor overload factor from the design (default from memory)",
                          f"drive {drive / 1e3:g} kW x {spec.motor_overload:g}"))
    bad = [s for s in r.steps if s.unbalanced != 0.0]
    if bad:
        worst = max(bad, key=lambda s: abs(s.unbalanced))
        f.append(base.finding("CYC-STEADY", "Every step of the cycle has a steady state (its energy balances).",
                              "power not accounted for", abs(worst.unbalanced), 0.0, "power", "kW", "caution",
                              "steady-state solution (force balance)", None,
                              f"step {worst.step.label!r} ({worst.regime}): no steady state, its heat is a "
                              "lower bound"))
    f.sort(key=lambda x: base.LEVEL_ORDER[x["level"]])

    tl = timeline(r)
    t = np.asarray(tl["t"])
    series = {"shaft power": np.asarray(tl["shaft"]) / 1e3, "heat into the oil": np.asarray(tl["heat"]) / 1e3,
              "work on the load": np.asarray(tl["useful"]) / 1e3}
    for key in axes:
        on = np.array([r.steps[i].step.axis == key for i in tl["step"]])
        series[f"shaft power, {key} moving"] = np.where(on, np.asarray(tl["shaft"]) / 1e3, np.nan)
    figures = {"timeline": {"title": "Power and heat over one cycle", "x_label": "time in the cycle (s)",
                            "y_label": "power (kW)", "x": t, "series": series,
                            "limits": {"installed drive": drive / 1e3} if math.isfinite(drive) else {}}}
    hours = np.linspace(0.0, 5.0 * m.tau, 121)
    start = spec.ambient
    temps = warm_up(hours, start, m.steady_tank_alone, m.tau)
    if m.steady < m.steady_tank_alone:     # a cooler holds it: flat at the held temperature once reached
        temps = np.minimum(temps, m.steady)
    figures["warm_up"] = {"title": "Oil temperature from a cold start", "x_label": "running time (h)",
                          "y_label": "oil temperature (degC)", "x": hours / 3600.0,
                          "series": {"oil temperature": temps - _C0},
                          "limits": {"highest allowed": spec.oil_max - _C0}}
    rows = alternatives(axes_values, cycle, m)
    for a in rows:
        if a["applies"]:
            k = a["key"].replace(" ", "_").replace("-", "_")
            res[f"alt_{k}_heat"] = {"value": a["heat_kw"], "unit": "kW", "label": f"Mean heat, {_ALT_WORDS[a['key']]}"}
            res[f"alt_{k}_oil"] = {"value": a["oil_c"], "unit": "degC",
                                   "label": f"Steady oil temperature, {_ALT_WORDS[a['key']]}"}
            res[f"alt_{k}_shaft"] = {"value": a["shaft_kj"], "unit": "kJ",
                                     "label": f"Shaft energy per cycle, {_ALT_WORDS[a['key']]}"}
    best = best_alternative(rows)
    notes = [f"Oil temperature consistent after {m.iterations} iteration(s) of the losses with viscosity.",
             "Steps run one after the other on the one pump; the other axes stand with their valves centred.",
             "The per-point heat share of each axis check stays in the axis records as information; this "
             "study is the machine's verdict on heat."]
    if best is not None:
        notes.append(f"Helps most: {_ALT_WORDS[best['key']]} (mean heat {best['heat_kw']:.3g} kW against "
                     f"{rows[0]['heat_kw']:.3g} kW as drawn).")
    notes.append("Machine inputs (JSON): " + json.dumps(machine_inputs_data(axes_values, cycle), sort_keys=True,
                                                        separators=(",", ":")))
    return MachineOutcome(m, res, f, figures, rows, notes)


def run(values):
    """The axis-study entry point: refused, the machine study needs every axis and the cycle."""
    raise InputError("study kind", repr(KIND), "a machine study run through run_machine(axes, cycle) "
                     "(axisbook evaluate runs it when the design file has a [cycle])")


# --------------------------------------------------------------------------- the machine record
def _cycle_entries(values: Mapping) -> dict:
    out = {}
    for f in CYCLE.fields:
        v = values.get(f.key)
        out[f.key] = None if v is None else (v if not f.is_quantity else f.as_text(v, digits=17))
    return out


def machine_inputs_data(axes_values: Mapping, cycle: Mapping) -> dict:
    """Everything the machine study ran on, as plain data: each axis's inputs in the record's
    entry form (units and SI), the cycle's fields as text with units, the steps in SI."""
    return {"axes": {k: inputs_from_values({s: v for s, v in vals.items()}) for k, vals in axes_values.items()},
            "cycle": _cycle_entries(cycle["values"]),
            "steps": [step_to_data(s) for s in cycle["steps"]]}


def inputs_from_data(data) -> tuple[dict, dict]:
    """``(axes_values, cycle)`` back from :func:`machine_inputs_data`, every part checked by
    its field (catalogue) or by :class:`~workbook.cycle.Step`."""
    if not isinstance(data, Mapping) or set(data) != {"axes", "cycle", "steps"}:
        raise InputError("machine inputs", "a damaged block", "axes, cycle and steps")
    axes_values = {}
    for key, entries in data["axes"].items():
        try:
            axes_values[key] = values_from_inputs(entries)
        except InputError as exc:
            raise exc.qualified(f"machine inputs.axes.{key}.{exc.field}") from None
    values = {}
    for f in CYCLE.fields:
        raw = data["cycle"].get(f.key)
        try:
            values[f.key] = f.default_si() if raw is None and not f.optional else f.parse(raw)
        except InputError as exc:
            raise InputError(f"machine inputs.cycle.{f.key}", exc.given, exc.allowed) from None
    steps = tuple(step_from_data(s, f"machine inputs.steps[{i}]") for i, s in enumerate(data["steps"], 1))
    return axes_values, {"values": values, "steps": steps}


INPUTS_NOTE = "Machine inputs (JSON): "


def record_inputs(record: Record) -> tuple[dict, dict]:
    """The inputs a machine record holds (its study's note), checked."""
    study = record.studies.get(KIND)
    if study is None:
        raise InputError("studies", "a record without a machine-cycle study", "a machine record")
    notes = [n for n in study.notes if n.startswith(INPUTS_NOTE)]
    if len(notes) != 1:
        raise InputError(f"studies.{KIND}.notes", "no machine inputs", "one note holding the machine inputs")
    try:
        data = json.loads(notes[0][len(INPUTS_NOTE):])
    except ValueError:
        raise InputError(f"studies.{KIND}.notes", "machine inputs that are not JSON", "the machine inputs") from None
    return inputs_from_data(data)


def review_record(record: Record) -> Record:
    """The machine record as its review copy shows it: the note of machine inputs (JSON)
    replaced by readable lines (the cycle's inputs with their labels, one line per step; the
    axis inputs are in the axis records). For HTML and Markdown only; save the record itself."""
    import dataclasses

    study = record.studies.get(KIND)
    if study is None:
        return record
    axes_values, cycle = record_inputs(record)
    lines = []
    for f in CYCLE.fields:
        v = cycle["values"].get(f.key)
        lines.append(f"Cycle input: {f.label} = {'(empty)' if v is None else f.as_text(v, digits=4)}")
    for i, st in enumerate(cycle["steps"], 1):
        if st.kind == "dwell":
            lines.append(f"Step {i}: {st.label}: dwell {st.duration:.4g} s")
        else:
            how = "duration from the stroke and the solved speed" if st.duration is None else f"{st.duration:.4g} s"
            part = "" if st.stroke is None else f", stroke {st.stroke * 1e3:.4g} mm"
            lines.append(f"Step {i}: {st.label}: axis {st.axis} {st.direction}, load {st.load / 1e3:.4g} kN "
                         f"(with the weight along the rod){part}; {how}")
    lines.append(f"Axis inputs: in the axis records of {', '.join(axes_values)} (the record itself holds them too).")
    notes = [n for n in study.notes if not n.startswith(INPUTS_NOTE)] + lines
    return record.with_study(dataclasses.replace(study, notes=notes), key=KIND)


def to_record(outcome: MachineOutcome, identity: Mapping, notes=()) -> Record:
    """The machine record: an ordinary record with identity axis ``"machine"``, one study."""
    rec = Record({**dict(identity), "axis": MACHINE_AXIS})
    for n in notes:
        rec = rec.with_note(n)
    return rec.with_study(outcome.to_study(), key=KIND)


__all__ = ["KIND", "TITLE", "PURPOSE", "run_machine", "run", "MachineOutcome", "alternatives", "best_alternative",
           "alternatives_text", "to_record", "review_record", "record_inputs", "machine_inputs_data", "inputs_from_data",
           "MACHINE_AXIS", "ALTERNATIVES"]
