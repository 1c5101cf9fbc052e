"""Property-based round trips: print, parse, compare (hypothesis)."""

from hypothesis import given, settings, strategies as st

from ledger.expr import parse, to_latex, to_text, to_unicode

weights = st.integers(min_value=1, max_value=4)
atoms = st.one_of(
    st.integers(min_value=2, max_value=7).map(lambda s: f"E({s})"),
    st.lists(weights, min_size=3, max_size=5).map(lambda w: "C(" + ",".join(map(str, w)) + ")"),
    st.sampled_from([3, 5, 7, 9]).map(lambda n: f"zeta({n})"),
    st.fractions(min_value=-20, max_value=20, max_denominator=12).map(lambda f: f"({f})"),
    st.just("pi"),
    st.just("graph(0-1, 0-2, 0-3, 1-2, 1-3, 2-3)"),
    st.just("graph(0-1, 0-1, 1-2, 1-2, 2-0, 0-2:2)"),
)


def combine(children):
    return st.one_of(
        st.tuples(children, children).map(lambda p: f"{p[0]} + {p[1]}"),
        st.tuples(children, children).map(lambda p: f"{p[0]} - {p[1]}"),
        st.tuples(children, children).map(lambda p: f"({p[0]})*({p[1]})"),
        st.tuples(children, st.integers(0, 3)).map(lambda p: f"({p[0]})^{p[1]}"),
        children.map(lambda c: f"-({c})"),
        children.map(lambda c: f"laplace({c})"),
    )


expressions = st.recursive(atoms, combine, max_leaves=6)


@settings(max_examples=150, deadline=None)
@given(expressions)
def test_print_parse_compare(text):
    expr = parse(text)
    assert parse(to_text(expr)) == expr
    assert to_unicode(expr)
    assert to_latex(expr)
