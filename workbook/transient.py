"""One axis in motion: a stroke simulated in time (circuit layer).

The steady solver (:mod:`workbook.circuit`) proves operating points; this module integrates
the same axis through time, on the same component objects (``axis.flow_valve``,
``axis.holding``, ``axis.supply.relief``, the checks inside them), evaluated at the
instantaneous pressures. No valve law is written twice here; the only new element is the
directional valve, which the steady solver takes as ideal.

Network
-------
Per side (cap, rod) a chain from the directional valve to the chamber::

    pump line ps / tank --[directional valve]-- port node --[flow valve]-- line node
                        --[holding valve]-- chamber

A link that holds no valve merges its two nodes (one pressure). The flow valve sits at the
valve end of its line (meter-in, meter-out) or tees off the port node of the controlled
motion's driving side to tank (bleed-off). The holding valve sits at the chamber port of its
side; the cylinder line lies between it and the flow valve. Volumes: a chamber holds its
swept volume plus its port dead volume, plus the line when no holding valve separates them;
a port node holds the valve body's volume (``body_volume``); the pump line ``supply_volume``.

Equations (gauge pressures; Merritt, Hydraulic Control Systems, 1967, §2 continuity with
compressibility, from memory)::

    dp_i/dt = E'_i / V_i · (Σ Q_in,i − dV_i/dt)          every node i
    V1 = A1 x + V1,dead,  V3 = A3 (L − x) + V3,dead
    m dv/dt = p1 A1 − p3 A3 − F(x) − m g sin(θ) − F_fr(v) + F_stop(x, v)
    dpp/dt = (p_pilot − pp) / τ                          counterbalance pilot lag

* ``F(x)`` the load table (N, positive pushing the rod in), linear between its points.
* ``F_fr(v) = [F_run + (F_brk − F_run) exp(−(v/v_s)²)] tanh(v/v_t) + c_v v``: breakaway
  above running (Stribeck), viscous part, smoothed through zero by the tanh (from memory).
* ``F_stop``: beyond either end a spring ``k_stop`` and a damper ``c_stop`` (engaging over
  the first 0.1 mm), the cylinder's mechanical stop.
* The directional valve is a sharp orifice (:class:`workbook.restrictor.SharpOrifice`)
  sized to ``dv_drop`` at the pump flow fully open, times its opening ``u(t)`` in [0, 1]:
  extend ps→cap and rod→tank, retract ps→rod and cap→tank, stop all ports blocked (closed
  centre: the pump crosses the relief).
* The holding valve's opening follows its pilot through a first-order lag ``τ`` (the
  poppet and pilot piston moving; a few ms to tens of ms, from memory): the valve law is
  evaluated with the lagged pilot pressure ``pp``.
* A chamber near vapour pressure: the modulus is scaled down smoothly below
  ``cavity_abs`` (absolute) so that the pressure cannot fall below absolute zero and a
  void forms instead (a simplified cavity model, from memory).

The effective modulus of a column is :func:`workbook.circuit.chamber_modulus` (oil, line
compliance over its share, entrained air) at the instantaneous pressure and position, or a
constant ``modulus`` when one is given (the hand-checked tests use a constant).

Natural frequency (Merritt 1967): ``w0 = sqrt(E'/m · (A1²/V1 + A3²/V3))``.

Integration: ``scipy.integrate.solve_ivp`` with ``BDF`` (stiff; the valve body nodes are
far stiffer than the mechanics) and the Jacobian's sparsity pattern; each move of the
command profile is one call that stops on its events (the commanded position reached, the
end of the stroke reached).

Worked example (by hand): an 80/45 cylinder, 1.2 m stroke, 500 kg, trapped (valves shut,
no friction) at mid-stroke with 1 GPa and no dead volume: k = E (A1 + A3)/0.6 =
1e9 × 84.626e-4 / 0.6 = 1.4104e7 N/m, w0 = sqrt(k/m) = 167.96 rad/s.

>>> from workbook.cylinder import Cylinder
>>> c = Cylinder(0.080, 0.045, 1.2)
>>> round(float(c.natural_frequency(1e9, 500.0, 0.6)), 2)
167.96
"""

from __future__ import annotations

import math
from dataclasses import dataclass, field
from typing import Sequence

