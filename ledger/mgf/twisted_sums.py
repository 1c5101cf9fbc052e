"""Twisted Eisenstein-type lattice sums with rational characteristics.

    Etw(s, alpha, beta | tau) = sum'_{(m,n)} (tau2/pi)^s exp(2 pi i (m alpha - n beta)) / |m tau + n|^(2s)

for integer s >= 1 and (alpha, beta) in Q^2; it is real, periodic in alpha
and beta, Etw(s, 0, 0) = E_s, and Etw(1, alpha, beta) is the scalar Green's
function at z = alpha + beta tau. Under tau -> (a tau + b)/(c tau + d) it
satisfies Etw(s, alpha, beta | gamma tau) = Etw(s, d alpha + b beta, c alpha + a beta | tau).

Evaluation: Poisson resummation in n. With y = pi tau2, xi = k + beta:

    Etw = (-1)^(s+1) 4^s B_2s(beta) y^s / (2s)!                     (m = 0)
        + [beta in Z] 2 g_s C_(2s-1)(alpha) y^(1-s)                     (xi = 0)
        + (2/Gamma(s)) sum_j a_j (4 pi tau2)^-j sum_xi |xi|^(s-1-j) Re Li_(s+j)(w_xi)

with g_s = Gamma(s-1/2)/(sqrt(pi) Gamma(s)), C_r(alpha) = sum_{m>=1} cos(2 pi m alpha)/m^r,
a_j = (s-1+j)!/(j!(s-1-j)!) (the terms of K_(s-1/2)), and
w_xi = exp(2 pi i (alpha + tau1 xi) - 2 pi tau2 |xi|). The first two lines are
the Laurent polynomial in y (exact, :func:`twisted_eisenstein_laurent`), the
last decays like exp(-2 pi tau2 |xi|); its xi- and m-tails are bounded
geometrically, which is the error estimate.

>>> v = twisted_eisenstein(2, 0, 0, 5j, digits=20)      # E_2(5i)
>>> laurent = twisted_eisenstein_laurent(2, 0, 0)
>>> sorted(laurent.items())
[(-1, zeta(3)), (2, 1/45)]
>>> y = 5 * mpmath.pi   # the rest is O(exp(-2 pi tau2)) ~ 1e-13
>>> abs(v.value - y**2 / 45 - mpmath.zeta(3) / y) < 1e-12
True
"""

from __future__ import annotations

from fractions import Fraction
from math import factorial

import mpmath
import sympy

from ledger.errors import DivergentGraphError, LedgerError
from ledger.mgf.approx import Approx, as_tau, refine
from ledger.mgf.jobs import Job, ensure_job
from ledger.mgf.values import Value

MAX_POLYLOG_TERMS = 200_000
# cos(2 pi / order) for the orders at which it is rational
RATIONAL_COSINES = {1: sympy.Integer(1), 2: sympy.Integer(-1), 3: sympy.Rational(-1, 2),
                    4: sympy.Integer(0), 6: sympy.Rational(1, 2)}


def as_rational(x, what: str = "characteristic") -> Fraction:
    """An exact rational from int, Fraction, sympy Rational or text like '1/3'."""
    try:
        if isinstance(x, sympy.Basic):
            if not x.is_Rational:
                raise ValueError
            return Fraction(int(x.p), int(x.q))
        if isinstance(x, (int, Fraction, str)) and not isinstance(x, bool):
            return Fraction(x)
    except (ValueError, ZeroDivisionError):
        pass
    raise LedgerError(f"{what} must be a rational number, got {x!r}")


def as_weight(s) -> int:
    """A positive integer weight s (sympy Integer accepted)."""
    if isinstance(s, sympy.Basic) and s.is_Integer:
        s = int(s)
    if isinstance(s, bool) or not isinstance(s, int) or s < 1:
        raise LedgerError(f"the weight s must be a positive integer, got {s!r}")
    return s


def reduced_characteristic(alpha, beta) -> tuple[Fraction, Fraction]:
    """(alpha, beta) reduced into [0, 1)^2."""
    return as_rational(alpha) % 1, as_rational(beta) % 1


