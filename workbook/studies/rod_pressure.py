"""Rod-side pressure check: every operating case against the cylinder, hose and valve ratings.

Cases, at every load case of the design (findings and results) and over a load sweep (the
curves), at both ends of the oil temperature range (the higher pressure of the two is kept):

* extending and retracting with the flow valve as designed;
* the controlled motion with the flow valve fully closed (opening 0). With meter-out the
  trapped chamber then carries the supply pressure times the area ratio, plus a pulling
  load over its area (common practice)::

      p3 = (p_pump * A1 - F) / A3          (closed meter-out valve in the rod line, extending)

When a case exceeds a rating the study says what would fix it: a rod-side relief valve set
below the lowest rating, the smallest change of rod (area ratio) that keeps the closed-valve
pressure inside the ratings, or the meter-in arrangement.
"""

from __future__ import annotations

import dataclasses
import math

import numpy as np

from ..circuit import solve
from ..cylinder import ISO3320_RODS_MM
from .base import Outcome, curve, finding, grade, result
from .common import AXIS_FIELDS, FLOW_VALVE_FIELDS, HOLDING_FIELDS, build_axis, sweep

KIND = "rod-pressure"
TITLE = "Rod-side pressure check"
PURPOSE = ("Chamber pressures in every operating case, including the flow valve closed and the "
           "overrunning load, in both directions, against the cylinder, hose and valve ratings.")
NORMAL_REGIME = None

FIELDS = AXIS_FIELDS + FLOW_VALVE_FIELDS + HOLDING_FIELDS + (
    ("cylinder", "stroke"),
    ("ratings", "hose_rating"), ("ratings", "valve_rating"), ("limits", "pressure_margin"),
    ("limits", "buckling_factor"), ("cylinder", "mounting"), ("cylinder", "buckling_length"),
    ("study", "load_min"), ("study", "load_max"), ("study", "points"),
)

#: the inputs the panel keeps in view (the rest fold away by section)
KEY_FIELDS = (
    ("cylinder", "bore"), ("cylinder", "rod"), ("cylinder", "rated_pressure"), ("flow_valve", "arrangement"),
    ("supply", "relief_full_flow"), ("operation", "loads"), ("ratings", "hose_rating"), ("ratings", "valve_rating"),
)

def _worst(sol, name):
    """Highest value over the temperature axis (axis 1) of a (loads, temps) solution field."""
    return np.max(np.asarray(getattr(sol, name)), axis=1)


def cases(values, design: bool = False):
    """Solve every case; return ``(axis, {case: (p1, p3, regimes, loads)})``.

    With ``design`` each motion runs at its own load cases (:meth:`Axis.loads_for`, what the
    findings use); otherwise every case runs over the curve sweep.
    """
    axis = build_axis(values)
    op = values["operation"]
    temps = np.array([op["temp_min"], op["temp_max"]])
    swept = None if design else sweep(values)

    def loads_of(direction):
        return np.asarray(axis.loads_for(direction), dtype=float) if design else swept

    out = {}
    for direction in ("extend", "retract"):
        loads = loads_of(direction)
        sol = solve(axis, loads[:, None], temps[None, :], direction=direction)
        out[f"{direction}"] = (_worst(sol, "p1"), _worst(sol, "p3"), [str(r) for r in np.asarray(sol.regime)[:, 0]],
                               loads)
    if axis.arrangement != "bleed-off":
        loads = loads_of(axis.controlled)
        sol = solve(axis, loads[:, None], temps[None, :], opening=0.0)
        out[f"{axis.controlled}, valve closed"] = (_worst(sol, "p1"), _worst(sol, "p3"),
                                                    [str(r) for r in np.asarray(sol.regime)[:, 0]], loads)
    return axis, out


def largest_safe_rod(axis, p_supply: float, pull: float, rating: float) -> float | None:
    """Largest ISO 3320 rod (m) keeping the closed meter-out rod pressure within ``rating``.

    From ``p3 = (p A1 + pull) / A3 <= rating``: ``A3 >= (p A1 + pull)/rating``, so
    ``d <= sqrt(D² - 4 (p A1 + pull)/(pi rating))``. None if no rod is small enough.
    """
    a1 = axis.cylinder.a1
    need = (p_supply * a1 + max(pull, 0.0)) / rating
    rest = axis.cylinder.bore ** 2 - 4.0 * need / math.pi
    if rest <= 0:
        return None
    d_max = math.sqrt(rest)
    fits = [r / 1000.0 for r in ISO3320_RODS_MM if r / 1000.0 <= d_max]
    return fits[-1] if fits else None


def _ing(direction: str) -> str:
    return {"extend": "extending", "retract": "retracting"}[direction]


