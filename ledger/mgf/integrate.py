"""Renormalised integrals over the fundamental domain F, measure d^2tau/tau2^2.

Cut F at tau2 = L.  Above tau2 = 1 only the constant term survives the tau1
integral; its Laurent part sum_k c_k y^k (y = pi tau2) integrates to

    int_1^L sum_k c_k (pi t)^k dt/t^2
        = sum_{k != 1} pi^k c_k (L^(k-1) - 1)/(k-1) + pi c_1 log L,

so the divergent terms are pi^k c_k/(k-1) L^(k-1) (k >= 2), the log L
coefficient is pi c_1, and the renormalised integral (the L^0 term) is

    I = int_{F, tau2<=1} f + int_1^inf (a_0(t) - Laurent(t)) dt/t^2 - sum_{k != 1} pi^k c_k/(k-1).

Route (a), :func:`quadrature_integral`: Gauss-Legendre over the bounded part
(tau1 = sin(phi), phi in [0, pi/6], by the symmetry f(-conj tau) = f(tau) of
real modular graph functions; tau2 from cos(phi) to 1), the constant term a_0
by the trapezoid rule in tau1 (exact up to the Fourier modes +-N,
~e^(-2 pi N tau2)), and Gauss-Laguerre in tau2 for the remainder
a_0 - Laurent = O(e^(-4 pi tau2)) (the constant term of a q, qbar expansion);
the error is the difference between two quadrature levels plus the
propagated errors of the values.

Route (b), :func:`laplace_route_integral`: for (Delta - lambda) f = s, Stokes
on F_L (the sides of F cancel in pairs under T and S) leaves the top edge,

    int_{F_L} Delta f = d/dL a_0(L) = sum_k k pi^k c_k L^(k-1) + O(e^(-2 pi L)),

so lambda int_{F_L} f = sum_k k pi^k c_k L^(k-1) - int_{F_L} s, and for the
renormalised integrals I(f) = (pi c_1(f) - I(s)) / lambda (lambda != 0), the
log L coefficients obeying lambda l(f) = -l(s).  With lambda = s(s-1) and s = 0
this gives I(E_s) = 0 (c_1 = 0); constants give c pi/3; products of two
Eisenstein series come from :mod:`ledger.mgf.rankin_selberg`.

>>> from ledger.expr import parse
>>> result = integrate_over_fundamental_domain(parse("C(1,1,1)"))
>>> result.exact, result.route
(pi*zeta(3)/3, 'laplace')
>>> print(integrate_over_fundamental_domain(parse("E(3)")).divergent_terms)
((2, pi**3/945),)
"""

from __future__ import annotations

from dataclasses import dataclass
from math import ceil, log
from typing import Callable, Optional

import mpmath
import sympy

from ledger.errors import LedgerError, NotAvailableError
from ledger.mgf.approx import export
from ledger.mgf.jobs import Job, ensure_job
from ledger.mgf.laurent import LaurentPolynomial, laurent_polynomial
from ledger.mgf.values import Value

ROUTES = ("auto", "quadrature", "laplace", "both")


@dataclass(frozen=True)
class ModularIntegral:
    """The renormalised integral and the terms dropped to define it.

    ``value`` is the L^0 term, ``exact`` its closed form when known (else
    None), ``log_coefficient`` the coefficient of log L, ``divergent_terms``
    ((n, coefficient of L^n), ...) for n >= 1; coefficients are sympy numbers
    when exact, else :class:`Value`.  ``route`` names the route that produced
    ``value``; ``checks`` holds ((route, Value), ...) from the other route when
    both were run.
    """

    value: Value
    exact: object
    log_coefficient: object
    divergent_terms: tuple
    route: str
    checks: tuple = ()


