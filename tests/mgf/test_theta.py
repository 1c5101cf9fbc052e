"""Theta functions, eta, S_nu, the scalar Green's function and twisted sums.

References are general-purpose libraries (python-flint's acb theta and eta
functions, mpmath's jtheta, Hurwitz zeta and Bessel K) and published
identities; each check names its source.
"""

from fractions import Fraction

import flint
import mpmath
import pytest
import sympy

from eisenstein_reference import eisenstein_reference
from ledger.errors import DivergentGraphError, LedgerError
from ledger.expr import parse
from ledger.mgf.theta import (
    dedekind_eta,
    jacobi_theta,
    scalar_green,
    spin_green,
    theta1_prime,
    theta_atom_laurent,
    theta_atom_value,
)
from ledger.mgf.twisted_sums import twisted_eisenstein, twisted_eisenstein_laurent

# points inside and outside the fundamental domain, tau1 != 0 in most
TAUS = ["0.27+1.31j", "-0.5+0.8660254037844386j", "0.1+0.6j", "0.43+2.7j"]
ZS = ["0", "0.3+0.2j", "-1.7+2.3j", "0.5+0.41j"]


def _ref_ctx(dps=80):
    """A private high-precision context: comparisons must not round to the global 15 digits."""
    ctx = mpmath.MPContext()
    ctx.dps = dps
    return ctx


REF = _ref_ctx()


@pytest.fixture
def flint_50():
    saved = flint.ctx.dps
    flint.ctx.dps = 50
    yield
    flint.ctx.dps = saved


def _acb(text):
    """The exact binary double value, as our functions receive complex(text)."""
    return flint.acb(complex(text))


def _from_acb(x):
    return REF.mpc(REF.mpf(x.real.mid().str(50, radius=False)),
                   REF.mpf(x.imag.mid().str(50, radius=False)))


def _difference(a, b):
    return abs(REF.convert(a) - REF.convert(b))


def _agrees(ours, reference, radius=0):
    """The reference lies within our error bar (plus its own radius)."""
    return _difference(ours.value, reference) <= ours.error + radius


# --- python-flint (acb.modular_theta uses the same z, with pi included) -------------


@pytest.mark.parametrize("tau", TAUS)
@pytest.mark.parametrize("z", ZS)
def test_theta_matches_flint_to_30_digits(flint_50, tau, z):
    # Reference: python-flint acb.modular_theta(z, tau) = (theta_1..theta_4),
    # "theta_3(z,tau) = 1 + 2 sum q^(n^2) cos(2 n pi z)", q = exp(i pi tau) (its docstring).
    reference = _acb(z).modular_theta(_acb(tau))
    for nu in (1, 2, 3, 4):
        ours = jacobi_theta(nu, complex(z), complex(tau), digits=30)
        ref = _from_acb(reference[nu - 1])
        assert _agrees(ours, ref, 1e-45)
        assert ours.error <= 1e-30 * max(abs(ref), 1e-30) or abs(ref) < 1e-40


@pytest.mark.parametrize("tau", TAUS)
def test_theta_derivatives_match_flint(flint_50, tau):
    # Reference: python-flint acb.modular_theta(z, tau, r) gives the r-th z-derivatives.
    z = "0.21-0.33j"
    for order in (1, 2, 3):
        reference = _acb(z).modular_theta(_acb(tau), order)
        for nu in (1, 2, 3, 4):
            ours = jacobi_theta(nu, complex(z), complex(tau), digits=30, derivative=order)
            assert _agrees(ours, _from_acb(reference[nu - 1]), 1e-44)
            assert ours.correct_digits() >= 30


@pytest.mark.parametrize("tau", TAUS)
def test_eta_matches_flint(flint_50, tau):
    # Reference: python-flint acb.modular_eta (Dedekind eta).
    ours = dedekind_eta(complex(tau), digits=30)
    assert _agrees(ours, _from_acb(_acb(tau).modular_eta()), 1e-45)
    assert ours.correct_digits() >= 30


# --- mpmath jtheta: nome q = exp(i pi tau), argument pi z, d/dz = pi d/d(pi z) ----------


@pytest.mark.parametrize("tau", TAUS[:3])
def test_theta_matches_mpmath_jtheta(tau):
    # Reference: mpmath.jtheta(n, pi z, exp(i pi tau), r) * pi^r (mpmath's z has period pi).
    ctx = REF
    t = ctx.mpc(complex(tau))
    for z in ZS[1:]:
        for nu in (1, 2, 3, 4):
            for order in (0, 1):
                ours = jacobi_theta(nu, complex(z), complex(tau), digits=35, derivative=order)
                argument = ctx.pi * ctx.mpc(complex(z))
                reference = ctx.jtheta(nu, argument, ctx.expjpi(t), order) * ctx.pi ** order
                assert _agrees(ours, reference, 1e-50)


