"""Weighted multigraphs, their canonical form and the exact reductions.

A modular graph function is a sum over non-zero lattice momenta p_e = m tau + n,
one per edge, conserved at every vertex, of prod_e (tau2/pi)^a_e / |p_e|^(2 a_e).
The reductions below are exact identities of such sums:

* a bridge (in particular an edge ending at a degree-1 vertex) carries zero
  momentum, so the graph vanishes;
* a degree-2 vertex merges its two edges into one whose weight is the sum;
* a self-loop of weight s carries an unconstrained momentum: a factor E_s;
* a cut vertex (or a disconnected graph) factorises into its blocks.

What remains are blocks in which every vertex has degree >= 3: a two-vertex
block with r >= 3 edges is the dihedral C(a1, ..., ar), anything larger is a
general graph kept by its canonical edge list.

>>> g = Graph.from_edges([(0, 1, 1), (1, 0, 1), (0, 1, 1)])
>>> reduce_graph(g).atoms()
(('C', (1, 1, 1)),)
>>> reduce_graph(Graph.from_edges([(0, 1, 1), (1, 2, 2), (2, 0, 1)])).atoms()
(('E', 4),)
>>> reduce_graph(Graph.from_edges([(0, 1, 1), (1, 2, 1), (1, 2, 1)])).zero
True
"""

from __future__ import annotations

import itertools
from dataclasses import dataclass
from typing import Iterable

from ledger.errors import DivergentGraphError, LedgerError

Edge = tuple[int, int, int]  # (vertex, vertex, weight), vertex <= vertex


@dataclass(frozen=True)
class Graph:
    """A weighted multigraph on vertices 0..n_vertices-1 (edges sorted)."""

    n_vertices: int
    edges: tuple[Edge, ...]

    @classmethod
    def from_edges(cls, edges: Iterable[tuple[int, int, int]]) -> "Graph":
        """Build a graph from (u, v, weight) triples with any vertex labels."""
        edges = list(edges)
        labels = sorted({x for u, v, _ in edges for x in (u, v)})
        index = {label: i for i, label in enumerate(labels)}
        normalised = []
        for u, v, w in edges:
            if not isinstance(w, int) or w < 1:
                raise LedgerError(f"edge {u}-{v} has weight {w}; weights must be positive integers")
            a, b = sorted((index[u], index[v]))
            normalised.append((a, b, w))
        return cls(len(labels), tuple(sorted(normalised)))

    @property
    def weight(self) -> int:
        return sum(w for _, _, w in self.edges)

    @property
    def loops(self) -> int:
        """Number of independent loop momenta (first Betti number)."""
        return len(self.edges) - self.n_vertices + _count_components(self.n_vertices, self.edges)

    def degree(self, vertex: int) -> int:
        return sum((u == vertex) + (v == vertex) for u, v, _ in self.edges)

    def text(self) -> str:
        """Plain-text edge list as used by the expression language."""
        return "graph(" + ", ".join(
            f"{u}-{v}" + (f":{w}" if w != 1 else "") for u, v, w in self.edges) + ")"


@dataclass(frozen=True)
class Reduction:
    """The result of reducing a graph: zero, or a product of irreducible blocks."""

    zero: bool
    factors: tuple[Graph, ...]  # canonical, sorted; empty product means 1

    def atoms(self) -> tuple[tuple, ...]:
        """The factors classified as ('E', s), ('C', weights) or ('G', graph)."""
        return tuple(classify(f) for f in self.factors)


ZERO = Reduction(True, ())


def check_convergence(graph: Graph) -> None:
    """Raise :class:`DivergentGraphError` if the lattice sum diverges.

    Power counting in two dimensions: a subgraph with L >= 1 loops and total
    weight W makes the sum diverge when W <= L.  With positive integer weights
    this happens exactly for a self-loop of weight 1, i.e. a factor E_1.

    >>> check_convergence(Graph.from_edges([(0, 0, 1)]))  # doctest: +IGNORE_EXCEPTION_DETAIL
    Traceback (most recent call last):
    DivergentGraphError: ...
    """
    edges = graph.edges
    if len(edges) <= 14:
        candidates = (subset for k in range(1, len(edges) + 1)
                      for subset in itertools.combinations(edges, k))
    else:  # the only divergent subgraphs with weights >= 1 are weight-1 self-loops
        candidates = ((e,) for e in edges if e[0] == e[1])
    for subset in candidates:
        vertices = sorted({x for u, v, _ in subset for x in (u, v)})
        relabel = {x: i for i, x in enumerate(vertices)}
        sub_edges = tuple((relabel[u], relabel[v], w) for u, v, w in subset)
        loops = len(sub_edges) - len(vertices) + _count_components(len(vertices), sub_edges)
        weight = sum(w for _, _, w in subset)
        if loops >= 1 and weight <= loops:
            named = ", ".join(f"{u}-{v}" + (f":{w}" if w != 1 else "") for u, v, w in subset)
            if loops == 1 and weight == 1:
                raise DivergentGraphError(
                    f"divergent graph: the one-loop subgraph {{{named}}} has total weight 1, "
                    "i.e. a factor E(1), whose lattice sum diverges logarithmically; "
                    "Kronecker's first limit formula gives its regularised value, not a number here")
            raise DivergentGraphError(
                f"divergent graph: the subgraph {{{named}}} has {loops} loops "
                f"but total weight {weight} (convergence needs weight > loops)")


