"""T^4/Z_N x R^6: backgrounds, sectors, modular action, supersymmetry, K3 elliptic genus,
and the sector-summed twisted integrands."""

import mpmath
import pytest
import sympy

from ledger.amplitudes.backgrounds import get_background, known_backgrounds
from ledger.amplitudes.orbifold import (
    fixed_point_weight,
    k3_elliptic_genus,
    k3_elliptic_genus_closed_form,
    elliptic_genus_sector,
    modular_image,
    orbifold_backgrounds,
    orbifold_integrands,
    orbifold_order,
    sector_blocks,
    sector_integral,
    sector_orbit,
    sector_partition_function,
    sector_spin_sum,
    sector_summed_integrand,
    sector_summed_integrand_value,
    sectors,
    spin_structure_image,
)
from ledger.errors import LedgerError, NotAvailableError
from ledger.expr import parse, to_text
from ledger.mgf.theta import theta_atom_value
from ledger.mgf.twisted_sums import twisted_eisenstein

REF = mpmath.MPContext()
REF.dps = 60
ORDERS = (2, 3, 4, 6)
TAU = REF.mpc("0.31", "0.97")


def _diff(a, b):
    return abs(REF.convert(a) - REF.convert(b))


def test_backgrounds():
    ids = [b.id for b in orbifold_backgrounds()]
    assert ids == [f"t4z{n}-{t}" for n in ORDERS for t in ("iia", "iib")]
    for background in orbifold_backgrounds():
        # K3 compactification keeps half of the 32 supercharges (common practice).
        assert background.supercharges == 16 and background.dimension == 6
        assert known_backgrounds()[background.id] == background
    assert get_background("t4z3-iib").theory == "IIB"
    assert orbifold_order("t4z4-iia") == 4
    with pytest.raises(LedgerError):
        orbifold_order("flat-iib")


def test_fixed_points_and_euler_number():
    # Fixed points of the Z_N twist on T^4: 16, 9, 4, 1 for orders 2, 3, 4, 6 (Lefschetz,
    # det(1 - g) = |1 - omega|^4; from memory), and (1/N) sum over sectors = chi(K3) = 24
    # (common knowledge).
    assert [fixed_point_weight(n, 1, 0) for n in ORDERS] == [16, 9, 4, 1]
    for n in ORDERS:
        assert sum(fixed_point_weight(n, k, l) for k, l in sectors(n)) == 24 * n


@pytest.mark.parametrize("N", ORDERS)
def test_k3_elliptic_genus_for_every_order(N):
    # Eguchi, Ooguri, Taormina, Yang, Nucl. Phys. B315 (1989) 193 (from memory):
    # Z_K3(z|tau) = 8 [(theta_2(z)/theta_2)^2 + (theta_3(z)/theta_3)^2 + (theta_4(z)/theta_4)^2].
    for z, tau in [(REF.mpc(0.3, 0.4), TAU), (REF.mpc(0.77, -1.2), REF.mpc(-0.4, 0.95))]:
        ours = k3_elliptic_genus(N, z, tau)
        expected = k3_elliptic_genus_closed_form(z, tau)
        assert _diff(ours.value, expected.value) <= ours.error + expected.error
        assert ours.correct_digits() >= 30
    # At z = 0 it is the Euler number 24 (common knowledge).
    at_zero = k3_elliptic_genus(N, 0, TAU)
    assert _diff(at_zero.value, 24) <= at_zero.error


def test_closed_form_against_mpmath_jtheta():
    # The closed form itself, from mpmath.jtheta (nome exp(i pi tau), argument pi z).
    z, tau = REF.mpc(0.2, 0.1), REF.mpc(0.1, 1.1)
    q = REF.expjpi(tau)
    expected = 8 * sum((REF.jtheta(nu, REF.pi * z, q) / REF.jtheta(nu, 0, q)) ** 2 for nu in (2, 3, 4))
    ours = k3_elliptic_genus_closed_form(z, tau)
    assert _diff(ours.value, expected) <= ours.error + 1e-50


