"""How many digits a benchmarked value really has, against a reference computed more precisely."""

from __future__ import annotations

import mpmath


def true_digits(value, reference) -> float:
    """-log10 of the relative difference (60 when they agree exactly).

    >>> round(true_digits(mpmath.mpf("1.0001"), 1), 1)
    4.0
    """
    ctx = mpmath.MPContext()
    ctx.dps = 60
    difference = abs(ctx.convert(value) - ctx.convert(reference))
    if difference == 0:
        return 60.0
    return float(-ctx.log10(difference / abs(ctx.convert(reference))))
