"""Gauss rules for the integrals over the fundamental domain (mpmath, any precision).

* :func:`gauss_jacobi_01`: weight x^beta on [0, 1] (beta = 0 is Gauss-Legendre),
  from the closed-form Jacobi recurrence (Golub-Welsch).
* :func:`gauss_exponential`: weight e^(-m pi (t-1)) t^(-K) on [1, inf), from the
  moments int_0^inf s^j e^(-m pi s) (1+s)^(-K) ds = j! U(j+1, j+2-K, m pi)
  (Tricomi's U; Abramowitz-Stegun 13.2.5) by Chebyshev's algorithm (W. Gautschi,
  Orthogonal Polynomials: Computation and Approximation, 2004, sec. 2.1.7).
  With m = 4 it integrates e^(-4 pi t) P(t) exactly for every Laurent
  polynomial P with powers -K..2n-1-K: the shape of the constant term of a
  modular graph function above its Laurent polynomial.

Rules are built once per (size, parameters, precision) and cached; nodes and
weights are returned as plain mpf numbers, to be converted by the caller's
context.

>>> ctx = mpmath.MPContext(); ctx.dps = 30
>>> x, w = [[ctx.convert(v) for v in part] for part in gauss_jacobi_01(4, 2, ctx.dps)]
>>> abs(ctx.fsum(wi * xi ** 5 for xi, wi in zip(x, w)) - ctx.mpf(1) / 8) < 1e-28   # int x^2 x^5
True
"""

from __future__ import annotations

from functools import lru_cache

import mpmath

BUILD_GUARD_DIGITS = 20


@lru_cache(maxsize=64)
def gauss_jacobi_01(n: int, beta: int, dps: int) -> tuple:
    """(nodes, weights) of the n-point Gauss rule for int_0^1 x^beta g(x) dx.

    >>> ctx = mpmath.MPContext(); ctx.dps = 30
    >>> x, w = [[ctx.convert(v) for v in part] for part in gauss_jacobi_01(5, 0, ctx.dps)]
    >>> abs(ctx.fsum(wi * xi ** 9 for xi, wi in zip(x, w)) - ctx.mpf(1) / 10) < 1e-28
    True
    """
    ctx = mpmath.MPContext()
    ctx.dps = dps + BUILD_GUARD_DIGITS
    b = ctx.mpf(beta)
    # monic Jacobi recurrence on [-1, 1], weight (1+x)^beta (alpha = 0)
    diagonal = [b / (b + 2)] + [b ** 2 / ((2 * k + b) * (2 * k + b + 2)) for k in range(1, n)]
    off = [ctx.sqrt(4 * k * k * (k + b) ** 2 / ((2 * k + b) ** 2 * (2 * k + b + 1) * (2 * k + b - 1)))
           for k in range(1, n)]
    nodes, weights = golub_welsch(diagonal, off, 2 ** (b + 1) / (b + 1), ctx)
    scale = 2 ** (b + 1)
    return _export([(x + 1) / 2 for x in nodes]), _export([w / scale for w in weights])


@lru_cache(maxsize=64)
def gauss_exponential(n: int, rate_in_pi: int, power: int, dps: int) -> tuple:
    """(nodes, weights) of the n-point Gauss rule for
    int_1^inf e^(-rate_in_pi pi (t-1)) t^(-power) g(t) dt.

    >>> ctx = mpmath.MPContext(); ctx.dps = 30
    >>> t, w = [[ctx.convert(v) for v in part] for part in gauss_exponential(3, 4, 5, ctx.dps)]
    >>> exact = ctx.quad(lambda u: ctx.exp(-4 * ctx.pi * (u - 1)) * u ** -2, [1, 2, ctx.inf])
    >>> abs(ctx.fsum(wi * ti ** 3 for ti, wi in zip(t, w)) - exact) < 1e-28   # t^-5 t^3
    True
    """
    # Chebyshev's algorithm loses about n digits to the conditioning of ordinary moments
    ctx = mpmath.MPContext()
    ctx.dps = dps + BUILD_GUARD_DIGITS + 2 * n
    a = rate_in_pi * ctx.pi
    moments = [ctx.factorial(j) * ctx.hyperu(j + 1, j + 2 - power, a) for j in range(2 * n)]
    alpha, beta = chebyshev_algorithm(moments, n)
    nodes, weights = golub_welsch(alpha, [ctx.sqrt(b) for b in beta[1:]], beta[0], ctx)
    return _export([1 + s for s in nodes]), _export(weights)


def chebyshev_algorithm(moments, n: int) -> tuple:
    """Recurrence coefficients (alpha_0..alpha_(n-1), beta_0..beta_(n-1)) of the monic
    orthogonal polynomials of a measure from its moments mu_0..mu_(2n-1).

    >>> alpha, beta = chebyshev_algorithm([mpmath.mpf(1) / (j + 1) for j in range(4)], 2)
    >>> [mpmath.nstr(x, 6) for x in alpha + beta]      # Legendre on [0, 1]
    ['0.5', '0.5', '1.0', '0.0833333']
    """
    previous = [0] * (2 * n)
    current = list(moments)
    alpha, beta = [moments[1] / moments[0]], [moments[0]]
    for k in range(1, n):
        following = [0] * (2 * n)
        for col in range(k, 2 * n - k):
            following[col] = current[col + 1] - alpha[k - 1] * current[col] - beta[k - 1] * previous[col]
        alpha.append(following[k + 1] / following[k] - current[k] / current[k - 1])
        beta.append(following[k] / current[k - 1])
        previous, current = current, following
    return alpha, beta


def golub_welsch(diagonal, off_diagonal, mass, ctx) -> tuple:
    """Nodes (ascending) and weights of the Gauss rule of a Jacobi matrix (monic
    recurrence: diagonal alpha_k, off-diagonal sqrt(beta_k)) and total mass."""
    n = len(diagonal)
    matrix = ctx.zeros(n, n)
    for i in range(n):
        matrix[i, i] = diagonal[i]
    for i, b in enumerate(off_diagonal):
        matrix[i, i + 1] = matrix[i + 1, i] = b
    eigenvalues, vectors = ctx.eigsy(matrix)
    pairs = sorted((eigenvalues[i], mass * vectors[0, i] ** 2) for i in range(n))
    return [p[0] for p in pairs], [p[1] for p in pairs]


def _export(numbers) -> tuple:
    return tuple(mpmath.mp.make_mpf(x._mpf_) for x in numbers)