import numpy as np
from scipy.integrate import solve_ivp
from scipy.sparse import lil_matrix

from .circuit import G_STANDARD, Axis, chamber_modulus
from .errors import InputError
from .fluid import P_ATM
from .restrictor import SharpOrifice
from .valve import CounterbalanceValve, check_opening

_BAR = 1e5
MOVES = ("extend", "retract", "stop")

#: default counterbalance opening lag, s (from memory: pilot-operated poppet cartridges
#: respond in a few ms to a few tens of ms; 20 ms taken)
HOLDING_LAG_DEFAULT = 0.020
#: default directional valve ramp times, s (from memory: proportional or soft-shift valves
#: 50 to 300 ms; 100 ms taken)
RAMP_DEFAULT = 0.100


@dataclass(frozen=True)
class Move:
    """One move of a command profile: ``kind`` extend / retract / stop, ended by
    ``duration`` (s) or, for extend / retract, by ``target`` (m from the cap end) reached
    (the end of the stroke when neither is given); ``ramp`` (s) the valve's opening time."""

    kind: str
    duration: float | None = None
    target: float | None = None
    ramp: float = RAMP_DEFAULT

    def __post_init__(self):
        if self.kind not in MOVES:
            raise InputError("motion.profile", repr(self.kind), "moves 'extend', 'retract' or 'stop'")
        if not (math.isfinite(self.ramp) and self.ramp > 0):
            raise InputError("motion.ramp", self.ramp, "a ramp time greater than 0 s")
        if self.duration is not None and not (math.isfinite(self.duration) and self.duration > 0):
            raise InputError("motion.profile", self.duration, "a move duration greater than 0 s")
        if self.kind == "stop" and self.duration is None:
            raise InputError("motion.profile", "stop without a duration", "a stop with its duration in s")


def default_profile(stroke: float, ramp: float = RAMP_DEFAULT, dwell: float = 0.5) -> tuple[Move, ...]:
    """One full stroke out and back: extend to the end, dwell, retract to the end, dwell."""
    return (Move("extend", target=stroke, ramp=ramp), Move("stop", duration=dwell, ramp=ramp),
            Move("retract", target=0.0, ramp=ramp), Move("stop", duration=dwell, ramp=ramp))


@dataclass
class Trace:
    """The motion in time: arrays over ``t`` (s). ``x`` m, ``v`` m/s (positive extending),
    ``p1``, ``p3``, ``ps``, ``pilot`` (lagged counterbalance pilot) Pa gauge; ``nodes`` every
    node pressure (rows, names in ``names``); ``u`` the directional valve's signed opening;
    ``impacts`` the speeds (m/s) at which the piston reached an end; ``steps`` the
    integrator's accepted steps, ``nfev`` its right-hand-side calls."""

    t: np.ndarray
    x: np.ndarray
    v: np.ndarray
    p1: np.ndarray
    p3: np.ndarray
    ps: np.ndarray
    pilot: np.ndarray
    u: np.ndarray
    names: tuple
    nodes: np.ndarray
    move_end: list = field(default_factory=list)
    impacts: list = field(default_factory=list)
    steps: int = 0
    nfev: int = 0
    njev: int = 0


def _positive(name, value, allowed):
    value = float(value)
    if not (math.isfinite(value) and value > 0):
        raise InputError(name, value, allowed)
    return value


def check_load_table(positions, forces, stroke: float):
    """The load table as arrays; refused unless positions strictly increase, forces finite."""
    x = np.atleast_1d(np.asarray(positions, dtype=float))
    f = np.atleast_1d(np.asarray(forces, dtype=float))
    if x.shape != f.shape or x.size == 0:
        raise InputError("motion.load_table", f"{x.size} positions, {f.size} forces", "as many forces as positions")
    if not (np.all(np.isfinite(x)) and np.all(np.isfinite(f))):
        raise InputError("motion.load_table", "NaN or infinite", "finite positions and forces")
    if x.size > 1 and not np.all(np.diff(x) > 0):
        raise InputError("motion.load_table", np.round(x * 1e3, 3).tolist(), "positions (mm) strictly increasing")
    if x[0] < -1e-9 or x[-1] > stroke + 1e-9:
        raise InputError("motion.load_table", np.round(x * 1e3, 3).tolist(),
                         f"positions within the stroke, 0 to {stroke * 1e3:g} mm")
    return x, f


