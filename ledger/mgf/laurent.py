"""Laurent polynomials in y = pi tau2: the tau1-constant, power-law part.

A modular graph function f of weight w has the constant term
sum_{k=1-w}^{w} c_k y^k + O(e^{-2y}); :class:`LaurentPolynomial` keeps the
c_k, each either exact (a sympy number: rationals, zeta values,
zeta_sv(3,5,3)) or a decimal with an error bound (a
:class:`~ledger.mgf.values.Value`).  :func:`laurent_polynomial` computes it
for any expression: exactly for E_s, constants, sums, products and
laplace(...); for dihedral graphs from the exact constant term
(:mod:`ledger.mgf.dihedral_laurent`) matched against the single-valued
zeta basis (:mod:`ledger.mgf.zeta_basis`); for other graphs from a fit to
values at large tau2 (:mod:`ledger.mgf.laurent_fit`).

>>> from ledger.expr import parse
>>> lp = laurent_polynomial(parse("C(2,1,1)"))
>>> lp.exact
True
>>> print(lp.to_text())
2*y^4/14175 + zeta(3)*y/45 + 5*zeta(5)/(12*y) - zeta(3)^2/(4*y^2) + 9*zeta(7)/(16*y^3)
>>> print(laurent_polynomial(parse("laplace(C(2,1,1)) - 2*C(2,1,1) - 9*E(4) + E(2)^2")).to_text())
0
"""

from __future__ import annotations

from dataclasses import dataclass
from fractions import Fraction
from math import factorial
from typing import Optional

import mpmath
import sympy

from ledger.errors import NotAvailableError
from ledger.mgf.approx import export
from ledger.mgf.jobs import Job
from ledger.mgf.values import Value

Y = sympy.Symbol("y", positive=True)
GUARD = 15


@dataclass(frozen=True)
class LaurentPolynomial:
    """sum_k c_k y^k with c_k exact (sympy) or a :class:`Value`.

    ``terms`` is a tuple of (power, coefficient), highest power first, with
    no exact zeros; ``digits`` is the precision asked of inexact coefficients.
    """

    terms: tuple = ()
    digits: int = 30

    @classmethod
    def from_dict(cls, coefficients: dict, digits: int = 30) -> "LaurentPolynomial":
        cleaned = []
        for power in sorted(coefficients, reverse=True):
            c = coefficients[power]
            if isinstance(c, Value):
                cleaned.append((int(power), c))
                continue
            c = sympy.nsimplify(c) if isinstance(c, (int, Fraction)) else sympy.expand(c)
            if c != 0:
                cleaned.append((int(power), c))
        return cls(tuple(cleaned), digits)

    @classmethod
    def constant(cls, c, digits: int = 30) -> "LaurentPolynomial":
        return cls.from_dict({0: c}, digits)

    @property
    def exact(self) -> bool:
        return not any(isinstance(c, Value) for _, c in self.terms)

    def as_dict(self) -> dict:
        return dict(self.terms)

    def coefficient(self, power: int):
        """c_power (exact sympy zero when absent)."""
        return self.as_dict().get(power, sympy.Integer(0))

    def powers(self) -> list:
        return [p for p, _ in self.terms]

    # arithmetic -----------------------------------------------------------
    def __add__(self, other) -> "LaurentPolynomial":
        other = _lift(other, self.digits)
        digits = min(self.digits, other.digits)
        result = self.as_dict()
        for power, c in other.terms:
            result[power] = _add(result[power], c, digits) if power in result else c
        return LaurentPolynomial.from_dict(result, digits)

    __radd__ = __add__

    def __neg__(self) -> "LaurentPolynomial":
        return self.scaled(-1)

    def __sub__(self, other) -> "LaurentPolynomial":
        return self + (-_lift(other, self.digits))

    def __rsub__(self, other) -> "LaurentPolynomial":
        return _lift(other, self.digits) - self

    def __mul__(self, other) -> "LaurentPolynomial":
        other = _lift(other, self.digits)
        digits = min(self.digits, other.digits)
        result: dict = {}
        for p, a in self.terms:
            for q, b in other.terms:
                term = _mul(a, b, digits)
                result[p + q] = _add(result[p + q], term, digits) if p + q in result else term
        return LaurentPolynomial.from_dict(result, digits)

    __rmul__ = __mul__

    def __pow__(self, n: int) -> "LaurentPolynomial":
        if not isinstance(n, int) or n < 0:
            raise NotAvailableError(f"Laurent polynomials are raised to non-negative integer powers only, not {n}")
        result = LaurentPolynomial.constant(1, self.digits)
        for _ in range(n):
            result = result * self
        return result

    def scaled(self, factor) -> "LaurentPolynomial":
        """Multiply every coefficient by an exact constant."""
        factor = sympy.sympify(factor)
        return LaurentPolynomial.from_dict(
            {p: _mul(c, factor, self.digits) for p, c in self.terms}, self.digits)

    def laplacian(self) -> "LaurentPolynomial":
        """Delta = y^2 d^2/dy^2 on the Laurent polynomial: c_k -> k(k-1) c_k.

        >>> print(LaurentPolynomial.from_dict({2: sympy.Rational(1, 45), -1: sympy.zeta(3)}).laplacian().to_text())
        2*y^2/45 + 2*zeta(3)/y
        """
        return LaurentPolynomial.from_dict(
            {p: _mul(c, p * (p - 1), self.digits) for p, c in self.terms}, self.digits)

    # output ---------------------------------------------------------------
    def to_sympy(self, variable=Y):
        """The polynomial as a sympy expression (inexact coefficients as Floats)."""
        return sympy.Add(*(_as_sympy(c) * variable ** p for p, c in self.terms))

    def to_text(self) -> str:
        """Plain text, highest power first: ``2*y^4/14175 + zeta(3)*y/45 + ...``."""
        if not self.terms:
            return "0"
        pieces = [_term_text(_as_sympy(c), p) for p, c in self.terms]
        out = pieces[0]
        for piece in pieces[1:]:
            out += " - " + piece[1:] if piece.startswith("-") else " + " + piece
        return out

    def coefficient_value(self, power: int, ctx) -> tuple:
        """(value, error) of c_power as numbers of ``ctx``."""
        return _numeric(self.coefficient(power), ctx)

    def evaluate(self, y, ctx) -> tuple:
        """(value, error) of the polynomial at y (a ctx number)."""
        total, error = ctx.mpf(0), ctx.mpf(0)
        for p, c in self.terms:
            value, err = _numeric(c, ctx)
            total += value * y ** p
            error += err * abs(y) ** p
        return total, error


