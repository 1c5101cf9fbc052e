"""Exact constant-term extraction for dihedral graphs C(a1, ..., ar).

Derivation (our own; conventions of DESIGN.md, y = pi tau2).  Impose the
conservation of n with one Fourier variable u in [0, 1):

    C = sum_{m1+...+mr=0} int_0^1 du prod_i K_{a_i}(m_i, u),
    K_a(m, u) = sum_{n, (m,n) != 0} e^{2 pi i n u} (tau2/pi)^a / |m tau + n|^(2a).

For m = 0 the kernel is c_a y^a B_{2a}(u), c_a = (-1)^(a+1) 4^a / (2a)!.
For m != 0, Poisson summation in n gives terms labelled by an integer k with
a phase e^{-2 pi i (u-k) m tau1} and size e^{-2 pi |u-k| |m| tau2}.  The
tau1-average forces sum k_i m_i = 0, and only k_i = 0 near u = 0 (or k_i = 1
near u = 1, the mirror image) escapes exponential suppression, so with
u = v/y the power-law part is

    C_laurent = c y^w int_0^1 prod_i B_{2a_i}(u) du
              + 2 sum_{N} sum_m y^-1 int_0^inf dv prod_{i in Z} c_{a_i} y^{a_i} B_{2a_i}(v/y)
                                               prod_{i in N} y^(1-a_i) g_{a_i}(v, |m_i|),

N = the edges with m_i != 0 (|N| >= 2), Z the others, and
g_a(v, mu) = 2 e^{-2 v mu} / ((a-1)! 2^(2a-1) mu^(2a-1))
             sum_{k<a} (2a-2-k)! / (k! (a-1-k)!) (4 v mu)^k
(the Fourier transform of (t^2 + c^2)^-a).  The v-integral leaves lattice
sums over m_i != 0 with sum m_i = 0 of prod |m_i|^-alpha_i (sum |m_i|)^-beta.
Splitting the m_i by sign into two compositions of the same T >= 1, each
composition sum is a combination of T^-p S_u(T-1) (nested harmonic sums, by
partial fractions), their product is a stuffle, and sum_T T^-q S_u(T-1) =
zeta(q, u): every coefficient is an exact rational combination of
convergent multiple zeta values.

>>> terms = dihedral_laurent_mzv((1, 1))   # C(1,1) = E(2) = y^2/45 + zeta(3)/y
>>> terms[2]
{(): Fraction(1, 45)}
>>> terms[-1]
{(3,): Fraction(1, 1)}
"""

from __future__ import annotations

import itertools
from fractions import Fraction
from functools import lru_cache
from math import comb, factorial

import sympy

from ledger.mgf.bernoulli import bernoulli_polynomial, poly_integral_01, poly_mul
from ledger.mgf.values import Value
from ledger.mgf.zeta_basis import identify_in_basis, rational_combination_value, weight_basis

Word = tuple  # index word of a nested sum / multiple zeta value


def dihedral_laurent(weights: tuple, digits: int = 30, job=None):
    """The Laurent polynomial of C(weights), exact wherever the coefficient is
    identified in the single-valued zeta basis (see :mod:`ledger.mgf.zeta_basis`).

    >>> print(dihedral_laurent((1, 1, 1)).to_text())
    2*y^3/945 + zeta(3) + 3*zeta(5)/(4*y^2)
    """
    from ledger.mgf.laurent import LaurentPolynomial

    weights = tuple(sorted((int(a) for a in weights), reverse=True))
    return LaurentPolynomial(_dihedral_terms(weights, digits), digits)


@lru_cache(maxsize=512)
def _dihedral_terms(weights: tuple, digits: int) -> tuple:
    """((power, exact sympy or Value), ...) for C(weights), highest power first."""
    w = sum(weights)
    terms = []
    for power, combination in sorted(dihedral_laurent_mzv(weights).items(), reverse=True):
        coefficient = _identified(combination, w - power, digits)
        if coefficient != 0:
            terms.append((power, coefficient))
    return tuple(terms)


