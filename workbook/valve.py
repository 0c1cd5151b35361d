"""Valve characteristics the circuit solver composes (SI, gauge pressures, vectorised).

Every valve here is a steady-state characteristic: flow from pressures and, where the
solver needs it, the inverse (pressure drop or inlet pressure from flow). Flows are
positive in the valve's forward (controlled) direction and negative in reverse, where the
built-in free-flow check carries them. Nothing here divides by a zero opening: a closed
valve passes exactly zero flow.

Models
------
* :class:`CheckValve`: ``dp = p_crack + k q + c q²`` for ``q > 0``; blocked in reverse.
* :class:`RestrictorValve`: a non-compensated flow valve made from a restrictor of
  :mod:`workbook.restrictor` (sharp orifice, long throttle, needle). ``opening`` in [0, 1]
  scales its flow at a given drop (for a turbulent orifice this is the same as scaling the
  area); reverse flow through its check.
* :class:`CompensatedFlowValve`: 2-way pressure-compensated flow valve. Metering orifice
  area chosen so that ``Q_set = Cd A sqrt(2 dpc / rho)``; above the minimum working drop
  ``dp_min``::

      Q = Q_set (1 + droop (dp - dp_min) / 100 bar)

  Sign of the droop: positive ``droop`` makes the flow *rise* slightly with the drop across
  the valve (the compensator spring is compressed further as it closes, so the metering
  drop creeps up); this is the usual direction on data-sheet curves (common practice).
  Below ``dp_min`` the compensator is wide open and the valve is a fixed orifice sized so
  the curve is continuous at ``dp_min``: ``Q = Q_set sqrt(dp / dp_min)`` ("starved").
* :class:`CounterbalanceValve`: closed until ``p_in >= p_set + k p_out - R p_pilot``; above
  that ``Q = (p_in - p_set - k p_out + R p_pilot) / g``, at most what it passes held fully
  open, ``(p_in - p_out) / r``. With the outlet at 0 bar gauge this is the textbook opening
  condition ``p_load + R p_pilot >= p_set``. ``k = 1 + R`` when the spring chamber drains
  to the outlet (outlet-referenced), 0 when it is vented to air. Reverse free flow through
  its check.
* :class:`BackPressureValve`: direct-acting relief in the return line:
  ``p_in - p_out = p_set + g q`` for ``q > 0``; reverse free flow through its check.

Worked example, the compensated valve (Cd 0.61, 6 bar spring, 8 bar minimum drop,
2 % droop, 12 L/min at rho 870 kg/m³):

>>> v = CompensatedFlowValve.from_setting(12 / 60000, cd=0.61, compensator_drop=6e5,
...                                       min_drop=8e5, droop=0.02, rho=870.0)
>>> round(v.area * 1e6, 3)           # A = Q / (Cd sqrt(2 dpc/rho)) in mm²
8.828
>>> [round(float(q) * 60000, 3) for q in v.flow(np.array([2e5, 8e5, 108e5]), 870.0)]
[6.0, 12.0, 12.24]

References: orifice equation ``Q = Cd A sqrt(2 dp / rho)`` (any fluid-power handbook;
Merritt, Hydraulic Control Systems, 1967); compensated and counterbalance valve
characteristics as linearised steady-state models (common practice).
"""

from __future__ import annotations

import math
from dataclasses import dataclass, field
from typing import Any

import numpy as np

from .constants import BAR as _BAR
from .constants import LPM as _LPM
from .errors import InputError

#: default flow gradient of a free-flow check above its cracking pressure, Pa per m³/s:
#: 0.1 bar per L/min (a small cartridge check at 20 L/min drops about 2 bar; from memory)
CHECK_GRADIENT_DEFAULT = 0.1 * _BAR / _LPM

#: reference pressure span of the droop: droop is the flow change per 100 bar
DROOP_SPAN = 100 * _BAR


def _num(field_name: str, value, allowed: str, low: float = 0.0, low_open: bool = False) -> float:
    try:
        v = float(value)
    except (TypeError, ValueError):
        raise InputError(field_name, repr(value), allowed) from None
    if not math.isfinite(v) or v < low or (low_open and v <= low):
        raise InputError(field_name, value, allowed)
    return v