def test_more_digits_on_request():
    ctx = _ref_ctx(110)
    tau = ctx.mpc(complex(TAUS[0]))
    ours = jacobi_theta(2, 0.3 + 0.2j, complex(TAUS[0]), digits=90)
    # Reference: mpmath.jtheta at 110 digits.
    reference = ctx.jtheta(2, ctx.pi * ctx.mpc(0.3 + 0.2j), ctx.expjpi(tau))
    assert ours.correct_digits() >= 90
    assert abs(ctx.convert(ours.value) - reference) <= ours.error + 1e-105


# --- identities -----------------------------------------------------------------------


@pytest.mark.parametrize("tau", TAUS)
def test_jacobi_identities(tau):
    ctx = REF
    t2, t3, t4 = (ctx.convert(jacobi_theta(nu, 0, complex(tau), digits=35).value) for nu in (2, 3, 4))
    eta = ctx.convert(dedekind_eta(complex(tau), digits=35).value)
    prime = ctx.convert(theta1_prime(complex(tau), digits=35).value)
    # Jacobi: theta_3^4 = theta_2^4 + theta_4^4 (DLMF 20.7.3, from memory).
    assert abs(t3 ** 4 - t2 ** 4 - t4 ** 4) < 1e-32
    # theta_1'(0) = pi theta_2 theta_3 theta_4 in the period-1 variable (DLMF 20.4.6, from memory)
    # and theta_2 theta_3 theta_4 = 2 eta^3 (from memory): theta_1'(0) = 2 pi eta^3.
    assert abs(prime - ctx.pi * t2 * t3 * t4) < 1e-32
    assert abs(prime - 2 * ctx.pi * eta ** 3) < 1e-32


def test_special_values_at_i():
    ctx = REF
    # eta(i) = Gamma(1/4) / (2 pi^(3/4)) (from memory; Chowla-Selberg).
    eta = dedekind_eta(1j, digits=35)
    assert _agrees(eta, ctx.gamma(ctx.mpf(1) / 4) / (2 * ctx.pi ** (ctx.mpf(3) / 4)), 1e-38)
    # theta_3(0|i) = pi^(1/4) / Gamma(3/4) (from memory).
    theta3 = jacobi_theta(3, 0, 1j, digits=35)
    assert _agrees(theta3, ctx.pi ** (ctx.mpf(1) / 4) / ctx.gamma(ctx.mpf(3) / 4), 1e-38)


def test_quasi_periodicity():
    # theta_1(z + tau) = -exp(-i pi tau - 2 pi i z) theta_1(z) (DLMF 20.2.12 in the period-1 variable,
    # from memory); our reduction uses it, so test it far from the reduced cell.
    ctx = REF
    tau, z = ctx.mpc(0.31, 1.2), ctx.mpc(0.17, -0.4)
    far = ctx.convert(jacobi_theta(1, z + 3 * tau - 2, tau, digits=30).value)
    near = ctx.convert(jacobi_theta(1, z, tau, digits=30).value)
    expected = -ctx.expjpi(-9 * tau - 6 * z) * near   # three shifts by tau, sign (-1)^3, two by 1: +1
    assert abs(far - expected) < 1e-28 * abs(far)


# --- fermionic and scalar Green's functions --------------------------------------------


@pytest.mark.parametrize("nu", (2, 3, 4))
def test_spin_green_matches_flint_thetas(flint_50, nu):
    # S_nu = theta_1'(0) theta_nu(z) / (theta_nu(0) theta_1(z)) from python-flint's thetas.
    tau, z = _acb(TAUS[0]), _acb("0.23+0.37j")
    at_z = z.modular_theta(tau)
    at_zero = flint.acb(0).modular_theta(tau)
    prime = flint.acb(0).modular_theta(tau, 1)[0]
    reference = _from_acb(prime * at_z[nu - 1] / (at_zero[nu - 1] * at_z[0]))
    ours = spin_green(nu, 0.23 + 0.37j, complex(TAUS[0]), digits=30)
    assert _agrees(ours, reference, 1e-44) and ours.correct_digits() >= 30


def test_spin_green_pole_is_reported():
    with pytest.raises(LedgerError, match="pole"):
        spin_green(2, 1, 1j)


POINTS = [(Fraction(1, 2), Fraction(0)), (Fraction(1, 3), Fraction(1, 2)), (Fraction(1, 6), Fraction(5, 6)),
          (Fraction(2, 7), Fraction(3, 11)), (Fraction(0), Fraction(1, 4))]


