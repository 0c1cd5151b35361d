"""Steady-state solution of one cylinder axis: meter-in, meter-out or bleed-off, each with or
without a load-holding valve, in both directions of motion, over arrays of loads and oil
temperatures at once.

Circuit model
-------------
A fixed pump feeds the axis; whatever the axis does not take crosses the relief valve. The
directional valve is ideal (no drop). Per direction of motion the *driving* chamber takes
oil in (cap when extending, rod when retracting) and the *driven* chamber pushes oil out.

* **meter-in**: the flow valve sits in the line of the chamber that drives the controlled
  motion, forward towards the cylinder.
* **meter-out**: it sits in the line of the chamber that is driven in the controlled motion,
  forward from the cylinder to tank.
* **bleed-off**: it tees off the line to the driving chamber of the controlled motion and
  bleeds to tank; the cylinder gets the remainder of the pump flow.
* In the **other direction** the flow valve passes oil in reverse through its free-flow
  check (meter-in / meter-out); a bleed-off valve then sits in the return, in parallel with
  the return path to tank, and does not meter (its effect is neglected).
* The **holding valve** (counterbalance or back-pressure) is mounted at the port of its
  load-holding chamber (``holding_side``) and restrains the outflow of that chamber; oil
  flows in through its check. Order on a return line: cylinder, holding valve, flow valve,
  tank (at ``tank_pressure``). The counterbalance pilot is the opposite chamber.

Equations (gauge pressures; ``s`` = +1 extending, -1 retracting; ``A_d``, ``A_o`` driving
and driven areas; ``p_d``, ``p_o`` their pressures; ``F`` the load, positive pushing the rod
in; ``F_fr`` running friction, opposing motion)::

    p_d A_d - p_o A_o = s F + F_fr                 (DEVELOPERS.md force balance)
    Q_in  = A_d v,  Q_out = A_o v                   (continuity)
    Q_pump = Q_in + Q_bleed + Q_relief              (fixed pump)

The speed ``v`` is found by a vectorised bracketing solve (regula falsi with the Illinois
modification and forced bisection steps, on all points at once, no per-point call) of
one monotone residual in flow per arrangement. At standstill (``v = 0``: stalled, held, or
valve closed) friction is taken as zero: static friction may take any value up to
breakaway, and zero gives the highest trapped pressure, the conservative choice for ratings.

Pressures are never returned below the cavitation limit ``cavitation_abs - P_ATM`` (gauge);
where the force balance would ask for less, the chamber is clamped there, the point is
flagged, and ``unbalanced_force`` records the force the clamped pressures leave unbalanced.

Regime labels (:data:`REGIMES`):

===================  =========================================================================
``metering``          the flow valve sets the speed; the pump's surplus crosses the relief
``compensator starved`` a compensated valve has less than its minimum working drop and acts
                      as a fixed orifice: the flow falls below its setting
``pump-limited``      all pump flow reaches the cylinder, relief closed; the flow valve (if
                      any) is not limiting the speed
``relief bypassing``  the load pressure has opened the relief: part of the pump flow is lost
                      over it and the speed falls below pump speed (not set by a flow valve)
``stalled``           no motion: the supply at relief full-flow pressure cannot move the load
``held``              no motion: the holding valve stays closed and the load stands on it
``valve closed``      no motion: the flow valve's opening is 0 (meter-in / meter-out)
``running away``      an overrunning load would pull the driving chamber below the
                      cavitation limit: the load is not restrained, there is no steady state;
                      the speed reported is the speed the oil supply alone fills (a lower
                      bound) and the driving chamber is clamped
``cavitating``        a chamber is clamped at the cavitation limit but a steady state exists
                      (meter-out: the load outruns the pump and the valve sets the speed)
``sinking``           the flow valve shuts the driving chamber off, yet the trapped load
                      pressure is above the holding valve's opening pressure: the valve
                      opens and the load sinks at the speed the holding valve passes, the
                      driving chamber voiding (counted as running away)
``driven back``       the load exceeds what the supply at relief pressure can hold: the axis
                      moves against the commanded direction (``speed`` < 0), pushing the
                      driving chamber's oil back over the relief (and through any valve in
                      that line) while the other chamber refills through its checks
===================  =========================================================================

Standstill is tested, not assumed: where the solved speed is 0 the solver asks whether the
load drives the piston back (force balance in the opposite direction, friction now helping
the supply) and, with a closed meter-in valve, whether the trapped holding chamber exceeds
its valve's opening pressure (setting, outlet and pilot terms); either motion is solved.

Worked example (checked by hand): an 80/45 cylinder extending against 20 kN with a
12 L/min compensated meter-out valve in the rod line, 21.6 L/min pump, relief 160/172 bar.
The valve holds 12 L/min out of the annulus (A3 = 34.361 cm²): v = 2e-4/3.4361e-3 =
0.05820 m/s; cap inflow 0.05820 × 50.265e-4 = 17.55 L/min, relief 21.6 - 17.55 = 4.05 L/min,
pump pressure 160 + 12 × 4.05/21.6 = 162.25 bar (droop set to zero for the hand check):

>>> from workbook.cylinder import Cylinder
>>> from workbook.fluid import Oil
>>> from workbook.supply import Supply, Pump, ReliefValve
>>> from workbook.valve import CompensatedFlowValve
>>> oil = Oil.from_grade("VG46")
>>> valve = CompensatedFlowValve.from_setting(12 / 60000, float(oil.density(313.15)), droop=0.0)
>>> axis = Axis(Cylinder(0.080, 0.045, 0.6, 210e5), oil,
...             Supply(Pump(21.6 / 60000), ReliefValve(160e5, 172e5, 21.6 / 60000)), valve,
...             arrangement="meter-out", controlled="extend")
>>> sol = solve(axis, 20e3, 313.15)
>>> round(float(sol.speed), 5), str(sol.regime), round(float(sol.p_pump) / 1e5, 2)
(0.0582, 'metering', 162.25)
"""

from __future__ import annotations

import math
from dataclasses import dataclass, field, fields, replace
from typing import Any, Mapping

import numpy as np

from .constants import BAR as _BAR
from .constants import G_STANDARD, T0_C
from .constants import LPM as _LPM
from .cylinder import Cylinder
from .errors import InputError
from .fluid import P_ATM, Oil, effective_bulk_modulus, tube_modulus
from .numerics import solve_increasing
from .supply import Supply
from .valve import (
    CB_OPEN_GRADIENT_DEFAULT,
    CHECK_GRADIENT_DEFAULT,
    BackPressureValve,
    CheckValve,
    CompensatedFlowValve,
    CounterbalanceValve,
    RestrictorValve,
    check_opening,
)

ARRANGEMENTS = ("meter-in", "meter-out", "bleed-off")
DIRECTIONS = ("extend", "retract")
SIDES = ("cap", "rod")

METERING = "metering"
STARVED = "compensator starved"
PUMP_LIMITED = "pump-limited"
RELIEF = "relief bypassing"
STALLED = "stalled"
HELD = "held"
CLOSED = "valve closed"
RUNAWAY = "running away"
CAVITATING = "cavitating"
SINKING = "sinking"
DRIVEN_BACK = "driven back"
#: every regime label a Solution can carry
REGIMES = (METERING, STARVED, PUMP_LIMITED, RELIEF, STALLED, HELD, CLOSED, RUNAWAY, CAVITATING, SINKING,
           DRIVEN_BACK)
#: regimes in which the load moves although nothing meters it (the runaway rule counts them)
UNCONTROLLED = (RUNAWAY, SINKING)

#: default lowest absolute chamber pressure, Pa abs (from memory; limits.cavitation_abs)
CAVITATION_ABS_DEFAULT = 0.3 * _BAR


@dataclass(frozen=True)
class Ratings:
    """Hose and valve pressure ratings (Pa) and line bores (m) of the ``ratings`` section."""

    hose_rating: float = 250 * _BAR
    valve_rating: float = 315 * _BAR
    pressure_line_bore: float = 0.010
    return_line_bore: float = 0.012
    suction_line_bore: float = 0.025
    cap_line_bore: float = 0.010
    rod_line_bore: float = 0.010
    cap_line_length: float = 1.5
    rod_line_length: float = 1.5
    line_kind: str = "hose"
    hose_modulus: float = 3000 * _BAR
    tube_wall: float = 0.0015

    @classmethod
    def from_values(cls, values: Mapping) -> "Ratings":
        return cls(**{f.name: (str(values[f.name]) if f.name == "line_kind" else float(values[f.name]))
                      for f in fields(cls) if values.get(f.name) is not None})

    def line_volume(self, side: str) -> float:
        """Volume of the line between the valves and the ``side`` port, m³ (its dead volume)."""
        bore, length = ((self.cap_line_bore, self.cap_line_length) if side == "cap"
                        else (self.rod_line_bore, self.rod_line_length))
        return math.pi * bore * bore / 4.0 * length

    def line_modulus(self, side: str) -> float:
        """Volumetric stiffness of the ``side`` line, Pa: the hose's, or ``E t / d`` of a steel tube."""
        if self.line_kind == "steel tube":
            return tube_modulus(self.cap_line_bore if side == "cap" else self.rod_line_bore, self.tube_wall)
        return self.hose_modulus


