"""Spin-structure sums: Jacobi and Riemann identities and the n = 5, 6 closed forms.

Independent references: python-flint's theta functions, theta derivatives and
Weierstrass wp (acb.modular_theta, acb.elliptic_p); the identities name their source.
"""

import random

import flint
import mpmath
import pytest

from ledger.errors import LedgerError, NotAvailableError
from ledger.mgf.spin_sums import (
    GSO_SIGNS,
    spin_structure_sum,
    spin_sum_closed_form,
    weierstrass_p,
)

REF = mpmath.MPContext()
REF.dps = 60
TAUS = [0.23 + 1.07j, -0.41 + 0.93j, 0.05 + 1.9j]


@pytest.fixture(autouse=True)
def flint_50():
    saved = flint.ctx.dps
    flint.ctx.dps = 50
    yield
    flint.ctx.dps = saved


def _mp(x):
    return REF.mpc(REF.mpf(x.real.mid().str(50, radius=False)), REF.mpf(x.imag.mid().str(50, radius=False)))


def _points(n, seed):
    rng = random.Random(seed)
    xs = [complex(rng.uniform(-0.45, 0.45), rng.uniform(-0.45, 0.45)) for _ in range(n - 1)]
    return xs + [-sum(xs)] if n else []


def _flint_pieces(points, tau):
    """g(x) = theta_1'/theta_1 and wp(x) from python-flint, at the points as our code sees them
    (the last one closed to make the sum exactly zero)."""
    exact = [REF.mpc(x) for x in points[:-1]]
    exact.append(-REF.fsum(exact))
    t = flint.acb(tau)
    gs, ps = [], []
    for x in exact:
        z = flint.acb(flint.arb(REF.nstr(x.real, 55)), flint.arb(REF.nstr(x.imag, 55)))
        value = z.modular_theta(t)[0]
        slope = z.modular_theta(t, 1)[0]
        gs.append(_mp(slope / value))
        ps.append(_mp(flint.acb.elliptic_p(z, t)))
    return gs, ps


@pytest.mark.parametrize("tau", TAUS)
def test_jacobi_identity_is_the_empty_sum(tau):
    # theta_3^4 - theta_2^4 - theta_4^4 = 0 (Jacobi; DLMF 20.7.3, from memory).
    value = spin_structure_sum([], tau)
    assert abs(value.value) <= value.error + 1e-40


@pytest.mark.parametrize("n", (2, 3))
@pytest.mark.parametrize("tau", TAUS)
def test_sums_with_fewer_than_four_points_vanish(n, tau):
    # Fewer than eight fermion zero modes: the sum vanishes (common practice; Riemann identity).
    value = spin_structure_sum(_points(n, 7 + n), tau)
    assert abs(value.value) <= value.error + 1e-40
    assert spin_sum_closed_form(_points(n, 7 + n), tau).value == 0


@pytest.mark.parametrize("tau", TAUS)
def test_riemann_identity_four_points(tau):
    # Riemann's identity for sum x_i = 0: sum_even s_nu prod theta_nu(x_i) = -prod theta_1(x_i)
    # (Whittaker & Watson sec. 21.22; Mumford, Tata lectures on theta I, from memory), checked
    # with python-flint's thetas; with theta_1'(0) = 2 pi eta^3 it gives F_4 = -(2 pi)^4.
    points = _points(4, 11)
    t = flint.acb(tau)
    exact = [flint.acb(x) for x in points[:3]]
    exact.append(-(exact[0] + exact[1] + exact[2]))
    thetas = [x.modular_theta(t) for x in exact]
    lhs = sum(GSO_SIGNS[nu] * thetas[0][nu - 1] * thetas[1][nu - 1] * thetas[2][nu - 1] * thetas[3][nu - 1]
              for nu in (2, 3, 4))
    rhs = -thetas[0][0] * thetas[1][0] * thetas[2][0] * thetas[3][0]
    assert abs(_mp(lhs) - _mp(rhs)) < 1e-40
    ours = spin_structure_sum(points, tau)
    assert abs(REF.convert(ours.value) + (2 * REF.pi) ** 4) <= ours.error
    assert ours.correct_digits() >= 30


