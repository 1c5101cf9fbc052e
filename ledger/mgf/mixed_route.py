"""Any graph function by the mixed Fourier route: exact position integrals, lattice sums in m.

Momenta p_e = m_e tau + n_e.  Conservation of the n_e at every vertex is imposed
with one position u_v in [0, 1) per vertex (u_0 = 0), which leaves per edge the
kernel K_a(m, x) = sum_n (tau2/pi)^a e^(2 pi i n x) / |m tau + n|^(2a) at
x = u_head - u_tail:

* m = 0: (-1)^(a+1) (4 pi tau2)^a B_2a(x) / (2a)!  (a Bernoulli polynomial);
* m != 0, after Poisson resummation in n: e^(-2 pi i m tau1 x) times
  P_a^+(x) e^(-k x) + e^(2 pi i m tau1) P_a^-(1-x) e^(-k (1-x)),  k = 2 pi |m| tau2,
  P^+- polynomials of degree a-1 (the images summed as geometric series).

The phases e^(-2 pi i m tau1 x) cancel between the edges (the m_e are conserved
too) except for a constant on edges that wrap around the circle.  On each
ordering of the u's the integrand is a sum of polynomials times exponentials of
the gaps between consecutive u's; by the Hermite-Genocchi formula its integral
over the simplex of gaps is a (confluent) divided difference of exp at the nodes
-2 pi tau2 W_g (W_g integers), so every configuration of the m_e is summed exactly.

The sum over the conserved m_e (one integer per independent cycle) is done by
shells k = max_e |m_e|, one orbit of the graph's symmetries at a time.  The shells
decay only like a power of k (near coinciding u's the kernels decay like
e^(-2 pi |m| tau2 |x|)): the power follows from power counting of the subgraphs
that can carry large m, and the tail beyond the last shell K is extrapolated
(:mod:`ledger.mgf.shell_extrapolation`), with an error estimate from the
extrapolation at 3K/4.  K grows until the digits asked for are reached or the
time budget would be exceeded; about 12-14 digits for the weight-6 tetrahedral
graph in a minute or two.  This is the general fallback and the independent
check; cycles of bundles (trihedral graphs) go through :mod:`ledger.mgf.bundle_cycle`.

>>> import mpmath
>>> from ledger.mgf.graph import Graph
>>> from ledger.mgf.eisenstein import eisenstein_value
>>> tau = mpmath.mpc("0.1", "1.1")
>>> v = mixed_route_value(Graph.from_edges([(0, 1, 1), (1, 2, 1), (2, 0, 1)]), tau, shells=24)
>>> abs(v.value - eisenstein_value(3, tau, 20).value) < max(v.error, mpmath.mpf(10) ** -9)
True
"""

from __future__ import annotations

import itertools
import math
from functools import lru_cache

import gmpy2
import mpmath

from ledger.errors import LedgerError
from ledger.mgf.approx import export
from ledger.mgf.bernoulli import bernoulli_polynomial
from ledger.mgf.graph import Graph, check_convergence
from ledger.mgf.jobs import Job, ensure_job
from ledger.mgf.modular import to_fundamental_domain
from ledger.mgf.shell_extrapolation import extrapolate, shell_power
from ledger.mgf.values import Value

GUARD_BITS = 40


# --- graph structure -----------------------------------------------------------

