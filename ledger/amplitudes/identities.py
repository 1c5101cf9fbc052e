"""Known identities between modular graph functions, as a data table.

Each row rewrites one graph function (its left side) as a combination of
simpler ones, in the form the source states it; a right side may contain the
left side of another row but the rows never form a cycle, so substituting
until nothing changes terminates.  Every row names its source and is checked
numerically in tests/amplitudes/test_identities.py.  Rows for general graphs
(weight-5 and weight-6 trihedral graphs, one square) were found in this project
by exact-rational fits of values from two independent evaluators and say so in
their source; each also reproduces the graph's independently computed leading
Laurent coefficient.

>>> from ledger.expr import parse
>>> apply_identities(parse("3*C(1,1,1) - 3*E(3)"))
3*zeta(3)
"""

from __future__ import annotations

from dataclasses import dataclass

import sympy


@dataclass(frozen=True)
class Identity:
    """lhs = rhs in the plain-text expression syntax, with its source."""

    lhs: str
    rhs: str
    source: str

    def rule(self) -> tuple:
        """The (atom, replacement) pair as sympy expressions."""
        from ledger.expr import parse

        return parse(self.lhs), parse(self.rhs)


NUMERICAL_WEIGHT_SIX = (
    "found in this project: rational fit of values at 13-14 tau (20 digits, multivertex evaluator) "
    "over E6, E3^2, E2 E4, E2^3, E2 C(2,1,1), C(4,1,1), C(3,2,1), C(2,2,2), C(3,1,1,1), zeta3 E3, "
    "zeta3^2, holding at every fitted point and at 3-4 further tau within the values' errors "
    "(~1e-25) and reproducing the independently computed y^6 Laurent coefficient; "
    "algebraic identities of this kind are discussed in D'Hoker, Kaidi 2016, arXiv:1608.04393 "
    "(not checked against any paper)")

IDENTITIES: tuple[Identity, ...] = (
    Identity("C(1,1,1)", "E(3) + zeta(3)",
             "D. Zagier (unpublished); D'Hoker, Green, Vanhove 2015, arXiv:1502.06698"),
    Identity("C(2,2,1)", "2/5*E(5) + zeta(5)/30",
             "D'Hoker, Green, Vanhove 2015, arXiv:1502.06698; D'Hoker, Green 2016, arXiv:1603.00839"),
    Identity("C(1,1,1,1)", "24*C(2,1,1) - 18*E(4) + 3*E(2)^2",
             "D'Hoker, Green, Vanhove 2015, arXiv:1502.06698; D'Hoker, Green 2016, arXiv:1603.00839"),
    # 40 C(2,1,1,1) = 300 C(3,1,1) + 120 E(2) E(3) - 276 E(5) + 7 zeta(5), divided by 40
    Identity("C(2,1,1,1)", "15/2*C(3,1,1) + 3*E(2)*E(3) - 69/10*E(5) + 7/40*zeta(5)",
             "D'Hoker, Green, Vanhove 2015, arXiv:1502.06698; D'Hoker, Kaidi 2016, "
             "arXiv:1608.04393 (recalled from memory)"),
    Identity("C(1,1,1,1,1)", "60*C(3,1,1) + 10*E(2)*C(1,1,1) - 48*E(5) + 16*zeta(5)",
             "D'Hoker, Green, Vanhove 2015, arXiv:1502.06698; D'Hoker, Kaidi 2016, "
             "arXiv:1608.04393 (recalled from memory)"),
    # the weight-5 trihedral graph of B_(1,1) (bundles of 1, 2 and 2 edges)
    Identity("graph(0-1, 0-2, 0-2, 1-2, 1-2)", "2*C(3,1,1) - 2/5*E(5) + 3/10*zeta(5)",
             "found by integer-relation search in this project (agreement to 31 digits at three "
             "tau); weight-5 trihedral relations are proved in D'Hoker, Kaidi 2016, "
             "arXiv:1608.04393 (this form not checked against the paper)"),
    # the weight-6 trihedral graphs (bundles of 1, 2, 3 edges; 2, 2, 2; 1, 2, 2 with a weight-2
    # edge in the single bundle or in a double one), found numerically (NUMERICAL_WEIGHT_SIX)
    Identity("graph(0-1, 0-2, 0-2, 1-2, 1-2, 1-2)",
             "9/2*E(6) - 18*E(2)*E(4) + 3*E(2)*C(2,1,1) - 36*C(4,1,1) + 72*C(3,2,1) "
             "+ 57/2*C(2,2,2) + 6*C(3,1,1,1)", NUMERICAL_WEIGHT_SIX),
    Identity("graph(0-1:2, 0-2, 0-2, 1-2, 1-2)",
             "8*E(6) - 4*E(2)*E(4) - 8*C(4,1,1) + 2*C(2,2,2) + 4/3*C(3,1,1,1)", NUMERICAL_WEIGHT_SIX),
    Identity("graph(0-1, 0-1, 0-2, 0-2, 1-2, 1-2)",
             "-238/3*E(6) + 4*E(3)^2 + 12*E(2)*E(4) + E(2)^3 + 36*C(4,1,1) + 112*C(3,2,1) "
             "+ 70/3*C(2,2,2) - 4*C(3,1,1,1)", NUMERICAL_WEIGHT_SIX),
    Identity("graph(0-1, 0-2:2, 0-2, 1-2, 1-2)",
             "-43/9*E(6) + E(2)*E(4) + 3*C(4,1,1) + 22/3*C(3,2,1) + 13/9*C(2,2,2) - 1/3*C(3,1,1,1)",
             NUMERICAL_WEIGHT_SIX),
    # a cycle of bundles is sum_p prod_i f_i(p) with one momentum p running round the cycle, so
    # it does not depend on the order of its bundles: this square (bundles 2, 1, 2, 1) is the
    # trihedral above with its weight-2 edge opened into a chain (bundles 2, 1, 1, 2)
    Identity("graph(0-1, 0-1, 0-2, 1-3, 2-3, 2-3)",
             "8*E(6) - 4*E(2)*E(4) - 8*C(4,1,1) + 2*C(2,2,2) + 4/3*C(3,1,1,1)",
             "order of bundles in a cycle (common practice), with the weight-6 row for "
             "graph(0-1:2, 0-2, 0-2, 1-2, 1-2); the fit of NUMERICAL_WEIGHT_SIX finds the same "
             "combination directly (D'Hoker, Kaidi 2016, arXiv:1608.04393, for such identities)"),
)


def substitution_rules() -> dict:
    """{atom: replacement} for every row of the table."""
    return dict(identity.rule() for identity in IDENTITIES)


def apply_identities(expr):
    """Rewrite every graph function that is the left side of a row, then expand.

    >>> from ledger.expr import parse
    >>> from ledger.expr import to_text
    >>> to_text(apply_identities(parse("C(1,1,1,1) - 24*C(2,1,1)")))
    '-18*E(4) + 3*E(2)^2'
    """
    rules = substitution_rules()
    current = sympy.sympify(expr)
    while True:
        rewritten = current.xreplace(rules)
        if rewritten == current:
            return sympy.expand(current)
        current = rewritten