def integrate_over_fundamental_domain(expr, digits: int = 15, route: str = "auto",
                                      job: Optional[Job] = None,
                                      values: Optional[Callable] = None) -> ModularIntegral:
    """Renormalised int_F expr d^2tau/tau2^2 (module docstring).

    ``route``: "laplace" (exact, where known), "quadrature" (numerical),
    "both" (quadrature, checked against the exact value when known) or
    "auto" (exact when known, else quadrature).  ``values(tau, digits) ->
    Value`` overrides the evaluator used by the quadrature.
    """
    if route not in ROUTES:
        raise LedgerError(f"route must be one of {', '.join(ROUTES)}, got {route!r}")
    job = ensure_job(job)
    expr = sympy.sympify(expr)
    laurent = laurent_polynomial(expr, digits + 5, job.part(0.0, 0.05))
    log_coefficient, divergent = _dropped_terms(laurent, digits)
    exact = laplace_route_integral(expr) if route != "quadrature" else None
    if route == "laplace" and exact is None:
        raise NotAvailableError(f"no Laplace equation or closed form is known for every term of {expr}; "
                                "use the quadrature route")
    checks = ()
    if exact is not None:
        value = _exact_value(exact, digits)
        chosen = "laplace"
    if exact is None or route == "both":
        numeric = quadrature_integral(expr, laurent, digits, job.part(0.05, 1.0), values)
        if exact is None:
            value, chosen = numeric, "quadrature"
        else:
            checks = (("quadrature", numeric),)
    return ModularIntegral(value, exact, log_coefficient, divergent, chosen, checks)


def _exact_value(exact, digits: int) -> Value:
    ctx = mpmath.MPContext()
    ctx.dps = digits + 15
    number = ctx.convert(str(sympy.N(exact, digits + 15)))
    return Value(export(number), export(ctx.mpf(10) ** (-digits - 10) * max(1, abs(number))), digits)


def _dropped_terms(laurent: LaurentPolynomial, digits: int) -> tuple:
    """(log L coefficient, ((n, coefficient of L^n), ...)) from the Laurent polynomial."""
    log_coefficient = laurent.scaled(sympy.pi).coefficient(1)
    divergent = []
    for k, c in laurent.terms:
        if k >= 2:
            divergent.append((k - 1, LaurentPolynomial.from_dict({0: c}, digits)
                              .scaled(sympy.pi ** k / (k - 1)).coefficient(0)))
    return log_coefficient, tuple(divergent)


def tail_finite_part(laurent: LaurentPolynomial, ctx) -> tuple:
    """(value, error) of -sum_{k != 1} pi^k c_k/(k-1): the L^0 part of int_1^L Laurent dt/t^2."""
    total, error = ctx.zero, ctx.zero
    for k, _ in laurent.terms:
        if k == 1:
            continue
        c, e = laurent.coefficient_value(k, ctx)
        factor = ctx.pi ** k / (k - 1)
        total -= factor * c
        error += abs(factor) * e
    return total, error


# route (b) ---------------------------------------------------------------------

def laplace_route_integral(expr):
    """Closed form of the renormalised integral, or None when some term has none.

    >>> from ledger.expr import parse
    >>> laplace_route_integral(parse("C(2,2,1) - 3"))
    pi*(-1 + zeta(5)/90)
    """
    from ledger.expr.atoms import E, Laplace, modular_atoms
    from ledger.mgf.laplace import known_laplace_equation
    from ledger.mgf.rankin_selberg import eisenstein_product_integral

    expr = sympy.expand(sympy.sympify(expr))
    total = sympy.Integer(0)
    for term in sympy.Add.make_args(expr):
        constant, monomial = term.as_independent(*modular_atoms(term)) if modular_atoms(term) \
            else (term, sympy.Integer(1))
        factors = _factor_list(monomial)
        if not factors:
            piece = sympy.pi / 3
        elif len(factors) == 1 and isinstance(factors[0], Laplace):
            # int_{F_L} Delta g = d/dL a_0(L): its L^0 term is pi c_1(g)
            c1 = laurent_polynomial(factors[0].args[0]).coefficient(1)
            if isinstance(c1, Value):
                return None
            piece = sympy.pi * c1
        elif len(factors) == 2 and all(isinstance(f, E) for f in factors):
            piece = eisenstein_product_integral(int(factors[0].args[0]), int(factors[1].args[0]))
        elif len(factors) == 1 and (equation := known_laplace_equation(factors[0])) is not None:
            eigenvalue, source = equation
            c1 = laurent_polynomial(factors[0]).coefficient(1)
            source_integral = laplace_route_integral(source) if source != 0 else sympy.Integer(0)
            if source_integral is None or isinstance(c1, Value):
                return None
            piece = (sympy.pi * c1 - source_integral) / eigenvalue
        else:
            return None
        total += constant * piece
    return sympy.factor_terms(sympy.expand(total))


