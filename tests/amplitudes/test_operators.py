"""Operator labels, alpha' orders and the sigma_2^p sigma_3^q basis."""

from __future__ import annotations

import math
from fractions import Fraction

import pytest
import sympy
from hypothesis import given, settings, strategies as st

from ledger.amplitudes.operators import (
    Operator, Structure, format_structure, mandelstam_form, operator_for, parse_operator,
    parse_structure, sigma_coordinates, structures_of_weight, structures_through,
)
from ledger.errors import LedgerError


@pytest.mark.parametrize("label, weight, order", [
    ("R^4", 0, 3), ("D^4R^4", 2, 5), ("D^6R^4", 3, 6), ("D^8R^4", 4, 7),
    ("D^10R^4", 5, 8), ("D^12R^4", 6, 9), ("D^{14} R^4", 7, 10),
])
def test_operator_labels_and_orders(label, weight, order):
    # D^{2k}R^4 appears at alpha'^(3+k) relative to Einstein-Hilbert (common practice)
    operator = parse_operator(label)
    assert operator.weight == weight and operator.alpha_order == order
    assert parse_operator(operator.label) == operator


def test_d12r4_has_two_structures():
    # sigma_2^3 and sigma_3^2 are independent at weight 6 (common practice)
    assert [format_structure(s) for s in parse_operator("D^12R^4").structures] == [
        "sigma2^3", "sigma3^2"]
    assert structures_of_weight(12) == (Structure(6, 0), Structure(3, 2), Structure(0, 4))


@pytest.mark.parametrize("label", ["D^2R^4", "D^3R^4", "R^3", "D^4", "DR^4", "", "D^-2R^4"])
def test_bad_operator_labels(label):
    with pytest.raises(LedgerError):
        parse_operator(label)


def test_d2r4_message_explains_sigma1():
    with pytest.raises(LedgerError, match="sigma_1"):
        parse_operator("D^2R^4")
    with pytest.raises(LedgerError, match="D\\^2R\\^4"):
        Operator(1)


@pytest.mark.parametrize("text, p, q", [
    ("1", 0, 0), ("sigma2", 1, 0), ("sigma2^2", 2, 0), ("sigma2 sigma3", 1, 1),
    ("sigma_3^2", 0, 2), ("σ2σ3", 1, 1), ("sigma2^{3}", 3, 0), ("sigma2*sigma3^2", 1, 2),
])
def test_parse_structure(text, p, q):
    assert parse_structure(text) == Structure(p, q)


@pytest.mark.parametrize("text", ["sigma1", "sigma4", "", "s^2", "sigma2^", "sigma2 x"])
def test_bad_structures(text):
    with pytest.raises(LedgerError):
        parse_structure(text)


def test_format_parse_round_trip():
    for structure in structures_through(12):
        assert parse_structure(format_structure(structure)) == structure
        assert operator_for(structure).weight == structure.weight


def _symmetric_polynomial(coefficients: dict[tuple[int, int], int], degree: int):
    """sum c_pq sigma2^p sigma3^q/(p! q!) as a binary form {power of s: Fraction}, via sympy."""
    s, t = sympy.symbols("s t")
    u = -s - t
    total = sum(c * (s**2 + t**2 + u**2)**p * (s**3 + t**3 + u**3)**q
                / (math.factorial(p) * math.factorial(q)) for (p, q), c in coefficients.items())
    poly = sympy.Poly(sympy.expand(total), s, t)
    return {a: Fraction(int(sympy.fraction(poly.coeff_monomial(s**a * t**(degree - a)))[0]),
                        int(sympy.fraction(poly.coeff_monomial(s**a * t**(degree - a)))[1]))
            for a in range(degree + 1)}


@settings(max_examples=30, deadline=None)
@given(st.integers(min_value=2, max_value=12), st.data())
def test_sigma_coordinates_recovers_random_combinations(degree, data):
    basis = structures_of_weight(degree)
    coefficients = {(s.p, s.q): data.draw(st.integers(-9, 9)) for s in basis}
    form = _symmetric_polynomial(coefficients, degree) if coefficients else {}
    recovered = sigma_coordinates(form, degree)
    assert recovered == {Structure(p, q): Fraction(c) for (p, q), c in coefficients.items() if c}


def test_non_symmetric_polynomial_is_refused():
    with pytest.raises(ValueError):
        sigma_coordinates(mandelstam_form(3, 1, 0), 4)  # s^3 t