def working_pressure(axis) -> tuple[float, str]:
    """The least relief full-flow pressure the duty needs, Pa, and what sets it.

    The force balance of each motion at each of its load cases with the other chamber at the
    tank back pressure, ``p = (s F + F_fr + p_t A_o) / A_d`` (the least the driving chamber
    needs to move it), and the work force stalled at the end of the working motion,
    ``p = (F_work + p_t A_o) / A_d``; the highest of them.

    >>> from types import SimpleNamespace as NS
    >>> cyl = NS(a1=math.pi * 0.1 ** 2 / 4, a3=math.pi * (0.1 ** 2 - 0.07 ** 2) / 4)
    >>> ax = NS(cylinder=cyl, friction=0.0, tank_pressure=0.0, work_force=120e3, work_motion="extend",
    ...         loads_for=lambda d: (0.0,))
    >>> p, why = working_pressure(ax)
    >>> round(p / 1e5, 1), why
    (152.8, 'the 120 kN work force extending')
    """
    c = axis.cylinder
    best = (0.0, "")
    for d in ("extend", "retract"):
        s, a_d, a_o = (1.0, c.a1, c.a3) if d == "extend" else (-1.0, c.a3, c.a1)
        for f in axis.loads_for(d):
            p = (s * f + axis.friction + axis.tank_pressure * a_o) / a_d
            if p > best[0]:
                best = (p, f"moving the {f / 1e3:.4g} kN case {_ing(d)}")
    if axis.work_force is not None:
        a_d, a_o = (c.a1, c.a3) if axis.work_motion == "extend" else (c.a3, c.a1)
        p = (axis.work_force + axis.tank_pressure * a_o) / a_d
        if p > best[0]:
            best = (p, f"the {axis.work_force / 1e3:.4g} kN work force {_ing(axis.work_motion)}")
    return best


def _remedy(axis, solved, lowest, lowest_name, margin_share, buckling_factor, res) -> dict:
    """What would bring the rod side back inside the lowest rating, for the case that caused it.

    * Lower the relief: with the meter-out valve closed, ``p3 = (p A1 - F)/A3``, so the
      full-flow pressure must satisfy ``p <= (rating A3 + F_min)/A1`` (F_min: the most pulling
      load case).
    * A rod-side relief: only if the rod side stays below its setting while metering;
      otherwise it would open in normal motion and the flow valve would lose the speed.
    * A thinner rod (a smaller area ratio), checked for Euler buckling when stalled at the
      relief pressure (the same rule as the axis check).
    * Meter-in, where a closed valve leaves the rod side at tank pressure.
    """
    c = axis.cylinder
    case = max(solved, key=lambda k: float(np.max(solved[k][1])))
    p_rod_max = float(np.max(solved[case][1]))
    moving_rod = max(float(np.max(v[1])) for k, v in solved.items() if "closed" not in k)
    f_min = min(float(np.min(v[3])) for v in solved.values())
    advice = []
    closed_case = "closed" in case
    relief_ok = (lowest * c.a3 + f_min) / c.a1
    p_work, why = working_pressure(axis)
    if relief_ok > axis.tank_pressure:
        res["relief_for_rating"] = result("Relief full-flow pressure that keeps the rod side inside the lowest "
                                          "rating", relief_ok, "pressure", "bar")
        # the relief must stay above what the duty needs, with the pressure margin (common practice)
        if relief_ok >= p_work * (1 + margin_share):
            advice.append(f"lower the relief full-flow pressure to at most {relief_ok / 1e5:.0f} bar "
                          f"(now {axis.supply.relief.full_flow / 1e5:.0f} bar; the duty needs at least "
                          f"{p_work / 1e5:.0f} bar, for {why})")
        else:
            advice.append(f"lowering the relief would not do: the rod side needs it at most {relief_ok / 1e5:.0f} bar, "
                          f"but the duty needs at least {p_work / 1e5:.0f} bar for {why}")
    setting = lowest / (1 + margin_share)
    if moving_rod < setting:
        res["rod_relief_setting"] = result("Rod-side relief setting that would protect the lowest rating",
                                           setting, "pressure", "bar")
        advice.append(f"or a rod-side relief valve set at about {setting / 1e5:.0f} bar (below the {lowest_name}; "
                      f"the rod side reaches {moving_rod / 1e5:.0f} bar while metering, so it stays shut then)")
    else:
        advice.append(f"a rod-side relief would not do: the rod side reaches {moving_rod / 1e5:.0f} bar while "
                      "metering, so a relief below the rating would open in normal motion and take the speed "
                      "from the flow valve")
    if closed_case and axis.arrangement == "meter-out" and axis.controlled == "extend":
        rod = largest_safe_rod(axis, axis.supply.relief.full_flow, max(-f_min, 0.0), lowest)
        if rod is not None and rod < c.rod:
            thin = dataclasses.replace(c, rod=rod)
            euler = thin.euler_buckling_load(length=thin.free_length) / buckling_factor
            stall = axis.supply.relief.full_flow * c.a1
            res["largest_safe_rod"] = result("Largest ISO 3320 rod keeping the closed-valve pressure inside the "
                                             "lowest rating", rod, "length", "mm")
            words = "passes" if stall <= euler else "fails"
            advice.append(f"or a thinner rod of {rod * 1e3:g} mm (area ratio {thin.phi:.2f}), which {words} "
                          f"the buckling check stalled at relief pressure ({stall / 1e3:.0f} kN against "
                          f"{euler / 1e3:.0f} kN)")
    if axis.arrangement == "meter-out":
        meter_in = dataclasses.replace(axis, arrangement="meter-in")
        s = solve(meter_in, solved[f"{axis.controlled}, valve closed"][3], axis.temp_min, opening=0.0)
        p = float(np.max(np.asarray(s.p3)))
        res["meter_in_closed_rod"] = result("Highest rod pressure with meter-in, valve closed", p, "pressure", "bar")
        advice.append(f"or meter-in, where the closed valve leaves the rod side at {p / 1e5:.0f} bar "
                      "(but meter-in needs a holding valve to hold an overrunning load)")
    return finding(
        "RP-REMEDY", "What to change: " + "; ".join(advice), "highest rod pressure", p_rod_max, lowest,
        "pressure", "bar", "caution" if p_rod_max <= lowest else "fail", "force balance; common practice",
        (lowest - p_rod_max) / lowest, detail=f"worst case: {case}")


