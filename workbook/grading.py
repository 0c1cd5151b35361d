"""The one grading rule of the workbook: a value against its limit gives a margin and a level.

Every check of the axis (:mod:`workbook.checks`) and every study finding
(:mod:`workbook.studies.base`) is graded here, so a panel, the record, the review copy
and ``axisbook evaluate`` can never grade the same value differently.

The margin is the share of the limit still unused,

    margin = (limit - value) / |limit|    when a higher value is worse (sense "max"),
    margin = (value - limit) / |limit|    when a lower value is worse (sense "min").

* ``margin < -TOLERANCE`` breaches the limit: the rule's broken level ("fail", or
  "caution" for an advisory rule);
* ``margin < band`` is inside the caution band (a limit of zero has no band);
* otherwise it passes.

``TOLERANCE`` (1e-12, a relative share) only absorbs floating-point rounding: a value
exactly at its limit passes, one part in 10^11 over it fails. A limit smaller in magnitude
than ``ZERO_LIMIT`` SI units counts as zero, and its margin is taken on a scale of one SI
unit, so a vanishing limit (a load of 1e-300 kN) never makes a margin infinite.

>>> grade_margin(200e5, 210e5, 0.10)
(0.047619047619047616, 'caution')
>>> grade_margin(211e5, 210e5, 0.10)[1]
'fail'
>>> grade_margin(3e6, 1e-318, 0.10, higher_is_worse=False)
(3000000.0, 'pass')

Source: common practice (a margin as a share of the limit, with a caution band).
"""

from __future__ import annotations

#: relative share below zero that still counts as at the limit (rounding only)
TOLERANCE = 1e-12
#: a limit below this magnitude (SI units) is graded as zero
ZERO_LIMIT = 1e-6


def grade_margin(value: float, limit: float, band: float, higher_is_worse: bool = True,
                 broken: str = "fail") -> tuple[float, str]:
    """``(margin, level)`` of ``value`` against ``limit`` (both in the same SI unit).

    ``band`` is the caution share (dimensionless, 0.10 for 10 % of the limit); ``broken``
    the level a breach gets ("fail" or "caution").
    """
    zero = abs(limit) < ZERO_LIMIT
    scale = 1.0 if zero else abs(limit)
    margin = ((limit - value) if higher_is_worse else (value - limit)) / scale
    if margin < -TOLERANCE:
        return margin, broken
    if not zero and margin < band:
        return margin, "caution"
    return margin, "pass"
