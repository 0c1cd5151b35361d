"""Hydraulic oil: viscosity over temperature (ASTM D341), density and bulk modulus.

Viscosity follows the two-constant Walther equation of ASTM D341::

    log10(log10(nu + 0.7)) = A - B * log10(T)

with ``nu`` in mm²/s (cSt) and ``T`` in kelvin, fitted through two datasheet points
(40 °C and 100 °C). The constant 0.7 holds down to about 2 mm²/s (ASTM D341); below
that the standard adds further terms, so this model refuses to extrapolate there.

Density falls with the volumetric expansion coefficient ``alpha`` (nearly linearly over the
working range)::

    rho(T) = rho15 / (1 + alpha * (T - 288.15 K))

ISO 3448 viscosity grades (VG 10 to VG 150) fix the 40 °C midpoint within ±10 %; the
100 °C values of the presets are typical datasheet values for a mineral oil of viscosity
index about 100 (from memory) and can be overwritten.

Worked example (VG 46 preset, 46 cSt at 40 °C and 6.8 cSt at 100 °C):

>>> oil = Oil.from_grade("VG46")
>>> round(oil.kinematic_viscosity_cst(313.15), 3), round(oil.kinematic_viscosity_cst(373.15), 3)
(46.0, 6.8)
>>> round(oil.kinematic_viscosity_cst(333.15), 1)    # 60 °C
20.6
>>> round(oil.density(313.15), 1)
855.0

Reference: ASTM D341, Standard Practice for Viscosity-Temperature Equations and Charts
for Liquid Petroleum or Hydrocarbon Products; ISO 3448, Industrial liquid lubricants -
ISO viscosity classification.
"""

from __future__ import annotations

import math
from dataclasses import dataclass
from typing import Mapping

import numpy as np

from .constants import P_ATM, T0_C  # noqa: F401  (re-exported: fluid.P_ATM, fluid.T0_C)
from .errors import InputError, ModelValidityError

#: reference temperature of the density, K (15 °C)
T_DENSITY_REF = 288.15
#: lowest kinematic viscosity for which the ASTM D341 constant 0.7 holds, m²/s
NU_MIN_VALID = 2.0e-6

#: ISO 3448 grade midpoints at 40 °C, cSt; limits are ±10 % (ISO 3448)
ISO3448_MIDPOINT_CST = {"VG10": 10.0, "VG15": 15.0, "VG22": 22.0, "VG32": 32.0, "VG46": 46.0, "VG68": 68.0,
                        "VG100": 100.0, "VG150": 150.0}
#: typical 100 °C viscosity of a mineral oil of viscosity index about 100, cSt (from memory)
TYPICAL_NU100_CST = {"VG10": 2.6, "VG15": 3.4, "VG22": 4.3, "VG32": 5.4, "VG46": 6.8, "VG68": 8.7,
                     "VG100": 11.1, "VG150": 14.7}
#: polytropic index of entrained air compressed quickly (adiabatic, diatomic gas)
KAPPA_AIR = 1.4
#: Young's modulus of steel, Pa (common practice)
E_STEEL = 2.1e11


def iso3448_limits(grade: str) -> tuple[float, float]:
    """Lower and upper 40 °C kinematic viscosity of an ISO 3448 grade, in m²/s.

    >>> [round(x * 1e6, 1) for x in iso3448_limits("VG46")]
    [41.4, 50.6]
    """
    mid = _grade_mid(grade)
    return 0.9 * mid * 1e-6, 1.1 * mid * 1e-6


def _grade_mid(grade: str) -> float:
    key = grade.replace(" ", "").upper()
    if key not in ISO3448_MIDPOINT_CST:
        raise InputError("grade", repr(grade), "one of " + ", ".join(ISO3448_MIDPOINT_CST))
    return ISO3448_MIDPOINT_CST[key]


