"""The tree-level (Virasoro-Shapiro) expansion in the sigma_2^p sigma_3^q basis.

Normalisation.  With the dimensionless Mandelstams of the genus-one integrand
(s = -alpha' (k_1 + k_2)^2 / 4, s + t + u = 0), the tree-level coefficient of
the R^4 kinematic factor is taken to be

    T(s, t, u) = (1 / (s t u)) Gamma(1-s) Gamma(1-t) Gamma(1-u)
                                / (Gamma(1+s) Gamma(1+t) Gamma(1+u))
               = -Gamma(-s) Gamma(-t) Gamma(-u) / (Gamma(1+s) Gamma(1+t) Gamma(1+u)),

normalised so that the supergravity pole is 1/(s t u) = 3/sigma_3.  From
log Gamma(1 - x) = gamma x + sum_{k>=2} zeta(k) x^k / k the even zeta values
and Euler's constant cancel between numerator and denominator (sigma_1 = 0):

    T = (3 / sigma_3) exp( sum_{k>=1} 2 zeta(2k+1) sigma_{2k+1} / (2k+1) ),

and Newton's identities with sigma_1 = 0, sigma_k = (sigma_2/2) sigma_{k-2}
+ (sigma_3/3) sigma_{k-3}, write every sigma_{2k+1} through sigma_2, sigma_3.
The regular part T - 3/sigma_3 = sum T_(p,q) sigma_2^p sigma_3^q / (p! q!)
has T_(0,0) = 2 zeta(3) (R^4), T_(1,0) = zeta(5) (D^4R^4), ...

>>> from ledger.expr import to_text
>>> t = tree_coefficients(3)
>>> [to_text(t[s]) for s in (Structure(0, 0), Structure(1, 0), Structure(0, 1))]
['2*zeta(3)', 'zeta(5)', '2/3*zeta(3)^2']
"""

from __future__ import annotations

import math
from typing import Optional

import sympy

from ledger.amplitudes.operators import Structure, structures_through
from ledger.errors import LedgerError
from ledger.mgf.jobs import Job, ensure_job

MAX_TREE_ORDER = 16
_SIGMA2, _SIGMA3 = sympy.symbols("sigma2 sigma3")


def power_sums(max_k: int) -> dict[int, object]:
    """sigma_k for k <= max_k as polynomials in sigma_2, sigma_3 (sigma_1 = 0).

    >>> power_sums(5)[5]
    5*sigma2*sigma3/6
    """
    sigma = {0: sympy.Integer(3), 1: sympy.Integer(0), 2: _SIGMA2, 3: _SIGMA3}
    for k in range(4, max_k + 1):
        # roots of x^3 + e2 x - e3 with e2 = -sigma_2/2, e3 = s t u = sigma_3/3
        sigma[k] = sympy.expand(_SIGMA2 / 2 * sigma[k - 2] + _SIGMA3 / 3 * sigma[k - 3])
    return {k: v for k, v in sigma.items() if k <= max_k}


def log_gamma_ratio(max_degree: int):
    """sum over x in (s,t,u) of log Gamma(1-x) - log Gamma(1+x), through degree max_degree.

    Built from log Gamma(1 - x) = gamma x + sum_{k>=2} zeta(k) x^k / k (Abramowitz and
    Stegun 6.1.33, common practice), with sum_x x^k = sigma_k.

    >>> log_gamma_ratio(5)
    sigma2*sigma3*zeta(5)/3 + 2*sigma3*zeta(3)/3
    """
    sigma = power_sums(max_degree)
    x = sympy.Symbol("x")
    series = sympy.EulerGamma * x + sum(sympy.zeta(k) * x**k / k for k in range(2, max_degree + 1))
    difference = sympy.Poly(sympy.expand(series - series.subs(x, -x)), x)
    return sympy.expand(sum(c * sigma[m[0]] for m, c in difference.terms()))


def tree_coefficients(order: int, job: Optional[Job] = None) -> dict[Structure, object]:
    """T_(p,q) for 2p + 3q <= order, exact in odd zeta values (the pole 3/sigma_3 excluded).

    >>> from ledger.expr import to_text
    >>> to_text(tree_coefficients(6)[Structure(0, 2)])
    '4/27*zeta(9) + 8/27*zeta(3)^3'
    """
    check_tree_order(order)
    job = ensure_job(job)
    degree = order + 3  # T = (3/sigma_3) exp(X): weight w of T needs weight w + 3 of exp(X)
    exponent = _graded(log_gamma_ratio(degree))
    power = {(0, 0): sympy.Integer(1)}
    exponential = dict(power)
    for n in range(1, degree // 3 + 1):  # X has weight >= 3, so X^n vanishes beyond this
        job.report(n / (degree // 3 + 1), f"tree level: term {n} of the exponential")
        power = _truncated_product(power, exponent, degree)
        for key, value in power.items():
            exponential[key] = exponential.get(key, 0) + value / math.factorial(n)
    coefficients = {}
    for structure in structures_through(order):
        value = exponential.get((structure.p, structure.q + 1), 0)  # divide by sigma_3 / 3
        coefficients[structure] = sympy.expand(
            3 * value * math.factorial(structure.p) * math.factorial(structure.q))
    job.report(1.0, "tree level: done")
    return coefficients


def _graded(polynomial) -> dict[tuple[int, int], object]:
    """{(p, q): coefficient} of a polynomial in sigma_2, sigma_3."""
    return {monomial: coefficient
            for monomial, coefficient in sympy.Poly(polynomial, _SIGMA2, _SIGMA3).terms()}


def _truncated_product(a: dict, b: dict, max_weight: int) -> dict:
    product: dict = {}
    for (p1, q1), x in a.items():
        for (p2, q2), y in b.items():
            key = (p1 + p2, q1 + q2)
            if 2 * key[0] + 3 * key[1] <= max_weight:
                product[key] = sympy.expand(product.get(key, 0) + x * y)
    return product


def check_tree_order(order) -> None:
    if not isinstance(order, int) or isinstance(order, bool) or not 0 <= order <= MAX_TREE_ORDER:
        raise LedgerError(f"the tree-level order must be an integer weight from 0 to "
                          f"{MAX_TREE_ORDER}, got {order!r}")
