"""An independent evaluator of E_s for the tests, from the handbook Fourier series.

sum'_{(m,n)} tau2^s/|m tau + n|^(2s) = 2 zeta(2s) tau2^s
    + 2 sqrt(pi) Gamma(s-1/2) zeta(2s-1)/Gamma(s) tau2^(1-s)
    + 8 pi^s sqrt(tau2)/Gamma(s) sum_{n>=1} n^(s-1/2) sigma_(1-2s)(n) K_(s-1/2)(2 pi n tau2) cos(2 pi n tau1)
(common practice; e.g. D. Zagier 1981 and any text on non-holomorphic Eisenstein
series), divided by pi^s for the convention of DESIGN.md.  Only mpmath is used.
"""

import mpmath

from ledger.mgf.values import Value


def eisenstein_reference(s: int, tau, digits: int) -> Value:
    ctx = mpmath.MPContext()
    ctx.dps = digits + 15
    tau = ctx.mpc(tau)
    x, y = tau.real, tau.imag
    total = 2 * ctx.zeta(2 * s) * y ** s
    total += 2 * ctx.sqrt(ctx.pi) * ctx.gamma(s - ctx.mpf(1) / 2) * ctx.zeta(2 * s - 1) / ctx.gamma(s) * y ** (1 - s)
    prefactor = 8 * ctx.pi ** s * ctx.sqrt(y) / ctx.gamma(s)
    n = 1
    while True:
        sigma = sum(ctx.mpf(d) ** (1 - 2 * s) for d in range(1, n + 1) if n % d == 0)
        term = prefactor * ctx.mpf(n) ** (s - ctx.mpf(1) / 2) * sigma \
            * ctx.besselk(s - ctx.mpf(1) / 2, 2 * ctx.pi * n * y) * ctx.cos(2 * ctx.pi * n * x)
        total += term
        if 2 * ctx.pi * n * y > (digits + 20) * 2.31 + 50 * (s + 2):
            break
        n += 1
    value = total / ctx.pi ** s
    return Value(+value, ctx.mpf(10) ** (-digits - 8) * abs(value), digits)
