"""Every convention transformation checked on a pair derived by hand or from a published statement."""

from __future__ import annotations

import itertools

import mpmath
import numpy as np
import pytest
import sympy
from hypothesis import given, settings
from hypothesis import strategies as st

from conftest import eisenstein_textbook, engine_eisenstein
from ledger.amplitudes.operators import Structure, structures_of_weight
from ledger.book import default_conventions
from ledger.book.transform import (
    convert_coefficient, convert_integral, convert_laurent, convert_values, engine_form,
    rewrite_atoms, scale_factor,
)
from ledger.errors import ConventionError
from ledger.expr import parse

ENGINE = default_conventions()
pi, zeta = sympy.pi, sympy.zeta
CTX = mpmath.MPContext()
CTX.dps = 60  # a private context for the checks (the global mpmath precision is never changed)


def _terms(record) -> dict:
    return {t["power"]: sympy.sympify(t["coefficient"]) for t in record["terms"]}


def _laurent(terms: dict, variable="pi*tau2") -> dict:
    return {"variable": variable, "exact": True, "digits": 30,
            "terms": [{"power": k, "coefficient": str(v)} for k, v in terms.items()]}


def test_textbook_eisenstein_expansion_matches_a_brute_force_lattice_sum():
    # Guards the remembered Fourier expansion used below: a plain lattice sum over
    # |m|, |n| <= N, Richardson-extrapolated in N (tail ~ 1/N^2), to 1e-7 relative.
    tau = 0.1 + 1.2j

    def lattice(size):
        m, n = np.meshgrid(np.arange(-size, size + 1), np.arange(-size, size + 1))
        norm = np.abs(m * tau + n) ** 2
        norm[size, size] = np.inf
        return float((tau.imag**2 / norm**2).sum())

    extrapolated = (4 * lattice(600) - lattice(300)) / 3
    assert abs(extrapolated / float(eisenstein_textbook(2, "0.1+1.2i", 15)) - 1) < 1e-7


# --- E_2: our normalisation against tau2^s and the coprime form ------------------------

def test_e2_in_tau2_normalisation_is_pi_squared_times_ours():
    # Derived: (tau2/pi)^s per lattice point -> tau2^s multiplies E_s by pi^s, so a
    # coefficient E_2 (ours) is written pi^-2 E_2 in the tau2 normalisation.
    written = rewrite_atoms(parse("E(2)"), ENGINE, {"graph_normalisation": "tau2"})
    assert sympy.simplify(written - parse("E(2)") / pi**2) == 0
    assert engine_form(written, {"graph_normalisation": "tau2"}) == parse("E(2)")


def test_e2_laurent_polynomial_in_tau2_conventions_matches_the_textbook_constant_term():
    # Ours (DESIGN.md section 3): E_2 = y^2/45 + zeta(3)/y, y = pi tau2.
    # Textbook (from memory, common practice): sum' tau2^s/|m tau+n|^(2s) has constant term
    # 2 zeta(2s) tau2^s + 2 sqrt(pi) Gamma(s-1/2) zeta(2s-1)/Gamma(s) tau2^(1-s)
    # = pi^4/45 tau2^2 + pi zeta(3)/tau2 for s = 2.  Our function is that over pi^2.
    theirs = {"graph_normalisation": "tau2", "laurent_variable": "tau2"}
    converted = convert_laurent(_laurent({2: sympy.Rational(1, 45), -1: zeta(3)}), ENGINE, theirs)
    assert converted["variable"] == "tau2"
    textbook = {2: 2 * zeta(4), -1: 2 * sympy.sqrt(pi) * sympy.gamma(sympy.Rational(3, 2)) * zeta(3)}
    terms = _terms(converted)
    assert set(terms) == {2, -1}
    for power, coefficient in textbook.items():
        assert sympy.simplify(terms[power] - coefficient / pi**2) == 0


def test_e2_coprime_form_laurent_polynomial():
    # From memory (Zagier 1981; common practice): E^coprime(tau, s) = 1/2 sum over coprime (c,d)
    # of tau2^s/|c tau+d|^(2s) = tau2^s + phi(s) tau2^(1-s) + ..., with
    # phi(s) = sqrt(pi) Gamma(s-1/2) zeta(2s-1)/(Gamma(s) zeta(2s)); phi(2) = 45 zeta(3)/pi^3.
    written = rewrite_atoms(parse("E(2)"), ENGINE, {"graph_normalisation": "coprime/2"})
    coefficient = sympy.simplify(written / parse("E(2)"))
    assert sympy.simplify(coefficient - 2 * zeta(4) / pi**2) == 0  # E_2 (ours) = 2 zeta(4)/pi^2 E_2^cop
    ours = convert_laurent(_laurent({2: sympy.Rational(1, 45), -1: zeta(3)}), ENGINE,
                           {"laurent_variable": "tau2"})
    coprime = {k: sympy.simplify(v / coefficient) for k, v in _terms(ours).items()}
    assert coprime[2] == 1
    assert sympy.simplify(coprime[-1] - 45 * zeta(3) / pi**3) == 0


