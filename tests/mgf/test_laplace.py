"""The Laplacian: exact on Laurent polynomials, numerical on values, the equation table.

References: finite-difference weights (common practice, Fornberg's tables), the
eigenvalue equation of E_s (handbook), published Laplace equations with their sources.
"""

import mpmath
import pytest

from eisenstein_reference import eisenstein_reference
from ledger.expr import parse
from ledger.mgf.laplace import (
    LAPLACE_EQUATIONS, central_difference_weights, known_laplace_equation, numerical_laplacian,
)
from ledger.mgf.laurent import laurent_polynomial

TAUS = [mpmath.mpc(complex(t)) for t in ("0.27+1.31j", "-0.41+0.93j", "0.05+2.6j")]


def test_difference_weights():
    # f''(0) ~ (-f(2h) + 16 f(h) - 30 f(0) + 16 f(-h) - f(-2h)) / (12 h^2)  (common practice)
    ctx = mpmath.MPContext()
    ctx.dps = 30
    w = central_difference_weights(2, ctx)
    assert [mpmath.nstr(x * 12, 10) for x in w] == ["-30.0", "16.0", "-1.0"]
    for p in (3, 7):  # exact on x^(2k) up to the order of the rule
        w = central_difference_weights(p, ctx)
        for k in range(p + 1):
            terms = [w[0] * (1 if k == 0 else 0)] + [2 * w[j] * ctx.mpf(j) ** (2 * k) for j in range(1, p + 1)]
            assert abs(sum(terms) - (2 if k == 1 else 0)) < ctx.mpf(10) ** -25 * sum(abs(t) for t in terms)


@pytest.mark.parametrize("s", [2, 3, 5])
@pytest.mark.parametrize("tau", TAUS)
def test_eisenstein_eigenvalue_numerically(s, tau):
    # Delta E_s = s(s-1) E_s (handbook), values from the Fourier series reference
    result = numerical_laplacian(lambda t, d: eisenstein_reference(s, t, d), tau, 30)
    ctx = mpmath.MPContext()
    ctx.dps = 50
    expected = s * (s - 1) * ctx.convert(eisenstein_reference(s, tau, 45).value)
    true_error = abs(ctx.convert(result.value) - expected)
    assert true_error <= result.error
    assert result.error < 1e-29 * abs(expected)


@pytest.mark.parametrize("equation", LAPLACE_EQUATIONS, ids=lambda e: e.lhs)
def test_equation_table_on_laurent_polynomials(equation):
    lhs, eigenvalue, source = equation.parsed()
    difference = laurent_polynomial(parse(f"laplace({equation.lhs})") - eigenvalue * lhs - source)
    assert difference.terms == (), equation.reference


def test_known_equations():
    assert known_laplace_equation(parse("E(4)")) == (12, 0)
    assert known_laplace_equation(parse("C(1,1,1,1)")) is None


@pytest.mark.slow
def test_c211_laplace_equation_numerically():
    # (Delta - 2) C_{2,1,1} = 9 E_4 - E_2^2: D'Hoker, Green, Vanhove 2015, arXiv:1502.06698,
    # with C_{2,1,1} from the position-space evaluator and E_s from the Fourier series
    from ledger.mgf.dihedral import dihedral_value

    tau = mpmath.mpc(complex("0.21+1.07j"))
    delta = numerical_laplacian(lambda t, d: dihedral_value((2, 1, 1), t, d), tau, 12)
    ctx = mpmath.MPContext()
    ctx.dps = 40
    c211 = ctx.convert(dihedral_value((2, 1, 1), tau, 30).value)
    e4 = ctx.convert(eisenstein_reference(4, tau, 35).value)
    e2 = ctx.convert(eisenstein_reference(2, tau, 35).value)
    residual = abs(ctx.convert(delta.value) - 2 * c211 - 9 * e4 + e2 ** 2)
    assert residual <= ctx.convert(delta.error) + ctx.mpf(10) ** -28
    assert delta.error < 1e-12
