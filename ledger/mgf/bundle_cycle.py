"""Graph functions of a cycle of edge bundles (trihedral graphs and their kin).

A cycle of bundles has vertices v_1..v_k in a ring, consecutive ones joined by
a bundle of edges (weights a_b1, a_b2, ...), and no other edge.  Momentum
conservation forces the same momentum p through every bundle, so

    value = sum_p prod_b B^_b(p),

B^_b the torus Fourier coefficient of the bundle function B_b = prod_i G_(a_bi)
(p = 0 included; a single edge has B^(p) = (tau2/pi)^a / |p|^(2a), zero at p = 0).
Trihedral graphs (k = 3) and the square with two opposite edges doubled (k = 4)
are of this kind.  The sum is split at |zeta| = Z, zeta = 2 pi p / tau2:

* inside, the coefficients come from a quadrature in position space
  (:mod:`ledger.mgf.bundle_fourier`), run at two rule sizes;
* outside, each coefficient is replaced by its large-momentum series
  (:mod:`ledger.mgf.fourier_asymptotics`), accurate to about exp(-|zeta|/2),
  and the sum of the product series is done in closed form over the rows
  |m| tau2 >= Z tau2 / 2 pi (Poisson in n, then Hurwitz zeta derivatives in m)
  and by the Abel-Plana formula along the ends of the remaining rows.

Error estimate: the difference between the two quadrature rules plus the
change when the split is moved from Z to Z + 12 (which is the asymptotic error
on that annulus and bounds the error beyond it), plus the integration
tolerances.  The value returned is the one with the larger rules and split.

>>> import mpmath
>>> from ledger.mgf.eisenstein import eisenstein_value
>>> v = cycle_value([(1,), (1,), (2,)], mpmath.mpc("0.1", "1.2"), digits=15)   # a triangle: E_4
>>> abs(v.value - eisenstein_value(4, mpmath.mpc("0.1", "1.2"), 20).value) <= v.error
True
"""

from __future__ import annotations

import math

import mpmath

from ledger.errors import LedgerError
from ledger.mgf.approx import export
from ledger.mgf.bundle_fourier import fourier_coefficients
from ledger.mgf.fourier_asymptotics import bundle_series, log_constant, multiply
from ledger.mgf.jobs import Job, ensure_job
from ledger.mgf.modular import to_fundamental_domain
from ledger.mgf.values import Value

GUARD_DIGITS = 12
SPLIT_STEP = 12     # the second split, for the error estimate, is at Z + SPLIT_STEP


def split_radius(digits: int) -> float:
    """The split |zeta| = Z for ``digits``: exp(-Z/2) Z^4 well below 10^-digits."""
    target = (digits + 5) * math.log(10)
    return max(36.0, 2 * target - 8 * math.log(2 * target))


