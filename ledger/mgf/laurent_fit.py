"""Laurent polynomials of general graphs: exact leading term, the rest fitted.

Leading term (exact): the sector where every lattice momentum has m = 0 is
the torus average over vertex positions u_v of prod_e c_a y^a B_2a({u_v - u_w})
(:mod:`ledger.mgf.dihedral_laurent` for c_a), a rational multiple of y^w,
integrated here exactly over each ordering of the u_v.

The other coefficients come from values at large tau2 on tau1 = 0, where
f = sum_k c_k y^k + O(e^(-2y)): with z = 1/y, f/y^w is a polynomial in z,
fitted by least squares at Chebyshev nodes in z.  Only powers whose
transcendental weight j = w - k has single-valued zeta values are fitted
(weights 1, 2 and 4 have none: Laurent coefficients of modular graph
functions are single-valued multiple zeta values, F. Brown 2017,
arXiv:1707.01230; D. Zerbini 2015, arXiv:1512.05689; from memory).  Two fits
on disjoint node sets give the error; each coefficient is then matched in
:mod:`ledger.mgf.zeta_basis`, and exact only when a second fit at higher
precision confirms the relation.

>>> from ledger.mgf.graph import Graph
>>> leading_coefficient(Graph.from_edges([(0, 1, 1)] * 3))   # C(1,1,1): 2/945 y^3
Fraction(2, 945)
"""

from __future__ import annotations

import itertools
from fractions import Fraction
from math import ceil, log
from typing import Callable, Optional

import mpmath
import sympy

from ledger.errors import LedgerError, NotAvailableError
from ledger.mgf.approx import export
from ledger.mgf.bernoulli import bernoulli_polynomial
from ledger.mgf.dihedral_laurent import bernoulli_kernel_constant
from ledger.mgf.graph import Graph
from ledger.mgf.jobs import Job, ensure_job
from ledger.mgf.values import Value
from ledger.mgf.zeta_basis import SPARE_DIGITS, identify_in_basis, weight_basis

COEFFICIENT_DIGITS = 45  # digits wanted of the lowest coefficient before identification


def leading_coefficient(graph: Graph) -> Fraction:
    """The exact coefficient of y^w (all momenta with m = 0)."""
    n = graph.n_vertices
    u = sympy.symbols(f"u0:{n}")
    constant = Fraction(1)
    for _, _, a in graph.edges:
        constant *= bernoulli_kernel_constant(a)
    total = sympy.Integer(0)
    for order in itertools.permutations(range(1, n)):
        position = {0: 0, **{v: i + 1 for i, v in enumerate(order)}}
        integrand = sympy.Poly(1, *u[1:]) if n > 1 else sympy.Integer(1)
        for v, w, a in graph.edges:
            low, high = sorted((v, w), key=position.get)
            x = sympy.Poly((u[high] if high else 0) - (u[low] if low else 0), *u[1:])
            bernoulli = bernoulli_polynomial(2 * a)
            term = sympy.Poly(0, *u[1:])
            for c in reversed(bernoulli):  # Horner
                term = term * x + sympy.Rational(c.numerator, c.denominator)
            integrand = integrand * term
        # 0 < u_order[0] < u_order[1] < ... < 1, innermost variable first
        for i, v in enumerate(order):
            upper = u[order[i + 1]] if i + 1 < len(order) else sympy.Integer(1)
            primitive = integrand.integrate(u[v])
            integrand = sympy.Poly(primitive.as_expr().subs(u[v], upper), *u[1:])
        total += integrand.as_expr()
    value = sympy.Rational(total) * sympy.Rational(constant.numerator, constant.denominator)
    return Fraction(int(value.p), int(value.q))


def graph_laurent(graph: Graph, digits: int = 30, job: Optional[Job] = None,
                  values: Optional[Callable] = None, coefficient_digits: int = COEFFICIENT_DIGITS):
    """The Laurent polynomial of a general graph (module docstring).

    ``values(tau, digits) -> Value`` overrides the evaluator of the graph;
    ``coefficient_digits`` is the precision aimed at for the lowest coefficient.
    """
    from ledger.mgf.laurent import LaurentPolynomial

    job = ensure_job(job)
    if values is None:
        values = _graph_values(graph)
    w = graph.weight
    powers = [w - j for j in range(1, 2 * w) if weight_basis(j).elements]
    leading = leading_coefficient(graph)
    first = _fit(graph, powers, leading, _value_digits(w, coefficient_digits), 0, values, job.part(0.0, 0.5))
    second = _fit(graph, powers, leading, _value_digits(w, coefficient_digits + 15), 1, values,
                  job.part(0.5, 1.0))
    terms = {w: sympy.Rational(leading.numerator, leading.denominator)}
    for power in powers:
        terms[power] = _identified(first[power], second[power], w - power, digits)
    return LaurentPolynomial.from_dict(terms, digits)


