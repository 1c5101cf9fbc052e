"""Operators D^{2k}R^4, their alpha' orders and the sigma_2^p sigma_3^q basis.

The four-graviton coefficients are symmetric polynomials in the Mandelstams
s, t, u with s + t + u = 0, hence polynomials in sigma_2 and sigma_3, where
sigma_k = s^k + t^k + u^k.  A monomial sigma_2^p sigma_3^q has weight
w = 2p + 3q; it multiplies the operator D^{2w}R^4, which appears at
alpha'^(3+w) relative to the Einstein-Hilbert term.  There is no structure
of weight 1 (sigma_1 = 0), so there is no D^2R^4.

>>> op = parse_operator("D^12R^4")
>>> op.label, op.alpha_order, [format_structure(s) for s in op.structures]
('D^12R^4', 9, ['sigma2^3', 'sigma3^2'])
>>> parse_structure("sigma2 sigma3")
Structure(p=1, q=1)
"""

from __future__ import annotations

import math
import re
from dataclasses import dataclass
from fractions import Fraction

from ledger.errors import LedgerError

# A homogeneous polynomial in (s, t) after u = -s - t: {power of s: coefficient};
# the power of t is the degree minus the power of s.
BinaryForm = dict[int, Fraction]


@dataclass(frozen=True, order=True)
class Structure:
    """The kinematic structure sigma_2^p sigma_3^q / (p! q!)."""

    p: int
    q: int

    @property
    def weight(self) -> int:
        return 2 * self.p + 3 * self.q


@dataclass(frozen=True)
class Operator:
    """The operator D^{2w}R^4 of weight w (R^4 for w = 0)."""

    weight: int

    def __post_init__(self):
        if not isinstance(self.weight, int) or self.weight < 0:
            raise LedgerError(f"an operator weight must be a non-negative integer, got {self.weight!r}")
        if self.weight == 1:
            raise LedgerError("there is no D^2R^4 term: sigma_1 = s + t + u = 0 leaves no "
                              "kinematic structure of weight 1")

    @property
    def label(self) -> str:
        return "R^4" if self.weight == 0 else f"D^{2 * self.weight}R^4"

    @property
    def alpha_order(self) -> int:
        """The power of alpha' relative to the Einstein-Hilbert term."""
        return 3 + self.weight

    @property
    def structures(self) -> tuple[Structure, ...]:
        return structures_of_weight(self.weight)