def reduce_graph(graph: Graph) -> Reduction:
    """Apply the exact reductions and return canonical irreducible factors."""
    check_convergence(graph)
    edges = [list(e) for e in graph.edges]
    pending = [(graph.n_vertices, edges)]
    factors: list[Graph] = []
    while pending:
        n, edges = pending.pop()
        n, edges = _drop_isolated(n, edges)
        if not edges:
            continue
        loop_index = next((i for i, (u, v, _) in enumerate(edges) if u == v), None)
        if loop_index is not None:
            u, v, w = edges.pop(loop_index)
            factors.append(Graph(1, ((0, 0, w),)))
            pending.append((n, edges))
            continue
        if _has_bridge(n, edges):
            return ZERO
        merged = _merge_degree_two(n, edges)
        if merged is not None:
            pending.append(merged)
            continue
        blocks = _split_blocks(n, edges)
        if len(blocks) > 1:
            pending.extend(blocks)
            continue
        factors.append(canonical_form(Graph.from_edges(tuple(e) for e in edges)))
    factors = [canonical_form(f) for f in factors]
    factors.sort(key=lambda g: (g.n_vertices, len(g.edges), g.edges))
    return Reduction(False, tuple(factors))


def classify(graph: Graph) -> tuple:
    """('E', s) for a weight-s self-loop, ('C', weights) for a dihedral, else ('G', graph)."""
    if graph.n_vertices == 1 and len(graph.edges) == 1:
        return ("E", graph.edges[0][2])
    if graph.n_vertices == 2 and all(u != v for u, v, _ in graph.edges):
        weights = tuple(sorted((w for _, _, w in graph.edges), reverse=True))
        if len(weights) == 2:
            return ("E", sum(weights))
        return ("C", weights)
    return ("G", graph)


def canonical_form(graph: Graph) -> Graph:
    """The isomorphism-invariant representative: lexicographically least edge list.

    Vertices are first ordered by invariants (degree, weighted degree); only
    permutations inside classes of equal invariants are tried.

    >>> a = Graph.from_edges([(0, 1, 2), (1, 2, 1), (2, 0, 1), (0, 1, 1), (1, 2, 1)])
    >>> b = Graph.from_edges([(5, 7, 1), (7, 9, 2), (9, 5, 1), (7, 9, 1), (5, 9, 1)])
    >>> canonical_form(a) == canonical_form(b)
    True
    """
    n = graph.n_vertices
    invariant = []
    for x in range(n):
        incident = sorted(w for u, v, w in graph.edges for end in (u, v) if end == x)
        invariant.append((len(incident), tuple(incident)))
    classes: dict = {}
    for x in range(n):
        classes.setdefault(invariant[x], []).append(x)
    ordered_classes = [classes[k] for k in sorted(classes)]
    best = None
    for choice in itertools.product(*(itertools.permutations(c) for c in ordered_classes)):
        order = [x for group in choice for x in group]
        position = {x: i for i, x in enumerate(order)}
        edges = tuple(sorted((min(position[u], position[v]), max(position[u], position[v]), w)
                             for u, v, w in graph.edges))
        if best is None or edges < best:
            best = edges
    return Graph(n, best if best is not None else ())


class _UnionFind:
    """Connected components by union-find over arbitrary hashable vertices."""

    def __init__(self, vertices):
        self.parent = {x: x for x in vertices}

    def find(self, x):
        while self.parent[x] != x:
            self.parent[x] = self.parent[self.parent[x]]
            x = self.parent[x]
        return x

    def union_edges(self, edges) -> "_UnionFind":
        for u, v, _ in edges:
            self.parent[self.find(u)] = self.find(v)
        return self

    def roots(self) -> set:
        return {self.find(x) for x in self.parent}


def _count_components(n: int, edges) -> int:
    return len(_UnionFind(range(n)).union_edges(edges).roots())


def _drop_isolated(n, edges):
    used = sorted({x for u, v, _ in edges for x in (u, v)})
    relabel = {x: i for i, x in enumerate(used)}
    return len(used), [[relabel[u], relabel[v], w] for u, v, w in edges]


def _has_bridge(n, edges) -> bool:
    base = _count_components(n, edges)
    for i in range(len(edges)):
        rest = edges[:i] + edges[i + 1:]
        if _count_components(n, rest) > base:
            return True
    return False


def _merge_degree_two(n, edges):
    for x in range(n):
        incident = [i for i, (u, v, _) in enumerate(edges) if x in (u, v)]
        if len(incident) != 2:
            continue
        (i, j) = incident
        ends = []
        for k in (i, j):
            u, v, _ = edges[k]
            ends.append(v if u == x else u)
        weight = edges[i][2] + edges[j][2]
        rest = [e for k, e in enumerate(edges) if k not in (i, j)]
        rest.append([min(ends), max(ends), weight])
        return n, rest
    return None


def _split_blocks(n, edges):
    """Split at a cut vertex or into connected components; [(n, edges)] if neither applies."""
    if _count_components(n, edges) > 1:
        return _components(n, edges)
    for x in range(n):
        others = [e for e in edges if x not in (e[0], e[1])]
        touching = [e for e in edges if x in (e[0], e[1])]
        forest = _UnionFind(y for y in range(n) if y != x).union_edges(others)
        roots = forest.roots()
        if len(roots) > 1:
            blocks = []
            for root in roots:
                members = {y for y in forest.parent if forest.find(y) == root}
                block = [list(e) for e in others if e[0] in members]
                block += [list(e) for e in touching if (e[0] in members or e[1] in members)]
                blocks.append((n, block))
            return blocks
    return [(n, edges)]


def _components(n, edges):
    forest = _UnionFind(range(n)).union_edges(edges)
    groups: dict = {}
    for e in edges:
        groups.setdefault(forest.find(e[0]), []).append(list(e))
    return [(n, group) for group in groups.values()]
