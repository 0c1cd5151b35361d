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

from .circuit import G_STANDARD, Axis
from .errors import InputError
from .fluid import P_ATM, effective_bulk_modulus
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
    arrived: list = field(default_factory=list)


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
        # its law at this oil state, Q = sign(dp) min(c_l |dp|, c_t sqrt|dp|), both
        # coefficients read off SharpOrifice.flow itself (one laminar, one turbulent point)
        self._dv_ct = float(self.dv.flow(1e6, self.rho, self.mu).flow) / 1e3
        self._dv_cl = float(self.dv.flow(1e-6, self.rho, self.mu).flow) / 1e-6
        r = axis.ratings
        self.v_supply = (math.pi / 4 * r.pressure_line_bore ** 2 * 2.0) if supply_volume is None else supply_volume
        self._build(body_volume, port_volume)

    # ------------------------------------------------------------------ network
    def _build(self, body_volume, port_volume):
        ax = self.axis
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
        self._jac_scale = np.full(self.n, 1e4)
        self._jac_scale[self.i_x], self._jac_scale[self.i_v] = 1e-3, 1e-3
        self._modulus_layout()

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

    # ------------------------------------------------------------------ physics (vectorised)
    def load(self, x):
        """External force, N: the table at ``x`` (m, scalar or array) plus the weight along the rod."""
        out = np.interp(x, self.load_x, self.load_f) + self.weight
        return float(out) if np.ndim(out) == 0 else out

    def friction(self, v):
        """Friction force, N, opposing ``v`` (m/s, scalar or array; smoothed Stribeck, see the
        module text)."""
        v = np.asarray(v, dtype=float)
        level = self.f_run + (self.f_brk - self.f_run) * np.exp(-(v / self.vs) ** 2)
        out = level * np.tanh(v / self.vt) + self.c_visc * v
        return float(out) if out.ndim == 0 else out

    def stop_force(self, x, v):
        """End-stop force, N (positive pushes the rod out), smoothed: the penetration beyond
        either end enters as ``(e + sqrt(e² + δ²))/2`` with δ = 1 µm (C∞, zero far inside the
        stroke), the damper engaging over the first 0.1 mm."""
        x = np.asarray(x, dtype=float)
        v = np.asarray(v, dtype=float)
        d = 1e-6
        e0, e1 = -x, x - self.cyl.stroke
        pen0 = 0.5 * (e0 + np.sqrt(e0 * e0 + d * d))
        pen1 = 0.5 * (e1 + np.sqrt(e1 * e1 + d * d))
        s0, s1 = pen0 / (pen0 + 1e-4), pen1 / (pen1 + 1e-4)
        out = self.k_stop * (pen0 - pen1) - self.c_stop * v * (s0 + s1)
        return float(out) if out.ndim == 0 else out

    def volumes(self, x):
        """Volume of every node, m³, at piston position ``x`` (m; scalar or array of k)."""
        c = self.cyl
        x = np.asarray(x, dtype=float)
        vol = np.repeat(self.vol0[:, None], x.size, axis=1) if x.ndim else self.vol0.copy()
        vol[self.i1] = vol[self.i1] + c.a1 * np.clip(x, 0.0, c.stroke)
        vol[self.i3] = vol[self.i3] + c.a3 * (c.stroke - np.clip(x, 0.0, c.stroke))
        return vol

    def moduli(self, p, x):
        """Effective modulus of every node, Pa (``p`` shape (n_p,) or (n_p, k)), softened near
        vapour pressure: :func:`workbook.fluid.effective_bulk_modulus` once for all nodes, each
        with its line share (a chamber whose line it holds: line over line plus swept volume,
        as :func:`workbook.circuit.chamber_modulus`; a line node and the pump line: 1; a valve
        body: 0)."""
        if self.modulus is not None:
            e = np.full(np.shape(p), self.modulus)
        else:
            share = np.broadcast_to(self._share0[:, None] if np.ndim(p) == 2 else self._share0, np.shape(p)).copy()
            c = self.cyl
            xc = np.clip(x, 0.0, c.stroke)
            for i, side, vline in self._merged:
                swept = c.a1 * xc if side == "cap" else c.a3 * (c.stroke - xc)
                share[i] = vline / np.maximum(swept + vline, 1e-12) * self._k_scale[i]
            e = effective_bulk_modulus(self.axis.oil.bulk_modulus, np.maximum(p, 0.0), self.axis.air_content,
                                       share, self._k_ref)
        soft = 0.5 * (1.0 + np.tanh((p - self.pcav - 0.1 * _BAR) / (0.05 * _BAR)))
        return e * np.maximum(soft, 1e-6)

    def _modulus_layout(self):
        """Line shares of the nodes and one reference line stiffness for the single call of
        :func:`effective_bulk_modulus` (a share over K_side = share·(K_ref/K_side) over K_ref)."""
        r = self.axis.ratings
        self._k_ref = r.line_modulus("cap")
        self._share0 = np.zeros(self.n_p)
        self._k_scale = np.ones(self.n_p)
        self._merged = []
        self._share0[0] = 1.0                              # the pump line: all of it a line
        for s, d in self.side.items():
            scale = self._k_ref / r.line_modulus(s)
            self._k_scale[d["chamber"]] = scale
            if d["line"] != d["chamber"]:
                self._share0[d["line"]] = scale            # a line node: all line
            else:
                self._merged.append((d["chamber"], s, d["line_volume"]))

    def flows(self, p, pp, u):
        """Net flow into every pressure node, m³/s, at node pressures ``p`` (Pa; (n_p,) or
        (n_p, k)), lagged pilot ``pp`` and directional valve opening ``u`` (a signed scalar,
        +1 extend). Each valve law is called once on all columns."""
        ax = self.axis
        q = np.zeros(np.shape(p))
        ps, pt = p[0], self.pt
        q[0] = ax.supply.flow - ax.supply.relief.flow(ps, pt)
        a = abs(u)
        if a > 0.0:
            cap, rod = self.side["cap"]["port"], self.side["rod"]["port"]
            inlet, outlet = (cap, rod) if u > 0 else (rod, cap)
            dp = np.stack((ps - p[inlet], p[outlet] - pt))
            adp = np.abs(dp)
            qd = a * np.sign(dp) * np.minimum(self._dv_cl * adp, self._dv_ct * np.sqrt(adp))
            q[inlet] += qd[0]
            q[0] -= qd[0]
            q[outlet] -= qd[1]
        for s, d in self.side.items():
            port = d["port"]
            if d["bleed"]:
                q[port] -= ax.flow_valve.forward_flow(p[port] - pt, self.rho, self.mu, self.opening)
            if d["fv"]:
                # forward towards the chamber (meter-in) or from it towards the tank (meter-out)
                a_, b_ = (port, d["line"]) if ax.arrangement == "meter-in" else (d["line"], port)
                qf = ax.flow_valve.flow(p[a_] - p[b_], self.rho, self.mu, self.opening)
                q[a_] -= qf
                q[b_] += qf
            if d["hv"]:
                pc, pl = p[d["chamber"]], p[d["line"]]
                qh = ax.holding.flow(pc, pp, pl) if self.cb else ax.holding.flow(pc, pl)
                q[d["chamber"]] -= qh
                q[d["line"]] += qh
        return q

    def pilot_target(self, p):
        """The pressure the counterbalance pilot follows: the opposite chamber's."""
        if not self.cb:
            return 0.0 * p[0]
        return p[self.i3] if self.axis.holding_side == "cap" else p[self.i1]

    def rhs(self, t, y, u_of_t):
        """dy/dt for state ``y`` of shape (n,) or (n, k) (k states at once, for the Jacobian)."""
        p = y[:self.n_p]
        x, v, pp = y[self.i_x], y[self.i_v], y[self.i_pp]
        u = u_of_t(t)
        c = self.cyl
        q = self.flows(p, pp, u)
        q[self.i1] -= c.a1 * v
        q[self.i3] += c.a3 * v
        dy = np.empty(np.shape(y))
        dy[:self.n_p] = self.moduli(p, x) / self.volumes(x) * q
        force = p[self.i1] * c.a1 - p[self.i3] * c.a3 - self.load(x) - self.friction(v) + self.stop_force(x, v)
        dy[self.i_x] = v
        dy[self.i_v] = force / self.m
        dy[self.i_pp] = (self.pilot_target(p) - pp) / self.lag
        return dy

    def jacobian(self, t, y, u_of_t):
        """Dense Jacobian of :meth:`rhs` by forward differences, all n columns in one
        vectorised call (n is 7 to 10: a dense LU beats a sparse one at this size)."""
        h = _SQRT_EPS * np.maximum(np.abs(y), self._jac_scale)
        Y = np.repeat(y[:, None], self.n + 1, axis=1)
        Y[np.arange(self.n), np.arange(1, self.n + 1)] += h
        F = self.rhs(t, Y, u_of_t)
        return (F[:, 1:] - F[:, :1]) / h

    def energy(self, y):
        """Kinetic energy, J (the hydraulic spring energy is in the tests, by hand)."""
        return 0.5 * self.m * y[self.i_v] ** 2

    def natural_frequency(self, x, p_cap=None, p_rod=None):
        """Merritt's ``w0 = sqrt((E1 A1²/V1 + E3 A3²/V3)/m)``, rad/s, at position ``x`` with the
        model's own node volumes (the chambers and what they hold) and moduli."""
        c = self.cyl
        y = initial_state(self, float(x))
        p = y[:self.n_p].copy()
        if p_cap is not None:
            p[self.i1] = p_cap
        if p_rod is not None:
            p[self.i3] = p_rod
        e = self.moduli(p, float(x))
        vol = self.volumes(float(x))
        return math.sqrt((e[self.i1] * c.a1 ** 2 / vol[self.i1] + e[self.i3] * c.a3 ** 2 / vol[self.i3]) / self.m)


