"""Sums over the even spin structures of products of fermionic Green's functions.

    F_n(x_1, ..., x_n | tau) = sum_{nu=2,3,4} s_nu (theta_nu(0)/eta^3)^4 prod_i S_nu(x_i),
    x_1 + ... + x_n = 0,   s_2 = s_4 = -1, s_3 = +1,

where (theta_nu(0)/eta^3)^4 = theta_nu^4/eta^12 is the ten-dimensional
(light-cone) partition-function factor of spin structure nu and s_nu the GSO
sign, so that F_0 = (theta_3^4 - theta_2^4 - theta_4^4)/eta^12 = 0 (Jacobi).

Closed forms (derivation below; g(x) = theta_1'(x)/theta_1(x), and
wp the Weierstrass function of the lattice Z + tau Z):

    F_0 = F_2 = F_3 = 0,
    F_4 = -(2 pi)^4                                     (Riemann identity),
    F_5 = -(2 pi)^4 sum_i g(x_i),
    F_6 = -(2 pi)^4 [ (sum_i g(x_i))^2 - sum_i wp(x_i) ] / 2.

Derivation. S_nu(x)^2 = wp(x) - e_nu with e_2 = wp(1/2), e_3 = wp((1+tau)/2),
e_4 = wp(tau/2), and in terms of a = theta_2^4, c = theta_4^4 (theta_3^4 = a + c),
e_2 = pi^2 (2c + a)/3, e_3 = pi^2 (a - c)/3, e_4 = -pi^2 (2a + c)/3. Then
sum s_nu theta_nu^4 e_nu^k vanishes for k = 0, 1, 3 and equals -pi^4 (theta_2 theta_3 theta_4)^4
= -(2 pi)^4 eta^12 for k = 2 (algebra with theta_3^4 = theta_2^4 + theta_4^4). Each
F_n is elliptic in every independent x_i, with only simple poles at x_i = 0
whose residue is F_(n-1) of the remaining points (S_nu(x) = 1/x + O(x)).
F_2 = -sum s theta^4 S^2 = 0 and F_3 is odd with no poles of F_2, so both vanish;
F_4 has no poles, hence is constant, fixed at (x, -x, y, -y) to sum s theta^4 e^2/eta^12.
sum_i g(x_i) is elliptic once sum x_i = 0 (g(x + tau) = g(x) - 2 pi i) with the
right residues, and both sides of F_5 are odd, so no constant is left. For F_6 the
double poles of (sum g)^2/2 cancel against wp/2; the constant is fixed at
(x, -x, y, -y, w, -w), where F_6 = -sum s theta^4 prod (wp - e)/eta^12 leaves
-(2 pi)^4 (wp(x) + wp(y) + wp(w)) because the k = 3 sum vanishes.
The same structure (Kronecker-Eisenstein functions f^(1) = g + 2 pi i Im x/tau2,
equal to g in these sums) is in Tsuchiya, Phys. Rev. D39 (1989) 1626 (from memory).

>>> v = spin_structure_sum([0.1 + 0.2j, 0.3, -0.25 + 0.1j, -0.15 - 0.3j], 0.1 + 1.2j, digits=20)
>>> abs(v.value + (2 * mpmath.pi) ** 4) < 1e-12
True
"""

from __future__ import annotations

import mpmath

from ledger.errors import LedgerError, NotAvailableError
from ledger.mgf.approx import Approx, as_complex, as_tau, refine
from ledger.mgf.theta import EVEN_SPIN_STRUCTURES, spin_green_approx
from ledger.mgf.theta_series import eta_approx, theta_approx
from ledger.mgf.values import Value

GSO_SIGNS = {2: -1, 3: 1, 4: -1}
CLOSED_FORM_POINTS = (0, 2, 3, 4, 5, 6)


def spin_structure_sum(points, tau, digits: int = 30) -> Value:
    """F_n(x_1, ..., x_n | tau) summed numerically over nu = 2, 3, 4.

    The last point is replaced by -(x_1 + ... + x_(n-1)) so that the sum is
    exactly zero; it must agree with the given one to 1e-10.
    """

    def compute(ctx):
        tau_mp = as_tau(tau, ctx)
        xs = _points_with_zero_sum(ctx, points)
        eta4 = eta_approx(ctx, tau_mp) ** 12
        total = Approx(ctx, ctx.zero, ctx.zero)
        for nu in EVEN_SPIN_STRUCTURES:
            term = theta_approx(ctx, nu, ctx.mpc(0), tau_mp) ** 4 / eta4
            for x in xs:
                term = term * spin_green_approx(ctx, nu, x, tau_mp)
            total = total + GSO_SIGNS[nu] * term
        return total

    return refine(compute, digits).to_value(digits)