def loop_basis(n_vertices: int, edges) -> list:
    """B with m_e = sum_c B[e][c] l_c over a cycle basis (one cycle per non-tree edge)."""
    adjacency = {v: [] for v in range(n_vertices)}
    for index, (t, h, _) in enumerate(edges):
        adjacency[t].append((h, index))
        adjacency[h].append((t, index))
    parent_edge = {0: None}
    stack = [0]
    while stack:
        v = stack.pop()
        for w, index in adjacency[v]:
            if w not in parent_edge:
                parent_edge[w] = (v, index)
                stack.append(w)
    if len(parent_edge) != n_vertices:
        raise LedgerError("the mixed route needs a connected graph")
    tree = {pe[1] for pe in parent_edge.values() if pe is not None}
    loops = [i for i in range(len(edges)) if i not in tree]

    def root_path(v):   # [(edge, +1 if oriented root -> v)]
        path = []
        while parent_edge[v] is not None:
            u, index = parent_edge[v]
            t, h, _ = edges[index]
            path.append((index, 1 if (t, h) == (u, v) else -1))
            v = u
        return path

    basis = [[0] * len(loops) for _ in edges]
    for c, index in enumerate(loops):
        t, h, _ = edges[index]
        basis[index][c] += 1
        for e, sign in root_path(t):
            basis[e][c] += sign
        for e, sign in root_path(h):
            basis[e][c] -= sign
    return basis


def symmetries(n_vertices: int, edges) -> list:
    """Signed edge permutations (perm, signs) induced by the graph automorphisms
    (and by permutations of parallel edges of equal weight): m'_perm[e] = sign[e] m_e."""
    by_pair: dict = {}
    for index, (t, h, a) in enumerate(edges):
        by_pair.setdefault((min(t, h), max(t, h), a), []).append(index)
    out = set()
    for pi in itertools.permutations(range(n_vertices)):
        images = {}
        ok = True
        for key, members in by_pair.items():
            u, v, a = key
            target = (min(pi[u], pi[v]), max(pi[u], pi[v]), a)
            if target not in by_pair or len(by_pair[target]) != len(members):
                ok = False
                break
            images[key] = target
        if not ok:
            continue
        choices = []
        for key, members in by_pair.items():
            targets = by_pair[images[key]]
            choices.append([(members, order) for order in itertools.permutations(targets)])
        for combination in itertools.product(*choices):
            perm = [0] * len(edges)
            signs = [0] * len(edges)
            for members, order in combination:
                for e, f in zip(members, order):
                    t, h, _ = edges[e]
                    ft, fh, _ = edges[f]
                    perm[e] = f
                    signs[e] = 1 if (pi[t], pi[h]) == (ft, fh) else -1
            out.add((tuple(perm), tuple(signs)))
    return sorted(out)


# --- one configuration of the m_e ---------------------------------------------------

