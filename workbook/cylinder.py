"""Double-acting cylinder: areas, area ratio, force balance and the ISO 3320 series.

Geometry (bore ``D``, rod ``d``)::

    A1  = pi D² / 4                 piston (cap-side, full-bore) area
    A3  = pi (D² - d²) / 4          annulus (rod-side) area
    phi = A1 / A3                   area ratio

Force balance on the piston with gauge pressures ``p1`` (cap) and ``p3`` (rod) is exact
because the outer end of the rod sits in the atmosphere::

    F_hydraulic = p1 A1 - p3 A3

Worked example, an 80/45 cylinder:

>>> c = Cylinder(bore=0.080, rod=0.045, stroke=0.6, rated_pressure=210e5)
>>> round(c.a1 * 1e4, 3), round(c.a3 * 1e4, 3), round(c.phi, 4)
(50.265, 34.361, 1.4628)
>>> round(c.force(160e5, 0.0) / 1e3, 2)          # kN pushing out at 160 bar
80.42

Reference: ISO 3320, Fluid power systems and components - Cylinder bores and piston rod
diameters - Metric series; Euler buckling and Merritt's hydraulic natural frequency below.
"""

from __future__ import annotations

import math
from dataclasses import dataclass

import numpy as np

from .errors import InputError
from .formatting import with_article

#: ISO 3320 cylinder bores, first choice, mm (from memory of the standard's table)
ISO3320_BORES_MM = (8, 10, 12, 16, 20, 25, 32, 40, 50, 63, 80, 100, 125, 160, 200, 250, 320, 400, 500)
#: ISO 3320 second-choice bores, mm (from memory of the standard's table)
ISO3320_BORES_SECOND_MM = (90, 110, 140, 180, 220, 280, 360, 450)
#: ISO 3320 piston rod diameters, mm (from memory of the standard's table)
ISO3320_RODS_MM = (4, 5, 6, 8, 10, 12, 14, 16, 18, 20, 22, 25, 28, 32, 36, 40, 45, 50, 56, 63, 70, 80,
                   90, 100, 110, 125, 140, 160, 180, 200, 220, 250, 280, 320, 360)

#: default yield strength of the rod steel, Pa (from memory: C45 normalised about 355 MPa)
ROD_YIELD_DEFAULT = 355e6

#: Euler end-fixing factors: effective length over actual length (common practice)
EULER_LENGTH_FACTOR = {
    "pinned-pinned": 1.0,
    "fixed-free": 2.0,
    "fixed-pinned": 0.7,
    "fixed-fixed": 0.5,
}


def _positive(name: str, value) -> float:
    try:
        v = float(value)
    except (TypeError, ValueError):
        raise InputError(name, repr(value), "a number in SI units greater than 0") from None
    if not math.isfinite(v) or v <= 0:
        raise InputError(name, value, "a finite value greater than 0")
    return v


def _out(x):
    """A float for a scalar result, an array otherwise."""
    return float(x) if np.ndim(x) == 0 else x


