"""Laurent polynomials in y = pi tau2: published forms, identities, independent values.

Each expected polynomial names its source; numerical checks compare against the
evaluator of ledger.mgf.dihedral (an independent computation: position space
rather than our constant-term sums) and the handbook Fourier series of E_s
(tests/mgf/eisenstein_reference.py).
"""

import json
import subprocess
import sys
from fractions import Fraction

import mpmath
import pytest
import sympy

from ledger.errors import LedgerError
from ledger.expr import parse
from ledger.mgf.dihedral_laurent import dihedral_laurent_mzv
from ledger.mgf.graph import Graph
from ledger.mgf.laurent import LaurentPolynomial, Y, eisenstein_laurent, laurent_polynomial
from ledger.mgf.laurent_fit import leading_coefficient
from ledger.mgf.values import Value
from ledger.mgf.zeta_basis import zeta_sv

z = sympy.zeta
y = Y


def polynomial(text):
    lp = laurent_polynomial(parse(text))
    assert lp.exact, text
    return sympy.expand(lp.to_sympy())


def test_c211_published():
    # D'Hoker, Green, Gurdogan, Vanhove 2015, arXiv:1512.06779; D'Hoker, Green, Vanhove 2015,
    # arXiv:1502.06698: C_{2,1,1} = 2y^4/14175 + zeta(3) y/45 + 5 zeta(5)/(12y) - zeta(3)^2/(4y^2) + 9 zeta(7)/(16y^3)
    expected = (sympy.Rational(2, 14175) * y ** 4 + z(3) * y / 45 + 5 * z(5) / (12 * y)
                - z(3) ** 2 / (4 * y ** 2) + 9 * z(7) / (16 * y ** 3))
    assert sympy.expand(polynomial("C(2,1,1)") - expected) == 0


def test_c1111_published():
    # D'Hoker, Green, Vanhove 2015, arXiv:1502.06698 (from memory):
    # C_{1,1,1,1} = y^4/945 + 2 zeta(3) y/3 + 10 zeta(5)/y - 3 zeta(3)^2/y^2 + 9 zeta(7)/(4 y^3)
    expected = (y ** 4 / 945 + 2 * z(3) * y / 3 + 10 * z(5) / y - 3 * z(3) ** 2 / y ** 2
                + 9 * z(7) / (4 * y ** 3))
    assert sympy.expand(polynomial("C(1,1,1,1)") - expected) == 0


@pytest.mark.parametrize("s", range(2, 8))
def test_eisenstein_against_gamma_functions(s):
    # DESIGN.md section 3 (handbook): 2 zeta(2s)/pi^(2s) y^s + 2 Gamma(s-1/2) zeta(2s-1)/(sqrt(pi) Gamma(s)) y^(1-s)
    lp = eisenstein_laurent(s)
    ctx = mpmath.MPContext()
    ctx.dps = 40
    top, _ = lp.coefficient_value(s, ctx)
    bottom, _ = lp.coefficient_value(1 - s, ctx)
    assert abs(top - 2 * ctx.zeta(2 * s) / ctx.pi ** (2 * s)) < ctx.mpf(10) ** -38
    expected = 2 * ctx.gamma(s - ctx.mpf(1) / 2) * ctx.zeta(2 * s - 1) / (ctx.sqrt(ctx.pi) * ctx.gamma(s))
    assert abs(bottom - expected) < ctx.mpf(10) ** -38
    assert lp.powers() == [s, 1 - s]


@pytest.mark.parametrize("lhs,rhs", [
    ("C(1,1,1)", "E(3) + zeta(3)"),  # D. Zagier; D'Hoker, Green, Vanhove 2015, arXiv:1502.06698
    ("C(2,2,1)", "2/5*E(5) + zeta(5)/30"),  # D'Hoker, Green, Vanhove 2015, arXiv:1502.06698
    # D'Hoker, Green, Vanhove 2015, arXiv:1502.06698; D'Hoker, Kaidi 2016, arXiv:1608.04393 (from memory)
    ("C(1,1,1,1)", "24*C(2,1,1) - 18*E(4) + 3*E(2)^2"),
])
def test_identities_hold_on_laurent_polynomials(lhs, rhs):
    assert laurent_polynomial(parse(f"{lhs} - ({rhs})")).terms == ()


def test_laplace_equation_of_c211_exactly():
    # (Delta - 2) C_{2,1,1} = 9 E_4 - E_2^2: D'Hoker, Green, Vanhove 2015, arXiv:1502.06698
    assert laurent_polynomial(parse("laplace(C(2,1,1)) - 2*C(2,1,1) - 9*E(4) + E(2)^2")).terms == ()