@dataclass(frozen=True)
class Axis:
    """One cylinder axis, everything in SI (see the module text for the circuit).

    ``loads`` are the design load cases (N, positive pushing the rod in) of either motion;
    ``loads_extend`` / ``loads_retract`` the cases of one motion (empty: ``loads``), see
    :meth:`loads_for`; ``work_force`` (N, or None) the force the rod must apply at the end of
    ``work_motion`` (a stall at the work, graded like the end of every stroke); ``temp_min`` and
    ``temp_max`` the oil temperature range (K); ``target_speed`` (m/s) and
    ``speed_tolerance`` (fraction) apply to the ``controlled`` motion.
    """

    cylinder: Cylinder
    oil: Oil
    supply: Supply
    flow_valve: Any
    arrangement: str = "meter-out"
    controlled: str = "retract"
    holding: Any = None
    holding_side: str = "cap"
    friction: float = 0.0
    tank_pressure: float = 0.0
    loads: tuple = (0.0,)
    loads_extend: tuple = ()
    loads_retract: tuple = ()
    work_force: float | None = None
    work_motion: str = "extend"
    temp_min: float = 313.15
    temp_max: float = 313.15
    target_speed: float | None = None
    speed_tolerance: float = 0.15
    mass: float = 0.0
    ratings: Ratings = field(default_factory=Ratings)
    cavitation_abs: float = CAVITATION_ABS_DEFAULT
    air_content: float = 0.0

    def __post_init__(self):
        if self.arrangement not in ARRANGEMENTS:
            raise InputError("arrangement", repr(self.arrangement), "one of " + ", ".join(map(repr, ARRANGEMENTS)))
        if self.controlled not in DIRECTIONS:
            raise InputError("direction", repr(self.controlled), "one of 'extend', 'retract'")
        if self.holding_side not in SIDES:
            raise InputError("side", repr(self.holding_side), "one of 'cap', 'rod'")
        for name in ("friction", "tank_pressure"):
            v = getattr(self, name)
            if not (math.isfinite(v) and v >= 0):
                raise InputError(name, v, "a finite value of at least 0")
        if not (math.isfinite(self.cavitation_abs) and 0.0 <= self.cavitation_abs < P_ATM):
            raise InputError("cavitation_abs", self.cavitation_abs, "an absolute pressure from 0 to 1 atm")
        for name in ("loads", "loads_extend", "loads_retract"):
            given = getattr(self, name)
            loads = tuple(float(x) for x in np.atleast_1d(np.asarray(given, dtype=float)))
            if (name == "loads" and not loads) or not all(math.isfinite(x) for x in loads):
                raise InputError(name, given, "a list of finite forces")
            object.__setattr__(self, name, loads)
        if self.work_motion not in DIRECTIONS:
            raise InputError("work_motion", repr(self.work_motion), "one of 'extend', 'retract'")
        if self.work_force is not None and not (math.isfinite(self.work_force) and self.work_force >= 0):
            raise InputError("work_force", self.work_force, "a finite force of at least 0 kN")
        if self.temp_max < self.temp_min:
            raise InputError("temp_max", f"{self.temp_max - T0_C:g} degC",
                             f"a temperature at least the cold temperature ({self.temp_min - T0_C:g} degC)")
        self.oil.check_temperature(self.temp_min, "temp_min")
        self.oil.check_temperature(self.temp_max, "temp_max")
        if self.tank_pressure >= self.supply.relief.cracking:
            raise InputError("tank_pressure", f"{self.tank_pressure / _BAR:g} bar",
                             f"a back pressure below the relief cracking pressure "
                             f"({self.supply.relief.cracking / _BAR:g} bar)")

    def loads_for(self, direction: str) -> tuple:
        """The load cases (N) that act while the rod moves in ``direction``.

        >>> from workbook.cylinder import Cylinder
        >>> from workbook.fluid import Oil
        >>> from workbook.supply import Supply, Pump, ReliefValve
        >>> from workbook.valve import CompensatedFlowValve
        >>> ax = Axis(Cylinder(0.1, 0.07, 0.5), Oil.from_grade("VG46"),
        ...           Supply(Pump(30 / 6e4), ReliefValve(190e5, 200e5, 30 / 6e4)),
        ...           CompensatedFlowValve.from_setting(12 / 6e4, 870.0),
        ...           loads=(0.0, 120e3), loads_extend=(120e3,), loads_retract=(0.0,))
        >>> ax.loads_for("extend"), ax.loads_for("retract")
        ((120000.0,), (0.0,))
        """
        if direction not in DIRECTIONS:
            raise InputError("direction", repr(direction), "one of 'extend', 'retract'")
        own = getattr(self, f"loads_{direction}")
        return own if own else self.loads

    @property
    def cavitation_gauge(self) -> float:
        """The cavitation limit as a gauge pressure, Pa (negative)."""
        return self.cavitation_abs - P_ATM

    def valve_side(self) -> str | None:
        """Chamber whose line holds the flow valve (None for bleed-off)."""
        if self.arrangement == "bleed-off":
            return None
        ext = self.controlled == "extend"
        if self.arrangement == "meter-in":
            return "cap" if ext else "rod"
        return "rod" if ext else "cap"

    def holding_pressure(self, load=None):
        """Load-induced pressure in the holding chamber, Pa: the load that the holding side
        carries over its area (cap: ``F/A1`` for F > 0; rod: ``-F/A3`` for F < 0)."""
        f = np.asarray(self.loads if load is None else load, dtype=float)
        if self.holding_side == "cap":
            return np.maximum(f, 0.0) / self.cylinder.a1
        return np.maximum(-f, 0.0) / self.cylinder.a3


# --------------------------------------------------------------------------- Solution
@dataclass(frozen=True, eq=False)
class Solution:
    """Steady state at every point (numpy arrays broadcast from ``load`` and ``temperature``).

    ``speed`` is the speed (m/s) in ``direction``: >= 0, except where the load drives the
    axis back (regime ``driven back``), where it is negative; ``velocity`` is signed
    (positive extending). Flows are m³/s, pressures Pa gauge, powers W. Valve flows and
    drops follow the valve's own sign (forward positive, reverse through its check
    negative). ``q_void`` is the rate (m³/s) at which a cavitating driving chamber's volume
    grows faster than oil fills it. ``p1_demand`` / ``p3_demand`` are the pressures the
    force balance asked of each chamber before clamping (may be below absolute zero; for
    checks only).
    """

    direction: str
    arrangement: str
    controlled: bool
    opening: float
    load: np.ndarray
    temperature: np.ndarray
    speed: np.ndarray
    p1: np.ndarray
    p3: np.ndarray
    p_pump: np.ndarray
    p_mid: np.ndarray
    p_pilot: np.ndarray
    q_pump: np.ndarray
    q_relief: np.ndarray
    q_bleed: np.ndarray
    q_cylinder_in: np.ndarray
    q_cylinder_out: np.ndarray
    q_void: np.ndarray
    q_flow_valve: np.ndarray
    dp_flow_valve: np.ndarray
    q_holding: np.ndarray
    dp_holding: np.ndarray
    friction_force: np.ndarray
    unbalanced_force: np.ndarray
    p1_demand: np.ndarray
    p3_demand: np.ndarray
    useful_power: np.ndarray
    friction_power: np.ndarray
    input_power: np.ndarray
    loss_flow_valve: np.ndarray
    loss_holding: np.ndarray
    loss_relief: np.ndarray
    loss_return_line: np.ndarray
    efficiency: np.ndarray
    regime: np.ndarray

    @property
    def velocity(self) -> np.ndarray:
        """Signed speed, m/s: positive extending, negative retracting."""
        return self.speed if self.direction == "extend" else -self.speed

    @property
    def loss_total(self) -> np.ndarray:
        """Heat from throttling: flow valve, holding valve, relief and return line, W."""
        return self.loss_flow_valve + self.loss_holding + self.loss_relief + self.loss_return_line


# --------------------------------------------------------------------------- helpers
def _check_drop(check: CheckValve | None, q):
    if check is None:
        return np.zeros_like(np.asarray(q, dtype=float))
    return check.pressure_drop(q)


@dataclass(frozen=True)
class _Layout:
    """Where each element sits for one direction of motion (internal)."""

    s: float
    a_d: float
    a_o: float
    driving: str
    controlled: bool
    kind: str                 # "free", "meter-in", "meter-out", "bleed-off"
    fv_check_supply: bool     # flow valve's reverse check in the supply path
    fv_check_return: bool     # ... in the return path
    hold_driven: bool         # holding valve restrains the driven chamber's outflow
    hold_driving: bool        # holding valve's check in the supply path


