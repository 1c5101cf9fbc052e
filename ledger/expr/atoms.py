"""The atoms of the expression language, as sympy functions in canonical form.

Graph functions canonicalise on construction: ``C`` sorts its weights in
descending order and turns two weights into an Eisenstein series, a general
``GraphFunction`` is built only through :func:`from_graph`, which applies the
exact reductions of :mod:`ledger.mgf.graph` (so isomorphic graphs are equal
objects and a two-vertex graph becomes a ``C``).

>>> C(1, 2, 1)
C(2, 1, 1)
>>> C(2, 3)
E(5)
>>> from ledger.mgf.graph import Graph
>>> from_graph(Graph.from_edges([(0, 1, 1), (1, 2, 1), (2, 0, 1)]))
E(3)
>>> Laplace(3 * E(2) + 5)
6*E(2)
"""

from __future__ import annotations

import sympy

from ledger.errors import DivergentGraphError, ExpressionError
from ledger.mgf.graph import Graph, reduce_graph


def _positive_int(value, what: str) -> int:
    if not (isinstance(value, (int, sympy.Integer)) and int(value) >= 1):
        raise ExpressionError(f"{what} must be a positive integer, got {value}")
    return int(value)


class E(sympy.Function):
    """Non-holomorphic Eisenstein series E_s, s >= 2."""

    nargs = 1
    is_commutative = True

    @classmethod
    def eval(cls, s):
        if s.is_Integer and int(s) < 2:
            if int(s) == 1:
                raise DivergentGraphError(
                    "E(1) diverges: its lattice sum is logarithmically divergent; "
                    "Kronecker's first limit formula gives its regularised value, not a number here")
            raise ExpressionError(f"E(s) needs an integer s >= 2, got {s}")
        return None


class C(sympy.Function):
    """Dihedral modular graph function C_{a1,...,ar}, weights sorted descending."""

    is_commutative = True

    @classmethod
    def eval(cls, *weights):
        if len(weights) < 2:
            raise ExpressionError("C(...) needs at least two weights")
        values = [_positive_int(w, "a weight of C(...)") for w in weights]
        if len(values) == 2:
            return E(sum(values))
        ordered = sorted(values, reverse=True)
        if ordered != [int(w) for w in weights]:
            return cls(*ordered)
        return None


class GraphFunction(sympy.Function):
    """An irreducible general modular graph; the argument is its canonical edge list."""

    nargs = 1
    is_commutative = True

    @property
    def graph(self) -> Graph:
        edges = tuple((int(u), int(v), int(w)) for u, v, w in self.args[0])
        n = 1 + max(max(u, v) for u, v, _ in edges)
        return Graph(n, edges)


class Laplace(sympy.Function):
    """The Laplacian Delta = 4 tau2^2 d_tau d_taubar, applied exactly where it is known."""

    nargs = 1
    is_commutative = True

    @classmethod
    def eval(cls, arg):
        if not modular_atoms(arg):
            return sympy.Integer(0)
        if isinstance(arg, sympy.Add):
            return sympy.Add(*(cls(term) for term in arg.args))
        if isinstance(arg, sympy.Mul):
            constant, rest = arg.as_independent(*modular_atoms(arg))
            if constant != 1:
                return constant * cls(rest)
        if isinstance(arg, E):
            s = arg.args[0]
            return s * (s - 1) * arg
        return None


class Theta(sympy.Function):
    """Jacobi theta_nu(alpha + beta tau | tau), nu = 1..4."""

    nargs = 3
    is_commutative = True


class Eta(sympy.Function):
    """Dedekind eta(tau)."""

    nargs = 0
    is_commutative = True


class Spin(sympy.Function):
    """Fermionic Green's function S_nu(alpha + beta tau | tau), even nu = 2, 3, 4."""

    nargs = 3
    is_commutative = True


class Green(sympy.Function):
    """Scalar Green's function G(alpha + beta tau | tau)."""

    nargs = 2
    is_commutative = True


class Etw(sympy.Function):
    """Twisted Eisenstein-type lattice sum with characteristics (alpha, beta)."""

    nargs = 3
    is_commutative = True


class EllGenus(sympy.Function):
    """Elliptic genus of T^4/Z_N at z = alpha + beta tau."""

    nargs = 3
    is_commutative = True


GRAPH_ATOMS = (E, C, GraphFunction)
THETA_ATOMS = (Theta, Eta, Spin, Green, Etw, EllGenus)
FUNCTION_ATOMS = GRAPH_ATOMS + THETA_ATOMS + (Laplace,)


def modular_atoms(expr) -> set:
    """Every non-constant atom (graph, theta-family or Laplace) in ``expr``."""
    return set(expr.atoms(*FUNCTION_ATOMS)) if isinstance(expr, sympy.Basic) else set()


def graph_of(atom) -> Graph:
    """The canonical graph of an E, C or GraphFunction atom.

    >>> graph_of(E(3))
    Graph(n_vertices=1, edges=((0, 0, 3),))
    """
    if isinstance(atom, E):
        return Graph(1, ((0, 0, int(atom.args[0])),))
    if isinstance(atom, C):
        return Graph(2, tuple(sorted((0, 1, int(w)) for w in atom.args)))
    if isinstance(atom, GraphFunction):
        return atom.graph
    raise TypeError(f"{atom} is not a graph function")


def from_graph(graph: Graph):
    """The sympy expression of a graph after the exact reductions (0 or a product)."""
    reduction = reduce_graph(graph)
    if reduction.zero:
        return sympy.Integer(0)
    result = sympy.Integer(1)
    for kind, data in reduction.atoms():
        if kind == "E":
            result *= E(data)
        elif kind == "C":
            result *= C(*data)
        else:
            result *= GraphFunction(sympy.Tuple(*(sympy.Tuple(*e) for e in data.edges)))
    return result
