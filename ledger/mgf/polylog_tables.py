"""Tau-independent Taylor tables of Li_s(exp(2 pi i z)) for the edge kernels.

Two expansions of the singular term of G_a (see :mod:`ledger.mgf.lattice`),
both in a variable t scaled by the radius of convergence so that |t| < 1 and
the fixed-point coefficients stay of moderate size:

* around z = 0: t = i z (w = 2 pi i z = 2 pi t) and
  Li_s(e^w) = sum_{n != s-1} zeta(s-n) w^n/n! + w^(s-1)/(s-1)! (H_(s-1) - log(-w));
  the table leaves out the logarithm (Jonquiere's expansion, DLMF 25.12.12);
* around z = 1/2: t = 2 i (z - 1/2) (w = i pi + pi t) and
  Li_s(-e^(pi t)) = -sum_n eta(s-n) (pi t)^n / n!, eta the Dirichlet eta function.

Rows are packed over the orders s (one slot each, lowest order first).

>>> from ledger.mgf.fixedpoint import FixedPoint
>>> fp = FixedPoint(64)
>>> row = taylor_table((2,), 64, around_half=False)[0]
>>> round(fp.to_float(fp.unpack(row << 64, 1)[0]), 12)   # zeta(2)
1.644934066848
"""

from __future__ import annotations

import math
from functools import lru_cache

import mpmath

from ledger.mgf.fixedpoint import FixedPoint

TERMS_MAX = 400
WORST_RATIO = 0.75  # tables reach far enough for |t| up to this ratio


BUCKET_BITS = 64


@lru_cache(maxsize=64)
def taylor_table(orders: tuple, bits: int, around_half: bool) -> tuple:
    """Packed coefficients c_n (n = 0, 1, ...) with Li_s = sum_n c_n t^n per slot s."""
    fp = FixedPoint(bits)
    bucket = BUCKET_BITS * -(-(bits + 40) // BUCKET_BITS)
    shift = bucket - bits
    count = min(int((bits + 40) * math.log(2) / -math.log(WORST_RATIO)) + 2, TERMS_MAX)
    columns = [_order_coefficients(s, bucket, around_half) for s in orders]
    return tuple(fp.pack([column[n] >> shift for column in columns]) for n in range(count))


@lru_cache(maxsize=64)
def _order_coefficients(s: int, bits: int, around_half: bool) -> tuple:
    """The Taylor coefficients of one order s at ``bits`` fractional bits (enough
    terms for every precision up to ``bits`` - 40)."""
    fp = FixedPoint(bits)
    ctx = mpmath.MPContext()
    ctx.prec = bits + 24
    count = min(int(bits * math.log(2) / -math.log(WORST_RATIO)) + 2, TERMS_MAX)
    radius = ctx.pi if around_half else 2 * ctx.pi
    scale = ctx.one  # radius^n / n!
    out = []
    for n in range(count):
        order = s - n
        if around_half:
            eta = ctx.log(2) if order == 1 else (1 - ctx.mpf(2) ** (1 - order)) * ctx.zeta(order)
            c = -eta * scale
        elif n == s - 1:
            c = ctx.harmonic(s - 1) * scale
        else:
            c = ctx.zeta(order) * scale
        out.append(fp.from_number(c))
        scale = scale * radius / (n + 1)
    return tuple(out)
