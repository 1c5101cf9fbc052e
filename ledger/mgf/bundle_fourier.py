"""Torus Fourier coefficients of bundles of edges, by quadrature in position space.

For a bundle B(z) = prod_i G_(a_i)(z) and p = m tau + n,

    B^(p) = (1/tau2) int_torus B(z) cos(2 pi (m u - n v)) d^2z,   z = u + v tau,

(B is real and even).  The torus is the rectangle |x| <= 1/2, |y| <= tau2/2
(z = x + i y), halved by z -> -z.  Near the singular point z = 0 (the strip
0 <= y <= h) polar coordinates z = s R(phi) e^(i phi): on s <= S1 the integrand
is a polynomial in log s with analytic coefficients and the product rule of
:func:`ledger.mgf.quadrature.radial_rule` applies; on S1 <= s <= 1 Gauss-Legendre
panels (geometric, then long); Gauss-Legendre in phi on the three edges of the
strip.  Above the strip the integrand is analytic and periodic in x: trapezoid
rule in x, Gauss-Legendre panels in y.  Rule sizes grow with the largest
|zeta| = 2 pi |p| / tau2 asked for (the oscillation of the cosine).

All coefficients come from one set of nodes: per node the values e^(-2 pi i n v)
for every n are packed into one integer (:class:`ledger.mgf.fixedpoint.FixedPoint`),
so that one big multiplication per (node, m) adds a node to a whole row of
coefficients.

>>> import mpmath
>>> from ledger.mgf.eisenstein import eisenstein_value
>>> tau = mpmath.mpc(0, 1)
>>> table = fourier_coefficients([(1, 1)], tau, [(0, 0), (1, 0)], bits=70, max_zeta=10)
>>> abs(table[0][(0, 0)] - eisenstein_value(2, tau, 20).value) < 1e-15   # B^(0) = <G_1^2> = E_2
True
"""

from __future__ import annotations

import math
from collections import Counter

import mpmath

from ledger.mgf.approx import export
from ledger.mgf.fixedpoint import FixedPoint, mpz
from ledger.mgf.jobs import Job, ensure_job
from ledger.mgf.lattice import EdgeKernels
from ledger.mgf.quadrature import gauss_legendre, radial_rule

STRIP_HEIGHT = 0.5
INNER_RADIUS = 0.125      # the product rule covers s <= INNER_RADIUS on every ray
PHASE_PER_NODE = 0.55     # extra Gauss nodes per radian of oscillation over a panel
BASE_SLOPE = 0.4


def _rule_base(bits: int, level: int) -> int:
    """Gauss nodes per panel for the analytic part at ``bits`` (``level`` > 0: larger)."""
    digits = bits * math.log10(2)
    return max(8, round((BASE_SLOPE * digits + 4) * (1 + 0.2 * level)))


def _panel_nodes(bits, level, phase) -> int:
    return _rule_base(bits, level) + math.ceil(PHASE_PER_NODE * float(phase) * (1 + 0.2 * level))


class _Accumulator:
    """Row sums sum_nodes w B_b cos(2 pi (m u - n v)) for m = 0..m_max, n in [-n_max, n_max]."""

    def __init__(self, count: int, m_max: int, n_max: int, fp: FixedPoint, two_pi):
        self.fp = fp
        self.two_pi = two_pi
        self.m_max, self.n_max = m_max, n_max
        self.rows = [[mpz(0)] * (m_max + 1) for _ in range(count)]

    def add(self, values, u, v):
        """Add one node: ``values`` = [weight x B_b], position z = u + v tau (all fixed point)."""
        fp = self.fp
        bits = fp.bits
        # e^(-2 pi i n v) for n = -n_max..n_max, packed (real and imaginary parts)
        cr, ci = fp.cos_sin((-self.two_pi * v) >> bits)
        pr, pi_ = fp.one, mpz(0)
        forward_r, forward_i = [pr], [pi_]
        for _ in range(self.n_max):
            pr, pi_ = (pr * cr - pi_ * ci) >> bits, (pr * ci + pi_ * cr) >> bits
            forward_r.append(pr)
            forward_i.append(pi_)
        # slots n = -n_max .. n_max: negative n are conjugates
        real = [forward_r[k] for k in range(self.n_max, 0, -1)] + forward_r
        imag = [-forward_i[k] for k in range(self.n_max, 0, -1)] + forward_i
        packed_r, packed_i = fp.pack(real), fp.pack(imag)
        ar, ai = fp.cos_sin((self.two_pi * u) >> bits)   # e^(2 pi i u)
        er, ei = fp.one, mpz(0)
        for m in range(self.m_max + 1):
            for b, value in enumerate(values):
                cre, cim = (value * er) >> bits, (value * ei) >> bits
                self.rows[b][m] += cre * packed_r - cim * packed_i
            er, ei = (er * ar - ei * ai) >> bits, (er * ai + ei * ar) >> bits

    def table(self, b: int, points, ctx):
        """{(m, n): coefficient} as global-context mpf, converted without rounding."""
        unpacked = {m: self.fp.unpack(self.rows[b][m], 2 * self.n_max + 1)
                    for m in {m for m, _ in points}}
        return {(m, n): export(self.fp.to_mpf(unpacked[m][n + self.n_max], ctx))
                for m, n in points}


