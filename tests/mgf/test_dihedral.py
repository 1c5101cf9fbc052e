"""Edge kernels G_a and dihedral graphs C(a1..ar): published identities, independent
methods (Kronecker's limit formula, Ewald summation, the plain lattice sum), modular
invariance and honest error bounds."""

from __future__ import annotations

import importlib.util
from pathlib import Path

import mpmath
import pytest

from ledger.errors import LedgerError
from ledger.mgf.dihedral import dihedral_value, integrate_dihedral, rule_for, working_bits
from ledger.mgf.eisenstein import eisenstein_value
from ledger.mgf.jobs import Cancelled, Job
from ledger.mgf.lattice import green_value

TAUS = {
    "i": ("0", "1"),
    "near rho": ("-0.49", "0.8703"),
    "generic": ("0.27", "1.31"),
    "tall": ("0.1", "3"),
}


def _ctx(dps=60):
    ctx = mpmath.MPContext()
    ctx.dps = dps
    return ctx


def _tau(name, ctx):
    return ctx.mpc(*TAUS[name])


def _e(s, tau, digits=40):
    return eisenstein_value(s, tau, digits=digits)


# -- edge kernels -----------------------------------------------------------------

def _kronecker(u, v, tau, ctx):
    # Kronecker's second limit formula: G_1(z) = -log|theta_1(z)/eta|^2 + 2 pi (Im z)^2 / tau2
    z = u + v * tau
    theta = ctx.jtheta(1, ctx.pi * z, ctx.expjpi(tau))
    eta = ctx.expjpi(tau / 12) * ctx.qp(ctx.expjpi(2 * tau))
    return -ctx.log(abs(theta / eta) ** 2) + 2 * ctx.pi * z.imag ** 2 / tau.imag


POINTS = [("0.25", "0.5"), ("0.01", "0.02"), ("0.3", "0.05"), ("0.45", "0.2"),
          ("-0.2", "0.7"), ("0.5", "0"), ("0.3", "0.17"), ("2.3", "-1.6")]


@pytest.mark.parametrize("tau_name", ["i", "near rho", "tall"])
def test_scalar_green_function_is_kronecker(tau_name):
    ctx = _ctx(40)
    tau = _tau(tau_name, ctx)
    for u, v in POINTS:
        u, v = ctx.mpf(u), ctx.mpf(v)
        assert abs(green_value(1, u, v, tau, ctx) - _kronecker(u, v, tau, ctx)) < ctx.mpf(10) ** -35


def test_scalar_green_function_at_unreduced_tau():
    ctx = _ctx(40)
    tau = ctx.mpc("2.31", "0.37")
    u, v = ctx.mpf("0.13"), ctx.mpf("0.41")
    assert abs(green_value(1, u, v, tau, ctx) - _kronecker(u, v, tau, ctx)) < ctx.mpf(10) ** -35


def _ewald(a, u, v, tau, ctx, size=10):
    # Ewald's split of 1/|p|^(2a) at t = pi/tau2 (independent of the engine's Poisson form):
    # G_a = (tau2/pi)^a [ sum'_p chi_p Gamma(a, eta |p|^2) / (Gamma(a) |p|^(2a)) - eta^a/a!
    #        + pi/(tau2 Gamma(a)) sum_lambda b^(a-1) Gamma(1-a, b/eta) ],  b = pi^2 |z-lambda|^2/tau2^2
    tau2 = tau.imag
    eta = ctx.pi / tau2
    z = u + v * tau
    reciprocal, direct = ctx.zero, ctx.zero
    for m in range(-size, size + 1):
        for n in range(-size, size + 1):
            if m or n:
                p2 = abs(m * tau + n) ** 2
                reciprocal += (ctx.cos(2 * ctx.pi * (m * u - n * v)) * ctx.gammainc(a, eta * p2)
                               / (ctx.gamma(a) * p2 ** a))
            b = ctx.pi ** 2 * abs(z - m * tau - n) ** 2 / tau2 ** 2
            direct += b ** (a - 1) * ctx.gammainc(1 - a, b / eta)
    return (tau2 / ctx.pi) ** a * (reciprocal - eta ** a / ctx.factorial(a)
                                   + ctx.pi / (tau2 * ctx.gamma(a)) * direct)


