"""Physical constants and unit factors used across the workbook, each defined once.

Everything inside the package is SI; these factors turn the few trade units the physics and
the messages write by hand into SI and back. (Text with units goes through
:mod:`workbook.units`, which uses pint.)

>>> 210 * BAR                      # 210 bar in Pa
21000000.0
>>> round(30 * LPM * TO_LPM, 12)   # 30 L/min to m³/s and back
30.0
>>> 20.0 + T0_C                    # 20 °C in K
293.15
"""

#: one bar in Pa (ISO 80000-4: 1 bar = 10⁵ Pa)
BAR = 1e5
#: one litre per minute in m³/s
LPM = 1.0 / 60000.0
#: m³/s to L/min (the inverse of :data:`LPM`, kept as an exact factor)
TO_LPM = 60000.0
#: standard atmosphere, Pa (absolute = gauge + P_ATM; ISO 2533)
P_ATM = 101325.0
#: 0 °C in kelvin (SI Brochure, 9th edition)
T0_C = 273.15
#: standard acceleration of gravity, m/s² (CGPM 1901; NIST SP 811)
G_STANDARD = 9.80665

__all__ = ["BAR", "LPM", "TO_LPM", "P_ATM", "T0_C", "G_STANDARD"]