class Model:
    """The axis as a set of ODEs (see the module text).

    Parameters (SI): ``axis`` the steady solver's Axis (its ``mass`` must be > 0);
    ``load_x``, ``load_f`` the load table (m, N); ``temperature`` K; ``inclination`` rad
    (adds m g sin θ, pushing the rod in when positive); ``breakaway`` N (default 1.5 ×
    running, from memory); ``viscous`` N·s/m; ``holding_lag`` s; ``modulus`` a constant
    effective modulus (Pa) or None for :func:`workbook.circuit.chamber_modulus`;
    ``dv_drop`` Pa, the directional valve's drop at the pump flow fully open;
    ``body_volume``, ``supply_volume``, ``port_volume`` m³; ``k_stop`` N/m; ``opening`` the
    flow valve's opening factor in [0, 1] (as in :func:`workbook.circuit.solve`).
    """

    def __init__(self, axis: Axis, load_x=(0.0,), load_f=(0.0,), temperature: float | None = None,
                 inclination: float = 0.0, breakaway: float | None = None, viscous: float = 0.0,
                 holding_lag: float = HOLDING_LAG_DEFAULT, modulus: float | None = None,
                 dv_drop: float = 0.05 * _BAR, body_volume: float = 2e-5, supply_volume: float | None = None,
                 port_volume: float = 1e-5, k_stop: float = 2e8, cavity_abs: float = 0.02 * _BAR,
                 v_smooth: float = 1e-3, stribeck: float = 5e-3, opening: float = 1.0):
        self.axis = axis
        self.opening = check_opening(opening)
        c = self.cyl = axis.cylinder
        self.m = _positive("operation.mass", axis.mass, "a moving mass greater than 0 kg (the motion needs it)")
        self.lag = _positive("motion.holding_lag", holding_lag, "a time constant greater than 0 s")
        self.load_x, self.load_f = check_load_table(load_x, load_f, c.stroke)
        t = axis.temp_min if temperature is None else float(temperature)
        axis.oil.check_temperature(t, "motion.temperature")
        self.rho = float(axis.oil.density(t))
        self.mu = float(axis.oil.dynamic_viscosity(t))
        self.weight = self.m * G_STANDARD * math.sin(float(inclination))
        self.f_run = float(axis.friction)
        self.f_brk = 1.5 * self.f_run if breakaway is None else float(breakaway)
        self.c_visc = float(viscous)
        self.vt, self.vs = v_smooth, stribeck
        self.modulus = None if modulus is None else _positive("motion.modulus", modulus, "a modulus above 0 Pa")
        self.pt = axis.tank_pressure
        self.pcav = cavity_abs - P_ATM
        self.k_stop = k_stop
        self.c_stop = 2.0 * 0.7 * math.sqrt(k_stop * self.m)
        qp = axis.supply.flow
        # directional valve: a sharp orifice passing the pump flow at dv_drop fully open
        d = 1e-3
        for _ in range(60):                                  # bore for that flow (secant on d², turbulent)
            q = float(SharpOrifice(d).flow(dv_drop, self.rho, self.mu).flow)
            d *= math.sqrt(qp / q)
        self.dv = SharpOrifice(d)
        r = axis.ratings
        self.v_supply = (math.pi / 4 * r.pressure_line_bore ** 2 * 2.0) if supply_volume is None else supply_volume
        self._build(body_volume, port_volume)

    # ------------------------------------------------------------------ network
    def _build(self, body_volume, port_volume):
        ax, c = self.axis, self.cyl
        vside = ax.valve_side()
        bleed_side = None
        if ax.arrangement == "bleed-off":
            bleed_side = "cap" if ax.controlled == "extend" else "rod"
        names = ["ps"]
        vol = [self.v_supply]
        self.side = {}
        for s in ("cap", "rod"):
            hv = ax.holding is not None and ax.holding_side == s
            fv = vside == s
            line = ax.ratings.line_volume(s)
            chamber = len(names)
            names.append("p1" if s == "cap" else "p3")
            vol.append(port_volume if hv else line + port_volume)   # plus swept volume, added in rhs
            line_node = chamber
            if hv:
                line_node = len(names)
                names.append(s + " line")
                vol.append(line)
            port = line_node
            if fv:
                port = len(names)
                names.append(s + " port")
                vol.append(body_volume)
            self.side[s] = dict(chamber=chamber, line=line_node, port=port, hv=hv, fv=fv, bleed=bleed_side == s,
                                line_volume=line)
        self.names = tuple(names)
        self.n_p = len(names)
        self.vol0 = np.array(vol)
        self.i_x, self.i_v = self.n_p, self.n_p + 1
        self.i_pp = self.n_p + 2
        self.n = self.n_p + 3
        self.cb = isinstance(ax.holding, CounterbalanceValve)
        self.i1, self.i3 = self.side["cap"]["chamber"], self.side["rod"]["chamber"]

    def sparsity(self):
        """Jacobian sparsity: pressures couple along their chains, all with x, v and the pilot."""
        S = lil_matrix((self.n, self.n))
        for i in range(self.n):
            S[i, i] = 1
        pres = list(range(self.n_p))
        for i in pres:                                     # conservative: pressures with each other
            for j in pres:
                S[i, j] = 1
            S[i, self.i_x] = S[i, self.i_v] = S[i, self.i_pp] = 1
        S[self.i_x, self.i_v] = 1
        for j in (self.i1, self.i3, self.i_x, self.i_v):
            S[self.i_v, j] = 1
        S[self.i_pp, self.i1] = S[self.i_pp, self.i3] = S[self.i_pp, self.i_pp] = 1
        return S.tocsr()

    # ------------------------------------------------------------------ physics
    def load(self, x):
        """External force, N: the table at ``x`` plus the weight along the rod."""
        return float(np.interp(x, self.load_x, self.load_f)) + self.weight

    def friction(self, v):
        """Friction force, N, opposing ``v`` (smoothed Stribeck, see the module text)."""
        level = self.f_run + (self.f_brk - self.f_run) * math.exp(-(v / self.vs) ** 2)
        return level * math.tanh(v / self.vt) + self.c_visc * v

    def stop_force(self, x, v):
        """End-stop force, N (positive pushes the rod out)."""
        L = self.cyl.stroke
        if x < 0.0:
            pen = -x
            return self.k_stop * pen - self.c_stop * v * min(pen / 1e-4, 1.0)
        if x > L:
            pen = x - L
            return -self.k_stop * pen - self.c_stop * v * min(pen / 1e-4, 1.0)
        return 0.0

    def volumes(self, x):
        c = self.cyl
        xc = min(max(x, 0.0), c.stroke)
        vol = self.vol0.copy()
        vol[self.i1] += c.a1 * xc
        vol[self.i3] += c.a3 * (c.stroke - xc)
        return vol

    def moduli(self, p, x):
        """Effective modulus of every node, Pa, softened near vapour pressure."""
        if self.modulus is not None:
            e = np.full(self.n_p, self.modulus)
        else:
            e = np.empty(self.n_p)
            e[0] = self._line_modulus(p[0])
            for s, d in self.side.items():
                for i in {d["chamber"], d["line"], d["port"]}:
                    if i == d["chamber"]:
                        e[i] = float(chamber_modulus(self.axis, s, p[i], x)) if not d["hv"] else self._oil(p[i])
                    elif i == d["line"]:
                        e[i] = self._line_modulus(p[i], s)
                    else:
                        e[i] = self._oil(p[i])
        # below cavity_abs + 0.5 bar the column softens (a void forms rather than tension)
        soft = 0.5 * (1.0 + np.tanh((p - self.pcav - 0.1 * _BAR) / (0.05 * _BAR)))
        return e * np.maximum(soft, 1e-6)

    def _oil(self, p):
        from .fluid import effective_bulk_modulus
        return float(effective_bulk_modulus(self.axis.oil.bulk_modulus, p, self.axis.air_content))

    def _line_modulus(self, p, side="cap"):
        from .fluid import effective_bulk_modulus
        r = self.axis.ratings
        return float(effective_bulk_modulus(self.axis.oil.bulk_modulus, p, self.axis.air_content, 1.0,
                                            r.line_modulus(side)))

    def flows(self, p, pp, u):
        """Net flow into every pressure node, m³/s, at node pressures ``p`` (Pa), lagged
        pilot ``pp`` and directional valve opening ``u`` (signed, +1 extend)."""
        ax = self.axis
        q = np.zeros(self.n_p)
        ps, pt = p[0], self.pt
        q[0] += ax.supply.flow - float(ax.supply.relief.flow(ps, pt))
        a = abs(u)
        for s, d in self.side.items():
            inlet = (u > 0) == (s == "cap")
            src = ps if inlet else pt
            port = d["port"]
            if a > 0.0:
                dp = src - p[port]
                qd = a * math.copysign(float(self.dv.flow(abs(dp), self.rho, self.mu).flow), dp)
                q[port] += qd
                if inlet:
                    q[0] -= qd
            if d["bleed"]:
                qb = float(ax.flow_valve.forward_flow(p[port] - pt, self.rho, self.mu, self.opening))
                q[port] -= qb
            if d["fv"]:
                # forward towards the chamber (meter-in) or from it towards the tank (meter-out)
                a_, b_ = (port, d["line"]) if ax.arrangement == "meter-in" else (d["line"], port)
                qf = float(ax.flow_valve.flow(p[a_] - p[b_], self.rho, self.mu, self.opening))
                q[a_] -= qf
                q[b_] += qf
            if d["hv"]:
                other = p[self.i3 if s == "cap" else self.i1]
                h = ax.holding
                pc, pl = p[d["chamber"]], p[d["line"]]
                if self.cb:
                    qh = float(h.flow(pc, pp, pl))
                else:
                    qh = float(h.flow(pc, pl))
                del other
                q[d["chamber"]] -= qh
                q[d["line"]] += qh
        return q

    def pilot_target(self, p):
        """The pressure the counterbalance pilot follows: the opposite chamber's."""
        if not self.cb:
            return 0.0
        return p[self.i3] if self.axis.holding_side == "cap" else p[self.i1]

    def rhs(self, t, y, u_of_t):
        p = y[:self.n_p]
        x, v, pp = y[self.i_x], y[self.i_v], y[self.i_pp]
        u = u_of_t(t)
        c = self.cyl
        q = self.flows(p, pp, u)
        xc_in = 0.0 <= x <= c.stroke
        vel = v if xc_in else 0.0
        q[self.i1] -= c.a1 * vel
        q[self.i3] += c.a3 * vel
        vol = self.volumes(x)
        e = self.moduli(p, x)
        dy = np.empty(self.n)
        dy[:self.n_p] = e / vol * q
        force = p[self.i1] * c.a1 - p[self.i3] * c.a3 - self.load(x) - self.friction(v) + self.stop_force(x, v)
        dy[self.i_x] = v
        dy[self.i_v] = force / self.m
        dy[self.i_pp] = (self.pilot_target(p) - pp) / self.lag
        return dy

    def energy(self, y):
        """Kinetic energy, J (the hydraulic spring energy is in the tests, by hand)."""
        return 0.5 * self.m * y[self.i_v] ** 2