def cycle_value(bundles, tau, digits: int = 20, job: Job | None = None) -> Value:
    """sum_p prod_b B^_b(p) for a cycle of bundles, each a tuple of edge weights.

    >>> import mpmath
    >>> v = cycle_value([(1, 1), (1,), (1,)], mpmath.mpc(0, 1), digits=10)   # C(2,1,1)
    >>> v.correct_digits() >= 10
    True
    """
    bundles = [tuple(sorted(int(a) for a in b)) for b in bundles]
    if len(bundles) < 2 or any(not b or min(b) < 1 for b in bundles):
        raise LedgerError(f"a cycle needs at least two bundles of positive weights, got {bundles}")
    if not isinstance(digits, int) or not 1 <= digits <= 60:
        raise LedgerError(f"digits must be an integer between 1 and 60, got {digits!r}")
    job = ensure_job(job)
    ctx = mpmath.MPContext()
    ctx.dps = digits + GUARD_DIGITS
    tau = to_fundamental_domain(ctx.mpc(tau), ctx)
    tau2 = tau.imag
    split = split_radius(digits)
    outer = split + SPLIT_STEP
    multi = sorted({b for b in bundles if len(b) > 1})
    points = _half_box(tau, outer, ctx)
    bits = math.ceil((digits + GUARD_DIGITS) * math.log2(10)) + 16
    tables = [{}, {}]
    if multi:
        for level in (0, 1):
            coefficients = fourier_coefficients(multi, tau, points, bits, outer, level,
                                                job.part(0.05 + 0.4 * level, 0.45 + 0.4 * level))
            tables[level] = dict(zip(multi, coefficients))
    degree = _series_degree(digits, split)
    series = [bundle_series(b, tau, degree, ctx) for b in bundles]
    leading = sum(min(a + b for a, b, _ in s) for s in series)
    product = series[0]
    for s in series[1:]:
        product = multiply(product, s, leading + degree)
    job.report(0.9, "cycle of bundles: sums beyond the split")
    results = {}
    for z in (split, outer):
        tail, tail_error = _outside(product, tau, z, digits, ctx)
        for level in (0, 1):
            box = _box_sum(bundles, tables[level], points, tau, z, ctx)
            results[(z, level)] = (box + tail, tail_error)
    value, tail_error = results[(outer, 1)]
    error = (abs(value - results[(outer, 0)][0]) + abs(value - results[(split, 1)][0])
             + tail_error + results[(split, 1)][1] + ctx.mpf(10) ** (-digits - GUARD_DIGITS + 4))
    job.report(1.0, "cycle of bundles: done")
    return Value(export(ctx.re(value)), export(error), digits)


def _series_degree(digits: int, split: float) -> int:
    """Degree of the local expansions: the terms (j+k)! (2/Z)^(j+k) fall below the target."""
    target = -(digits + 8) * math.log(10)
    degree = 4
    while degree < split / 2 and math.lgamma(degree + 1) + degree * math.log(2 / split) > target:
        degree += 2
    return degree


def _zeta_abs(m, n, tau, ctx):
    return 2 * ctx.pi * abs(m * tau + n) / tau.imag


def _half_box(tau, z, ctx) -> list:
    """(m, n) with |zeta| < z and m > 0 or (m = 0, n >= 0)."""
    radius = z * tau.imag / (2 * ctx.pi)
    points = []
    m = 0
    while m * tau.imag < radius:
        width = ctx.sqrt(radius ** 2 - (m * tau.imag) ** 2)
        centre = -m * tau.real
        for n in range(int(ctx.floor(centre - width)), int(ctx.ceil(centre + width)) + 1):
            if (m > 0 or n >= 0) and _zeta_abs(m, n, tau, ctx) < z:
                points.append((m, n))
        m += 1
    return points


def _single(a, m, n, tau, ctx):
    if m == 0 and n == 0:
        return ctx.zero
    return (tau.imag / ctx.pi) ** a / abs(m * tau + n) ** (2 * a)


def _box_sum(bundles, table, points, tau, z, ctx):
    """sum over |zeta| < z of prod_b B^_b(p), using p -> -p symmetry."""
    total = ctx.zero
    for m, n in points:
        if _zeta_abs(m, n, tau, ctx) >= z:
            continue
        term = ctx.one
        for b in bundles:
            term *= table[b][(m, n)] if len(b) > 1 else _single(b[0], m, n, tau, ctx)
        total += term if (m, n) == (0, 0) else 2 * term
    return total


def _outside(product, tau, z, digits, ctx):
    """(sum over |zeta| >= z of the product series, error estimate of that computation)."""
    tau1, tau2 = tau.real, tau.imag
    radius = z * tau2 / (2 * ctx.pi)
    far_start = int(ctx.floor(radius / tau2)) + 1     # rows m >= far_start lie entirely outside
    far = _far_rows(product, tau, far_start, ctx)
    rows = ctx.zero
    error = ctx.zero
    evaluate = _series_evaluator(product, tau, ctx)
    for m in range(-far_start + 1, far_start):
        n = int(ctx.floor(-m * tau1)) + 1
        while _zeta_abs(m, n, tau, ctx) < z:
            n += 1
        tail, tail_error = _abel_plana(lambda t, m=m: evaluate(m * tau + t, m * ctx.conj(tau) + t),
                                       n, ctx)
        rows += tail
        error += tail_error
    return 2 * (far + rows), 2 * error