def check_opening(opening) -> float:
    """Validate a valve opening factor: a finite number in [0, 1]."""
    try:
        o = float(opening)
    except (TypeError, ValueError):
        raise InputError("opening", repr(opening), "a fraction from 0 (closed) to 1 (fully open)") from None
    if not (math.isfinite(o) and 0.0 <= o <= 1.0):
        raise InputError("opening", opening, "a fraction from 0 (closed) to 1 (fully open)")
    return o


# --------------------------------------------------------------------------- check valve
@dataclass(frozen=True)
class CheckValve:
    """Spring-loaded check: ``dp = p_crack + k q + c q²`` for forward flow ``q > 0``.

    Parameters
    ----------
    cracking : float
        Cracking pressure, Pa (>= 0).
    gradient : float
        Linear flow drop ``k`` above cracking, Pa per m³/s (>= 0).
    quadratic : float
        Orifice-like drop ``c``, Pa per (m³/s)²  (>= 0); ``k`` and ``c`` not both zero.

    >>> c = CheckValve(0.5e5, gradient=0.1e5 / (1 / 60000))   # 0.5 bar + 0.1 bar per L/min
    >>> round(float(c.pressure_drop(20 / 60000)) / 1e5, 6)
    2.5
    >>> round(float(c.flow(2.5e5)) * 60000, 6), float(c.flow(-3e5))
    (20.0, 0.0)
    """

    cracking: float = 0.5 * _BAR
    gradient: float = CHECK_GRADIENT_DEFAULT
    quadratic: float = 0.0

    def __post_init__(self):
        _num("check_cracking", self.cracking, "a pressure of at least 0 bar")
        _num("check_gradient", self.gradient, "a gradient of at least 0 Pa per m³/s")
        _num("check_quadratic", self.quadratic, "a coefficient of at least 0 Pa per (m³/s)²")
        if self.gradient == 0.0 and self.quadratic == 0.0:
            raise InputError("check_gradient", 0, "a flow drop: gradient or quadratic coefficient above 0")

    def flow(self, dp):
        """Forward flow, m³/s, for a drop ``dp`` (Pa) inlet minus outlet; 0 if below cracking."""
        x = np.maximum(np.asarray(dp, dtype=float) - self.cracking, 0.0)
        if self.quadratic == 0.0:
            return x / self.gradient
        k, c = self.gradient, self.quadratic
        return 2.0 * x / (k + np.sqrt(k * k + 4.0 * c * x))     # root of c q² + k q = x, no cancellation

    def pressure_drop(self, q):
        """Drop, Pa, at forward flow ``q`` (m³/s, taken as >= 0); the cracking pressure at q = 0."""
        q = np.maximum(np.asarray(q, dtype=float), 0.0)
        return self.cracking + self.gradient * q + self.quadratic * q * q