@pytest.mark.parametrize("tau", TAUS)
@pytest.mark.parametrize("alpha,beta", POINTS)
def test_kronecker_second_limit_formula(tau, alpha, beta):
    # Kronecker's second limit formula (e.g. Siegel, Lectures on advanced analytic number theory,
    # 1961; D'Hoker, Green, Gurdogan, Vanhove arXiv:1512.06779 sec. 2, from memory):
    # sum' tau2/(pi |m tau + n|^2) exp(2 pi i (m alpha - n beta))
    #     = -log|theta_1(z)/eta|^2 + 2 pi (Im z)^2/tau2.
    kronecker = scalar_green(alpha, beta, complex(tau), digits=30)
    lattice = scalar_green(alpha, beta, complex(tau), digits=30, method="lattice")
    assert _difference(kronecker.value, lattice.value) <= kronecker.error + lattice.error
    assert min(kronecker.correct_digits(), lattice.correct_digits()) >= 30


def test_green_phase_orientation_matters():
    # With tau1 != 0 the opposite phase exp(2 pi i (m alpha + n beta)) is a different function:
    # Etw(1, alpha, -beta) must differ from the Kronecker form at (alpha, beta).
    tau = 0.27 + 1.31j
    right = scalar_green(Fraction(1, 3), Fraction(1, 4), tau)
    flipped = twisted_eisenstein(1, Fraction(1, 3), Fraction(-1, 4), tau)
    assert abs(right.value - flipped.value) > 1e-3


def test_green_diverges_at_origin():
    with pytest.raises(DivergentGraphError):
        scalar_green(0, 1, 1j)


def test_green_half_periods_sum_to_minus_two_log_two():
    # sum over the three half periods: -log|theta_2 theta_3 theta_4/eta^3|^2 = -log 4,
    # by theta_2 theta_3 theta_4 = 2 eta^3 (from memory).
    tau = 0.37 + 0.88j
    total = sum(REF.convert(scalar_green(a, b, tau).value)
                for a, b in [(Fraction(1, 2), 0), (0, Fraction(1, 2)), (Fraction(1, 2), Fraction(1, 2))])
    assert abs(total + 2 * REF.log(2)) < 1e-29


# --- twisted Eisenstein sums -----------------------------------------------------------


def _eisenstein_fourier(s, tau):
    """E_s from the handbook Fourier series (tests/mgf/eisenstein_reference.py, mpmath only)."""
    return REF.convert(eisenstein_reference(s, tau, 50).value)


@pytest.mark.parametrize("s", (2, 3, 5))
def test_untwisted_sum_is_the_eisenstein_series(s):
    ctx = REF
    tau = ctx.mpc(0.31, 1.05)
    ours = twisted_eisenstein(s, 0, 0, tau, digits=30)
    assert _agrees(ours, _eisenstein_fourier(s, tau), 1e-40) and ours.correct_digits() >= 30


@pytest.mark.parametrize("N,s", [(2, 2), (3, 2), (4, 3), (6, 2)])
def test_distribution_relation(N, s):
    # sum_{k,l mod N} exp(2 pi i (m l - n k)/N) = N^2 [N | m, N | n]: the twisted sums over all
    # N-torsion points add up to N^(2-2s) E_s (character orthogonality, common practice).
    ctx = REF
    tau = ctx.mpc(-0.22, 0.93)
    total = sum(ctx.convert(twisted_eisenstein(s, Fraction(l, N), Fraction(k, N), tau, digits=30).value)
                for k in range(N) for l in range(N))
    assert abs(total - ctx.mpf(N) ** (2 - 2 * s) * _eisenstein_fourier(s, tau)) < 1e-28


@pytest.mark.parametrize("alpha,beta", [(Fraction(1, 3), Fraction(1, 4)), (Fraction(0), Fraction(1, 6)),
                                        (Fraction(5, 6), Fraction(0))])
def test_modular_covariance(alpha, beta):
    # From the lattice sum: Etw(s, alpha, beta | gamma tau) = Etw(s, d alpha + b beta, c alpha + a beta | tau)
    # for gamma = (a b; c d) (substitute (m, n) -> (m a + n c, m b + n d)); the Poisson-resummed
    # evaluation is not manifestly covariant, so this tests it.
    tau = REF.mpc(0.17, 1.13)
    for s in (1, 2):
        for (a, b, c, d) in [(1, 1, 0, 1), (0, -1, 1, 0), (2, 1, 1, 1)]:
            moved = (a * tau + b) / (c * tau + d)
            lhs = twisted_eisenstein(s, alpha, beta, moved, digits=30)
            rhs = twisted_eisenstein(s, d * alpha + b * beta, c * alpha + a * beta, tau, digits=30)
            assert _difference(lhs.value, rhs.value) <= lhs.error + rhs.error