def _term_text(c, power: int) -> str:
    """``N*y^p/D`` or ``N/(D*y^k)`` for the coefficient N/D, sign in front."""
    numerator, denominator = sympy.fraction(sympy.factor_terms(c))
    sign = ""
    if numerator.could_extract_minus_sign():
        sign, numerator = "-", -numerator
    top = _text(numerator)
    if isinstance(numerator, sympy.Add):
        top = f"({top})"
    y_power = "y" if abs(power) == 1 else f"y^{abs(power)}"
    if power > 0:
        top = y_power if top == "1" else f"{top}*{y_power}"
    bottom = _text(denominator) if denominator != 1 else ""
    if isinstance(denominator, sympy.Add) or (bottom and "*" in bottom):
        bottom = f"({bottom})"
    if power < 0:
        bottom = y_power if not bottom else f"({bottom}*{y_power})" if not bottom.startswith("(") \
            else f"({bottom[1:-1]}*{y_power})"
    return sign + (f"{top}/{bottom}" if bottom else top)


def _text(e) -> str:
    return sympy.sstr(e).replace("**", "^")


def _as_sympy(c):
    if isinstance(c, Value):
        digits = max(1, int(c.correct_digits()) if c.error else c.digits)
        return sympy.Float(mpmath.nstr(c.value, min(digits, c.digits) + 2), min(digits, c.digits) + 2)
    return c


def _lift(other, digits) -> LaurentPolynomial:
    if isinstance(other, LaurentPolynomial):
        return other
    return LaurentPolynomial.constant(sympy.sympify(other), digits)


def _numeric(c, ctx) -> tuple:
    """(value, error) of a coefficient as ctx numbers."""
    if isinstance(c, Value):
        return ctx.convert(c.value), ctx.convert(c.error)
    c = sympy.sympify(c)
    if c.is_Rational:
        return ctx.mpf(int(c.p)) / int(c.q), ctx.zero
    value = ctx.convert(str(c.evalf(int(ctx.dps) + 10)))
    return value, ctx.mpf(10) ** (-int(ctx.dps) - 5) * max(1, abs(value))