@pytest.mark.parametrize("a", [2, 3, 4])
def test_higher_green_functions_against_ewald_summation(a):
    ctx = _ctx(25)
    for tau, (u, v) in [(ctx.mpc("0.27", "1.31"), ("0.1", "0.3")),
                        (ctx.mpc("-0.4", "0.95"), ("0.45", "0.02")),
                        (ctx.mpc("0.13", "0.6"), ("0.33", "0.71"))]:
        u, v = ctx.mpf(u), ctx.mpf(v)
        assert abs(green_value(a, u, v, tau, ctx) - _ewald(a, u, v, tau, ctx)) < ctx.mpf(10) ** -20


def test_green_function_symmetry_and_bad_input():
    ctx = _ctx(30)
    tau = ctx.mpc("0.2", "1.1")
    g = green_value(3, ctx.mpf("0.1"), ctx.mpf("0.3"), tau, ctx)
    assert abs(g - green_value(3, ctx.mpf("-1.1"), ctx.mpf("-0.3"), tau, ctx)) < ctx.mpf(10) ** -28
    # G_a(0) is finite for a >= 2: the regular value sum' (tau2/pi)^a/|p|^(2a) = E_a
    e2 = ctx.convert(_e(2, tau).value)
    assert abs(green_value(2, ctx.zero, ctx.zero, tau, ctx) - e2) < ctx.mpf(10) ** -28
    with pytest.raises(LedgerError):
        green_value(1, ctx.zero, ctx.one, tau, ctx)
    with pytest.raises(LedgerError):
        green_value(0, ctx.mpf("0.1"), ctx.zero, tau, ctx)


# -- dihedral graphs: published identities ---------------------------------------

@pytest.mark.parametrize("tau_name", list(TAUS))
def test_c111_is_e3_plus_zeta3(tau_name):
    # Zagier; D'Hoker, Green, Vanhove, arXiv:1502.06698: C_{1,1,1} = E_3 + zeta(3)
    ctx = _ctx()
    tau = _tau(tau_name, ctx)
    value = dihedral_value((1, 1, 1), tau, digits=30)
    expected = ctx.convert(_e(3, tau).value) + ctx.zeta(3)
    assert abs(ctx.convert(value.value) - expected) <= value.error
    assert value.error <= ctx.mpf(10) ** -30 * expected


@pytest.mark.parametrize("tau_name", ["generic", "tall"])
def test_c221(tau_name):
    # D'Hoker, Green, Vanhove, arXiv:1502.06698 (proof: D'Hoker, Green, arXiv:1603.00839):
    # C_{2,2,1} = 2/5 E_5 + zeta(5)/30
    ctx = _ctx()
    tau = _tau(tau_name, ctx)
    value = dihedral_value((2, 2, 1), tau, digits=30)
    expected = 2 * ctx.convert(_e(5, tau).value) / 5 + ctx.zeta(5) / 30
    assert abs(ctx.convert(value.value) - expected) <= value.error
    assert value.error <= ctx.mpf(10) ** -30 * expected


def test_c1111_identity():
    # D'Hoker, Green, Vanhove, arXiv:1502.06698: C_{1,1,1,1} = 24 C_{2,1,1} - 18 E_4 + 3 E_2^2
    ctx = _ctx()
    tau = _tau("near rho", ctx)
    c1111 = dihedral_value((1, 1, 1, 1), tau, digits=30)
    c211 = dihedral_value((2, 1, 1), tau, digits=30)
    e4, e2 = ctx.convert(_e(4, tau).value), ctx.convert(_e(2, tau).value)
    residual = ctx.convert(c1111.value) - (24 * ctx.convert(c211.value) - 18 * e4 + 3 * e2 ** 2)
    assert abs(residual) <= c1111.error + 24 * c211.error + ctx.mpf(10) ** -38
    assert abs(residual) < ctx.mpf(10) ** -28


def test_two_edges_give_eisenstein():
    ctx = _ctx()
    tau = _tau("generic", ctx)
    # C(a, b) = E_(a+b) by definition; and the quadrature itself reproduces it
    assert dihedral_value((2, 1), tau, digits=30).value == _e(3, tau, 30).value
    quadrature = integrate_dihedral((2, 1), tau, working_bits(25), rule_for(25))
    assert abs(ctx.convert(quadrature) - ctx.convert(_e(3, tau).value)) < ctx.mpf(10) ** -24