# --------------------------------------------------------------------------- plain flow valve
@dataclass(frozen=True)
class RestrictorValve:
    """Non-compensated flow valve: a restrictor with an opening factor and a free-flow check.

    ``restrictor`` is any object with ``flow(dp, rho, mu)`` and ``pressure_drop(q, rho, mu)``
    returning a result with ``.flow``, ``.pressure_drop``, ``.reynolds`` and ``.regime``
    (the restrictors of :mod:`workbook.restrictor`).

    Forward flow at opening ``o``: ``Q = o · Q_r(dp)``; drop at flow q: ``dp_r(q / o)``.
    Reverse flow (dp < 0) goes through ``check`` alone (the restrictor in parallel is
    neglected, which over-estimates the reverse drop: conservative for pressures).
    """

    restrictor: Any
    check: CheckValve | None = field(default_factory=CheckValve)
    kind: str = "restrictor"

    compensated = False

    @property
    def closed(self) -> bool:
        """True when the restrictor itself is shut (a needle screwed onto its seat, lift 0):
        the valve then acts as at opening 0."""
        lift = getattr(self.restrictor, "lift", None)
        return lift is not None and bool(np.all(np.asarray(lift) <= 0.0))

    def _opening(self, opening) -> float:
        o = check_opening(opening)
        return 0.0 if self.closed else o

    def flow(self, dp, rho, mu, opening: float = 1.0):
        """Flow, m³/s, for a drop ``dp`` (Pa), density ``rho`` (kg/m³), viscosity ``mu`` (Pa s)."""
        o = self._opening(opening)
        dp = np.asarray(dp, dtype=float)
        fwd = np.maximum(dp, 0.0)
        q = o * np.asarray(self.restrictor.flow(fwd, rho, mu).flow, dtype=float) if o > 0 else np.zeros(
            np.broadcast(dp, np.asarray(rho), np.asarray(mu)).shape)
        rev = self._reverse(dp, rho, mu)
        return np.where(dp >= 0.0, q, rev)

    def _reverse(self, dp, rho, mu):
        back = np.maximum(-dp, 0.0)
        if self.check is not None:
            return -self.check.flow(back) + 0.0 * np.asarray(rho) * np.asarray(mu)
        return -np.asarray(self.restrictor.flow(back, rho, mu).flow, dtype=float)

    def forward_flow(self, dp, rho, mu, opening: float = 1.0):
        """Forward flow only (negative drops give 0), m³/s."""
        o = self._opening(opening)
        shape = np.broadcast(np.asarray(dp), np.asarray(rho), np.asarray(mu)).shape
        if o == 0.0:
            return np.zeros(shape)
        fwd = np.maximum(np.asarray(dp, dtype=float), 0.0)
        return np.broadcast_to(o * np.asarray(self.restrictor.flow(fwd, rho, mu).flow, dtype=float), shape).copy()

    def pressure_drop(self, q, rho, mu, opening: float = 1.0):
        """Drop, Pa, at flow ``q`` (m³/s). Infinite for ``q > 0`` at opening 0 or with the
        restrictor shut (it cannot pass)."""
        o = self._opening(opening)
        q = np.asarray(q, dtype=float)
        shape = np.broadcast(q, np.asarray(rho), np.asarray(mu)).shape
        qf = np.maximum(q, 0.0)
        if o == 0.0:
            fwd = np.where(qf > 0.0, np.inf, 0.0)
        else:
            fwd = np.asarray(self.restrictor.pressure_drop(qf / o, rho, mu).pressure_drop, dtype=float)
        if self.check is not None:
            rev = -self.check.pressure_drop(-q)
        else:
            rev = -np.asarray(self.restrictor.pressure_drop(np.maximum(-q, 0.0), rho, mu).pressure_drop, dtype=float)
        return np.broadcast_to(np.where(q >= 0.0, fwd, rev), shape).copy()

    def starved(self, dp):
        """A plain restrictor is never starved: all False."""
        return np.zeros(np.shape(dp), dtype=bool)


