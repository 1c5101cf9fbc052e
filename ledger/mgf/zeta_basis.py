"""Bases of single-valued zeta values by weight, and their identification.

The coefficient of y^(w-j) in the Laurent polynomial of a modular graph
function of weight w is a single-valued multiple zeta value of weight j.
Through weight 10 these are spanned by products of odd zeta values; at
weight 11 the irreducible zeta_sv(3,5,3) joins (it is not a polynomial in
odd zetas), weight 12 needs nothing new, and from weight 13 further
irreducibles appear that this module does not provide: a basis there is
marked incomplete and never yields an exact form.

zeta_sv(3,5,3) = 2 zeta(3,5,3) - 2 zeta(3) zeta(5,3) - 10 zeta(3)^2 zeta(5)
(from memory: F. Brown 2013, arXiv:1309.5309; O. Schlotterer, S. Stieberger
2012, arXiv:1205.1516, written there with increasing summation indices; in
the decreasing convention of ledger.mgf.mzv, zeta(5,3) = sum_{n1>n2} n1^-5 n2^-3).

>>> [e.label for e in weight_basis(9).elements]
['zeta(9)', 'zeta(3)^3']
>>> weight_basis(11).complete, weight_basis(11, include_irreducible=False).complete
(True, False)
>>> b = weight_basis(6)
>>> found = identify_in_basis(lambda ev: 3 * ev.zeta((3,)) ** 2 / 7, b)
>>> found.exact
3*zeta(3)**2/7
"""

from __future__ import annotations

from dataclasses import dataclass
from fractions import Fraction
from typing import Callable, Optional

import mpmath
import sympy

from ledger.mgf.mzv import MZVEvaluator

COMPLETE_THROUGH_WEIGHT = 12
SPARE_DIGITS = 20  # digits of agreement beyond what the relation itself uses


class zeta_sv(sympy.Function):  # noqa: N801 - the printed name is the trade notation
    """Single-valued multiple zeta value zeta_sv(s1, ..., sk); only (3, 5, 3) is known here."""

    def _eval_evalf(self, prec):
        indices = tuple(int(a) for a in self.args)
        if indices != (3, 5, 3):
            return None
        evaluator = MZVEvaluator(int(prec * 0.30103) + 10)
        return sympy.Float(mpmath.nstr(_zeta_sv_353(evaluator), evaluator.digits + 5),
                           int(prec * 0.30103) + 5)


def _zeta_sv_353(ev: MZVEvaluator):
    z3 = ev.zeta((3,))
    return 2 * ev.zeta((3, 5, 3)) - 2 * z3 * ev.zeta((5, 3)) - 10 * z3 ** 2 * ev.zeta((5,))


@dataclass(frozen=True)
class BasisElement:
    """A product of odd zeta values, optionally times zeta_sv(3,5,3)."""

    odd_zetas: tuple  # e.g. (5, 3, 3) for zeta(3)^2 zeta(5)
    with_sv353: bool = False

    @property
    def weight(self) -> int:
        return sum(self.odd_zetas) + (11 if self.with_sv353 else 0)

    @property
    def expr(self):
        result = sympy.Integer(1)
        for s in self.odd_zetas:
            result *= sympy.zeta(s)
        if self.with_sv353:
            result *= zeta_sv(3, 5, 3)
        return result

    @property
    def label(self) -> str:
        return str(self.expr).replace("**", "^")

    def value(self, ev: MZVEvaluator):
        result = ev.ctx.mpf(1)
        for s in self.odd_zetas:
            result *= ev.zeta((s,))
        if self.with_sv353:
            result *= _zeta_sv_353(ev)
        return result


@dataclass(frozen=True)
class WeightBasis:
    weight: int
    elements: tuple
    complete: bool  # True when every single-valued MZV of this weight is in the span


def odd_zeta_partitions(weight: int, largest: Optional[int] = None) -> list:
    """Partitions of ``weight`` into odd parts >= 3, largest part first.

    >>> odd_zeta_partitions(11)
    [(11,), (5, 3, 3)]
    """
    if largest is None:
        largest = weight
    if weight == 0:
        return [()]
    result = []
    for part in range(min(weight, largest), 2, -1):
        if part % 2 == 1:
            result.extend((part,) + rest for rest in odd_zeta_partitions(weight - part, part))
    return result


