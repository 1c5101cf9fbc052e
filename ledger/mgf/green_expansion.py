"""Expansions of the edge functions G_a and of their products around z = 0.

Near the lattice point z = 0 (z = x + i y, L = log|z|^2)

    G_a(z) = Lg_a(z) L + R_a(z),

where Lg_a = gamma_a |z|^(2a-2) and R_a is real-analytic with radius of
convergence 1 (the nearest other lattice point).  Both are kept as polynomials
in (z, zbar): dicts {(j, k): c} meaning sum c z^j zbar^k, truncated at total
degree j + k <= ``degree``.  The coefficients come from the closed form of
:mod:`ledger.mgf.lattice` (Poisson resummation in n, then the sum over m), with
v = Im z / tau2 = (z - zbar) / (2 i tau2), lambda = 4 pi tau2, x0 = exp(2 pi i z):

    G_a = (-1)^(a+1) lambda^a B_2a(v)/(2a)!
          + Re sum_j kappa_aj [ sum_k>=0 (v+k)^j Li_s(x0 q^k)
                                + sum_k>=0 (1-v+k)^j Li_s(q^(k+1)/x0) ],

s = 2a-1-j.  Every Li_s(c e^(+-2 pi i z)) with |c| < 1 is expanded by
d/dz Li_s = +-2 pi i Li_(s-1); the singular Li_s(x0) by Jonquiere's expansion
(DLMF 25.12.12) Li_s(e^w) = sum_(n != s-1) zeta(s-n) w^n/n! + w^(s-1)/(s-1)! (H_(s-1) - log(-w)),
w = 2 pi i z, whose logarithm gives Lg_a (the arguments of log(-w) cancel
between the j-terms, leaving a real-analytic remainder).

A bundle (edges of weights a_1..a_r between the same two vertices) is the
product prod_i G_(a_i) = sum_l L^l A_l(z): see :func:`bundle_expansion`.

>>> import mpmath
>>> ctx = mpmath.MPContext(); ctx.dps = 30
>>> log_part, regular = green_expansion(1, ctx.mpc(0, 1), 10, ctx)
>>> log_part
{(0, 0): mpf('-1.0')}
>>> z = ctx.mpc("0.1", "0.05")   # Kronecker: G_1 = -log|theta_1(z)/eta|^2 + 2 pi (Im z)^2/tau2
>>> theta = ctx.jtheta(1, ctx.pi * z, ctx.exp(-ctx.pi))
>>> eta = ctx.exp(-ctx.pi / 12) * ctx.qp(ctx.exp(-2 * ctx.pi))
>>> exact = -ctx.log(abs(theta / eta) ** 2) + 2 * ctx.pi * z.imag ** 2
>>> abs(evaluate(regular, z, ctx) - ctx.log(abs(z) ** 2) - exact) < 1e-10
True
"""

from __future__ import annotations

from functools import lru_cache
from math import comb

import mpmath

from ledger.errors import LedgerError

Poly = dict  # {(j, k): coefficient of z^j zbar^k}


def poly_add(p: Poly, q: Poly, scale=1) -> Poly:
    out = dict(p)
    for key, c in q.items():
        out[key] = out.get(key, 0) + scale * c
    return out


def poly_mul(p: Poly, q: Poly, degree: int) -> Poly:
    out: Poly = {}
    for (j1, k1), c1 in p.items():
        for (j2, k2), c2 in q.items():
            if j1 + k1 + j2 + k2 <= degree:
                key = (j1 + j2, k1 + k2)
                out[key] = out.get(key, 0) + c1 * c2
    return out


def poly_conjugate(p: Poly, ctx) -> Poly:
    """The polynomial of the complex-conjugate function: z <-> zbar, conjugated coefficients."""
    return {(k, j): ctx.conj(c) for (j, k), c in p.items()}


def evaluate(p: Poly, z, ctx):
    """sum c z^j zbar^k at the point z."""
    zb = ctx.conj(z)
    return ctx.fsum(c * z ** j * zb ** k for (j, k), c in p.items())


def _power(p: Poly, n: int, degree: int, ctx) -> Poly:
    out: Poly = {(0, 0): ctx.mpf(1)}
    for _ in range(n):
        out = poly_mul(out, p, degree)
    return out


def _real_part(p: Poly, ctx) -> Poly:
    """The polynomial of Re f, given the polynomial p of f."""
    both = poly_add(p, poly_conjugate(p, ctx))
    return {key: c / 2 for key, c in both.items()}


