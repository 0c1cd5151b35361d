"""The needle (cone-seat) throttle and the lift that passes a flow at a drop."""

from __future__ import annotations

import math
from dataclasses import dataclass

import numpy as np

from ..constants import TO_LPM
from ..errors import InputError
from ..numerics import solve_log as _solve_log
from .cd_law import CdLaw, _orifice_drop, _orifice_flow
from .orifice import _sizing_inputs
from .results import LiftSizing, RestrictorFlow
from .validate import _array, _cd_delta, _finite, _fmt, _out, _stored


@dataclass(frozen=True, eq=False)
class NeedleThrottle(CdLaw):
    r"""Needle (cone-seat) throttle: a cone of half-angle α lifted h off a sharp seat of
    diameter d.

    .. math::

        A(h) = \pi h \sin\alpha\,(d - h\sin\alpha\cos\alpha),\qquad
        D_h = 2 h \sin\alpha,\qquad Q = C_d(Re)\,A\sqrt{2\Delta p/\rho}

    Derivation (by hand): the narrowest gap runs from the seat edge normal to the cone
    surface; its width is h·sin α and its mid-point sits on a circle of diameter
    d − h·sin α·cos α, so A is the lateral area of that frustum band. A rises with h until
    it reaches the seat bore area π d²/4 at the *full-open lift*
    :math:`h_{open} = d\,(1-\sqrt{1-\cos\alpha})/(2\sin\alpha\cos\alpha)`; above it the
    area is capped at the seat area (the bore, not the gap, then limits the flow) and the
    hydraulic diameter is held at 2·h_open·sin α. The Reynolds number is
    Re = ρ v D_h/μ with v = Q/A and the discharge coefficient is that of
    :class:`SharpOrifice`: Cd = min(delta·√Re, cd), same regime labels.

    Parameters
    ----------
    seat_diameter : float or array
        Seat bore d, m (> 0).
    half_angle : float or array
        Cone half-angle α, rad, in (0, π/2).
    lift : float or array
        Lift h of the cone off the seat, m (0 = closed, which passes no flow).
    cd, delta : float
        As for :class:`SharpOrifice` (Merritt 1967, from memory).

    Worked example (checked by hand): d = 4 mm, α = 15°, one turn of a 0.5 mm thread,
    h = 0.5 mm: h sin α = 0.129410 mm, h sin α cos α = 0.125 mm, A = π × 0.129410 × 3.875
    = 1.57539 mm²; at 50 bar (rho 870): Q = 0.61 × 1.57539e-6 × 107.211 = 1.0303e-4 m³/s
    = 6.18 L/min; D_h = 0.25882 mm, v = 65.40 m/s, Re = 870 × 65.40 × 2.5882e-4/0.040
    = 368: turbulent.

    >>> n = NeedleThrottle.from_turns(4e-3, math.radians(15), 1.0, 0.5e-3)
    >>> round(n.lift * 1e3, 6), round(float(n.area) * 1e6, 5)
    (0.5, 1.57539)
    >>> r = n.flow(50e5, 870.0, 0.040)
    >>> round(float(r.flow) * 60000, 2), round(float(r.reynolds)), str(r.regime)
    (6.18, 368, 'turbulent')
    """

    seat_diameter: float | np.ndarray
    half_angle: float | np.ndarray
    lift: float | np.ndarray
    cd: float = 0.61
    delta: float = 0.2

    def __post_init__(self):
        d = _array(self.seat_diameter, "seat_diameter", "m", "a diameter", "positive")
        a = _half_angle(self.half_angle)
        h = _array(self.lift, "lift", "m", "a lift", "nonnegative")
        cd, delta = _cd_delta(self.cd, self.delta)
        for name, val in (("seat_diameter", d), ("half_angle", a), ("lift", h),
                          ("cd", cd), ("delta", delta)):
            object.__setattr__(self, name, _stored(val))

    @classmethod
    def from_turns(cls, seat_diameter, half_angle, turns, pitch, cd=0.61, delta=0.2):
        """Needle opened ``turns`` turns (>= 0) on a thread of ``pitch`` (m per turn, > 0):
        lift = turns·pitch.

        >>> round(NeedleThrottle.from_turns(4e-3, 0.26, 1.5, 0.5e-3).lift * 1e3, 6)
        0.75
        """
        turns = _array(turns, "turns", "turn", "an opening in turns", "nonnegative")
        pitch = _array(pitch, "pitch", "m", "a thread pitch", "positive")
        return cls(seat_diameter, half_angle, _stored(turns * pitch), cd, delta)

    @classmethod
    def from_angle(cls, seat_diameter, half_angle, angle, pitch, cd=0.61, delta=0.2):
        """Needle opened by ``angle`` (rad; one turn = 2π rad, >= 0) on a thread of ``pitch``
        (m per turn, > 0): lift = angle/(2π)·pitch (the SI form of :meth:`from_turns`).

        >>> round(NeedleThrottle.from_angle(4e-3, 0.26, 3 * math.pi, 0.5e-3).lift * 1e3, 6)
        0.75
        """
        angle = _array(angle, "turns", "rad", "an opening angle", "nonnegative")
        pitch = _array(pitch, "pitch", "m", "a thread pitch", "positive")
        return cls(seat_diameter, half_angle, _stored(angle / (2.0 * math.pi) * pitch), cd, delta)

    @property
    def seat_area(self):
        """Seat bore area pi·d²/4, m² (the cap on the flow area)."""
        return _out(math.pi * np.asarray(self.seat_diameter) ** 2 / 4.0)

    @property
    def full_open_lift(self):
        """Lift at which the gap area reaches the seat area, m."""
        return _out(_open_lift(np.asarray(self.seat_diameter), np.asarray(self.half_angle)))

    @property
    def area(self):
        """Flow area A(h), capped at the seat area, m²."""
        return _out(_needle_area(np.asarray(self.seat_diameter), np.asarray(self.half_angle),
                                 np.asarray(self.lift))[0])

    @property
    def hydraulic_diameter(self):
        """Hydraulic diameter of the gap 2·min(h, h_open)·sin α, m."""
        return _out(_needle_area(np.asarray(self.seat_diameter), np.asarray(self.half_angle),
                                 np.asarray(self.lift))[1])


    def flow(self, dp, rho, mu) -> RestrictorFlow:
        """Flow at pressure drop ``dp`` (Pa, either sign), density ``rho`` (kg/m³) and
        dynamic viscosity ``mu`` (Pa·s); closed form as :meth:`SharpOrifice.flow`."""
        dp = _array(dp, "dp", "Pa", "pressure drop", "finite")
        rho = _array(rho, "rho", "kg/m^3", "a density", "positive")
        mu = _array(mu, "mu", "Pa*s", "a dynamic viscosity", "positive")
        area, dh = _needle_area(np.asarray(self.seat_diameter), np.asarray(self.half_angle),
                                np.asarray(self.lift))
        return _orifice_flow(dp, rho, mu, area, dh, self.cd, self.delta)

    def pressure_drop(self, q, rho, mu) -> RestrictorFlow:
        """Pressure drop at flow ``q`` (m³/s, either sign); the exact inverse of
        :meth:`flow`. A closed needle (lift 0) accepts only q = 0."""
        q = _array(q, "q", "m^3/s", "flow", "finite")
        rho = _array(rho, "rho", "kg/m^3", "a density", "positive")
        mu = _array(mu, "mu", "Pa*s", "a dynamic viscosity", "positive")
        area, dh = _needle_area(np.asarray(self.seat_diameter), np.asarray(self.half_angle),
                                np.asarray(self.lift))
        return _orifice_drop(q, rho, mu, area, dh, self.cd, self.delta, "lift")


