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
from ..constants import T0_C, TO_LPM
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
        raise InputError("operation.temp_max", f"{t_hi - T0_C:g} degC",
                         f"a temperature above the cold one ({t_lo - T0_C:g} degC)")
    oil.check_temperature(np.array([t_lo, t_hi, t_design]), field="operation.temp_min")
    rho, mu = oil.density(t_design), oil.dynamic_viscosity(t_design)
    cd = fv["cd"]
    tol = op["speed_tolerance"]

    try:
        drilled = rs.drilled_orifice(q, dp, rho, mu, cd=cd)
    except InputError as exc:
        raise InputError("study.target_flow", f"{q * TO_LPM:g} L/min at {dp / 1e5:g} bar",
                         f"a flow and drop whose orifice fits the drill series ({exc.allowed})") from None
    d_exact, d_drill = float(drilled.exact_diameter), float(drilled.drill_diameter)
    orifice = rs.SharpOrifice(d_drill, cd=cd)
    throttle_size = rs.throttle_diameter(q, dp, rho, mu, fv["length"])
    throttle = rs.LongThrottle(float(throttle_size.diameter), fv["length"])
    # the needle is a candidate: when its seat or thread cannot pass this duty it is "not
    # possible here", with the reason, and the orifice and the throttle still answer
    needle_problem = ""
    lift = None
    try:
        lift = rs.needle_lift(q, dp, rho, mu, fv["seat_diameter"], fv["half_angle"], cd=cd)
    except InputError as exc:
        needle_problem = (f"the needle seat of {fv['seat_diameter'] * 1e3:g} mm (Flow valve, Needle seat "
                          f"diameter) cannot pass {q * TO_LPM:.4g} L/min at {dp / 1e5:.4g} bar ({exc.allowed})")
    turns_field = inputs.FLOW_VALVE["turns"]
    if lift is not None:
        turns = float(lift.lift) / fv["pitch"]
        if turns > turns_field.high:
            needle_problem = (f"with a thread pitch of {fv['pitch'] * 1e3:g} mm the needle would need "
                              f"{turns:.4g} turns, more than {turns_field.high:g}")
    candidates = [("orifice (drilled)", orifice, drilled.state), ("long throttle", throttle, throttle_size.state)]
    if not needle_problem:
        needle = rs.NeedleThrottle(fv["seat_diameter"], fv["half_angle"], float(lift.lift), cd=cd)
        candidates.append(("needle throttle", needle, lift.state))
    models = {name: m for name, m, _s in candidates}
    sized_regime = {name: str(np.asarray(state.regime).ravel()[0]) for name, _m, state in candidates}
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
    }
    if not needle_problem:
        # the needle as a restriction first (its open area and lift), its spindle turns second
        res["needle_area"] = result("Needle open flow area", float(needle.area), "area", "mm**2")
        res["needle_lift"] = result("Needle lift", float(lift.lift), "length", "mm")
        res["needle_turns"] = {"value": turns, "unit": "turns", "label": "Needle spindle turns for that lift"}
    findings = []
    if needle_problem:
        chosen = fv["kind"] == "needle"
        item = finding("SZ-NEEDLE", "Needle throttle: not possible here", "needle throttle for this duty", None,
                       None, "dimensionless", "", "fail" if chosen else "caution", "needle seat geometry", None,
                       detail=needle_problem + "; the orifice and the long throttle are sized as usual")
        findings.append(item if chosen else as_alternative(item, "the needle throttle"))

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

    # a throttle sized in, or swept through, the transition band follows neither law well:
    # its flow against temperature rises, peaks and falls, and the models disagree there
    band_t = np.asarray(flow_t["long throttle"].regime).ravel() == rs.TRANSITIONAL
    band_dp = np.asarray(flow_dp["long throttle"].regime).ravel() == rs.TRANSITIONAL
    in_band = sized_regime["long throttle"] == rs.TRANSITIONAL or band_t.any()
    if in_band:
        re_sized = float(throttle_size.state.reynolds)
        where = (f"oil {float(temps[band_t].min()) - T0_C:.0f} to {float(temps[band_t].max()) - T0_C:.0f} °C"
                 if band_t.any() else "at the sizing point")
        item = finding(
            "SZ-THROTTLE-BAND", "The long throttle runs laminar (below the transition band, Re "
            f"{rs.RE_LAMINAR_LIMIT:g} to {rs.RE_TURBULENT_FROM:g})", "throttle Reynolds number at the sizing point",
            re_sized, rs.RE_LAMINAR_LIMIT, "dimensionless", "", "caution", "common practice (pipe flow transition "
            "band Re 2300 to 4000)", (rs.RE_LAMINAR_LIMIT - re_sized) / rs.RE_LAMINAR_LIMIT,
            detail=f"in the transition band {where}: the flow there is uncertain (neither Hagen-Poiseuille nor "
                   "the turbulent law holds); a viscosity-sensitive throttle should be laminar: make it longer, "
                   "or give it a lower drop")
        findings.append(item if DESIGN_KIND.get(fv["kind"]) == "long throttle"
                        else as_alternative(item, "the long throttle"))

    def _band(x, mask):
        return {"long throttle in the transition band": [float(x[mask].min()), float(x[mask].max())]} \
            if mask.any() else {}

    figures = {
        "flow_vs_drop": {
            "title": "Flow against pressure drop at the sizing temperature",
            "x_label": "Pressure drop [bar]", "y_label": "Flow [L/min]",
            "x": curve(dps / 1e5),
            "series": {name: curve(np.asarray(f.flow) * 60000.0) for name, f in flow_dp.items()},
            "limits": {"target flow": q * TO_LPM}, "bands": _band(dps / 1e5, band_dp),
        },
        "flow_vs_temperature": {
            "title": "Flow against oil temperature at the available drop",
            "x_label": "Oil temperature [degC]", "y_label": "Flow [L/min]",
            "x": curve(temps - T0_C),
            "series": {name: curve(np.asarray(f.flow) * 60000.0) for name, f in flow_t.items()},
            "limits": {"target flow": q * TO_LPM}, "bands": _band(temps - T0_C, band_t),
        },
    }
    regimes = {
        "flow_vs_drop": {name: [str(r) for r in np.asarray(f.regime).ravel()] for name, f in flow_dp.items()},
        "flow_vs_temperature": {name: [str(r) for r in np.asarray(f.regime).ravel()] for name, f in flow_t.items()},
    }
    return Outcome(KIND, TITLE, values, FIELDS, res, findings, figures, regimes)


__all__ = ["KIND", "TITLE", "PURPOSE", "FIELDS", "run"]
