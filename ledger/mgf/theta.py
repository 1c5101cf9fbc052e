"""Theta-function family: Jacobi theta, eta, fermionic and scalar Green's
functions on the torus, twisted sums, and their evaluation as expression atoms.

Conventions (period-1 elliptic variable z, a torus point z = alpha + beta tau):

* theta_nu(z|tau), eta(tau): q-series, see :mod:`ledger.mgf.theta_series`.
* S_nu(z|tau) = theta_1'(0) theta_nu(z) / (theta_nu(0) theta_1(z)), nu = 2, 3, 4:
  the fermionic Green's function of even spin structure nu (S_nu(z) ~ 1/z).
* G(alpha, beta|tau) = sum'_(m,n) (tau2/pi) exp(2 pi i (m alpha - n beta)) / |m tau + n|^2
  (momentum m tau + n), the scalar Green's function at z = alpha + beta tau,
  computed either from Kronecker's second limit formula
  -log|theta_1(z)/eta|^2 + 2 pi (Im z)^2/tau2 or from the Poisson-resummed
  lattice sum (:mod:`ledger.mgf.twisted_sums`).

Expression atoms (ledger/expr/atoms.py) and what they evaluate to at tau:
Theta(nu, a, b) = theta_nu(a + b tau), Eta() = eta, Spin(nu, a, b) = S_nu(a + b tau),
Green(a, b) = G(a, b), Etw(s, a, b) = twisted Eisenstein sum,
EllGenus(N, a, b) = K3 elliptic genus from T^4/Z_N at z = a + b tau.

>>> from fractions import Fraction
>>> k = scalar_green(Fraction(1, 3), Fraction(1, 2), 0.2 + 1.1j, digits=25)
>>> l = scalar_green(Fraction(1, 3), Fraction(1, 2), 0.2 + 1.1j, digits=25, method="lattice")
>>> abs(k.value - l.value) < 1e-24
True
"""

from __future__ import annotations

from fractions import Fraction

import mpmath

from ledger.errors import DivergentGraphError, ExpressionError, LedgerError
from ledger.mgf.approx import Approx, as_complex, as_tau, refine
from ledger.mgf.elliptic_genus import k3_elliptic_genus
from ledger.mgf.theta_series import (
    dedekind_eta,
    eta_approx,
    jacobi_theta,
    theta1_prime,
    theta_approx,
)
from ledger.mgf.twisted_sums import (
    as_rational,
    as_weight,
    reduced_characteristic,
    twisted_eisenstein,
    twisted_eisenstein_laurent,
)
from ledger.mgf.values import Value

__all__ = [
    "jacobi_theta", "dedekind_eta", "theta1_prime", "spin_green", "scalar_green",
    "twisted_eisenstein", "k3_elliptic_genus", "theta_atom_value", "theta_atom_laurent",
    "spin_green_approx", "EVEN_SPIN_STRUCTURES", "check_spin_structure",
]

EVEN_SPIN_STRUCTURES = (2, 3, 4)
GREEN_METHODS = ("kronecker", "lattice")


def spin_green(nu: int, z, tau, digits: int = 30) -> Value:
    """S_nu(z|tau) for an even spin structure nu in (2, 3, 4).

    >>> s = spin_green(3, 1e-8, 1j, digits=20)   # S_nu(z) = 1/z + O(z)
    >>> abs(s.value * 1e-8 - 1) < 1e-12
    True
    """
    check_spin_structure(nu)

    def compute(ctx):
        return spin_green_approx(ctx, nu, as_complex(z, ctx, "z"), as_tau(tau, ctx))

    return refine(compute, digits).to_value(digits)


def spin_green_approx(ctx, nu: int, z, tau) -> Approx:
    """S_nu(z|tau) in the context ``ctx``; LedgerError at the poles (lattice points)."""
    odd = theta_approx(ctx, 1, z, tau)
    if abs(odd.value) <= 2 * odd.error:
        raise LedgerError(f"S_{nu}(z) has a pole at z = {mpmath.nstr(z, 8)}: "
                          "z is a lattice point m + n tau")
    prime = theta_approx(ctx, 1, ctx.mpc(0), tau, derivative=1)
    return prime * theta_approx(ctx, nu, z, tau) / (theta_approx(ctx, nu, ctx.mpc(0), tau) * odd)