@pytest.mark.parametrize("N", (3, 4))
def test_sector_genera_permute_under_modular_transformations(N):
    # A weak Jacobi form of index 1: phi(z/tau | -1/tau) = exp(2 pi i z^2/tau) phi(z|tau)
    # (Eichler-Zagier 1985, from memory), sector by sector with (k,l) -> (l,-k);
    # tau -> tau+1: (k,l) -> (k,k+l).
    z, tau = REF.mpc(0.21, 0.13), REF.mpc(0.12, 1.05)
    for sector in sectors(N)[1:]:
        moved = elliptic_genus_sector(N, *sector, z / tau, -1 / tau)
        image = elliptic_genus_sector(N, *modular_image(N, sector, "S"), z, tau)
        assert _diff(moved.value, REF.expjpi(2 * z * z / tau) * REF.convert(image.value)) < 1e-28
        shifted = elliptic_genus_sector(N, *sector, z, tau + 1)
        image = elliptic_genus_sector(N, *modular_image(N, sector, "T"), z, tau)
        assert _diff(shifted.value, image.value) <= shifted.error + image.error


@pytest.mark.parametrize("N", ORDERS)
def test_spin_structure_sum_vanishes_in_every_sector(N):
    # Space-time supersymmetry: sum_nu s_nu theta_nu(0)^2 theta_nu(u) theta_nu(-u) = 0 by the
    # Riemann identity with points (0, 0, u, -u) (Whittaker & Watson sec. 21.22, from memory).
    for sector in sectors(N):
        value = sector_spin_sum(N, *sector, TAU)
        assert abs(value.value) <= value.error + 1e-40


@pytest.mark.parametrize("N", (2, 6))
def test_blocks_transform_by_permuting_sectors(N):
    # theta transformation laws (DLMF 20.7.26-20.7.33 in the period-1 variable, from memory):
    # tau+1: theta_2 -> e^(i pi/4) theta_2, theta_3 <-> theta_4, theta_1 -> e^(i pi/4) theta_1,
    #        eta -> e^(i pi/12) eta;
    # -1/tau: theta_2 <-> theta_4, theta_3 -> theta_3, each up to sqrt(-i tau) exp(i pi z^2/tau)
    #        (theta_1 with an extra -i), eta -> sqrt(-i tau) eta.
    for sector in sectors(N):
        at_tau_plus_one = sector_blocks(N, *sector, TAU + 1)
        at_tau_t = sector_blocks(N, *modular_image(N, sector, "T"), TAU)
        at_minus_inverse = sector_blocks(N, *sector, -1 / TAU)
        at_tau_s = sector_blocks(N, *modular_image(N, sector, "S"), TAU)
        weight = -4 if sector == (0, 0) else -2
        for nu in (2, 3, 4):
            image, sign = spin_structure_image(nu, "T")
            assert _diff(at_tau_plus_one[nu].value, sign * REF.convert(at_tau_t[image].value)) < 1e-28
            image, _ = spin_structure_image(nu, "S")
            expected = TAU ** weight * REF.convert(at_tau_s[image].value)
            assert _diff(at_minus_inverse[nu].value, expected) < 1e-28 * max(1, abs(expected))


def test_sector_partition_functions_are_permuted():
    # |B|^2 tau2^-2 is invariant up to the permutation (weights cancel against tau2).
    N = 3
    for sector in [(0, 1), (1, 2), (2, 0)]:
        for nu, nubar in [(3, 3), (2, 4)]:
            moved = sector_partition_function(N, *sector, nu, nubar, -1 / TAU)
            image = sector_partition_function(N, *modular_image(N, sector, "S"),
                                              spin_structure_image(nu, "S")[0],
                                              spin_structure_image(nubar, "S")[0], TAU)
            assert _diff(moved.value, image.value) < 1e-27
    with pytest.raises(NotAvailableError):
        sector_partition_function(N, 0, 0, 3, 3, TAU)


def test_orbits_are_the_classes_of_equal_twist_order():
    # SL(2,Z) -> SL(2,Z/N) is onto and acts transitively on vectors of a given order; the number
    # of vectors of exact order M in (Z/M)^2 is Jordan's totient J_2(M) = M^2 prod_p|M (1 - p^-2)
    # (from memory): J_2 = 3, 8, 12, 24 for M = 2, 3, 4, 6.
    jordan = {1: 1, 2: 3, 3: 8, 4: 12, 6: 24}
    for N in ORDERS:
        for sector in sectors(N)[1:]:
            orbit = sector_orbit(N, sector)
            order = N // sympy.gcd(sympy.gcd(*sector), N)
            assert len(orbit) == jordan[order]
            assert all(fixed_point_weight(N, *s) == fixed_point_weight(N, *sector) for s in orbit)