def _image_sum(q, e: int, t: int, ctx):
    """sum_{k>=1} k^e Li_t(q^k) = sum_N q^N sum_{r | N} (N/r)^e r^(-t), for |q| < 1."""
    eps = ctx.mpf(2) ** (-ctx.prec - 20)
    total = ctx.zero
    power = ctx.one
    n = 0
    while True:
        n += 1
        power *= q
        size = abs(power)
        if size * ctx.mpf(n) ** (abs(e) + abs(t) + 2) < eps:
            return total
        divisor_sum = 0
        for r in range(1, n + 1):
            if n % r == 0:
                divisor_sum += ctx.mpf(n // r) ** e * ctx.mpf(r) ** (-t)
        total += divisor_sum * power


def green_expansion(a: int, tau, degree: int, ctx) -> tuple:
    """(Lg_a, R_a) with G_a(z) = Lg_a(z) log|z|^2 + R_a(z) near z = 0 (polynomials in z, zbar)."""
    if not isinstance(a, int) or a < 1:
        raise LedgerError(f"edge weights must be positive integers, got {a!r}")
    tau = ctx.mpc(tau)
    log_part, regular = _green_expansion_cached(a, tau.real._mpf_, tau.imag._mpf_, degree, ctx.prec)
    convert = lambda p: {k: ctx.convert(c) for k, c in p.items()}  # noqa: E731
    return convert(log_part), convert(regular)


@lru_cache(maxsize=64)
def _green_expansion_cached(a: int, tau_real, tau_imag, degree: int, prec: int):
    ctx = mpmath.MPContext()
    ctx.prec = prec + 20
    tau = ctx.mpc(ctx.make_mpf(tau_real), ctx.make_mpf(tau_imag))
    tau2 = tau.imag
    q = ctx.expjpi(2 * tau)
    lam = 4 * ctx.pi * tau2
    v = {(1, 0): 1 / (2j * tau2), (0, 1): -1 / (2j * tau2)}
    two_pi_i = 2j * ctx.pi
    # zero mode (-1)^(a+1) lambda^a B_2a(v) / (2a)!
    regular: Poly = {}
    scale = (-1) ** (a + 1) * lam ** a / ctx.factorial(2 * a)
    for k in range(2 * a + 1):
        coefficient = ctx.bernoulli(2 * a - k) * comb(2 * a, k)
        regular = poly_add(regular, _power(v, k, degree, ctx), scale * coefficient)
    analytic: Poly = {}   # f with G_a = zero mode + Re f + (log part)
    logarithmic: Poly = {}
    for j in range(a):
        kappa = (2 * ctx.factorial(2 * a - 2 - j) * lam ** (j - a + 1)
                 / (ctx.factorial(a - 1) * ctx.factorial(j) * ctx.factorial(a - 1 - j)))
        s = 2 * a - 1 - j
        v_j = _power(v, j, degree, ctx)
        # Li_s(x0): Jonquiere, with log(-w) -> log(2 pi) + L/2 (its argument cancels in the sum)
        singular = {}
        for n in range(degree + 1):
            if n == s - 1:
                c = (ctx.harmonic(s - 1) - ctx.log(2 * ctx.pi)) / ctx.factorial(s - 1)
            else:
                c = ctx.zeta(s - n) / ctx.factorial(n)
            singular[(n, 0)] = c * two_pi_i ** n
        analytic = poly_add(analytic, poly_mul(v_j, singular, degree), kappa)
        logarithmic = poly_add(logarithmic, poly_mul(
            v_j, {(s - 1, 0): two_pi_i ** (s - 1) / ctx.factorial(s - 1)}, degree), -kappa / 2)
        # images: (v+k)^j Li_s(x0 q^k), k >= 1, and (1+k-v)^j Li_s(q^(k+1)/x0), k >= 0
        for i in range(j + 1):
            v_i = _power(v, i, degree, ctx)
            sums = [_image_sum(q, j - i, s - n, ctx) for n in range(degree + 1)]
            forward = {(n, 0): two_pi_i ** n / ctx.factorial(n) * sums[n]
                       for n in range(degree + 1)}
            backward = {(n, 0): (-two_pi_i) ** n / ctx.factorial(n) * sums[n]
                        for n in range(degree + 1)}
            analytic = poly_add(analytic, poly_mul(v_i, forward, degree), kappa * comb(j, i))
            analytic = poly_add(analytic, poly_mul(v_i, backward, degree),
                                kappa * comb(j, i) * (-1) ** i)
    regular = poly_add(regular, _real_part(analytic, ctx))
    log_part = _real_part(logarithmic, ctx)
    return _clean(log_part, ctx), _clean(regular, ctx)


def _clean(p: Poly, ctx) -> Poly:
    """Drop rounding-level entries; make real the coefficients of z^j zbar^j."""
    size = max((abs(c) for c in p.values()), default=0)
    floor = ctx.mpf(2) ** (-ctx.prec + 30) * (1 + size)
    out = {}
    for (j, k), c in p.items():
        if abs(c) <= floor:
            continue
        out[(j, k)] = ctx.re(c) if j == k else c
    return out


def bundle_expansion(weights, tau, degree: int, ctx) -> dict:
    """{l: A_l} with prod_i G_(a_i)(z) = sum_l log^l|z|^2 A_l(z) near z = 0.

    >>> import mpmath
    >>> ctx = mpmath.MPContext(); ctx.dps = 20
    >>> sorted(bundle_expansion((1, 1), ctx.mpc(0, 1), 4, ctx))   # G_1^2: L^0, L^1, L^2
    [0, 1, 2]
    """
    terms = {0: {(0, 0): ctx.mpf(1)}}
    for a in weights:
        log_part, regular = green_expansion(a, tau, degree, ctx)
        product: dict = {}
        for l, poly in terms.items():
            for power, factor in ((l, regular), (l + 1, log_part)):
                product[power] = poly_add(product.get(power, {}), poly_mul(poly, factor, degree))
        terms = product
    return terms