# -- independent checks -------------------------------------------------------------

def _peer():
    path = Path(__file__).resolve().parents[1] / "benchmarks" / "peer.py"
    spec = importlib.util.spec_from_file_location("peer", path)
    module = importlib.util.module_from_spec(spec)
    spec.loader.exec_module(module)
    return module


@pytest.mark.parametrize("weights", [(1, 1, 1), (3, 1, 1), (2, 1, 1, 1)])
def test_against_the_plain_lattice_sum(weights):
    # an independent method (box sums, FFT convolution, extrapolation) at low precision
    pytest.importorskip("numpy")
    tau = mpmath.mpc("0.27", "1.31")
    peer_value, peer_error, _ = _peer().peer_dihedral(weights, complex(tau), target_digits=8,
                                                        max_size=200)
    value = dihedral_value(weights, tau, digits=15)
    assert abs(value.value - peer_value) < 1e-7 * abs(peer_value) + 10 * peer_error


def test_modular_invariance_without_reduction():
    # the quadrature at images of tau outside F (other lattice bases, other points) agrees
    ctx = _ctx()
    tau = ctx.mpc("0.27", "1.31")
    direct = ctx.convert(integrate_dihedral((2, 1, 1), tau, working_bits(18), rule_for(18)))
    for image in (-1 / tau, 1 / (1 - tau)):
        other = ctx.convert(integrate_dihedral((2, 1, 1), image, working_bits(20), rule_for(20)))
        assert abs(other - direct) < ctx.mpf(10) ** -16 * direct
    shifted = dihedral_value((3, 2, 1), tau + 3, digits=20)
    plain = dihedral_value((3, 2, 1), tau, digits=20)
    assert abs(ctx.convert(shifted.value) - ctx.convert(plain.value)) <= shifted.error + plain.error


@pytest.mark.parametrize("weights, tau_name", [((2, 1, 1), "near rho"), ((1, 1, 1, 1, 1), "i"),
                                               ((4, 1, 1), "tall")])
def test_error_is_honest(weights, tau_name):
    ctx = _ctx()
    tau = _tau(tau_name, ctx)
    low = dihedral_value(weights, tau, digits=16)
    high = dihedral_value(weights, tau, digits=26)
    assert abs(ctx.convert(low.value) - ctx.convert(high.value)) <= low.error
    assert low.correct_digits() >= 16


@pytest.mark.slow
@pytest.mark.parametrize("weights", [(3, 2, 1), (2, 2, 1, 1), (1, 1, 1, 1, 1, 1)])
@pytest.mark.parametrize("tau_name", ["near rho", "generic"])
def test_error_is_honest_at_30_digits(weights, tau_name):
    ctx = _ctx()
    tau = _tau(tau_name, ctx)
    low = dihedral_value(weights, tau, digits=30)
    high = dihedral_value(weights, tau, digits=45)
    assert abs(ctx.convert(low.value) - ctx.convert(high.value)) <= low.error
    assert low.correct_digits() >= 30


def test_progress_and_cancellation():
    seen = []
    job = Job(on_progress=lambda fraction, message: seen.append(fraction))
    dihedral_value((1, 1, 1), mpmath.mpc(0, 1), digits=10, job=job)
    assert seen and seen == sorted(seen) and seen[-1] == 1.0
    job = Job()
    job.cancel()
    with pytest.raises(Cancelled):
        dihedral_value((1, 1, 1), mpmath.mpc(0, 1), digits=10, job=job)


def test_bad_input():
    for weights in [(1,), (), (1, 0, 1), (1, 1.5, 1), (1, True, 1)]:
        with pytest.raises(LedgerError):
            dihedral_value(weights, 1j)
    with pytest.raises(LedgerError, match="digits"):
        dihedral_value((1, 1, 1), 1j, digits=0)
    with pytest.raises(LedgerError, match="upper half plane"):
        dihedral_value((1, 1, 1), mpmath.mpc(0, -1))
