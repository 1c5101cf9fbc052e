"""Dihedral modular graph functions C(a1, ..., ar) at a point tau.

C(a1..ar) = sum over non-zero momenta p_1 + ... + p_r = 0 of
prod_i (tau2/pi)^a_i / |p_i|^(2 a_i) is the torus average of prod_i G_(a_i)(z)
(see :mod:`ledger.mgf.lattice`).  The torus is the rectangle |x| <= 1/2,
|y| <= tau2/2 (z = x + i y, measure dx dy / tau2), halved by z -> -z.

* Around the singular point z = 0 (the strip 0 <= y <= h, h = min(tau2/2, 1/2))
  polar coordinates z = s R(phi) e^(i phi), s in [0, 1], over angular panels
  that end on the strip's edges.  With L = log|z|^2 = 2 log s + 2 log R and
  G_a = R_a + gamma_a |z|^(2a-2) L, the integrand is a polynomial in log s
  with analytic coefficients: a product-integration rule in s (exact for
  s log^k(s) x polynomial) and Gauss-Legendre in phi converge geometrically.
* Above the strip (tau2 > 1) the integrand is analytic and periodic in x:
  the trapezoid rule in x (spectrally accurate) and Gauss-Legendre in y on
  geometrically growing panels.

Error estimate: two rules of different size at two working precisions; the
smaller rule is sized to reach the digits asked for, and twice the difference
(plus a floor for fixed-point rounding) bounds its error and hence that of the
larger rule, whose value is returned.  If the bound misses the target the
rules grow (up to MAX_LEVELS levels); the bound returned is honest either way.

>>> ctx = mpmath.MPContext(); ctx.dps = 40
>>> value = dihedral_value((1, 1, 1), mpmath.mpc(0, 1), digits=20)
>>> expected = ctx.zeta(3) / 8 + ctx.zeta(3)     # E_3(i) + zeta(3) (Zagier: C(1,1,1) = E_3 + zeta(3))
>>> abs(ctx.convert(value.value) - expected) <= value.error < 1e-20 * expected
True
"""

from __future__ import annotations

import cmath
import math
from collections import Counter
from dataclasses import dataclass

import mpmath

from ledger.errors import LedgerError
from ledger.mgf.approx import export
from ledger.mgf.jobs import Job, ensure_job
from ledger.mgf.lattice import EdgeKernels
from ledger.mgf.modular import to_fundamental_domain
from ledger.mgf.quadrature import gauss_legendre, radial_rule
from ledger.mgf.values import Value

STRIP_HEIGHT = 0.5
MAX_DIGITS = 300
LEVEL_STEP = 3
MAX_LEVELS = 4


@dataclass(frozen=True)
class Rule:
    """Sizes of one quadrature: the digits aimed at by each ray's radial rule, Gauss
    nodes per angular panel and the panels' widest angle, and above the strip
    the trapezoid density (points = scale / y at height y) and nodes per y-panel."""

    radial_digits: float
    angular: int
    panel_degrees: float
    trapezoid_scale: float
    vertical: int


# measured convergence (relative digits per node, worst over graphs of weight <= 6
# and tau across the fundamental domain): angular Gauss-Legendre on the two
# ~90 degree panels ~0.77 (near tau = rho), vertical Gauss-Legendre ~1.6; the radial rule of a ray
# is sized from its predicted rate (see _radial_nodes), observed 0.1 above it
ANGULAR_RATE, VERTICAL_RATE = 0.74, 1.5
RADIAL_MARGIN = 0.05


def rule_for(digits: float) -> Rule:
    """A rule aimed at ``digits`` correct (relative) digits."""
    return Rule(
        radial_digits=digits,
        angular=max(6, math.ceil(digits / ANGULAR_RATE)),
        panel_degrees=100.0,
        trapezoid_scale=(digits * math.log(10) + 10) / (2 * math.pi),
        vertical=max(6, math.ceil(digits / VERTICAL_RATE)),
    )