# --------------------------------------------------------------------------- compensated valve
@dataclass(frozen=True)
class CompensatedFlowValve:
    """2-way pressure-compensated flow valve (see the module text for the equations).

    Parameters
    ----------
    area : float
        Metering orifice area, m² (fully open).
    cd : float
        Discharge coefficient of the metering orifice (turbulent, constant).
    compensator_drop : float
        Metering drop held by the compensator spring, dpc, Pa.
    min_drop : float
        Minimum working drop across the whole valve, dp_min, Pa (>= dpc).
    droop : float
        Fractional flow rise per 100 bar of drop above ``min_drop`` (0.02 = 2 %).
    check : CheckValve
        The reverse free-flow check.
    """

    area: float
    cd: float = 0.61
    compensator_drop: float = 6 * _BAR
    min_drop: float = 8 * _BAR
    droop: float = 0.02
    check: CheckValve | None = field(default_factory=CheckValve)
    kind: str = "compensated"

    compensated = True

    def __post_init__(self):
        _num("area", self.area, "a metering area greater than 0 m²", low_open=True)
        _num("cd", self.cd, "a discharge coefficient greater than 0 and at most 1", low_open=True)
        if self.cd > 1.0:
            raise InputError("cd", self.cd, "a discharge coefficient greater than 0 and at most 1")
        _num("compensator_drop", self.compensator_drop, "a pressure greater than 0 bar", low_open=True)
        _num("min_drop", self.min_drop, "a pressure greater than 0 bar", low_open=True)
        if self.min_drop < self.compensator_drop:
            raise InputError("min_drop", f"{self.min_drop / _BAR:g} bar",
                             f"a minimum working drop at least the compensator spring drop "
                             f"({self.compensator_drop / _BAR:g} bar)")
        _num("droop", self.droop, "a fraction of at least 0 (0.02 = 2 % per 100 bar)")

    @classmethod
    def from_setting(cls, setting: float, rho: float, cd: float = 0.61, compensator_drop: float = 6 * _BAR,
                     min_drop: float = 8 * _BAR, droop: float = 0.02, check: CheckValve | None = None):
        """Valve whose metering area gives ``setting`` (m³/s) at density ``rho`` (kg/m³).

        ``A = Q_set / (Cd sqrt(2 dpc / rho))``.
        """
        q = _num("setting", setting, "a flow greater than 0 m³/s", low_open=True)
        r = _num("density", rho, "a density greater than 0 kg/m³", low_open=True)
        dpc = _num("compensator_drop", compensator_drop, "a pressure greater than 0 bar", low_open=True)
        area = q / (cd * math.sqrt(2.0 * dpc / r))
        return cls(area, cd, dpc, min_drop, droop, CheckValve() if check is None else check)

    def nominal_flow(self, rho, opening: float = 1.0):
        """Flow held at ``min_drop``, m³/s: ``o Cd A sqrt(2 dpc / rho)``."""
        o = check_opening(opening)
        return o * self.cd * self.area * np.sqrt(2.0 * self.compensator_drop / np.asarray(rho, dtype=float))

    def forward_flow(self, dp, rho, mu=None, opening: float = 1.0):
        """Forward flow only (negative drops give 0), m³/s."""
        dp = np.maximum(np.asarray(dp, dtype=float), 0.0)
        qn = self.nominal_flow(rho, opening)
        above = qn * (1.0 + self.droop * (dp - self.min_drop) / DROOP_SPAN)
        below = qn * np.sqrt(np.minimum(dp, self.min_drop) / self.min_drop)
        return np.where(dp >= self.min_drop, above, below)

    def flow(self, dp, rho, mu=None, opening: float = 1.0):
        """Flow, m³/s, at drop ``dp`` (Pa); reverse (dp < 0) through the check."""
        dp = np.asarray(dp, dtype=float)
        fwd = self.forward_flow(dp, rho, mu, opening)
        rev = -self.check.flow(-dp) if self.check is not None else np.zeros_like(dp)
        return np.where(dp >= 0.0, fwd, rev)

    def pressure_drop(self, q, rho, mu=None, opening: float = 1.0):
        """Smallest drop, Pa, that passes ``q`` (m³/s).

        ``dp_min (q/Qn)²`` up to ``Qn``; ``dp_min + (q/Qn - 1) 100 bar / droop`` above.
        Infinite where the valve cannot pass ``q`` at any drop (zero droop above ``Qn``, or
        a closed valve).
        """
        q = np.asarray(q, dtype=float)
        qn = np.broadcast_to(self.nominal_flow(rho, opening), np.broadcast(q, np.asarray(rho)).shape)
        qf = np.maximum(q, 0.0)
        with np.errstate(divide="ignore", invalid="ignore"):
            ratio = np.where(qn > 0.0, qf / np.where(qn > 0.0, qn, 1.0), np.where(qf > 0.0, np.inf, 0.0))
            below = self.min_drop * np.minimum(ratio, 1.0) ** 2
            if self.droop > 0.0:
                above = self.min_drop + (ratio - 1.0) * DROOP_SPAN / self.droop
            else:
                above = np.full_like(ratio, np.inf)
        fwd = np.where(ratio <= 1.0, below, above)
        rev = -self.check.pressure_drop(-q) if self.check is not None else np.zeros_like(q)
        return np.where(q >= 0.0, fwd, rev)

    def starved(self, dp):
        """True where the forward drop is below the minimum working drop (compensator wide open)."""
        return np.asarray(dp, dtype=float) < self.min_drop


# --------------------------------------------------------------------------- counterbalance
#: spring-chamber references of a counterbalance valve (see :class:`CounterbalanceValve`)
SPRING_CHAMBERS = ("outlet-referenced", "vented")
#: default drop of a counterbalance held fully open by its pilot, Pa per m³/s: 0.2 bar per
#: L/min (a small cartridge piloted fully open drops about 3 to 6 bar at 20 L/min; from memory)
CB_OPEN_GRADIENT_DEFAULT = 0.2 * _BAR / _LPM


