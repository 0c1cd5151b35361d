"""Counterbalance setting: from the load cases, a few pilot ratios side by side, and the
same duty with a back-pressure valve in series.

Setting (common practice, no published source): about 1.3 times the highest load-induced
pressure in the holding chamber, ``p_set = k * max(p_L)``, with ``p_L = F / A_hold``.

Lowering against a counterbalance on the holding chamber (pilot from the opposite,
driving chamber, at ``p_d``), the valve opens when ``p_hold + R p_d >= p_set + g Q`` and
the piston's force balance ``p_hold A_hold - p_d A_d = F - F_fr`` closes the system. Just
opening (Q -> 0), with ``p_L = (F - F_fr)/A_hold`` and ``a = A_d/A_hold``::

    p_d = (p_set - p_L) / (R + a)          pilot pressure needed to lower

With ``k`` the outlet term of the valve's spring chamber (``1 + R`` outlet-referenced, 0
vented; see :class:`~workbook.valve.CounterbalanceValve`) the opening condition reads
``p_hold + R p_d >= p_set + k p_out + g Q``, so a metering valve downstream (outlet
pressure ``p_out``) raises the lowering pressures of an outlet-referenced valve by about
``k p_out`` and leaves a vented one alone: the study shows both.

Everything is solved at the cold end of the oil temperature range, where pressures and pilot
pressures are highest. A high ratio lowers with a small pilot pressure (less pump pressure, less heat); a low ratio
makes the valve less sensitive to pilot-pressure swings, steadier with an unstable load
(common practice). A back-pressure valve in series needs no pilot but costs its whole
setting times the flow as heat, all the time.
"""

from __future__ import annotations

import dataclasses

import numpy as np

from ..circuit import METERING, solve
from ..errors import InputError
from ..valve import BackPressureValve
from .base import Outcome, curve, finding, grade, result
from .common import AXIS_FIELDS, FLOW_VALVE_FIELDS, build_axis, regime_list, section_fields, sweep

KIND = "counterbalance"
TITLE = "Counterbalance setting"
PURPOSE = ("Set the counterbalance valve from the load cases, compare pilot ratios (pilot pressure to "
           "lower, pump pressure, heat) and a back-pressure valve in series, and check the setting "
           "against the ratings.")
#: lowering is metered; held, stalled, sinking or driven-back points are drawn dotted and named
NORMAL_REGIME = METERING

FIELDS = AXIS_FIELDS + FLOW_VALVE_FIELDS + section_fields("holding", without=("kind",)) + (
    ("ratings", "hose_rating"), ("ratings", "valve_rating"),
    ("limits", "counterbalance_factor"), ("limits", "pressure_margin"), ("limits", "heat_share"),
    ("study", "pilot_ratios"), ("study", "load_min"), ("study", "load_max"), ("study", "points"),
)

#: the inputs the panel keeps in view (the rest fold away by section)
KEY_FIELDS = (
    ("holding", "setting"), ("holding", "pilot_ratio"), ("holding", "side"), ("study", "pilot_ratios"),
    ("operation", "loads"), ("limits", "counterbalance_factor"), ("flow_valve", "arrangement"),
)

def lowering_direction(side: str) -> str:
    """The motion that drives oil out of the holding chamber: cap -> retract, rod -> extend."""
    return "retract" if side == "cap" else "extend"