def _ramp(u0, u1, t0, tr):
    def u(t):
        s = min(max((t - t0) / tr, 0.0), 1.0)
        s = s * s * (3.0 - 2.0 * s)                      # smooth step (C1 at both ends)
        return u0 + (u1 - u0) * s
    return u


def check_profile(profile: Sequence[Move], stroke: float):
    """Refuse a profile whose targets leave the stroke or that moves away from its target."""
    if not profile:
        raise InputError("motion.profile", "no moves", "at least one move")
    for mv in profile:
        if mv.target is not None and not (-1e-12 <= mv.target <= stroke + 1e-12):
            raise InputError("motion.profile", f"target {mv.target * 1e3:g} mm",
                             f"targets within the stroke, 0 to {stroke * 1e3:g} mm")


def simulate(model: Model, profile: Sequence[Move], x0: float = 0.0, v0: float = 0.0, y0=None,
             rtol: float = 1e-6, atol_p: float = 1.0, method: str = "BDF", max_step: float = 0.05,
             settle: float | None = None) -> Trace:
    """Integrate the command ``profile`` from ``x0`` (m) at rest (or from state ``y0``).

    Each move is one ``solve_ivp`` call; a target move stops on the event ``x = target``
    (or the end of the stroke); a duration move runs its time. The next move ramps the valve
    from where the last one left it. Returns a :class:`Trace`."""
    c = model.cyl
    check_profile(profile, c.stroke)
    if not (-1e-12 <= x0 <= c.stroke + 1e-12):
        raise InputError("motion.start", f"{x0 * 1e3:g} mm", f"a start within the stroke, 0 to {c.stroke * 1e3:g} mm")
    if y0 is None:
        y0 = initial_state(model, x0, v0)
    y = np.array(y0, dtype=float)
    t0, u_prev = 0.0, 0.0
    atol = np.full(model.n, atol_p)
    atol[model.i_x], atol[model.i_v], atol[model.i_pp] = 1e-7, 1e-6, atol_p
    jac = model.sparsity() if method in ("BDF", "Radau") else None
    ts, ys, us = [np.array([0.0])], [y[:, None]], [np.array([0.0])]
    trace_end, impacts = [], []
    steps = nfev = njev = 0
    for mv in profile:
        sign = {"extend": 1.0, "retract": -1.0, "stop": 0.0}[mv.kind]
        u_fun = _ramp(u_prev, sign, t0, mv.ramp)
        events = []
        if mv.kind != "stop":
            target = mv.target if mv.target is not None else (c.stroke if sign > 0 else 0.0)
            end = c.stroke - 1e-6 if sign > 0 else 1e-6
            goal = min(target, end) if sign > 0 else max(target, end)

            def reached(t, yy, _u=None, goal=goal, sign=sign):
                return sign * (yy[model.i_x] - goal)
            reached.terminal = True
            reached.direction = 1.0
            events.append(reached)
        t_end = t0 + (mv.duration if mv.duration is not None else 600.0)
        kw = dict(jac_sparsity=jac) if jac is not None else {}
        sol = solve_ivp(model.rhs, (t0, t_end), y, method=method, args=(u_fun,), rtol=rtol, atol=atol,
                        events=events or None, max_step=max_step, **kw)
        if sol.status < 0:
            raise RuntimeError(f"integration failed in move {mv.kind}: {sol.message}")
        steps += sol.t.size - 1
        nfev += sol.nfev
        njev += getattr(sol, "njev", 0)
        ts.append(sol.t[1:])
        ys.append(sol.y[:, 1:])
        us.append(np.array([u_fun(t) for t in sol.t[1:]]))
        y = sol.y[:, -1].copy()
        if events and sol.t_events[0].size:
            impacts.append(abs(float(sol.y_events[0][0][model.i_v])))
        t0 = float(sol.t[-1])
        u_prev = u_fun(t0)
        trace_end.append(t0)
    t = np.concatenate(ts)
    Y = np.concatenate(ys, axis=1)
    return Trace(t=t, x=Y[model.i_x], v=Y[model.i_v], p1=Y[model.i1], p3=Y[model.i3], ps=Y[0], pilot=Y[model.i_pp],
                 u=np.concatenate(us), names=model.names, nodes=Y[:model.n_p], move_end=trace_end, impacts=impacts,
                 steps=steps, nfev=nfev, njev=njev)


def initial_state(model: Model, x0: float, v0: float = 0.0):
    """A state at rest at ``x0``: the chambers holding the load (the force balance shared
    by the two sides in proportion to area, rod side at tank pressure), everything else at
    tank pressure."""
    c = model.cyl
    y = np.zeros(model.n)
    y[:model.n_p] = model.pt
    f = model.load(x0)
    if f >= 0:
        p1, p3 = (f + model.pt * c.a3) / c.a1, model.pt
    else:
        p1, p3 = model.pt, (model.pt * c.a1 - f) / c.a3
    for s, d in model.side.items():
        pc = p1 if s == "cap" else p3
        y[d["chamber"]] = pc
    y[model.i_x], y[model.i_v] = x0, v0
    y[model.i_pp] = model.pilot_target(y[:model.n_p])
    return y


__all__ = ["Model", "Move", "Trace", "simulate", "default_profile", "initial_state", "check_load_table",
           "check_profile", "MOVES", "HOLDING_LAG_DEFAULT", "RAMP_DEFAULT"]