def _layout(axis: Axis, direction: str) -> _Layout:
    cyl = axis.cylinder
    ext = direction == "extend"
    driving = "cap" if ext else "rod"
    controlled = direction == axis.controlled
    vside = axis.valve_side()
    kind = axis.arrangement if controlled else "free"
    fv_sup = (not controlled) and vside == driving
    fv_ret = (not controlled) and vside is not None and vside != driving
    hold = axis.holding is not None
    return _Layout(1.0 if ext else -1.0, cyl.a1 if ext else cyl.a3, cyl.a3 if ext else cyl.a1, driving,
                   controlled, kind, fv_sup, fv_ret,
                   hold and axis.holding_side != driving, hold and axis.holding_side == driving)


class _Model:
    """The equations of one axis, one direction, at fixed load and oil state (internal)."""

    def __init__(self, axis: Axis, lay: _Layout, f_res, rho, mu, opening: float):
        self.ax, self.lay, self.f_res, self.rho, self.mu, self.o = axis, lay, f_res, rho, mu, opening
        self.pt = axis.tank_pressure
        self.qp = axis.supply.flow
        self.relief = axis.supply.relief
        self.fv = axis.flow_valve
        self.hold = axis.holding
        self.pcav = axis.cavitation_gauge
        self.v_max = self.qp / lay.a_d

    # the relief drains to the tank port, which sits at the return-line back pressure
    def relief_flow(self, p):
        return self.relief.flow(p, self.pt)

    def relief_pressure(self, q):
        return self.relief.pressure(q, self.pt)

    # supply-path drop between the pump line (or meter-in outlet / bleed tee) and p_d
    def dp_supply(self, q_in):
        d = np.zeros_like(q_in)
        if self.lay.fv_check_supply:
            d = d + _check_drop(self.fv.check, q_in)
        if self.lay.hold_driving:
            d = d + _check_drop(self.hold.check, q_in)
        return d

    def p_mid_return(self, q_out):
        """Pressure at the holding valve's outlet (flow valve inlet) on a return line that the
        flow valve does not meter."""
        p = self.pt + np.zeros_like(q_out)
        if self.lay.fv_check_return:
            p = p + _check_drop(self.fv.check, q_out)
        return p

    def chambers_from_return(self, q_out, p_m, f_res):
        """Driving and driven pressures from the return side and the force balance."""
        a_d, a_o = self.lay.a_d, self.lay.a_o
        if self.lay.hold_driven and isinstance(self.hold, CounterbalanceValve):
            h = self.hold
            r, g = h.pilot_ratio, h.gradient
            c = h.setting + h.outlet_factor * p_m + g * q_out   # p_o = c - R p_d while metering
            p_d = (f_res + c * a_o) / (a_d + r * a_o)
            p_o = c - r * p_d
            p_o_w = p_m + h.open_gradient * q_out             # pilot alone holds it fully open
            wide = p_o < p_o_w
            p_d_w = (f_res + p_o_w * a_o) / a_d
            return np.where(wide, p_d_w, p_d), np.where(wide, p_o_w, p_o)
        if self.lay.hold_driven:                          # back-pressure valve
            p_o = self.hold.inlet_pressure(q_out, p_m)
        else:
            p_o = p_m
        return (f_res + p_o * a_o) / a_d, p_o

    def mid_from_chambers(self, q_out, p_d, p_o):
        """Holding valve outlet pressure from the chamber pressures (metered return line)."""
        if self.lay.hold_driven and isinstance(self.hold, CounterbalanceValve):
            return self.hold.outlet_pressure(q_out, p_o, p_d)
        if self.lay.hold_driven:
            return p_o - self.hold.setting - self.hold.gradient * q_out
        return p_o

    def fv_forward(self, dp):
        return self.fv.forward_flow(dp, self.rho, self.mu, self.o)

    def q_bleed(self, dp):
        if self.lay.kind != "bleed-off":
            return np.zeros_like(dp)
        return self.fv_forward(dp)


# --------------------------------------------------------------------------- solve
def _broadcast_inputs(axis: Axis, load, temperature):
    try:
        f = np.asarray(load, dtype=float)
    except (TypeError, ValueError):
        raise InputError("load", repr(load), "a force in N or an array of forces") from None
    if not np.all(np.isfinite(f)):
        raise InputError("load", "NaN or infinite", "finite forces in N")
    try:
        t = np.asarray(temperature, dtype=float)
    except (TypeError, ValueError):
        raise InputError("temperature", repr(temperature), "a temperature in K or an array of them") from None
    axis.oil.check_temperature(t, "temperature")
    f, t = np.broadcast_arrays(f, t)
    return np.array(f, dtype=float), np.array(t, dtype=float)


def solve(axis: Axis, load, temperature, direction: str | None = None, opening: float = 1.0) -> Solution:
    """Steady state of ``axis`` moving in ``direction`` (default: its controlled motion).

    Parameters
    ----------
    axis : Axis
    load : float or array
        External force on the rod, N, positive pushing the rod in.
    temperature : float or array
        Oil temperature, K; broadcast against ``load``.
    direction : {"extend", "retract"}, optional
    opening : float
        Flow valve opening factor in [0, 1]; 0 closes it (speed 0 with meter-in and
        meter-out; with bleed-off a closed bleed valve sends all flow to the cylinder).

    Returns
    -------
    Solution
    """
    direction = axis.controlled if direction is None else direction
    if direction not in DIRECTIONS:
        raise InputError("direction", repr(direction), "one of 'extend', 'retract'")
    opening = check_opening(opening)
    if getattr(axis.flow_valve, "closed", False):
        opening = 0.0                 # a shut restrictor (needle on its seat) is a closed valve
    f_ext, temp = _broadcast_inputs(axis, load, temperature)
    shape = f_ext.shape
    rho = np.asarray(axis.oil.density(temp), dtype=float) * np.ones(shape)
    mu = np.asarray(axis.oil.dynamic_viscosity(temp), dtype=float) * np.ones(shape)
    lay = _layout(axis, direction)
    f_res = lay.s * f_ext + axis.friction
    m = _Model(axis, lay, f_res, rho, mu, opening)
    a_d, a_o, qp, pt, pcav = lay.a_d, lay.a_o, m.qp, m.pt, m.pcav
    zeros = np.zeros(shape)
    xtol = 1e-13 * m.v_max
    ftol = 1e-13 * qp
    lo = zeros.copy()
    hi = np.full(shape, m.v_max)
    branch = np.zeros(shape, dtype=np.int8)   # 0 relief open / solved, 1 relief closed at v_max, 2 cavitating (meter-out)

    if lay.kind in ("free", "bleed-off"):
        def state_s(v, fr=f_res):
            q_in, q_out = a_d * v, a_o * v
            p_d, p_o = m.chambers_from_return(q_out, m.p_mid_return(q_out), fr)
            p_pump = np.maximum(p_d, pcav) + m.dp_supply(q_in)
            return p_d, p_o, p_pump

        def resid(v):
            _, _, p_pump = state_s(v)
            return a_d * v + m.q_bleed(p_pump - pt) + m.relief_flow(p_pump) - qp

        v = solve_increasing(resid, lo, hi, xtol, ftol)
    elif lay.kind == "meter-in":
        def resid(v):
            q_in, q_out = a_d * v, a_o * v
            p_d, _ = m.chambers_from_return(q_out, m.p_mid_return(q_out), f_res)
            p_down = np.maximum(p_d, pcav) + m.dp_supply(q_in)
            return q_in - m.fv_forward(m.relief_pressure(qp - q_in) - p_down)

        f_top = resid(hi)
        branch = np.where(f_top <= 0.0, 1, 0).astype(np.int8)
        v = solve_increasing(resid, lo, hi, xtol, ftol)
        v = np.where(branch == 1, m.v_max, v)
    else:  # meter-out
        cavmask = np.zeros(shape, dtype=bool)

        def resid(v, cav=None):
            cav = cavmask if cav is None else cav
            q_in, q_out = a_d * v, a_o * v
            p_d = np.where(cav, pcav, m.relief_pressure(qp - q_in) - m.dp_supply(q_in))
            p_o = (p_d * a_d - f_res) / a_o
            p_m = m.mid_from_chambers(q_out, p_d, p_o)
            return q_out - m.fv_forward(p_m - pt)

        f_top = resid(hi)                                   # relief just closing (p = cracking)
        closed_top = f_top <= 0.0
        # relief closed at v_max: pressures from the return side; cavitating if p_d < limit
        q_out_top = a_o * m.v_max
        with np.errstate(over="ignore", invalid="ignore"):
            p_m_top = pt + axis.flow_valve.pressure_drop(np.full(shape, q_out_top), rho, mu, opening)
        p_m_top = np.where(np.isfinite(p_m_top), p_m_top, pt)
        p_d_top, _ = m.chambers_from_return(np.full(shape, q_out_top), p_m_top, f_res)
        cav_branch = closed_top & (p_d_top < pcav)
        cavmask = cav_branch
        branch = np.where(cav_branch, 2, np.where(closed_top, 1, 0)).astype(np.int8)
        # upper end for the cavitating branch: the valve flow with the driving chamber at the limit
        p_o_c = (pcav * a_d - f_res) / a_o
        p_m_c = m.mid_from_chambers(np.full(shape, q_out_top), np.full(shape, pcav), p_o_c)
        v_hi_c = np.maximum(m.fv_forward(p_m_c - pt) / a_o, m.v_max) * (1 + 1e-9) + 1e-12
        lo = np.where(cav_branch, m.v_max, lo)
        hi = np.where(cav_branch, v_hi_c, hi)
        v = solve_increasing(resid, lo, hi, xtol, ftol)
        v = np.where(branch == 1, m.v_max, v)

    v = np.clip(v, 0.0, None)
    demand = p_d_top if lay.kind == "meter-out" else None
    sol = _assemble(axis, m, lay, direction, opening, f_ext, temp, v, branch, rho, mu, demand)
    still = ~(v > 0.0)
    if np.any(still):
        sol = _standstill_motion(axis, m, lay, sol, still, f_ext)
    return sol


