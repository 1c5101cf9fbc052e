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
from ledger.mgf.bundle_fourier import fourier_coefficients, gauss_nodes
from ledger.mgf.fourier_asymptotics import bundle_series, log_constant, multiply
from ledger.mgf.jobs import Job, ensure_job
from ledger.mgf.modular import to_fundamental_domain
from ledger.mgf.values import Value

GUARD_DIGITS = 12
ABEL_PLANA_NODES = 24
SPLIT_STEP = 12     # the second split, for the error estimate, is at Z + SPLIT_STEP
MAX_SPLIT = 160.0   # beyond this the box and the quadrature grow too large
MAX_ATTEMPTS = 3


def split_radius(digits: int) -> float:
    """The split |zeta| = Z for ``digits``: exp(-Z/2) Z^4 well below 10^-digits."""
    target = (digits + 5) * math.log(10)
    return max(36.0, 2 * target - 8 * math.log(2 * target))


def cycle_value(bundles, tau, digits: int = 20, job: Job | None = None,
                reduce_tau: bool = True) -> Value:
    """sum_p prod_b B^_b(p) for a cycle of bundles, each a tuple of edge weights.

    If the error estimate misses ``digits`` the split is moved out (up to twice);
    ``reduce_tau=False`` evaluates at tau as given (for modular-invariance checks).

    >>> import mpmath
    >>> v = cycle_value([(1, 1), (1,), (1,)], mpmath.mpc(0, 1), digits=10)   # C(2,1,1)
    >>> v.correct_digits() >= 10
    True
    """
    bundles = [tuple(sorted(int(a) for a in b)) for b in bundles]
    if len(bundles) < 2 or any(not b or min(b) < 1 for b in bundles):
        raise LedgerError(f"a cycle needs at least two bundles of positive weights, got {bundles}")
    if isinstance(digits, bool) or not isinstance(digits, int) or not 1 <= digits <= 60:
        raise LedgerError(f"digits must be an integer between 1 and 60, got {digits!r}")
    job = ensure_job(job)
    job.check()
    ctx = mpmath.MPContext()
    ctx.dps = digits + GUARD_DIGITS
    tau = ctx.mpc(tau)
    if reduce_tau:
        tau = to_fundamental_domain(tau, ctx)
    elif not tau.imag > 0:
        raise LedgerError(f"tau must lie in the upper half plane, got {tau}")
    split = min(split_radius(digits), MAX_SPLIT)
    for attempt in range(MAX_ATTEMPTS):
        value, error = _cycle_sum(bundles, tau, digits, split, ctx,
                                  job.part(attempt / MAX_ATTEMPTS, (attempt + 1) / MAX_ATTEMPTS))
        if error <= ctx.mpf(10) ** (-digits) * abs(value) or split >= MAX_SPLIT:
            break
        split = min(split + 2 * SPLIT_STEP, MAX_SPLIT)
    job.report(1.0, "cycle of bundles: done")
    return Value(export(ctx.re(value)), export(error), digits)


def _cycle_sum(bundles, tau, digits, split, ctx, job):
    """(value, error) with the split at ``split`` (and the error check at split + SPLIT_STEP)."""
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
    evaluate = _product_evaluator(series, tau, outer * tau.imag / (2 * ctx.pi), ctx)
    tail, tail_error = _outside(product, evaluate, tau, outer, ctx)
    # moving the split inwards to |zeta| = split: the annulus by the series instead of the box
    annulus = ctx.zero
    for m, n in points:
        if _zeta_abs(m, n, tau, ctx) >= split:
            term = ctx.re(evaluate(m * tau + n, m * ctx.conj(tau) + n))
            annulus += term if (m, n) == (0, 0) else 2 * term
    box = [_box_sum(bundles, tables[level], points, tau, outer, ctx) for level in (0, 1)]
    inner_box = _box_sum(bundles, tables[1], points, tau, split, ctx)
    value = box[1] + tail
    error = (abs(box[1] - box[0]) + abs(box[1] - inner_box - annulus) + tail_error
             + ctx.mpf(10) ** (-digits - GUARD_DIGITS + 4) * (1 + abs(value)))
    return value, error


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