def test_coprime_and_zeta_relation_numerically():
    # sum' = 2 zeta(2s) E^coprime: check the coprime sum directly (|c|,|d| <= 300) at tau = i.
    c, d = np.meshgrid(np.arange(-300, 301), np.arange(-300, 301))
    coprime = np.gcd(c, d) == 1
    direct = 0.5 * (1.0 / (c[coprime] ** 2 + d[coprime] ** 2) ** 3).sum()  # s = 3, tau = i
    ours = engine_eisenstein(3, "0+1i", 15)
    scale = rewrite_atoms(parse("E(3)"), {"graph_normalisation": "coprime/2"}, ENGINE) / parse("E(3)")
    assert abs(direct - float(sympy.N(scale)) * float(ours)) < 1e-8


# --- sigma-basis coefficients under s -> 2s -----------------------------------------------

def _sigma_polynomial(coefficients: dict, s, t):
    u = -s - t
    sigma = {k: s**k + t**k + u**k for k in (2, 3)}
    return sum(c * sigma[2] ** st.p * sigma[3] ** st.q / (sympy.factorial(st.p) * sympy.factorial(st.q))
               for st, c in coefficients.items())


def test_sigma_coefficients_under_mandelstam_doubling_by_direct_substitution():
    # Derived: write A = sum B_pq sigma2^p sigma3^q/(p!q!) in s, set s = s'/2 (s' = -alpha'(k1+k2)^2/2),
    # and read the coefficients in the sigma' basis by solving the linear system; compare with
    # B'_pq = 2^-(2p+3q) B_pq.
    s, t = sympy.symbols("s t")
    for weight in (2, 3, 6):
        basis = structures_of_weight(weight)
        coefficients = {st: sympy.Symbol(f"B{st.p}{st.q}") for st in basis}
        substituted = sympy.expand(_sigma_polynomial(coefficients, s / 2, t / 2))
        unknown = {st: sympy.Symbol(f"X{st.p}{st.q}") for st in basis}
        difference = sympy.Poly(sympy.expand(substituted - _sigma_polynomial(unknown, s, t)), s, t)
        solution = sympy.solve(difference.coeffs(), list(unknown.values()), dict=True)[0]
        for st in basis:
            predicted = convert_coefficient(coefficients[st], ENGINE, {"mandelstam": "alpha'/2"}, weight)
            assert sympy.simplify(solution[unknown[st]] - predicted) == 0


def test_tree_amplitude_in_doubled_mandelstams_against_the_gamma_functions():
    # Tree level with s = -alpha'(k1+k2)^2/4 (from memory; e.g. D'Hoker, Green, Vanhove 2015,
    # arXiv:1502.06698): -Gamma(-s)Gamma(-t)Gamma(-u)/(Gamma(1+s)Gamma(1+t)Gamma(1+u))
    # = 3/sigma3 + 2 zeta(3) + zeta(5) sigma2 + 2/3 zeta(3)^2 sigma3 + O(weight 4).
    # In s' = 2s the converted coefficients must reproduce the same function of s'.
    ours = {Structure(0, 0): 2 * zeta(3), Structure(1, 0): zeta(5), Structure(0, 1): 2 * zeta(3) ** 2 / 3}
    theirs = {st: convert_coefficient(c, ENGINE, {"mandelstam": "alpha'/2"}, st.weight)
              for st, c in ours.items()}
    ctx = CTX
    s_prime, t_prime = ctx.mpf("0.002"), ctx.mpf("0.0013")
    s, t = s_prime / 2, t_prime / 2
    u = -s - t
    exact = -ctx.gamma(-s) * ctx.gamma(-t) * ctx.gamma(-u) / (ctx.gamma(1 + s) * ctx.gamma(1 + t) * ctx.gamma(1 + u))
    u_prime = -s_prime - t_prime
    sigma3_prime = s_prime**3 + t_prime**3 + u_prime**3
    pole = 3 / (sigma3_prime / 8)  # 3/sigma3 with sigma3 = sigma3'/8
    series = pole + sum(ctx.mpf(sympy.N(c, 45)) * (s_prime**2 + t_prime**2 + u_prime**2) ** st.p
                        * sigma3_prime**st.q for st, c in theirs.items())
    # the first omitted structure (weight 4, sigma2'^2) is of size ~1e-11
    assert abs(series - exact) < ctx.mpf("1e-9")
    assert theirs[Structure(1, 0)] == zeta(5) / 4 and theirs[Structure(0, 1)] == zeta(3) ** 2 / 12


