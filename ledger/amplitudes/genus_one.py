"""The genus-one four-graviton integrand expanded in modular graph functions.

B(s, t, u | tau) is the integral over four positions on the torus (normalised
measure) of exp(sum_{i<j} s_ij G(z_i - z_j)) with s_12 = s_34 = s,
s_14 = s_23 = t, s_13 = s_24 = u and s + t + u = 0.  Expanding the exponential,
a product prod G(z_i - z_j)^(k_ij) integrates to the modular graph function of
the multigraph with k_ij weight-1 edges between i and j; the exact reductions
of :mod:`ledger.mgf.graph` bring each one to a product of canonical irreducible
graphs (or zero).  Collecting by kinematics,

    B = sum_{p,q} B_(p,q)(tau) sigma_2^p sigma_3^q / (p! q!).

G is the engine's scalar Green's function, G(z) = sum' tau2/(pi |p|^2) exp(2 pi i <p, z>)
over lattice momenta p (zero mean), so that an edge of weight a carries
(tau2/pi)^a / |p|^(2a) as in :mod:`ledger.mgf.graph`.

The raw result keeps each B_(p,q) as a :data:`GraphSum`, a map from a product of
canonical graphs to its rational coefficient.

>>> from ledger.amplitudes.operators import format_structure
>>> from ledger.expr import to_text
>>> expansion = expand_genus_one(3)
>>> for structure, b in expansion.coefficients.items():
...     print(format_structure(structure), "->", to_text(graph_sum_expression(b)))
1 -> 1
sigma2 -> E(2)
sigma3 -> 1/3*C(1,1,1) + 4/3*E(3)
"""

from __future__ import annotations

import math
from dataclasses import dataclass
from fractions import Fraction
from typing import Optional

import sympy

from ledger.amplitudes.operators import (
    BinaryForm, Structure, mandelstam_form, sigma_coordinates, structures_through,
)
from ledger.errors import LedgerError
from ledger.mgf.graph import Graph, canonical_form, reduce_graph
from ledger.mgf.jobs import Job, ensure_job

GraphProduct = tuple[Graph, ...]  # canonical irreducible factors, sorted; () is 1
GraphSum = dict[GraphProduct, Fraction]

MAX_ORDER = 10

# The six pairs of the four vertices 0..3 and which Mandelstam (0 = s, 1 = t, 2 = u)
# each carries: s_12 = s_34 = s, s_14 = s_23 = t, s_13 = s_24 = u.
PAIRS = ((0, 1), (2, 3), (0, 3), (1, 2), (0, 2), (1, 3))
PAIR_MANDELSTAM = (0, 0, 1, 1, 2, 2)


@dataclass(frozen=True)
class GenusOneExpansion:
    """B_(p,q) for every structure of weight <= order (absent structures are zero)."""

    order: int
    coefficients: dict[Structure, GraphSum]


def expand_genus_one(order: int, job: Optional[Job] = None) -> GenusOneExpansion:
    """Expand the genus-one integrand through weight ``order`` (2p + 3q <= order).

    >>> b = expand_genus_one(2).coefficients
    >>> b[Structure(0, 0)], graph_sum_expression(b[Structure(1, 0)])
    ({(): Fraction(1, 1)}, E(2))
    """
    check_order(order)
    job = ensure_job(job)
    cache: dict[Graph, tuple[bool, GraphProduct]] = {}
    coefficients: dict[Structure, GraphSum] = {s: {} for s in structures_through(order)}
    for weight in range(order + 1):
        job.report(weight / (order + 1), f"genus one: weight {weight}")
        forms = _weight_forms(weight, cache)
        for product, form in forms.items():
            for structure, value in sigma_coordinates(form, weight).items():
                target = coefficients[structure]
                target[product] = target.get(product, Fraction(0)) + value
    job.report(1.0, "genus one: done")
    return GenusOneExpansion(order, {s: {k: v for k, v in c.items() if v}
                                     for s, c in coefficients.items()})


def check_order(order) -> None:
    if not isinstance(order, int) or isinstance(order, bool) or not 0 <= order <= MAX_ORDER:
        raise LedgerError(f"the order must be an integer weight from 0 to {MAX_ORDER}, got {order!r}")


def _weight_forms(weight: int, cache: dict) -> dict[GraphProduct, BinaryForm]:
    """Sum over k_ij with sum k_ij = weight of prod s_ij^k_ij/k_ij! times the reduced graph."""
    forms: dict[GraphProduct, BinaryForm] = {}
    for counts in _compositions(weight, len(PAIRS)):
        zero, product = _reduced(counts, cache)
        if zero:
            continue
        powers = [0, 0, 0]
        for k, mandelstam in zip(counts, PAIR_MANDELSTAM):
            powers[mandelstam] += k
        scale = Fraction(1, math.prod(math.factorial(k) for k in counts))
        target = forms.setdefault(product, {})
        for s_power, value in mandelstam_form(*powers).items():
            target[s_power] = target.get(s_power, Fraction(0)) + scale * value
    return forms


def _reduced(counts: tuple[int, ...], cache: dict) -> tuple[bool, GraphProduct]:
    edges = [(u, v, 1) for (u, v), k in zip(PAIRS, counts) for _ in range(k)]
    graph = canonical_form(Graph.from_edges(edges))
    if graph not in cache:
        reduction = reduce_graph(graph)
        cache[graph] = (reduction.zero, reduction.factors)
    return cache[graph]


def _compositions(total: int, parts: int):
    """All tuples of ``parts`` non-negative integers summing to ``total``."""
    if parts == 1:
        yield (total,)
        return
    for first in range(total, -1, -1):
        for rest in _compositions(total - first, parts - 1):
            yield (first,) + rest


def graph_sum_expression(graph_sum: GraphSum):
    """The sympy expression (atoms E, C, GraphFunction) of a graph sum.

    >>> graph_sum_expression({(Graph(1, ((0, 0, 2),)),) * 2: Fraction(3, 4)})
    3*E(2)**2/4
    """
    from ledger.expr.atoms import from_graph

    total = sympy.Integer(0)
    for product, coefficient in graph_sum.items():
        term = sympy.Rational(coefficient.numerator, coefficient.denominator)
        for factor in product:
            term *= from_graph(factor)
        total += term
    return sympy.expand(total)


def genus_one_coefficients(order: int, reduce: bool = False,
                           job: Optional[Job] = None) -> dict[Structure, object]:
    """B_(p,q) as sympy expressions, raw or after the identities of the table.

    >>> from ledger.expr import to_text
    >>> to_text(genus_one_coefficients(3, reduce=True)[Structure(0, 1)])
    '5/3*E(3) + 1/3*zeta(3)'
    """
    expansion = expand_genus_one(order, job)
    expressions = {s: graph_sum_expression(b) for s, b in expansion.coefficients.items()}
    if reduce:
        from ledger.amplitudes.identities import apply_identities

        expressions = {s: apply_identities(e) for s, e in expressions.items()}
    return expressions