def _radial_nodes(ray: complex, tau: complex, digits: float) -> int:
    """Nodes for the radial rule along z = s * ray, s in [0, 1].

    The regular parts are analytic in s up to the complexified lattice points
    s = lambda/ray and conj(lambda)/conj(ray); the product rule converges like
    rho^-n, rho the Bernstein ellipse parameter of the nearest one.
    """
    nearest = math.inf
    for m in range(-2, 3):
        for n in range(-2, 3):
            if m or n:
                point = m * tau + n
                for s in (point / ray, point.conjugate() / ray.conjugate()):
                    x = 2 * s - 1
                    rho = abs(x + cmath.sqrt(x * x - 1))
                    nearest = min(nearest, max(rho, 1 / rho))
    rate = math.log10(nearest) + RADIAL_MARGIN
    # rounded up to a multiple of 4, so that few distinct rules are built
    return max(8, 4 * math.ceil(digits / rate / 4))


def working_bits(digits: float) -> int:
    """Fixed-point bits for ``digits`` digits plus room for rounding in the sums."""
    return math.ceil(digits * math.log2(10)) + 24


def integrate_dihedral(weights, tau, bits: int, rule: Rule, job: Job | None = None):
    """The torus average of prod G_a (mpf); tau should lie in the fundamental domain."""
    return integrate_dihedrals([tuple(weights)], tau, bits, rule, job)[0]


def integrate_dihedrals(graphs, tau, bits: int, rule: Rule, job: Job | None = None) -> list:
    """[torus average of prod G_a for each weight tuple in ``graphs``] (mpf): one pass
    over the quadrature points, the edge functions evaluated once per point."""
    job = ensure_job(job)
    kernels = EdgeKernels(tau, {a for weights in graphs for a in weights}, bits)
    fp = kernels.fp
    ctx = mpmath.MPContext()
    ctx.prec = bits + 30
    tau = ctx.mpc(tau)
    tau2 = tau.imag
    exponents = [[Counter(weights)[a] for a in kernels.weights] for weights in graphs]
    height = min(tau2 / 2, ctx.mpf(STRIP_HEIGHT))
    totals = _strip_integral(kernels, exponents, height, rule, ctx, job.part(0, 0.8))
    if tau2 / 2 > height:
        upper = _upper_integral(kernels, exponents, height, tau2 / 2, rule, ctx, job.part(0.8, 1))
        totals = [a + b for a, b in zip(totals, upper)]
    return [2 * fp.to_mpf(total, ctx) / tau2 for total in totals]


def _mp_rule(rule, ctx) -> tuple:
    """A fixed-point Gauss rule as (nodes, weights) in ctx."""
    fp = rule.fixed
    return ([fp.to_mpf(x, ctx) for x in rule.nodes], [fp.to_mpf(w, ctx) for w in rule.weights])


def _angular_panels(height, rule: Rule, ctx):
    """(phi_a, phi_b, distance to edge, edge normal) covering -corner <= phi <= pi - corner:
    the side edge x = 1/2 (with x = -1/2 reflected through z -> -z) and the top edge."""
    corner = ctx.atan2(height, ctx.mpf(1) / 2)
    edges = [(-corner, corner, ctx.mpf(1) / 2, ctx.zero),
             (corner, ctx.pi - corner, height, ctx.pi / 2)]
    panels = []
    for start, stop, distance, normal in edges:
        pieces = max(1, math.ceil(float(stop - start) / math.radians(rule.panel_degrees) - 1e-9))
        width = (stop - start) / pieces
        for k in range(pieces):
            panels.append((start + k * width, start + (k + 1) * width, distance, normal))
    return panels


