"""Parser, canonical forms and printers of the expression language."""

import pytest
import sympy

from ledger.errors import DivergentGraphError, ExpressionError, LedgerError
from ledger.expr import C, E, GraphFunction, Laplace, parse, to_latex, to_text, to_unicode


def test_dihedral_arguments_are_sorted():
    # canonical form: C is symmetric in its weights (common practice)
    assert parse("C(1,2,1)") == parse("C(2,1,1)") == C(2, 1, 1)


def test_two_weights_are_an_eisenstein_series():
    # C_{a,b} = E_{a+b}: a degree-2 vertex merges its edges (common practice)
    assert parse("C(2,3)") == E(5)


def test_two_vertex_graph_is_dihedral():
    assert parse("graph(0-1, 0-1:2, 1-0)") == C(2, 1, 1)


def test_isomorphic_graphs_compare_equal():
    a = parse("graph(0-1, 1-2, 2-0, 0-1, 1-2, 2-0:2)")
    b = parse("graph(7-5:2, 5-7, 5-9, 9-5, 7-9, 9-7)")
    c = parse("graph(1-2:2, 2-3, 3-1, 1-3, 2-3, 1-2)")
    assert a == b == c
    assert isinstance(a, GraphFunction)


def test_graph_reductions():
    # a cycle is E of the total weight; a bridge carries zero momentum; a cut vertex factorises
    assert parse("graph(0-1, 1-2:2, 2-0)") == E(4)
    assert parse("graph(0-1, 1-2, 1-2)") == 0
    assert parse("graph(0-1, 0-1, 1-2, 1-2)") == E(2) ** 2


def test_tetrahedral_graph_is_irreducible():
    e = parse("graph(0-1, 0-2, 0-3, 1-2, 1-3, 2-3)")
    assert isinstance(e, GraphFunction) and e.graph.weight == 6


def test_rationals_zeta_pi_and_juxtaposition():
    e = parse("2/5 E(5) + zeta(5)/30")
    assert e == sympy.Rational(2, 5) * E(5) + sympy.zeta(5) / 30
    assert parse("1.5 E(3)") == sympy.Rational(3, 2) * E(3)
    assert parse("zeta(2)") == sympy.pi ** 2 / 6  # Euler (common practice)


def test_laplace_acts_exactly_on_eisenstein_series():
    # Delta E_s = s(s-1) E_s (common practice)
    assert parse("laplace(E(3))") == 6 * E(3)
    assert parse("laplace(2 E(2) + zeta(3))") == 4 * E(2)
    assert isinstance(parse("laplace(C(2,1,1))"), Laplace)


@pytest.mark.parametrize("text", [
    "E(2)", "C(2,1,1)", "C(1,1,1) - E(3) - zeta(3)", "2/5*E(5) + 1/30*zeta(5)",
    "24*C(2,1,1) - 18*E(4) + 3*E(2)^2", "graph(0-1, 0-2, 0-3, 1-2, 1-3, 2-3)",
    "laplace(C(2,1,1)) - 2*C(2,1,1)", "theta(2,1/2,1/3)*eta^3", "-(E(2) + E(3))^2",
    "pi^(-2)*E(2)^2*zeta(3)", "green(1/2,0) + spin(3,1/4,1/4) + Etw(2,1/3,0) + ellgenus(4,0,0)",
])
def test_text_printer_round_trip(text):
    e = parse(text)
    assert parse(to_text(e)) == e


def test_unicode_and_latex():
    e = parse("C(2,1,1) + E(2)^2 - zeta(3)")
    assert to_unicode(e) == "C₂,₁,₁ + E₂² − ζ(3)"
    latex = to_latex(parse("2/5 E(5) + C(2,1,1) + zeta(3)"))
    for piece in ("E_{5}", "C_{2,1,1}", r"\zeta(3)", r"\frac{2"):
        assert piece in latex


def test_e1_is_divergent_and_points_to_kronecker():
    with pytest.raises(DivergentGraphError, match="Kronecker"):
        parse("E(1)")
    with pytest.raises(DivergentGraphError, match="weight 1"):
        parse("graph(0-0, 0-1, 0-1)")


MALFORMED = [
    ("", 1), ("   ", 4), ("E(", 3), ("E(2", 4), ("E 2", 3), ("E()", 3), ("E(2,3)", 1),
    ("C(1)", 1), ("C(1,1", 6), ("C(1,-1,1)", 1), ("C(0,1,1)", 1), ("C(1.5,1,1)", 3),
    ("zeta(1)", 1), ("zeta(x)", 6), ("zeta(3", 7), ("2 +", 4), ("* E(2)", 1), ("E(2) E(3) )", 11),
    ("(E(2)", 6), ("E(2))", 5), ("foo(3)", 1), ("E(2)/E(3)", 6), ("E(2)^(1/2)", 6),
    ("E(2)^-1", 6), ("1/0", 3), ("graph()", 7), ("graph(0-)", 9), ("graph(0-1:0)", 11),
    ("graph(0 1)", 9), ("graph(0-1:x)", 11), ("E(2) $ 3", 6), ("theta(5,0,0)", 1),
    ("spin(1,0,0)", 1), ("ellgenus(5,0,0)", 1), ("theta(2,x,0)", 9), ("E(2)^", 6),
    ("laplace()", 9), ("eta(1)", 5), ("E(2.5)", 3), ("2..5", 2),
]


@pytest.mark.parametrize("text,column", MALFORMED)
def test_malformed_expressions_name_the_column(text, column):
    with pytest.raises(LedgerError) as info:
        parse(text)
    message = str(info.value)
    assert "\n" not in message
    if isinstance(info.value, ExpressionError):
        assert info.value.column == column, message
        assert message.startswith(f"column {column}:")