@dataclass(frozen=True)
class CounterbalanceValve:
    """Pilot-assisted load-holding valve.

    Parameters
    ----------
    setting : float
        Opening pressure with no pilot and the outlet at 0 bar, p_set, Pa.
    pilot_ratio : float
        R, pilot area over seat area (> 0).
    gradient : float
        g, rise of the opening pressure per flow, Pa per m³/s (> 0).
    check : CheckValve
        Reverse free-flow check.
    spring_chamber : {"outlet-referenced", "vented"}
        Where the spring chamber drains. Force balance on the poppet (seat area A_s, pilot
        area R A_s, spring force p_set A_s; the outlet pressure acts on the seat annulus and,
        when the spring chamber drains to the outlet, on the back of the poppet and of the
        pilot piston)::

            outlet-referenced:  (p_in - p_out) + R (p_pilot - p_out) >= p_set
            vented (to air):     p_in + R p_pilot >= p_set

        i.e. the opening pressure ``p_set + k p_out - R p_pilot`` with ``k = 1 + R``
        (outlet-referenced) or ``k = 0`` (vented): a valve draining to its outlet has the
        outlet pressure added to its setting and taken off its pilot, roughly (1 + R) p_out
        (common practice for the usual cartridge whose spring chamber drains to the valve
        port; from memory).
    open_gradient : float
        r, drop of the valve held fully open by its pilot, Pa per m³/s (> 0): a fully open
        restriction, ``p_in - p_out = r q`` (:data:`CB_OPEN_GRADIENT_DEFAULT`).

    Forward flow: ``Q = min(max(p_in - p_open, 0) / g, max(p_in - p_out, 0) / r)`` with
    ``p_open = p_set + k p_out - R p_pilot``; the inverse is
    ``p_in = max(p_open + g Q, p_out + r Q)``.

    Worked example (by hand), outlet at 0: 40 + 3*32 - 130 = 6 bar over the opening point
    at 0.5 bar per L/min -> 12 L/min; fully open it would pass 40 bar / 0.2 = 200 L/min, so
    the metering term rules:

    >>> cb = CounterbalanceValve(130e5, 3.0, 0.5e5 / (1 / 60000))
    >>> round(float(cb.flow(40e5, 32e5)) * 60000, 6)
    12.0
    >>> float(cb.flow(40e5, 25e5))                           # 40 + 75 < 130: closed
    0.0
    >>> # outlet at 10 bar: outlet-referenced opens at 130 + 4*10 - 96 = 74 bar; vented at 34 bar
    >>> round(float(cb.opening_pressure(32e5, 10e5)) / 1e5, 6)
    74.0
    >>> vented = CounterbalanceValve(130e5, 3.0, 0.5e5 / (1 / 60000), spring_chamber="vented")
    >>> round(float(vented.opening_pressure(32e5, 10e5)) / 1e5, 6)
    34.0
    >>> # piloted wide open (pilot 60 bar): 10 L/min crosses it with 0.2 bar per L/min = 2 bar
    >>> round(float(cb.inlet_pressure(10 / 60000, 60e5, 0.0)) / 1e5, 6)
    2.0
    """

    setting: float
    pilot_ratio: float
    gradient: float
    check: CheckValve | None = field(default_factory=lambda: CheckValve(1.0 * _BAR))
    kind: str = "counterbalance"
    spring_chamber: str = "outlet-referenced"
    open_gradient: float = CB_OPEN_GRADIENT_DEFAULT

    def __post_init__(self):
        _num("setting", self.setting, "a pressure greater than 0 bar", low_open=True)
        _num("pilot_ratio", self.pilot_ratio, "a pilot ratio greater than 0 (for example 3 for 3:1)", low_open=True)
        _num("gradient", self.gradient, "a gradient greater than 0 Pa per m³/s", low_open=True)
        _num("open_gradient", self.open_gradient, "a gradient greater than 0 Pa per m³/s", low_open=True)
        if self.spring_chamber not in SPRING_CHAMBERS:
            raise InputError("spring_chamber", repr(self.spring_chamber), "one of " + ", ".join(SPRING_CHAMBERS))

    @property
    def outlet_factor(self) -> float:
        """k, the weight of the outlet pressure in the opening pressure: 1 + R or 0."""
        return 1.0 + self.pilot_ratio if self.spring_chamber == "outlet-referenced" else 0.0

    def opening_pressure(self, p_pilot, p_out=0.0):
        """Inlet pressure, Pa, at which the valve just opens: ``p_set + k p_out - R p_pilot``."""
        return (self.setting + self.outlet_factor * np.asarray(p_out, dtype=float)
                - self.pilot_ratio * np.asarray(p_pilot, dtype=float))

    def flow(self, p_in, p_pilot, p_out=0.0):
        """Flow, m³/s, from the load port (``p_in``) to the outlet (``p_out``); negative = reverse."""
        p_in = np.asarray(p_in, dtype=float)
        p_out = np.asarray(p_out, dtype=float)
        meter = np.maximum(p_in - self.opening_pressure(p_pilot, p_out), 0.0) / self.gradient
        wide = np.maximum(p_in - p_out, 0.0) / self.open_gradient
        fwd = np.minimum(meter, wide)
        rev = -self.check.flow(p_out - p_in) if self.check is not None else np.zeros_like(fwd)
        return np.where(p_in >= p_out, fwd, rev)

    def inlet_pressure(self, q, p_pilot, p_out=0.0):
        """Inlet pressure, Pa, that passes forward flow ``q`` (m³/s, >= 0) with pilot ``p_pilot``:
        ``max(p_open + g q, p_out + r q)`` (metering, or held fully open by the pilot)."""
        q = np.maximum(np.asarray(q, dtype=float), 0.0)
        p_out = np.asarray(p_out, dtype=float)
        return np.maximum(self.opening_pressure(p_pilot, p_out) + self.gradient * q, p_out + self.open_gradient * q)

    def outlet_pressure(self, q, p_in, p_pilot):
        """Highest outlet pressure, Pa, at which forward flow ``q`` (m³/s, >= 0) still passes
        from inlet ``p_in`` with pilot ``p_pilot``: the inverse of :meth:`inlet_pressure` in
        ``p_out``, ``min((p_in - p_set + R p_pilot - g q)/k, p_in - r q)``.

        A vented valve (k = 0) cannot be helped by a lower outlet: where its metering term
        cannot pass ``q`` at all the result falls steeply (1000 Pa per Pa short), which keeps
        it finite and decreasing for the solver.
        """
        q = np.maximum(np.asarray(q, dtype=float), 0.0)
        p_in = np.asarray(p_in, dtype=float)
        wide = p_in - self.open_gradient * q
        short = self.setting - self.pilot_ratio * np.asarray(p_pilot, dtype=float) + self.gradient * q - p_in
        k = self.outlet_factor
        if k > 0.0:
            return np.minimum(-short / k, wide)
        return wide - 1e3 * np.maximum(short, 0.0)