def run(values) -> Outcome:
    axis, solved = cases(values, design=True)    # each motion at its own load cases
    _, curves = cases(values)                    # the curves, over the sweep
    sweep_loads = sweep(values)
    rt = values["ratings"]
    margin_share = values["limits"]["pressure_margin"]
    ratings = {
        "cylinder rating": axis.cylinder.rated_pressure,
        "hose rating": rt["hose_rating"],
        "valve rating": rt["valve_rating"],
    }
    lowest_name = min(ratings, key=ratings.get)
    lowest = ratings[lowest_name]
    res = {"area_ratio": {"value": axis.cylinder.phi, "unit": "", "label": "Area ratio φ (cap area / annulus area)"}}
    findings = []
    for case, (p1, p3, _regimes, _loads) in solved.items():
        for chamber, p in (("cap", p1), ("rod", p3)):
            i = int(np.argmax(p))
            key = f"{case.replace(', ', '_').replace(' ', '_')}_{chamber}"
            res[f"p_{key}"] = result(f"Highest {chamber} pressure, {case}", float(p[i]), "pressure", "bar")
    # one finding per chamber and rating, at the worst case
    for chamber in ("cap", "rod"):
        idx = 0 if chamber == "cap" else 1
        best = max(((float(np.max(v[idx])), c, float(v[3][int(np.argmax(v[idx]))])) for c, v in solved.items()))
        value, case, at_load = best
        for rname, rvalue in ratings.items():
            level, margin = grade(value, rvalue, margin_share)
            findings.append(finding(
                f"RP-{chamber.upper()}-{rname.split()[0].upper()}",
                f"{chamber.capitalize()} chamber pressure stays within the {rname} in every case",
                f"highest {chamber} pressure", value, rvalue, "pressure", "bar", level,
                "user's data sheet rating; caution margin common practice", margin,
                detail=f"worst case: {case} at {at_load / 1e3:.3g} kN"))
    # what to change when the rod side fails: worked out for the case that caused it
    p_rod_max = max(float(np.max(v[1])) for v in solved.values())
    if p_rod_max > lowest * (1 - margin_share):
        findings.append(_remedy(axis, solved, lowest, lowest_name, margin_share,
                                values["limits"]["buckling_factor"], res))
    series = {}
    regimes = {}
    for case, (p1, p3, reg, _loads) in curves.items():
        series[f"cap, {case}"] = curve(p1 / 1e5)
        series[f"rod, {case}"] = curve(p3 / 1e5)
        regimes[f"cap, {case}"] = reg
        regimes[f"rod, {case}"] = reg
    figures = {
        "chamber_pressure_vs_load": {
            "title": "Chamber pressures against load (higher of cold and warm oil)",
            "x_label": "Load [kN]", "y_label": "Pressure [bar]", "x": curve(sweep_loads / 1e3),
            "series": series, "limits": {k: v / 1e5 for k, v in ratings.items()},
        },
    }
    return Outcome(KIND, TITLE, values, FIELDS, res, findings, figures, {"chamber_pressure_vs_load": regimes})


__all__ = ["KIND", "TITLE", "PURPOSE", "FIELDS", "run", "cases", "largest_safe_rod"]
