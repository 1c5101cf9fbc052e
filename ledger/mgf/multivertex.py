"""Numerical values of general (non-dihedral) modular graph functions.

:func:`graph_value` reduces the graph exactly (:func:`ledger.mgf.graph.reduce_graph`)
and multiplies the values of its irreducible blocks: E_s and dihedral C(...)
blocks go to :mod:`ledger.mgf.eisenstein` and :mod:`ledger.mgf.dihedral`, the
others to one of two methods of our own:

* a *cycle of bundles* (vertices in a ring, consecutive ones joined by parallel
  edges, nothing else: every trihedral graph, the square with two opposite
  edges doubled, ...) is sum_p prod_b B^_b(p) over one lattice momentum, with the
  bundle coefficients B^_b from a position-space quadrature inside |zeta| < Z and
  from their large-momentum expansion outside (:mod:`ledger.mgf.bundle_cycle`):
  the power-law tail is summed in closed form, so the error falls like
  exp(-Z/2) and 20 digits take well under a minute for weight <= 6;
* anything else (the tetrahedral graph K4, ...) by the mixed Fourier route with
  exact position integrals and an extrapolated sum over the m-lattice
  (:mod:`ledger.mgf.mixed_route`): about 12-14 digits in minutes for weight 6.

Why not one method for all: the mixed route's sum over m converges like a power
of the cut-off (the kernels decay only like exp(-2 pi |m| tau2 |u|) near
coinciding positions), and summing that power-law part exactly needs nested
multiple-zeta-like sums in as many variables as the graph has loops; a plain
truncated lattice sum stalls near 10-14 digits.  For a cycle of bundles the
power-law part is carried by one two-dimensional momentum, and the local
expansion of the bundles at z = 0 gives it in closed form.

Every value carries an error estimate from two independent variants of the
computation (rule sizes, split radius, extrapolation window); digits that cannot
be reached in reasonable time are not claimed: the error says what is right.

>>> import mpmath
>>> from ledger.mgf.graph import Graph
>>> triangle = Graph.from_edges([(0, 1, 1), (1, 2, 1), (2, 0, 1)])
>>> v = graph_value(triangle, mpmath.mpc(0, 1), digits=20)
>>> abs(v.value - mpmath.zeta(3) / 8) < 1e-15, v.correct_digits() >= 20   # E_3(i) = zeta(3)/8
(True, True)
"""

from __future__ import annotations

import mpmath

from ledger.errors import LedgerError
from ledger.mgf.bundle_cycle import cycle_value
from ledger.mgf.graph import Graph, reduce_graph
from ledger.mgf.jobs import Job, ensure_job
from ledger.mgf.mixed_route import mixed_route_value
from ledger.mgf.values import Value

FACTOR_GUARD_DIGITS = 2   # each factor of a product is asked for a few more digits


def graph_value(graph: Graph, tau, digits: int = 20, job: Job | None = None) -> Value:
    """The graph function of ``graph`` at ``tau`` with an error bound.

    The graph need not be reduced; divergent graphs raise DivergentGraphError.

    >>> import mpmath
    >>> from ledger.mgf.graph import Graph
    >>> graph_value(Graph.from_edges([(0, 1, 1), (1, 2, 1), (1, 2, 1)]), mpmath.mpc(0, 1)).value
    mpf('0.0')
    """
    if not isinstance(graph, Graph):
        raise LedgerError(f"graph_value needs a Graph, got {type(graph).__name__}")
    if isinstance(digits, bool) or not isinstance(digits, int) or not 1 <= digits <= 60:
        raise LedgerError(f"digits must be an integer between 1 and 60, got {digits!r}")
    job = ensure_job(job)
    job.check()
    reduction = reduce_graph(graph)
    if reduction.zero:
        return Value.exact(mpmath.mpf(0), digits)
    atoms = reduction.atoms()
    result = Value.exact(mpmath.mpf(1), digits)
    extra = FACTOR_GUARD_DIGITS if len(atoms) > 1 else 0
    for index, atom in enumerate(atoms):
        part = job.part(index / len(atoms), (index + 1) / len(atoms))
        result = result * block_value(atom, tau, digits + extra, part)
    return Value(result.value, result.error, digits)


def block_value(atom: tuple, tau, digits: int, job: Job | None = None) -> Value:
    """Value of one irreducible factor as classified by :func:`ledger.mgf.graph.classify`."""
    kind = atom[0]
    if kind == "E":
        from ledger.mgf.eisenstein import eisenstein_value
        return eisenstein_value(atom[1], tau, digits, job)
    if kind == "C":
        from ledger.mgf.dihedral import dihedral_value
        return dihedral_value(atom[1], tau, digits, job)
    graph = atom[1]
    bundles = cycle_bundles(graph)
    if bundles is not None:
        return cycle_value(bundles, tau, digits, job)
    return mixed_route_value(graph, tau, digits, job)


def cycle_bundles(graph: Graph):
    """The bundles [(weights), ...] in ring order if ``graph`` is a cycle of bundles, else None.

    >>> cycle_bundles(Graph.from_edges([(0, 1, 1), (0, 1, 1), (1, 2, 2), (2, 0, 1)]))
    [(1, 1), (2,), (1,)]
    >>> k4 = Graph.from_edges([(0, 1, 1), (0, 2, 1), (0, 3, 1), (1, 2, 1), (1, 3, 1), (2, 3, 1)])
    >>> cycle_bundles(k4) is None
    True
    """
    bundles: dict = {}
    for u, v, a in graph.edges:
        if u == v:
            return None
        bundles.setdefault((min(u, v), max(u, v)), []).append(a)
    n = graph.n_vertices
    neighbours = {x: set() for x in range(n)}
    for u, v in bundles:
        neighbours[u].add(v)
        neighbours[v].add(u)
    if n < 3 or any(len(neighbours[x]) != 2 for x in range(n)):
        return None
    ring = [0]
    while len(ring) < n:
        options = sorted(neighbours[ring[-1]] - set(ring))
        if not options:
            return None
        ring.append(options[0])
    if ring[0] not in neighbours[ring[-1]]:
        return None
    pairs = [(ring[i], ring[(i + 1) % n]) for i in range(n)]
    return [tuple(sorted(bundles[(min(u, v), max(u, v))])) for u, v in pairs]
