"""Load sensitivity of speed: orifice, long throttle, needle and pressure-compensated valve compared.

The three candidates are sized to the same duty: the target speed of the controlled motion
at the reference load (the middle load case) and the sizing temperature. The compensated
valve is set to the flow that the target speed needs at the valve; its solved pressure drop
at the reference load is then the drop at which the orifice and the throttle are sized, so
that all three pass the same point and differ only in how they follow the load:

* a fixed restrictor's flow follows the drop, which moves with the load (orifice: √Δp;
  laminar throttle: Δp and the viscosity);
* the compensated valve holds its flow until its drop falls below the minimum working drop
  (compensator starved), then behaves as a fixed orifice.

Figure of merit: the speed variation ``(v_max - v_min) / v_target`` over the load cases and
the oil temperature range, for each candidate (common practice).
"""

from __future__ import annotations

import dataclasses

import numpy as np

from .. import restrictor as rs
from ..circuit import METERING, solve
from ..constants import TO_LPM
from ..errors import InputError
from ..valve import CompensatedFlowValve, RestrictorValve
from .base import Outcome, as_alternative, curve, finding, grade, ratio_result, result
from .common import AXIS_FIELDS, HOLDING_FIELDS, build_axis, regime_list, sweep

KIND = "speed-vs-load"
TITLE = "Load sensitivity of speed"
PURPOSE = ("Speed against load for an orifice, a long throttle, a needle and a pressure-compensated valve sized "
           "to the same duty, in the chosen metering arrangement, with pump pressure, losses and the "
           "speed variation over the load range.")
NORMAL_REGIME = METERING

FIELDS = AXIS_FIELDS + HOLDING_FIELDS + (
    ("flow_valve", "arrangement"), ("flow_valve", "direction"), ("flow_valve", "kind"), ("flow_valve", "cd"),
    ("flow_valve", "length"), ("flow_valve", "compensator_drop"), ("flow_valve", "min_drop"),
    ("flow_valve", "droop"), ("flow_valve", "check_cracking"), ("flow_valve", "check_gradient"),
    ("flow_valve", "seat_diameter"), ("flow_valve", "half_angle"), ("flow_valve", "pitch"),
    ("study", "design_temp"), ("study", "load_min"), ("study", "load_max"), ("study", "points"),
    ("limits", "heat_share"),
)

#: the inputs the panel keeps in view (the rest fold away by section)
KEY_FIELDS = (
    ("cylinder", "bore"), ("cylinder", "rod"), ("flow_valve", "arrangement"), ("flow_valve", "direction"),
    ("operation", "target_speed"), ("operation", "loads"), ("study", "design_temp"),
)
CANDIDATES = ("orifice", "long throttle", "needle throttle", "compensated valve")
SHORT = {"orifice": "orifice", "long throttle": "throttle", "needle throttle": "needle",
         "compensated valve": "compensated"}
#: the design's ``flow_valve.kind`` -> the candidate that is the design's own valve
DESIGN_KIND = {"orifice": "orifice", "throttle": "long throttle", "needle": "needle throttle",
               "compensated": "compensated valve"}


class NoMotion(InputError):
    """The axis does not move with the valve metering at the reference load (stalled or held).

    Not bad input: a design that stalls is a design that fails. :func:`run` turns it into a
    failing finding (exit 1 from the command line); :func:`candidates` raises it because no
    candidate can be sized to a duty the axis never reaches.
    """

    def __init__(self, load: float, regime: str, speed: float):
        self.load, self.regime, self.speed = load, regime, speed
        super().__init__("operation.loads", f"a middle load of {load / 1e3:g} kN",
                         "a reference load at which the axis moves with the valve metering "
                         f"(it is {regime} there)")


def valve_flow_for_speed(axis, speed: float) -> float:
    """Flow through the flow valve at ``speed`` of the controlled motion, m³/s."""
    c = axis.cylinder
    ext = axis.controlled == "extend"
    a_drive, a_driven = (c.a1, c.a3) if ext else (c.a3, c.a1)
    if axis.arrangement == "meter-in":
        return speed * a_drive
    if axis.arrangement == "meter-out":
        return speed * a_driven
    q = axis.supply.flow - speed * a_drive
    if q <= 0:
        raise InputError("operation.target_speed", f"{speed * 1e3:g} mm/s",
                         f"a speed the pump can fill with flow to spare for bleed-off "
                         f"(at most {axis.supply.flow / a_drive * 1e3:.4g} mm/s)")
    return q