def weight_basis(weight: int, include_irreducible: bool = True) -> WeightBasis:
    """The basis of single-valued zeta values of ``weight`` known to this module."""
    elements = [BasisElement(p) for p in odd_zeta_partitions(weight)]
    if include_irreducible and weight >= 11:
        elements += [BasisElement(p, True) for p in odd_zeta_partitions(weight - 11)]
    complete = weight <= 10 or (include_irreducible and weight <= COMPLETE_THROUGH_WEIGHT)
    return WeightBasis(weight, tuple(elements), complete)


@dataclass(frozen=True)
class Identification:
    """The outcome of matching a number against a basis.

    ``exact`` is the sympy form when the relation was found with
    ``spare_digits`` to spare and confirmed at ``confirmed_digits``, else None;
    ``value``/``error`` always hold the number itself (global-context mpf).
    """

    exact: object
    value: object
    error: object
    spare_digits: float
    confirmed_digits: int


def identify_in_basis(compute: Callable, basis: WeightBasis, digits: tuple = (80, 120)
                      ) -> Identification:
    """Identify the number ``compute(evaluator)`` in ``basis``.

    ``compute`` receives an :class:`MZVEvaluator` and returns an mpf of its
    context, or a pair (mpf, absolute error bound).  The integer relation is
    searched at ``digits[0]`` and must leave :data:`SPARE_DIGITS` unused
    digits; it is then re-checked at ``digits[1]``.  An incomplete basis
    never yields an exact form.
    """
    first, second = digits
    x1, err1, ev1 = _computed(compute, first)
    relation, spare = _relation(x1, err1, basis, ev1)
    value, error = mpmath.mpf(x1), mpmath.mpf(err1)
    if relation is None or not basis.complete or spare < SPARE_DIGITS:
        return Identification(None, value, error, spare, 0)
    x2, err2, ev2 = _computed(compute, second)
    if not _holds(relation, x2, err2, basis, ev2):
        return Identification(None, mpmath.mpf(x2), mpmath.mpf(err2), spare, 0)
    head, rest = relation[0], relation[1:]
    exact = sympy.Add(*(sympy.Rational(-r, head) * e.expr
                        for r, e in zip(rest, basis.elements) if r))
    return Identification(exact, mpmath.mpf(x2), mpmath.mpf(err2), spare, second)


def _computed(compute, digits):
    ev = MZVEvaluator(digits)
    out = compute(ev)
    if isinstance(out, tuple):
        x, err = out
    else:
        x, err = out, ev.ctx.mpf(10) ** (-digits) * max(1, abs(out))
    return ev.ctx.mpf(x), ev.ctx.mpf(err), ev


def _relation(x, err, basis: WeightBasis, ev: MZVEvaluator):
    """(integer relation [r0, r1, ...] with r0 != 0, spare digits) or (None, 0)."""
    ctx = ev.ctx
    size = max(abs(x), ctx.mpf(1))
    tolerance = max(err * 10, ctx.mpf(10) ** (-ev.digits + 5) * size)
    available = -float(ctx.log10(tolerance / size))
    if abs(x) <= tolerance:
        return [1] + [0] * len(basis.elements), available
    if not basis.elements:
        return None, 0.0
    values = [x] + [e.value(ev) for e in basis.elements]
    with ctx.workdps(ev.digits):
        relation = ctx.pslq(values, tol=tolerance / size, maxcoeff=10 ** int(available / 2),
                            maxsteps=20000)
    if relation is None or relation[0] == 0:
        return None, 0.0
    if relation[0] < 0:
        relation = [-r for r in relation]
    used = sum(float(mpmath.log10(abs(r) + 1)) for r in relation)
    return relation, available - used


def _holds(relation, x, err, basis: WeightBasis, ev: MZVEvaluator) -> bool:
    ctx = ev.ctx
    values = [x] + [e.value(ev) for e in basis.elements]
    residual = abs(sum(r * v for r, v in zip(relation, values)))
    scale = max(abs(r * v) for r, v in zip(relation, values))
    return residual <= abs(relation[0]) * err * 10 + ctx.mpf(10) ** (-ev.digits + 5) * scale


def rational_combination_value(terms: dict, ev: MZVEvaluator):
    """sum c * zeta(word) for {word: Fraction} (empty word = 1), with an error bound."""
    ctx = ev.ctx
    total = ctx.mpf(0)
    weight = ctx.mpf(0)
    for word, c in terms.items():
        c = Fraction(c)
        size = ctx.mpf(c.numerator) / c.denominator
        total += size * ev.zeta(word) if word else size
        weight += abs(size)
    # each zeta value is within 10^-(digits+5) (MZVEvaluator); a rounding per term
    return total, weight * ctx.mpf(10) ** (-ev.digits - 5) + len(terms) * ctx.eps * weight
