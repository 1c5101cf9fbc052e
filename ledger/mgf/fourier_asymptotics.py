"""Large-momentum expansion of the Fourier coefficients of a bundle of edges.

A bundle B(z) = prod_i G_(a_i)(z) has torus Fourier coefficients

    B^(p) = (1/tau2) int_torus B(z) conj(chi_p(z)) d^2z,   p = m tau + n,

(chi_p as in :mod:`ledger.mgf.lattice`), and a cycle of bundles is sum_p prod_b B^_b(p).
For large |p| the coefficient is governed by the singular terms z^j zbar^k log^l|z|^2
(l >= 1) of the expansion of B at z = 0 (:mod:`ledger.mgf.green_expansion`): with
zeta = 2 pi i p / tau2 (so that conj(chi_p(z)) = exp(i Re(zeta zbar))), the
two-dimensional Fourier transform of |z|^(2s) is pi 4^(s+1) Gamma(s+1)/Gamma(-s) |zeta|^(-2s-2)
(e.g. Gel'fand and Shilov, Generalized Functions I, ch. II.3), z and zbar act as
-2i d/dzetabar and -2i d/dzeta, and log^l|z|^2 = d^l/ds^l |z|^(2s) at s = 0; the
polynomial terms (l = 0) give nothing at p != 0.  Hence

    B^(p) ~ sum c_(a,b,i) p^(-a) pbar^(-b) Lambda^i,   Lambda = log|zeta|^2.

The series is asymptotic: its terms shrink like (j+k)! (2/|zeta|)^(j+k), so at
a given p it is accurate to about exp(-|zeta|/2) (the singularities of the
regular part at the other lattice points).  Series are dicts {(a, b, i): c};
for analytic continuation (p, pbar) are passed as two independent numbers P, Q
and Lambda = log(4 pi^2/tau2^2) + log P + log Q.

>>> import mpmath
>>> ctx = mpmath.MPContext(); ctx.dps = 20
>>> tau = ctx.mpc(0, 1)
>>> series = fourier_series({1: {(0, 0): ctx.mpf(-1)}}, tau, ctx)   # -log|z|^2 -> G_1's coefficient
>>> p = ctx.mpc(2, 3)
>>> abs(evaluate(series, p, ctx.conj(p), tau, ctx) - 1 / (ctx.pi * abs(p) ** 2)) < 1e-18
True
"""

from __future__ import annotations

from math import comb

from ledger.mgf.green_expansion import bundle_expansion

Series = dict  # {(a, b, i): coefficient of p^-a pbar^-b Lambda^i}


def _series_mul(a: list, b: list, n: int) -> list:
    return [sum(a[i] * b[k - i] for i in range(k + 1)) for k in range(n)]


def _series_exp(a: list, n: int, ctx) -> list:
    """exp of a power series with a[0] = 0."""
    out = [ctx.zero] * n
    out[0] = ctx.one
    for k in range(1, n):
        out[k] = ctx.fsum(i * a[i] * out[k - i] for i in range(1, k + 1)) / k
    return out


def _transform_prefactor(n: int, ctx) -> list:
    """Taylor coefficients at s = 0 of pi 4^(s+1) Gamma(s+1)/Gamma(-s)
    = -4 pi s 4^s Gamma(1+s)/Gamma(1-s), from
    log(4^s Gamma(1+s)/Gamma(1-s)) = s log 4 - 2 gamma s - 2 sum_(k odd >= 3) zeta(k) s^k / k."""
    exponent = [ctx.zero] * n
    if n > 1:
        exponent[1] = ctx.log(4) - 2 * ctx.euler
    for k in range(3, n, 2):
        exponent[k] = -2 * ctx.zeta(k) / k
    g = _series_exp(exponent, n, ctx)
    return [ctx.zero] + [-4 * ctx.pi * g[i] for i in range(n - 1)]


def _falling(k: int, n: int, ctx) -> list:
    """Taylor coefficients of (-s-1)(-s-2)...(-s-k)."""
    out = [ctx.one] + [ctx.zero] * (n - 1)
    for i in range(1, k + 1):
        out = _series_mul(out, [ctx.mpf(-i), ctx.mpf(-1)] + [ctx.zero] * (n - 2), n)
    return out


def fourier_series(local: dict, tau, ctx) -> Series:
    """The asymptotic series of B^(p) from the expansion {l: {(j, k): A}} of B at z = 0."""
    tau2 = ctx.mpc(tau).imag
    n = max(local) + 1
    prefactor = _transform_prefactor(n, ctx)
    unit = 2j * ctx.pi / tau2        # zeta = unit * p, zetabar = -unit * pbar
    falling_cache: dict = {}

    def falling(k):
        if k not in falling_cache:
            falling_cache[k] = _falling(k, n, ctx)
        return falling_cache[k]

    out: Series = {}
    for l, poly in local.items():
        if l == 0:
            continue
        for (j, k), value in poly.items():
            phi = _series_mul(_series_mul(prefactor, falling(k), n), falling(j), n)
            base = value / tau2 * (-2j) ** (j + k) * unit ** (-1 - k) * (-unit) ** (-1 - j)
            for i in range(l + 1):
                derivative = phi[l - i] * ctx.factorial(l - i)
                key = (1 + k, 1 + j, i)
                out[key] = out.get(key, 0) + base * comb(l, i) * derivative * (-1) ** i
    return out


def bundle_series(weights, tau, degree: int, ctx) -> Series:
    """The asymptotic series of the Fourier coefficients of prod_i G_(a_i)."""
    weights = tuple(weights)
    if len(weights) == 1:   # a single edge is exact: (tau2/pi)^a / |p|^(2a)
        a = weights[0]
        return {(a, a, 0): (ctx.mpc(tau).imag / ctx.pi) ** a}
    return fourier_series(bundle_expansion(weights, tau, degree, ctx), tau, ctx)


def multiply(s1: Series, s2: Series, max_order: int) -> Series:
    """The product series, keeping terms with a + b <= max_order."""
    out: Series = {}
    for (a1, b1, i1), c1 in s1.items():
        for (a2, b2, i2), c2 in s2.items():
            if a1 + a2 + b1 + b2 <= max_order:
                key = (a1 + a2, b1 + b2, i1 + i2)
                out[key] = out.get(key, 0) + c1 * c2
    return out


def log_constant(tau, ctx):
    """log(4 pi^2 / tau2^2): Lambda = this + log p + log pbar."""
    return ctx.log(4 * ctx.pi ** 2 / ctx.mpc(tau).imag ** 2)


def evaluate(series: Series, p, pbar, tau, ctx):
    """The series at (p, pbar) (independent numbers for analytic continuation)."""
    lam = log_constant(tau, ctx) + ctx.log(p) + ctx.log(pbar)
    inv_p, inv_q = 1 / p, 1 / pbar
    total = 0
    powers_p: dict = {}
    powers_q: dict = {}
    for (a, b, i), c in series.items():
        if a not in powers_p:
            powers_p[a] = inv_p ** a
        if b not in powers_q:
            powers_q[b] = inv_q ** b
        total += c * powers_p[a] * powers_q[b] * lam ** i
    return total