def _identified(combination: dict, weight: int, digits: int):
    """Exact form of sum c*zeta(word), or a Value when it cannot be made exact."""
    if all(len(word) <= 1 for word in combination):
        return sympy.expand(sum((sympy.Rational(c.numerator, c.denominator)
                                 * (sympy.zeta(word[0]) if word else 1)
                                 for word, c in combination.items()), sympy.Integer(0)))
    first = max(80, digits + 30)
    found = identify_in_basis(lambda ev: rational_combination_value(combination, ev),
                              weight_basis(weight), (first, first + 40))
    if found.exact is not None:
        return found.exact
    return Value(found.value, found.error, digits)


def dihedral_laurent_mzv(weights: tuple, job=None) -> dict:
    """{power of y: {mzv index word: rational}} for C(weights); the empty word is 1.

    Powers run from w = sum(weights) down to 1 - w; zero terms are omitted.
    """
    weights = tuple(int(a) for a in weights)
    sums = _CompositionSums()
    result: dict = {}
    w = sum(weights)
    leading = Fraction(1)
    poly = [Fraction(1)]
    for a in weights:
        leading *= bernoulli_kernel_constant(a)
        poly = poly_mul(poly, bernoulli_polynomial(2 * a))
    _accumulate(result, w, (), leading * poly_integral_01(poly))
    r = len(weights)
    sectors = [n for size in range(2, r + 1) for n in itertools.combinations(range(r), size)]
    for index, sector in enumerate(sectors):
        if job is not None:
            job.report(index / len(sectors), f"constant term, sector {index + 1}/{len(sectors)}")
        _add_sector(result, weights, sector, sums)
    return {p: {word: c for word, c in terms.items() if c} for p, terms in result.items()
            if any(terms.values())}


def bernoulli_kernel_constant(a: int) -> Fraction:
    """c_a in sum_{n != 0} (tau2/pi)^a e^{2 pi i n u}/n^(2a) = c_a y^a B_{2a}(u)."""
    return Fraction((-1) ** (a + 1) * 4 ** a, factorial(2 * a))


def _poisson_kernel_terms(a: int) -> list:
    """[(k, gamma)]: g_a(v, mu) = sum_k gamma v^k mu^(k-2a+1) e^{-2 v mu}."""
    return [(k, Fraction(2 * factorial(2 * a - 2 - k) * 4 ** k,
                         factorial(a - 1) * 2 ** (2 * a - 1) * factorial(k) * factorial(a - 1 - k)))
            for k in range(a)]


def _add_sector(result: dict, weights: tuple, sector: tuple, sums: "_CompositionSums") -> None:
    zero_edges = [i for i in range(len(weights)) if i not in sector]
    prefactor = Fraction(2)
    bern = [Fraction(1)]
    for i in zero_edges:
        prefactor *= bernoulli_kernel_constant(weights[i])
        bern = poly_mul(bern, bernoulli_polynomial(2 * weights[i]))
    base_power = -1 + sum(weights[i] for i in zero_edges) + sum(1 - weights[i] for i in sector)
    kernels = [_poisson_kernel_terms(weights[i]) for i in sector]
    for choice in itertools.product(*kernels):
        k_total = sum(k for k, _ in choice)
        gamma = Fraction(1)
        for _, g in choice:
            gamma *= g
        alphas = tuple(2 * weights[i] - 1 - k for i, (k, _) in zip(sector, choice))
        for j, beta_j in enumerate(bern):
            if not beta_j:
                continue
            n = j + k_total
            # int_0^inf v^n e^{-2 v M} dv = n!/(2M)^(n+1), M = 2T
            coefficient = prefactor * beta_j * gamma * factorial(n) / Fraction(4) ** (n + 1)
            lattice = sums.signed_conservation_sum(alphas, n + 1)
            power = base_power - j
            for word, c in lattice.items():
                _accumulate(result, power, word, coefficient * c)


def _accumulate(result: dict, power: int, word: Word, value: Fraction) -> None:
    bucket = result.setdefault(power, {})
    bucket[word] = bucket.get(word, Fraction(0)) + value