def _fields(sol: Solution) -> dict:
    return {f.name: getattr(sol, f.name) for f in fields(sol)}


def _overlay(sol: Solution, mask, state: Mapping, regime: str) -> Solution:
    """``sol`` with the points of ``mask`` replaced by ``state`` (arrays) and ``regime``."""
    out = _fields(sol)
    for key, val in state.items():
        out[key] = np.where(mask, np.broadcast_to(val, mask.shape), out[key])
    reg = np.array(out["regime"], copy=True)
    reg[mask] = regime
    out["regime"] = reg
    return Solution(**out)


def _standstill_motion(axis: Axis, m: _Model, lay: _Layout, sol: Solution, still, f_ext) -> Solution:
    """Where the solved speed is 0, test whether the piston really stands: the load may drive
    it back over the relief (:func:`_driven_back`), or, with a closed meter-in valve, open the
    holding valve behind the trapped chamber and sink (:func:`_sinking`)."""
    back, st = _driven_back(axis, m, lay, f_ext)
    back = back & still
    if back.any():
        sol = _overlay(sol, back, st, DRIVEN_BACK)
    if lay.kind == "meter-in" and sol.opening == 0.0 and lay.hold_driven:
        sink, st = _sinking(axis, m, lay, f_ext)
        sink = sink & still & ~back
        if sink.any():
            sol = _overlay(sol, sink, st, SINKING)
    return sol


def _chambers(lay: _Layout, p_d, p_o):
    return (p_d, p_o) if lay.driving == "cap" else (p_o, p_d)


def _driven_back(axis: Axis, m: _Model, lay: _Layout, f_ext):
    """The load drives the piston against the commanded direction (back speed u > 0).

    Force balance with friction now opposing the backward motion (so helping the supply)::

        p_d A_d - p_o A_o = s F - F_fr

    The driving chamber's outflow ``Q = A_d u`` joins the pump flow over the relief (and the
    bleed valve, bleed-off): ``relief(p_line) + bleed(p_line) = Q_pump + Q``; on its way it
    crosses, in this order from the line, the flow valve (its reverse check when it meters
    in, its metering part when it is the reverse check of the other motion) and the holding
    valve on that chamber (forward: ``inlet_pressure`` with its pilot on the other chamber).
    The other chamber refills ``A_o u`` from the tank port (``p_t``) through the flow valve
    and the holding valve's check; where that path cannot keep up (a closed valve passes
    nothing) the chamber sits at the cavitation limit, its demand kept in ``p*_demand``, and
    the valves carry only what the path passes at that drop (the rest is void; the cylinder
    flows stay the swept ones).
    Solved for the line pressure by the same bracketing as the motion. Returns
    ``(mask, state)``: where the load drives the axis back, and the state everywhere.
    """
    a_d, a_o, pt, qp = lay.a_d, lay.a_o, m.pt, m.qp
    shape = np.shape(f_ext)
    rho, mu, fv, hold, o = m.rho, m.mu, m.fv, m.hold, m.o
    f_back = lay.s * np.asarray(f_ext, dtype=float) - axis.friction

    def flow_valve_fwd_drop(q):
        with np.errstate(over="ignore", invalid="ignore"):
            return fv.pressure_drop(q, rho, mu, o)

    def refill_drop(q):
        """Drop from the tank port into the refilling chamber at flow ``q``: (total, flow valve part)."""
        z = np.zeros(shape)
        if lay.kind == "meter-out":
            fv_o = _check_drop(fv.check, q)                 # refill back through its check
        elif lay.fv_check_return:
            fv_o = flow_valve_fwd_drop(q)                   # refill forward through its metering part
        else:
            fv_o = z + 0.0 * q
        h_o = _check_drop(hold.check, q) if lay.hold_driven else z
        return fv_o + h_o, fv_o

    def state(p_line):
        q_r = m.relief_flow(p_line)
        q_b = m.q_bleed(p_line - pt)
        big_q = np.maximum(q_r + q_b - qp, 0.0)
        u = big_q / a_d
        q_o = a_o * u
        z = np.zeros(shape)
        p_o_dem = pt - refill_drop(q_o)[0]
        # where the refill path cannot keep up, the chamber sits at the cavitation limit and
        # takes what the path passes at that drop (a closed valve: nothing), voiding the rest
        starved = p_o_dem < m.pcav
        q_fill = q_o
        if starved.any():
            q_max = solve_increasing(lambda q: refill_drop(q)[0] - (pt - m.pcav), np.zeros(shape),
                                     np.where(starved, q_o, 0.0), 1e-13 * qp + 1e-18, 1.0)
            q_max = np.where(np.isfinite(refill_drop(q_max)[0]), q_max, 0.0)   # a closed valve passes nothing
            q_fill = np.where(starved, q_max, q_o)
        fv_o = refill_drop(q_fill)[1]
        p_mid_o = pt - fv_o
        p_o = np.maximum(p_o_dem, m.pcav)
        if lay.kind == "meter-in":
            fv_d = _check_drop(fv.check, big_q)              # back to the line through its check
        elif lay.fv_check_supply:
            fv_d = flow_valve_fwd_drop(big_q)
        else:
            fv_d = z
        p_out_h = p_line + fv_d
        with np.errstate(invalid="ignore"):          # a shut valve on the way: infinite, mapped below
            if lay.hold_driving and isinstance(hold, CounterbalanceValve):
                p_d = hold.inlet_pressure(big_q, p_o, p_out_h)
            elif lay.hold_driving:
                p_d = hold.inlet_pressure(big_q, p_out_h)
            else:
                p_d = p_out_h
        return dict(u=u, q=big_q, q_o=q_o, q_fill=q_fill, q_r=q_r, q_b=q_b, fv_o=fv_o, fv_d=fv_d, p_mid_o=p_mid_o,
                    p_o=p_o, p_o_dem=p_o_dem, p_out_h=p_out_h, p_d=p_d)

    def resid(p_line):
        st = state(p_line)
        with np.errstate(invalid="ignore"):
            r = st["p_d"] * a_d - st["p_o"] * a_o - f_back
        return np.where(np.isnan(r), np.inf, r)

    # line pressure with no flow back: pump flow alone over relief (and bleed valve)
    p_full = np.full(shape, m.relief_pressure(qp))
    p0 = solve_increasing(lambda p: m.relief_flow(p) + m.q_bleed(p - pt) - qp, np.zeros(shape), p_full,
                          1e-9, 1e-13 * qp)
    # just above p0 (a trickle backwards): a refill path that is shut voids at once, so test there
    r0 = resid(p0 + 1.0)
    p_hi = np.maximum(p0, (f_back + pt * a_o) / a_d) + 1e5
    r_hi = resid(p_hi)
    mask = (r0 < -1e-9 * (np.abs(f_back) + p0 * a_d + 1.0)) & np.isfinite(r_hi)
    if not mask.any():
        return mask, {}
    p_line = solve_increasing(resid, p0, np.where(mask, p_hi, p0), 1e-15 * (np.abs(p_hi) + 1.0),
                              1e-12 * (np.abs(f_back) + 1.0))
    st = state(p_line)
    u, big_q, q_o, q_fill = st["u"], st["q"], st["q_o"], st["q_fill"]
    p_d, p_o = st["p_d"], st["p_o"]
    v = -u
    if lay.kind == "meter-in":
        q_fv, dp_fv = -big_q, -st["fv_d"]
    elif lay.fv_check_supply:
        q_fv, dp_fv = big_q, st["fv_d"]
    elif lay.kind == "meter-out":
        q_fv, dp_fv = -q_fill, -st["fv_o"]
    elif lay.fv_check_return:
        q_fv, dp_fv = q_fill, st["fv_o"]
    elif lay.kind == "bleed-off":
        q_fv, dp_fv = st["q_b"], p_line - pt
    else:
        q_fv, dp_fv = np.zeros(shape), np.zeros(shape)
    if lay.hold_driving:
        q_h, dp_h, p_mid = big_q, p_d - st["p_out_h"], st["p_out_h"]
    elif lay.hold_driven:
        q_h, dp_h, p_mid = -q_fill, -_check_drop(hold.check, q_fill), st["p_mid_o"]
    else:
        q_h, dp_h, p_mid = np.zeros(shape), np.zeros(shape), st["p_mid_o"]
    p_pilot = p_o if (lay.hold_driving and isinstance(hold, CounterbalanceValve)) else np.zeros(shape)
    p1, p3 = _chambers(lay, p_d, p_o)
    p1_dem, p3_dem = _chambers(lay, p_d, st["p_o_dem"])
    fr = -axis.friction + np.zeros(shape)
    useful = lay.s * np.asarray(f_ext, dtype=float) * v
    q_relief = st["q_r"]
    out = dict(speed=v, p1=p1, p3=p3, p_pump=p_line, p_mid=np.maximum(p_mid, m.pcav), p_pilot=p_pilot,
               q_relief=q_relief, q_bleed=st["q_b"], q_cylinder_in=-big_q, q_cylinder_out=-q_o,
               q_void=np.zeros(shape), q_flow_valve=q_fv, dp_flow_valve=dp_fv, q_holding=q_h, dp_holding=dp_h,
               friction_force=fr, unbalanced_force=np.zeros(shape), p1_demand=p1_dem, p3_demand=p3_dem,
               useful_power=useful, friction_power=fr * v, input_power=p_line * qp,
               loss_flow_valve=np.abs(dp_fv * q_fv), loss_holding=np.abs(dp_h * q_h),
               loss_relief=(p_line - pt) * q_relief, loss_return_line=pt * (q_relief + st["q_b"] - q_fill),
               efficiency=np.zeros(shape))
    return mask, out