class _Integrator:
    """Exact u-integrals for one graph at one tau, in gmpy2 at ``bits``."""

    def __init__(self, n_vertices, edges, tau, bits):
        self.n_vertices = n_vertices
        self.edges = edges
        self.bits = bits
        self.gmp = gmpy2.context(precision=bits)
        ctx = mpmath.MPContext()
        ctx.prec = bits + 20
        self.ctx = ctx
        tau = ctx.mpc(tau)
        self.tau1, self.tau2 = tau.real, tau.imag
        with self.gmp:
            self.step = self._gmp_real(2 * ctx.pi * self.tau2)   # nodes are -step * W
        self.orders = []
        for perm in itertools.permutations(range(1, n_vertices)):
            position = {v: i for i, v in enumerate((0,) + perm)}
            arcs = []
            for t, h, _ in edges:
                pt, ph = position[t], position[h]
                if ph > pt:
                    arc, wrap = tuple(range(pt, ph)), False
                else:
                    arc, wrap = tuple(range(pt, n_vertices)) + tuple(range(ph)), True
                rest = tuple(g for g in range(n_vertices) if g not in arc)
                arcs.append((arc, rest, wrap))
            self.orders.append(arcs)
        self._kernel_cache: dict = {}
        self._dd_cache: dict = {}

    def _gmp_real(self, x):
        """An mpf as a gmpy2 mpfr; call inside ``with self.gmp`` (gmpy2 rounds in its context)."""
        sign, man, exponent, _ = self.ctx.mpf(x)._mpf_
        value = gmpy2.mul_2exp(gmpy2.mpfr(int(man)), exponent)
        return -value if sign else value

    def _gmp_complex(self, z):
        z = self.ctx.mpc(z)
        return gmpy2.mpc(self._gmp_real(z.real), self._gmp_real(z.imag))

    def kernel(self, a: int, m: int):
        """('zero', [coefficients of x^d]) or ('exp', |m|, plus, minus) with plus/minus the
        coefficients of x^d in P^+ (variable x) and P^- (variable 1 - x), wrap phase left out."""
        key = (a, m)
        if key in self._kernel_cache:
            return self._kernel_cache[key]
        ctx = self.ctx
        tau2, tau1 = self.tau2, self.tau1
        if m == 0:
            scale = (-1) ** (a + 1) * (4 * ctx.pi * tau2) ** a / ctx.factorial(2 * a)
            poly = [self._gmp_complex(scale * ctx.mpf(c.numerator) / c.denominator)
                    for c in bernoulli_polynomial(2 * a)]
            result = ("zero", poly)
        else:
            c = abs(m) * tau2
            kappa = 2 * ctx.pi * c
            prefactor = ((tau2 / ctx.pi) ** a * ctx.pi
                         / (ctx.factorial(a - 1) * 4 ** (a - 1) * c ** (2 * a - 1)))
            d = [ctx.factorial(2 * a - 2 - j) / (ctx.factorial(j) * ctx.factorial(a - 1 - j))
                 for j in range(a)]
            sides = []
            for r, phase in ((ctx.expj(-2 * ctx.pi * m * tau1) * ctx.exp(-kappa), 1),
                             (ctx.expj(2 * ctx.pi * m * tau1) * ctx.exp(-kappa),
                              ctx.expj(2 * ctx.pi * m * tau1))):
                moments = _geometric_moments(r, a - 1, ctx)
                poly = [ctx.mpc(0)] * a
                for j in range(a):
                    for i in range(j + 1):
                        poly[j - i] += d[j] * (2 * kappa) ** j * math.comb(j, i) * moments[i]
                sides.append([self._gmp_complex(prefactor * phase * p) for p in poly])
            result = ("exp", abs(m), sides[0], sides[1])
        self._kernel_cache[key] = result
        return result

    def integral(self, ms) -> complex:
        """int_[0,1)^(V-1) prod_e K_(a_e)(m_e, u_h - u_t) du as a gmpy2 mpc."""
        n = self.n_vertices
        with self.gmp:
            kernels = [self.kernel(a, m) for m, (_, _, a) in zip(ms, self.edges)]
            total = gmpy2.mpc(0)
            wrap_phase = {}
            for arcs in self.orders:
                phase_key = tuple(m for m, (_, _, wrap) in zip(ms, arcs) if wrap)
                shift = sum(phase_key)
                if shift not in wrap_phase:
                    phase = self.ctx.expj(-2 * self.ctx.pi * shift * self.tau1)
                    wrap_phase[shift] = self._gmp_complex(phase)
                state = {((0,) * n, (0,) * n): wrap_phase[shift]}
                for kernel, (arc, rest, _) in zip(kernels, arcs):
                    state = _apply_kernel(state, kernel, arc, rest, n)
                for (weights, monomial), coefficient in state.items():
                    total += coefficient * self._divided_difference(weights, monomial)
        return total

    def _divided_difference(self, weights, monomial):
        """prod k_g! exp[nodes -step W_g with multiplicity k_g + 1] (Hermite-Genocchi)."""
        grouped: dict = {}
        factor = 1
        for w, k in zip(weights, monomial):
            grouped[w] = grouped.get(w, 0) + k + 1
            factor *= math.factorial(k)
        key = tuple(sorted(grouped.items()))
        value = self._dd_cache.get(key)
        if value is None:
            value = self._confluent(key)
            self._dd_cache[key] = value
        return value * factor

    def _confluent(self, key):
        step = self.step
        total = gmpy2.mpfr(0)
        for w_i, n_i in key:
            x_i = -step * w_i
            series = [gmpy2.mpfr(1) / math.factorial(k) for k in range(n_i)]   # e^h
            for w_j, n_j in key:
                if w_j == w_i:
                    continue
                gap = step * (w_j - w_i)   # x_i - x_j
                inverse = [(-1) ** k * math.comb(n_j + k - 1, k) / gap ** (n_j + k)
                           for k in range(n_i)]
                series = [sum(series[a] * inverse[k - a] for a in range(k + 1)) for k in range(n_i)]
            total += gmpy2.exp(x_i) * series[n_i - 1]
        return total