def twisted_eisenstein(s, alpha, beta, tau, digits: int = 30,
                       job: Job | None = None) -> Value:
    """Etw(s, alpha, beta | tau) with an error bound (see the module docstring).

    >>> g = twisted_eisenstein(1, Fraction(1, 2), 0, 1j, digits=20)   # G(1/2 | i)
    >>> abs(g.value + mpmath.log(2) / 2) < 1e-14   # the three half periods sum to -2 log 2
    True
    """
    s = as_weight(s)
    alpha, beta = reduced_characteristic(alpha, beta)
    if s == 1 and alpha == 0 and beta == 0:
        raise DivergentGraphError("Etw(1, 0, 0) is the Green's function at z = 0, "
                                  "which diverges logarithmically")
    job = ensure_job(job)
    return refine(lambda ctx: twisted_eisenstein_approx(ctx, s, alpha, beta, as_tau(tau, ctx), job),
                  digits).to_value(digits)


def twisted_eisenstein_laurent(s, alpha, beta) -> dict[int, sympy.Expr]:
    """The exact Laurent polynomial of Etw(s, alpha, beta) in y = pi tau2:
    {power: coefficient}. For beta not in Z only y^s survives (the other
    terms oscillate in tau1 with non-integer frequency and decay).

    >>> twisted_eisenstein_laurent(1, sympy.Rational(1, 3), 0)
    {1: 1/3, 0: -log(3)}
    >>> twisted_eisenstein_laurent(2, 0, sympy.Rational(1, 2))
    {2: -7/360}
    """
    s = as_weight(s)
    alpha, beta = reduced_characteristic(alpha, beta)
    if s == 1 and alpha == 0 and beta == 0:
        raise DivergentGraphError("Etw(1, 0, 0) diverges; it has no Laurent polynomial")
    terms = {s: _power_coefficient(s, beta)}
    if beta == 0:
        g_s = sympy.Rational(factorial(2 * s - 2), 4 ** (s - 1) * factorial(s - 1) ** 2)
        constant = sympy.simplify(2 * g_s * cosine_dirichlet_exact(2 * s - 1, alpha))
        terms[1 - s] = sympy.expand_log(constant, force=True)
    return terms


def _power_coefficient(s: int, beta: Fraction) -> sympy.Expr:
    b = sympy.bernoulli(2 * s, sympy.Rational(beta.numerator, beta.denominator))
    return sympy.Integer(-1) ** (s + 1) * 4 ** s * b / factorial(2 * s)