def _sinking(axis: Axis, m: _Model, lay: _Layout, f_ext):
    """A closed meter-in valve shuts the driving chamber; the holding chamber is trapped by
    its holding valve. Where the load pressure is above the valve's opening pressure the
    valve opens and the load sinks in the commanded (lowering) direction, the driving
    chamber voiding at the cavitation limit::

        p_o = (p_cav A_d - (s F + F_fr)) / A_o          force balance, moving
        Q   = holding valve flow at (p_o, pilot p_cav, outlet p_t),  v = Q / A_o

    Returns ``(mask, state)``.
    """
    a_d, a_o, pt, qp, pcav = lay.a_d, lay.a_o, m.pt, m.qp, m.pcav
    shape = np.shape(f_ext)
    hold = m.hold
    f_res = lay.s * np.asarray(f_ext, dtype=float) + axis.friction
    p_o = (pcav * a_d - f_res) / a_o
    p_out = m.p_mid_return(np.zeros(shape))
    if isinstance(hold, CounterbalanceValve):
        q = np.maximum(hold.flow(p_o, pcav, p_out), 0.0)
    else:
        q = np.maximum(hold.flow(p_o, p_out), 0.0)
    mask = q > 1e-12 * qp
    v = q / a_o
    p_d = np.full(shape, pcav)
    p_pump = np.full(shape, m.relief_pressure(qp))
    p1, p3 = _chambers(lay, p_d, p_o)
    useful = lay.s * np.asarray(f_ext, dtype=float) * v
    dp_h = p_o - p_out
    out = dict(speed=v, p1=p1, p3=p3, p_pump=p_pump, p_mid=p_out,
               p_pilot=p_d if isinstance(hold, CounterbalanceValve) else np.zeros(shape),
               q_relief=np.full(shape, qp), q_bleed=np.zeros(shape), q_cylinder_in=np.zeros(shape),
               q_cylinder_out=q, q_void=a_d * v, q_flow_valve=np.zeros(shape), dp_flow_valve=p_pump - p_d,
               q_holding=q, dp_holding=dp_h, friction_force=np.full(shape, axis.friction),
               unbalanced_force=np.zeros(shape), p1_demand=p1, p3_demand=p3, useful_power=useful,
               friction_power=axis.friction * v, input_power=p_pump * qp, loss_flow_valve=np.zeros(shape),
               loss_holding=dp_h * q, loss_relief=(p_pump - pt) * qp, loss_return_line=pt * (q + qp),
               efficiency=np.zeros(shape))
    return mask, out


def _assemble(axis, m: _Model, lay: _Layout, direction, opening, f_ext, temp, v, branch, rho, mu,
              demand=None) -> Solution:
    a_d, a_o, qp, pt, pcav = lay.a_d, lay.a_o, m.qp, m.pt, m.pcav
    shape = v.shape
    moving = v > 0.0
    fr_used = np.where(moving, axis.friction, 0.0)
    f_res = lay.s * f_ext + fr_used
    q_in_swept, q_out = a_d * v, a_o * v
    fv = axis.flow_valve
    q_bleed = np.zeros(shape)
    q_void = np.zeros(shape)
    p_mid = np.zeros(shape)

    if lay.kind in ("free", "bleed-off"):
        p_m = m.p_mid_return(q_out)
        p_d, p_o = m.chambers_from_return(q_out, p_m, f_res)
        p_pump = np.maximum(p_d, pcav) + m.dp_supply(q_in_swept)
        # standstill: the pump line sits where bleed and relief take the whole pump flow
        if np.any(~moving):
            def rp(p):
                return m.q_bleed(p - pt) + m.relief_flow(p) - qp
            p_stall = solve_increasing(rp, np.zeros(shape), np.full(shape, m.relief_pressure(qp)),
                                       1e-9, 1e-13 * qp)
            p_pump = np.where(moving, p_pump, p_stall)
            p_d, p_o = _standstill(m, lay, moving, p_stall, p_d, p_o, p_m, f_res, True, False)
        q_bleed = m.q_bleed(p_pump - pt)
        q_in = q_in_swept
        q_relief = np.maximum(qp - q_in - q_bleed, 0.0)
        p_mid = p_m
    elif lay.kind == "meter-in":
        p_m = m.p_mid_return(q_out)
        p_d, p_o = m.chambers_from_return(q_out, p_m, f_res)
        p_down = np.maximum(p_d, pcav) + m.dp_supply(q_in_swept)
        p_pump = m.relief_pressure(qp - q_in_swept)
        with np.errstate(over="ignore", invalid="ignore"):
            dp_rc = fv.pressure_drop(q_in_swept, rho, mu, opening)
        p_pump = np.where(branch == 1, p_down + np.where(np.isfinite(dp_rc), dp_rc, 0.0), p_pump)
        if np.any(~moving):
            p_full = np.full(shape, m.relief_pressure(qp))
            p_pump = np.where(moving, p_pump, p_full)
            p_d, p_o = _standstill(m, lay, moving, p_full, p_d, p_o, p_m, f_res, opening > 0.0, False)
        q_in = q_in_swept
        q_relief = np.maximum(qp - q_in, 0.0)
        p_mid = p_m
    else:  # meter-out
        p_d = np.where(branch == 2, pcav, m.relief_pressure(qp - q_in_swept) - m.dp_supply(q_in_swept))
        p_o = (p_d * a_d - f_res) / a_o
        p_m = m.mid_from_chambers(q_out, p_d, p_o)
        if np.any(branch == 1):
            with np.errstate(over="ignore", invalid="ignore"):
                dp_rc = fv.pressure_drop(q_out, rho, mu, opening)
            p_m_rc = pt + np.where(np.isfinite(dp_rc), dp_rc, 0.0)
            p_d_rc, p_o_rc = m.chambers_from_return(q_out, p_m_rc, f_res)
            sel = branch == 1
            p_d, p_o, p_m = np.where(sel, p_d_rc, p_d), np.where(sel, p_o_rc, p_o), np.where(sel, p_m_rc, p_m)
        if np.any(~moving):
            p_full = np.full(shape, m.relief_pressure(qp))
            refill = pt - (_check_drop(fv.check, np.zeros(shape)) if fv.check is not None else 0.0)
            p_d, p_o = _standstill(m, lay, moving, p_full, p_d, p_o, refill, f_res, True, opening == 0.0)
            p_m = np.where(moving, p_m, m.mid_from_chambers(q_out, p_d, p_o) if lay.hold_driven else p_o)
        # cavitating: the pump fills the voiding chamber through the supply-path checks; where
        # their drop at the whole pump flow would lift the pump above the relief, the relief
        # opens and takes the rest (the pump never exceeds what its relief allows)
        q_fill = _fill_flow(m, shape) if np.any(branch == 2) else np.full(shape, qp)
        p_pump = np.where(branch == 2, np.minimum(pcav + m.dp_supply(q_fill), m.relief_pressure(qp - q_fill)),
                          p_d + m.dp_supply(q_in_swept))
        p_pump = np.where(moving, p_pump, m.relief_pressure(qp))
        q_in = np.where(branch == 2, q_fill, q_in_swept)
        q_void = np.where(branch == 2, np.maximum(q_in_swept - q_fill, 0.0), 0.0)
        q_relief = np.maximum(qp - q_in, 0.0)
        p_mid = p_m

    # demanded pressures before clamping, then the clamp
    p_d_dem, p_o_dem = p_d, p_o
    if demand is not None:      # meter-out outrunning the pump: what the pump side would have needed
        p_d_dem = np.where(branch == 2, np.minimum(demand, pcav), p_d_dem)
    p_d = np.maximum(p_d, pcav)
    p_o = np.maximum(p_o, pcav)
    p_pump = np.maximum(p_pump, pcav)
    p_mid = np.maximum(p_mid, pcav)
    unbalanced = f_res - (p_d * a_d - p_o * a_o)
    unbalanced = np.where(np.abs(unbalanced) <= 1e-9 * (np.abs(f_res) + np.abs(p_d * a_d) + 1.0), 0.0, unbalanced)

    # valve flows and drops (valve sign: forward positive)
    if lay.kind == "meter-in":
        q_fv, dp_fv = q_in, p_pump - p_d - m.dp_supply(q_in)
    elif lay.kind == "meter-out":
        q_fv, dp_fv = q_out, p_mid - pt
    elif lay.kind == "bleed-off":
        q_fv, dp_fv = q_bleed, p_pump - pt
    elif lay.fv_check_supply:
        q_fv, dp_fv = -q_in, -_check_drop(fv.check, q_in) * moving
    elif lay.fv_check_return:
        q_fv, dp_fv = -q_out, -(p_mid - pt) * moving
    else:
        q_fv, dp_fv = np.zeros(shape), np.zeros(shape)
    if lay.hold_driven:
        q_h, dp_h = q_out, p_o - p_mid
    elif lay.hold_driving:
        q_h, dp_h = -q_in, -_check_drop(axis.holding.check, q_in) * moving
    else:
        q_h, dp_h = np.zeros(shape), np.zeros(shape)
    p_pilot = p_d if (lay.hold_driven and isinstance(axis.holding, CounterbalanceValve)) else np.zeros(shape)

    p1, p3 = (p_d, p_o) if lay.driving == "cap" else (p_o, p_d)
    p1_dem, p3_dem = (p_d_dem, p_o_dem) if lay.driving == "cap" else (p_o_dem, p_d_dem)

    useful = lay.s * f_ext * v
    fric_p = fr_used * v
    input_p = p_pump * qp
    loss_fv = np.abs(dp_fv * q_fv)
    loss_h = np.abs(dp_h * q_h)
    loss_r = (p_pump - pt) * q_relief            # the relief drains to the tank port at p_t
    loss_ret = pt * (q_out + q_bleed + q_relief)
    with np.errstate(divide="ignore", invalid="ignore"):
        eff = np.where(input_p > 0.0, np.maximum(useful, 0.0) / np.where(input_p > 0.0, input_p, 1.0), 0.0)

    regime = _regimes(axis, m, lay, opening, v, branch, p_d_dem, p_o_dem, q_relief, dp_fv, p_o, p_mid)
    return Solution(direction=direction, arrangement=axis.arrangement, controlled=lay.controlled, opening=opening,
                    load=f_ext, temperature=temp, speed=v, p1=p1, p3=p3, p_pump=p_pump, p_mid=p_mid,
                    p_pilot=p_pilot, q_pump=np.full(shape, qp), q_relief=q_relief, q_bleed=q_bleed,
                    q_cylinder_in=q_in, q_cylinder_out=q_out, q_void=q_void, q_flow_valve=q_fv,
                    dp_flow_valve=dp_fv, q_holding=q_h, dp_holding=dp_h, friction_force=fr_used,
                    unbalanced_force=unbalanced, p1_demand=p1_dem, p3_demand=p3_dem, useful_power=useful,
                    friction_power=fric_p, input_power=input_p, loss_flow_valve=loss_fv, loss_holding=loss_h,
                    loss_relief=loss_r, loss_return_line=loss_ret, efficiency=eff, regime=regime)