def walther_constants(nu1: float, t1: float, nu2: float, t2: float) -> tuple[float, float]:
    """Constants ``A`` and ``B`` of ASTM D341 through two points.

    Parameters
    ----------
    nu1, nu2 : float
        Kinematic viscosities, m²/s (each at least 2 mm²/s).
    t1, t2 : float
        Their temperatures, K (different).

    Returns ``(A, B)`` for ``log10(log10(nu_cst + 0.7)) = A - B*log10(T)``.

    >>> a, b = walther_constants(46e-6, 313.15, 6.8e-6, 373.15)
    >>> round(b, 4)
    3.6844
    """
    w1 = np.log10(np.log10(nu1 * 1e6 + 0.7))
    w2 = np.log10(np.log10(nu2 * 1e6 + 0.7))
    b = (w1 - w2) / (np.log10(t2) - np.log10(t1))
    a = w1 + b * np.log10(t1)
    return float(a), float(b)


@dataclass(frozen=True)
class Oil:
    """A hydraulic oil described by datasheet values (all SI).

    Parameters
    ----------
    nu40 : float
        Kinematic viscosity at 40 °C, m²/s (46 cSt = 46e-6 m²/s).
    nu100 : float
        Kinematic viscosity at 100 °C, m²/s; must be below ``nu40``.
    density15 : float
        Density at 15 °C, kg/m³ (about 870 for mineral oil, from memory).
    expansion : float
        Volumetric thermal expansion coefficient, 1/K (about 7e-4, from memory).
    bulk_modulus : float
        Effective bulk modulus, Pa (1.4 to 1.8 GPa for pure mineral oil; lower with hoses
        and entrained air; from memory).
    pour_point : float
        Lowest temperature at which the model is used, K.
    name : str
        Label for reports.
    """

    nu40: float
    nu100: float
    density15: float = 870.0
    expansion: float = 7.0e-4
    bulk_modulus: float = 1.4e9
    pour_point: float = T0_C - 30.0
    name: str = "custom"

    def __post_init__(self):
        for key in ("nu40", "nu100", "density15", "bulk_modulus"):
            v = getattr(self, key)
            if not (isinstance(v, (int, float)) and np.isfinite(v) and v > 0):
                raise InputError(key, v, "a finite value greater than 0")
        if self.nu100 < NU_MIN_VALID or self.nu40 < NU_MIN_VALID:
            raise InputError("nu100", f"{self.nu100 * 1e6:g} cSt",
                             "a viscosity of at least 2 cSt (ASTM D341 constant 0.7 holds above it)")
        if not self.nu100 < self.nu40:
            raise InputError("nu100", f"{self.nu100 * 1e6:g} cSt",
                             f"a viscosity below the 40 °C value ({self.nu40 * 1e6:g} cSt)")
        if not (np.isfinite(self.expansion) and 0 <= self.expansion < 0.01):
            raise InputError("expansion", self.expansion, "a coefficient from 0 to 0.01 1/K")
        if not (np.isfinite(self.pour_point) and 0 < self.pour_point < T0_C + 40):
            raise InputError("pour_point", self.pour_point, "a temperature above absolute zero and below 40 degC")
        a, b = walther_constants(self.nu40, T0_C + 40, self.nu100, T0_C + 100)
        object.__setattr__(self, "_a", a)
        object.__setattr__(self, "_b", b)

    # -------------------------------------------------------------- construction
    @classmethod
    def from_grade(cls, grade: str, nu100: float | None = None, **kw) -> "Oil":
        """An oil of ISO 3448 ``grade`` ("VG22" ... "VG100") at its 40 °C midpoint.

        >>> round(Oil.from_grade("VG32").nu40 * 1e6, 6)
        32.0
        """
        mid = _grade_mid(grade)
        key = grade.replace(" ", "").upper()
        return cls(nu40=mid * 1e-6, nu100=nu100 if nu100 is not None else TYPICAL_NU100_CST[key] * 1e-6,
                   name=f"ISO {key}", **kw)

    @classmethod
    def from_values(cls, values: Mapping) -> "Oil":
        """From the parsed ``oil`` section of :mod:`workbook.inputs` (SI values).

        A grade other than ``custom`` sets the 40 °C viscosity to its ISO 3448 midpoint
        unless ``nu40`` was given and lies inside the grade's ±10 % band.
        """
        grade = values.get("grade", "custom")
        nu40 = values["nu40"]
        name = "custom"
        if grade != "custom":
            lo, hi = iso3448_limits(grade)
            if not (lo <= nu40 <= hi):
                raise InputError("oil.nu40", f"{nu40 * 1e6:g} cSt",
                                 f"a 40 °C viscosity within ISO 3448 {grade} ({lo * 1e6:.1f} to {hi * 1e6:.1f} cSt), "
                                 "or grade 'custom'")
            name = f"ISO {grade}"
        return cls(nu40=nu40, nu100=values["nu100"], density15=values["density15"],
                   expansion=values["expansion"], bulk_modulus=values["bulk_modulus"],
                   pour_point=values["pour_point"], name=name)

    # -------------------------------------------------------------- validity
    @property
    def max_temperature(self) -> float:
        """Highest temperature (K) where the viscosity is still at least 2 mm²/s."""
        w = np.log10(np.log10(NU_MIN_VALID * 1e6 + 0.7))
        return float(10 ** ((self._a - w) / self._b))

    def check_temperature(self, temperature, field: str = "oil temperature"):
        """Raise :class:`ModelValidityError` if any temperature is outside validity."""
        t = np.asarray(temperature, dtype=float)
        if not np.all(np.isfinite(t)):
            raise InputError(field, "NaN or infinite", "a finite temperature")
        lo, hi = self.pour_point, self.max_temperature
        if np.any(t < lo - 1e-9) or np.any(t > hi + 1e-9):
            bad = t[(t < lo - 1e-9) | (t > hi + 1e-9)].ravel()[0]
            raise ModelValidityError(
                field, f"{bad - T0_C:.1f} degC",
                f"a temperature from the pour point {lo - T0_C:.1f} degC to {hi - T0_C:.1f} degC, "
                "where the viscosity stays above 2 cSt (ASTM D341 validity)")
        return t

    # -------------------------------------------------------------- properties
    def kinematic_viscosity(self, temperature):
        """Kinematic viscosity, m²/s, at ``temperature`` in K (ASTM D341)."""
        t = self.check_temperature(temperature)
        nu_cst = 10.0 ** (10.0 ** (self._a - self._b * np.log10(t))) - 0.7
        return _like(nu_cst * 1e-6, temperature)

    def kinematic_viscosity_cst(self, temperature):
        """Kinematic viscosity in cSt (mm²/s), for reports and doctests."""
        return _like(np.asarray(self.kinematic_viscosity(temperature)) * 1e6, temperature)

    def density(self, temperature):
        """Density, kg/m³, at ``temperature`` in K: ``rho15 / (1 + alpha (T - 288.15))``."""
        t = self.check_temperature(temperature)
        return _like(self.density15 / (1.0 + self.expansion * (t - T_DENSITY_REF)), temperature)

    def dynamic_viscosity(self, temperature):
        """Dynamic viscosity ``mu = rho * nu``, Pa·s, at ``temperature`` in K.

        >>> round(Oil.from_grade("VG46").dynamic_viscosity(313.15), 4)
        0.0393
        """
        return _like(np.asarray(self.density(temperature)) * np.asarray(self.kinematic_viscosity(temperature)),
                     temperature)

    def temperature_for_viscosity(self, nu):
        """Temperature (K) at which the kinematic viscosity is ``nu`` (m²/s)."""
        nu = np.asarray(nu, dtype=float)
        if np.any(nu < NU_MIN_VALID):
            raise InputError("viscosity", f"{float(np.min(nu)) * 1e6:g} cSt", "at least 2 cSt")
        w = np.log10(np.log10(nu * 1e6 + 0.7))
        return _like(10 ** ((self._a - w) / self._b), nu)


