"""An independent check of the genus-one graph bookkeeping on finite abelian groups.

The exact reductions behind the expansion use only translation invariance, a
normalised measure, G(-z) = G(z) and zero mean.  They therefore hold verbatim
when the torus is replaced by a finite abelian group A (Z_11, Z_4 x Z_4, ...)
and G by a random even, mean-zero function on A, with the weight-a edge
function G_a the a-fold convolution (f * g)(x) = (1/|A|) sum_y f(y) g(x - y).

On A everything is exact: the Taylor coefficients of the 'integrand'
(1/|A|^4) sum_{z in A^4} exp(sum_{i<j} s_ij G(z_i - z_j)) are computed by brute
force over positions, each graph of the expansion is evaluated by brute force
over the positions of its own vertices, and the two must agree coefficient by
coefficient.  A random G separates graphs that coincide on the torus, so no
identity between graph functions is assumed.  Nothing here uses the reduction
or canonical-form code; only the output of the expansion is read.
"""

from __future__ import annotations

import itertools
import math
import random
from fractions import Fraction

import pytest
import sympy

from ledger.amplitudes.genus_one import expand_genus_one


class GroupModel:
    """A finite abelian group Z_n1 x ... x Z_nk with a random even, mean-zero integer G."""

    def __init__(self, moduli: tuple[int, ...], seed: int):
        self.moduli = moduli
        self.elements = list(itertools.product(*(range(n) for n in moduli)))
        self.size = len(self.elements)
        self.index = {x: i for i, x in enumerate(self.elements)}
        rng = random.Random(seed)
        raw = [rng.randint(-6, 6) for _ in self.elements]
        even = [raw[i] + raw[self.negate(i)] for i in range(self.size)]
        total = sum(even)
        self.green = [self.size * g - total for g in even]  # integer, even, mean zero
        assert sum(self.green) == 0
        assert all(self.green[i] == self.green[self.negate(i)] for i in range(self.size))
        self._kernels = {1: [Fraction(g) for g in self.green]}

    def negate(self, i: int) -> int:
        return self.index[tuple((-a) % n for a, n in zip(self.elements[i], self.moduli))]

    def difference(self, i: int, j: int) -> int:
        return self.index[tuple((a - b) % n for a, b, n in
                                zip(self.elements[i], self.elements[j], self.moduli))]

    def kernel(self, weight: int) -> list[Fraction]:
        """G_weight: the (weight)-fold convolution of G with the normalised measure."""
        if weight not in self._kernels:
            previous = self.kernel(weight - 1)
            self._kernels[weight] = [
                sum(previous[y] * self.green[self.difference(x, y)] for y in range(self.size))
                / self.size for x in range(self.size)]
        return self._kernels[weight]

    def graph_value(self, graph) -> Fraction:
        """(1/|A|^V) sum over vertex positions of prod_edges G_a(z_u - z_v), by brute force."""
        tables = [(u, v, self.kernel(w)) for u, v, w in graph.edges]
        total = Fraction(0)
        for positions in itertools.product(range(self.size), repeat=graph.n_vertices):
            term = Fraction(1)
            for u, v, table in tables:
                term *= table[self.difference(positions[u], positions[v])]
                if not term:
                    break
            total += term
        return total / self.size ** graph.n_vertices

    def integrand_taylor(self, order: int) -> dict[tuple[int, int], Fraction]:
        """Coefficient of s^a t^b (u = -s - t) of the brute-force integrand, a + b <= order."""
        # s_12 = s_34 = s, s_14 = s_23 = t, s_13 = s_24 = u = -s - t
        sums = {(a, b): 0 for a in range(order + 1) for b in range(order + 1 - a)}
        for z in itertools.product(range(self.size), repeat=4):
            g = {(i, j): self.green[self.difference(z[i], z[j])]
                 for i in range(4) for j in range(i + 1, 4)}
            alpha = g[0, 1] + g[2, 3] - g[0, 2] - g[1, 3]  # multiplies s
            beta = g[0, 3] + g[1, 2] - g[0, 2] - g[1, 3]  # multiplies t
            for a, b in sums:
                sums[a, b] += alpha ** a * beta ** b
        return {(a, b): Fraction(m, math.factorial(a) * math.factorial(b) * self.size ** 4)
                for (a, b), m in sums.items()}