def candidates(values):
    """The candidates sized to one duty and their sizes: ``({name: axis}, {key: result entry})``."""
    base = build_axis(values)
    fv, op, st = values["flow_valve"], values["operation"], values["study"]
    t = st["design_temp"]
    base.oil.check_temperature(t, "study.design_temp")
    rho, mu = float(base.oil.density(t)), float(base.oil.dynamic_viscosity(t))
    v_target = op["target_speed"]
    q_valve = valve_flow_for_speed(base, v_target)
    c = base.cylinder
    a_drive = c.a1 if base.controlled == "extend" else c.a3
    if v_target * a_drive > base.supply.flow:
        raise InputError("operation.target_speed", f"{v_target * 1e3:g} mm/s",
                         f"a speed the pump ({base.supply.flow * TO_LPM:.4g} L/min) can fill, at most "
                         f"{base.supply.flow / a_drive * 1e3:.4g} mm/s")
    loads = np.asarray(base.loads_for(base.controlled), dtype=float)
    f_ref = float(np.sort(loads)[loads.size // 2])     # a real load case: the middle one
    check = base.flow_valve.check  # the design's reverse check, cracking and flow drop
    comp = CompensatedFlowValve.from_setting(q_valve, float(base.oil.density(313.15)), cd=fv["cd"],
                                             compensator_drop=fv["compensator_drop"], min_drop=fv["min_drop"],
                                             droop=fv["droop"], check=check)
    axis_c = dataclasses.replace(base, flow_valve=comp)
    ref = solve(axis_c, f_ref, t)
    dp_ref = float(ref.dp_flow_valve)
    q_ref = float(ref.q_flow_valve)
    if not (dp_ref > 0 and q_ref > 0):
        raise NoMotion(f_ref, str(ref.regime), float(ref.speed))
    d_orifice = float(rs.orifice_diameter(q_ref, dp_ref, rho, mu, cd=fv["cd"]).diameter)
    d_throttle = float(rs.throttle_diameter(q_ref, dp_ref, rho, mu, fv["length"]).diameter)
    axis_o = dataclasses.replace(base, flow_valve=RestrictorValve(rs.SharpOrifice(d_orifice, cd=fv["cd"]), check,
                                                                 kind="orifice"))
    axis_t = dataclasses.replace(base, flow_valve=RestrictorValve(rs.LongThrottle(d_throttle, fv["length"]), check,
                                                                 kind="throttle"))
    candidates_ = {"orifice": axis_o, "long throttle": axis_t}
    try:
        lift = float(rs.needle_lift(q_ref, dp_ref, rho, mu, fv["seat_diameter"], fv["half_angle"], cd=fv["cd"]).lift)
    except InputError:
        lift = None   # the seat cannot pass this duty: the needle is left out of the comparison
    if lift is not None:
        needle = rs.NeedleThrottle(fv["seat_diameter"], fv["half_angle"], lift, cd=fv["cd"])
        candidates_["needle throttle"] = dataclasses.replace(base, flow_valve=RestrictorValve(needle, check,
                                                                                             kind="needle"))
    candidates_["compensated valve"] = axis_c
    sizes = {
        "reference_load": result("Reference load (middle load case)", f_ref, "force", "kN"),
        "reference_drop": result("Valve drop at the reference load", dp_ref, "pressure", "bar"),
        "compensated_setting": result("Compensated valve setting", q_valve, "flow", "L/min"),
        "orifice_bore": result("Orifice bore for the same duty", d_orifice, "length", "mm"),
        "throttle_bore": result("Throttle bore for the same duty", d_throttle, "length", "mm"),
    }
    if lift is not None:
        sizes["needle_turns"] = {"value": lift / fv["pitch"], "unit": "turns",
                                 "label": "Needle opening for the same duty"}
    return candidates_, sizes


class _Part:
    """A slice of a :class:`~workbook.circuit.Solution` (arrays of the points in ``part``)."""

    def __init__(self, sol, part: slice):
        self._sol, self._part = sol, part

    def __getattr__(self, name):
        value = getattr(self._sol, name)
        return value[self._part] if isinstance(value, np.ndarray) and value.ndim == 1 else value


def _no_motion(values, stop: NoMotion) -> Outcome:
    """The outcome of an axis that stalls or is held at the reference load: one failing finding."""
    v_target = values["operation"]["target_speed"]
    res = {"reference_load": result("Reference load (middle load case)", stop.load, "force", "kN")}
    findings = [finding(
        "SP-MOVES", "The controlled motion moves with the valve metering at the reference load (the middle "
        "load case)", "speed at the reference load", abs(stop.speed), v_target, "velocity", "mm/s", "fail",
        "force balance", None,
        detail=f"the axis is {stop.regime} at {stop.load / 1e3:g} kN and the sizing temperature: no candidate "
               "can be sized to a speed it never reaches")]
    return Outcome(KIND, TITLE, values, FIELDS, res, findings, {}, {})


def run(values) -> Outcome:
    try:
        axes, res = candidates(values)
    except NoMotion as stop:
        return _no_motion(values, stop)
    op, st = values["operation"], values["study"]
    t = st["design_temp"]
    loads = sweep(values, direction=axes["orifice"].controlled)
    cases = np.asarray(axes["orifice"].loads_for(axes["orifice"].controlled), dtype=float)
    temps = np.array([op["temp_min"], op["temp_max"]])
    v_target = op["target_speed"]
    tol = op["speed_tolerance"]
    # one solve per candidate: the sweep at the sizing temperature, then every load case at
    # both ends of the temperature range (the solver's cost is per call, not per point)
    case_loads = np.repeat(cases, temps.size)
    case_temps = np.tile(temps, cases.size)
    all_loads = np.concatenate([loads, case_loads])
    all_temps = np.concatenate([np.full(loads.size, t), case_temps])
    n = loads.size
    both = {name: solve(ax, all_loads, all_temps) for name, ax in axes.items()}
    sols = {name: _Part(s, slice(0, n)) for name, s in both.items()}
    grid = {name: _Part(s, slice(n, None)) for name, s in both.items()}
    findings = []
    for name, g in grid.items():
        v = np.asarray(g.speed)
        spread = float((v.max() - v.min()) / v_target)
        key = SHORT[name]
        res[f"{key}_variation"] = ratio_result(f"Speed variation, {name}", spread, percent=True)
        res[f"{key}_speed_low"] = result(f"Slowest speed, {name}", float(v.min()), "velocity", "mm/s")
        res[f"{key}_speed_high"] = result(f"Fastest speed, {name}", float(v.max()), "velocity", "mm/s")
        level, margin = grade(spread, tol, 0.25 * tol)
        regs = sorted(set(regime_list(g)) - {METERING})
        chosen = DESIGN_KIND.get(values["flow_valve"]["kind"]) == name
        mark = (lambda f: f) if chosen else (lambda f, n=name: as_alternative(f, f"the {n}"))
        findings.append(mark(finding(
            f"SP-VAR-{key.upper()}", f"Speed with the {name} stays within the tolerance over the load cases "
            "and the oil temperature range", f"speed variation, {name}", spread, tol, "dimensionless", "%",
            level, "common practice", margin,
            detail=("regimes met besides metering: " + ", ".join(regs)) if regs else "metering at every case")))
    figures = {
        "speed_vs_load": {
            "title": f"Speed against load, {values['flow_valve']['arrangement']}, "
                     f"{values['flow_valve']['direction']}ing",
            "x_label": "Load [kN]", "y_label": "Speed [mm/s]", "x": curve(loads / 1e3),
            "series": {name: curve(np.asarray(s.speed) * 1e3) for name, s in sols.items()},
            "limits": {"target speed": v_target * 1e3},
        },
        "pump_pressure_vs_load": {
            "title": "Pump pressure against load", "x_label": "Load [kN]", "y_label": "Pump pressure [bar]",
            "x": curve(loads / 1e3),
            "series": {name: curve(np.asarray(s.p_pump) / 1e5) for name, s in sols.items()},
            "limits": {"relief cracking": axes["orifice"].supply.relief.cracking / 1e5},
        },
        "losses_vs_load": {
            # the whole axis's heat, what the heat-share check grades; stalled, held or driven-back
            # points carry the relief's heat and are drawn dotted, named by their regime
            "title": "Heat of the whole axis against load (valves, relief, return line)", "x_label": "Load [kN]",
            "y_label": "Heat [kW]",
            "x": curve(loads / 1e3),
            "series": {name: curve(np.asarray(s.loss_total) / 1e3) for name, s in sols.items()},
            "limits": {"heat share of drive power":
                       values["limits"]["heat_share"] * values["supply"]["drive_power"] / 1e3},
        },
    }
    per_series = {name: regime_list(s) for name, s in sols.items()}
    regimes = {key: per_series for key in figures}
    return Outcome(KIND, TITLE, values, FIELDS, res, findings, figures, regimes)


__all__ = ["KIND", "TITLE", "PURPOSE", "FIELDS", "run", "candidates", "NoMotion"]
