"""Renormalised integrals of products of two Eisenstein series, in closed form.

Derivation (ours, by the method of D. Zagier, "The Rankin-Selberg method
for automorphic functions which are not of rapid decay", 1981).  Let
E(z,s) = sum over Gamma_inf\\Gamma of Im(gamma z)^s, xi(s) = pi^(-s/2)
Gamma(s/2) zeta(s) and phi_s = xi(2s-1)/xi(2s).  For F invariant with
constant term phi(y) + psi(y), phi = sum_a c_a y^a (y = tau2 here), psi
rapidly decaying, unfolding E(z,s) against F cut at Im z = T gives

  int_{F_T} F E(.,s) = R(F,s) + sum_a c_a [T^(a+s-1)/(a+s-1) - phi_s T^(a-s)/(s-a)] + o(1),

R(F,s) = int_0^inf psi(y) y^(s-2) dy.  The residue at s = 1 (E and phi_s
both have residue 3/pi; phi_s = 3/(pi(s-1)) + kappa + ..., kappa =
(6/pi)(gamma - log 2 - zeta'(2)/zeta(2))) yields, after dropping the positive
powers of T and the log T term (coefficient c_1),

  RN int_F F = (pi/3) Res_{s=1} R(F,s) + (pi/3) c_0 - (pi/3) kappa c_1.

For F = E(z,s1) E(z,s2) the Rankin-Selberg unfolding gives
R(F,s) = xi(s+s1-s2) xi(s-s1+s2) xi(s+s1+s2-1) xi(s-s1-s2+1) / (xi(2s1) xi(2s2) xi(2s)).
For s1 != s2 the residue term cancels the c_0 term and the integral is 0;
for s1 = s2 = s the double pole of xi(s)^2 gives, after the gamma and
zeta'(2) terms cancel,

  RN int_F E_s^2 = ell * (xi'/xi(2s) - xi'/xi(2s-1)),

with our E_s (= 2 zeta(2s)/pi^s E(z,s)) and ell = pi c_1 the coefficient of
log L, c_1 the coefficient of y^1 (y = pi tau2) in the Laurent polynomial of
E_s^2.  Written out, xi'/xi(2s) - xi'/xi(2s-1) = H_(s-1)/2 + log 2 -
sum_{k<s} 1/(2k-1) + zeta'(2s)/zeta(2s) - zeta'(2s-1)/zeta(2s-1).
Route (a) of :mod:`ledger.mgf.integrate` checks these numerically.

>>> print(eisenstein_square_integral(2))
2*pi*(-1/2 + zeta_prime(4)/zeta(4) - zeta_prime(3)/zeta(3) + log(2))*zeta(3)/45
"""

from __future__ import annotations

import mpmath
import sympy


class zeta_prime(sympy.Function):  # noqa: N801 - printed name
    """The derivative zeta'(n) of the Riemann zeta function at an integer n >= 2."""

    nargs = 1

    def _eval_evalf(self, prec):
        n = self.args[0]
        if not n.is_Integer:
            return None
        ctx = mpmath.MPContext()
        ctx.prec = prec + 20
        return sympy.Float(ctx.nstr(ctx.zeta(int(n), derivative=1), int(prec * 0.30103) + 5),
                           int(prec * 0.30103) + 5)


def eisenstein_square_integral(s: int):
    """RN int_F E_s^2 d^2tau/tau2^2 (cut at tau2 = L, positive powers and log L dropped)."""
    from ledger.mgf.laurent import eisenstein_laurent

    log_coefficient = sympy.pi * (eisenstein_laurent(s) ** 2).coefficient(1)
    bracket = (sympy.harmonic(s - 1) / 2 + sympy.log(2)
               - sum(sympy.Rational(1, 2 * k - 1) for k in range(1, s))
               + zeta_prime(2 * s) / sympy.zeta(2 * s, evaluate=False)  # keep zeta'/zeta visible
               - zeta_prime(2 * s - 1) / sympy.zeta(2 * s - 1))
    return sympy.factor_terms(sympy.expand(log_coefficient) * sympy.expand(bracket))


def eisenstein_product_integral(s1: int, s2: int):
    """RN int_F E_s1 E_s2: zero unless s1 = s2."""
    return eisenstein_square_integral(s1) if s1 == s2 else sympy.Integer(0)