def _half_angle(value) -> np.ndarray:
    a = _array(value, "half_angle", "rad", "an angle", "positive")
    if (a >= math.pi / 2).any():
        raise InputError("half_angle", _fmt(float(a[a >= math.pi / 2].flat[0]), "rad"),
                         "an angle greater than 0 and less than pi/2 rad (90 deg)")
    return a


def _open_lift(d, a):
    s, c = np.sin(a), np.cos(a)
    # d (1 - sqrt(1 - c)) / (2 s c), written without cancellation
    return d / (2.0 * s * (1.0 + np.sqrt(1.0 - c)))


def _needle_area(d, a, h):
    s, c = np.sin(a), np.cos(a)
    h_open = _open_lift(d, a)
    he = np.minimum(h, h_open)
    area = np.where(h >= h_open, math.pi * d**2 / 4.0, math.pi * he * s * (d - he * s * c))
    return area, 2.0 * he * s


def needle_lift(q, dp, rho, mu, seat_diameter, half_angle, cd=0.61, delta=0.2) -> LiftSizing:
    r"""Lift of a needle throttle that passes flow ``q`` at drop ``dp``.

    The flow grows with the lift on both Cd branches, so the lift is the larger of

    * the turbulent lift, from the area :math:`A = q/(c_d\sqrt{2\Delta p/\rho})` and the
      quadratic :math:`\sin^2\!\alpha\cos\alpha\,h^2 - d\sin\alpha\,h + A/\pi = 0`, on its
      rising branch (the smaller root):
      :math:`h = 2A/(\pi\sin\alpha\,(d + \sqrt{d^2 - 4A\cos\alpha/\pi}))`;
    * the laminar lift, from :math:`Q = 4\pi\delta^2\sin^2\!\alpha\,\Delta p\,h^2
      (d - h\sin\alpha\cos\alpha)/\mu`, a cubic solved by a vectorised bracketed root find
      on (0, h_open].

    Parameters
    ----------
    q : float or array
        Flow, m³/s (> 0).
    dp : float or array
        Pressure drop, Pa (> 0).
    rho, mu : float or array
        Density, kg/m³; dynamic viscosity, Pa·s.
    seat_diameter : float or array
        Seat bore, m (> 0).
    half_angle : float or array
        Cone half-angle, rad, in (0, π/2).
    cd, delta : float
        As for :class:`SharpOrifice`.

    Raises :class:`~workbook.errors.InputError` (field ``q``) where the flow needs more
    than the fully open seat passes at that drop.

    >>> s = needle_lift(1.0303e-4, 50e5, 870.0, 0.040, 4e-3, math.radians(15))
    >>> round(float(s.lift) * 1e3, 3), round(float(s.area) * 1e6, 4)
    (0.5, 1.5754)
    """
    q, dp, rho, mu = _sizing_inputs(q, dp, rho, mu)
    d = _array(seat_diameter, "seat_diameter", "m", "a diameter", "positive")
    a = _half_angle(half_angle)
    cd, delta = _cd_delta(cd, delta)
    q, dp, rho, mu, d, a, cd_b, delta_b = (np.array(x, dtype=float) for x in np.broadcast_arrays(
        q, dp, rho, mu, d, a, cd, delta))
    s, c = np.sin(a), np.cos(a)
    k = s * c
    h_open = _open_lift(d, a)
    seat = math.pi * d**2 / 4.0
    full = _orifice_flow(dp, rho, mu, seat, 2.0 * h_open * s, cd_b, delta_b)
    too_much = q > full.flow * (1.0 + 1e-12)
    if too_much.any():
        i = np.argmax(too_much.ravel())
        # in L/min, as people size a valve (the message reaches the sizing study's findings)
        raise InputError("q", _fmt(float(q.ravel()[i]) * TO_LPM, "L/min"),
                         f"at most {float(full.flow.ravel()[i]) * TO_LPM:.4g} L/min, what the fully open "
                         "seat passes at this drop (a larger seat or a larger drop)")
    a_t = np.minimum(q / (cd_b * np.sqrt(2.0 * dp / rho)), seat)
    h_t = 2.0 * a_t / (math.pi * s * (d + np.sqrt(np.maximum(d**2 - 4.0 * a_t * c / math.pi, 0.0))))
    # laminar: h^2 (d - k h) = R on (0, h_open]
    r_l = q * mu / (4.0 * math.pi * delta_b**2 * s**2 * dp)
    lo = np.sqrt(r_l / d)
    hi = np.minimum(np.sqrt(r_l / (d - k * h_open)), h_open)
    lo = np.minimum(lo, hi)
    dd, kk, ln_r = d.ravel(), k.ravel(), np.log(r_l.ravel())

    def resid(u, i):
        h = np.exp(u)
        return 2.0 * u + np.log(dd[i] - kk[i] * h) - ln_r[i]

    h_l = _solve_log(resid, lo.ravel(), hi.ravel()).reshape(q.shape)
    h = np.minimum(np.maximum(h_t, h_l), h_open)
    h = _finite(h, "q", q, "m^3/s")
    area, dh = _needle_area(d, a, h)
    state = _orifice_flow(dp, rho, mu, area, dh, cd_b, delta_b)
    return LiftSizing(h, area, state)