@dataclass(frozen=True)
class Cylinder:
    """Double-acting single-rod cylinder (all SI).

    Parameters
    ----------
    bore : float
        Piston diameter D, m.
    rod : float
        Rod diameter d, m; smaller than the bore.
    stroke : float
        Stroke, m.
    rated_pressure : float
        Maximum working pressure from the data sheet, Pa (gauge).
    """

    bore: float
    rod: float
    stroke: float = 1.0
    rated_pressure: float = 210e5
    mounting: str = "pinned-pinned"
    buckling_length: float | None = None
    rod_yield: float = ROD_YIELD_DEFAULT

    def __post_init__(self):
        for name in ("bore", "rod", "stroke", "rated_pressure"):
            object.__setattr__(self, name, _positive(name, getattr(self, name)))
        if self.mounting not in EULER_LENGTH_FACTOR:
            raise InputError("mounting", repr(self.mounting), "one of " + ", ".join(EULER_LENGTH_FACTOR))
        if self.buckling_length is not None:
            object.__setattr__(self, "buckling_length", _positive("buckling_length", self.buckling_length))
        object.__setattr__(self, "rod_yield", _positive("rod_yield", self.rod_yield))
        if not self.rod < self.bore:
            raise InputError("rod", f"{self.rod * 1e3:g} mm",
                             f"a rod diameter smaller than the bore ({self.bore * 1e3:g} mm)")

    @classmethod
    def from_values(cls, values) -> "Cylinder":
        """From the parsed ``cylinder`` section of :mod:`workbook.inputs`."""
        return cls(values["bore"], values["rod"], values["stroke"], values["rated_pressure"],
                   values.get("mounting", "pinned-pinned"), values.get("buckling_length"),
                   values.get("rod_yield") or ROD_YIELD_DEFAULT)

    @property
    def a1(self) -> float:
        """Piston area, m²."""
        return math.pi * self.bore ** 2 / 4.0

    @property
    def rod_area(self) -> float:
        """Rod cross-section, m²."""
        return math.pi * self.rod ** 2 / 4.0

    @property
    def a3(self) -> float:
        """Annulus area, m²."""
        return math.pi * (self.bore ** 2 - self.rod ** 2) / 4.0

    @property
    def phi(self) -> float:
        """Area ratio A1/A3 (dimensionless)."""
        return self.a1 / self.a3

    def force(self, p1, p3):
        """Hydraulic force pushing the rod out, N: ``p1 A1 - p3 A3`` (p in Pa gauge)."""
        return _out(np.asarray(p1) * self.a1 - np.asarray(p3) * self.a3)

    def cap_pressure(self, force, p3=0.0):
        """Cap pressure for a rod-out force and rod pressure: ``p1 = (F + p3 A3)/A1``, Pa."""
        return _out((np.asarray(force) + np.asarray(p3) * self.a3) / self.a1)

    def rod_pressure(self, force, p1=0.0):
        """Rod pressure for a rod-out force and cap pressure: ``p3 = (p1 A1 - F)/A3``, Pa.

        With the meter-out valve closed and no load, ``p3 = p1 * phi``: the area ratio
        multiplies supply pressure (common practice).

        >>> c = Cylinder(0.080, 0.045)
        >>> round(c.rod_pressure(0.0, 160e5) / 1e5, 1)
        234.1
        """
        return _out((np.asarray(p1) * self.a1 - np.asarray(force)) / self.a3)

    def speed_extend(self, q_in):
        """Extending speed, m/s, for a flow into the cap chamber, m³/s: ``v = Q / A1``."""
        return _out(np.asarray(q_in) / self.a1)

    def speed_retract(self, q_in):
        """Retracting speed, m/s, for a flow into the rod chamber, m³/s: ``v = Q / A3``."""
        return _out(np.asarray(q_in) / self.a3)

    def euler_buckling_load(self, youngs_modulus: float = 2.1e11, mounting: str | None = None,
                            length: float | None = None) -> float:
        """Euler critical load of the rod, N: ``F_k = pi² E I / (K L)²``, ``I = pi d⁴/64``.

        ``length`` defaults to the stroke; ``mounting`` (default: the cylinder's own) sets the
        effective-length factor K (:data:`EULER_LENGTH_FACTOR`). Apply a safety factor (3.5 is
        common practice, from memory). The rod alone is taken to carry the bending (the tube is
        stiffer): a conservative simplification. E = 2.1e11 Pa for steel (common practice).

        # I = pi 0.045**4/64 = 2.013e-7 m4; F = pi**2 2.1e11 I / 0.6**2
        >>> round(Cylinder(0.08, 0.045, 0.6).euler_buckling_load() / 1e3)
        1159
        """
        mounting = self.mounting if mounting is None else mounting
        if mounting not in EULER_LENGTH_FACTOR:
            raise InputError("mounting", repr(mounting), "one of " + ", ".join(EULER_LENGTH_FACTOR))
        length = self.stroke if length is None else _positive("length", length)
        inertia = math.pi * self.rod ** 4 / 64.0
        k = EULER_LENGTH_FACTOR[mounting]
        return math.pi ** 2 * youngs_modulus * inertia / (k * length) ** 2

    @property
    def estimated_length(self) -> float:
        """Pin-to-pin length of the extended cylinder estimated from bore and stroke, m:
        ``L = stroke + L_closed``, ``L_closed = stroke + 4 D`` (heads, piston, guide and the
        two pin eyes of a clevis-mounted cylinder take about three to four bores; the high end
        is taken, from memory). Longer than twice the stroke, hence conservative for short
        strokes, where the dead length dominates.

        >>> round(Cylinder(0.08, 0.045, 0.1).estimated_length, 6)     # 2 x 0.1 + 4 x 0.08
        0.52
        """
        return 2.0 * self.stroke + 4.0 * self.bore

    @property
    def length_estimated(self) -> bool:
        """True when no buckling length was given and :attr:`estimated_length` is used."""
        return self.buckling_length is None

    @property
    def free_length(self) -> float:
        """Buckling length of the extended cylinder, m: the given pin-to-pin length, else
        :attr:`estimated_length`."""
        return self.buckling_length if self.buckling_length is not None else self.estimated_length

    def slenderness(self, length: float | None = None, mounting: str | None = None) -> float:
        """Slenderness ratio of the rod ``lambda = K L / i`` with ``i = d / 4`` (solid round)."""
        mounting = self.mounting if mounting is None else mounting
        length = self.free_length if length is None else _positive("length", length)
        return EULER_LENGTH_FACTOR[mounting] * length / (self.rod / 4.0)

    def transition_slenderness(self, youngs_modulus: float = 2.1e11) -> float:
        """Slenderness where the Johnson parabola meets Euler's curve: ``pi sqrt(2 E / s_y)``."""
        return math.pi * math.sqrt(2.0 * youngs_modulus / self.rod_yield)

    def buckling_load(self, length: float | None = None, youngs_modulus: float = 2.1e11,
                      mounting: str | None = None) -> float:
        """Critical load of the rod, N: Euler above the transition slenderness, the Johnson
        parabola below it (short rods, where Euler over-estimates)::

            lambda >= lambda_c:  F = pi² E I / (K L)²
            lambda <  lambda_c:  F = A_rod (s_y - (s_y lambda / (2 pi))² / E)

        Johnson parabola (J. B. Johnson; as in Shigley, Mechanical Engineering Design),
        tangent to Euler's curve at ``lambda_c = pi sqrt(2 E / s_y)`` where the critical
        stress is half the yield strength.

        Worked example (by hand): 45 mm rod, 355 MPa, pinned, 0.6 m: lambda = 0.6 / 0.01125
        = 53.3, lambda_c = pi sqrt(2 × 2.1e11 / 3.55e8) = 108.1: Johnson,
        s = 355e6 - (355e6 × 53.33 / (2 pi))² / 2.1e11 = 355e6 - 43.18e6 = 311.8e6 Pa; A_rod =
        1.5904e-3 m², F = 495.9 kN (Euler would claim 1159 kN).

        >>> round(Cylinder(0.08, 0.045, 0.6).buckling_load(0.6) / 1e3, 1)
        495.9
        """
        length = self.free_length if length is None else _positive("length", length)
        lam = self.slenderness(length, mounting)
        if lam >= self.transition_slenderness(youngs_modulus):
            return self.euler_buckling_load(youngs_modulus, mounting, length)
        sy = self.rod_yield
        return self.rod_area * (sy - (sy * lam / (2.0 * math.pi)) ** 2 / youngs_modulus)

    def natural_frequency(self, bulk_modulus, mass: float, position: float,
                          dead_volume_cap: float = 0.0, dead_volume_rod: float = 0.0, bulk_modulus_rod=None):
        """Hydraulic natural frequency, rad/s, with the piston at ``position`` (m from the cap end).

        ``w0 = sqrt((E1' A1²/V1 + E3' A3²/V3) / m)``, ``V1 = A1 x + V1dead``,
        ``V3 = A3 (stroke - x) + V3dead`` (Merritt, Hydraulic Control Systems, 1967; the two
        oil columns as springs in parallel on the piston). ``bulk_modulus`` is E1' (and E3'
        unless ``bulk_modulus_rod`` is given); either may be an array over ``position``.

        >>> c = Cylinder(0.08, 0.045, 0.6)
        >>> # mid-stroke, 1 GPa, 800 kg: k = 1e9 (A1 + A3)/0.3 = 1e9 x 84.626e-4/0.3 = 2.8209e7 N/m,
        >>> # w0 = sqrt(2.8209e7 / 800) = 187.78 rad/s
        >>> round(float(c.natural_frequency(1e9, 800.0, 0.3)), 2)
        187.78
        """
        e1 = np.asarray(bulk_modulus, dtype=float)
        e3 = e1 if bulk_modulus_rod is None else np.asarray(bulk_modulus_rod, dtype=float)
        if not (np.all(np.isfinite(e1)) and np.all(e1 > 0) and np.all(np.isfinite(e3)) and np.all(e3 > 0)):
            raise InputError("bulk_modulus", bulk_modulus, "a finite value greater than 0")
        m = _positive("mass", mass)
        x = np.clip(np.asarray(position, dtype=float), 0.0, self.stroke)
        v1 = self.a1 * x + dead_volume_cap
        v3 = self.a3 * (self.stroke - x) + dead_volume_rod
        tiny = 1e-12
        return np.sqrt((e1 * self.a1 ** 2 / np.maximum(v1, tiny) + e3 * self.a3 ** 2 / np.maximum(v3, tiny)) / m)


