"""Design rules that turn the solutions of an axis into findings.

Every rule is data (:class:`Rule`): an id of our own, a statement in plain words, the
quantity it looks at, the sense of the limit (the value must stay at most / at least the
limit), what happens when it is broken (fail, or only a caution), and its source: a
standard or handbook by name, ``"common practice"``, or ``"from memory"``.

:func:`evaluate` solves the axis over every load case, over the oil temperature range
(``temp_min`` .. ``temp_max``), in both directions of motion, with the flow valve open and
closed (``opening = 0``: the case people forget), and applies every rule that concerns the
axis. A finding's ``margin`` is the distance to the limit as a fraction of the limit
(negative when broken). Levels: ``"fail"`` when broken, ``"caution"`` when within the
caution margin (``limits.pressure_margin`` for pressures, 10 % otherwise) or when a
caution-only rule is broken, ``"pass"`` otherwise.

Results are design estimates; confirm with component data sheets, ISO 4413, local codes
and a qualified engineer (``workbook.CAUTION``).
"""

from __future__ import annotations

import math
from dataclasses import dataclass
from typing import Callable, Mapping

import numpy as np

from . import CAUTION
from .circuit import CLOSED, DRIVEN_BACK, HELD, STALLED, STARVED, UNCONTROLLED, Axis, Solution, solve, stall
from .constants import BAR as _BAR
from .constants import T0_C, TO_LPM
from .errors import InputError
from .fluid import P_ATM
from .grading import grade_margin
from .inputs import LIMITS
from .supply import OVERALL_EFFICIENCY_DEFAULT
from .valve import BackPressureValve, CompensatedFlowValve, CounterbalanceValve

LEVELS = ("fail", "caution", "pass")

#: default overall efficiency of the pump (from memory); the design's own is ``supply.overall_efficiency``
PUMP_OVERALL_EFFICIENCY = OVERALL_EFFICIENCY_DEFAULT
#: number of oil temperatures evaluated between temp_min and temp_max
N_TEMPERATURES = 5


@dataclass(frozen=True)
class Finding:
    """The outcome of one rule on one axis (SI values)."""

    rule_id: str
    statement: str
    quantity: str
    value: float
    limit: float
    dimension: str
    margin: float
    level: str
    source: str
    detail: str = ""

    @property
    def unit(self) -> str:
        """Alias: the dimension name of ``value`` and ``limit`` (see :mod:`workbook.units`)."""
        return self.dimension


@dataclass(frozen=True)
class Rule:
    """A design rule as data.

    ``measure(ctx)`` returns ``(value, limit, detail)`` or ``None`` when the rule does not
    concern the axis; a fourth element, a level, overrides the graded one where the value
    itself cannot be trusted (a speed that is only a lower bound). ``sense`` is ``"max"`` (value at most limit) or ``"min"`` (at least).
    ``broken`` is the level when the limit is crossed (``"fail"`` or ``"caution"``);
    ``margin_key`` names the limit in ``limits`` that sets the caution band.
    """

    rule_id: str
    statement: str
    quantity: str
    dimension: str
    sense: str
    source: str
    measure: Callable[["_Context"], tuple | None]
    broken: str = "fail"
    margin_key: str | None = None