def test_alpha_prime_set_to_a_number():
    # s = -(k1+k2)^2 with alpha' = 2 is 4/2 = 2 times ours: same as alpha'/2 (derived).
    for weight in (0, 2, 5):
        assert scale_factor(ENGINE, {"mandelstam": "alpha'=2"}, weight) == \
            scale_factor(ENGINE, {"mandelstam": "alpha'/2"}, weight) == sympy.Rational(1, 2**weight)


# --- Laurent polynomial of E_3 in y versus tau2 ----------------------------------------------

def test_e3_laurent_polynomial_y_versus_tau2():
    # Ours (DESIGN.md): 2 zeta(6) y^3/pi^6 + 2 Gamma(5/2) zeta(5)/(sqrt(pi) Gamma(3)) y^-2
    # = 2/945 y^3 + 3/4 zeta(5) y^-2.  Derived: with y = pi tau2 the tau2^3 coefficient is
    # 2 pi^3/945 and the tau2^-2 one 3 zeta(5)/(4 pi^2).
    record = _laurent({3: sympy.Rational(2, 945), -2: sympy.Rational(3, 4) * zeta(5)})
    converted = _terms(convert_laurent(record, ENGINE, {"laurent_variable": "tau2"}))
    assert sympy.simplify(converted[3] - 2 * pi**3 / 945) == 0
    assert sympy.simplify(converted[-2] - 3 * zeta(5) / (4 * pi**2)) == 0
    back = _terms(convert_laurent(convert_laurent(record, ENGINE, {"laurent_variable": "tau2"}),
                                  {"laurent_variable": "tau2"}, ENGINE))
    assert back == _terms(record)


def test_inexact_laurent_coefficients_convert_as_decimals():
    record = {"variable": "y", "exact": False, "digits": 20,
              "terms": [{"power": 3, "coefficient": "0.0021164021164021164021"}]}  # 2/945
    converted = convert_laurent(record, ENGINE, {"laurent_variable": "tau2"})
    value = CTX.mpf(converted["terms"][0]["coefficient"])
    assert abs(value - 2 * CTX.pi**3 / 945) < CTX.mpf("1e-21")


# --- measure, amplitude factor, Green's function, numbers -----------------------------------

@pytest.mark.parametrize("measure, volume", [
    # Vol(F) = pi/3 for d tau1 d tau2/tau2^2 (common practice); the others by their definitions.
    ("d2tau/tau2^2", pi / 3), ("d2tau/(2tau2^2)", pi / 6), ("2*d2tau/tau2^2", 2 * pi / 3),
    ("d2tau/(pi*tau2^2)", sympy.Rational(1, 3)), ("3*d2tau/(pi*tau2^2)", sympy.Integer(1)),
])
def test_volume_of_the_fundamental_domain_in_each_measure(measure, volume):
    integral = {"value": CTX.nstr(CTX.pi / 3, 35), "exact": "pi/3", "error": "1e-33",
                "digits": 30, "log_coefficient": "0"}
    converted = convert_integral(integral, ENGINE, {"measure": measure})
    assert sympy.simplify(sympy.sympify(converted["exact"]) - volume) == 0
    difference = CTX.mpf(converted["value"]) - CTX.mpf(str(sympy.N(volume, 50)))
    assert abs(difference) <= CTX.mpf(converted["error"])


def test_divergent_terms_and_log_coefficient_scale_with_the_measure():
    integral = {"value": "0", "exact": "0", "error": "0", "digits": 30, "log_coefficient": "1/2",
                "divergent_terms": [{"power": 1, "coefficient": "pi**2/45"}]}
    converted = convert_integral(integral, ENGINE, {"measure": "d2tau/(pi*tau2^2)"})
    assert sympy.sympify(converted["log_coefficient"]) == 1 / (2 * pi)
    assert sympy.sympify(converted["divergent_terms"][0]["coefficient"]) == pi / 45


