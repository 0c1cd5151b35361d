"""Power unit: a fixed-displacement pump and its relief valve (all SI, gauge pressures).

Pump: a fixed-displacement pump delivers a nearly constant flow whatever the pressure::

    Q_pump = V_g * n * eta_v          V_g m³/rev, n rev/s, eta_v volumetric efficiency

Relief valve: closed below its cracking pressure, then opening with a linear override
gradient so that the whole pump flow crosses it at the full-flow pressure::

    q_relief = 0                                  p <= p_crack
    q_relief = (p - p_crack) / g                  p >  p_crack
    g = (p_full - p_crack) / Q_pump               override gradient, Pa per m³/s

Worked example (a 16 cm³/rev pump at 1450 rpm, 93 % volumetric efficiency, relief cracking
at 160 bar and passing the full flow at 172 bar):

>>> s = Supply(Pump.from_displacement(16e-6, 1450 / 60, 0.93), ReliefValve(160e5, 172e5, 21.576e-3 / 60))
>>> round(s.pump.flow * 60e3, 3)              # L/min: 16 * 1450 * 0.93 / 1000
21.576
>>> round(float(s.relief.flow(166e5)) * 60e3, 3)   # half-way up the override: half the flow
10.788
>>> round(float(s.relief.pressure(s.pump.flow)) / 1e5, 1)
172.0

Reference: the fixed pump and direct-acting relief characteristics are the textbook
steady-state models (Merritt, Hydraulic Control Systems, 1967; from memory); ISO 4413 asks
for a relief valve on every pump line.
"""

from __future__ import annotations

import math
from dataclasses import dataclass
from typing import Mapping

import numpy as np

from .constants import BAR as _BAR
from .errors import InputError


def _finite_positive(field: str, value, unit_words: str) -> float:
    try:
        v = float(value)
    except (TypeError, ValueError):
        raise InputError(field, repr(value), f"a number greater than 0 ({unit_words})") from None
    if not math.isfinite(v) or v <= 0.0:
        raise InputError(field, value, f"a finite number greater than 0 ({unit_words})")
    return v


@dataclass(frozen=True)
class Pump:
    """Fixed-displacement pump delivering a constant ``flow`` (m³/s).

    >>> round(Pump.from_displacement(16e-6, 1450 / 60, 0.93).flow * 60e3, 2)
    21.58
    >>> float(Pump(3.6e-4).delivered(np.array([0.0, 150e5]))[1])   # constant with pressure
    0.00036
    """

    flow: float

    def __post_init__(self):
        object.__setattr__(self, "flow", _finite_positive("pump_flow", self.flow, "m³/s"))

    @classmethod
    def from_displacement(cls, displacement: float, shaft_speed: float,
                          volumetric_efficiency: float = 1.0) -> "Pump":
        """Pump from displacement (m³/rev), shaft speed (rev/s) and volumetric efficiency (-)."""
        vg = _finite_positive("displacement", displacement, "m³ per revolution")
        n = _finite_positive("shaft_speed", shaft_speed, "revolutions per second")
        eta = float(volumetric_efficiency)
        if not (math.isfinite(eta) and 0.0 < eta <= 1.0):
            raise InputError("volumetric_efficiency", volumetric_efficiency, "a fraction greater than 0 and at most 1")
        return cls(vg * n * eta)

    def delivered(self, pressure):
        """Delivered flow, m³/s, at pump pressure ``pressure`` (Pa): constant."""
        return np.full_like(np.asarray(pressure, dtype=float), self.flow)


@dataclass(frozen=True)
class ReliefValve:
    """Direct-acting relief valve with a linear override.

    Parameters
    ----------
    cracking : float
        Cracking pressure, Pa gauge.
    full_flow : float
        Pressure at which ``rated_flow`` crosses the valve, Pa gauge; above ``cracking``.
    rated_flow : float
        The flow at ``full_flow`` (the pump flow), m³/s.

    >>> r = ReliefValve(100e5, 110e5, 1e-3)
    >>> r.flow(np.array([50e5, 100e5, 105e5])).tolist()
    [0.0, 0.0, 0.0005]
    """

    cracking: float
    full_flow: float
    rated_flow: float

    def __post_init__(self):
        c = _finite_positive("relief_cracking", self.cracking, "Pa")
        f = _finite_positive("relief_full_flow", self.full_flow, "Pa")
        _finite_positive("pump_flow", self.rated_flow, "m³/s")
        if not f > c:
            raise InputError("relief_full_flow", f"{f / _BAR:g} bar",
                             f"a pressure above the relief cracking pressure ({c / _BAR:g} bar)")

    @property
    def gradient(self) -> float:
        """Override gradient, Pa per m³/s."""
        return (self.full_flow - self.cracking) / self.rated_flow

    def flow(self, pressure, p_out=0.0):
        """Relief flow, m³/s, at inlet pressure ``pressure`` (Pa gauge) with its outlet at
        ``p_out`` (the tank port's back pressure, Pa): ``max(p - p_out - p_crack, 0)/g``.

        The settings are drops across the valve: a direct-acting relief whose spring chamber
        drains to its outlet opens at the cracking pressure above its outlet (common practice).

        >>> r = ReliefValve(100e5, 110e5, 1e-3)
        >>> float(r.flow(105e5, p_out=5e5))
        0.0
        """
        p = np.asarray(pressure, dtype=float)
        return np.maximum(p - np.asarray(p_out, dtype=float) - self.cracking, 0.0) / self.gradient

    def pressure(self, flow, p_out=0.0):
        """Inlet pressure, Pa, while ``flow`` (m³/s, >= 0) crosses the valve to an outlet at
        ``p_out`` (Pa): ``p_out + p_crack + g q``.

        At zero flow this returns the cracking pressure (the highest pressure with the
        valve still closed).

        >>> round(float(ReliefValve(100e5, 110e5, 1e-3).pressure(1e-3, p_out=2e5)) / 1e5, 6)
        112.0
        """
        q = np.maximum(np.asarray(flow, dtype=float), 0.0)
        return np.asarray(p_out, dtype=float) + self.cracking + self.gradient * q