def _strip_integral(kernels, exponents, height, rule: Rule, ctx, job: Job) -> list:
    """[int over 0 <= y <= height, |x| <= 1/2 of prod G] in fixed point (polar around 0)."""
    fp = kernels.fp
    bits = fp.bits
    order = max(sum(row) for row in exponents)
    tau_float = complex(kernels.tau)
    phis, phi_weights = _mp_rule(gauss_legendre(rule.angular, bits), ctx)
    panels = _angular_panels(height, rule, ctx)
    totals = [0] * len(exponents)
    rays = len(panels) * len(phis)
    done = 0
    for start, stop, distance, normal in panels:
        width = stop - start
        for t, w in zip(phis, phi_weights):
            phi = start + width * t
            reach = distance / ctx.cos(phi - normal)
            # a ray below the real axis is evaluated as its mirror z -> -z (f is even)
            sign = -1 if phi < 0 else 1
            ray = _Ray(fp, sign * reach * ctx.cos(phi), sign * reach * ctx.sin(phi), ctx)
            radial = radial_rule(_radial_nodes(ray.vector, tau_float, rule.radial_digits),
                                 order, bits)
            weight = fp.from_number(w * width * reach * reach)
            for index, value in enumerate(_ray_sums(kernels, exponents, radial, ray)):
                totals[index] += (weight * value) >> bits
            done += 1
            job.report(done / rays, "dihedral: integrating around the singular point")
    return totals


class _Ray:
    """z = s * (reach_cos + i reach_sin), s in [0, 1], in fixed point."""

    def __init__(self, fp, reach_cos, reach_sin, ctx):
        self.vector = complex(reach_cos, reach_sin)
        self.cos = fp.from_number(reach_cos)
        self.sin = fp.from_number(reach_sin)
        self.length2 = fp.from_number(reach_cos ** 2 + reach_sin ** 2)
        self.log_length2 = fp.from_number(ctx.log(reach_cos ** 2 + reach_sin ** 2))


def _ray_sums(kernels, exponents, radial, ray) -> list:
    """[int_0^1 s ds f(s R e^(i phi)) for each graph] along one ray, by the product rule."""
    bits = kernels.bits
    one = kernels.fp.one
    weights = radial.weights
    log_length2 = ray.log_length2
    totals = [0] * len(exponents)
    for i, (s, log_s) in enumerate(zip(radial.nodes, radial.log_nodes)):
        x = (s * ray.cos) >> bits
        y = (s * ray.sin) >> bits
        r2 = (((s * s) >> bits) * ray.length2) >> bits
        regular = kernels.regular_parts(x, y, r2, 2 * log_s + log_length2)
        # G_a = R_a + g_a L with L = 2 sigma + log R^2: linear in sigma = log s
        linear = [(value + ((g * log_length2) >> bits), 2 * g)
                  for value, g in zip(regular, kernels.log_coefficients(r2))]
        for index, row in enumerate(exponents):
            poly = [one]
            for (constant, slope), count in zip(linear, row):
                for _ in range(count):
                    poly = _times_linear(poly, constant, slope, bits)
            totals[index] += sum(weights[k][i] * c for k, c in enumerate(poly))
    return [total >> bits for total in totals]


def _times_linear(poly, constant, slope, bits):
    out = [(constant * c) >> bits for c in poly] + [0]
    for k, c in enumerate(poly):
        out[k + 1] += (slope * c) >> bits
    return out


def _upper_integral(kernels, exponents, low, high, rule: Rule, ctx, job: Job) -> list:
    """[int over low <= y <= high, |x| <= 1/2 of prod G] (no singular point there)."""
    fp = kernels.fp
    bits = fp.bits
    ys, y_weights = _mp_rule(gauss_legendre(rule.vertical, bits), ctx)
    panels = []
    start = low
    while start < high:
        stop = min(2 * start, high)
        if high - stop < start / 2:
            stop = high
        panels.append((start, stop))
        start = stop
    totals = [0] * len(exponents)
    for index, (start, stop) in enumerate(panels):
        points = max(4, math.ceil(rule.trapezoid_scale / float(start)))
        xs = [fp.from_number(ctx.mpf(2 * k + 1) / (2 * points) - ctx.mpf(1) / 2)
              for k in range(points)]
        width = stop - start
        for t, w in zip(ys, y_weights):
            y = fp.from_number(start + width * t)
            lines = [0] * len(exponents)
            for x in xs:
                values = kernels.values(x, y)
                for graph, row in enumerate(exponents):
                    product = fp.one
                    for value, count in zip(values, row):
                        for _ in range(count):
                            product = (product * value) >> bits
                    lines[graph] += product
            weight = fp.from_number(w * width / points)
            for graph, line in enumerate(lines):
                totals[graph] += (weight * line) >> bits
        job.report((index + 1) / len(panels), "dihedral: integrating the upper region")
    return totals