_SQRT_EPS = math.sqrt(np.finfo(float).eps)


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
             rtol: float = 1e-5, atol_p: float = 100.0, method: str = "BDF", max_step: float = math.inf,
             settle: float | None = None, max_move: float = 600.0) -> Trace:
    """Integrate the command ``profile`` from ``x0`` (m) at rest (or from state ``y0``).

    Each move is one ``solve_ivp`` call; a target move stops on the event ``x = target``
    (or the end of the stroke); a duration move runs its time. The next move ramps the valve
    from where the last one left it. A stiff ``method`` (BDF, Radau, LSODA) gets the dense
    Jacobian of :meth:`Model.jacobian`; an explicit one (RK45, for the benchmark) none.
    ``max_move`` (s) ends a target move that never arrives (a stalled axis). Returns a
    :class:`Trace`."""
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
    stiff = method in ("BDF", "Radau", "LSODA")
    ts, ys, us = [np.array([0.0])], [y[:, None]], [np.array([0.0])]
    trace_end, impacts, arrived = [], [], []
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
        t_end = t0 + (mv.duration if mv.duration is not None else max_move)
        kw = dict(jac=model.jacobian) if stiff else {}
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
        hit = bool(events and sol.t_events[0].size)
        if hit and abs(goal - (c.stroke if sign > 0 else 0.0)) <= 2e-6:
            impacts.append(abs(float(sol.y_events[0][0][model.i_v])))
        arrived.append(hit or mv.kind == "stop")
        t0 = float(sol.t[-1])
        u_prev = u_fun(t0)
        trace_end.append(t0)
    t = np.concatenate(ts)
    Y = np.concatenate(ys, axis=1)
    return Trace(t=t, x=Y[model.i_x], v=Y[model.i_v], p1=Y[model.i1], p3=Y[model.i3], ps=Y[0], pilot=Y[model.i_pp],
                 u=np.concatenate(us), names=model.names, nodes=Y[:model.n_p], move_end=trace_end, impacts=impacts,
                 steps=steps, nfev=nfev, njev=njev, arrived=arrived)


