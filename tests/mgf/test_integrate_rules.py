"""Gauss rules of the fundamental-domain quadrature against mpmath's own quadrature.

References: the Laguerre recurrence alpha_k = 2k + 1, beta_k = k^2 (Abramowitz and
Stegun 22.7.12; W. Gautschi, Orthogonal Polynomials, 2004, Table 1.1); everything
else is checked against mpmath.quad (tanh-sinh), a general-purpose reference.
"""

import mpmath
import pytest

from ledger.mgf.integrate_rules import chebyshev_algorithm, gauss_exponential, gauss_jacobi_01

CTX = mpmath.MPContext()
CTX.dps = 40


def apply(rule, f):
    nodes, weights = rule
    return CTX.fsum(CTX.convert(w) * f(CTX.convert(x)) for x, w in zip(nodes, weights))


@pytest.mark.parametrize("n, beta", [(1, 0), (4, 0), (7, 0), (3, 2), (8, 2)])
def test_jacobi_rule_is_exact_to_degree_2n_minus_1(n, beta):
    rule = gauss_jacobi_01(n, beta, 30)
    assert all(0 < x < 1 for x in rule[0]) and all(w > 0 for w in rule[1])
    for k in (0, n, 2 * n - 1):
        exact = CTX.quad(lambda x: x ** (beta + k), [0, 1])
        assert abs(apply(rule, lambda x: x ** k) - exact) < 1e-29


@pytest.mark.parametrize("n, power", [(3, 7), (4, 6), (6, 9), (9, 15)])
def test_exponential_rule_window(n, power):
    # exact for e^(-4 pi (t-1)) t^j, j = -power .. 2n-1-power
    rule = gauss_exponential(n, 4, power, 30)
    assert all(x > 1 for x in rule[0]) and all(w > 0 for w in rule[1])
    for j in range(2 * n):
        exact = CTX.quad(lambda t: CTX.exp(-4 * CTX.pi * (t - 1)) * t ** (j - power), [1, 1.5, 3, CTX.inf])
        assert abs(apply(rule, lambda t: t ** j) - exact) < 1e-29 * exact


def test_exponential_rule_does_not_depend_on_its_build_precision():
    low, high = gauss_exponential(8, 4, 7, 30), gauss_exponential(8, 4, 7, 60)
    assert max(abs(a - b) for a, b in zip(low[0] + low[1], high[0] + high[1])) < 1e-30


def test_chebyshev_algorithm_on_laguerre_moments():
    alpha, beta = chebyshev_algorithm([CTX.factorial(j) for j in range(12)], 6)
    assert [int(CTX.nint(a)) for a in alpha] == [2 * k + 1 for k in range(6)]
    assert [int(CTX.nint(b)) for b in beta] == [1] + [k * k for k in range(1, 6)]
    assert max(abs(a - (2 * k + 1)) for k, a in enumerate(alpha)) < 1e-30