def _apply_kernel(state, kernel, arc, rest, n):
    """Multiply the state {(W, monomial): c} by one edge kernel on the given gap sets."""
    out: dict = {}
    if kernel[0] == "zero":
        branches = [(arc, 0, kernel[1])]
    else:
        branches = [(arc, kernel[1], kernel[2]), (rest, kernel[1], kernel[3])]
    for gaps, size, poly in branches:
        expansion = _polynomial_in_gaps(poly, gaps, n)
        for (weights, monomial), c in state.items():
            if size:
                weights = tuple(w + size if g in gaps else w for g, w in enumerate(weights))
            for increment, coefficient in expansion:
                new = (monomial if increment is None
                       else tuple(k + d for k, d in zip(monomial, increment)))
                key = (weights, new)
                out[key] = out.get(key, 0) + c * coefficient
    return out


def _polynomial_in_gaps(poly, gaps, n):
    """[(monomial increment or None, coefficient)] for sum_d poly[d] (sum_(g in gaps) g)^d."""
    out = []
    for degree, c in enumerate(poly):
        if degree == 0:
            out.append((None, c))
            continue
        for exponents in _compositions(degree, len(gaps)):
            coefficient = math.factorial(degree)
            increment = [0] * n
            for g, e in zip(gaps, exponents):
                coefficient //= math.factorial(e)
                increment[g] = e
            out.append((tuple(increment), c * coefficient))
    return out


@lru_cache(maxsize=None)
def _compositions(total: int, parts: int) -> tuple:
    if parts == 1:
        return ((total,),)
    return tuple((k,) + rest for k in range(total + 1)
                 for rest in _compositions(total - k, parts - 1))


def _geometric_moments(r, top: int, ctx) -> list:
    """sum_{n>=0} n^i r^n for i = 0..top (|r| < 1)."""
    out = [1 / (1 - r)]
    for i in range(1, top + 1):
        total, power, n = ctx.mpc(0), ctx.mpc(1), 0
        while True:
            n += 1
            power *= r
            term = ctx.mpf(n) ** i * power
            total += term
            if abs(term) < ctx.mpf(2) ** (-ctx.prec - 8):
                break
        out.append(total)
    return out


# --- the sum over the m_e ----------------------------------------------------------

class _Orbits:
    """Orbits of m-configurations under the signed edge symmetries and m -> -m."""

    def __init__(self, symmetry_list):
        self.maps = [(perm, signs) for perm, signs in symmetry_list]

    def images(self, ms):
        out = set()
        for perm, signs in self.maps:
            image = [0] * len(ms)
            for e, m in enumerate(ms):
                image[perm[e]] = signs[e] * m
            image = tuple(image)
            out.add(image)
            out.add(tuple(-x for x in image))
        return out