def test_weight_eleven_needs_zeta_sv():
    # the y^-4 coefficient of C(4,1,1,1) (weight 11) involves zeta_sv(3,5,3), the first
    # irreducible single-valued MZV (D. Zerbini 2015, arXiv:1512.05689, found it in dihedral
    # graphs of weight 7; from memory): exact only because the basis contains it
    lp = laurent_polynomial(parse("C(4,1,1,1)"))
    assert lp.exact
    assert lp.coefficient(-4).has(zeta_sv(3, 5, 3))
    assert not any(lp.coefficient(k).has(zeta_sv(3, 5, 3)) for k in lp.powers() if k != -4)


def test_weight_six_dihedral_lowest_terms_are_zeta11():
    for weights in [(4, 1, 1), (3, 2, 1), (2, 2, 2), (2, 2, 1, 1), (1, 1, 1, 1, 1, 1)]:
        lp = laurent_polynomial(parse(f"C{weights}".replace(" ", "")))
        assert lp.exact
        c = lp.coefficient(-5)
        assert c != 0 and sympy.simplify(c / z(11)).is_Rational


def test_leading_term_by_two_methods():
    # the all-m=0 sector: dihedral constant-term sums vs the torus integral of Bernoulli products
    for weights in [(2, 1, 1), (3, 1, 1, 1), (2, 2, 1, 1)]:
        graph = Graph.from_edges([(0, 1, a) for a in weights])
        assert dihedral_laurent_mzv(weights)[sum(weights)] == {(): leading_coefficient(graph)}
    # a triangle of weights (2,1,1) is E_4: 2 zeta(8)/pi^8 = 1/4725
    assert leading_coefficient(Graph.from_edges([(0, 1, 2), (1, 2, 1), (2, 0, 1)])) == Fraction(1, 4725)


def test_arithmetic_and_printing():
    e2 = eisenstein_laurent(2)
    assert (e2 * e2 - e2 ** 2).terms == ()
    assert (e2 + 1 - e2).to_text() == "1"
    assert e2.laplacian().to_text() == "2*y^2/45 + 2*zeta(3)/y"
    mixed = e2 + LaurentPolynomial.from_dict({0: Value(mpmath.mpf("0.5"), mpmath.mpf("1e-20"), 20)})
    assert not mixed.exact and mixed.coefficient(2) == sympy.Rational(1, 45)
    with pytest.raises(LedgerError):
        e2 ** -1


def test_no_laurent_polynomial_for_holomorphic_atoms():
    with pytest.raises(LedgerError):
        laurent_polynomial(parse("eta"))


@pytest.mark.slow
@pytest.mark.parametrize("weights", [(2, 1, 1), (1, 1, 1, 1, 1), (3, 2, 1)])
def test_laurent_matches_independent_values(weights):
    """f - Laurent = O(e^(-2y)) at several large tau2 with the position-space evaluator."""
    from ledger.mgf.dihedral import dihedral_value

    lp = laurent_polynomial(parse(f"C{weights}".replace(" ", "")))
    ctx = mpmath.MPContext()
    ctx.dps = 40
    for tau2 in ("3.5", "5.0", "7.0"):
        tau = ctx.mpc("0.31", tau2)
        value = dihedral_value(weights, tau, 30)
        polynomial_value, _ = lp.evaluate(ctx.pi * tau.imag, ctx)
        size = (ctx.pi * tau.imag) ** sum(weights)
        # the first non-constant Fourier mode is ~ y^w e^(-2y) (with a generous factor 1000)
        bound = 1000 * size * ctx.exp(-2 * ctx.pi * tau.imag) + 10 * ctx.convert(value.error)
        assert abs(ctx.convert(value.value) - polynomial_value) < bound


def run_cli(*args):
    return subprocess.run([sys.executable, "-m", "ledger", *args], capture_output=True, text=True, timeout=120)


def test_cli_json():
    result = run_cli("laurent", "C(2,1,1)", "--json")
    assert result.returncode == 0, result.stderr
    payload = json.loads(result.stdout)
    assert payload["exact"] is True and payload["variable"] == "y"
    assert [t["power"] for t in payload["terms"]] == [4, 1, -1, -2, -3]
    total = sum(sympy.sympify(t["coefficient"]) * y ** t["power"] for t in payload["terms"])
    assert sympy.expand(total - polynomial("C(2,1,1)")) == 0


def test_cli_bad_input():
    result = run_cli("laurent", "C(2,1")
    assert result.returncode == 2 and result.stderr.startswith("alpha-ledger: error:")


@pytest.mark.slow
def test_fit_from_values_recovers_c211():
    """The generic fit (used for graphs without an exact constant term), run on values of
    C(2,1,1) from the position-space evaluator, must give the published polynomial exactly."""
    from ledger.mgf.dihedral import dihedral_value
    from ledger.mgf.laurent_fit import graph_laurent

    graph = Graph.from_edges([(0, 1, 2), (0, 1, 1), (0, 1, 1)])
    lp = graph_laurent(graph, values=lambda tau, d: dihedral_value((2, 1, 1), tau, d), coefficient_digits=30)
    assert lp.exact
    assert sympy.expand(lp.to_sympy() - polynomial("C(2,1,1)")) == 0