#: default overall efficiency of a fixed pump, shaft power to hydraulic power (from memory:
#: gear and vane pumps about 0.80 to 0.90 near their rated point)
OVERALL_EFFICIENCY_DEFAULT = 0.85


@dataclass(frozen=True)
class Supply:
    """Pump, relief valve, installed drive power (W), the pump's overall efficiency and its
    geometric flow (m³/s, displacement × speed; ``None`` = the delivered flow).

    Shaft power from hydraulic power (common practice; any fluid-power handbook)::

        P_shaft = p Q_delivered / eta_total,     eta_total = eta_vol * eta_hydromechanical

    The geometric flow is what the pump draws through its suction line when its leakage
    goes to a case drain: the conservative figure for the suction line (common practice).

    >>> s = Supply(Pump(0.9e-3), ReliefValve(100e5, 110e5, 0.9e-3), 15e3, 0.8, 1e-3)
    >>> round(float(s.shaft_power(100e5)))      # 100e5 Pa x 0.9e-3 m³/s = 9 kW, / 0.8
    11250
    >>> s.suction_flow
    0.001
    """

    pump: Pump
    relief: ReliefValve
    drive_power: float = math.inf
    overall_efficiency: float = OVERALL_EFFICIENCY_DEFAULT
    geometric_flow: float | None = None

    def __post_init__(self):
        eta = float(self.overall_efficiency)
        if not (math.isfinite(eta) and 0.0 < eta <= 1.0):
            raise InputError("overall_efficiency", self.overall_efficiency, "a fraction greater than 0 and at most 1")
        if self.geometric_flow is not None:
            _finite_positive("geometric_flow", self.geometric_flow, "m³/s")

    @property
    def flow(self) -> float:
        """Pump flow, m³/s."""
        return self.pump.flow

    @property
    def suction_flow(self) -> float:
        """Flow through the suction line, m³/s: the geometric flow (the delivered flow when
        it is not known)."""
        return self.pump.flow if self.geometric_flow is None else max(self.geometric_flow, self.pump.flow)

    def shaft_power(self, pressure):
        """Pump shaft power, W, at pump pressure ``pressure`` (Pa): ``p Q / eta_total``."""
        return np.asarray(pressure, dtype=float) * self.pump.flow / self.overall_efficiency

    def pressure_for_delivery(self, q_out):
        """Pump pressure, Pa, while ``q_out`` (m³/s) of the pump flow leaves to the circuit.

        The rest, ``Q_pump - q_out``, crosses the relief. Valid while the relief is open
        (``q_out < Q_pump``); at ``q_out >= Q_pump`` it returns the cracking pressure.

        >>> s = Supply(Pump(1e-3), ReliefValve(100e5, 110e5, 1e-3))
        >>> s.pressure_for_delivery(np.array([0.0, 5e-4, 1e-3])).round(-3).tolist()
        [11000000.0, 10500000.0, 10000000.0]
        """
        q = np.asarray(q_out, dtype=float)
        return self.relief.pressure(np.maximum(self.pump.flow - q, 0.0))

    @classmethod
    def from_values(cls, values: Mapping) -> "Supply":
        """From the parsed ``supply`` section (SI floats) of :mod:`workbook.inputs`.

        ``pump_flow``, when given, overrides displacement × speed × efficiency.

        >>> Supply.from_values({"displacement": 16e-6, "shaft_speed": 24.0, "volumetric_efficiency": 1.0,
        ...     "pump_flow": None, "relief_cracking": 150e5, "relief_full_flow": 140e5, "drive_power": 7.5e3})
        Traceback (most recent call last):
        ...
        workbook.errors.InputError: relief_full_flow: got 140 bar; allowed: a pressure above the relief cracking pressure (150 bar)
        """
        v = dict(values)
        geometric = None
        if v.get("pump_flow") is not None:
            pump = Pump(v["pump_flow"])
            eta_v = v.get("volumetric_efficiency") or 1.0
            geometric = pump.flow / eta_v
        else:
            for key in ("displacement", "shaft_speed"):
                if v.get(key) is None:
                    raise InputError(key, "nothing", "a value, or give pump_flow directly")
            pump = Pump.from_displacement(v["displacement"], v["shaft_speed"], v.get("volumetric_efficiency", 1.0))
            geometric = v["displacement"] * v["shaft_speed"]
        for key in ("relief_cracking", "relief_full_flow"):
            if v.get(key) is None:
                raise InputError(key, "nothing", "a pressure greater than 0 bar")
        relief = ReliefValve(v["relief_cracking"], v["relief_full_flow"], pump.flow)
        drive = v.get("drive_power")
        drive = math.inf if drive is None else _finite_positive("drive_power", drive, "W")
        eta = v.get("overall_efficiency")
        return cls(pump, relief, drive, OVERALL_EFFICIENCY_DEFAULT if eta is None else eta, geometric)


__all__ = ["Pump", "ReliefValve", "Supply", "OVERALL_EFFICIENCY_DEFAULT"]