def air_fraction(air_content: float, pressure):
    """Share of the volume taken by entrained air at gauge ``pressure`` (Pa), given its share
    ``air_content`` at atmospheric pressure; the air compressed polytropically
    (``p V^kappa`` constant, kappa 1.4)::

        x(p) = x0 (p_atm / p_abs)^(1/kappa) / (1 - x0 + x0 (p_atm / p_abs)^(1/kappa))

    >>> round(float(air_fraction(0.01, 0.0)), 6)
    0.01
    """
    x0 = float(air_content)
    r = (P_ATM / (np.asarray(pressure, dtype=float) + P_ATM)) ** (1.0 / KAPPA_AIR)
    return x0 * r / (1.0 - x0 + x0 * r)


def tube_modulus(bore: float, wall: float, youngs_modulus: float = E_STEEL) -> float:
    """Volumetric stiffness of a thin-walled tube, Pa: ``K = E t / d``.

    Thin wall (Barlow): hoop stress ``p d / (2 t)``, hoop strain ``p d / (2 t E)``; the volume
    grows with twice the diametral strain, ``dV/V = p d / (t E)`` (open ends, axial strain
    neglected). 10 mm bore, 1.5 mm wall: 2.1e11 × 1.5 / 10 = 3.15e10 Pa.

    >>> round(tube_modulus(0.010, 0.0015) / 1e9, 2)
    31.5
    """
    return youngs_modulus * wall / bore


