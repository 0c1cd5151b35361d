"""Axis check: every design rule of :mod:`workbook.checks` on the axis as designed.

This is the study the command line's ``evaluate`` records for every axis of a design file:
all load cases, the oil temperature range, both directions, and the flow valve fully closed.
The findings carry their sources; the results give the key operating figures at the load
cases of the controlled motion.
"""

from __future__ import annotations

import numpy as np

from ..checks import evaluate
from ..circuit import chamber_modulus, natural_frequency, solve
from .base import Outcome, finding, result
from .common import AXIS_FIELDS, FLOW_VALVE_FIELDS, HOLDING_FIELDS, build_axis

KIND = "axis-check"
TITLE = "Axis check"
PURPOSE = "Every design rule on the axis as designed, over its load cases, temperatures and directions."
NORMAL_REGIME = None

FIELDS = AXIS_FIELDS + FLOW_VALVE_FIELDS + HOLDING_FIELDS + (
    ("cylinder", "stroke"), ("cylinder", "mounting"), ("cylinder", "buckling_length"),
    ("operation", "mass"), ("oil", "bulk_modulus"), ("oil", "air_content"), ("cylinder", "rod_yield"),
    ("supply", "overall_efficiency"), ("ratings", "cap_line_bore"), ("ratings", "rod_line_bore"),
    ("ratings", "cap_line_length"), ("ratings", "rod_line_length"), ("ratings", "line_kind"),
    ("ratings", "hose_modulus"), ("ratings", "tube_wall"),
    ("ratings", "hose_rating"), ("ratings", "valve_rating"), ("ratings", "pressure_line_bore"),
    ("ratings", "return_line_bore"), ("ratings", "suction_line_bore"),
    ("limits", "counterbalance_factor"), ("limits", "pressure_margin"), ("limits", "cavitation_abs"),
    ("limits", "buckling_factor"), ("limits", "heat_share"), ("limits", "v_suction"), ("limits", "v_return"), ("limits", "v_pressure"),
)

#: the inputs the panel keeps in view (the rest fold away by section)
KEY_FIELDS = (
    ("cylinder", "bore"), ("cylinder", "rod"), ("flow_valve", "arrangement"), ("flow_valve", "setting"),
    ("holding", "setting"), ("operation", "loads"),
)
#: display unit of each dimension in findings
DISPLAY_UNIT = {"pressure": "bar", "velocity": "m/s", "power": "kW", "flow": "L/min", "force": "kN",
                "length": "mm", "temperature": "degC", "dimensionless": "%"}


def run(values) -> Outcome:
    axis = build_axis(values)
    findings = []
    for f in evaluate(axis, values.get("limits")):
        unit = DISPLAY_UNIT.get(f.dimension, "")
        findings.append(finding(f.rule_id, f.statement, f.quantity, f.value, f.limit, f.dimension, unit,
                                f.level, f.source, f.margin, f.detail))
    loads = np.asarray(axis.loads_for(axis.controlled), dtype=float)   # the controlled motion's cases
    temps = np.array([axis.temp_min, axis.temp_max])
    sol = solve(axis, loads[:, None], temps[None, :])
    closed = solve(axis, loads, axis.temp_min, opening=0.0) if axis.arrangement != "bleed-off" else None
    res = {
        "pump_flow": result("Pump flow", axis.supply.flow, "flow", "L/min"),
        "area_ratio": {"value": axis.cylinder.phi, "unit": "", "label": "Area ratio φ (cap area / annulus area)"},
        "speed_min": result(f"Slowest {axis.controlled} speed over load cases and temperatures",
                            float(np.min(sol.speed)), "velocity", "mm/s"),
        "speed_max": result(f"Fastest {axis.controlled} speed over load cases and temperatures",
                            float(np.max(sol.speed)), "velocity", "mm/s"),
        "p_pump_max": result("Highest pump pressure", float(np.max(sol.p_pump)), "pressure", "bar"),
        "p_cap_max": result("Highest cap pressure, controlled motion, valve open", float(np.max(sol.p1)), "pressure", "bar"),
        "p_rod_max": result("Highest rod pressure, controlled motion, valve open", float(np.max(sol.p3)), "pressure", "bar"),
        "heat_max": result("Highest throttling heat, controlled motion, valve open", float(np.max(sol.loss_total)), "power", "kW"),
    }
    # the other motion (the return stroke) at its own load cases: its speed and pressures too
    other = "retract" if axis.controlled == "extend" else "extend"
    o_loads = np.asarray(axis.loads_for(other), dtype=float)
    o_sol = solve(axis, o_loads[:, None], temps[None, :], direction=other)
    moving = np.asarray(o_sol.speed) > 0
    if moving.any():
        res["other_speed_min"] = result(f"Slowest {other} speed over its load cases and temperatures",
                                        float(np.min(np.asarray(o_sol.speed)[moving])), "velocity", "mm/s")
        res["other_speed_max"] = result(f"Fastest {other} speed over its load cases and temperatures",
                                        float(np.max(np.asarray(o_sol.speed)[moving])), "velocity", "mm/s")
    res["other_p_cap_max"] = result(f"Highest cap pressure, {other}", float(np.max(o_sol.p1)), "pressure", "bar")
    res["other_p_rod_max"] = result(f"Highest rod pressure, {other}", float(np.max(o_sol.p3)), "pressure", "bar")
    c = axis.cylinder
    if axis.mass > 0:
        # at each load case (cold oil, controlled motion) with each column's effective modulus
        # (oil, line compliance, air at that pressure) and the lines as dead volumes
        cold = sol.p1[:, 0], sol.p3[:, 0]
        w = min(natural_frequency(axis, float(p1), float(p3)) for p1, p3 in zip(*cold))
        res["natural_frequency"] = result("Lowest hydraulic natural frequency over the stroke and load cases "
                                          "(effective bulk modulus, line dead volumes; Merritt)",
                                          w / (2 * np.pi), "dimensionless", "Hz")
        mid = chamber_modulus(axis, "cap", float(np.max(cold[0])), 0.5 * c.stroke)
        res["bulk_modulus_cap"] = result("Effective bulk modulus of the cap column at mid-stroke, highest "
                                         "cap pressure", float(mid), "pressure", "bar")
    res["euler_load"] = result(f"Buckling load of the rod ({'Euler' if c.slenderness() >= c.transition_slenderness() else 'Johnson'}, "
                               f"{c.mounting}, {'estimated ' if c.length_estimated else ''}length "
                               f"{c.free_length * 1e3:g} mm, slenderness {c.slenderness():.0f})", c.buckling_load(),
                               "force", "kN")
    if closed is not None:
        res["p_cap_closed"] = result("Highest cap pressure, flow valve closed", float(np.max(closed.p1)),
                                     "pressure", "bar")
        res["p_rod_closed"] = result("Highest rod pressure, flow valve closed", float(np.max(closed.p3)),
                                     "pressure", "bar")
    return Outcome(KIND, TITLE, values, FIELDS, res, findings, {}, {})


__all__ = ["KIND", "TITLE", "PURPOSE", "FIELDS", "run"]