def parse_profile(text: str, stroke: float, ramp_open: float = RAMP_DEFAULT, ramp_close: float = RAMP_DEFAULT,
                  dwell: float = 0.5) -> tuple[Move, ...]:
    """The moves of a ``motion.profile`` text: moves separated by ``;``, each ``extend`` or
    ``retract`` (to the end of the stroke), ``extend to 800 mm`` (a target from the cap
    end), ``retract for 2 s`` (a duration) or ``stop 0.5 s``. Empty: one full stroke out and
    back with ``dwell`` (s) at each end. A move opens the valve over ``ramp_open`` (s); a stop
    closes it over ``ramp_close``.

    >>> [(m.kind, m.target, m.duration) for m in parse_profile("extend to 800 mm; stop 0.2 s; retract", 1.2)]
    [('extend', 0.8, None), ('stop', None, 0.2), ('retract', 0.0, None)]
    >>> parse_profile("jump 2 s", 1.2)
    Traceback (most recent call last):
    ...
    workbook.errors.InputError: motion.profile: got 'jump 2 s'; allowed: moves separated by ';', each 'extend', 'retract' (optionally 'to <position>' or 'for <time>') or 'stop <time>', e.g. 'extend to 800 mm; stop 0.5 s; retract'
    """
    from . import units

    allowed = ("moves separated by ';', each 'extend', 'retract' (optionally 'to <position>' or 'for <time>') "
               "or 'stop <time>', e.g. 'extend to 800 mm; stop 0.5 s; retract'")
    _positive("motion.ramp_open", ramp_open, "a ramp time greater than 0 s")
    _positive("motion.ramp_close", ramp_close, "a ramp time greater than 0 s")
    text = (text or "").strip()
    if not text:
        return (Move("extend", target=stroke, ramp=ramp_open), Move("stop", duration=dwell, ramp=ramp_close),
                Move("retract", target=0.0, ramp=ramp_open), Move("stop", duration=dwell, ramp=ramp_close))
    moves = []
    for item in text.split(";"):
        words = item.strip().split(None, 1)
        if not words:
            continue
        kind = words[0].lower()
        rest = words[1].strip() if len(words) > 1 else ""
        if kind not in MOVES:
            raise InputError("motion.profile", repr(item.strip()), allowed)
        ramp = ramp_close if kind == "stop" else ramp_open
        try:
            if kind == "stop":
                dur = units.to_si(rest[4:] if rest.lower().startswith("for ") else rest, "time", "motion.profile")
                moves.append(Move("stop", duration=dur, ramp=ramp))
            elif not rest:
                moves.append(Move(kind, target=stroke if kind == "extend" else 0.0, ramp=ramp))
            elif rest.lower().startswith("to "):
                x = units.to_si(rest[3:], "length", "motion.profile")
                moves.append(Move(kind, target=x, ramp=ramp))
            elif rest.lower().startswith("for "):
                moves.append(Move(kind, duration=units.to_si(rest[4:], "time", "motion.profile"), ramp=ramp))
            else:
                raise InputError("motion.profile", repr(item.strip()), allowed)
        except InputError as exc:
            if exc.field == "motion.profile" and exc.allowed == allowed:
                raise
            raise InputError("motion.profile", repr(item.strip()), allowed + f" ({exc.allowed})") from None
    check_profile(moves, stroke)
    return tuple(moves)