def smallest_standard_bore(force: float, pressure: float, rod_ratio: float | None = None) -> float:
    """Smallest ISO 3320 bore, m, whose piston area develops ``force`` (N) at ``pressure`` (Pa).

    With ``rod_ratio`` (d/D) given, the annulus must develop it instead (pulling).

    >>> smallest_standard_bore(60e3, 160e5)    # needs 69.1 mm: next standard is 80 mm
    0.08
    """
    f = _positive("force", force)
    p = _positive("pressure", pressure)
    for bore_mm in ISO3320_BORES_MM:
        d = bore_mm / 1000.0
        area = math.pi * d ** 2 / 4.0
        if rod_ratio is not None:
            area *= 1.0 - rod_ratio ** 2
        if area * p >= f:
            return d
    raise InputError("force", f"{f / 1e3:g} kN",
                     f"a force that {with_article(f'{ISO3320_BORES_MM[-1]} mm bore')} can develop at {p / 1e5:g} bar")


def standard_rods_for(bore: float) -> tuple[float, ...]:
    """ISO 3320 rods (m) smaller than ``bore`` (m), for a selection list."""
    b = _positive("bore", bore)
    return tuple(r / 1000.0 for r in ISO3320_RODS_MM if r / 1000.0 < b)


def is_standard_bore(bore: float) -> bool:
    """True if ``bore`` (m) is in the ISO 3320 series (within 1 µm)."""
    return any(abs(bore - b / 1000.0) < 1e-6 for b in ISO3320_BORES_MM)


def is_standard_rod(rod: float) -> bool:
    """True if ``rod`` (m) is in the ISO 3320 series (within 1 µm)."""
    return any(abs(rod - r / 1000.0) < 1e-6 for r in ISO3320_RODS_MM)


__all__ = ["Cylinder", "ISO3320_BORES_MM", "ISO3320_RODS_MM", "EULER_LENGTH_FACTOR", "ROD_YIELD_DEFAULT",
           "smallest_standard_bore", "standard_rods_for", "is_standard_bore", "is_standard_rod", "ISO3320_BORES_SECOND_MM"]