class _Context:
    """Every solution of one axis that the rules look at."""

    def __init__(self, axis: Axis, limits: Mapping):
        self.axis, self.limits = axis, limits
        temps = np.linspace(axis.temp_min, axis.temp_max, N_TEMPERATURES if axis.temp_max > axis.temp_min else 1)
        self.temps = temps
        self.cases: list[tuple[str, float, Solution]] = []
        for direction in ("extend", "retract"):
            loads = np.asarray(axis.loads_for(direction), dtype=float)[:, None]   # the cases of this motion
            for opening in (1.0, 0.0):
                sol = solve(axis, loads, temps[None, :], direction, opening)
                self.cases.append((direction, opening, sol))
        #: the axis against its stop (or the work) at the end of each motion, every temperature:
        #: a duty of every cylinder (it can always reach its stop), graded by the rating rules
        self.stalls: list[tuple[str, Solution]] = [(d, stall(axis, d, temps)) for d in ("extend", "retract")]

    def all(self):
        return [s for _, _, s in self.cases]

    def controlled_open(self) -> Solution:
        return next(s for d, o, s in self.cases if d == self.axis.controlled and o == 1.0)

    def worst(self, getter, fn=np.max, stalls: bool = False):
        """(value, description) of the extreme of ``getter(sol)`` over every motion case, and
        over the stalls at the end of each stroke when ``stalls``."""
        best = None
        every = [(d, o, s) for d, o, s in self.cases] + ([(d, None, s) for d, s in self.stalls] if stalls else [])
        for d, o, s in every:
            arr = np.asarray(getter(s), dtype=float)
            idx = np.unravel_index(np.argmax(arr) if fn is np.max else np.argmin(arr), arr.shape)
            val = float(arr[idx])
            if best is None or (val > best[0] if fn is np.max else val < best[0]):
                oil = f"oil {float(s.temperature[idx]) - T0_C:.0f} degC"
                if o is None:
                    where = (f"{d}, stalled at the end of the stroke or on the work (the relief passes the whole "
                             f"pump flow), {oil}")
                else:
                    where = (f"{d}, valve {'closed' if o == 0.0 else 'open'}, load {float(s.load[idx]) / 1e3:g} kN, "
                             f"{oil}, {s.regime[idx]}")
                best = (val, where)
        return best


def _pressure_rule(rule_id, what, getter, rating, rating_words, source):
    def measure(ctx):
        val, where = ctx.worst(getter, stalls=True)
        return val, rating(ctx.axis), f"highest {what} at: {where}; limit: {rating_words}"
    return Rule(rule_id, f"The {what} stays within the {rating_words} in every case, the valve-closed case "
                         "and the stall at the end of each stroke included.", what, "pressure", "max", source, measure,
                margin_key="pressure_margin")


def _cavitation_rule(rule_id, chamber, getter):
    def measure(ctx):
        val, where = ctx.worst(lambda s: getter(s) + P_ATM, np.min)
        return val, ctx.limits["cavitation_abs"], f"lowest absolute pressure the {chamber} chamber is asked for at: {where}"
    return Rule(rule_id, f"The {chamber} chamber never needs less than the cavitation limit (absolute).",
                f"lowest absolute pressure the force balance demands of the {chamber} chamber "
                "(below 0: no oil pressure can restrain the load)", "pressure", "min",
                "from memory (limit); force balance", measure)


def _runaway(ctx):
    n = tot = 0
    where = ""
    for d, o, s in ctx.cases:
        # running away while moving, sinking through a holding valve that the trapped load opens,
        # or not held with the flow valve closed: the force balance cannot close (the chamber
        # that should carry the load would need less than the cavitation limit), so the load
        # moves whatever the valve does
        bad = np.isin(s.regime, UNCONTROLLED) | ((s.regime == CLOSED) & (np.abs(s.unbalanced_force) > 1.0))
        n += int(bad.sum())
        tot += bad.size
        if bad.any() and not where:
            i = np.unravel_index(np.argmax(bad), bad.shape)
            where = f"e.g. {d}, load {float(s.load[i]) / 1e3:g} kN, oil {float(s.temperature[i]) - T0_C:.0f} degC"
    return n / tot, 0.0, (f"{n} of {tot} points run away; {where}" if n else "no point runs away")


def _starved(ctx):
    v = ctx.axis.flow_valve
    if not isinstance(v, CompensatedFlowValve):
        return None
    s = ctx.controlled_open()
    moving = s.speed > 0
    if not moving.any():
        return 0.0, v.min_drop, "the controlled motion does not move at any load"
    if ctx.axis.arrangement == "bleed-off":
        dp = s.dp_flow_valve[moving]
    else:
        dp = np.where(moving, s.dp_flow_valve, np.inf)
    val = float(np.min(dp))
    n = int((s.regime == STARVED).sum())
    return val, v.min_drop, f"smallest drop across the compensated valve in the controlled motion; {n} starved points"


def _hold_pressure(ctx):
    return float(np.max(ctx.axis.holding_pressure()))


