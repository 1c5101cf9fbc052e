"""Exact Bernoulli numbers and polynomials, and rational polynomial helpers.

Polynomials are lists of Fractions, lowest degree first.  Convention
B_1 = -1/2, so B_n(x) = sum_k binom(n, k) B_k x^(n-k).

>>> bernoulli_polynomial(2)
[Fraction(1, 6), Fraction(-1, 1), Fraction(1, 1)]
>>> poly_integral_01(poly_mul(bernoulli_polynomial(2), bernoulli_polynomial(2)))
Fraction(1, 180)
"""

from __future__ import annotations

from fractions import Fraction
from functools import lru_cache
from math import comb


@lru_cache(maxsize=None)
def bernoulli_number(n: int) -> Fraction:
    """B_n with B_1 = -1/2 (from sum_{k<=n} binom(n+1, k) B_k = 0)."""
    if n == 0:
        return Fraction(1)
    return -sum(comb(n + 1, k) * bernoulli_number(k) for k in range(n)) / (n + 1)


def bernoulli_polynomial(n: int) -> list:
    """Coefficients of B_n(x), lowest degree first."""
    return [comb(n, n - d) * bernoulli_number(n - d) for d in range(n + 1)]


def poly_mul(p: list, q: list) -> list:
    result = [Fraction(0)] * (len(p) + len(q) - 1)
    for i, a in enumerate(p):
        if a:
            for j, b in enumerate(q):
                result[i + j] += a * b
    return result


def poly_integral_01(p: list) -> Fraction:
    """int_0^1 p(x) dx."""
    return sum((c / (d + 1) for d, c in enumerate(p)), Fraction(0))