def _outside(product, evaluate, tau, z, ctx):
    """(sum over |zeta| >= z of the product series, error estimate of that computation)."""
    tau1, tau2 = tau.real, tau.imag
    radius = z * tau2 / (2 * ctx.pi)
    far_start = int(ctx.floor(radius / tau2)) + 1     # rows m >= far_start lie entirely outside
    far = _far_rows(product, tau, far_start, ctx)
    rows = ctx.zero
    error = ctx.zero
    for m in range(-far_start + 1, far_start):
        n = int(ctx.floor(-m * tau1)) + 1
        while _zeta_abs(m, n, tau, ctx) < z:
            n += 1
        tail, tail_error = _abel_plana(lambda t, m=m: evaluate(m * tau + t, m * ctx.conj(tau) + t),
                                       n, abs(m * tau + n), ctx)
        rows += tail
        error += tail_error
    return 2 * (far + rows), 2 * error


def _product_evaluator(series_list, tau, scale, ctx):
    """f(P, Q) = prod_b S_b(P, Q), S_b = sum c P^-a Q^-b Lambda^i with
    Lambda = log(4 pi^2/tau2^2) + log P + log Q (P, Q independent, for analytic continuation).

    Each S_b is written P^-a0 Q^-b0 F_b(scale/P, scale/Q) with (a0, b0) its leading
    powers; F_b (of moderate size) is summed in fixed point (complex pairs of
    integers, rounded to nearest), the powers P^-a0 Q^-b0 in floating point, so the
    error stays relative however small f is far out."""
    bits = int(ctx.prec) + 16
    one = 1 << bits
    half = one >> 1
    fixed = lambda x: int(ctx.nint(ctx.ldexp(x, bits)))  # noqa: E731
    constant = log_constant(tau, ctx)
    scale = ctx.mpf(scale)
    plans, leading_a, leading_b = [], 0, 0
    for series in series_list:
        a0 = min(a for a, _, _ in series)
        b0 = min(b for _, b, _ in series)
        leading_a, leading_b = leading_a + a0, leading_b + b0
        groups: dict = {}
        for (a, b, i), c in series.items():
            c = ctx.mpc(c) * scale ** (a0 + b0 - a - b)
            groups.setdefault((b - b0, i), []).append((a - a0, fixed(c.real), fixed(c.imag)))
        plans.append([(b, i, sorted(terms)) for (b, i), terms in groups.items()])
    top_a = max(a for plan in plans for _, _, terms in plan for a, _, _ in terms)
    top_b = max(b for plan in plans for b, _, _ in plan)
    top_i = max(i for plan in plans for _, i, _ in plan)

    def powers(zr, zi, count):
        out = [(one, 0)]
        for _ in range(count):
            r, i = out[-1]
            out.append(((r * zr - i * zi + half) >> bits, (r * zi + i * zr + half) >> bits))
        return out

    def evaluate(p, q):
        lam = constant + ctx.log(p) + ctx.log(q)
        u, w = scale / p, scale / q
        pu = powers(fixed(u.real), fixed(u.imag), top_a)
        pw = powers(fixed(w.real), fixed(w.imag), top_b)
        pl = powers(fixed(lam.real), fixed(lam.imag), top_i)
        total = (one, 0)
        for plan in plans:
            sr = si = 0
            for b, i, terms in plan:
                gr = gi = 0
                for a, cr, ci in terms:
                    ur, ui = pu[a]
                    gr += cr * ur - ci * ui
                    gi += cr * ui + ci * ur
                gr, gi = (gr + half) >> bits, (gi + half) >> bits
                xr, xi = pw[b]
                yr, yi = pl[i]
                zr, zi = (xr * yr - xi * yi + half) >> bits, (xr * yi + xi * yr + half) >> bits
                sr += gr * zr - gi * zi
                si += gr * zi + gi * zr
            sr, si = (sr + half) >> bits, (si + half) >> bits
            tr, ti = total
            total = ((tr * sr - ti * si + half) >> bits, (tr * si + ti * sr + half) >> bits)
        value = ctx.mpc(ctx.ldexp(total[0], -bits), ctx.ldexp(total[1], -bits))
        return value * p ** -leading_a * q ** -leading_b

    return evaluate