def scalar_green(alpha, beta, tau, digits: int = 30, method: str = "kronecker") -> Value:
    """G(alpha, beta|tau) at the torus point z = alpha + beta tau (alpha, beta rational).

    method "kronecker": -log|theta_1(z)/eta|^2 + 2 pi (Im z)^2/tau2;
    method "lattice": the Poisson-resummed lattice sum Etw(1, alpha, beta).

    >>> g = scalar_green(Fraction(1, 2), Fraction(1, 2), 1j, digits=20)
    >>> abs(g.value + mpmath.log(2)) < 1e-14   # G((1+i)/2 | i) = -log 2
    True
    """
    if method not in GREEN_METHODS:
        raise LedgerError(f"unknown Green's function method {method!r}; "
                          f"use one of {', '.join(GREEN_METHODS)}")
    alpha, beta = reduced_characteristic(alpha, beta)
    if alpha == 0 and beta == 0:
        raise DivergentGraphError("the scalar Green's function diverges at z = 0 (a lattice point)")
    if method == "lattice":
        return twisted_eisenstein(1, alpha, beta, tau, digits)

    def compute(ctx):
        tau_mp = as_tau(tau, ctx)
        a = ctx.mpf(alpha.numerator) / alpha.denominator
        b = ctx.mpf(beta.numerator) / beta.denominator
        z = a + b * tau_mp
        ratio = theta_approx(ctx, 1, z, tau_mp) / eta_approx(ctx, tau_mp)
        quadratic = 2 * ctx.pi * b * b * tau_mp.imag
        return -2 * ratio.log_abs() + Approx(ctx, quadratic, 4 * ctx.eps * quadratic)

    return refine(compute, digits).to_value(digits)


def theta_atom_value(atom, tau, digits: int = 30) -> Value:
    """Value at tau of a theta-family atom: Theta, Eta, Spin, Green, Etw, EllGenus.

    ``atom`` is a sympy expression whose ``func.__name__`` names the family and
    whose ``args`` are sympy Integers/Rationals.
    """
    name, args = atom.func.__name__, tuple(atom.args)
    if name == "Eta":
        _check_arity(name, args, 0)
        return dedekind_eta(tau, digits)
    if name == "Green":
        _check_arity(name, args, 2)
        return scalar_green(args[0], args[1], tau, digits)
    if name == "Etw":
        _check_arity(name, args, 3)
        return twisted_eisenstein(as_weight(args[0]), args[1], args[2], tau, digits)
    if name in ("Theta", "Spin", "EllGenus"):
        _check_arity(name, args, 3)
        index = _integer_argument(name, args[0])
        point = _torus_point(args[1], args[2], tau, digits)
        if name == "Theta":
            return jacobi_theta(index, point, tau, digits)
        if name == "Spin":
            return spin_green(index, point, tau, digits)
        return k3_elliptic_genus(index, point, tau, digits)
    raise ExpressionError(f"{name} is not a theta-family function")


def theta_atom_laurent(atom) -> dict:
    """Exact Laurent polynomial in y = pi tau2 of Green/Etw atoms ({power: coefficient}).

    >>> import sympy
    >>> class Green(sympy.Function): pass
    >>> theta_atom_laurent(Green(sympy.Rational(1, 2), 0))
    {1: 1/3, 0: -2*log(2)}
    """
    name, args = atom.func.__name__, tuple(atom.args)
    if name == "Green":
        _check_arity(name, args, 2)
        return twisted_eisenstein_laurent(1, args[0], args[1])
    if name == "Etw":
        _check_arity(name, args, 3)
        return twisted_eisenstein_laurent(args[0], args[1], args[2])
    raise LedgerError(f"{name} has no Laurent polynomial in y = pi tau2 "
                      "(it is holomorphic in tau, not a function of tau2 alone)")


def _torus_point(alpha, beta, tau, digits: int):
    """alpha + beta tau as an mpc accurate well beyond ``digits``."""
    alpha, beta = as_rational(alpha), as_rational(beta)
    ctx = mpmath.MPContext()
    ctx.dps = 2 * digits + 40
    tau_mp = as_tau(tau, ctx)
    point = ctx.mpf(alpha.numerator) / alpha.denominator + ctx.mpf(beta.numerator) / beta.denominator * tau_mp
    return mpmath.mp.make_mpc(point._mpc_)


def _integer_argument(name: str, x) -> int:
    if getattr(x, "is_Integer", False) or (isinstance(x, int) and not isinstance(x, bool)):
        return int(x)
    raise ExpressionError(f"the first argument of {name} must be an integer, got {x}")


def _check_arity(name: str, args: tuple, count: int) -> None:
    if len(args) != count:
        raise ExpressionError(f"{name} takes {count} argument{'s' if count != 1 else ''}, got {len(args)}")


def check_spin_structure(nu) -> None:
    """LedgerError unless nu is an even spin structure 2, 3 or 4."""
    if isinstance(nu, bool) or nu not in EVEN_SPIN_STRUCTURES:
        raise LedgerError(f"even spin structures are nu = 2, 3, 4, got {nu!r}")

