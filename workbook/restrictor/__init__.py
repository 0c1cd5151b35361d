"""Fixed restrictors: sharp-edged orifice, long throttle, needle (cone-seat) throttle.

Every model here answers the same two questions over numpy arrays that broadcast together
(``dp`` of shape ``(N, 1)`` against oil properties of shape ``(1, M)``, for example):

* ``flow(dp, rho, mu)``: the flow through the restrictor at a pressure drop, and
* ``pressure_drop(q, rho, mu)``: the drop that a flow costs,

each returning a :class:`RestrictorFlow` with the flow, the drop, the Reynolds number and the
flow regime. Both are odd functions (a negative drop gives a negative flow of the same size),
zero gives zero with a Reynolds number of 0, and no valid input gives NaN. Sizing functions
answer the inverse questions: the bore of an orifice or a throttle, and the lift of a needle,
that pass a flow at a drop; :func:`drilled_orifice` rounds an orifice to a standard drill
and reports the flow the drill really passes.

Units are SI throughout: pressure drop in Pa, flow in m³/s, density ``rho`` in kg/m³,
dynamic viscosity ``mu`` in Pa·s, lengths in m, angles in rad.

Regime labels (:data:`REGIMES`), and what they mean in each model:

=============  ==========================================  ===============================
label          sharp orifice and needle throttle            long throttle
=============  ==========================================  ===============================
laminar        Re below ``(cd/delta)**2``: Cd = delta·√Re   Re < 2300: Hagen-Poiseuille
transitional   never reported (the Cd model has no band)    2300 ≤ Re < 4000: blended f
turbulent      Re at or above ``(cd/delta)**2``: Cd = cd    Re ≥ 4000: Colebrook
=============  ==========================================  ===============================

References: H. E. Merritt, *Hydraulic Control Systems*, Wiley 1967 (orifice equation and the
laminar discharge coefficient Cd = delta·√Re, delta about 0.2 for a sharp circular orifice,
from memory); Hagen-Poiseuille law for laminar pipe flow; C. F. Colebrook, J. Inst. Civil
Eng. 11 (1939) for the turbulent friction factor.

>>> o = SharpOrifice(1.0e-3)
>>> r = o.flow(50e5, 870.0, 0.040)
>>> round(float(r.flow) * 60000, 3), str(r.regime)       # L/min
(3.082, 'turbulent')

The package holds one module per concern: :mod:`.results` (what the models answer),
:mod:`.validate` (argument checks), :mod:`.cd_law` (the Cd(Re) law, written once for the
orifice and the needle), :mod:`.orifice`, :mod:`.friction` (pipe friction), :mod:`.throttle`,
:mod:`.needle` and :mod:`.drills`. Import the public names from here.
"""

from .cd_law import CdLaw
from .drills import DRILL_SERIES_MM, drilled_orifice, round_to_drill
from .friction import (
    MAX_RELATIVE_ROUGHNESS,
    RE_LAMINAR_LIMIT,
    RE_TURBULENT_FROM,
    colebrook,
    darcy_friction_factor,
)
from .needle import NeedleThrottle, needle_lift
from .orifice import SharpOrifice, orifice_diameter
from .results import (
    LAMINAR,
    REGIMES,
    TRANSITIONAL,
    TURBULENT,
    DiameterSizing,
    DrilledOrifice,
    LiftSizing,
    RestrictorFlow,
)
from .throttle import LongThrottle, throttle_diameter

__all__ = [
    "LAMINAR", "TRANSITIONAL", "TURBULENT", "REGIMES", "RE_LAMINAR_LIMIT", "RE_TURBULENT_FROM",
    "MAX_RELATIVE_ROUGHNESS", "DRILL_SERIES_MM",
    "RestrictorFlow", "DiameterSizing", "LiftSizing", "DrilledOrifice",
    "CdLaw", "SharpOrifice", "LongThrottle", "NeedleThrottle",
    "orifice_diameter", "throttle_diameter", "needle_lift",
    "colebrook", "darcy_friction_factor", "round_to_drill", "drilled_orifice",
]