def _cb_holds(ctx):
    h = ctx.axis.holding
    if not isinstance(h, (CounterbalanceValve, BackPressureValve)):
        return None
    p = _hold_pressure(ctx)
    return h.setting, p, (f"setting against the highest load-induced pressure in the {ctx.axis.holding_side} "
                          f"chamber ({p / _BAR:.1f} bar)")


def _cb_factor(ctx):
    h = ctx.axis.holding
    if not isinstance(h, CounterbalanceValve):
        return None
    f = ctx.limits["counterbalance_factor"]
    p = _hold_pressure(ctx)
    return h.setting, f * p, f"setting against {f:g} x the highest load-induced pressure ({p / _BAR:.1f} bar)"


def _hold_rating(ctx):
    h = ctx.axis.holding
    if h is None:
        return None
    r = min(ctx.axis.cylinder.rated_pressure, ctx.axis.ratings.valve_rating, ctx.axis.ratings.hose_rating)
    return h.setting, r, "setting against the lowest of cylinder, hose and valve ratings"


def _heat(ctx):
    drive = ctx.axis.supply.drive_power
    if not math.isfinite(drive):
        return None
    val, where = ctx.worst(lambda s: np.where(s.opening > 0, s.loss_total, 0.0) + 0.0 * s.speed)
    return val, ctx.limits["heat_share"] * drive, (f"throttling heat (valves, relief, return line) at: {where}; "
                                                  f"drive {drive / 1e3:g} kW")


def _drive(ctx):
    drive = ctx.axis.supply.drive_power
    if not math.isfinite(drive):
        return None
    eta = ctx.axis.supply.overall_efficiency
    val, where = ctx.worst(lambda s: s.input_power / eta)
    return val, drive, f"pump shaft power (hydraulic / overall efficiency {eta:g}) at: {where}"


def _line_rule(rule_id, line, limit_key, flow_getter, bore_attr, words):
    def measure(ctx):
        d = getattr(ctx.axis.ratings, bore_attr)
        area = math.pi * d * d / 4.0
        val, where = ctx.worst(lambda s: flow_getter(s) / area)
        return val, ctx.limits[limit_key], f"mean velocity in the {line} line, bore {d * 1e3:g} mm, at: {where}"
    return Rule(rule_id, f"The mean oil velocity in the {line} line stays at most {words}.",
                f"{line} line velocity", "velocity", "max", "common practice", measure, broken="caution")


def _port_rule(side: str):
    """Velocity in the line to the ``side`` port in every case, against the pressure-line
    limit while it feeds the chamber and the return-line limit while it drains it; the case
    nearest its limit is reported. On retraction the cap line carries the area ratio times
    the flow into the rod side (common practice: the case people forget)."""
    def measure(ctx):
        ax = ctx.axis
        d = ax.ratings.cap_line_bore if side == "cap" else ax.ratings.rod_line_bore
        area = math.pi * d * d / 4.0
        best = None
        for direction, opening, s in ctx.cases:
            driving = (direction == "extend") == (side == "cap")
            q = s.q_cylinder_in if driving else s.q_cylinder_out
            into = (q > 0) == driving                       # oil flows into this chamber
            v = np.abs(q) / area
            lim = np.where(into, ctx.limits["v_pressure"], ctx.limits["v_return"])
            ratio = v / lim
            i = np.unravel_index(np.argmax(ratio), ratio.shape)
            if best is None or ratio[i] > best[0]:
                best = (float(ratio[i]), float(v[i]), float(lim[i]),
                        f"{direction}, valve {'closed' if opening == 0.0 else 'open'}, load "
                        f"{float(s.load[i]) / 1e3:g} kN, oil {float(s.temperature[i]) - T0_C:.0f} degC, "
                        f"{s.regime[i]}, {'feeding' if into[i] else 'draining'} the {side} side")
        _, v, lim, where = best
        return v, lim, (f"mean velocity in the {side} line, bore {d * 1e3:g} mm, at: {where}; limit of a "
                        f"{'pressure' if lim == ctx.limits['v_pressure'] else 'return'} line")
    return Rule(f"V-{side.upper()}-LINE", f"The mean oil velocity in the {side} port line stays within the "
                "pressure-line limit while feeding and the return-line limit while draining.",
                f"{side} line velocity", "velocity", "max", "common practice", measure, broken="caution")


