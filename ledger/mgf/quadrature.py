"""Quadrature rules in fixed point: Gauss-Legendre and a radial rule for log powers.

The radial rule integrates s log^k(s) p(s) over [0, 1] exactly for every
polynomial p of degree < n and every k <= kmax (product integration on the
Gauss-Legendre nodes: the weights come from exact modified moments of the
shifted Legendre polynomials), so an integrand sum_k log^k(s) A_k(s) with
A_k analytic converges geometrically, like Gauss-Legendre for A_k alone.

>>> import mpmath
>>> nodes, weights = gauss_legendre(5, 60)
>>> ctx = mpmath.MPContext(); ctx.prec = 60
>>> float(sum(w * x**4 for x, w in zip(nodes, weights)))  # int_0^1 x^4 = 1/5
0.2
>>> rule = radial_rule(12, 2, 100)
>>> fp = rule.fixed
>>> total = sum(w * n for w, n in zip(rule.weights[1], rule.nodes)) >> 100  # int s log(s) s ds
>>> round(fp.to_float(total), 12) == round(-1 / 9, 12)
True
"""

from __future__ import annotations

from dataclasses import dataclass
from fractions import Fraction
from functools import lru_cache
from math import comb

import mpmath

from ledger.mgf.fixedpoint import FixedPoint


@lru_cache(maxsize=64)
def gauss_legendre(n: int, prec: int) -> tuple:
    """Nodes and weights of the n-point Gauss-Legendre rule on [0, 1] (mpf, ``prec`` bits)."""
    ctx = mpmath.MPContext()
    ctx.prec = prec + 20
    nodes, weights = [], []
    for i in range(1, n + 1):
        x = ctx.cos(ctx.pi * (i - ctx.mpf(1) / 4) / (n + ctx.mpf(1) / 2))
        for _ in range(100):
            p0, p1 = ctx.one, x
            for k in range(2, n + 1):
                p0, p1 = p1, ((2 * k - 1) * x * p1 - (k - 1) * p0) / k
            derivative = n * (x * p1 - p0) / (x * x - 1)
            step = p1 / derivative
            x -= step
            if abs(step) < ctx.mpf(2) ** (-prec - 10):
                break
        p0, p1 = ctx.one, x
        for k in range(2, n + 1):
            p0, p1 = p1, ((2 * k - 1) * x * p1 - (k - 1) * p0) / k
        derivative = n * (x * p1 - p0) / (x * x - 1)
        nodes.append((1 - x) / 2)
        weights.append(1 / ((1 - x * x) * derivative ** 2))
    return tuple(nodes), tuple(weights)


@dataclass(frozen=True)
class RadialRule:
    """Fixed-point nodes s_i, log s_i and weights W[k][i] for s log^k(s) ds on [0, 1]."""

    fixed: FixedPoint
    nodes: tuple
    log_nodes: tuple
    weights: tuple  # weights[k][i]


@lru_cache(maxsize=None)
def _legendre_log_moments(n: int, kmax: int) -> tuple:
    """mu[k][j] = int_0^1 s log^k(s) P_j(2s-1) ds, exactly."""
    moments = []
    for k in range(kmax + 1):
        sign_fact = (-1) ** k * _factorial(k)
        row = []
        for j in range(n):
            total = Fraction(0)
            for l in range(j + 1):
                coefficient = (-1) ** (j + l) * comb(j, l) * comb(j + l, l)
                total += Fraction(coefficient, (l + 2) ** (k + 1))
            row.append(sign_fact * total)
        moments.append(tuple(row))
    return tuple(moments)


def _factorial(k: int) -> int:
    out = 1
    for i in range(2, k + 1):
        out *= i
    return out


@lru_cache(maxsize=64)
def radial_rule(n: int, kmax: int, bits: int) -> RadialRule:
    """The n-node product rule for s log^k(s) on [0, 1], k = 0..kmax."""
    fp = FixedPoint(bits)
    nodes, gl_weights = gauss_legendre(n, bits + 20)
    ctx = mpmath.MPContext()
    ctx.prec = bits + 40
    moments = _legendre_log_moments(n, kmax)
    weights = [[] for _ in range(kmax + 1)]
    for s, w in zip(nodes, gl_weights):
        x = 2 * ctx.mpf(s) - 1
        legendre = [ctx.one, x]
        for j in range(2, n):
            legendre.append(((2 * j - 1) * x * legendre[-1] - (j - 1) * legendre[-2]) / j)
        for k in range(kmax + 1):
            total = ctx.fsum((2 * j + 1) * legendre[j] * ctx.mpf(moments[k][j].numerator)
                             / moments[k][j].denominator for j in range(n))
            weights[k].append(fp.from_number(w * total))
    return RadialRule(
        fp,
        tuple(fp.from_number(s) for s in nodes),
        tuple(fp.from_number(ctx.log(s)) for s in nodes),
        tuple(tuple(row) for row in weights),
    )