@pytest.mark.parametrize("tau", TAUS)
@pytest.mark.parametrize("seed", (1, 2))
def test_five_point_closed_form(tau, seed):
    # F_5 = -(2 pi)^4 sum_i theta_1'(x_i)/theta_1(x_i): derived in ledger/mgf/spin_sums.py from the
    # Riemann identity and Liouville's theorem (same structure as Tsuchiya, PRD 39 (1989) 1626,
    # from memory); the right side is built from python-flint's theta derivatives.
    points = _points(5, seed)
    gs, _ = _flint_pieces(points, tau)
    expected = -(2 * REF.pi) ** 4 * REF.fsum(gs)
    ours = spin_structure_sum(points, tau)
    assert abs(REF.convert(ours.value) - expected) <= ours.error + 1e-40
    assert ours.correct_digits() >= 30


@pytest.mark.parametrize("tau", TAUS)
@pytest.mark.parametrize("seed", (3, 4))
def test_six_point_closed_form(tau, seed):
    # F_6 = -(2 pi)^4 [(sum_i g(x_i))^2 - sum_i wp(x_i)]/2 (derivation in ledger/mgf/spin_sums.py),
    # right side from python-flint's theta derivatives and Weierstrass wp.
    points = _points(6, seed)
    gs, ps = _flint_pieces(points, tau)
    expected = -(2 * REF.pi) ** 4 * (REF.fsum(gs) ** 2 - REF.fsum(ps)) / 2
    ours = spin_structure_sum(points, tau)
    assert abs(REF.convert(ours.value) - expected) <= ours.error + 1e-38
    assert ours.correct_digits() >= 30


@pytest.mark.parametrize("n", (4, 5, 6))
def test_closed_form_function_agrees_with_the_sum(n):
    points = _points(n, 20 + n)
    tau = TAUS[0]
    closed = spin_sum_closed_form(points, tau)
    summed = spin_structure_sum(points, tau)
    assert abs(REF.convert(closed.value) - REF.convert(summed.value)) <= closed.error + summed.error


def test_derivation_ingredients():
    # S_nu(z)^2 = wp(z) - e_nu with e_2 = wp(1/2), e_3 = wp((1+tau)/2), e_4 = wp(tau/2)
    # (DLMF 23.6.2-23.6.4 in theta form, from memory), and sum_nu s_nu theta_nu^4 e_nu^k = 0 for
    # k = 0, 1, 3, = -pi^4 (theta_2 theta_3 theta_4)^4 for k = 2 (the algebra in the module docstring);
    # all from python-flint.
    tau = flint.acb(TAUS[1])
    zero = flint.acb(0).modular_theta(tau)
    half_periods = {2: flint.acb(0.5), 3: (1 + tau) / 2, 4: tau / 2}
    e = {nu: flint.acb.elliptic_p(p, tau) for nu, p in half_periods.items()}
    z = flint.acb(0.13, 0.21)
    at_z = z.modular_theta(tau)
    prime = flint.acb(0).modular_theta(tau, 1)[0]
    for nu in (2, 3, 4):
        s_nu = prime * at_z[nu - 1] / (zero[nu - 1] * at_z[0])
        assert abs(_mp(s_nu ** 2 - flint.acb.elliptic_p(z, tau) + e[nu])) < 1e-40
    k2 = -flint.arb.pi() ** 4 * (zero[1] * zero[2] * zero[3]) ** 4
    for k, expected in [(0, 0), (1, 0), (2, k2), (3, 0)]:
        total = sum(GSO_SIGNS[nu] * zero[nu - 1] ** 4 * e[nu] ** k for nu in (2, 3, 4))
        assert abs(_mp(total - expected)) < 1e-35


@pytest.mark.parametrize("tau", TAUS)
def test_weierstrass_p_matches_flint(tau):
    # Reference: python-flint acb.elliptic_p(z, tau) (lattice Z + tau Z).
    z = 0.31 - 0.17j
    ours = weierstrass_p(z, tau)
    expected = _mp(flint.acb.elliptic_p(flint.acb(z), flint.acb(tau)))
    assert abs(REF.convert(ours.value) - expected) <= ours.error + 1e-40
    assert ours.correct_digits() >= 30


def test_bad_input():
    with pytest.raises(LedgerError, match="add up to zero"):
        spin_structure_sum([0.1, 0.2], 1j)
    with pytest.raises(LedgerError, match="pole"):
        spin_sum_closed_form([0], 1j)
    with pytest.raises(NotAvailableError):
        spin_sum_closed_form(_points(7, 1), 1j)
    with pytest.raises(LedgerError, match="pole"):
        spin_structure_sum([0.5, -0.5, 1, -1], 1j)
