"""Renormalised integrals over the fundamental domain F, measure d^2tau/tau2^2.

Cut F at tau2 = L.  Above tau2 = 1 only the constant term survives the tau1
integral; its Laurent part sum_k c_k y^k (y = pi tau2) integrates to

    int_1^L sum_k c_k (pi t)^k dt/t^2
        = sum_{k != 1} pi^k c_k (L^(k-1) - 1)/(k-1) + pi c_1 log L,

so the divergent terms are pi^k c_k/(k-1) L^(k-1) (k >= 2), the log L
coefficient is pi c_1, and the renormalised integral (the L^0 term) is

    I = int_{F, tau2<=1} f + int_1^inf (a_0(t) - Laurent(t)) dt/t^2 - sum_{k != 1} pi^k c_k/(k-1).

Route (a), :func:`quadrature_integral`: a product Gauss rule over the bounded
part (tau1 = sin(phi), phi in [0, pi/6], by the symmetry f(-conj tau) = f(tau)
of real modular graph functions; tau2 from cos(phi) to 1; Gauss-Jacobi in phi
for the strip's height ~ phi^2, Gauss-Legendre in tau2), the constant term a_0
by the trapezoid rule in tau1 (exact up to the Fourier modes +-N,
~N^(w-1) e^(-2 pi N tau2)), and for the remainder a_0 - Laurent = e^(-4 pi t)
(Laurent polynomial in t) + O(e^(-8 pi t)) (the qbar^n q^n terms) the Gauss
rule of the weight e^(-4 pi (t-1)) t^(-K), exact on the main part; 3 or 4 of
its nodes suffice for C(2,1,1) to 15 digits.  Each part is computed by rules of
growing size until two agree within its share of the target; the error is
their difference plus the propagated errors of the values, which are asked
with no more digits than the part needs.  About 130 values of C(2,1,1) give
15 digits (~20 s).

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
from math import ceil, log, pi
from typing import Callable, Optional

import mpmath
import sympy

from ledger.errors import LedgerError, NotAvailableError
from ledger.mgf.approx import export
from ledger.mgf.integrate_rules import gauss_exponential, gauss_jacobi_01
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

# measured on E(2)^2, E(3)^2 (Fourier-series values) and C(2,1,1) for the bounded part:
# absolute digits ~ 1.6 per outer node + 3 and ~ 2.8 per inner node + 2.8; on products
# of two and three Eisenstein series for the remainder rule: relative digits ~ 11.5 with
# 5 nodes and 1.6 more per node (8 to 11 with 4 nodes, enough for C(2,1,1))
OUTER_RATE, OUTER_OFFSET, INNER_RATE, INNER_OFFSET = 1.6, 3.0, 2.8, 2.8
REMAINDER_NODES, REMAINDER_DIGITS, REMAINDER_RATE, REMAINDER_MAX_NODES = 5, 11.5, 1.6, 24
EXTRA_BOUNDED_LEVELS = 2   # refinements tried when a bounded pair misses its budget
VALUE_RETRIES = 2


def quadrature_integral(expr, laurent: LaurentPolynomial, digits: int = 15,
                        job: Optional[Job] = None, values: Optional[Callable] = None) -> Value:
    """Route (a): the renormalised integral by quadrature plus the exact tail.

    The target is 10^-digits times the size of the result (estimated from the
    Laurent polynomial); each part is computed with two rules of increasing
    size, the difference bounding the error of the larger one.

    >>> from ledger.mgf.laurent import LaurentPolynomial
    >>> one = lambda tau, digits: Value(mpmath.mpf(1), mpmath.mpf(0), digits)
    >>> volume = quadrature_integral(sympy.Integer(1), LaurentPolynomial.constant(1), 20, values=one)
    >>> ctx = mpmath.MPContext(); ctx.dps = 40
    >>> abs(ctx.convert(volume.value) - ctx.pi / 3) <= volume.error < 1e-20    # Vol(F) = pi/3
    True
    """
    job = ensure_job(job)
    if values is None:
        values = _evaluator(expr)
    ctx = mpmath.MPContext()
    ctx.dps = digits + 15
    polynomial = _numeric_laurent(laurent, ctx)
    tail, tail_error = tail_finite_part(laurent, ctx)
    outer, inner = _bounded_sizes(digits)   # refined below once the scale is known
    polynomial_part, _ = _bounded_rule(outer, inner, lambda t1, t2: polynomial(ctx.pi * t2), ctx)
    scale = max(abs(polynomial_part + tail), abs(polynomial_part), abs(tail)) or ctx.one
    target = ctx.mpf(10) ** (-digits) * scale
    # budgets (both rules together): 1/8 of the target for the values of the bounded
    # part (its weights sum to pi/3 - 1), 1/16 for those of the remainder (weights
    # summing to about 1) and 1/16 for its trapezoid aliasing, 3/4 for the bounded
    # rules (sized with a margin of 3), what is left for the remainder rules
    outer, inner = _bounded_sizes(float(-ctx.log10(target / 4)))
    planned = outer * inner + (outer + 1) * (inner + 1) + 30
    sampler = _Sampler(values, polynomial, ctx, job, planned)
    bounded, bounded_error = _bounded_part(
        outer, inner, 3 * target / 4, lambda t1, t2: sampler(t1, t2, target / (16 * (ctx.pi / 3 - 1))), ctx)
    left = max(target / 16, 13 * target / 16 - bounded_error - tail_error)
    remainder, remainder_error = _remainder_part(
        laurent, target / 32, left, polynomial, lambda t1, t2: sampler(t1, t2, target / 32), ctx)
    job.report(1.0, "integral: done")
    value = bounded + remainder + tail
    error = bounded_error + remainder_error + tail_error + 10 * ctx.eps * abs(value)
    return Value(export(value), export(error), digits)


def _evaluator(expr) -> Callable:
    from ledger.mgf.evaluate import evaluate

    return lambda tau, digits: evaluate(expr, tau, digits)


def _numeric_laurent(laurent: LaurentPolynomial, ctx) -> Callable:
    """y -> (value, error) of the Laurent polynomial, coefficients converted once."""
    terms = [(k,) + laurent.coefficient_value(k, ctx) for k in laurent.powers()]

    def polynomial(y):
        return (ctx.fsum(c * y ** k for k, c, _ in terms),
                ctx.fsum(e * abs(y) ** k for k, _, e in terms))
    return polynomial


def _bounded_sizes(digits: float) -> tuple:
    """(outer, inner) Gauss nodes reaching about ``digits`` absolute digits."""
    return (max(2, ceil((digits - OUTER_OFFSET) / OUTER_RATE)),
            max(2, ceil((digits - INNER_OFFSET) / INNER_RATE)))


def _bounded_part(outer: int, inner: int, budget, point, ctx) -> tuple:
    """(int over F, tau2 <= 1, error): rules of growing size until two agree within budget."""
    previous = None
    for extra in range(EXTRA_BOUNDED_LEVELS + 2):
        current = _bounded_rule(outer + extra, inner + extra, point, ctx)
        if previous is not None:
            difference = abs(current[0] - previous[0])
            if difference <= budget or extra == EXTRA_BOUNDED_LEVELS + 1:
                return current[0], difference + current[1] + previous[1]
        previous = current


def _bounded_rule(outer: int, inner: int, point, ctx) -> tuple:
    """(sum, propagated error) of one product rule over F below tau2 = 1.

    tau1 = sin(phi), phi = (pi/6) x, x in [0, 1] (the half tau1 >= 0, doubled by
    the symmetry f(-conj tau) = f(tau) of real modular functions), tau2 from
    cos(phi) to 1.  The strip's height 1 - cos(phi) vanishes like x^2 at x = 0:
    Gauss-Jacobi with weight x^2 in x, Gauss-Legendre in tau2.
    """
    top = ctx.pi / 6
    x_nodes, x_weights = gauss_jacobi_01(outer, 2, ctx.dps)
    y_nodes, y_weights = gauss_jacobi_01(inner, 0, ctx.dps)
    total, propagated = ctx.zero, ctx.zero
    for x, wx in zip(map(ctx.convert, x_nodes), map(ctx.convert, x_weights)):
        phi = top * x
        tau1, bottom = ctx.sin(phi), ctx.cos(phi)
        height = 1 - bottom
        # factor 2: tau1 -> -tau1; d tau1 = cos(phi) d phi; the weight x^2 is divided out
        line_weight = 2 * top * wx / x ** 2 * bottom * height
        for y, wy in zip(map(ctx.convert, y_nodes), map(ctx.convert, y_weights)):
            tau2 = bottom + height * y
            value, error = point(tau1, tau2)
            weight = line_weight * wy / tau2 ** 2
            total += weight * value
            propagated += abs(weight) * error
    return total, propagated


def _remainder_part(laurent: LaurentPolynomial, aliasing, budget, polynomial, point, ctx) -> tuple:
    """(int_1^inf (a_0(t) - Laurent(pi t)) dt/t^2, error) by rules of growing size.

    a_0 - Laurent = e^(-4 pi t) P(t) + O(e^(-8 pi t)) with P a Laurent polynomial
    for modular graph functions, so the n-node Gauss rule for e^(-4 pi (t-1)) t^(-K)
    (:func:`ledger.mgf.integrate_rules.gauss_exponential`) is exact on the main part
    once its window t^-K..t^(2n-1-K) spans the powers of P/t^2.  With k_min, k_max
    the lowest and highest powers of the Laurent polynomial, K = 4 - k_min, or
    more as n grows so that the window reaches t^max(2, k_max - 4): this covered
    every product of Eisenstein series we measured, and C(2,1,1).
    """
    powers = laurent.powers() or [0]
    lowest, highest = 4 - min(powers), max(2, max(powers) - 4)
    line = _LineRule(aliasing, max(powers), ctx)

    def rule(nodes):
        return _remainder_rule(nodes, max(lowest, 2 * nodes - 1 - highest), line, polynomial, point, ctx)

    nodes, previous = 3, None
    while True:
        current = rule(nodes)
        if previous is not None:
            difference = abs(current[0] - previous[0])
            if difference <= budget or nodes >= REMAINDER_MAX_NODES:
                return current[0], difference + current[1] + previous[1]
        # the digits still missing set the size of the next rule (and of its partner)
        missing = float(ctx.log10(max(abs(current[0]), budget) / budget)) - REMAINDER_DIGITS
        wanted = min(REMAINDER_MAX_NODES, REMAINDER_NODES + ceil(missing / REMAINDER_RATE))
        previous, nodes = current, (nodes + 1 if wanted <= nodes + 1 else wanted - 1)


def _remainder_rule(nodes: int, power: int, line, polynomial, point, ctx) -> tuple:
    t_nodes, t_weights = gauss_exponential(nodes, 4, power, ctx.dps)
    total, propagated = ctx.zero, ctx.zero
    for t, w in zip(map(ctx.convert, t_nodes), map(ctx.convert, t_weights)):
        constant_term, constant_error = line.constant_term(t, point)
        laurent_value, laurent_error = polynomial(ctx.pi * t)
        weight = w * ctx.exp(4 * ctx.pi * (t - 1)) * t ** (power - 2)
        total += weight * (constant_term - laurent_value)
        propagated += abs(weight) * (constant_error + laurent_error)
    return total, propagated


class _LineRule:
    """The constant term int_0^1 f(tau1 + i tau2) dtau1 by the trapezoid rule.

    N points miss only the Fourier modes +-N, +-2N, ..., of size ~ N^(w-1)
    e^(-2 pi N tau2) for graph functions of weight w (the highest power of the
    Laurent polynomial; measured on E(3)^2 and C(2,1,1)); N is the smallest
    with twice that below ``aliasing``, which is added to the error.  f is even
    in tau1: an odd N uses the points j/N, an even N the points (j + 1/2)/N, so
    that ceil(N/2) values suffice.
    """

    def __init__(self, aliasing, weight: int, ctx):
        self.aliasing, self.growth, self.ctx = aliasing, max(0, weight - 1), ctx
        self.log_aliasing = float(ctx.log(aliasing / 2))

    def points(self, tau2) -> int:
        n = 1
        while -2 * pi * n * float(tau2) + self.growth * log(n) > self.log_aliasing:
            n += 1
        return n

    def constant_term(self, tau2, point) -> tuple:
        ctx = self.ctx
        n = self.points(tau2)
        shift = ctx.zero if n % 2 else ctx.mpf(1) / 2
        total, propagated = ctx.zero, ctx.zero
        for j in range((n + 1) // 2):
            multiplicity = 1 if (n % 2 and j == 0) else 2
            value, error = point((j + shift) / n, tau2)
            total += multiplicity * value
            propagated += multiplicity * error
        return total / n, propagated / n + self.aliasing


class _Sampler:
    """Values of the integrand, each within an absolute error budget.

    The digits asked of ``values`` follow from the budget and the size of the
    Laurent polynomial there, less the fewest surplus digits the evaluator was
    seen to deliver beyond those asked (evaluators bound their errors
    conservatively; a negative surplus asks for more); a value that misses its
    budget is recomputed with more digits.
    """

    def __init__(self, values, polynomial, ctx, job, planned: int):
        self.values, self.polynomial, self.ctx, self.job = values, polynomial, ctx, job
        self.planned, self.count, self.surplus = planned, 0, None

    def __call__(self, tau1, tau2, budget) -> tuple:
        ctx = self.ctx
        size = max(abs(self.polynomial(ctx.pi * tau2)[0]), budget)
        ask = max(1, ceil(float(ctx.log10(size / budget)) - (self.surplus or 0)))
        for _ in range(VALUE_RETRIES + 1):
            self.job.report(min(self.count / self.planned, 0.99),
                            f"integral: value {self.count + 1} of about {self.planned}")
            result = self.values(ctx.mpc(tau1, tau2), ask)
            value, error = ctx.re(ctx.convert(result.value)), ctx.convert(result.error)
            if error > 0:
                extra = float(ctx.log10(max(abs(value), budget) / error)) - ask
                self.surplus = extra if self.surplus is None else min(self.surplus, extra)
            if error <= budget:
                break
            ask += ceil(float(ctx.log10(error / budget))) + 1
        self.count += 1
        return value, error