def predicted_taylor(coefficients, values, order) -> dict[tuple[int, int], Fraction]:
    """Taylor coefficients of sum_(p,q) B_(p,q) sigma2^p sigma3^q/(p! q!) with B evaluated on A."""
    s, t = sympy.symbols("s t")
    u = -s - t
    sigma2, sigma3 = s**2 + t**2 + u**2, s**3 + t**3 + u**3
    total = 0
    for structure, graph_sum in coefficients.items():
        value = sum((Fraction(c) * math.prod((values[g] for g in product), start=Fraction(1))
                     for product, c in graph_sum.items()), start=Fraction(0))
        total += sympy.Rational(value.numerator, value.denominator) * sigma2**structure.p * \
            sigma3**structure.q / (math.factorial(structure.p) * math.factorial(structure.q))
    poly = sympy.Poly(sympy.expand(total), s, t) if total != 0 else None
    result = {}
    for a in range(order + 1):
        for b in range(order + 1 - a):
            c = poly.coeff_monomial(s**a * t**b) if poly is not None else 0
            result[a, b] = Fraction(int(sympy.fraction(c)[0]), int(sympy.fraction(c)[1]))
    return result


def _graph_values(model, coefficients):
    graphs = {g for graph_sum in coefficients.values() for product in graph_sum for g in product}
    return {g: model.graph_value(g) for g in graphs}


@pytest.mark.parametrize("moduli, seed, order", [
    ((11,), 1, 6),
    ((7,), 5, 7),
])
def test_expansion_matches_brute_force_on_cyclic_group(moduli, seed, order):
    model = GroupModel(moduli, seed)
    coefficients = expand_genus_one(order).coefficients
    values = _graph_values(model, coefficients)
    assert predicted_taylor(coefficients, values, order) == model.integrand_taylor(order)


def test_expansion_matches_brute_force_on_z4_x_z4():
    model = GroupModel((4, 4), 3)
    coefficients = expand_genus_one(6).coefficients
    values = _graph_values(model, coefficients)
    assert predicted_taylor(coefficients, values, 6) == model.integrand_taylor(6)


def test_altering_any_single_coefficient_is_caught():
    model = GroupModel((11,), 2)
    order = 6
    coefficients = expand_genus_one(order).coefficients
    values = _graph_values(model, coefficients)
    reference = model.integrand_taylor(order)
    assert predicted_taylor(coefficients, values, order) == reference
    altered_count = 0
    for structure, graph_sum in coefficients.items():
        for product in graph_sum:
            altered = {k: dict(v) for k, v in coefficients.items()}
            altered[structure][product] += Fraction(1, 7)
            assert predicted_taylor(altered, values, order) != reference, (structure, product)
            altered_count += 1
    assert altered_count >= 20  # every term through weight 6 was tried


def test_brute_force_sees_the_known_low_orders():
    # B_(0,0) = 1 (normalised measure) and no weight-1 term (sigma_1 = 0): on the group,
    # the constant Taylor coefficient is 1 and the linear ones vanish (G has zero mean).
    model = GroupModel((5,), 4)
    taylor = model.integrand_taylor(1)
    assert taylor[0, 0] == 1
    assert taylor[1, 0] == 0 and taylor[0, 1] == 0


def test_random_green_function_separates_graphs_equal_on_the_torus():
    # C(1,1,1) = E(3) + zeta(3) on the torus, but on the group the two sides are unrelated:
    # the check does not rely on that identity (or any other).
    model = GroupModel((11,), 1)
    expansion = expand_genus_one(3).coefficients
    graphs = {g for b in expansion.values() for product in b for g in product}
    triangle_like = [g for g in graphs if g.weight == 3]
    values = {model.graph_value(g) for g in triangle_like}
    assert len(values) == len(triangle_like) == 2  # C(1,1,1) and E(3), distinct values
