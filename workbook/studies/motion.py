"""The axis in motion: the command profile simulated in time, with the peaks, dips and
oscillations that the steady state cannot show.

The model is :mod:`workbook.transient` on the steady solver's own component objects
(flow valve, holding valve, relief, checks), with the directional valve following the
profile's ramps, oil at the cold end of its range. From one run of the profile:

* **stroke time** of each controlled move against the distance over the target speed less
  its tolerance (or the whole profile against ``motion.cycle_time`` when given);
* **peak pressure** of every node over the whole motion (start, stop and reversal peaks
  included) against its rating: a chamber against the cylinder's (and the hose's when no
  valve separates it from its line), a line against the hose's, the pump line and valve
  bodies against the valves';
* **lowest absolute pressure** of each chamber against ``limits.cavitation_abs``;
* **end-stop impact speed** against ``motion.impact_speed`` (the cylinder data sheet);
* **ramps against the natural frequency**: rule of thumb (from memory) that a ramp shorter
  than a few periods ``T0 = 2 pi / w0`` of the hydraulic natural frequency (Merritt,
  ``w0 = sqrt(E'/m (A1²/V1 + A3²/V3))``, lowest over the stroke) excites the mass on its oil
  springs; ``motion.ramp_periods`` periods (3 by default) are asked for;
* **sustained oscillation while lowering** on a counterbalance: the lowering move
  simulated for each pilot ratio of ``study.pilot_ratios`` (and the design's), the speed's
  swing (half peak to peak) and frequency over the second half of the move, against
  ``motion.oscillation_share`` of the mean lowering speed (common practice: high pilot
  ratios lower with less energy but hunt more readily with a mass load).

Worked example: the demo lift (80/45 mm, 920 kg, 1.2 m): w0 about 110 rad/s at its stiffest
oil, T0 about 57 ms, so the 100 ms default ramps are under the 3 periods asked for (a
caution).
"""

from __future__ import annotations

import dataclasses
import math

import numpy as np

from ..circuit import natural_frequency
from ..errors import InputError
from ..fluid import P_ATM
from ..transient import model_from_values, simulate, start_position
from ..valve import CounterbalanceValve
from .base import Outcome, as_alternative, curve, finding, grade, result
from .common import AXIS_FIELDS, FLOW_VALVE_FIELDS, HOLDING_FIELDS, build_axis, section_fields

KIND = "axis-motion"
TITLE = "The axis in motion"
PURPOSE = ("Simulate the command profile in time on the same valve laws as the steady studies: stroke time, "
           "pressure peaks against the ratings, cavitation, end-stop impact, ramps against the natural "
           "frequency, and hunting while lowering on the counterbalance over the pilot ratios.")

FIELDS = AXIS_FIELDS + FLOW_VALVE_FIELDS + HOLDING_FIELDS + section_fields("motion") + (
    ("operation", "mass"), ("operation", "inclination"),
    ("ratings", "hose_rating"), ("ratings", "valve_rating"),
    ("ratings", "cap_line_bore"), ("ratings", "rod_line_bore"), ("ratings", "cap_line_length"),
    ("ratings", "rod_line_length"), ("ratings", "line_kind"), ("ratings", "hose_modulus"),
    ("oil", "bulk_modulus"), ("oil", "air_content"),
    ("limits", "cavitation_abs"), ("limits", "pressure_margin"),
    ("study", "pilot_ratios"), ("study", "points"),
)

#: the inputs the panel keeps in view (the rest fold away by section)
KEY_FIELDS = (
    ("motion", "profile"), ("motion", "ramp_open"), ("motion", "ramp_close"), ("motion", "holding_lag"),
    ("motion", "load_positions"), ("motion", "load_forces"), ("motion", "impact_speed"),
    ("holding", "pilot_ratio"), ("study", "pilot_ratios"),
)

#: integrator tolerances of the study (relative; absolute on pressures, Pa)
RTOL, ATOL_P = 1e-4, 100.0
#: longest lowering window simulated per pilot ratio, s
LOWER_WINDOW = 2.5


def _resample(t, y, grid):
    return np.interp(grid, t, y)


