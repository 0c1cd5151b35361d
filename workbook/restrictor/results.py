"""What a restrictor model answers: the flow state and the sizing results.

Regime labels (:data:`REGIMES`) are explained in :mod:`workbook.restrictor`.
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np

#: the regime labels a :class:`RestrictorFlow` can carry
LAMINAR = "laminar"
TRANSITIONAL = "transitional"
TURBULENT = "turbulent"
REGIMES = (LAMINAR, TRANSITIONAL, TURBULENT)

@dataclass(frozen=True, eq=False)
class RestrictorFlow:
    """State of a restrictor at one or many operating points (all numpy arrays).

    Attributes
    ----------
    flow : numpy.ndarray
        Volume flow, m³/s; same sign as ``pressure_drop``.
    pressure_drop : numpy.ndarray
        Pressure drop across the restrictor, Pa.
    reynolds : numpy.ndarray
        Reynolds number (never negative), on the model's own length scale: the bore for an
        orifice or a throttle, the hydraulic diameter of the gap for a needle.
    regime : numpy.ndarray of str
        One of :data:`REGIMES` per point; see the module docstring for what each means.
    """

    flow: np.ndarray
    pressure_drop: np.ndarray
    reynolds: np.ndarray
    regime: np.ndarray


@dataclass(frozen=True, eq=False)
class DiameterSizing:
    """A bore sized for a flow at a drop: the ``diameter`` (m) and the ``state``
    (:class:`RestrictorFlow`) of the sized restrictor at that drop."""

    diameter: np.ndarray
    state: RestrictorFlow


@dataclass(frozen=True, eq=False)
class LiftSizing:
    """A needle lift sized for a flow at a drop: the ``lift`` (m), the flow ``area`` (m²)
    and the ``state`` (:class:`RestrictorFlow`) at that drop."""

    lift: np.ndarray
    area: np.ndarray
    state: RestrictorFlow


@dataclass(frozen=True, eq=False)
class DrilledOrifice:
    """An orifice sized exactly and rounded to a drill.

    Attributes
    ----------
    exact_diameter : numpy.ndarray
        Bore that passes the asked flow at the asked drop, m.
    drill_diameter : numpy.ndarray
        Standard drill chosen for it, m.
    state : RestrictorFlow
        The drilled orifice at the asked drop: ``state.flow`` is what it really passes.
    flow_ratio : numpy.ndarray
        ``state.flow`` divided by the asked flow (1.0 means the drill is exact).
    """

    exact_diameter: np.ndarray
    drill_diameter: np.ndarray
    state: RestrictorFlow
    flow_ratio: np.ndarray

    @property
    def flow(self) -> np.ndarray:
        """Flow the drilled orifice passes at the asked drop, m³/s."""
        return self.state.flow