def _series_evaluator(series, tau, ctx):
    """f(P, Q) = sum c P^-a Q^-b Lambda^i, Lambda = log(4 pi^2/tau2^2) + log P + log Q (Horner in 1/P)."""
    constant = log_constant(tau, ctx)
    grouped: dict = {}
    for (a, b, i), c in series.items():
        grouped.setdefault(i, {}).setdefault(b, {})[a] = c
    plan = []
    for i, by_b in grouped.items():
        rows = []
        for b, by_a in by_b.items():
            top = max(by_a)
            rows.append((b, [by_a.get(a, 0) for a in range(top + 1)]))
        plan.append((i, rows))

    def evaluate(p, q):
        lam = constant + ctx.log(p) + ctx.log(q)
        ip, iq = 1 / p, 1 / q
        total = 0
        for i, rows in plan:
            part = 0
            for b, coefficients in rows:
                acc = 0
                for c in reversed(coefficients):
                    acc = acc * ip + c
                part += acc * iq ** b
            total += part * lam ** i
        return total

    return evaluate


def _abel_plana(g, start: int, ctx):
    """sum_{n >= start} g(n) for g analytic and decaying in Re t >= start (Abel-Plana)."""
    start = ctx.mpf(start)
    integral, e1 = ctx.quad(g, [start, start + 8, ctx.inf], error=True)
    correction, e2 = ctx.quad(lambda y: (g(start + 1j * y) - g(start - 1j * y)) / ctx.expm1(2 * ctx.pi * y),
                              [0, 1, ctx.inf], error=True)
    value = integral + g(start) / 2 + 1j * correction
    return value, abs(e1) + abs(e2)


def _far_rows(series, tau, start: int, ctx):
    """sum over m >= start, all n, of the series at p = m tau + n, by Poisson in n (exact up to
    exp(-2 pi m tau2)): sum_n f(m tau + n) = m int f(m (tau + s)) ds, then Hurwitz zeta in m."""
    tau2 = tau.imag
    c0 = log_constant(tau, ctx)
    unit_p = ctx.one   # the series is written directly in p and pbar
    total = ctx.zero
    cache: dict = {}
    for (a, b, i), c in series.items():
        sigma = a + b - 1
        if sigma <= 1:
            raise LedgerError("the product series does not converge over the rows")
        # int (tau+s)^-a (taubar+s)^-b (c0 + 2 log m + log|tau+s|^2)^i ds, summed over m >= start
        for r in range(i + 1):
            key = (a, b, r)
            if key not in cache:
                cache[key] = _row_integral(a, b, r, tau, ctx)
            j = cache[key]
            for t in range(i - r + 1):
                coefficient = (math.comb(i, r) * math.comb(i - r, t) * c0 ** (i - r - t) * 2 ** t)
                zeta_sum = (-1) ** t * ctx.zeta(sigma, start, derivative=t)
                total += c * unit_p * coefficient * j * zeta_sum
    return total


def _row_integral(a: int, b: int, r: int, tau, ctx):
    """int_R (tau+s)^-a (taubar+s)^-b log^r|tau+s|^2 ds = (-d/de)^r J(a+e, b+e) at e = 0,

    J(alpha, beta) = 2 pi e^(i pi (beta-alpha)/2) Gamma(alpha+beta-1) / (Gamma(alpha) Gamma(beta) (2 tau2)^(alpha+beta-1))."""
    tau2 = tau.imag

    def log_j(e):
        return (ctx.log(2 * ctx.pi) + 1j * ctx.pi * (b - a) / 2 + ctx.loggamma(a + b - 1 + 2 * e)
                - ctx.loggamma(a + e) - ctx.loggamma(b + e) - (a + b - 1 + 2 * e) * ctx.log(2 * tau2))

    if r == 0:
        return ctx.exp(log_j(0))
    derivatives = ctx.diffs(lambda e: ctx.exp(log_j(e)), 0, r)
    return (-1) ** r * list(derivatives)[r]