def _fill_flow(m: _Model, shape):
    """Flow, m³/s, the pump sends into a driving chamber held at the cavitation limit: all of
    it while ``p_cav + dp_supply(Q_pump)`` stays at or below the relief's cracking pressure,
    otherwise the root of ``p_cav + dp_supply(q) = relief_pressure(Q_pump - q)``."""
    qp = m.qp
    full = np.full(shape, qp)

    def g(q):
        return m.pcav + m.dp_supply(q) - m.relief_pressure(qp - q)

    q = solve_increasing(g, np.zeros(shape), full, 1e-13 * qp, 1e-9)
    return np.where(g(full) <= 0.0, full, q)


def _standstill(m: _Model, lay: _Layout, moving, p_source, p_d, p_o, p_ret, f_res, driving_open: bool,
                valve_trapped: bool):
    """Chamber pressures where the piston stands still (friction zero, see module text).

    The driving chamber sees the pump line (less its checks' cracking) when its line is
    open; the driven chamber is trapped (force balance: the load or intensification) when
    the holding valve or a closed meter-out valve shuts it in, otherwise it sits at its
    return or refill pressure ``p_ret`` and the load may be unbalanced (stalled).
    """
    a_d, a_o = lay.a_d, lay.a_o
    z = np.zeros_like(p_source)
    trapped_o = lay.hold_driven or valve_trapped
    if driving_open:
        pd_s = p_source - m.dp_supply(z)
        if trapped_o:
            po_s = (pd_s * a_d - f_res) / a_o
        else:
            po_s = np.maximum((pd_s * a_d - f_res) / a_o, p_ret) if lay.kind == "meter-out" else p_ret + z
    else:
        po_s = p_ret + z
        pd_s = (f_res + po_s * a_o) / a_d
        if lay.hold_driven:
            pd_s = np.maximum(pd_s, 0.0)
            po_s = (pd_s * a_d - f_res) / a_o
    return np.where(moving, p_d, pd_s), np.where(moving, p_o, po_s)


def _regimes(axis, m, lay, opening, v, branch, p_d_dem, p_o_dem, q_relief, dp_fv, p_o, p_mid):
    shape = v.shape
    pcav = m.pcav
    moving = v > 0.0
    tol_q = 1e-9 * m.qp
    relief_open = q_relief > tol_q
    out = np.full(shape, PUMP_LIMITED, dtype="<U20")
    out[relief_open] = RELIEF
    if lay.kind in ("meter-in", "meter-out"):
        out[relief_open] = METERING
    metered = lay.kind in ("meter-in", "meter-out") or (lay.kind == "bleed-off" and opening > 0.0)
    if lay.kind == "bleed-off" and opening > 0.0:
        out[~relief_open] = METERING
    if metered and getattr(axis.flow_valve, "compensated", False):
        starved = axis.flow_valve.starved(dp_fv) & moving & (relief_open | (lay.kind == "bleed-off"))
        out[starved] = STARVED
    cav = (p_d_dem < pcav) | (p_o_dem < pcav)
    out[cav & moving] = CAVITATING
    out[moving & (p_d_dem < pcav) & (branch != 2)] = RUNAWAY
    out[moving & (branch == 2)] = CAVITATING
    if lay.hold_driven and isinstance(axis.holding, CounterbalanceValve):
        closed_hold = p_o < axis.holding.opening_pressure(np.maximum(p_d_dem, pcav), p_mid)
    elif lay.hold_driven:
        closed_hold = (p_o - p_mid) < axis.holding.setting
    else:
        closed_hold = np.zeros(shape, dtype=bool)
    still = ~moving
    out[still] = STALLED
    out[still & closed_hold] = HELD
    out[still & (p_d_dem < pcav) & ~(still & closed_hold)] = CAVITATING if lay.kind == "meter-out" else STALLED
    if opening == 0.0 and lay.kind in ("meter-in", "meter-out"):
        out[still] = CLOSED
    return out


# --------------------------------------------------------------------------- building
def _counterbalance_from_values(hold: Mapping, pilot_ratio: float) -> CounterbalanceValve:
    """The counterbalance of the ``holding`` section (spring chamber and fully-open drop
    with their defaults)."""
    return CounterbalanceValve(hold["setting"], pilot_ratio, hold["gradient"], _holding_check(hold),
                               spring_chamber=("outlet-referenced" if hold.get("spring_chamber") in (None, "cautious")
                                               else hold["spring_chamber"]),
                               open_gradient=hold.get("open_gradient") or CB_OPEN_GRADIENT_DEFAULT)


def chamber_modulus(axis: Axis, side: str, pressure, position):
    """Effective bulk modulus, Pa, of the ``side`` oil column (chamber and its line) at gauge
    ``pressure`` (Pa) with the piston at ``position`` (m from the cap end), from the oil's
    own modulus, the line's compliance over its share of the column and the entrained air
    (:func:`workbook.fluid.effective_bulk_modulus`)."""
    c, r = axis.cylinder, axis.ratings
    x = np.clip(np.asarray(position, dtype=float), 0.0, c.stroke)
    v_chamber = c.a1 * x if side == "cap" else c.a3 * (c.stroke - x)
    v_line = r.line_volume(side)
    share = v_line / np.maximum(v_chamber + v_line, 1e-12)
    return effective_bulk_modulus(axis.oil.bulk_modulus, np.maximum(pressure, 0.0), axis.air_content, share,
                                  r.line_modulus(side))


