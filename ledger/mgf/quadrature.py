"""Quadrature rules in fixed point: Gauss-Legendre and a radial rule for log powers.

The radial rule integrates s log^k(s) p(s) over [0, 1] exactly for every
polynomial p of degree < n and every k <= kmax (product integration on the
Gauss-Legendre nodes, with weights from the modified moments of the shifted
Legendre polynomials), so an integrand sum_k log^k(s) A_k(s) with A_k analytic
converges geometrically, at the rate of polynomial interpolation of A_k.

Nodes come from Newton's method started at float accuracy; everything is
computed in fixed point with guard bits (fast enough to build on first use).

>>> from ledger.mgf.fixedpoint import FixedPoint
>>> rule = gauss_legendre(5, 60)
>>> fp = rule.fixed
>>> total = sum(w * (x ** 4 >> 180) for x, w in zip(rule.nodes, rule.weights)) >> 60
>>> round(fp.to_float(total), 12)                     # int_0^1 x^4 dx = 1/5
0.2
>>> radial = radial_rule(12, 2, 100)
>>> total = sum(w * s for w, s in zip(radial.weights[1], radial.nodes)) >> 100
>>> round(radial.fixed.to_float(total), 12) == round(-1 / 9, 12)   # int s log(s) s ds
True
"""

from __future__ import annotations

import math
from dataclasses import dataclass
from functools import lru_cache
from math import comb

from ledger.mgf.fixedpoint import FixedPoint, mpz

GUARD_BITS = 24
BUCKET_BITS = 64
RADIAL_KMAX = 6  # log powers covered by one construction (graphs with up to 6 edges)


@dataclass(frozen=True)
class GaussRule:
    """n-point Gauss-Legendre rule on [0, 1]: nodes and weights in fixed point."""

    fixed: FixedPoint
    nodes: tuple
    weights: tuple


@dataclass(frozen=True)
class RadialRule:
    """Fixed-point nodes s_i, log s_i and weights W[k][i] for s log^k(s) ds on [0, 1]."""

    fixed: FixedPoint
    nodes: tuple
    log_nodes: tuple
    weights: tuple  # weights[k][i]


def _legendre(n: int, x, bits: int) -> tuple:
    """(P_n(x), P_(n-1)(x)) in fixed point by the three-term recurrence."""
    one = mpz(1) << bits
    p0, p1 = one, x
    for k in range(2, n + 1):
        p0, p1 = p1, (((2 * k - 1) * x * p1 >> bits) - (k - 1) * p0) // k
    return p1, p0