def effective_bulk_modulus(oil_modulus: float, pressure, air_content: float = 0.0, line_share=0.0,
                           line_modulus: float = math.inf):
    """Effective bulk modulus, Pa, of an oil column with its line and entrained air: springs
    in series (Merritt, Hydraulic Control Systems, 1967; from memory)::

        1/E' = 1/E_oil + (V_line/V) / K_line + x(p) / (kappa p_abs)

    Parameters: ``oil_modulus`` E_oil (Pa); ``pressure`` gauge (Pa; the air term needs the
    absolute pressure); ``air_content`` x0 at atmospheric pressure (fraction, see
    :func:`air_fraction`); ``line_share`` V_line/V (fraction of the column in the hose or
    tube); ``line_modulus`` K_line (Pa, :func:`tube_modulus` or the hose's stiffness).

    Worked example (by hand): oil 1.4e9 Pa, half the column in a hose of 3e8 Pa, no air:
    1/E' = 1/1.4e9 + 0.5/3e8 = 7.143e-10 + 1.667e-9 = 2.381e-9 -> E' = 4.2e8 Pa. With 1 %
    air at 100 bar gauge (p_abs = 101.01325e5 Pa): (1.01325/101.01325)^(1/1.4) = 0.03735,
    x = 3.735e-4 / 0.99037 = 3.771e-4; its term 3.771e-4 / (1.4 × 101.01325e5) = 2.667e-11, so
    1/E' = 7.143e-10 + 0.267e-10 = 7.410e-10 and E' = 1.35e9 Pa.

    >>> round(float(effective_bulk_modulus(1.4e9, 100e5, 0.0, 0.5, 3e8)) / 1e8, 3)
    4.2
    >>> round(float(effective_bulk_modulus(1.4e9, 100e5, 0.01)) / 1e9, 3)
    1.35
    """
    p_abs = np.maximum(np.asarray(pressure, dtype=float) + P_ATM, 1.0)
    inv = 1.0 / oil_modulus + air_fraction(air_content, p_abs - P_ATM) / (KAPPA_AIR * p_abs)
    if math.isfinite(line_modulus):
        inv = inv + np.asarray(line_share, dtype=float) / line_modulus
    return 1.0 / inv


def _like(value, template):
    """Return a float for scalar input, an array otherwise."""
    if np.ndim(template) == 0:
        return float(value)
    return np.asarray(value, dtype=float)


__all__ = ["Oil", "P_ATM", "T0_C", "ISO3448_MIDPOINT_CST", "TYPICAL_NU100_CST", "iso3448_limits",
           "walther_constants", "NU_MIN_VALID", "air_fraction", "tube_modulus", "effective_bulk_modulus",
           "KAPPA_AIR", "E_STEEL"]