class _CompositionSums:
    """Exact reduction of composition sums to nested harmonic sums (memoised)."""

    def __init__(self):
        self._compositions: dict = {}
        self._convolutions: dict = {}
        self._signed: dict = {}

    def signed_conservation_sum(self, alphas: tuple, beta: int) -> dict:
        """sum over m_i != 0, sum m_i = 0, of prod |m_i|^-alpha_i / T^beta,
        T = the sum of the positive m_i, as {mzv word: rational}."""
        key = (tuple(sorted(alphas)), beta)
        if key in self._signed:
            return self._signed[key]
        total: dict = {}
        r = len(alphas)
        for mask in range(1, 2 ** r - 1):
            positive = tuple(sorted(alphas[i] for i in range(r) if mask >> i & 1))
            negative = tuple(sorted(alphas[i] for i in range(r) if not mask >> i & 1))
            for (p, u), c in self.composition(positive).items():
                for (q, v), d in self.composition(negative).items():
                    for word, e in stuffle(u, v).items():
                        full = (p + q + beta,) + word
                        total[full] = total.get(full, Fraction(0)) + c * d * e
        self._signed[key] = total
        return total

    def composition(self, alphas: tuple) -> dict:
        """A(T) = sum over m_i >= 1 with sum m_i = T of prod m_i^-alpha_i,
        as {(p, u): c} meaning sum c T^-p S_u(T-1)."""
        alphas = tuple(sorted(alphas))
        if alphas in self._compositions:
            return self._compositions[alphas]
        if len(alphas) == 1:
            result = {(alphas[0], ()): Fraction(1)}
        else:
            result = {}
            first, rest = alphas[0], alphas[1:]
            for (p, u), c in self.composition(rest).items():
                for key, d in self._split_pair(first, p, u).items():
                    result[key] = result.get(key, Fraction(0)) + c * d
        self._compositions[alphas] = result
        return result

    def _split_pair(self, j: int, p: int, u: Word) -> dict:
        """sum_{m+R=T, m,R>=1} m^-j R^-p S_u(R-1) as {(q, word): c}."""
        result: dict = {}
        for i in range(1, j + 1):  # the m^-i part: a convolution
            c = Fraction(comb(j + p - i - 1, p - 1))
            for word, d in self.convolution(i, u).items():
                key = (j + p - i, word)
                result[key] = result.get(key, Fraction(0)) + c * d
        for i in range(1, p + 1):  # the R^-i part: a nested sum
            c = Fraction(comb(j + p - i - 1, j - 1))
            key = (j + p - i, (i,) + u)
            result[key] = result.get(key, Fraction(0)) + c
        return result

    def convolution(self, j: int, u: Word) -> dict:
        """sum_{m=1}^{T-1} m^-j S_u(T-m-1) as {word: c} meaning sum c S_word(T-1)."""
        key = (j, u)
        if key in self._convolutions:
            return self._convolutions[key]
        if not u:
            result = {(j,): Fraction(1)}
        else:
            result = {}
            # = sum_{K<T} sum_{m+n=K} m^-j n^-u1 S_u'(n-1)
            for (q, word), c in self._split_pair(j, u[0], u[1:]).items():
                full = (q,) + word
                result[full] = result.get(full, Fraction(0)) + c
        self._convolutions[key] = result
        return result


def stuffle(u: Word, v: Word) -> dict:
    """Quasi-shuffle product of nested harmonic sums: S_u S_v = sum c S_w.

    >>> stuffle((2,), (3,)) == {(2, 3): 1, (3, 2): 1, (5,): 1}
    True
    """
    if not u:
        return {v: 1}
    if not v:
        return {u: 1}
    result: dict = {}
    for head, left, right in ((u[0], u[1:], v), (v[0], u, v[1:]), (u[0] + v[0], u[1:], v[1:])):
        for word, c in stuffle(left, right).items():
            full = (head,) + word
            result[full] = result.get(full, 0) + c
    return result