def start_position(profile: Sequence[Move], stroke: float) -> float:
    """Where the profile starts, m: at the cap end when its first motion extends, at the
    rod end when it retracts."""
    for mv in profile:
        if mv.kind != "stop":
            return 0.0 if mv.kind == "extend" else stroke
    return 0.0


def model_from_values(values, axis: Axis | None = None, **overrides) -> tuple["Model", tuple]:
    """The model of the axis ``values`` ({section: {field: SI}}) and its command profile.

    The ``motion`` section gives the profile, ramps, directional valve drop, load table,
    breakaway and viscous friction and the holding valve's lag (defaults when the section
    is missing); the table is the payload along the stroke (the moving mass's weight along
    the rod added as for the load cases); without a table, the highest load case (weight
    included) acts all along. Oil at the cold end of its range (highest pressures).
    ``axis`` replaces the axis built from ``values`` (a pilot ratio varied, say)."""
    from .circuit import axis_from_values, design_loads
    from .inputs import MOTION

    mo = dict(MOTION.defaults())
    mo.update({k: v for k, v in (values.get("motion") or {}).items()})
    ax = axis_from_values(values) if axis is None else axis
    op = values["operation"]
    stroke = ax.cylinder.stroke
    xs, fs = mo.get("load_positions"), mo.get("load_forces")
    if (xs is None) != (fs is None):
        missing = "motion.load_forces" if fs is None else "motion.load_positions"
        raise InputError(missing, "nothing", "a list as long as the other half of the load table")
    if xs is None:
        xs, fs, incl = (0.0, stroke), (float(np.max(design_loads(op))),) * 2, 0.0
    else:
        incl = float(op.get("inclination") or 0.0)
    profile = parse_profile(mo.get("profile") or "", stroke, mo["ramp_open"], mo["ramp_close"])
    kw = dict(temperature=op["temp_min"], inclination=incl, breakaway=mo.get("breakaway"),
              viscous=mo.get("viscous") or 0.0, holding_lag=mo["holding_lag"], dv_drop=mo["valve_drop"])
    kw.update(overrides)
    return Model(ax, xs, fs, **kw), profile


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
           "parse_profile", "start_position", "model_from_values",
           "check_profile", "MOVES", "HOLDING_LAG_DEFAULT", "RAMP_DEFAULT"]