def _graph_values(graph: Graph) -> Callable:
    from ledger.expr.atoms import from_graph
    from ledger.mgf.evaluate import evaluate

    expr = from_graph(graph)
    return lambda tau, digits: evaluate(expr, tau, digits)


def _value_digits(weight: int, wanted: int) -> int:
    """Digits of the values so that the y^(1-w) coefficient keeps ``wanted`` digits."""
    digits = wanted + 10
    for _ in range(5):  # y_min grows with the digits: iterate to a fixed point
        y_min = digits * log(10) / 2 + 5
        digits = wanted + 10 + ceil((2 * weight - 1) * log(y_min, 10))
    return digits


def _fit(graph, powers, leading, value_digits, variant, values, job) -> dict:
    """{power: (value, error)} as mpf from two least-squares fits on disjoint nodes."""
    ctx = mpmath.MPContext()
    ctx.dps = value_digits + 10
    w = graph.weight
    y_min = ctx.mpf(value_digits) * ctx.ln10 / 2 + 5  # e^(-2y) below the value precision
    y_max = 3 * y_min
    count = len(powers) + 2
    nodes = _chebyshev(2 * count, 1 / y_max, 1 / y_min, variant, ctx)
    rows, rhs, sizes = [], [], []
    for index, z in enumerate(nodes):
        job.report(index / len(nodes), f"Laurent fit: value {index + 1} of {len(nodes)}")
        y = 1 / z
        try:
            v = values(ctx.mpc(0, y / ctx.pi), value_digits)
        except NotAvailableError:
            raise
        except LedgerError as refused:
            raise NotAvailableError(
                f"only the leading term {leading} y^{w} of the Laurent polynomial of {graph.text()} is "
                f"known exactly; the others are fitted to values with {value_digits} digits at tau2 up "
                f"to {mpmath.nstr(y_max / ctx.pi, 3)}, which the evaluator cannot give: {refused}"
            ) from refused
        value, error = ctx.re(ctx.convert(v.value)), ctx.convert(v.error)
        rows.append([z ** (w - p) for p in powers])
        rhs.append(value / y ** w - ctx.mpf(leading.numerator) / leading.denominator)
        sizes.append(error / y ** w + abs(value / y ** w) * ctx.mpf(10) ** (-value_digits))
    fits = []
    for part in (slice(0, None, 2), slice(1, None, 2)):
        a = ctx.matrix(rows[part])
        b = ctx.matrix(rhs[part])
        fits.append(ctx.qr_solve(a, b)[0])
    # a perturbation of the data by its error bound moves the solution by at most
    # ||A^+|| ||delta||; bound it by the fit on the error sizes themselves
    noise = ctx.qr_solve(ctx.matrix(rows[0::2]), ctx.matrix(sizes[0::2]))[0]
    result = {}
    for i, power in enumerate(powers):
        error = abs(fits[0][i] - fits[1][i]) + abs(noise[i]) * len(powers)
        result[power] = (fits[0][i], error)
    return result


def _chebyshev(n: int, low, high, variant: int, ctx) -> list:
    """n Chebyshev nodes on [low, high], rotated by ``variant`` so that fits differ."""
    shift = ctx.mpf(variant) / 3
    return [(low + high) / 2 + (high - low) / 2 * ctx.cos(ctx.pi * (k + ctx.mpf(1) / 2 + shift) / n)
            for k in range(n)]


def _identified(first: tuple, second: tuple, weight: int, digits: int):
    """Exact coefficient when both fits support the same relation, else a Value."""
    basis = weight_basis(weight)
    (v1, e1), (v2, e2) = first, second
    estimates = iter([(v1, e1), (v2, e2)])

    def compute(ev):
        value, error = next(estimates)
        return ev.ctx.convert(value), ev.ctx.convert(error)

    d1 = max(10, int(-mpmath.log10(max(e1, mpmath.mpf(10) ** -200) / max(abs(v1), 1))) - 2)
    d2 = max(d1 + 1, int(-mpmath.log10(max(e2, mpmath.mpf(10) ** -200) / max(abs(v2), 1))) - 2)
    found = identify_in_basis(compute, basis, (d1, d2))
    if found.exact is not None and d1 >= SPARE_DIGITS + 5:
        return found.exact
    best_value, best_error = (v2, e2) if e2 < e1 else (v1, e1)
    return Value(export(best_value), export(best_error), digits)