def fourier_coefficients(bundles, tau, points, bits: int, max_zeta, level: int = 0,
                         job: Job | None = None) -> list:
    """[{(m, n): B^_b(m tau + n)} for each bundle b] (mpf), tau in the fundamental domain.

    ``points`` must satisfy m >= 0 (the coefficients are even in p);
    ``max_zeta`` bounds 2 pi |p| / tau2 over them and sizes the rules.
    """
    job = ensure_job(job)
    ctx = mpmath.MPContext()
    ctx.prec = bits + 40
    tau = ctx.mpc(tau)
    tau1, tau2 = tau.real, tau.imag
    weights = sorted({a for bundle in bundles for a in bundle})
    kernels = EdgeKernels(tau, weights, bits)
    fp = kernels.fp
    slot_of = {a: i for i, a in enumerate(weights)}
    multiplicities = [sorted(Counter(bundle).items()) for bundle in bundles]
    m_max = max(m for m, _ in points)
    n_max = max(abs(n) for _, n in points)
    acc = _Accumulator(len(bundles), m_max, n_max, fp, fp.from_number(2 * ctx.pi))
    scale = 2 / tau2        # (1/tau2) x 2 for the half torus
    inverse_tau2 = fp.from_number(1 / tau2)
    tau1_fixed = fp.from_number(tau1)
    max_zeta = ctx.mpf(max_zeta)

    def add_node(x, y, weight, products):
        v = (y * inverse_tau2) >> fp.bits
        u = x - ((v * tau1_fixed) >> fp.bits)
        acc.add([(weight * value) >> fp.bits for value in products], u, v)

    def bundle_values(x, y):
        r2 = (x * x + y * y) >> fp.bits
        log_r2 = fp.log(r2)
        regular = kernels.regular_parts(x, y, r2, log_r2)
        logs = kernels.log_coefficients(r2)
        g = [value + ((c * log_r2) >> fp.bits) for value, c in zip(regular, logs)]
        out = []
        for counts in multiplicities:
            product = fp.one
            for a, k in counts:
                for _ in range(k):
                    product = (product * g[slot_of[a]]) >> fp.bits
            out.append(product)
        return out

    height = min(tau2 / 2, ctx.mpf(STRIP_HEIGHT))
    panels = _angular_panels(height, max_zeta, bits, level, ctx)
    inner_order = max(len(bundle) for bundle in bundles)
    inner_nodes = _panel_nodes(bits, level, max_zeta * INNER_RADIUS * 0.75)
    inner = radial_rule(inner_nodes, inner_order, bits)
    radial_panels = _radial_panels(max_zeta, bits, level, ctx)
    total_rays = sum(len(nodes) for _, _, _, _, nodes, _ in panels)
    done = 0
    for start, stop, distance, normal, phis, phi_weights in panels:
        width = stop - start
        for t, w_phi in zip(phis, phi_weights):
            phi = start + width * t
            reach = distance / ctx.cos(phi - normal)
            cos_phi, sin_phi = ctx.cos(phi), ctx.sin(phi)
            ray_weight = w_phi * width * reach * reach * scale
            # inner part: s in [0, INNER_RADIUS], polynomial in log s
            rho = reach * INNER_RADIUS
            log_rho2 = fp.from_number(2 * ctx.log(rho))
            rho_cos, rho_sin = fp.from_number(rho * cos_phi), fp.from_number(rho * sin_phi)
            rho2 = fp.from_number(rho * rho)
            inner_weight = ray_weight * INNER_RADIUS ** 2
            for i, (s, log_s) in enumerate(zip(inner.nodes, inner.log_nodes)):
                x = (s * rho_cos) >> fp.bits
                y = (s * rho_sin) >> fp.bits
                r2 = (((s * s) >> fp.bits) * rho2) >> fp.bits
                log_r2 = 2 * log_s + log_rho2
                regular = kernels.regular_parts(x, y, r2, log_r2)
                logs = kernels.log_coefficients(r2)
                products = []
                for counts in multiplicities:
                    poly = [fp.one]   # in sigma = log s: G_a = (R_a + c log rho^2) + 2 c sigma
                    for a, k in counts:
                        constant = regular[slot_of[a]] + ((logs[slot_of[a]] * log_rho2) >> fp.bits)
                        slope = 2 * logs[slot_of[a]]
                        for _ in range(k):
                            poly = _times_linear(poly, constant, slope, fp.bits)
                    products.append(sum(inner.weights[k][i] * c for k, c in enumerate(poly))
                                    >> fp.bits)
                add_node(x, y, fp.from_number(inner_weight), products)
            # outer part: Gauss panels in s
            for s, w_s in radial_panels:
                r = reach * s
                x, y = fp.from_number(r * cos_phi), fp.from_number(r * sin_phi)
                add_node(x, y, fp.from_number(ray_weight * s * w_s), bundle_values(x, y))
            done += 1
            job.report(0.9 * done / total_rays, "bundle Fourier coefficients: around z = 0")
    if tau2 / 2 > height:
        _upper_region(add_node, bundle_values, height, tau2 / 2, m_max, max_zeta, scale,
                      bits, level, fp, ctx)
    job.report(1.0, "bundle Fourier coefficients")
    return [acc.table(b, points, ctx) for b in range(len(bundles))]