def test_amplitude_factor_scales_every_kind_of_data():
    theirs = {"amplitude_factor": "2*pi"}
    assert scale_factor(ENGINE, theirs, 3) == 2 * pi
    values = convert_values([{"tau": "0+1i", "value": "0.5", "error": "1e-30", "digits": 30}], 2 * pi)
    assert abs(CTX.mpf(values[0]["value"]) - CTX.pi) <= CTX.mpf(values[0]["error"])


def test_green_function_atoms_are_rewritten_but_not_graph_functions():
    # G' = 2 G (derived): a coefficient G(1/2) E_2 in ours is 1/2 G'(1/2) E_2 there.
    expr = parse("green(1/2,0)*E(2)")
    written = rewrite_atoms(expr, ENGINE, {"green_function": "2*sum/pi"})
    assert sympy.simplify(written - expr / 2) == 0


def test_graph_functions_are_mapped_atom_by_atom_with_their_own_weights():
    # Derived: tau2 normalisation multiplies each atom by pi^(its weight), zeta values untouched.
    expr = parse("C(2,1,1) + 3*E(2)^2 + zeta(3)*E(3) + zeta(5)")
    written = rewrite_atoms(expr, ENGINE, {"graph_normalisation": "tau2"})
    expected = parse("C(2,1,1)") / pi**4 + 3 * parse("E(2)") ** 2 / pi**4 + zeta(3) * parse("E(3)") / pi**3 \
        + zeta(5)
    assert sympy.expand(written - expected) == 0
    assert engine_form(written, {"graph_normalisation": "tau2"}) == sympy.expand(expr)


def test_numbers_keep_an_honest_error():
    third = "0.333333333333333333333333333333"  # 1/3 to 30 digits, error 1e-30 covers it
    converted = convert_values([{"tau": "0+1i", "value": third, "error": "1e-30", "digits": 30}], pi**2)
    true = CTX.pi**2 / 3
    assert abs(CTX.mpf(converted[0]["value"]) - true) <= CTX.mpf(converted[0]["error"])


# --- composition: any chain of conversions equals the direct one ---------------------------

VALUE_CHOICES = {
    "mandelstam": ["alpha'/4", "alpha'/2", "alpha'", "alpha'=2", "alpha'=1/2", "alpha'=3"],
    "graph_normalisation": ["tau2/pi", "tau2", "coprime/2"],
    "laurent_variable": ["pi*tau2", "tau2"],
    "measure": ["d2tau/tau2^2", "d2tau/(2tau2^2)", "2*d2tau/tau2^2", "d2tau/(pi*tau2^2)", "3*d2tau/(pi*tau2^2)"],
    "green_function": ["sum/pi", "2*sum/pi", "-sum/pi", "sum"],
    "amplitude_factor": ["1", "1/2", "2*pi", "pi^2/6", "3*zeta(3)"],
}
conventions_strategy = st.fixed_dictionaries({k: st.sampled_from(v) for k, v in VALUE_CHOICES.items()})


@settings(max_examples=25, deadline=None)
@given(conventions_strategy, conventions_strategy)
def test_conversion_round_trips_and_composes(first, second):
    expr = parse("C(2,1,1) + 1/3*E(2)^2 + zeta(3)*green(1/2,1/2)*E(2)")
    there = convert_coefficient(expr, ENGINE, first, 4)
    assert sympy.expand(convert_coefficient(there, first, ENGINE, 4) - sympy.expand(expr)) == 0
    via = convert_coefficient(there, first, second, 4)
    assert sympy.expand(via - convert_coefficient(expr, ENGINE, second, 4)) == 0


def test_unknown_conventions_are_rejected_with_the_known_ones():
    with pytest.raises(ConventionError, match="known values: 'tau2/pi', 'tau2', 'coprime/2'"):
        rewrite_atoms(parse("E(2)"), ENGINE, {"graph_normalisation": "tau"})
    with pytest.raises(ConventionError, match="unknown variable"):
        convert_laurent({"variable": "q", "terms": []}, ENGINE, ENGINE)


def test_every_pair_of_measures_is_inverse_to_its_reverse():
    integral = {"value": "1.5", "error": "1e-20", "digits": 20}
    for a, b in itertools.permutations(VALUE_CHOICES["measure"], 2):
        there = convert_integral(integral, {"measure": a}, {"measure": b})
        back = convert_integral(there, {"measure": b}, {"measure": a})
        assert abs(CTX.mpf(back["value"]) - CTX.mpf("1.5")) <= CTX.mpf(back["error"])