# --------------------------------------------------------------------------- back pressure
@dataclass(frozen=True)
class BackPressureValve:
    """Direct-acting relief in series in the return line: ``p_in - p_out = p_set + g q``.

    >>> bp = BackPressureValve(30e5, 1e5 / (1 / 60000))      # 30 bar + 1 bar per L/min
    >>> round(float(bp.inlet_pressure(10 / 60000, 2e5)) / 1e5, 6)
    42.0
    >>> round(float(bp.flow(42e5, 2e5)) * 60000, 6)
    10.0
    """

    setting: float
    gradient: float
    check: CheckValve | None = field(default_factory=lambda: CheckValve(1.0 * _BAR))
    kind: str = "back-pressure"

    pilot_ratio = 0.0

    def __post_init__(self):
        _num("setting", self.setting, "a pressure greater than 0 bar", low_open=True)
        _num("gradient", self.gradient, "a gradient greater than 0 Pa per m³/s", low_open=True)

    def flow(self, p_in, p_out=0.0):
        """Flow, m³/s, from inlet to outlet; negative = reverse through the check."""
        dp = np.asarray(p_in, dtype=float) - np.asarray(p_out, dtype=float)
        fwd = np.maximum(dp - self.setting, 0.0) / self.gradient
        rev = -self.check.flow(-dp) if self.check is not None else np.zeros_like(dp)
        return np.where(dp >= 0.0, fwd, rev)

    def inlet_pressure(self, q, p_out=0.0):
        """Inlet pressure, Pa, while forward flow ``q`` (m³/s, >= 0) crosses it."""
        q = np.maximum(np.asarray(q, dtype=float), 0.0)
        return np.asarray(p_out, dtype=float) + self.setting + self.gradient * q


__all__ = ["CheckValve", "RestrictorValve", "CompensatedFlowValve", "CounterbalanceValve", "BackPressureValve",
           "CHECK_GRADIENT_DEFAULT", "DROOP_SPAN", "check_opening", "SPRING_CHAMBERS", "CB_OPEN_GRADIENT_DEFAULT"]
