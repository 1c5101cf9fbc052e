"""The expression language: parser, canonical atoms over sympy, three printers.

>>> e = parse("C(1,1,1) - E(3)")
>>> to_text(e)
'C(1,1,1) - E(3)'
>>> to_latex(parse("zeta(3)"))
'\\\\zeta(3)'
"""

from ledger.expr.atoms import (
    C, E, Eta, EllGenus, Etw, GraphFunction, Green, Laplace, Spin, Theta,
    from_graph, graph_of, modular_atoms,
)
from ledger.expr.parser import parse
from ledger.expr.printers import to_latex, to_text, to_unicode

__all__ = [
    "C", "E", "Eta", "EllGenus", "Etw", "GraphFunction", "Green", "Laplace", "Spin", "Theta",
    "from_graph", "graph_of", "modular_atoms", "parse", "to_latex", "to_text", "to_unicode",
]