def cosine_dirichlet_exact(r: int, alpha: Fraction) -> sympy.Expr:
    """C_r(alpha) = sum_{m>=1} cos(2 pi m alpha)/m^r exactly (r >= 1, not r = 1 at alpha = 0).

    >>> cosine_dirichlet_exact(3, Fraction(1, 2))
    -3*zeta(3)/4
    """
    if r == 1:
        return -sympy.log(2 * sympy.sin(sympy.pi * sympy.Rational(alpha.numerator, alpha.denominator)))
    q = alpha.denominator
    if q in RATIONAL_COSINES:
        # cos(2 pi m alpha) depends only on g = gcd(m, q): it is cos(2 pi / (q/g))
        total = sympy.Integer(0)
        for g in divisors(q):
            coprime_density = sympy.Integer(1)
            for p in sympy.primefactors(q // g):
                coprime_density *= 1 - sympy.Rational(1, p ** r)
            total += RATIONAL_COSINES[q // g] * coprime_density / sympy.Integer(g) ** r
        return sympy.nsimplify(total) * sympy.zeta(r)
    p = alpha.numerator
    return sum(sympy.cos(2 * sympy.pi * j * p / q) * sympy.zeta(r, sympy.Rational(j, q))
               for j in range(1, q + 1)) / sympy.Integer(q) ** r


def _cosine_dirichlet(ctx, r: int, alpha: Fraction) -> Approx:
    """C_r(alpha) numerically (Hurwitz zeta values, rounding-level error)."""
    if r == 1:
        value = -ctx.log(2 * ctx.sinpi(ctx.mpf(alpha.numerator) / alpha.denominator))
        return Approx(ctx, value, 8 * ctx.eps * (1 + abs(value)))
    q, p = alpha.denominator, alpha.numerator
    terms = [ctx.cospi(ctx.mpf(2 * j * p) / q) * ctx.zeta(r, ctx.mpf(j) / q)
             for j in range(1, q + 1)]
    value = ctx.fsum(terms) / ctx.mpf(q) ** r
    return Approx(ctx, value, (10 + q) * ctx.eps * ctx.fsum(abs(t) for t in terms))


def twisted_eisenstein_approx(ctx, s: int, alpha: Fraction, beta: Fraction, tau,
                              job: Job | None = None) -> Approx:
    """Etw in the context ``ctx``; (alpha, beta) reduced into [0, 1)^2, not both 0 if s = 1."""
    job = ensure_job(job)
    tau1, tau2 = tau.real, tau.imag
    y = ctx.pi * tau2
    b = _power_coefficient(s, beta)
    total = Approx(ctx, ctx.mpf(int(b.p)) / int(b.q) * y ** s, 4 * ctx.eps * abs(y ** s))
    if beta == 0:
        g_s = ctx.mpf(factorial(2 * s - 2)) / (4 ** (s - 1) * factorial(s - 1) ** 2)
        zero_mode = _cosine_dirichlet(ctx, 2 * s - 1, alpha)
        total = total + Approx.exact(ctx, 2 * g_s * y ** (1 - s)) * zero_mode
    bessel = [ctx.mpf(factorial(s - 1 + j)) / (factorial(j) * factorial(s - 1 - j))
              / (4 * ctx.pi * tau2) ** j for j in range(s)]
    prefactor = ctx.mpf(2) / factorial(s - 1)
    alpha_mp = ctx.mpf(alpha.numerator) / alpha.denominator
    decay = 2 * ctx.pi * tau2
    scale = abs(total.value) + total.error
    exponential = Approx(ctx, ctx.zero, ctx.zero)
    for xi, distance in _shifts(beta):
        tail = _xi_tail(ctx, s, bessel, decay, distance)
        if tail is not None and tail <= ctx.eps * scale:
            break
        xi_mp = ctx.mpf(xi.numerator) / xi.denominator
        d_mp = abs(xi_mp)
        w = ctx.expjpi(2 * (alpha_mp + tau1 * xi_mp)) * ctx.exp(-decay * d_mp)
        for j in range(s):
            li = _polylog_series(ctx, s + j, w)
            weight = Approx.exact(ctx, prefactor * bessel[j] * d_mp ** (s - 1 - j))
            exponential = exponential + weight * li.real
        scale = max(scale, abs(exponential.value))
        job.check()
    return total + exponential + Approx(ctx, ctx.zero, tail)


def _shifts(beta: Fraction):
    """xi = k + beta != 0 in order of increasing |xi|, as (xi, |xi|)."""
    positive = beta if beta > 0 else Fraction(1)
    negative = beta - 1
    while True:
        if positive <= -negative:
            yield positive, positive
            positive += 1
        else:
            yield negative, -negative
            negative -= 1


def _xi_tail(ctx, s, bessel, decay, distance: Fraction):
    """Bound on the xi-terms with |xi| >= distance, both signs (None if not decaying yet)."""
    x = ctx.mpf(distance.numerator) / distance.denominator
    ratio = (1 + 1 / x) ** (s - 1) * ctx.exp(-decay)
    if ratio >= 0.5:
        return None
    w = ctx.exp(-decay * x)
    # |Re Li_r(w)| <= w/(1-w); |xi|^(s-1-j) <= |xi|^(s-1)/x^j for |xi| >= x
    per_term = sum(bessel[j] / x ** j for j in range(s)) * 2 / factorial(s - 1) / (1 - w)
    return 2 * 2 * per_term * x ** (s - 1) * w / (1 - ratio)


def _polylog_series(ctx, r: int, w) -> Approx:
    """Li_r(w) = sum w^m/m^r for |w| < 1 with the geometric tail bound."""
    size = abs(w)
    power = w
    total = ctx.zero
    magnitudes = ctx.zero
    m = 1
    while True:
        term = power / ctx.mpf(m) ** r
        total += term
        magnitudes += abs(term)
        m += 1
        tail = size ** m / (ctx.mpf(m) ** r * (1 - size))
        if tail <= ctx.eps * abs(w) / 4:
            break
        if m > MAX_POLYLOG_TERMS:
            raise LedgerError("the twisted lattice sum converges too slowly here "
                              "(characteristic with a large denominator or tau2 too small)")
        power *= w
    return Approx(ctx, total, 2 * tail + (10 + 2 * m) * ctx.eps * magnitudes)


def divisors(n: int) -> list[int]:
    """The positive divisors of n, increasing."""
    return [d for d in range(1, n + 1) if n % d == 0]