def _suction(ctx):
    """Suction line velocity from the pump's geometric flow (displacement x speed): what the
    pump draws when its leakage goes to a case drain, the conservative figure (common
    practice). ``v = Q_geom / (pi d² / 4)``."""
    d = ctx.axis.ratings.suction_line_bore
    q = ctx.axis.supply.suction_flow
    return q / (math.pi * d * d / 4.0), ctx.limits["v_suction"], (
        f"mean velocity in the suction line, bore {d * 1e3:g} mm, at the geometric pump flow "
        f"{q * TO_LPM:.4g} L/min (displacement x speed; leakage taken to a case drain)")


def _speed(ctx):
    a = ctx.axis
    if a.target_speed is None:
        return None
    s = ctx.controlled_open()
    dev = np.abs(s.speed - a.target_speed) / a.target_speed
    i = np.unravel_index(np.argmax(dev), dev.shape)
    detail = (f"worst speed {float(s.speed[i]) * 1e3:.1f} mm/s against target {a.target_speed * 1e3:g} mm/s at "
              f"load {float(s.load[i]) / 1e3:g} kN, oil {float(s.temperature[i]) - T0_C:.0f} degC ({s.regime[i]})")
    loose = np.isin(s.regime, UNCONTROLLED)
    if loose.any():
        # the speed of a load that runs away is only a lower bound: the check cannot pass on it
        j = np.unravel_index(np.argmax(loose), loose.shape)
        return float(dev[i]), a.speed_tolerance, (
            f"{detail}; {int(loose.sum())} point(s) not under control (e.g. load {float(s.load[j]) / 1e3:g} kN, "
            f"{s.regime[j]}): their speed is only a lower bound"), "fail"
    return float(dev[i]), a.speed_tolerance, detail


def _stall(ctx):
    s = ctx.controlled_open()
    bad = np.isin(s.regime, (STALLED, HELD, CLOSED, DRIVEN_BACK))
    if bad.any():
        i = np.unravel_index(np.argmax(bad), bad.shape)
        where = f"e.g. load {float(s.load[i]) / 1e3:g} kN ({s.regime[i]})"
    else:
        where = "the controlled motion moves at every load and temperature"
    return float(bad.mean()), 0.0, where


def _buckling_words(c) -> str:
    """How the buckling load was found: length (given or estimated), slenderness, method."""
    lam, lam_c = c.slenderness(), c.transition_slenderness()
    method = ("Euler" if lam >= lam_c else
              f"Johnson parabola (short rod, below the Euler limit; yield {c.rod_yield / 1e6:g} MPa)")
    length = (f"pin-to-pin length {c.free_length * 1e3:g} mm ESTIMATED as twice the stroke plus four bores: "
              "give cylinder.buckling_length" if c.length_estimated else f"pin-to-pin length {c.free_length * 1e3:g} mm")
    return (f"{method}, {c.mounting}, {length}, slenderness {lam:.0f} (transition {lam_c:.0f}), E 210 GPa")


def _buckling(ctx):
    """Highest rod compression (p1 A1 - p3 A3 > 0 pushes the rod out against the load)
    against the buckling load of the rod over its free length (Euler, or Johnson for a short
    rod), divided by the safety factor."""
    c = ctx.axis.cylinder
    val, where = ctx.worst(lambda s: np.maximum(c.force(s.p1, s.p3), 0.0))
    f_crit = c.buckling_load()
    k = ctx.limits["buckling_factor"]
    return val, f_crit / k, (f"highest rod compression at: {where}; buckling load {f_crit / 1e3:.4g} kN "
                             f"({_buckling_words(c)}) / {k:g}")


def _stall_extend(ctx) -> Solution:
    return next(s for d, s in ctx.stalls if d == "extend")


def _buckling_stall(ctx):
    """The force the cylinder develops stalled extending against a stop or the work (the
    driving chamber at the pressure the relief holds with the whole pump flow, the rod side as
    its return path leaves it, :func:`workbook.circuit.stall`) against the same limit. Every
    cylinder can reach its stop, so a breach fails."""
    c = ctx.axis.cylinder
    s = _stall_extend(ctx)
    push = np.asarray(c.force(s.p1, s.p3), dtype=float)
    i = int(np.argmax(push))
    f_crit = c.buckling_load()
    k = ctx.limits["buckling_factor"]
    return float(push.flat[i]), f_crit / k, (
        f"{_buckling_words(c)}; extending onto the stop or the work, cap chamber at "
        f"{float(np.asarray(s.p1).flat[i]) / _BAR:.4g} bar, rod side at {float(np.asarray(s.p3).flat[i]) / _BAR:.4g} bar")


