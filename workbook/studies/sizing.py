"""Restrictor sizing: an orifice, a long throttle and a needle throttle for one duty.

For a target flow ``Q`` at an available drop ``Δp`` at the sizing temperature, the study
sizes each candidate (:mod:`workbook.restrictor`), rounds the orifice to a standard drill and
reports the flow the drill really passes, then shows how each candidate's flow moves with
the drop and over the oil temperature range. The orifice barely notices the temperature
(turbulent flow, orifice equation); the laminar throttle's flow follows the viscosity
(Hagen-Poiseuille): this is the trade's reason to meter with sharp edges. Near the
laminar-turbulent transition of the throttle (Re 2300 to 4000) its flow at a fixed drop can
even fall as the oil warms, because the friction factor rises through the transition: the
model shows this on purpose, and a throttle sized there is a poor choice.

>>> from workbook import inputs
>>> values = {s.key: s.defaults() for s in inputs.AXIS_SECTIONS}
>>> out = run(values)
>>> out.results["orifice_drill"]["value"], out.results["orifice_drill"]["unit"]
(2.45, 'mm')
"""

from __future__ import annotations

import numpy as np

from .. import inputs
from .. import restrictor as rs
from ..errors import InputError
from ..fluid import Oil
from .base import Outcome, as_alternative, curve, finding, grade, ratio_result, result

KIND = "restrictor-sizing"
TITLE = "Restrictor sizing"
PURPOSE = ("Size a sharp orifice, a long throttle and a needle throttle for a target flow at an "
           "available pressure drop, round the orifice to a drill, and compare how each holds its "
           "flow as the drop and the oil temperature change.")

FIELDS = (
    ("study", "target_flow"), ("study", "available_drop"), ("study", "design_temp"),
    ("operation", "temp_min"), ("operation", "temp_max"), ("operation", "speed_tolerance"),
    ("oil", "grade"), ("oil", "nu40"), ("oil", "nu100"), ("oil", "density15"), ("oil", "expansion"),
    ("oil", "bulk_modulus"), ("oil", "pour_point"),
    ("flow_valve", "kind"), ("flow_valve", "cd"), ("flow_valve", "length"), ("flow_valve", "seat_diameter"),
    ("flow_valve", "half_angle"), ("flow_valve", "pitch"),
)

#: the inputs the panel keeps in view (the rest fold away by section)
KEY_FIELDS = (
    ("study", "target_flow"), ("study", "available_drop"), ("study", "design_temp"),
    ("operation", "temp_min"), ("operation", "temp_max"), ("flow_valve", "length"), ("oil", "grade"),
)
#: orifices below this bore clog easily without a protecting screen (common practice, from memory)
SMALL_ORIFICE = 0.8e-3

CANDIDATES = ("orifice (drilled)", "long throttle", "needle throttle")
#: the design's ``flow_valve.kind`` -> the candidate that is the design's own restrictor
DESIGN_KIND = {"orifice": "orifice (drilled)", "throttle": "long throttle", "needle": "needle throttle"}


