"""Non-holomorphic Eisenstein series E_s(tau) = sum' (tau2/pi)^s / |m tau + n|^(2s).

Fourier expansion (y = pi tau2; e.g. Terras, Harmonic Analysis on Symmetric
Spaces I, or any text on Epstein zeta functions):

    E_s = 2 zeta(2s) y^s / pi^(2s) + 2 Gamma(s-1/2) zeta(2s-1) / (sqrt(pi) Gamma(s)) y^(1-s)
          + (8 / Gamma(s)) sqrt(tau2) sum_{N>=1} N^(s-1/2) sigma_(1-2s)(N)
            K_(s-1/2)(2 pi N tau2) cos(2 pi N tau1),

with K_(s-1/2) elementary for integer s.  tau is first reduced to the
fundamental domain (E_s is modular invariant), so the series converges like
exp(-2 pi N tau2) <= exp(-pi sqrt(3) N).

>>> ctx = mpmath.MPContext(); ctx.dps = 40
>>> v = eisenstein_value(3, mpmath.mpc(0, 1), digits=25)
>>> abs(ctx.convert(v.value) - ctx.zeta(3) / 8) <= v.error < 1e-25   # E_3(i) = zeta(3)/8
True
"""

from __future__ import annotations

import math

import mpmath

from ledger.errors import DivergentGraphError, LedgerError
from ledger.mgf.approx import export
from ledger.mgf.jobs import Job
from ledger.mgf.modular import to_fundamental_domain
from ledger.mgf.values import Value

GUARD_DIGITS = 10


def laurent_coefficients(s: int, ctx):
    """(c_s, c_(1-s)) with E_s = c_s y^s + c_(1-s) y^(1-s) + O(exp(-2y)).

    >>> c, d = laurent_coefficients(2, mpmath.mp)
    >>> mpmath.nstr(c, 10), mpmath.nstr(d / mpmath.zeta(3), 10)   # E_2: y^2/45 + zeta(3)/y
    ('0.02222222222', '1.0')
    """
    leading = 2 * ctx.zeta(2 * s) / ctx.pi ** (2 * s)
    sub = 2 * ctx.gamma(s - ctx.mpf(1) / 2) * ctx.zeta(2 * s - 1) / (ctx.sqrt(ctx.pi) * ctx.gamma(s))
    return leading, sub


def eisenstein_value(s: int, tau, digits: int = 30, job: Job | None = None) -> Value:
    """E_s(tau) with an error bound (s >= 2 an integer).

    >>> v = eisenstein_value(2, mpmath.mpc("0.27", "1.31"), digits=20)
    >>> v.correct_digits() >= 20
    True
    """
    if isinstance(s, bool) or not isinstance(s, int):
        raise LedgerError(f"E(s) needs an integer s >= 2, got {s!r}")
    if s == 1:
        raise DivergentGraphError(
            "E(1) diverges: its lattice sum is logarithmically divergent; "
            "Kronecker's first limit formula gives its regularised value, not a number here")
    if s < 2:
        raise LedgerError(f"E(s) needs an integer s >= 2, got {s}")
    if isinstance(digits, bool) or not isinstance(digits, int) or not 1 <= digits <= 1000:
        raise LedgerError(f"digits must be an integer between 1 and 1000, got {digits!r}")
    ctx = mpmath.MPContext()
    ctx.dps = digits + GUARD_DIGITS + s
    tau = to_fundamental_domain(ctx.mpc(tau), ctx)
    tau1, tau2 = tau.real, tau.imag
    y = ctx.pi * tau2
    leading, sub = laurent_coefficients(s, ctx)
    laurent = leading * y ** s + sub * y ** (1 - s)
    # K_(s-1/2)(x) = sqrt(pi/(2x)) e^(-x) sum_k (s-1+k)!/(k!(s-1-k)!) (2x)^(-k)
    bessel_coefficients = [ctx.mpf(math.factorial(s - 1 + k))
                           / (math.factorial(k) * math.factorial(s - 1 - k)) for k in range(s)]
    target = ctx.mpf(10) ** (-(digits + GUARD_DIGITS // 2)) * laurent
    prefactor = 8 * ctx.sqrt(tau2) / ctx.gamma(s)
    series = ctx.zero
    bound = ctx.zero
    n = 0
    while True:
        n += 1
        x = 2 * ctx.pi * n * tau2
        bessel = ctx.sqrt(ctx.pi / (2 * x)) * ctx.exp(-x) * ctx.fsum(
            c / (2 * x) ** k for k, c in enumerate(bessel_coefficients))
        divisor_sum = ctx.fsum(ctx.mpf(d) ** (1 - 2 * s) for d in range(1, n + 1) if n % d == 0)
        size = prefactor * ctx.mpf(n) ** (s - ctx.mpf(1) / 2) * divisor_sum * bessel
        series += size * ctx.cos(2 * ctx.pi * n * tau1)
        # the tail after n is below size * sum_k (e^(-2 pi tau2) (1+1/n)^s)^k
        ratio = ctx.exp(-2 * ctx.pi * tau2) * (1 + ctx.mpf(1) / n) ** (s + 1) * ctx.zeta(2 * s - 1)
        if ratio < 1 and size * ratio / (1 - ratio) < target:
            bound = size * ratio / (1 - ratio)
            break
        if job is not None:
            job.check()
    value = laurent + series
    error = bound + ctx.mpf(10) ** (-(digits + GUARD_DIGITS // 2)) * abs(value)
    return Value(export(value), export(error), digits)
