"""Reference checks of the genus-one expansion B_(p,q)(tau)."""

from __future__ import annotations

from fractions import Fraction

import pytest

from ledger.amplitudes.genus_one import _weight_forms, expand_genus_one, genus_one_coefficients
from ledger.amplitudes.operators import Structure, structures_through
from ledger.errors import LedgerError
from ledger.expr import parse
from ledger.mgf.jobs import Cancelled, Job


def _equal(expr, text):
    return (expr - parse(text)).expand() == 0


def test_constant_term_is_one_with_normalised_measure():
    # B_(0,0) = 1: the torus measure is normalised (common practice).
    assert expand_genus_one(0).coefficients == {Structure(0, 0): {(): Fraction(1)}}


def test_no_weight_one_structure():
    # sigma_1 = s + t + u = 0, so there is no weight-1 term (common practice).
    assert [s.weight for s in expand_genus_one(7).coefficients] == [
        s.weight for s in structures_through(7)]
    assert 1 not in {s.weight for s in expand_genus_one(7).coefficients}
    # and the weight-1 part of the integrand itself, sum s_ij G_ij, integrates to zero
    assert _weight_forms(1, {}) == {}


def test_d4r4_is_e2():
    # B_(1,0) = E_2: Green, Russo, Vanhove 2008, arXiv:0801.0322; D'Hoker, Green, Vanhove
    # 2015, arXiv:1502.06698 (from memory).
    raw = genus_one_coefficients(2)
    assert _equal(raw[Structure(1, 0)], "E(2)")


def test_d6r4_raw_and_reduced():
    # B_(0,1) = (5 E_3 + zeta(3))/3: Green, Russo, Vanhove 2008, arXiv:0801.0322; D'Hoker,
    # Green, Vanhove 2015, arXiv:1502.06698 (from memory).  The raw form keeps C(1,1,1):
    # sigma_3/3 C(1,1,1) from G_ij^3 and 4 s t u E_3 from the four triangles of K_4.
    raw = genus_one_coefficients(3)[Structure(0, 1)]
    assert _equal(raw, "C(1,1,1)/3 + 4/3*E(3)")
    reduced = genus_one_coefficients(3, reduce=True)[Structure(0, 1)]
    assert _equal(reduced, "(5*E(3) + zeta(3))/3")


def test_d8r4_reduced():
    # B_(2,0) = 2 C_{2,1,1} + E_2^2 - E_4: D'Hoker, Green, Vanhove 2015, arXiv:1502.06698
    # (from memory); raw form by hand: sigma_2^2/24 C(1,1,1,1) from G_ij^4, 3/8 sigma_2^2 E_2^2
    # from pairs of doubled edges, 1/4 sigma_2^2 E_4 from the three 4-cycles (the doubled
    # triangles cancel since s + t + u = 0).
    raw = genus_one_coefficients(4)[Structure(2, 0)]
    assert _equal(raw, "C(1,1,1,1)/12 + 3/4*E(2)^2 + E(4)/2")
    reduced = genus_one_coefficients(4, reduce=True)[Structure(2, 0)]
    assert _equal(reduced, "2*C(2,1,1) + E(2)^2 - E(4)")


def test_tetrahedral_graph_coefficient_at_weight_six():
    # The complete graph K_4 arises once, from prod_{i<j} G_ij with monomial
    # (s t u)^2 = sigma_3^2/9, i.e. 2/9 in the basis sigma_3^2/2! (derived by hand).
    raw = genus_one_coefficients(6)[Structure(0, 2)]
    k4 = parse("graph(0-1, 0-2, 0-3, 1-2, 1-3, 2-3)")
    assert raw.coeff(k4) == parse("2/9")


def test_weight_seven_works_and_is_exact():
    expansion = expand_genus_one(7)
    assert set(expansion.coefficients) == {Structure(2, 1)} | set(expand_genus_one(6).coefficients)
    assert all(isinstance(c, Fraction) for b in expansion.coefficients.values() for c in b.values())


@pytest.mark.parametrize("order", [-1, 11, 2.5, "3", True])
def test_bad_order_is_rejected(order):
    with pytest.raises(LedgerError, match="order"):
        expand_genus_one(order)


def test_progress_and_cancellation():
    seen = []
    expand_genus_one(4, Job(on_progress=lambda f, m: seen.append(f)))
    assert seen[-1] == 1.0 and seen == sorted(seen)
    job = Job()
    job.cancel()
    with pytest.raises(Cancelled):
        expand_genus_one(4, job)
