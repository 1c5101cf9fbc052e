"""E_s(tau) = sum' (tau2/pi)^s / |m tau + n|^(2s): closed forms, Laurent part, invariance."""

from __future__ import annotations

import mpmath
import pytest

from ledger.errors import DivergentGraphError, LedgerError
from ledger.mgf.eisenstein import eisenstein_value, laurent_coefficients
from ledger.mgf.modular import reduce_point, reduce_tau, to_fundamental_domain


def _ctx(dps=60):
    ctx = mpmath.MPContext()
    ctx.dps = dps
    return ctx


@pytest.mark.parametrize("s", [2, 3, 4, 5, 6])
def test_square_lattice_closed_form(s):
    # sum' 1/(m^2+n^2)^s = 4 zeta(s) beta(s) (classical; e.g. Zucker 1974, from memory),
    # so E_s(i) = 4 zeta(s) beta(s) / pi^s; beta = Dirichlet beta = L(s, chi_-4).
    ctx = _ctx()
    value = eisenstein_value(s, mpmath.mpc(0, 1), digits=30)
    expected = 4 * ctx.zeta(s) * ctx.dirichlet(s, [0, 1, 0, -1]) / ctx.pi ** s
    assert abs(ctx.convert(value.value) - expected) <= value.error
    assert value.error < ctx.mpf(10) ** -30 * expected


def test_e3_at_i_is_zeta3_over_8():
    # beta(3) = pi^3/32, hence E_3(i) = zeta(3)/8 (classical closed form, from memory)
    ctx = _ctx()
    value = eisenstein_value(3, mpmath.mpc(0, 1), digits=40)
    assert abs(ctx.convert(value.value) - ctx.zeta(3) / 8) < ctx.mpf(10) ** -40


@pytest.mark.parametrize("s", [2, 3, 4, 5])
def test_hexagonal_lattice_closed_form(s):
    # sum' 1/(m^2 - m n + n^2)^s = 6 zeta(s) L(s, chi_-3) (Epstein zeta of the hexagonal
    # lattice, from memory), tau = exp(2 pi i/3), tau2 = sqrt(3)/2.
    ctx = _ctx()
    rho = ctx.mpc(-0.5, ctx.sqrt(3) / 2)
    value = eisenstein_value(s, rho, digits=30)
    expected = (ctx.sqrt(3) / (2 * ctx.pi)) ** s * 6 * ctx.zeta(s) * ctx.dirichlet(s, [0, 1, -1])
    assert abs(ctx.convert(value.value) - expected) <= value.error


def test_laurent_coefficients_of_e2():
    # E_2 = y^2/45 + zeta(3)/y + O(e^-2y), y = pi tau2 (standard, e.g. D'Hoker-Green-Vanhove 2015)
    ctx = _ctx()
    leading, sub = laurent_coefficients(2, ctx)
    assert abs(leading - ctx.mpf(1) / 45) < ctx.mpf(10) ** -50
    assert abs(sub - ctx.zeta(3)) < ctx.mpf(10) ** -50


def test_far_cusp_is_laurent_polynomial():
    # at tau2 = 12 the exponential corrections are below e^-75
    ctx = _ctx()
    tau = ctx.mpc("0.3", 12)
    leading, sub = laurent_coefficients(4, ctx)
    y = ctx.pi * 12
    value = eisenstein_value(4, tau, digits=30)
    assert abs(ctx.convert(value.value) - (leading * y ** 4 + sub * y ** -3)) < ctx.mpf(10) ** -28


def _lattice_sum(s, tau, size=60):
    # brute-force truncated sum plus the integral of the tail outside the disc |p| > R
    # (independent of the Fourier expansion; good to about 7 digits for s = 3)
    ctx = _ctx(20)
    tau = ctx.mpc(tau)
    total = ctx.zero
    radius = size * min(1, abs(tau)) * 0.9
    for m in range(-size, size + 1):
        for n in range(-size, size + 1):
            if m == 0 and n == 0:
                continue
            norm = abs(m * tau + n)
            if norm <= radius:
                total += norm ** (-2 * s)
    tail = 2 * ctx.pi / (tau.imag * (2 * s - 2) * radius ** (2 * s - 2))
    return (tau.imag / ctx.pi) ** s * (total + tail)


def test_against_a_brute_force_lattice_sum_at_unreduced_tau():
    tau = mpmath.mpc("1.37", "0.81")  # outside the fundamental domain
    value = eisenstein_value(3, tau, digits=20)
    assert abs(value.value - _lattice_sum(3, tau)) < 1e-6 * value.value


@pytest.mark.parametrize("tau", [mpmath.mpc("0.27", "1.31"), mpmath.mpc("-0.45", "0.92")])
def test_modular_invariance(tau):
    ctx = _ctx()
    tau = ctx.convert(tau)  # the transformed points must be exact to far beyond 30 digits
    values = [ctx.convert(eisenstein_value(4, t, digits=30).value)
              for t in (tau, tau + 1, -1 / tau, tau / (2 * tau + 1))]
    assert max(values) - min(values) < ctx.mpf(10) ** -29 * values[0]


def test_reduction_to_the_fundamental_domain():
    ctx = _ctx(40)
    tau = ctx.mpc("0.13", "0.021")
    reduced, (a, b, c, d) = reduce_tau(tau, ctx)
    assert a * d - b * c == 1
    assert abs(reduced - (a * tau + b) / (c * tau + d)) < ctx.mpf(10) ** -30
    assert abs(reduced.real) <= 0.5 and abs(reduced) >= 1 - ctx.mpf(10) ** -30
    assert to_fundamental_domain(ctx.mpc(0, 1), ctx) == ctx.mpc(0, 1)


def test_point_reduction_keeps_the_torus_point():
    ctx = _ctx(40)
    tau = ctx.mpc("0.31", "0.4")
    u, v = ctx.mpf("0.7"), ctx.mpf("2.35")
    reduced, x, y = reduce_point(u, v, tau, ctx)
    _, (a, b, c, d) = reduce_tau(tau, ctx)
    z = (u + v * tau) / (c * tau + d)
    # x + i y equals +-z modulo the lattice Z + Z reduced
    for sign in (1, -1):
        w = sign * z - (x + 1j * y)
        k = w.imag / reduced.imag
        rest = w.real - k * reduced.real
        if abs(k - ctx.nint(k)) < 1e-25 and abs(rest - ctx.nint(rest)) < 1e-25:
            break
    else:
        pytest.fail("reduced point is not equivalent")
    assert abs(x) <= 0.5 and 0 <= y <= reduced.imag / 2


def test_error_is_honest_between_precisions():
    for tau in (mpmath.mpc("0.1", "0.999"), mpmath.mpc("0.5", "2.7")):
        low = eisenstein_value(5, tau, digits=30)
        high = eisenstein_value(5, tau, digits=50)
        ctx = _ctx()
        assert abs(ctx.convert(low.value) - ctx.convert(high.value)) <= low.error


def test_bad_input():
    with pytest.raises(DivergentGraphError, match="Kronecker"):
        eisenstein_value(1, 1j)
    for s in (0, -2, 2.5, "3", True):
        with pytest.raises(LedgerError):
            eisenstein_value(s, 1j)
    with pytest.raises(LedgerError, match="upper half plane"):
        eisenstein_value(2, mpmath.mpc(0.3, -1))
    with pytest.raises(LedgerError, match="digits"):
        eisenstein_value(2, 1j, digits=0)