def test_twisted_sum_against_truncated_lattice_sum():
    # Independent of the Poisson resummation: a plain symmetric sum over |m|, |n| <= 150 for s = 3
    # (absolutely convergent; the tail is O(150^-4) ~ 1e-9 here).
    tau = complex(0.27, 1.31)
    alpha, beta = Fraction(1, 3), Fraction(1, 4)
    cut = 150
    total = 0.0
    import cmath
    for m in range(-cut, cut + 1):
        for n in range(-cut, cut + 1):
            if m or n:
                phase = cmath.exp(2j * cmath.pi * (m * alpha - n * beta))
                total += (phase / abs(m * tau + n) ** 6).real
    total *= (tau.imag / cmath.pi) ** 3
    assert abs(twisted_eisenstein(3, alpha, beta, tau, digits=20).value - total) < 1e-7


@pytest.mark.parametrize("s,alpha,beta", [(1, Fraction(1, 3), 0), (2, Fraction(1, 4), 0),
                                          (3, Fraction(1, 6), 0),
                                          (2, Fraction(2, 5), 0), (2, Fraction(1, 2), Fraction(1, 3))])
def test_laurent_polynomial_is_the_large_tau2_limit(s, alpha, beta):
    # The remainder decays like exp(-2 pi tau2 d), d = min |k + beta| over k + beta != 0.
    laurent = twisted_eisenstein_laurent(s, alpha, beta)
    distance = min(beta, 1 - beta) if beta else 1
    for tau2 in (4, 7):
        tau = REF.mpc(0.3, tau2)
        y = REF.pi * tau2
        polynomial = sum(REF.mpf(str(sympy.N(c, 60))) * y ** p for p, c in laurent.items())
        value = REF.convert(twisted_eisenstein(s, alpha, beta, tau, digits=30).value)
        assert abs(value - polynomial) < 20 * REF.exp(-2 * REF.pi * tau2 * distance) * (1 + y) ** s


def test_laurent_polynomial_exact_forms():
    # E_s: 2 zeta(2s) y^s/pi^2s + 2 Gamma(s-1/2) zeta(2s-1) y^(1-s)/(sqrt(pi) Gamma(s)) (DESIGN sec. 3,
    # standard); sum cos(2 pi m/2)/m^3 = -(3/4) zeta(3) (alternating zeta, common practice).
    expected = {3: sympy.Rational(2, 945), -2: sympy.Rational(3, 4) * sympy.zeta(5)}
    assert twisted_eisenstein_laurent(3, 0, 0) == expected
    assert twisted_eisenstein_laurent(2, Fraction(1, 2), 0)[-1] == -sympy.Rational(3, 4) * sympy.zeta(3)
    # G at beta = 0: y/3 - 2 log|2 sin(pi alpha)| (the q -> 0 limit of the Kronecker form, from memory).
    assert twisted_eisenstein_laurent(1, Fraction(1, 6), 0) == {1: sympy.Rational(1, 3), 0: 0}


# --- the expression atoms --------------------------------------------------------------


@pytest.mark.parametrize("text,direct", [
    ("theta(1, 1/3, 1/2)", lambda tau: jacobi_theta(1, REF.mpf(1) / 3 + tau / 2, tau)),
    ("eta", lambda tau: dedekind_eta(tau)),
    ("spin(4, 1/5, 2/3)", lambda tau: spin_green(4, REF.mpf(1) / 5 + 2 * tau / 3, tau)),
    ("green(1/3, 1/2)", lambda tau: scalar_green(Fraction(1, 3), Fraction(1, 2), tau, method="lattice")),
    ("Etw(2, 1/4, 1/3)", lambda tau: twisted_eisenstein(2, Fraction(1, 4), Fraction(1, 3), tau)),
])
def test_atoms_evaluate(text, direct):
    tau = REF.mpc(0.27, 1.31)
    value = theta_atom_value(parse(text), tau, digits=30)
    reference = direct(tau)
    assert _difference(value.value, reference.value) <= value.error + reference.error
    assert value.correct_digits() >= 30 and value.digits == 30


def test_atom_errors_are_ledger_errors():
    tau = 0.1 + 1.2j
    with pytest.raises(LedgerError, match="pole"):
        theta_atom_value(parse("spin(3, 1, 0)"), tau)
    with pytest.raises(DivergentGraphError):
        theta_atom_value(parse("green(0, 1)"), tau)
    with pytest.raises(LedgerError, match="upper half plane"):
        theta_atom_value(parse("eta"), 1 - 0.5j)
    with pytest.raises(LedgerError):
        theta_atom_laurent(parse("theta(2, 0, 0)"))


def test_atom_laurent():
    assert theta_atom_laurent(parse("green(1/2, 0)")) == {1: sympy.Rational(1, 3), 0: -2 * sympy.log(2)}
    assert theta_atom_laurent(parse("Etw(2, 0, 1/2)")) == {2: -sympy.Rational(7, 360)}
