"""The table of identities: shape of every row, and a numerical check of each row."""

from __future__ import annotations

import re

import mpmath
import pytest
import sympy

from ledger.amplitudes.identities import IDENTITIES, apply_identities, substitution_rules
from ledger.expr import C, GraphFunction, parse
from ledger.expr.atoms import modular_atoms

# points in (or near) the fundamental domain, one far up the cusp
TAU_POINTS = [mpmath.mpc("0.27", "1.31"), mpmath.mpc("-0.41", "0.95"), mpmath.mpc("0.1", "2.7")]
DIGITS = 30
GENERAL_GRAPH_DIGITS = 14  # general graphs: ~8 s at 14 digits, 20-30 s at 20, minutes at 30


def test_every_row_rewrites_one_graph_function_and_names_its_source():
    for identity in IDENTITIES:
        lhs, rhs = identity.rule()
        assert isinstance(lhs, (C, GraphFunction)), identity.lhs
        assert re.search(r"arXiv:\d{4}\.\d{4,5}", identity.source), identity.source
        assert modular_atoms(rhs) and lhs not in modular_atoms(rhs), identity.rhs


def test_rows_form_no_cycle():
    rules = substitution_rules()
    uses = {lhs: modular_atoms(rhs) & set(rules) for lhs, rhs in rules.items()}
    done: set = set()

    def visit(atom, path):
        assert atom not in path, f"cycle through {atom}"
        if atom not in done:
            for other in uses[atom]:
                visit(other, path | {atom})
            done.add(atom)

    for atom in rules:
        visit(atom, frozenset())


def test_substitution_terminates_and_is_idempotent():
    expr = parse("C(1,1,1)^2 + C(1,1,1,1)*E(2) + C(2,2,1) - C(3,1,1)")
    once = apply_identities(expr)
    assert apply_identities(once) == once
    assert not (modular_atoms(once) & set(substitution_rules()))
    assert once.coeff(parse("C(3,1,1)")) == -1  # not in the table: left alone


def test_zeta_values_survive_substitution():
    assert sympy.expand(apply_identities(parse("C(1,1,1) - E(3)")) - sympy.zeta(3)) == 0


def _eisenstein_laurent(s: int, ctx) -> dict:
    # E_s = 2 zeta(2s) y^s / pi^(2s) + 2 Gamma(s-1/2) zeta(2s-1) / (sqrt(pi) Gamma(s)) y^(1-s)
    # + O(e^{-2y}), y = pi tau2 (common practice; e.g. D'Hoker, Green, Vanhove 2015,
    # arXiv:1502.06698)
    return {s: 2 * ctx.zeta(2 * s) / ctx.pi ** (2 * s),
            1 - s: 2 * ctx.gamma(s - ctx.mpf(1) / 2) * ctx.zeta(2 * s - 1) / (ctx.sqrt(ctx.pi) * ctx.gamma(s))}


def _laurent(expr, ctx, dihedral_laurent, mzv):
    """Laurent polynomial {power of y: value} of a polynomial in E, C and zeta values."""
    def atom_laurent(atom):
        if isinstance(atom, sympy.zeta):
            return {0: ctx.zeta(int(atom.args[0]))}
        if isinstance(atom, C):
            terms = dihedral_laurent(tuple(int(a) for a in atom.args))
            return {k: ctx.fsum(ctx.mpf(c.numerator) / c.denominator * (mzv.zeta(w) if w else 1)
                                for w, c in words.items()) for k, words in terms.items()}
        return _eisenstein_laurent(int(atom.args[0]), ctx)

    total: dict = {}
    for monomial, coefficient in sympy.expand(expr).as_coefficients_dict().items():
        product = {0: ctx.mpf(coefficient.p) / coefficient.q}
        for base, exponent in monomial.as_powers_dict().items():
            if base == 1:
                continue
            for _ in range(int(exponent)):
                merged: dict = {}
                for i, x in product.items():
                    for j, y in atom_laurent(base).items():
                        merged[i + j] = merged.get(i + j, 0) + x * y
                product = merged
        for power, value in product.items():
            total[power] = total.get(power, 0) + value
    return total