def dihedral_value(weights, tau, digits: int = 30, job: Job | None = None) -> Value:
    """C(a1, ..., ar)(tau) with an error bound; r = 2 gives E_(a1+a2).

    >>> v = dihedral_value((2, 1, 1), mpmath.mpc("0.27", "1.31"), digits=15)
    >>> v.correct_digits() >= 15
    True
    """
    return dihedral_values([weights], tau, digits, job)[0]


def dihedral_values(graphs, tau, digits: int = 30, job: Job | None = None) -> list:
    """[C(weights)(tau) for weights in graphs], computed together (shared edge functions).

    >>> c111, c211 = dihedral_values([(1, 1, 1), (2, 1, 1)], mpmath.mpc(0, 1), digits=12)
    >>> mpmath.nstr(c111.value, 12), mpmath.nstr(c211.value, 12)
    ('1.35231401605', '0.219765455942')
    """
    graphs = [_checked_weights(weights) for weights in graphs]
    if isinstance(digits, bool) or not isinstance(digits, int) or not 1 <= digits <= MAX_DIGITS:
        raise LedgerError(f"digits must be an integer between 1 and {MAX_DIGITS}, got {digits!r}")
    job = ensure_job(job)
    ctx = mpmath.MPContext()
    ctx.dps = digits + 15
    tau_f = to_fundamental_domain(ctx.mpc(tau), ctx)
    results = {}
    for index, weights in enumerate(graphs):
        if len(weights) == 2:
            from ledger.mgf.eisenstein import eisenstein_value
            results[index] = eisenstein_value(sum(weights), tau_f, digits)
    pending = sorted({_canonical(weights) for weights in graphs if len(weights) > 2})
    target = ctx.mpf(10) ** (-digits)
    # each level aims LEVEL_STEP digits higher than the one before; the error of a
    # level is bounded by its difference to the next (geometric convergence)
    aims = [digits + 1 + LEVEL_STEP * k for k in range(MAX_LEVELS)]
    part = 1 / MAX_LEVELS

    def level(k, todo):
        values = integrate_dihedrals(todo, tau_f, working_bits(aims[k]), rule_for(aims[k]),
                                     job.part(k * part, (k + 1) * part))
        return {weights: ctx.convert(value) for weights, value in zip(todo, values)}

    done = {}
    lower = level(0, pending) if pending else {}
    for k in range(1, MAX_LEVELS):
        if not pending:
            break
        upper = level(k, pending)
        floor = ctx.mpf(2) ** (-working_bits(aims[0]) + 20)
        for weights in pending:
            error = 2 * abs(upper[weights] - lower[weights]) + floor * abs(upper[weights])
            if error <= target * abs(upper[weights]) or k == MAX_LEVELS - 1:
                done[weights] = Value(export(upper[weights]), export(error), digits)
        pending = [weights for weights in pending if weights not in done]
        lower = upper
    job.report(1.0, "dihedral: done")
    return [results[i] if i in results else done[_canonical(weights)]
            for i, weights in enumerate(graphs)]


def _canonical(weights) -> tuple:
    return tuple(sorted(weights, reverse=True))


def _checked_weights(weights) -> tuple:
    weights = tuple(weights)
    if len(weights) < 2 or not all(isinstance(a, int) and not isinstance(a, bool) and a >= 1
                                   for a in weights):
        raise LedgerError(f"C(...) needs at least two positive integer weights, got {weights}")
    return weights