def _factor_list(monomial) -> list:
    factors = []
    for factor in sympy.Mul.make_args(monomial):
        if factor == 1:
            continue
        if isinstance(factor, sympy.Pow) and factor.exp.is_Integer and factor.exp > 0:
            factors.extend([factor.base] * int(factor.exp))
        else:
            factors.append(factor)
    return factors


# route (a) ---------------------------------------------------------------------

@dataclass(frozen=True)
class _Level:
    outer: int      # Gauss-Legendre nodes in phi over [0, pi/6], tau1 = sin(phi)
    inner: int      # Gauss-Legendre nodes in tau2 over [cos(phi), 1]
    laguerre: int   # Gauss-Laguerre nodes for the remainder above tau2 = 1
    digits: int     # the trapezoid rule for a_0 is sized for these digits

    @classmethod
    def for_digits(cls, digits: int) -> "_Level":
        """Sizes reaching about ``digits`` digits for modular graph functions.

        Measured on E(2)^2 (tests/mgf/test_integrate.py): with tau1 = sin(phi)
        the lower boundary cos(phi) is entire and the phi rule gains ~1.8
        digits per node; the Laguerre rule gains ~1 digit per node of the
        remainder, itself ~e^(-4 pi) of the integrand.
        """
        outer = ceil(digits / 1.7)
        inner = ceil(0.55 * outer)
        laguerre = max(6, digits - 6 + max(0, digits - 15) // 2)
        return cls(outer, inner, laguerre, digits)

    def refined(self) -> "_Level":
        """A level larger in every rule, so that the difference estimates our error."""
        return _Level(self.outer + 2, self.inner + 1, self.laguerre + 2, self.digits + 2)

    def trapezoid_points(self, tau2) -> int:
        """N with e^(-2 pi N tau2) < 10^-(digits+3): the rule misses only modes +-N, 2N, ..."""
        return ceil((self.digits + 3) * log(10) / (2 * float(mpmath.pi) * float(tau2))) + 1


def quadrature_integral(expr, laurent: LaurentPolynomial, digits: int = 15,
                        job: Optional[Job] = None, values: Optional[Callable] = None) -> Value:
    """Route (a): the renormalised integral by quadrature plus the exact tail."""
    job = ensure_job(job)
    if values is None:
        values = _evaluator(expr)
    ctx = mpmath.MPContext()
    ctx.dps = digits + 15
    coarse_level = _Level.for_digits(digits)
    levels = (coarse_level, coarse_level.refined())
    estimates = []
    for index, level in enumerate(levels):
        # the coarse level only estimates the error: its values need fewer guard digits
        estimates.append(_integrate_level(level, laurent, values, digits + 1 + 2 * index, ctx,
                                           job.part(index / 2, (index + 1) / 2)))
    (coarse, _), (fine, propagated) = estimates
    tail, tail_error = tail_finite_part(laurent, ctx)
    value = fine + tail
    error = abs(fine - coarse) + propagated + tail_error + 10 * ctx.eps * abs(value)
    return Value(export(value), export(error), digits)


def _evaluator(expr) -> Callable:
    from ledger.mgf.evaluate import evaluate

    return lambda tau, digits: evaluate(expr, tau, digits)


def _integrate_level(level: _Level, laurent, values, value_digits, ctx, job) -> tuple:
    """(int over tau2 <= 1 + remainder above, propagated value error)."""
    laguerre_nodes, laguerre_weights = gauss_laguerre(level.laguerre, ctx)
    rate = 4 * ctx.pi
    strip_points = sum(level.trapezoid_points(1 + x / rate) // 2 + 1 for x in laguerre_nodes)
    total_points = level.outer * level.inner + strip_points
    done = [0]

    def f(tau1, tau2):
        job.report(done[0] / total_points, f"integral: value {done[0] + 1} of {total_points}")
        done[0] += 1
        v = values(ctx.mpc(tau1, tau2), value_digits)
        return ctx.re(ctx.convert(v.value)), ctx.convert(v.error)

    top = ctx.pi / 6
    x_nodes, x_weights = _legendre_01(level.outer, ctx)
    y_nodes, y_weights = _legendre_01(level.inner, ctx)
    bounded, bounded_error = ctx.zero, ctx.zero
    for x, wx in zip(x_nodes, x_weights):
        phi = top * x
        tau1, bottom = ctx.sin(phi), ctx.cos(phi)
        span = 1 - bottom
        for y, wy in zip(y_nodes, y_weights):
            tau2 = bottom + span * y
            value, err = f(tau1, tau2)
            # factor 2: tau1 -> -tau1; d tau1 = cos(phi) d phi
            weight = 2 * top * wx * bottom * span * wy / tau2 ** 2
            bounded += weight * value
            bounded_error += abs(weight) * err
    remainder, remainder_error = ctx.zero, ctx.zero
    for x, w in zip(laguerre_nodes, laguerre_weights):
        # int_1^inf (a_0(t) - Laurent(t)) dt/t^2, t = 1 + x/(4 pi)
        tau2 = 1 + x / rate
        n = level.trapezoid_points(tau2)
        constant_term, constant_error = ctx.zero, ctx.zero
        for j in range(n // 2 + 1):
            multiplicity = 1 if (j == 0 or 2 * j == n) else 2
            value, err = f(ctx.mpf(j) / n, tau2)
            constant_term += multiplicity * value / n
            constant_error += multiplicity * err / n
        polynomial, polynomial_error = laurent.evaluate(ctx.pi * tau2, ctx)
        weight = w * ctx.exp(x) / (rate * tau2 ** 2)
        remainder += weight * (constant_term - polynomial)
        remainder_error += abs(weight) * (constant_error + polynomial_error)
    return bounded + remainder, bounded_error + remainder_error


def _legendre_01(n: int, ctx) -> tuple:
    """Gauss-Legendre nodes and weights on [0, 1] (Golub-Welsch).

    >>> ctx = mpmath.MPContext(); ctx.dps = 30
    >>> x, w = _legendre_01(5, ctx)
    >>> abs(sum(wi * xi ** 9 for xi, wi in zip(x, w)) - ctx.mpf(1) / 10) < 1e-28
    True
    """
    off = [ctx.mpf(k) / ctx.sqrt(4 * k * k - 1) for k in range(1, n)]
    nodes, weights = _golub_welsch([ctx.zero] * n, off, ctx.mpf(2), ctx)
    return [(x + 1) / 2 for x in nodes], [w / 2 for w in weights]


def gauss_laguerre(n: int, ctx) -> tuple:
    """Nodes and weights for int_0^inf e^-x g(x) dx (Golub-Welsch).

    >>> ctx = mpmath.MPContext(); ctx.dps = 30
    >>> x, w = gauss_laguerre(6, ctx)
    >>> abs(sum(wi * xi ** 11 for xi, wi in zip(x, w)) - ctx.factorial(11)) < 1e-20
    True
    """
    return _golub_welsch([ctx.mpf(2 * k + 1) for k in range(n)],
                         [ctx.mpf(k) for k in range(1, n)], ctx.mpf(1), ctx)


def _golub_welsch(diagonal, off_diagonal, mass, ctx) -> tuple:
    n = len(diagonal)
    matrix = ctx.zeros(n, n)
    for i in range(n):
        matrix[i, i] = diagonal[i]
    for i, b in enumerate(off_diagonal):
        matrix[i, i + 1] = matrix[i + 1, i] = b
    eigenvalues, vectors = ctx.eigsy(matrix)
    pairs = sorted((eigenvalues[i], mass * vectors[0, i] ** 2) for i in range(n))
    return [p[0] for p in pairs], [p[1] for p in pairs]