class ShellSums:
    """Shells s_k = sum over conserved m with max_e |m_e| = k of the exact u-integral,
    computed up to a growing K (one orbit of the graph's symmetries at a time)."""

    def __init__(self, graph: Graph, tau, bits: int):
        self.graph = graph
        self.integrator = _Integrator(graph.n_vertices, graph.edges, tau, bits)
        self.basis = loop_basis(graph.n_vertices, graph.edges)
        self.loops = len(self.basis[0]) if self.basis else 0
        self.orbits = _Orbits(symmetries(graph.n_vertices, graph.edges))
        self.sums: list = []

    def extend(self, shells: int, job: Job | None = None) -> list:
        """The shells s_0..s_shells as mpf (those already known are kept)."""
        job = ensure_job(job)
        known = len(self.sums) - 1
        if shells <= known:
            return self.values()[:shells + 1]
        integrator = self.integrator
        with integrator.gmp:
            self.sums.extend(gmpy2.mpc(0) for _ in range(shells - known))
        seen = set()
        total = (2 * shells + 1) ** self.loops
        job.report(0.0, f"mixed route: shells {known + 1}..{shells}")
        for done, ls in enumerate(itertools.product(range(-shells, shells + 1), repeat=self.loops)):
            ms = tuple(sum(row[c] * ls[c] for c in range(self.loops)) for row in self.basis)
            k = max((abs(m) for m in ms), default=0)
            if k <= known or k > shells or ms in seen:
                continue
            images = self.orbits.images(ms)
            seen.update(images)
            value = integrator.integral(ms)
            with integrator.gmp:
                self.sums[k] += value * len(images)
            if len(seen) % 64 < len(images):
                job.report(done / total, f"mixed route: shells {known + 1}..{shells}")
        return self.values()

    def values(self) -> list:
        return [_to_mpf(x.real, self.integrator.ctx) for x in self.sums]


def _to_mpf(x, ctx):
    """A gmpy2 mpfr as an mpf of ``ctx`` (exact at ctx's precision)."""
    mantissa, exponent = x.as_mantissa_exp()
    return ctx.ldexp(ctx.mpf(int(mantissa)), int(exponent))


SHELL_SCHEDULE = (12, 16, 20, 24, 28, 32, 40, 48, 56, 64, 80, 96)
DEFAULT_BUDGET_SECONDS = 600.0


def mixed_route_value(graph: Graph, tau, digits: int = 12, job: Job | None = None,
                      reduce_tau: bool = True, budget_seconds: float = DEFAULT_BUDGET_SECONDS,
                      shells: int | None = None) -> Value:
    """The graph function by the mixed route, shells grown until ``digits`` are reached
    (or the next step would exceed ``budget_seconds``: the error then says how many
    digits are right); ``shells`` fixes the last shell.

    ``reduce_tau=False`` evaluates at tau as given (for modular-invariance checks).
    """
    import time

    if not isinstance(graph, Graph):
        raise LedgerError(f"mixed_route_value needs a Graph, got {type(graph).__name__}")
    if isinstance(digits, bool) or not isinstance(digits, int) or not 1 <= digits <= 60:
        raise LedgerError(f"digits must be an integer between 1 and 60, got {digits!r}")
    check_convergence(graph)
    job = ensure_job(job)
    job.check()
    ctx = mpmath.MPContext()
    ctx.dps = digits + 20
    tau = ctx.mpc(tau)
    if reduce_tau:
        tau = to_fundamental_domain(tau, ctx)
    elif not tau.imag > 0:
        raise LedgerError(f"tau must lie in the upper half plane, got {tau}")
    bits = math.ceil(ctx.prec) + GUARD_BITS
    sums = ShellSums(graph, tau, bits)
    fit = mpmath.MPContext()          # the least-squares fits are ill-conditioned: many digits
    fit.dps = max(60, 2 * digits + 30)
    power = shell_power(graph)
    schedule = [shells] if shells is not None else list(SHELL_SCHEDULE)
    target = ctx.mpf(10) ** (-digits)
    start = time.monotonic()
    value = error = None
    for index, k in enumerate(schedule):
        values = sums.extend(k, job.part(index / len(schedule), (index + 1) / len(schedule)))
        value, error = extrapolate([fit.mpf(v) for v in values], power, fit)
        if error <= target * abs(value) or index + 1 == len(schedule):
            break
        elapsed = time.monotonic() - start
        growth = (schedule[index + 1] / k) ** max(sums.loops, 1)
        if elapsed * growth > budget_seconds:
            break
    return Value(export(value), export(error + fit.mpf(10) ** (-digits - 15)), digits)