def _context(digits: int):
    ctx = mpmath.MPContext()
    ctx.dps = digits + GUARD
    return ctx


def _add(a, b, digits):
    if not isinstance(a, Value) and not isinstance(b, Value):
        return sympy.expand(a + b)
    ctx = _context(digits)
    (x, e), (u, f) = _numeric(a, ctx), _numeric(b, ctx)
    return Value(export(x + u), export(e + f + ctx.eps * abs(x + u)), digits)


def _mul(a, b, digits):
    if not isinstance(a, Value) and not isinstance(b, Value):
        return sympy.expand(a * b)
    ctx = _context(digits)
    (x, e), (u, f) = _numeric(a, ctx), _numeric(sympy.sympify(b) if not isinstance(b, Value) else b, ctx)
    return Value(export(x * u), export(abs(x) * f + abs(u) * e + e * f + ctx.eps * abs(x * u)), digits)


# Laurent polynomials of the atoms -------------------------------------------

def eisenstein_laurent(s: int) -> LaurentPolynomial:
    """E_s: 2 zeta(2s)/pi^(2s) y^s + 2 Gamma(s-1/2) zeta(2s-1)/(sqrt(pi) Gamma(s)) y^(1-s).

    >>> print(eisenstein_laurent(2).to_text())
    y^2/45 + zeta(3)/y
    """
    leading = 2 * sympy.zeta(2 * s) / sympy.pi ** (2 * s)
    sub = sympy.Rational(2 * factorial(2 * s - 2), 4 ** (s - 1) * factorial(s - 1) ** 2)
    return LaurentPolynomial.from_dict({s: sympy.nsimplify(leading), 1 - s: sub * sympy.zeta(2 * s - 1)})


def laurent_polynomial(expr, digits: int = 30, job: Optional[Job] = None) -> LaurentPolynomial:
    """The Laurent polynomial of an expression (see the module docstring).

    ``digits`` is the precision of any coefficient that cannot be made exact.
    """
    from ledger.expr.atoms import THETA_ATOMS, C, E, GraphFunction, Laplace, modular_atoms

    expr = sympy.sympify(expr)
    if not modular_atoms(expr):
        return LaurentPolynomial.constant(expr, digits)
    if isinstance(expr, sympy.Add):
        parts = expr.args
        total = LaurentPolynomial((), digits)
        for i, part in enumerate(parts):
            total = total + laurent_polynomial(part, digits, _part(job, i, len(parts)))
        return total
    if isinstance(expr, sympy.Mul):
        constant, rest = expr.as_independent(*modular_atoms(expr))
        factors = sympy.Mul.make_args(rest)
        result = LaurentPolynomial.constant(constant, digits)
        for i, factor in enumerate(factors):
            result = result * laurent_polynomial(factor, digits, _part(job, i, len(factors)))
        return result
    if isinstance(expr, sympy.Pow) and expr.exp.is_Integer and int(expr.exp) >= 0:
        return laurent_polynomial(expr.base, digits, job) ** int(expr.exp)
    if isinstance(expr, E):
        return _with_digits(eisenstein_laurent(int(expr.args[0])), digits)
    if isinstance(expr, C):
        from ledger.mgf.dihedral_laurent import dihedral_laurent

        return dihedral_laurent(tuple(int(a) for a in expr.args), digits, job)
    if isinstance(expr, GraphFunction):
        from ledger.mgf.laurent_fit import graph_laurent

        return graph_laurent(expr.graph, digits, job)
    if isinstance(expr, Laplace):
        return laurent_polynomial(expr.args[0], digits, job).laplacian()
    if isinstance(expr, THETA_ATOMS):  # Green and Etw have one; the others say why not
        from ledger.mgf.theta import theta_atom_laurent

        return LaurentPolynomial.from_dict(theta_atom_laurent(expr), digits)
    raise NotAvailableError(f"no Laurent polynomial is available for {expr}: "
                            "it is defined for modular graph functions, their products and laplace(...)")


def _with_digits(lp: LaurentPolynomial, digits: int) -> LaurentPolynomial:
    return LaurentPolynomial(lp.terms, digits)


def _part(job, i, n):
    return None if job is None else job.part(i / n, (i + 1) / n)