def spin_sum_closed_form(points, tau, digits: int = 30) -> Value:
    """The closed form of F_n for n in (0, 2, 3, 4, 5, 6) (module docstring).

    >>> a = spin_sum_closed_form([0.1, 0.2j, 0.3 - 0.1j, -0.2, -0.2 - 0.1j], 1.3j, digits=20)
    >>> b = spin_structure_sum([0.1, 0.2j, 0.3 - 0.1j, -0.2, -0.2 - 0.1j], 1.3j, digits=20)
    >>> abs(a.value - b.value) < 1e-10
    True
    """
    n = len(points)
    if n not in CLOSED_FORM_POINTS:
        if n == 1:
            raise LedgerError("a single point with zero sum is x = 0, a pole of S_nu")
        raise NotAvailableError(f"no closed form for {n} points here; only n = 0, 2, ..., 6 "
                                "(use spin_structure_sum for the numerical value)")

    def compute(ctx):
        tau_mp = as_tau(tau, ctx)
        xs = _points_with_zero_sum(ctx, points)
        constant = Approx.exact(ctx, -(2 * ctx.pi) ** 4)
        if n < 4:
            return Approx(ctx, ctx.zero, ctx.zero)
        if n == 4:
            return constant
        g_sum = sum((log_derivative_theta1(ctx, x, tau_mp) for x in xs), Approx.exact(ctx, 0))
        if n == 5:
            return constant * g_sum
        p_sum = sum((weierstrass_p_approx(ctx, x, tau_mp) for x in xs), Approx.exact(ctx, 0))
        return constant * (g_sum * g_sum - p_sum) / 2

    return refine(compute, digits).to_value(digits)


def weierstrass_p(z, tau, digits: int = 30) -> Value:
    """wp(z) for the lattice Z + tau Z: wp = -g' + theta_1'''(0)/(3 theta_1'(0)), g = theta_1'/theta_1.

    >>> v = weierstrass_p(1e-6, 1j, digits=20)   # wp(z) = 1/z^2 + O(z^2)
    >>> abs(v.value * 1e-12 - 1) < 1e-10
    True
    """

    def compute(ctx):
        return weierstrass_p_approx(ctx, as_complex(z, ctx, "z"), as_tau(tau, ctx))

    return refine(compute, digits).to_value(digits)


def log_derivative_theta1(ctx, z, tau) -> Approx:
    """g(z) = theta_1'(z)/theta_1(z)."""
    return theta_approx(ctx, 1, z, tau, 1) / _nonzero_theta1(ctx, z, tau)


def weierstrass_p_approx(ctx, z, tau) -> Approx:
    """wp(z|tau) = g^2 - theta_1''/theta_1 + theta_1'''(0)/(3 theta_1'(0))."""
    value = _nonzero_theta1(ctx, z, tau)
    g = theta_approx(ctx, 1, z, tau, 1) / value
    second = theta_approx(ctx, 1, z, tau, 2) / value
    origin = ctx.mpc(0)
    shift = theta_approx(ctx, 1, origin, tau, 3) / (3 * theta_approx(ctx, 1, origin, tau, 1))
    return g * g - second + shift


def _nonzero_theta1(ctx, z, tau) -> Approx:
    value = theta_approx(ctx, 1, z, tau)
    if abs(value.value) <= 2 * value.error:
        raise LedgerError(f"z = {mpmath.nstr(z, 8)} is a lattice point, a pole")
    return value


def _points_with_zero_sum(ctx, points) -> list:
    xs = [as_complex(x, ctx, "point") for x in points]
    if not xs:
        return xs
    closing = -ctx.fsum(xs[:-1])
    scale = 1 + max(abs(x) for x in xs)
    if abs(closing - xs[-1]) > ctx.mpf("1e-10") * scale:
        raise LedgerError("the points of a spin-structure sum must add up to zero")
    return xs[:-1] + [closing]