def _abel_plana(g, start: int, length, ctx):
    """(sum_{n >= start} g(n), error estimate) for g analytic and decaying like |t|^-4 or
    faster in Re t >= start, by the Abel-Plana formula

        sum = int_start^oo g + g(start)/2
              + i int_0^oo (g(start+iy) - g(start-iy)) / (e^(2 pi y) - 1) dy.

    The first integral by the trapezoid rule after t = start + length exp(pi/2 sinh v)
    (it copes with the logarithms in g at infinity), steps h and 4h/3 for the error;
    the second by Gauss-Legendre on geometric panels (two rule sizes for the error);
    both ranges cover the working precision."""
    start = ctx.mpf(start)
    reach = ctx.dps * math.log(10) + 10          # decay (in e-folds) that must be covered
    low = -math.asinh(2 * reach / math.pi)       # e^(pi/2 sinh v) below e^-reach
    high = math.asinh(2 * reach / (3 * math.pi))  # g ~ t^-4 or faster: t^-3 below e^-reach
    integrals = []
    fine_step = ctx.mpf(1) / (8 * max(1, reach / 45))   # trapezoid error ~ exp(-c/step)
    for step in (fine_step, 4 * fine_step / 3):
        total = ctx.zero
        for k in range(int(low / step), int(high / step) + 2):
            v = k * step
            e = ctx.exp(ctx.pi / 2 * ctx.sinh(v))
            total += g(start + length * e) * length * e * ctx.pi / 2 * ctx.cosh(v)
        integrals.append(total * step)
    fine, coarse = integrals
    top = reach / (2 * math.pi)                  # e^(-2 pi y) below e^-reach beyond
    panels = [(0, 1)]
    while panels[-1][1] < top:   # not beyond top: the series grows towards its singularities
        panels.append((panels[-1][1], min(2 * panels[-1][1] + 1, top)))
    corrections = []
    for nodes in (ABEL_PLANA_NODES, (2 * ABEL_PLANA_NODES) // 3):
        xs, ws = gauss_nodes(nodes, ctx)
        correction = ctx.zero
        for a, b in panels:
            for x, w in zip(xs, ws):
                y = a + (b - a) * x
                correction += (b - a) * w * (g(start + 1j * y) - g(start - 1j * y)) \
                    / ctx.expm1(2 * ctx.pi * y)
        corrections.append(correction)
    g0 = g(start)
    value = fine + g0 / 2 + 1j * corrections[0]
    error = (abs(fine - coarse) + abs(corrections[0] - corrections[1])
             + abs(g0) * ctx.exp(-reach) * 10)
    return value, error


def _far_rows(series, tau, start: int, ctx):
    """sum over m >= start, all n, of the series at p = m tau + n, by Poisson in n (exact up to
    exp(-2 pi m tau2)): sum_n f(m tau + n) = m int f(m (tau + s)) ds, then Hurwitz zeta in m."""
    c0 = log_constant(tau, ctx)
    top = max(i for _, _, i in series)
    integrals: dict = {}
    zetas: dict = {}
    total = ctx.zero
    for (a, b, i), c in series.items():
        sigma = a + b - 1
        if sigma <= 1:
            raise LedgerError("the product series does not converge over the rows")
        if (a, b) not in integrals:
            integrals[(a, b)] = _row_integrals(a, b, top, tau, ctx)
        # int (tau+s)^-a (taubar+s)^-b (c0 + 2 log m + log|tau+s|^2)^i ds, summed over m >= start
        for r in range(i + 1):
            for t in range(i - r + 1):
                if (sigma, t) not in zetas:
                    zetas[(sigma, t)] = (-1) ** t * ctx.zeta(sigma, start, derivative=t)
                coefficient = math.comb(i, r) * math.comb(i - r, t) * c0 ** (i - r - t) * 2 ** t
                total += c * coefficient * integrals[(a, b)][r] * zetas[(sigma, t)]
    return total


def _row_integrals(a: int, b: int, top: int, tau, ctx) -> list:
    """[int_R (tau+s)^-a (taubar+s)^-b log^r|tau+s|^2 ds for r = 0..top], i.e. the
    derivatives (-d/de)^r J(a+e, b+e) at e = 0 of

    J(alpha, beta) = 2 pi e^(i pi (beta-alpha)/2) Gamma(alpha+beta-1)
                     / (Gamma(alpha) Gamma(beta) (2 tau2)^(alpha+beta-1))."""
    tau2 = tau.imag

    def j(e):
        return ctx.exp(ctx.log(2 * ctx.pi) + 1j * ctx.pi * (b - a) / 2
                       + ctx.loggamma(a + b - 1 + 2 * e) - ctx.loggamma(a + e) - ctx.loggamma(b + e)
                       - (a + b - 1 + 2 * e) * ctx.log(2 * tau2))

    if top == 0:
        return [j(0)]
    return [(-1) ** r * d for r, d in enumerate(ctx.diffs(j, 0, top))]