def gauss_nodes(n: int, ctx) -> tuple:
    """(nodes, weights) of the n-point Gauss-Legendre rule on [0, 1] as mpf of ``ctx``."""
    rule = gauss_legendre(n, ctx.prec + 10)
    bits = rule.fixed.bits
    convert = lambda v: ctx.ldexp(ctx.mpf(int(v)), -bits)  # noqa: E731
    return [convert(x) for x in rule.nodes], [convert(w) for w in rule.weights]


def _times_linear(poly, constant, slope, bits):
    out = [(constant * c) >> bits for c in poly] + [0]
    for k, c in enumerate(poly):
        out[k + 1] += (slope * c) >> bits
    return out


def _angular_panels(height, max_zeta, bits, level, ctx):
    """(phi_a, phi_b, distance to edge, edge normal, nodes, weights) covering 0 <= phi <= pi."""
    corner = ctx.atan2(height, ctx.mpf(1) / 2)
    edges = [(ctx.zero, corner, ctx.mpf(1) / 2, ctx.zero),
             (corner, ctx.pi - corner, height, ctx.pi / 2),
             (ctx.pi - corner, ctx.pi, ctx.mpf(1) / 2, ctx.pi)]
    panels = []
    for start, stop, distance, normal in edges:
        far = max(distance / ctx.cos(start - normal), distance / ctx.cos(stop - normal))
        phase = max_zeta * far * (stop - start)
        nodes, weights = gauss_nodes(_panel_nodes(bits, level, phase), ctx)
        panels.append((start, stop, distance, normal, nodes, weights))
    return panels


def _radial_panels(max_zeta, bits, level, ctx):
    """(s, weight) for s in [INNER_RADIUS, 1]: geometric panels up to 1/2, then [1/2, 1]."""
    out = []
    start = ctx.mpf(INNER_RADIUS)
    reach = ctx.mpf(3) / 4   # the longest ray: the corner of the strip
    while start < 1:
        stop = min(2 * start, ctx.one)
        count = _panel_nodes(bits, level, max_zeta * reach * (stop - start))
        nodes, weights = gauss_nodes(count, ctx)
        out.extend((start + (stop - start) * t, (stop - start) * w) for t, w in zip(nodes, weights))
        start = stop
    return out


def _upper_region(add_node, bundle_values, low, high, m_max, max_zeta, scale, bits, level, fp, ctx):
    """low <= y <= high, |x| <= 1/2: trapezoid in x, Gauss-Legendre panels in y."""
    digits = bits * math.log10(2)
    count = m_max + 4 + math.ceil((digits * math.log(10) + 10) / (2 * math.pi * float(low))
                                  * (1 + 0.2 * level))
    xs = [fp.from_number(ctx.mpf(2 * k + 1) / (2 * count) - ctx.mpf(1) / 2) for k in range(count)]
    start = low
    while start < high:
        stop = min(2 * start, high)
        if high - stop < start / 2:
            stop = high
        nodes, weights = gauss_nodes(_panel_nodes(bits, level, max_zeta * (stop - start)), ctx)
        for t, w in zip(nodes, weights):
            y = fp.from_number(start + (stop - start) * t)
            weight = fp.from_number(w * (stop - start) * scale / count)
            for x in xs:
                add_node(x, y, weight, bundle_values(x, y))
        start = stop
