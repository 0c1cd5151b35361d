"""Shared pieces of the axis studies: the axis from values, load sweeps, regime text."""

from __future__ import annotations

import numpy as np

from .. import inputs
from ..circuit import Axis, axis_from_values, design_loads
from ..errors import InputError

#: the inputs that describe an axis for the solver (each study adds its own)
AXIS_FIELDS = (
    ("cylinder", "bore"), ("cylinder", "rod"), ("cylinder", "rated_pressure"),
    ("supply", "displacement"), ("supply", "shaft_speed"), ("supply", "volumetric_efficiency"),
    ("supply", "pump_flow"), ("supply", "relief_cracking"), ("supply", "relief_full_flow"), ("supply", "drive_power"),
    ("operation", "loads"), ("operation", "friction"), ("operation", "temp_min"), ("operation", "temp_max"),
    ("operation", "tank_pressure"), ("operation", "target_speed"), ("operation", "speed_tolerance"),
    ("oil", "grade"), ("oil", "nu40"), ("oil", "nu100"),
)




def section_fields(section: str, *, without: tuple = ()) -> tuple:
    """Every field of a catalogue section as ``(section, key)`` pairs (less ``without``)."""
    return tuple((section, key) for key in inputs.section(section).keys if key not in without)


#: the whole flow valve and holding valve, as the axis studies record them
FLOW_VALVE_FIELDS = section_fields("flow_valve")
HOLDING_FIELDS = section_fields("holding")


def build_axis(values) -> Axis:
    """The solver's axis for ``values``; errors name the design field."""
    return axis_from_values(values)


def sweep_range(values, direction: str | None = None) -> tuple[float, float]:
    """``(lowest, highest)`` load of the curves, N.

    ``study.load_min`` / ``study.load_max`` when given; otherwise the range of the load cases
    of ``direction`` (all of them when None; with the weight along the rod,
    :func:`~workbook.circuit.design_loads`) widened by a quarter of its span on each side (at
    least 1 kN wide).
    """
    st = values["study"]
    cases = design_loads(values["operation"], direction)
    span = max(float(cases.max() - cases.min()), 1e3)
    lo = st.get("load_min")
    hi = st.get("load_max")
    lo = float(cases.min() - 0.25 * span) if lo is None else lo
    hi = float(cases.max() + 0.25 * span) if hi is None else hi
    return lo, hi


def sweep(values, n: int | None = None, direction: str | None = None) -> np.ndarray:
    """Loads of the curves, N, from :func:`sweep_range`, ``study.points`` of them."""
    st = values["study"]
    lo, hi = sweep_range(values, direction)
    if not lo < hi:
        raise InputError("study.load_max", f"{hi / 1e3:g} kN", f"a load above the lowest sweep load ({lo / 1e3:g} kN)")
    n = int(n or st.get("points", 400))
    return np.linspace(lo, hi, n)


def regime_list(sol) -> list[str]:
    """The regime label of every point, as plain strings."""
    return np.asarray(sol.regime).ravel().astype(str).tolist()