@pytest.mark.parametrize("N", ORDERS)
def test_sector_summed_integrand_reduces_exactly(N):
    # Numerical sum of the twisted lattice sums over the sectors against the exact reduction
    # (Moebius inversion of the distribution relation) to c E_s, or a constant for s = 1.
    for s in (1, 2, 3):
        data = sector_summed_integrand(N, s)
        value = sector_summed_integrand_value(N, s, TAU)
        if s == 1:
            expected = REF.mpf(str(sympy.N(data.expression, 70)))
        else:
            coefficient = data.expression.as_coeff_Mul()[0]
            expected = REF.mpf(coefficient.p) / coefficient.q * _eisenstein(s, TAU)
        assert _diff(value.value, expected) <= value.error + 1e-45
        assert value.correct_digits() >= 30


def test_green_sector_sum_is_the_distribution_constant():
    # For s = 1 the sector sum is constant in tau: check it at a second point, and the
    # known N = 2 value -16 log 2 from theta_2 theta_3 theta_4 = 2 eta^3 (from memory).
    data = sector_summed_integrand(2, 1)
    assert data.expression == -16 * sympy.log(2)
    assert data.integral == -16 * sympy.log(2) * sympy.pi / 3
    other = sector_summed_integrand_value(2, 1, REF.mpc(-0.45, 2.2))
    assert _diff(other.value, -16 * REF.log(2)) <= other.error + 1e-45


def test_sector_expression_reparses_and_evaluates():
    data = sector_summed_integrand(3, 2)
    text = to_text(data.sector_expression())
    expression = parse(text)
    total = REF.zero
    for term in expression.args:
        coefficient, atom = term.as_coeff_Mul()
        total += REF.mpf(coefficient.p) / coefficient.q * REF.convert(theta_atom_value(atom, TAU).value)
    coefficient = data.expression.as_coeff_Mul()[0]
    assert abs(total - REF.mpf(coefficient.p) / coefficient.q * _eisenstein(2, TAU)) < 1e-28


def test_laurent_and_integrals():
    data = sector_summed_integrand(2, 2)
    # -6 E_2: Laurent -6 (y^2/45 + zeta(3)/y) (E_2 Laurent polynomial, DESIGN sec. 3 / standard).
    assert data.laurent == {2: -sympy.Rational(6, 45), -1: -6 * sympy.zeta(3)}
    # The renormalised integral of E_s over F vanishes (Zagier 1981, "The Rankin-Selberg method
    # for automorphic functions which are not of rapid decay", from memory).
    assert data.integral == 0 and data.log_coefficient == 0
    # One N = 2 sector on Gamma_0(2)-type domains of index 3: unfolding gives the integral of the
    # orbit sum (all three sectors, -2 log 2) over F: -2 pi log 2/3.
    assert sector_integral(2, (1, 1), 1) == (-2 * sympy.pi * sympy.log(2) / 3, 3)
    # Order-6 sectors of N = 6: their orbit sum is U(1) = -2 log 6 + 2 log 3 + 2 log 2 = 0.
    assert sector_integral(6, (1, 0), 1) == (0, 12)
    assert sector_integral(6, (0, 3), 2) == (0, 3)


def test_records_for_project_entries():
    records = [i.as_record() for i in orbifold_integrands("t4z4-iib", 2)]
    assert [r["weight"] for r in records] == [1, 2]
    assert records[1]["reduced"] == "-51*E(2)/16" and records[1]["integral"] == "0"
    # The sector form re-parses and names one atom per twisted sector (N^2 - 1 = 15).
    assert len(parse(records[1]["expr"]).args) == 15
    assert sympy.sympify(records[0]["laurent"][0]["coefficient"]) == -10 * sympy.log(2)


def test_bad_orders_and_transforms():
    with pytest.raises(LedgerError, match="N in 2, 3, 4, 6"):
        sectors(5)
    with pytest.raises(LedgerError):
        modular_image(4, (1, 0), "U")
    with pytest.raises(LedgerError):
        sector_summed_integrand(3, 0)


def _eisenstein(s, tau):
    """E_s(tau) = Etw(s, 0, 0), itself checked against the Fourier expansion in tests/mgf/test_theta.py."""
    return REF.convert(twisted_eisenstein(s, 0, 0, tau, digits=40).value)