def natural_frequency(axis: Axis, p_cap, p_rod, n: int = 97) -> float:
    """Lowest hydraulic natural frequency over the stroke, rad/s, with the chambers at
    ``p_cap`` and ``p_rod`` (Pa gauge, scalars): ``w0² = (E1' A1²/V1 + E3' A3²/V3)/m``
    (Merritt 1967) with each column's effective modulus (:func:`chamber_modulus`) and the
    lines between valves and cylinder as dead volumes. Requires ``axis.mass > 0``."""
    c = axis.cylinder
    x = np.linspace(0.0, 1.0, n) * c.stroke
    e1 = chamber_modulus(axis, "cap", p_cap, x)
    e3 = chamber_modulus(axis, "rod", p_rod, x)
    w = c.natural_frequency(e1, axis.mass, x, axis.ratings.line_volume("cap"), axis.ratings.line_volume("rod"), e3)
    return float(np.min(w))


def _holding_check(hold: Mapping) -> CheckValve:
    """The holding valve's free-flow check from the ``holding`` section."""
    return CheckValve(hold.get("check_cracking", _BAR), hold.get("check_gradient") or CHECK_GRADIENT_DEFAULT)


def _flow_valve_from_values(fv: Mapping, oil: Oil):
    from .restrictor import LongThrottle, NeedleThrottle, SharpOrifice
    kind = fv.get("kind", "compensated")
    check = CheckValve(fv.get("check_cracking", 0.5 * _BAR), fv.get("check_gradient") or CHECK_GRADIENT_DEFAULT)
    cd = fv.get("cd", 0.61)
    if kind == "orifice":
        return RestrictorValve(SharpOrifice(fv["diameter"], cd=cd), check, kind="orifice")
    if kind == "throttle":
        return RestrictorValve(LongThrottle(fv["diameter"], fv["length"]), check, kind="throttle")
    if kind == "needle":
        # the catalogue's "turns" is an angle, stored in SI (rad)
        return RestrictorValve(NeedleThrottle.from_angle(fv["seat_diameter"], fv["half_angle"], fv["turns"],
                                                         fv["pitch"], cd=cd), check, kind="needle")
    if kind == "compensated":
        rho40 = float(oil.density(313.15))
        return CompensatedFlowValve.from_setting(fv["setting"], rho40, cd=cd,
                                                 compensator_drop=fv.get("compensator_drop", 6 * _BAR),
                                                 min_drop=fv.get("min_drop", 8 * _BAR), droop=fv.get("droop", 0.02),
                                                 check=check)
    raise InputError("flow_valve.kind", repr(kind), "one of 'orifice', 'throttle', 'needle', 'compensated'")



def design_loads(operation: Mapping, direction: str | None = None) -> np.ndarray:
    """The load cases of the ``operation`` section with the moving mass's weight along the rod.

    ``F_i = F_case,i + m g sin(inclination)`` (N): an inclination above horizontal with the
    rod end up makes the weight push the rod in (positive, the workbook's sign); 0 leaves the
    load cases as given.

    ``direction`` ("extend" or "retract") gives the cases of that motion: ``loads`` (both
    motions) followed by ``loads_extend`` or ``loads_retract``; without it, every case of
    either motion. Where no list holds a case the motion runs with no external force (the
    weight alone).

    >>> design_loads({"loads": [1000.0], "mass": 100.0, "inclination": math.pi / 2}).round(3).tolist()
    [1980.665]
    >>> op = {"loads": [], "loads_extend": [120e3], "mass": 1500.0, "inclination": -math.pi / 2}
    >>> design_loads(op, "extend").round(1).tolist(), design_loads(op, "retract").round(1).tolist()
    ([105290.0], [-14710.0])
    """
    if direction is not None and direction not in DIRECTIONS:
        raise InputError("direction", repr(direction), "one of 'extend', 'retract'")
    parts = [operation.get("loads") or []]
    for d in DIRECTIONS:
        if direction in (None, d):
            parts.append(operation.get(f"loads_{d}") or [])
    loads = np.asarray([float(x) for part in parts for x in part] or [0.0], dtype=float)
    angle = float(operation.get("inclination") or 0.0)
    mass = float(operation.get("mass") or 0.0)
    return loads + mass * G_STANDARD * math.sin(angle)


#: bare field names raised by the physics -> the design field they come from
_QUALIFIED = {
    "rod": "cylinder.rod", "bore": "cylinder.bore", "stroke": "cylinder.stroke",
    "rated_pressure": "cylinder.rated_pressure", "mounting": "cylinder.mounting",
    "buckling_length": "cylinder.buckling_length", "rod_yield": "cylinder.rod_yield",
    "relief_full_flow": "supply.relief_full_flow", "relief_cracking": "supply.relief_cracking",
    "volumetric_efficiency": "supply.volumetric_efficiency", "pump_flow": "supply.pump_flow",
    "min_drop": "flow_valve.min_drop", "compensator_drop": "flow_valve.compensator_drop",
    "droop": "flow_valve.droop", "cd": "flow_valve.cd", "diameter": "flow_valve.diameter",
    "length": "flow_valve.length", "seat_diameter": "flow_valve.seat_diameter",
    "half_angle": "flow_valve.half_angle", "pitch": "flow_valve.pitch", "arrangement": "flow_valve.arrangement",
    "direction": "flow_valve.direction",
    "pilot_ratio": "holding.pilot_ratio", "gradient": "holding.gradient", "side": "holding.side",
    "spring_chamber": "holding.spring_chamber", "open_gradient": "holding.open_gradient",
    "overall_efficiency": "supply.overall_efficiency",
    "friction": "operation.friction", "tank_pressure": "operation.tank_pressure", "loads": "operation.loads",
    "loads_extend": "operation.loads_extend", "loads_retract": "operation.loads_retract",
    "work_force": "operation.work_force", "work_motion": "operation.work_motion",
    "temp_min": "operation.temp_min", "temp_max": "operation.temp_max",
    "cavitation_abs": "limits.cavitation_abs",
}


def axis_from_values(values: Mapping[str, Mapping]) -> Axis:
    """An :class:`Axis` from parsed sections; every refusal names its design field
    (``section.key``), see :func:`_axis_from_values`."""
    try:
        return _axis_from_values(values)
    except InputError as exc:
        if "." in exc.field or exc.field not in _QUALIFIED:
            raise
        raise exc.qualified(_QUALIFIED[exc.field]) from None


def _axis_from_values(values: Mapping[str, Mapping]) -> Axis:
    """An :class:`Axis` from parsed sections (``{section_key: dict}``, SI values as
    produced by ``workbook.inputs.<SECTION>.parse``): cylinder, oil, supply, flow_valve,
    holding, operation, ratings (and optionally limits for ``cavitation_abs``).

    Cross-field rules (each an :class:`~workbook.errors.InputError` naming the field):
    rod smaller than bore; relief full-flow above cracking; a compensated setting at most
    the pump flow; a minimum working drop at least the compensator drop; a pilot ratio
    above zero; temperatures in the oil's validity, cold not above warm. A counterbalance
    set below the load-holding pressure is reported by :func:`workbook.checks.evaluate`
    (rule ``H-HOLDS``) rather than refused, so the study can show what happens.

    The compensated setting is taken at the oil density at 40 °C (the ISO 3448 reference).
    """
    need = ("cylinder", "oil", "supply", "flow_valve", "holding", "operation")
    for key in need:
        if key not in values:
            raise InputError(key, "nothing (the section is missing)", "the parsed section " + key)
    cy, oil_v, sup, fv, hold, op = (values[k] for k in need)
    if cy["rod"] >= cy["bore"]:
        raise InputError("rod", f"{cy['rod'] * 1e3:g} mm",
                         f"a rod diameter smaller than the bore ({cy['bore'] * 1e3:g} mm)")
    cylinder = Cylinder.from_values(cy)
    oil = Oil.from_values(oil_v)
    supply = Supply.from_values(sup)
    if fv.get("kind") == "needle" and not fv.get("turns", 1.0) > 0:
        raise InputError("flow_valve.turns", "0 turn",
                         "an opening above 0 turns (the valve-closed case is checked for every design anyway)")
    valve = _flow_valve_from_values(fv, oil)
    if isinstance(valve, CompensatedFlowValve):
        # the setting is reachable only if the pump can fill the driving chamber at the speed it sets:
        # meter-in and bleed-off pass pump oil; meter-out passes the driven chamber's oil, so the
        # pump limit scales by the area ratio A_driven / A_driving (common practice)
        ext = fv["direction"] == "extend"
        a_drive, a_driven = (cylinder.a1, cylinder.a3) if ext else (cylinder.a3, cylinder.a1)
        limit = supply.flow * (a_driven / a_drive if fv["arrangement"] == "meter-out" else 1.0)
        if fv["setting"] > limit * (1 + 1e-12):
            raise InputError("flow_valve.setting", f"{fv['setting'] / _LPM:g} L/min",
                             f"a flow at most {limit / _LPM:.4g} L/min, what the pump "
                             f"({supply.flow / _LPM:.4g} L/min) can drive through the valve "
                             f"({fv['arrangement']}, {fv['direction']})")
    kind = hold.get("kind", "none")
    holding = None
    if kind == "counterbalance":
        r = hold.get("pilot_ratio")
        if r is None or not r > 0:
            raise InputError("pilot_ratio", r, "a pilot ratio greater than 0 (for example 3 for 3:1)")
        holding = _counterbalance_from_values(hold, r)
    elif kind == "back-pressure":
        holding = BackPressureValve(hold["setting"], hold["gradient"], _holding_check(hold))
    elif kind != "none":
        raise InputError("holding.kind", repr(kind), "one of 'none', 'counterbalance', 'back-pressure'")
    if holding is not None and hold["setting"] >= supply.relief.full_flow and kind == "back-pressure":
        raise InputError("holding.setting", f"{hold['setting'] / _BAR:g} bar",
                         f"a back-pressure setting below the relief full-flow pressure "
                         f"({supply.relief.full_flow / _BAR:g} bar)")
    ratings = Ratings.from_values(values["ratings"]) if "ratings" in values else Ratings()
    cav = values.get("limits", {}).get("cavitation_abs", CAVITATION_ABS_DEFAULT)
    axis = Axis(cylinder=cylinder, oil=oil, supply=supply, flow_valve=valve, arrangement=fv["arrangement"],
                controlled=fv["direction"], holding=holding, holding_side=hold.get("side", "cap"),
                friction=op["friction"], tank_pressure=op["tank_pressure"], loads=tuple(design_loads(op)),
                loads_extend=tuple(design_loads(op, "extend")), loads_retract=tuple(design_loads(op, "retract")),
                work_force=op.get("work_force"), work_motion=op.get("work_motion") or "extend",
                temp_min=op["temp_min"], temp_max=op["temp_max"], target_speed=op.get("target_speed"),
                speed_tolerance=op.get("speed_tolerance", 0.15), mass=op.get("mass", 0.0), ratings=ratings,
                cavitation_abs=cav, air_content=oil_v.get("air_content") or 0.0)
    if isinstance(holding, CounterbalanceValve) and (hold.get("spring_chamber") or "cautious") == "cautious":
        axis = replace(axis, holding=cautious_counterbalance(axis))
    return axis