def _work_force(ctx):
    """The force the rod exerts stalled at the end of the working motion against the work force."""
    a = ctx.axis
    if a.work_force is None:
        return None
    s = next(s for d, s in ctx.stalls if d == a.work_motion)
    push = np.asarray(s.load, dtype=float) * (1.0 if a.work_motion == "extend" else -1.0)
    i = int(np.argmin(push))
    drive = "cap" if a.work_motion == "extend" else "rod"
    p_drive = float(np.asarray(s.p1 if drive == "cap" else s.p3).flat[i])
    return float(push.flat[i]), a.work_force, (
        f"{a.work_motion}ing onto the work, {drive} chamber at {p_drive / _BAR:.4g} bar (the relief with the whole "
        f"pump flow), oil {float(np.asarray(s.temperature).flat[i]) - T0_C:.0f} degC; friction not counted")


#: every rule, in the order the record lists them
RULES: tuple[Rule, ...] = (
    _pressure_rule("P-CAP-RATING", "cap chamber pressure", lambda s: s.p1, lambda a: a.cylinder.rated_pressure,
                   "cylinder rated pressure", "user's data sheet; ISO 4413 (no component above its rating)"),
    _pressure_rule("P-ROD-RATING", "rod chamber pressure", lambda s: s.p3, lambda a: a.cylinder.rated_pressure,
                   "cylinder rated pressure", "user's data sheet; ISO 4413 (no component above its rating)"),
    _pressure_rule("P-HOSE-RATING", "line pressure", lambda s: np.maximum(np.maximum(s.p1, s.p3), s.p_pump),
                   lambda a: a.ratings.hose_rating, "hose rated pressure",
                   "user's data sheet; ISO 4413 (no component above its rating)"),
    _pressure_rule("P-VALVE-RATING", "valve port pressure",
                   lambda s: np.maximum(np.maximum(np.maximum(s.p1, s.p3), s.p_pump), s.p_mid),
                   lambda a: a.ratings.valve_rating, "valve rated pressure",
                   "user's data sheet; ISO 4413 (no component above its rating)"),
    _cavitation_rule("CAV-CAP", "cap", lambda s: s.p1_demand),
    _cavitation_rule("CAV-ROD", "rod", lambda s: s.p3_demand),
    Rule("RUNAWAY", "No overrunning load runs ahead of the oil supply (the circuit restrains it).",
         "share of points running away", "dimensionless", "max", "common practice; ISO 4413 (load holding)", _runaway),
    Rule("FV-STARVED", "The compensated flow valve keeps at least its minimum working drop over the load range.",
         "smallest drop across the compensated valve", "pressure", "min", "common practice", _starved,
         margin_key="pressure_margin"),
    Rule("H-HOLDS", "The holding valve setting is above the highest load-induced pressure it must hold.",
         "holding valve setting", "pressure", "min", "force balance", _cb_holds),
    Rule("H-CB-FACTOR", "The counterbalance setting is at least the setting factor times the highest "
         "load-induced pressure.", "counterbalance setting", "pressure", "min", "common practice", _cb_factor,
         broken="caution"),
    Rule("H-RATING", "The holding valve setting stays within the cylinder, hose and valve ratings.",
         "holding valve setting", "pressure", "max", "user's data sheet", _hold_rating,
         margin_key="pressure_margin"),
    Rule("ROD-BUCKLING", "The highest rod compression stays below the buckling load divided by the "
         "safety factor.", "rod compression", "force", "max",
         "Euler buckling (pi^2 E I / (K L)^2), Johnson parabola below the transition slenderness (Shigley); "
         "safety factor common practice (from memory)", _buckling),
    Rule("ROD-BUCKLING-STALL", "Stalled against a stop at the relief pressure, the rod stays below the "
         "buckling load divided by the safety factor.", "rod force at relief pressure", "force", "max",
         "Euler buckling (pi^2 E I / (K L)^2), Johnson parabola below the transition slenderness (Shigley); "
         "safety factor common practice (from memory)", _buckling_stall),
    Rule("WORK-FORCE", "Stalled on the work at the relief pressure, the rod applies at least the work force.",
         "rod force on the work", "force", "min", "force balance; work force from the design", _work_force),
    Rule("HEAT-SHARE", "Throttling heat stays within the allowed share of the installed drive power.",
         "throttling heat", "power", "max", "common practice", _heat, broken="caution"),
    Rule("DRIVE-POWER", "The pump never needs more shaft power than the installed drive.",
         "pump shaft power", "power", "max", "P = p Q / overall efficiency (common practice); efficiency from the "
         "design (default 0.85, from memory)", _drive),
    Rule("V-SUCTION", "The mean oil velocity in the suction line stays at most about 1.2 m/s.",
         "suction line velocity", "velocity", "max", "common practice", _suction, broken="caution"),
    _line_rule("V-PRESSURE", "pressure", "v_pressure", lambda s: s.q_pump, "pressure_line_bore", "3 to 6 m/s"),
    _line_rule("V-RETURN", "return", "v_return", lambda s: s.q_cylinder_out + s.q_relief + s.q_bleed,
               "return_line_bore", "2 to 4 m/s (relief taken to drain into it)"),
    _port_rule("cap"),
    _port_rule("rod"),
    Rule("SPEED-TARGET", "The controlled motion keeps its target speed within tolerance over every load and "
         "temperature.", "largest speed deviation", "dimensionless", "max", "target and tolerance from the design; common practice",
         _speed),
    Rule("SUPPLY-STALL", "The supply moves the controlled motion at every load case (the relief setting is above "
         "the load pressure).", "share of points stalled or held", "dimensionless", "max", "force balance", _stall),
)


