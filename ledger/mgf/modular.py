"""Reduction to the fundamental domain of SL(2, Z), for tau and for torus points.

Graph functions are modular invariant, so the engine evaluates them at the
representative of tau in F = {|tau1| <= 1/2, |tau| >= 1}, where q = exp(2 pi i tau)
is smallest (|q| <= exp(-pi sqrt 3)).  A torus point z moves with the lattice:
z -> z / (c tau + d).

>>> import mpmath
>>> to_fundamental_domain(mpmath.mpc("0.1", "0.2"))
mpc(real='0.0', imag='4.0')
>>> to_fundamental_domain(mpmath.mpc(3, 2))
mpc(real='0.0', imag='2.0')
"""

from __future__ import annotations

import mpmath

from ledger.errors import LedgerError

MAX_STEPS = 10_000


def reduce_tau(tau, ctx=None):
    """(tau', (a, b, c, d)) with tau' = (a tau + b)/(c tau + d) in F."""
    ctx = ctx or mpmath.mp
    tau = ctx.mpc(tau)
    if not tau.imag > 0:
        raise LedgerError(f"tau must lie in the upper half plane (Im tau > 0), got {tau}")
    a, b, c, d = 1, 0, 0, 1
    slack = ctx.mpf(2) ** (-ctx.prec + 8)
    for _ in range(MAX_STEPS):
        shift = int(ctx.nint(tau.real))
        if shift:
            tau -= shift
            a, b = a - shift * c, b - shift * d
        if abs(tau) ** 2 < 1 - slack:
            tau = -1 / tau
            a, b, c, d = -c, -d, a, b
            continue
        break
    else:  # pragma: no cover - needs tau2 below 2^-MAX_STEPS
        raise LedgerError("tau is too close to the real axis to reduce")
    if tau.real < 0 and abs(abs(tau) - 1) <= slack:
        tau = -1 / tau  # boundary: prefer tau1 >= 0 on the unit circle
        a, b, c, d = -c, -d, a, b
    if abs(tau.real + ctx.mpf(1) / 2) <= slack:
        tau += 1
        a, b = a + c, b + d
    return tau, (a, b, c, d)


def to_fundamental_domain(tau, ctx=None):
    """The SL(2, Z) image of tau in the fundamental domain F."""
    return reduce_tau(tau, ctx)[0]


def reduce_point(u, v, tau, ctx):
    """Reduce the torus point z = u + v tau together with tau.

    Returns (tau', x, y): tau' in F and the equivalent point x + i y of the
    lattice Z + Z tau' (up to z -> -z) with |x| <= 1/2 and 0 <= y <= tau2'/2.

    >>> import mpmath
    >>> tau, x, y = reduce_point(mpmath.mpf("0.3"), mpmath.mpf("0.9"), mpmath.mpc(0, 1), mpmath.mp)
    >>> (tau, mpmath.nstr(x, 5), mpmath.nstr(y, 5))
    (mpc(real='0.0', imag='1.0'), '-0.3', '0.1')
    """
    tau0 = ctx.mpc(tau)
    tau_f, (a, b, c, d) = reduce_tau(tau0, ctx)
    z = (u + v * tau0) / (c * tau0 + d)
    t1, t2 = tau_f.real, tau_f.imag
    v2 = z.imag / t2
    u2 = z.real - v2 * t1  # coordinates z = u2 + v2 tau'; u2 is unchanged by z -> z - tau'
    v2 -= ctx.floor(v2)
    if v2 > ctx.mpf(1) / 2:
        u2, v2 = -u2, 1 - v2
    x = u2 + v2 * t1
    x -= ctx.nint(x)
    return tau_f, x, v2 * t2