def _legendre_all(n: int, x, bits: int) -> list:
    """[P_0(x), ..., P_(n-1)(x)] in fixed point."""
    values = [mpz(1) << bits, x]
    for k in range(2, n):
        values.append((((2 * k - 1) * x * values[-1] >> bits) - (k - 1) * values[-2]) // k)
    return values[:n]


def _float_root(n: int, i: int) -> float:
    """The i-th largest root of P_n in float64 (Tricomi's guess, then Newton)."""
    x = math.cos(math.pi * (i - 0.25) / (n + 0.5))
    for _ in range(100):
        p0, p1 = 1.0, x
        for k in range(2, n + 1):
            p0, p1 = p1, ((2 * k - 1) * x * p1 - (k - 1) * p0) / k
        step = p1 / (n * (x * p1 - p0) / (x * x - 1))
        x -= step
        if abs(step) < 1e-15:
            break
    return x


def _bucket(bits: int) -> int:
    """Rules are built at a multiple of BUCKET_BITS and shifted down, so that nearby
    precisions share one construction."""
    return BUCKET_BITS * -(-(bits + GUARD_BITS) // BUCKET_BITS)


@lru_cache(maxsize=256)
def gauss_legendre(n: int, bits: int) -> GaussRule:
    """The n-point Gauss-Legendre rule on [0, 1] at ``bits`` fractional bits."""
    built = _gauss_legendre(n, _bucket(bits))
    shift = built.fixed.bits - bits
    return GaussRule(FixedPoint(bits), tuple(x >> shift for x in built.nodes),
                     tuple(w >> shift for w in built.weights))


@lru_cache(maxsize=256)
def _gauss_legendre(n: int, bits: int) -> GaussRule:
    work = bits + GUARD_BITS
    one = mpz(1) << work
    nodes, weights = [], []
    for i in range(1, n + 1):
        x = mpz(round(_float_root(n, i) * 2.0 ** 60)) << (work - 60)
        while True:
            p, q = _legendre(n, x, work)
            derivative = (n * ((x * p >> work) - q) << work) // ((x * x >> work) - one)
            step = (p << work) // derivative
            x -= step
            if abs(step) < (1 << (GUARD_BITS // 2)):
                break
        p, q = _legendre(n, x, work)
        derivative = (n * ((x * p >> work) - q) << work) // ((x * x >> work) - one)
        # on [0, 1]: node (1 - x)/2, weight 1/((1 - x^2) P_n'(x)^2)
        nodes.append((one - x) >> (GUARD_BITS + 1))
        denominator = ((one - (x * x >> work)) * (derivative * derivative >> work)) >> work
        weights.append(((one << work) // denominator) >> GUARD_BITS)
    return GaussRule(FixedPoint(bits), tuple(nodes), tuple(weights))


@lru_cache(maxsize=None)
def _log_moment_numerators(n: int, kmax: int, extra: int) -> tuple:
    """mu[k][j] = int_0^1 s log^k(s) P_j(2s-1) ds in fixed point with ``extra`` bits,
    from P_j(2s-1) = sum_l (-1)^(j+l) C(j,l) C(j+l,l) s^l and
    int_0^1 s^(l+1) log^k(s) ds = (-1)^k k! / (l+2)^(k+1)."""
    moments = []
    for k in range(kmax + 1):
        scale = (-1) ** k * math.factorial(k)
        powers = [(mpz(scale) << extra) // (l + 2) ** (k + 1) for l in range(n)]
        row = []
        for j in range(n):
            row.append(sum((-1) ** (j + l) * comb(j, l) * comb(j + l, l) * powers[l]
                           for l in range(j + 1)))
        moments.append(tuple(row))
    return tuple(moments)


@lru_cache(maxsize=512)
def radial_rule(n: int, kmax: int, bits: int) -> RadialRule:
    """The n-node product rule for s log^k(s) on [0, 1], k = 0..kmax."""
    built = _radial_rule(n, max(kmax, RADIAL_KMAX), _bucket(bits))
    shift = built.fixed.bits - bits
    return RadialRule(FixedPoint(bits), tuple(s >> shift for s in built.nodes),
                      tuple(v >> shift for v in built.log_nodes),
                      tuple(tuple(w >> shift for w in row) for row in built.weights[:kmax + 1]))


@lru_cache(maxsize=256)
def _radial_rule(n: int, kmax: int, bits: int) -> RadialRule:
    fp = FixedPoint(bits)
    work = bits + GUARD_BITS
    # the alternating sums for the moments lose about 2n bits to cancellation
    extra = work + 2 * n + 16
    moments = _log_moment_numerators(n, kmax, extra)
    gauss = _gauss_legendre(n, work)
    one = mpz(1) << work
    weights = [[] for _ in range(kmax + 1)]
    for s, w in zip(gauss.nodes, gauss.weights):
        legendre = _legendre_all(n, 2 * s - one, work)
        for k in range(kmax + 1):
            total = sum((2 * j + 1) * legendre[j] * moments[k][j] for j in range(n)) >> extra
            weights[k].append((w * total) >> (work + GUARD_BITS))
    nodes = tuple(s >> GUARD_BITS for s in gauss.nodes)
    gfp = FixedPoint(work)
    log_nodes = tuple(gfp.log(s) >> GUARD_BITS for s in gauss.nodes)
    return RadialRule(fp, nodes, log_nodes, tuple(tuple(row) for row in weights))