def run(values) -> Outcome:
    hold, lim, op = values["holding"], values["limits"], values["operation"]
    vals = {k: dict(v) for k, v in values.items()}
    vals["holding"]["kind"] = "counterbalance"
    base = build_axis(vals)
    side = hold["side"]
    lower = lowering_direction(side)
    c = base.cylinder
    cases = np.asarray(base.loads_for(lower), dtype=float)   # the lowering cases: what the valve meters
    p_load = np.asarray(base.holding_pressure(cases))
    p_load_max = float(p_load.max())
    if p_load_max <= 0:
        raise InputError("operation.loads", "no load that the holding side carries",
                         f"at least one load case that pushes on the {side} side (an overrunning load to hold)")
    factor = lim["counterbalance_factor"]
    recommended = factor * p_load_max
    setting = hold["setting"]
    loads = sweep(values, direction=lower)
    t_cold = op["temp_min"]
    ratios = [r for r in values["study"]["pilot_ratios"]]
    if any(not r > 0 for r in ratios):
        raise InputError("study.pilot_ratios", ratios, "pilot ratios greater than 0 (3 means 3:1)")
    check = base.holding.check  # the design's free-flow check, cracking and flow drop
    design_cb = base.holding    # the design's valve: spring chamber, fully-open drop, check

    res = {
        "load_pressure_max": result("Highest load-induced holding pressure", p_load_max, "pressure", "bar"),
        "recommended_setting": result(f"Recommended setting ({factor:g} x load pressure)", recommended,
                                      "pressure", "bar"),
        "chosen_setting": result("Chosen setting", setting, "pressure", "bar"),
    }
    pilot_series, pump_series, heat_series, regimes = {}, {}, {}, {}
    for r in ratios:
        cb = dataclasses.replace(design_cb, pilot_ratio=r)
        ax = dataclasses.replace(base, holding=cb, holding_side=side)
        sol = solve(ax, loads, t_cold, direction=lower)
        name = f"counterbalance {r:g}:1"
        pilot_series[name] = curve(np.asarray(sol.p_pilot) / 1e5)
        pump_series[name] = curve(np.asarray(sol.p_pump) / 1e5)
        # the whole axis's heat (what the heat-share check grades), held points included: there
        # the pump's whole flow crosses the relief (drawn dotted and named by their regime)
        heat_series[name] = curve(np.asarray(sol.loss_total) / 1e3)
        regimes[name] = regime_list(sol)
        at_cases = solve(ax, cases, t_cold, direction=lower)
        res[f"pilot_{r:g}"] = result(f"Pilot pressure to lower, {r:g}:1, highest over load cases",
                                     float(np.max(np.asarray(at_cases.p_pilot))), "pressure", "bar")
        res[f"heat_{r:g}"] = result(f"Heat in the counterbalance, {r:g}:1, highest over load cases",
                                    float(np.max(np.asarray(at_cases.loss_holding))), "power", "kW")
    bp = BackPressureValve(setting, hold["gradient"], check)
    ax_bp = dataclasses.replace(base, holding=bp, holding_side=side)
    sol_bp = solve(ax_bp, loads, t_cold, direction=lower)
    name = "back-pressure valve"
    pilot_series[name] = curve(np.full(loads.size, np.nan))  # no pilot: nothing to draw
    pump_series[name] = curve(np.asarray(sol_bp.p_pump) / 1e5)
    heat_series[name] = curve(np.asarray(sol_bp.loss_total) / 1e3)
    regimes[name] = regime_list(sol_bp)
    bp_cases = solve(ax_bp, cases, t_cold, direction=lower)
    res["heat_back_pressure"] = result("Heat in the back-pressure valve, highest over load cases",
                                       float(np.max(np.asarray(bp_cases.loss_holding))), "power", "kW")
    res["pump_back_pressure"] = result("Pump pressure while lowering, back-pressure valve, highest",
                                       float(np.max(np.asarray(bp_cases.p_pump))), "pressure", "bar")

    findings = []
    level, margin = grade(setting, recommended, 0.0, higher_is_worse=False)
    if level == "fail" and setting > p_load_max:
        level = "caution"
    findings.append(finding(
        "CB-SETTING", f"Setting is at least {factor:g} times the highest load-induced pressure",
        "counterbalance setting", setting, recommended, "pressure", "bar", level, "common practice", margin,
        detail=f"load-induced pressure {p_load_max / 1e5:.3g} bar on the {side} side"))
    level, margin = grade(setting, p_load_max, 0.0, higher_is_worse=False)
    findings.append(finding(
        "CB-HOLDS", "Setting is above the load-induced pressure, so the valve holds the load",
        "counterbalance setting", setting, p_load_max, "pressure", "bar", level,
        "force balance on the piston (common practice)", margin))
    for rname, rvalue in (("cylinder rating", c.rated_pressure), ("valve rating", values["ratings"]["valve_rating"]),
                          ("hose rating", values["ratings"]["hose_rating"])):
        level, margin = grade(setting, rvalue, lim["pressure_margin"])
        findings.append(finding(
            f"CB-RATING-{rname.split()[0].upper()}",
            f"The holding chamber, trapped at up to the setting, stays within the {rname}",
            "counterbalance setting", setting, rvalue, "pressure", "bar", level,
            "user's data sheet rating; caution margin common practice", margin,
            detail="a closed counterbalance relieves thermal expansion at its setting"))
    # both spring-chamber types at the load cases: how much the outlet pressure moves the
    # lowering pressures (holding chamber, pilot, outlet)
    by_type = {}
    for chamber in ("outlet-referenced", "vented"):
        cb = dataclasses.replace(design_cb, spring_chamber=chamber)
        st = solve(dataclasses.replace(base, holding=cb, holding_side=side), cases, t_cold, direction=lower)
        p_hold = np.asarray(st.p1 if side == "cap" else st.p3)
        by_type[chamber] = (float(np.max(p_hold)), float(np.max(np.asarray(st.p_pilot))),
                            float(np.max(np.asarray(st.p_mid))))
        key = chamber.split("-")[0]
        res[f"lowering_hold_{key}"] = result(f"Holding chamber pressure while lowering, {chamber} valve, highest",
                                             by_type[chamber][0], "pressure", "bar")
        res[f"lowering_pilot_{key}"] = result(f"Pilot pressure while lowering, {chamber} valve, highest",
                                              by_type[chamber][1], "pressure", "bar")
        res[f"lowering_outlet_{key}"] = result(f"Counterbalance outlet pressure while lowering, {chamber} valve, "
                                               "highest", by_type[chamber][2], "pressure", "bar")
    if base.valve_side() == side:
        # the flow valve meters the same line downstream of the counterbalance
        chosen_type = design_cb.spring_chamber
        other = "vented" if chosen_type == "outlet-referenced" else "outlet-referenced"
        p_out = by_type[chosen_type][2]
        words = "; ".join(f"{t}: holding chamber {v[0] / 1e5:.4g} bar, pilot {v[1] / 1e5:.4g} bar, outlet "
                          f"{v[2] / 1e5:.4g} bar" for t, v in by_type.items())
        findings.append(finding(
            "CB-OUTLET", "No metering valve downstream raises the counterbalance's outlet pressure",
            "highest counterbalance outlet pressure while lowering", p_out, base.tank_pressure, "pressure", "bar",
            "caution", "force balance on the poppet; valve types common practice", None,
            detail=f"the design's valve is {chosen_type}"
                   + (" (spring chamber 'cautious': the type with the higher lowering pressures for this design)"
                      if hold.get("spring_chamber") in (None, "cautious") else "")
                   + f"; lowering pressures at the load cases, cold oil: {words}. "
                   f"An outlet-referenced valve adds about (1 + R) times its outlet pressure to its opening "
                   f"pressure, a vented one ignores it; confirm the type on the data sheet (the {other} figures "
                   "show the other case), or meter in instead"))
    drive = values["supply"]["drive_power"]
    chosen = design_cb
    chosen_sol = solve(dataclasses.replace(base, holding=chosen, holding_side=side), cases, t_cold, direction=lower)
    heat_all = np.asarray(chosen_sol.loss_total)
    worst = int(np.argmax(heat_all))
    heat = float(heat_all[worst])
    worst_regime = str(np.asarray(chosen_sol.regime)[worst])
    still = [f"{float(f) / 1e3:g} kN ({r})" for f, r, v in zip(cases, np.asarray(chosen_sol.regime),
                                                              np.asarray(chosen_sol.speed)) if not v > 0]
    res["heat_chosen"] = result(f"Heat of the whole axis while lowering, chosen ratio {hold['pilot_ratio']:g}:1",
                                heat, "power", "kW")
    res["pilot_chosen"] = result(f"Pilot pressure to lower, chosen ratio {hold['pilot_ratio']:g}:1",
                                 float(np.max(np.asarray(chosen_sol.p_pilot))), "pressure", "bar")
    level, margin = grade(heat, lim["heat_share"] * drive, 0.0)
    level = "caution" if level == "fail" else level  # heat needs a cooler or a duty-cycle check, not a stop
    # where the heat arises at the worst case: the counterbalance is one source among several
    parts = {"relief": chosen_sol.loss_relief, "flow valve": chosen_sol.loss_flow_valve,
             "counterbalance": chosen_sol.loss_holding, "return line": chosen_sol.loss_return_line}
    split = ", ".join(f"{name} {float(np.asarray(v).flat[worst]) / 1e3:.3g} kW" for name, v in parts.items())
    findings.append(finding(
        "CB-HEAT", "Heat of the whole axis while lowering on the counterbalance stays within the heat "
        "share of the drive power", "throttling heat", heat, lim["heat_share"] * drive, "power", "kW", level,
        "common practice", margin,
        detail="; ".join(filter(None, [
            f"the whole axis's heat, worst at {float(cases[worst]) / 1e3:g} kN ({worst_regime}): {split} "
            f"(chosen ratio {hold['pilot_ratio']:g}:1)",
            ("not lowering at " + ", ".join(still) + ": there the whole pump flow crosses the relief")
            if still else "",
            "with a meter-out valve in series the pump runs at relief pressure while lowering; "
            "meter-in, or the counterbalance alone, lowers with less heat"
            if base.arrangement == "meter-out" and base.controlled == lower else ""]))))
    figures = {
        "pilot_pressure_vs_load": {
            "title": f"Pilot pressure while lowering ({lower}), cold oil", "x_label": "Load [kN]",
            "y_label": "Pilot pressure [bar]", "x": curve(loads / 1e3), "series": pilot_series,
            "limits": {},
        },
        "pump_pressure_vs_load": {
            "title": f"Pump pressure while lowering ({lower}), cold oil", "x_label": "Load [kN]", "y_label": "Pump pressure [bar]",
            "x": curve(loads / 1e3), "series": pump_series,
            "limits": {"relief cracking": base.supply.relief.cracking / 1e5},
        },
        "heat_vs_load": {
            "title": f"Heat of the whole axis while lowering ({lower}), cold oil (valves, relief, return line)",
            "x_label": "Load [kN]", "y_label": "Heat [kW]",
            "x": curve(loads / 1e3), "series": heat_series,
            "limits": {"heat share of drive power": lim["heat_share"] * drive / 1e3},
        },
    }
    reg = {key: regimes for key in figures}
    return Outcome(KIND, TITLE, values, FIELDS, res, findings, figures, reg)


def pilot_to_lower(setting: float, load_pressure: float, pilot_ratio: float, area_ratio_drive_hold: float) -> float:
    """Pilot pressure (Pa) at which lowering starts: ``(p_set - p_L)/(R + A_d/A_hold)``."""
    return max(setting - load_pressure, 0.0) / (pilot_ratio + area_ratio_drive_hold)


__all__ = ["KIND", "TITLE", "PURPOSE", "FIELDS", "run", "lowering_direction", "pilot_to_lower"]