def structures_of_weight(weight: int) -> tuple[Structure, ...]:
    """All (p, q) with 2p + 3q = weight, by increasing q.

    >>> structures_of_weight(6)
    (Structure(p=3, q=0), Structure(p=0, q=2))
    >>> structures_of_weight(1)
    ()
    """
    return tuple(Structure((weight - 3 * q) // 2, q)
                 for q in range(weight // 3 + 1) if (weight - 3 * q) % 2 == 0)


def structures_through(max_weight: int) -> tuple[Structure, ...]:
    """All structures of weight <= max_weight, ordered by weight then q."""
    return tuple(s for w in range(max_weight + 1) for s in structures_of_weight(w))


def operator_for(structure: Structure) -> Operator:
    return Operator(structure.weight)


_OPERATOR = re.compile(r"^(?:D\^\{?(?P<power>\d+)\}?)?R\^\{?4\}?$")


def parse_operator(text: str) -> Operator:
    """Parse 'R^4', 'D^4R^4', 'D^{10} R^4', ...

    >>> parse_operator("D^4 R^4").weight
    2
    >>> parse_operator("D^2R^4")  # doctest: +IGNORE_EXCEPTION_DETAIL
    Traceback (most recent call last):
    LedgerError: there is no D^2R^4 term: ...
    """
    match = _OPERATOR.match("".join(str(text).split()))
    if not match:
        raise LedgerError(f"not an operator label: {text!r}; expected R^4 or D^<2k>R^4 such as D^4R^4")
    power = match.group("power")
    if power is None:
        return Operator(0)
    if int(power) % 2:
        raise LedgerError(f"{text!r}: the number of derivatives in D^<2k>R^4 must be even")
    return Operator(int(power) // 2)


_SIGMA_FACTOR = re.compile(r"(?:sigma_?|σ_?)(?P<k>[23])(?:\^\{?(?P<n>\d+)\}?)?")


def parse_structure(text: str) -> Structure:
    """Parse 'sigma2^2', 'sigma2 sigma3', 'sigma_3^2', 'σ2σ3' or '1'.

    >>> parse_structure("sigma3^2")
    Structure(p=0, q=2)
    """
    compact = "".join(str(text).split()).replace("*", "")
    if compact == "1":
        return Structure(0, 0)
    powers = {"2": 0, "3": 0}
    position = 0
    while position < len(compact):
        match = _SIGMA_FACTOR.match(compact, position)
        if not match:
            raise LedgerError(f"not a sigma structure: {text!r}; expected a product such as "
                              "'sigma2^2 sigma3', or '1'")
        powers[match.group("k")] += int(match.group("n") or 1)
        position = match.end()
    if not compact:
        raise LedgerError("empty sigma structure; use '1' for R^4")
    return Structure(powers["2"], powers["3"])


def format_structure(structure: Structure) -> str:
    """'sigma2^p sigma3^q' without unit powers; '1' for p = q = 0.

    >>> format_structure(Structure(1, 1))
    'sigma2 sigma3'
    """
    parts = []
    for name, n in (("sigma2", structure.p), ("sigma3", structure.q)):
        if n:
            parts.append(name if n == 1 else f"{name}^{n}")
    return " ".join(parts) or "1"


def mandelstam_form(s_power: int, t_power: int, u_power: int) -> BinaryForm:
    """s^a t^b u^c with u = -s - t, as a binary form in (s, t).

    >>> mandelstam_form(0, 0, 2) == {2: 1, 1: 2, 0: 1}
    True
    """
    form: BinaryForm = {}
    sign = -1 if u_power % 2 else 1
    for j in range(u_power + 1):  # (s + t)^c = sum_j binom(c, j) s^j t^(c-j)
        key = s_power + j
        form[key] = form.get(key, Fraction(0)) + sign * math.comb(u_power, j)
    return form


def _multiply(a: BinaryForm, b: BinaryForm) -> BinaryForm:
    product: BinaryForm = {}
    for i, x in a.items():
        for j, y in b.items():
            product[i + j] = product.get(i + j, Fraction(0)) + x * y
    return product


def structure_form(structure: Structure) -> BinaryForm:
    """sigma_2^p sigma_3^q / (p! q!) as a binary form in (s, t)."""
    sigma2 = {2: Fraction(2), 1: Fraction(2), 0: Fraction(2)}  # 2(s^2 + s t + t^2)
    sigma3 = {2: Fraction(-3), 1: Fraction(-3)}  # 3 s t u = -3 s^2 t - 3 s t^2
    form: BinaryForm = {0: Fraction(1)}
    for factor, n in ((sigma2, structure.p), (sigma3, structure.q)):
        for _ in range(n):
            form = _multiply(form, factor)
    scale = Fraction(1, math.factorial(structure.p) * math.factorial(structure.q))
    return {k: v * scale for k, v in form.items() if v}


def sigma_coordinates(form: BinaryForm, degree: int) -> dict[Structure, Fraction]:
    """Write a symmetric binary form of the given degree in the basis sigma_2^p sigma_3^q/(p! q!).

    Raises ``ValueError`` if the form is not symmetric under permutations of s, t, u.

    >>> sigma_coordinates(mandelstam_form(2, 0, 0), 2)  # s^2 alone is not symmetric
    Traceback (most recent call last):
    ...
    ValueError: the polynomial is not symmetric in s, t, u
    >>> sigma_coordinates({2: Fraction(2), 1: Fraction(2), 0: Fraction(2)}, 2)
    {Structure(p=1, q=0): Fraction(1, 1)}
    """
    basis = structures_of_weight(degree)
    remainder = {k: Fraction(v) for k, v in form.items() if v}
    coordinates: dict[Structure, Fraction] = {}
    # sigma_3^q contains s t (s+t) to the q-th power: its lowest power of t is q and
    # its coefficient of s^(degree-q) t^q is (-3)^q/q! times 2^p/p!, nonzero; eliminate
    # by increasing q (the basis is triangular in this order).
    for structure in basis:
        pivot_form = structure_form(structure)
        pivot = degree - structure.q
        coefficient = remainder.get(pivot, Fraction(0)) / pivot_form[pivot]
        if coefficient:
            coordinates[structure] = coefficient
            for k, v in pivot_form.items():
                remainder[k] = remainder.get(k, Fraction(0)) - coefficient * v
        remainder = {k: v for k, v in remainder.items() if v}
    if remainder:
        raise ValueError("the polynomial is not symmetric in s, t, u")
    return coordinates