def cautious_counterbalance(axis: Axis) -> CounterbalanceValve:
    """Of the two spring-chamber types, the one that gives this design the higher pressures
    while lowering (cap, rod, pump line or the valve's outlet; load cases, cold oil, flow
    valve open): the more cautious for the ratings when the data sheet does not say.

    Where nothing meters downstream of the valve the two differ by about (1 + R) times the
    tank back pressure and the outlet-referenced one is taken; with a metering valve downstream
    the difference can be large either way (force balance on the poppet, see
    :class:`~workbook.valve.CounterbalanceValve`)."""
    lower = "retract" if axis.holding_side == "cap" else "extend"
    loads = np.asarray(axis.loads_for(lower), dtype=float)
    peaks = {}
    for chamber in ("outlet-referenced", "vented"):
        cb = replace(axis.holding, spring_chamber=chamber)
        s = solve(replace(axis, holding=cb), loads, axis.temp_min, lower)
        peaks[chamber] = (float(np.max(np.maximum(np.maximum(s.p1, s.p3), np.maximum(s.p_pump, s.p_mid)))), cb)
    out, ven = peaks["outlet-referenced"], peaks["vented"]
    return ven[1] if ven[0] > out[0] * (1 + 1e-9) else out[1]


def stall(axis: Axis, direction: str, temperature) -> Solution:
    """The axis against its end stop, or the work, at the end of ``direction``.

    Nothing moves and nothing flows to the cylinder, so the whole pump flow crosses the
    relief (and, bleed-off, the bleed valve): the line pressure ``p`` solves
    ``Q_relief(p) + Q_bleed(p - p_t) = Q_pump``, and with no flow there is no drop across
    the flow valve or a check, so the driving chamber sits at ``p``. The other chamber is
    at the return path's zero-flow pressure: the tank back pressure ``p_t``; behind a
    back-pressure valve its setting ``p_t + p_s`` (the pressure it traps when the piston
    stops, an upper bound); behind a counterbalance piloted by the driving chamber
    ``max(p_t, p_s + k p_t - R p)`` (fully opened by the pilot at the usual settings). Any
    cylinder can reach its stop, so every rating applies to this state; a press or clamp
    lives in it (the work force is the stop's reaction).

    ``temperature`` (K, scalar or array) sets the pump's delivered flow and the bleed valve's
    law. Returns a :class:`Solution` with regime ``stalled`` and speed 0 everywhere; ``load``
    holds the force the piston then exerts on the stop, ``p_d A_d - p_o A_o`` (N, positive
    pushing away from the driving chamber, friction not counted: at rest it takes no side).

    Worked example (by hand, no bleed): relief cracking 160 bar, full flow 172 bar at the
    pump's 21.6 L/min, draining into a 2 bar return line (its settings are over its outlet):
    it passes the whole pump flow at 172 + 2 = 174 bar, so the cap chamber is at 174 bar when
    the rod extends onto its stop; on an 80/45 cylinder it pushes
    ``174e5 x 50.27e-4 - 2e5 x 34.36e-4 = 86.8 kN``.

    >>> from workbook.cylinder import Cylinder
    >>> from workbook.fluid import Oil
    >>> from workbook.supply import Supply, Pump, ReliefValve
    >>> from workbook.valve import CompensatedFlowValve
    >>> oil = Oil.from_grade("VG46")
    >>> ax = Axis(Cylinder(0.080, 0.045, 0.6, 210e5), oil,
    ...           Supply(Pump(21.6 / 60000), ReliefValve(160e5, 172e5, 21.6 / 60000)),
    ...           CompensatedFlowValve.from_setting(12 / 60000, float(oil.density(313.15))),
    ...           arrangement="meter-in", controlled="extend", tank_pressure=2e5)
    >>> st = stall(ax, "extend", 313.15)
    >>> round(float(st.p1) / 1e5, 2), round(float(st.p3) / 1e5, 2), str(st.regime), round(float(st.load) / 1e3, 1)
    (174.0, 2.0, 'stalled', 86.8)
    """
    if direction not in DIRECTIONS:
        raise InputError("direction", repr(direction), "one of 'extend', 'retract'")
    temp = np.asarray(temperature, dtype=float)
    shape = temp.shape
    base = solve(axis, np.zeros(shape), temp, direction)
    lay = _layout(axis, direction)
    rho = np.asarray(axis.oil.density(temp), dtype=float) * np.ones(shape)
    mu = np.asarray(axis.oil.dynamic_viscosity(temp), dtype=float) * np.ones(shape)
    m = _Model(axis, lay, np.zeros(shape), rho, mu, 1.0)
    pt, qp = m.pt, m.qp

    def resid(p):
        return m.relief_flow(p) + m.q_bleed(p - pt) - qp

    hi = np.full(shape, max(2.0 * axis.supply.relief.full_flow, axis.supply.relief.full_flow + 10 * _BAR))
    p_line = solve_increasing(resid, np.full(shape, pt), hi, 1e-9 * hi, 1e-13 * qp)
    p_d = p_line
    hold = axis.holding
    if lay.hold_driven and isinstance(hold, CounterbalanceValve):
        p_o = np.maximum(pt, hold.setting + hold.outlet_factor * pt - hold.pilot_ratio * p_d)
    elif lay.hold_driven:
        p_o = np.full(shape, pt + hold.setting)
    else:
        p_o = np.full(shape, pt)
    p1, p3 = _chambers(lay, p_d, p_o)
    q_relief = m.relief_flow(p_line)
    q_bleed = m.q_bleed(p_line - pt)
    z = np.zeros(shape)
    state = dict(load=lay.s * (p_d * lay.a_d - p_o * lay.a_o), speed=z, p1=p1, p3=p3, p_pump=p_line, p_mid=p_line,
                 p_pilot=p_d if isinstance(hold, CounterbalanceValve) else z, q_relief=q_relief, q_bleed=q_bleed,
                 q_cylinder_in=z, q_cylinder_out=z, q_void=z, q_flow_valve=z, dp_flow_valve=z, q_holding=z,
                 dp_holding=z, friction_force=z, unbalanced_force=z, p1_demand=p1, p3_demand=p3, useful_power=z,
                 friction_power=z, input_power=p_line * qp, loss_flow_valve=z, loss_holding=z,
                 loss_relief=(p_line - pt) * q_relief, loss_return_line=pt * (q_relief + q_bleed), efficiency=z)
    return _overlay(base, np.ones(shape, dtype=bool), state, STALLED)


__all__ = ["Axis", "Ratings", "Solution", "solve", "natural_frequency", "chamber_modulus",
           "cautious_counterbalance", "axis_from_values", "stall", "design_loads", "G_STANDARD", "solve_increasing",
           "REGIMES",
           "ARRANGEMENTS", "DIRECTIONS", "METERING", "STARVED", "PUMP_LIMITED", "RELIEF", "STALLED", "HELD",
           "CLOSED", "RUNAWAY", "CAVITATING", "SINKING", "DRIVEN_BACK", "UNCONTROLLED", "CAVITATION_ABS_DEFAULT"]