def default_limits() -> dict:
    """The check limits of the ``limits`` section, SI, with their declared defaults."""
    return LIMITS.defaults()


def _limits(limits: Mapping | None) -> dict:
    out = default_limits()
    for k, v in dict(limits or {}).items():
        if k not in out:
            raise InputError(f"limits.{k}", "an unknown entry", "one of " + ", ".join(out))
        try:
            fv = float(v)
        except (TypeError, ValueError):
            raise InputError(f"limits.{k}", repr(v), LIMITS[k].allowed()) from None
        if not math.isfinite(fv):
            raise InputError(f"limits.{k}", v, LIMITS[k].allowed())
        out[k] = fv
    return out


def _level(rule: Rule, value: float, limit: float, limits: Mapping) -> tuple[float, str]:
    band = limits[rule.margin_key] if rule.margin_key else 0.10
    return grade_margin(value, limit, band, higher_is_worse=rule.sense == "max", broken=rule.broken)


def evaluate(axis: Axis, limits: Mapping | None = None) -> list[Finding]:
    """Every rule that concerns ``axis``, sorted fail, caution, pass (then rule order).

    ``limits`` overrides entries of the ``limits`` section (SI values, keys as in
    :data:`workbook.inputs.LIMITS`).
    """
    lim = _limits(limits)
    ctx = _Context(axis, lim)
    out = []
    for rule in RULES:
        res = rule.measure(ctx)
        if res is None:
            continue
        value, limit, detail = res[:3]
        value, limit = float(value), float(limit)
        if not (math.isfinite(value) and math.isfinite(limit)):
            raise RuntimeError(f"rule {rule.rule_id} produced a non-finite value")  # pragma: no cover
        margin, level = _level(rule, value, limit, lim)
        if len(res) > 3:
            level = res[3]
        out.append(Finding(rule.rule_id, rule.statement, rule.quantity, value, limit, rule.dimension, margin, level,
                           rule.source, detail))
    order = {lv: i for i, lv in enumerate(LEVELS)}
    return sorted(out, key=lambda f: order[f.level])


__all__ = ["Finding", "Rule", "RULES", "evaluate", "default_limits", "LEVELS", "CAUTION", "PUMP_OVERALL_EFFICIENCY"]
