"""Multiple zeta values and the single-valued zeta basis used to identify coefficients.

References: Euler's and the standard MZV evaluations (handbook formulas), mpmath's
zeta as the reference library, and the stuffle product (common practice).
"""

import mpmath
import pytest
import sympy

from ledger.mgf.mzv import MZVEvaluator
from ledger.mgf.zeta_basis import (
    COMPLETE_THROUGH_WEIGHT, identify_in_basis, odd_zeta_partitions, weight_basis, zeta_sv,
)

REF = mpmath.MPContext()
REF.dps = 120


@pytest.fixture(scope="module")
def mzv():
    return MZVEvaluator(100)


def close(a, b, digits=100):
    return abs(REF.convert(a) - REF.convert(b)) < REF.mpf(10) ** (-digits)


@pytest.mark.parametrize("n", [2, 3, 5, 8, 11])
def test_depth_one_is_riemann_zeta(mzv, n):
    # reference: mpmath.zeta
    assert close(mzv.zeta((n,)), REF.zeta(n))


def test_classical_evaluations(mzv):
    # Euler: zeta(2,1) = zeta(3); zeta(3,1) = pi^4/360; zeta({2}^3) = pi^6/7!  (handbook, from memory)
    assert close(mzv.zeta((2, 1)), REF.zeta(3))
    assert close(mzv.zeta((3, 1)), REF.pi ** 4 / 360)
    assert close(mzv.zeta((2, 2, 2)), REF.pi ** 6 / REF.factorial(7))
    # Euler's sum zeta(2,1,1) = zeta(4) (duality), zeta(4,1) = 2 zeta(5) - zeta(2) zeta(3)
    assert close(mzv.zeta((2, 1, 1)), REF.zeta(4))
    assert close(mzv.zeta((4, 1)), 2 * REF.zeta(5) - REF.zeta(2) * REF.zeta(3))


@pytest.mark.parametrize("a,b", [(3, 5), (2, 7), (4, 4)])
def test_stuffle(mzv, a, b):
    # zeta(a) zeta(b) = zeta(a,b) + zeta(b,a) + zeta(a+b)  (common practice)
    assert close(mzv.zeta((a,)) * mzv.zeta((b,)), mzv.zeta((a, b)) + mzv.zeta((b, a)) + mzv.zeta((a + b,)), 95)


def test_two_precisions_agree():
    low, high = MZVEvaluator(40), MZVEvaluator(80)
    for word in [(3, 5, 3), (5, 3), (2, 1, 1, 1, 1), (6, 2, 3)]:
        assert abs(REF.convert(low.zeta(word)) - REF.convert(high.zeta(word))) < REF.mpf(10) ** -45


def test_odd_zeta_partitions():
    assert odd_zeta_partitions(12) == [(9, 3), (7, 5), (3, 3, 3, 3)]
    assert odd_zeta_partitions(4) == [] and odd_zeta_partitions(0) == [()]


def test_basis_completeness_flags():
    # through weight 10 products of odd zetas span the single-valued MZVs; at 11 the
    # irreducible zeta_sv(3,5,3) joins (F. Brown 2013; O. Schlotterer, S. Stieberger 2012)
    assert weight_basis(10).complete and weight_basis(11).complete
    assert not weight_basis(11, include_irreducible=False).complete
    assert not weight_basis(COMPLETE_THROUGH_WEIGHT + 1).complete
    assert zeta_sv(3, 5, 3) in [e.expr for e in weight_basis(11).elements]


def test_identifies_a_product_and_refuses_without_the_irreducible():
    target = lambda ev: (3 * ev.zeta((11,)) - ev.zeta((3, 5, 3)) + ev.zeta((3,)) * ev.zeta((5, 3))) / 7
    found = identify_in_basis(target, weight_basis(11))
    # 2 zeta(3,5,3) - 2 zeta(3) zeta(5,3) = zeta_sv(3,5,3) + 10 zeta(3)^2 zeta(5)
    expected = (3 * sympy.zeta(11) - (zeta_sv(3, 5, 3) + 10 * sympy.zeta(3) ** 2 * sympy.zeta(5)) / 2) / 7
    assert sympy.simplify(found.exact - expected) == 0
    refused = identify_in_basis(target, weight_basis(11, include_irreducible=False))
    assert refused.exact is None and refused.error < 1e-60


def test_incomplete_basis_never_gives_an_exact_form():
    # weight 13 is beyond COMPLETE_THROUGH_WEIGHT: even a plain zeta(13) stays a decimal
    found = identify_in_basis(lambda ev: ev.zeta((13,)), weight_basis(13))
    assert found.exact is None and abs(found.value - mpmath.zeta(13)) < 1e-60


def test_zero_is_identified_and_noise_is_not():
    assert identify_in_basis(lambda ev: ev.ctx.mpf(0), weight_basis(6)).exact == 0
    noise = identify_in_basis(lambda ev: ev.ctx.pi ** 6 / 945 + ev.zeta((3,)) ** 2, weight_basis(6))
    assert noise.exact is None  # pi^6 is not single-valued: no relation, no exact form


def test_zeta_sv_evaluates():
    value = sympy.N(zeta_sv(3, 5, 3), 30)
    ev = MZVEvaluator(40)
    reference = 2 * ev.zeta((3, 5, 3)) - 2 * ev.zeta((3,)) * ev.zeta((5, 3)) - 10 * ev.zeta((3,)) ** 2 * ev.zeta((5,))
    assert abs(REF.mpf(str(value)) - REF.convert(reference)) < 1e-28