def lowering_swing(model, stroke: float, direction: str, window: float, ramp: float):
    """Lower for ``window`` s from near the end the lowering starts at; return the trace and
    (mean speed, swing, frequency in Hz) over the second half of the window (swing: half the
    speed's peak to peak, m/s; frequency from the mean-crossings, 0 when none)."""
    from ..transient import Move

    x0 = 0.9 * stroke if direction == "retract" else 0.1 * stroke
    tr = simulate(model, [Move(direction, duration=window, ramp=ramp)], x0=x0, rtol=RTOL, atol_p=ATOL_P)
    sel = tr.t >= tr.t[0] + 0.5 * window
    t, v = tr.t[sel], np.abs(tr.v[sel])
    mean = float(np.trapezoid(v, t) / max(t[-1] - t[0], 1e-12)) if t.size > 1 else float(v.mean())
    swing = 0.5 * float(v.max() - v.min())
    d = v - mean
    up = np.where((d[:-1] < 0) & (d[1:] >= 0))[0]
    freq = float((up.size - 1) / (t[up[-1]] - t[up[0]])) if up.size >= 2 else 0.0
    return tr, mean, swing, freq


def run(values) -> Outcome:
    axis = build_axis(values)
    if not axis.mass > 0:
        raise InputError("operation.mass", "0 kg", "a moving mass greater than 0 kg (the motion needs it)")
    model, profile = model_from_values(values, axis)
    mo, lim, op, rt = values["motion"], values["limits"], values["operation"], values["ratings"]
    c = axis.cylinder
    x0 = start_position(profile, c.stroke)
    tr = simulate(model, profile, x0=x0, rtol=RTOL, atol_p=ATOL_P)
    margin = lim["pressure_margin"]
    res, findings = {}, []
    res["profile_time"] = result("Time of the whole profile", tr.t[-1], "time", "s")
    # the integrator's step count is left out of the results: it differs in the last steps
    # between machines (floating point), so a record would not recheck elsewhere

    # ---- stroke time
    t_prev, x_prev = 0.0, x0
    for k, (mv, t_end) in enumerate(zip(profile, tr.move_end)):
        i_end = int(np.searchsorted(tr.t, t_end, side="right")) - 1
        x_end = float(tr.x[i_end])
        dur = t_end - t_prev
        if mv.kind != "stop":
            res[f"move_{k + 1}_time"] = result(f"Move {k + 1} ({mv.kind}), time", dur, "time", "s")
            if mv.kind == axis.controlled and mo.get("cycle_time") is None and axis.target_speed:
                dist = abs(x_end - x_prev)
                allowed = dist / (axis.target_speed * (1.0 - axis.speed_tolerance)) if dist > 0 else 0.0
                if dist > 0 and mv.duration is None:
                    level, m = grade(dur, allowed, 0.0)
                    findings.append(finding(
                        f"MO-TIME-{k + 1}", f"Move {k + 1} ({mv.kind}) takes no longer than its distance at the "
                        "target speed less its tolerance", f"time of move {k + 1}", dur, allowed, "time", "s", level,
                        "operation.target_speed and speed_tolerance (demo scenario)", m,
                        detail=f"{dist * 1e3:.4g} mm" + ("" if tr.arrived[k] else "; the move never arrived")))
            if mv.duration is None and not tr.arrived[k]:
                findings.append(finding(
                    f"MO-ARRIVE-{k + 1}", f"Move {k + 1} ({mv.kind}) reaches its target", "position reached",
                    x_end, mv.target, "length", "mm", "fail", "the command profile", None,
                    detail="the axis stalled short of the target"))
        t_prev, x_prev = t_end, x_end
    if mo.get("cycle_time") is not None:
        level, m = grade(tr.t[-1], mo["cycle_time"], 0.0)
        findings.append(finding("MO-TIME", "The whole profile fits the time the cycle allows", "profile time",
                                tr.t[-1], mo["cycle_time"], "time", "s", level, "motion.cycle_time (user input)", m))

    # ---- peak pressures against ratings
    hose, valve_r, cyl_r = rt["hose_rating"], rt["valve_rating"], c.rated_pressure
    for i, name in enumerate(model.names):
        peak = float(np.max(tr.nodes[i]))
        if i in (model.i1, model.i3):
            side = "cap" if i == model.i1 else "rod"
            merged = model.side[side]["line"] == i
            rating, rname = (min(cyl_r, hose), "cylinder and hose rating") if merged else (cyl_r, "cylinder rating")
            label = f"{side} chamber" + (" and its line" if merged else "")
        elif name.endswith("line") and name != "ps":
            rating, rname, label = hose, "hose rating", name
        else:
            rating, rname = valve_r, "valve rating"
            label = "pump line" if name == "ps" else f"{name} (valve body)"
        key = name.replace(" ", "_")
        res[f"peak_{key}"] = result(f"Peak pressure, {label}", peak, "pressure", "bar")
        level, m = grade(peak, rating, margin)
        findings.append(finding(f"MO-PEAK-{key.upper()}", f"Peak pressure of the {label} over the motion stays "
                                f"within the {rname}", f"peak pressure, {label}", peak, rating, "pressure", "bar",
                                level, "user's data sheet rating; caution margin common practice", m,
                                detail=f"at {float(tr.t[np.argmax(tr.nodes[i])]):.3g} s"))

    # ---- cavitation
    for i, side in ((model.i1, "cap"), (model.i3, "rod")):
        # the model lets a void form instead of tension: an absolute pressure at or below 0 is a void
        low = max(float(np.min(tr.nodes[i])) + P_ATM, 0.0)
        res[f"lowest_abs_{side}"] = result(f"Lowest absolute pressure, {side} chamber", low, "pressure", "bar")
        level, m = grade(low, lim["cavitation_abs"], 0.0, higher_is_worse=False)
        findings.append(finding(f"MO-CAVITATION-{side.upper()}", f"The {side} chamber stays above the cavitation "
                                "limit over the motion", f"lowest absolute pressure, {side} chamber", low,
                                lim["cavitation_abs"], "pressure", "bar", level, "limits.cavitation_abs (from memory)",
                                m, detail=f"at {float(tr.t[np.argmin(tr.nodes[i])]):.3g} s"))

    # ---- end-stop impacts
    impact = max(tr.impacts) if tr.impacts else 0.0
    res["impact_speed"] = result("Highest end-stop impact speed", impact, "velocity", "mm/s")
    level, m = grade(impact, mo["impact_speed"], 0.0)
    findings.append(finding("MO-IMPACT", "The piston reaches the ends of the stroke no faster than the cylinder "
                            "allows", "end-stop impact speed", impact, mo["impact_speed"], "velocity", "mm/s", level,
                            "motion.impact_speed (user's data sheet)", m,
                            detail=f"{len(tr.impacts)} impact(s) in the profile" if tr.impacts
                            else "the profile stops short of both ends"))

    # ---- ramps against the natural frequency
    # medians over an even time grid (a median over the integrator's steps would weight the
    # busy moments by how finely the integrator happened to step through them)
    even = np.linspace(float(tr.t[0]), float(tr.t[-1]), 2001)
    p_cap = float(np.median(_resample(tr.t, tr.p1, even)))
    p_rod = float(np.median(_resample(tr.t, tr.p3, even)))
    w0 = natural_frequency(axis, p_cap, p_rod)
    period = 2 * math.pi / w0
    ramp = min(mo["ramp_open"], mo["ramp_close"])
    need = mo["ramp_periods"] * period
    res["natural_frequency"] = result("Lowest hydraulic natural frequency over the stroke", w0 / (2 * math.pi),
                                      "dimensionless", "Hz")
    res["natural_period"] = result("Natural period", period, "time", "ms")
    level, m = grade(ramp, need, 0.0, higher_is_worse=False)
    level = "caution" if level == "fail" else level
    findings.append(finding("MO-RAMP", f"The valve ramps last at least {mo['ramp_periods']:g} natural periods",
                            "shortest ramp", ramp, need, "time", "ms", level,
                            "rule of thumb (from memory); w0 from Merritt, Hydraulic Control Systems", m,
                            detail=f"w0 = {w0:.4g} rad/s at the chamber pressures' medians over time"))

    # ---- hunting while lowering on a counterbalance, over the pilot ratios
    lower_series = {}
    grid_l = None
    if isinstance(axis.holding, CounterbalanceValve):
        direction = "retract" if axis.holding_side == "cap" else "extend"
        speed = axis.target_speed or 0.05
        window = min(LOWER_WINDOW, max(0.5, 0.7 * c.stroke / speed))
        ratios = list(dict.fromkeys([axis.holding.pilot_ratio] + list(values["study"]["pilot_ratios"])))
        grid_l = np.linspace(0.0, window, 300)
        for r in ratios:
            ax_r = dataclasses.replace(axis, holding=dataclasses.replace(axis.holding, pilot_ratio=r))
            m_r, _ = model_from_values(values, ax_r)
            tr_r, mean, swing, freq = lowering_swing(m_r, c.stroke, direction, window, mo["ramp_open"])
            share = swing / mean if mean > 0 else math.inf
            own = r == axis.holding.pilot_ratio
            tag = f"{r:g}"
            res[f"lower_swing_{tag}"] = result(f"Speed swing while lowering, {r:g}:1", swing, "velocity", "mm/s")
            res[f"lower_freq_{tag}"] = result(f"Oscillation frequency while lowering, {r:g}:1", freq,
                                              "dimensionless", "Hz")
            lower_series[f"{r:g}:1" + (" (design)" if own else "")] = curve(
                _resample(tr_r.t, np.abs(tr_r.v), grid_l) * 1e3)
            value = min(share, 10.0)
            level, mg = grade(value, mo["oscillation_share"], 0.0)
            level = "caution" if level == "fail" else level
            item = finding(f"MO-HUNT-{tag}", f"Lowering on the counterbalance at {r:g}:1 settles (no sustained "
                           "oscillation)", f"speed swing over mean lowering speed, {r:g}:1", value,
                           mo["oscillation_share"], "dimensionless", "%", level,
                           "common practice (high pilot ratios hunt more readily with a mass load)", mg,
                           detail=f"swing {swing * 1e3:.3g} mm/s at {freq:.3g} Hz about a mean of "
                                  f"{mean * 1e3:.3g} mm/s, over the second half of a {window:.3g} s lowering")
            findings.append(item if own else as_alternative(item, f"pilot ratio {r:g}:1"))

    # ---- curves
    n = int(values["study"].get("points", 400))
    grid = np.linspace(0.0, float(tr.t[-1]), n)
    x_mm = _resample(tr.t, tr.x, grid) * 1e3
    v_mm = _resample(tr.t, tr.v, grid) * 1e3
    figures = {
        "position_vs_time": {"title": "Piston position", "x_label": "Time [s]", "y_label": "Position [mm]",
                             "x": curve(grid), "series": {"position": curve(x_mm)},
                             "limits": {"stroke": c.stroke * 1e3}},
        "speed_vs_time": {"title": "Piston speed (positive extending)", "x_label": "Time [s]",
                          "y_label": "Speed [mm/s]", "x": curve(grid), "series": {"speed": curve(v_mm)},
                          "limits": {}},
        "pressures_vs_time": {"title": "Chamber and pump-line pressures", "x_label": "Time [s]",
                              "y_label": "Pressure [bar]", "x": curve(grid),
                              "series": {"cap chamber": curve(_resample(tr.t, tr.p1, grid) / 1e5),
                                         "rod chamber": curve(_resample(tr.t, tr.p3, grid) / 1e5),
                                         "pump line": curve(_resample(tr.t, tr.ps, grid) / 1e5)},
                              "limits": {"cylinder rating": cyl_r / 1e5, "hose rating": hose / 1e5}},
    }
    if isinstance(axis.holding, CounterbalanceValve):
        figures["pilot_vs_time"] = {"title": "Counterbalance pilot pressure (lagged)", "x_label": "Time [s]",
                                    "y_label": "Pilot pressure [bar]", "x": curve(grid),
                                    "series": {"pilot": curve(_resample(tr.t, tr.pilot, grid) / 1e5)},
                                    "limits": {}}
        figures["lowering_by_ratio"] = {"title": "Lowering speed over the pilot ratios", "x_label": "Time [s]",
                                        "y_label": "Lowering speed [mm/s]", "x": curve(grid_l),
                                        "series": lower_series,
                                        "limits": {"target speed": (axis.target_speed or 0.0) * 1e3}}
    notes = [f"Simulated with BDF at rtol {RTOL:g}; oil at {op['temp_min'] - 273.15:.3g} degC; "
             "curves resampled evenly in time (peaks taken from every step)."]
    return Outcome(KIND, TITLE, values, FIELDS, res, findings, figures, {}, notes)


__all__ = ["KIND", "TITLE", "PURPOSE", "FIELDS", "KEY_FIELDS", "run", "lowering_swing"]