@pytest.mark.parametrize("identity", IDENTITIES, ids=lambda i: i.lhs)
def test_identity_holds_for_laurent_polynomials(identity):
    # Both sides' Laurent polynomials at the cusp (exact in multiple zeta values from the
    # engine's dihedral constant-term module, evaluated to 40 digits) must agree power by power.
    laurent_module = pytest.importorskip(
        "ledger.mgf.dihedral_laurent", reason="ledger.mgf.dihedral_laurent is not written yet")
    mzv_module = pytest.importorskip("ledger.mgf.mzv", reason="ledger.mgf.mzv is not written yet")
    lhs, rhs = identity.rule()
    if any(isinstance(a, GraphFunction) for a in modular_atoms(lhs - rhs)):
        pytest.skip("Laurent polynomials of general graphs are not available to this check")
    ctx = mpmath.MPContext()
    ctx.dps = 40
    mzv = mzv_module.MZVEvaluator(40)
    difference = _laurent(lhs - rhs, ctx, laurent_module.dihedral_laurent_mzv, mzv)
    scale = max(abs(v) for v in _laurent(lhs, ctx, laurent_module.dihedral_laurent_mzv, mzv).values())
    for power, value in difference.items():
        assert abs(value) < ctx.mpf(10) ** -35 * scale, (identity.lhs, power, value)


def _check_numerically(identity, tau):
    # Each row is a published identity (source in the table; the trihedral row was found
    # numerically here and is confirmed by two independent evaluators: the multivertex
    # momentum sums on the left, the dihedral torus integrals on the right); the engine's
    # evaluator must confirm it at tau within its error estimates.
    evaluate_module = pytest.importorskip(
        "ledger.mgf.evaluate",
        reason="ledger.mgf.evaluate (numerical evaluation, helper-1) is not written yet")
    lhs, rhs = identity.rule()
    digits = GENERAL_GRAPH_DIGITS if isinstance(lhs, GraphFunction) else DIGITS
    left = evaluate_module.evaluate(lhs, tau, digits)
    right = evaluate_module.evaluate(rhs, tau, digits)
    difference = abs(left.value - right.value)
    assert difference <= left.error + right.error, (identity.lhs, tau, difference)
    assert left.error + right.error < mpmath.mpf(10) ** (5 - digits) * abs(left.value)


@pytest.mark.parametrize("identity", IDENTITIES, ids=lambda i: i.lhs)
def test_identity_holds_numerically(identity):
    _check_numerically(identity, TAU_POINTS[0])


@pytest.mark.slow
@pytest.mark.parametrize("tau", TAU_POINTS[1:], ids=str)
@pytest.mark.parametrize("identity", [i for i in IDENTITIES if not i.lhs.startswith("graph(")],
                         ids=lambda i: i.lhs)
def test_identity_holds_numerically_at_more_points(identity, tau):
    # (the general-graph row is confirmed at a second tau, by a relation found independently,
    # in tests/mgf/test_multivertex.py::test_weight_five_trihedral_lies_in_the_weight_five_span)
    _check_numerically(identity, tau)


@pytest.mark.parametrize("identity", [i for i in IDENTITIES if i.lhs.startswith("graph(")],
                         ids=lambda i: i.lhs)
def test_general_graph_rows_give_the_independent_leading_laurent_term(identity):
    # A general graph's y^w coefficient is computed independently of any identity, as the
    # torus average of the m = 0 Bernoulli-polynomial sector (laurent_fit.leading_coefficient);
    # the right side's exact Laurent polynomial (dihedral constant terms) must reproduce it.
    from ledger.mgf.laurent import laurent_polynomial
    from ledger.mgf.laurent_fit import leading_coefficient

    lhs, rhs = identity.rule()
    leading = leading_coefficient(lhs.graph)
    assert laurent_polynomial(rhs).coefficient(lhs.graph.weight) == sympy.Rational(
        leading.numerator, leading.denominator)