def run(values) -> Outcome:
    """Size the three candidates for ``values`` ({section: {field: SI}})."""
    st, op, fv = values["study"], values["operation"], values["flow_valve"]
    oil = Oil.from_values(values["oil"])
    q, dp, t_design = st["target_flow"], st["available_drop"], st["design_temp"]
    t_lo, t_hi = op["temp_min"], op["temp_max"]
    if not t_lo < t_hi:
        raise InputError("operation.temp_max", f"{t_hi - 273.15:g} degC",
                         f"a temperature above the cold one ({t_lo - 273.15:g} degC)")
    oil.check_temperature(np.array([t_lo, t_hi, t_design]), field="operation.temp_min")
    rho, mu = oil.density(t_design), oil.dynamic_viscosity(t_design)
    cd = fv["cd"]
    tol = op["speed_tolerance"]

    try:
        drilled = rs.drilled_orifice(q, dp, rho, mu, cd=cd)
    except InputError as exc:
        raise InputError("study.target_flow", f"{q * 6e4:g} L/min at {dp / 1e5:g} bar",
                         f"a flow and drop whose orifice fits the drill series ({exc.allowed})") from None
    d_exact, d_drill = float(drilled.exact_diameter), float(drilled.drill_diameter)
    orifice = rs.SharpOrifice(d_drill, cd=cd)
    throttle_size = rs.throttle_diameter(q, dp, rho, mu, fv["length"])
    throttle = rs.LongThrottle(float(throttle_size.diameter), fv["length"])
    try:
        lift = rs.needle_lift(q, dp, rho, mu, fv["seat_diameter"], fv["half_angle"], cd=cd)
    except InputError as exc:
        raise InputError("flow_valve.seat_diameter", f"{fv['seat_diameter'] * 1e3:g} mm",
                         f"a needle seat large enough for {q * 6e4:g} L/min at {dp / 1e5:g} bar "
                         f"({exc.allowed})") from None
    needle = rs.NeedleThrottle(fv["seat_diameter"], fv["half_angle"], float(lift.lift), cd=cd)
    turns = float(lift.lift) / fv["pitch"]
    turns_field = inputs.FLOW_VALVE["turns"]
    if turns > turns_field.high:
        raise InputError("flow_valve.pitch", f"{fv['pitch'] * 1e3:g} mm",
                         f"a thread pitch that opens the needle within {turns_field.high:g} turns "
                         f"(this duty needs {turns:.4g} turns)")
    models = dict(zip(CANDIDATES, (orifice, throttle, needle)))
    sized_regime = {name: str(np.asarray(state.regime).ravel()[0]) for name, state in
                    zip(CANDIDATES, (drilled.state, throttle_size.state, lift.state))}
    short_throttle = fv["length"] < 10.0 * float(throttle_size.diameter)

    # flow against temperature at the available drop
    n = int(values["study"].get("points", 400))
    temps = np.linspace(t_lo, t_hi, n)
    rho_t, mu_t = oil.density(temps), oil.dynamic_viscosity(temps)
    flow_t = {name: m.flow(dp, rho_t, mu_t) for name, m in models.items()}
    # flow against drop at the sizing temperature
    dps = np.linspace(0.0, 2.0 * dp, n)
    flow_dp = {name: m.flow(dps, rho, mu) for name, m in models.items()}

    res = {
        "orifice_exact": result("Orifice bore, exact", d_exact, "length", "mm"),
        "orifice_drill": result("Orifice drill size", d_drill, "length", "mm"),
        "orifice_drill_flow": result("Flow of the drilled orifice", float(drilled.flow), "flow", "L/min"),
        "orifice_reynolds": ratio_result("Orifice Reynolds number", float(drilled.state.reynolds)),
        "throttle_bore": result("Throttle bore", float(throttle_size.diameter), "length", "mm"),
        "throttle_reynolds": ratio_result("Throttle Reynolds number", float(throttle_size.state.reynolds)),
        "needle_lift": result("Needle lift", float(lift.lift), "length", "mm"),
        "needle_turns": {"value": turns, "unit": "turns", "label": "Needle opening"},
    }
    findings = []
    # drill rounding against the speed tolerance
    flow_error = abs(float(drilled.flow_ratio) - 1.0)
    level, margin = grade(flow_error, tol, 0.25 * tol)
    findings.append(finding(
        "SZ-DRILL", "The drilled orifice passes the target flow within the speed tolerance",
        "flow error of the drill size", flow_error, tol, "dimensionless", "%", level, "common practice", margin,
        detail=f"exact bore {d_exact * 1e3:.3f} mm, drill {d_drill * 1e3:.2f} mm"))
    if short_throttle:
        d_t = float(throttle_size.diameter)
        findings.append(finding(
            "SZ-THROTTLE-LENGTH", "The long throttle is at least 10 bores long, as its model assumes",
            "throttle length", fv["length"], 10.0 * d_t, "length", "mm", "caution", "common practice",
            (fv["length"] - 10.0 * d_t) / (10.0 * d_t),
            detail="shorter than that it behaves between an orifice and a throttle; its figures here are rough"))
    if d_drill < SMALL_ORIFICE:
        findings.append(finding(
            "SZ-CLOG", "Orifice bore is large enough not to clog without a protecting screen",
            "drill size", d_drill, SMALL_ORIFICE, "length", "mm", "caution", "common practice (from memory)",
            (d_drill - SMALL_ORIFICE) / SMALL_ORIFICE,
            detail="split the drop over two orifices in series or add a screen"))
    for name, fl in flow_t.items():
        qf = np.asarray(fl.flow)
        spread = float((qf.max() - qf.min()) / q)
        key = name.split(" ")[0] if name != "long throttle" else "throttle"
        res[f"{key}_spread"] = ratio_result(f"Flow change {name}, cold to warm", spread, percent=True)
        res[f"{key}_flow_cold"] = result(f"Flow {name}, cold oil", float(qf[0]), "flow", "L/min")
        res[f"{key}_flow_warm"] = result(f"Flow {name}, warm oil", float(qf[-1]), "flow", "L/min")
        level, margin = grade(spread, tol, 0.25 * tol)
        chosen = DESIGN_KIND.get(fv["kind"]) == name
        mark = (lambda f: f) if chosen else (lambda f, n=name: as_alternative(f, f"the {n}"))
        findings.append(mark(finding(
            f"SZ-TEMP-{key.upper()}", f"Flow of the {name} stays within the speed tolerance over the oil "
            "temperature range", f"flow change of the {name}", spread, tol, "dimensionless", "%", level,
            "common practice", margin,
            detail=f"regime at the available drop and the sizing temperature: {sized_regime[name]}")))

    figures = {
        "flow_vs_drop": {
            "title": "Flow against pressure drop at the sizing temperature",
            "x_label": "Pressure drop [bar]", "y_label": "Flow [L/min]",
            "x": curve(dps / 1e5),
            "series": {name: curve(np.asarray(f.flow) * 60000.0) for name, f in flow_dp.items()},
            "limits": {"target flow": q * 60000.0},
        },
        "flow_vs_temperature": {
            "title": "Flow against oil temperature at the available drop",
            "x_label": "Oil temperature [degC]", "y_label": "Flow [L/min]",
            "x": curve(temps - 273.15),
            "series": {name: curve(np.asarray(f.flow) * 60000.0) for name, f in flow_t.items()},
            "limits": {"target flow": q * 60000.0},
        },
    }
    regimes = {
        "flow_vs_drop": {name: [str(r) for r in np.asarray(f.regime).ravel()] for name, f in flow_dp.items()},
        "flow_vs_temperature": {name: [str(r) for r in np.asarray(f.regime).ravel()] for name, f in flow_t.items()},
    }
    return Outcome(KIND, TITLE, values, FIELDS, res, findings, figures, regimes)


__all__ = ["KIND", "TITLE", "PURPOSE", "FIELDS", "run"]
