"""One-edge kernels: the torus functions G_a(z) of weight a at a point.

Convention (engine-wide): tau = tau1 + i tau2, lattice momenta p = m tau + n,
a point of the torus z = u + v tau (u, v real), and the character

    chi_p(z) = exp(2 pi i (m u - n v)) = exp(pi (p conj(z) - conj(p) z) / tau2),

so that chi_p chi_p' = chi_(p+p') and the torus average of chi_p vanishes
unless p = 0.  Then

    G_a(z) = sum_{p != 0} (tau2/pi)^a chi_p(z) / |p|^(2a):

G_1 is the scalar Green's function, G_a the a-fold convolution of G_1, and a
dihedral graph is the torus average of a product of G_a.  G_a is real, even,
periodic, and invariant under z -> z/(c tau + d), tau -> (a tau + b)/(c tau + d).

Near z = 0, G_a(z) = gamma_a |z|^(2a-2) log|z|^2 + R_a(z) with R_a real-analytic
and gamma_a = (-1)^a (pi/tau2)^(a-1) / ((a-1)!)^2; :class:`EdgeKernels` returns
the regular parts R_a in fixed point.

* G_1 alone: Kronecker's second limit formula,
  G_1(z) = -log|theta_1(z)/eta|^2 + 2 pi (Im z)^2 / tau2, with the Gaussian
  theta series (a handful of terms).
* otherwise: Poisson resummation in n, then the sum over m (0 <= v <= 1),
  with lambda = 4 pi tau2, x0 = exp(2 pi i z), q = exp(2 pi i tau):

      G_a(z) = (-1)^(a+1) lambda^a B_2a(v) / (2a)!
               + Re sum_j kappa_aj [ sum_{k>=0} (v+k)^j Li_(2a-1-j)(x0 q^k)
                                     + sum_{k>=0} (1-v+k)^j Li_(2a-1-j)(q^(k+1)/x0) ],
      kappa_aj = 2 (2a-2-j)! lambda^(j-a+1) / ((a-1)! j! (a-1-j)!),  j = 0..a-1.

  All terms but Li(x0) form one sum over m of x0^m and (q/x0)^m times
  polynomials in v (coefficients fixed per tau); Li(x0) is summed per point by
  the cheapest of three series: around z = 0 (its logarithm combines into
  gamma_a |z|^(2a-2) log|z|^2 exactly), around z = +-1/2, or in powers of x0.

>>> import mpmath
>>> g = green_value(1, mpmath.mpf("0.25"), mpmath.mpf("0.5"), mpmath.mpc(0, 1), mpmath.mp)
>>> mpmath.nstr(g, 12)
'-0.52733019108'
"""

from __future__ import annotations

import math
from functools import lru_cache
from itertools import islice

import mpmath

from ledger.errors import LedgerError
from ledger.mgf.fixedpoint import FixedPoint, mpz
from ledger.mgf.polylog_tables import taylor_table

AROUND_ZERO, AROUND_HALF, POWER_SERIES = "zero", "half", "power"
SERIES_MARGIN_BITS = 12  # covers coefficient sizes and rounding in the point series
WORST_POWER_RATIO = 0.5   # the power series in x0 is used only below this ratio


def polylog_orders(weights) -> tuple:
    """The orders s of Li_s that G_a needs: a <= s <= 2a-1."""
    return tuple(sorted({s for a in weights for s in range(a, 2 * a)}))


def log_coefficient(a: int, tau2, ctx):
    """gamma_a in G_a(z) = gamma_a |z|^(2a-2) log|z|^2 + (real-analytic)."""
    return (-1) ** a * (ctx.pi / tau2) ** (a - 1) / ctx.factorial(a - 1) ** 2


class EdgeKernels:
    """The regular parts R_a(z) of G_a for a set of weights at one tau, in fixed point.

    Points are fixed-point integers z = x + i y with |x| <= 1/2 and
    0 <= y <= tau2/2 (the torus modulo z -> -z); tau should lie in the
    fundamental domain, where |q| is smallest.
    """

    def __init__(self, tau, weights, bits: int):
        self.weights = tuple(sorted({int(a) for a in weights}))
        if not self.weights or self.weights[0] < 1:
            raise LedgerError(f"edge weights must be positive integers, got {weights}")
        self.bits = bits
        self.fp = fp = FixedPoint(bits)
        ctx = mpmath.MPContext()
        ctx.prec = bits + 40
        tau = ctx.mpc(tau)
        if not tau.imag > 0:
            raise LedgerError("tau must lie in the upper half plane")
        self.tau = tau
        self.tau2 = tau.imag
        self._gamma = [fp.from_number(log_coefficient(a, tau.imag, ctx)) for a in self.weights]
        if self.weights == (1,):
            self._scalar, self._series = _ScalarGreen(tau, fp, ctx), None
        else:
            self._scalar, self._series = None, _PolylogGreen(tau, self.weights, fp, ctx)

    def regular_parts(self, x, y, r2, log_r2=None) -> list:
        """[R_a(z) for a in weights] in fixed point; r2 = |z|^2 (> 0); log_r2 =
        log|z|^2 is computed when needed and not given."""
        fp = self.fp
        g = fp.gmp
        pi_x = g.mul(fp.to_gmp(x), fp.pi)
        sin, cos = g.sin_cos(pi_x)
        growth = g.expm1(g.mul(fp.to_gmp(y), fp.pi))  # e^(pi y) - 1
        point = _Point(x, y, fp.from_gmp(cos), fp.from_gmp(sin), growth)
        if self._scalar is not None:
            return [self._scalar.regular_part(point, fp, g, r2)]
        if log_r2 is None and self._series.needs_log(point):
            log_r2 = fp.log(r2)
        return self._series.regular_parts(point, fp, g, r2, log_r2)

    def log_coefficients(self, r2) -> list:
        """[gamma_a |z|^(2a-2) for a in weights] in fixed point, given |z|^2."""
        bits = self.bits
        out = []
        power, exponent = self.fp.one, 0
        for a, gamma in zip(self.weights, self._gamma):
            while exponent < a - 1:
                power = (power * r2) >> bits
                exponent += 1
            out.append((gamma * power) >> bits)
        return out

    def values(self, x, y) -> list:
        """[G_a(z) for a in weights] in fixed point (z != 0)."""
        bits = self.bits
        r2 = (x * x + y * y) >> bits
        log_r2 = self.fp.log(r2)
        regular = self.regular_parts(x, y, r2, log_r2)
        return [value + ((coefficient * log_r2) >> bits)
                for value, coefficient in zip(regular, self.log_coefficients(r2))]


class _Point:
    """Per-point data: x, y, cos(pi x), sin(pi x) (fixed point), e^(pi y) - 1 (gmpy2)."""

    __slots__ = ("x", "y", "cos", "sin", "growth")

    def __init__(self, x, y, cos, sin, growth):
        self.x, self.y, self.cos, self.sin, self.growth = x, y, cos, sin, growth


class _ScalarGreen:
    """R_1(z) = G_1(z) + log|z|^2 from Kronecker's second limit formula.

    theta_1(z) = sum_n (-1)^n Q_n (E^(2n+1) - E^-(2n+1)) / i, E = e^(i pi z),
    Q_n = e^(i pi tau (n+1/2)^2); the n = 0 term is 2 Q_0 sin(pi z) (computed
    without cancellation), and E^-(2n+1) is scaled by e^(-(2n+1) pi tau2/2) so
    that every fixed-point factor stays of moderate size for y <= tau2/2.
    """

    def __init__(self, tau, fp, ctx):
        tau2 = tau.imag
        self._half_height = ctx.pi * tau2 / 2
        target = (fp.bits + 16) * math.log(2)
        count = 1
        while ctx.pi * tau2 * (count * count - ctx.mpf(1) / 4) < target:
            count += 1
        pair = lambda z: (fp.from_number(z.real), fp.from_number(z.imag))  # noqa: E731
        self._q = [pair((-1) ** n * ctx.expjpi(tau * (n + ctx.mpf(1) / 2) ** 2))
                   for n in range(count + 1)]
        self._q_scaled = [pair((-1) ** n * ctx.expjpi(tau * (n + ctx.mpf(1) / 2) ** 2)
                               * ctx.exp((2 * n + 1) * self._half_height))
                          for n in range(count + 1)]
        eta = ctx.expjpi(tau / 12) * ctx.qp(ctx.expjpi(2 * tau))
        self._log_eta2 = fp.from_number(ctx.log(abs(eta) ** 2))
        self._two_pi_over_tau2 = fp.from_number(2 * ctx.pi / tau2)
        self._exp_half_height = fp.to_gmp(fp.from_number(ctx.exp(-self._half_height)))

    def regular_part(self, point, fp, g, r2):
        bits = fp.bits
        growth = point.growth
        up = g.add(growth, 1)                             # e^(pi y)
        sinh = fp.from_gmp(g.div(g.mul(growth, g.add(growth, 2)), g.mul(up, 2)))
        cosh = fp.from_gmp(g.div(g.add(g.mul(up, up), 1), g.mul(up, 2)))
        down = fp.from_gmp(g.div(1, up))                 # e^(-pi y)
        scaled = fp.from_gmp(g.mul(up, self._exp_half_height))  # e^(pi y - pi tau2/2)
        c, s = point.cos, point.sin
        # n = 0: 2 Q_0 sin(pi z), sin(pi z) = sin(pi x) cosh(pi y) + i cos(pi x) sinh(pi y)
        sr, si = (s * cosh) >> bits, (c * sinh) >> bits
        q0r, q0i = self._q[0]
        tr, ti = (2 * (q0r * sr - q0i * si)) >> bits, (2 * (q0r * si + q0i * sr)) >> bits
        # n >= 1: E^(2n+1) = E (E^2)^n and F^(2n+1), F = E^-1 e^(-pi tau2/2)
        er, ei = (down * c) >> bits, (down * s) >> bits
        fr, fi = (scaled * c) >> bits, -((scaled * s) >> bits)
        e2r, e2i = (er * er - ei * ei) >> bits, (2 * er * ei) >> bits
        f2r, f2i = (fr * fr - fi * fi) >> bits, (2 * fr * fi) >> bits
        pr, pi_ = er, ei
        mr, mi = fr, fi
        acc_r = acc_i = 0
        for (qr, qi), (sr_, si_) in zip(self._q[1:], self._q_scaled[1:]):
            pr, pi_ = (pr * e2r - pi_ * e2i) >> bits, (pr * e2i + pi_ * e2r) >> bits
            mr, mi = (mr * f2r - mi * f2i) >> bits, (mr * f2i + mi * f2r) >> bits
            dr = qr * pr - qi * pi_ - (sr_ * mr - si_ * mi)
            di = qr * pi_ + qi * pr - (sr_ * mi + si_ * mr)
            acc_r += di      # (d / i) = (di, -dr)
            acc_i -= dr
        tr += acc_r >> bits
        ti += acc_i >> bits
        norm = tr * tr + ti * ti                          # |theta_1|^2 scaled by 2^(2 bits)
        ratio = norm // r2                                # |theta_1 / z|^2 in fixed point
        y = point.y
        return (-fp.log(ratio) + self._log_eta2
                + ((((y * y) >> bits) * self._two_pi_over_tau2) >> bits))


class _PolylogGreen:
    """R_a(z) from the polylogarithm form (see the module docstring).

    The sum splits into Li(x0) (series chosen per point), Li(y0) with
    y0 = q/x0 (power series, |y0| <= |q|^(1/2)), both with real coefficients
    (Re x0^m and Re y0^m follow a real three-term recurrence), and the images
    k >= 1 with complex coefficients of size |q|^m (a short complex sum).
    Coefficients are packed over the slots (a, l) of v^l in G_a.
    """

    def __init__(self, tau, weights, fp, ctx):
        self.weights = weights
        self.orders = polylog_orders(weights)
        self._index = {s: i for i, s in enumerate(self.orders)}
        tau2 = tau.imag
        lam = 4 * ctx.pi * tau2
        self._fp = fp
        self._log_abs_q = float(2 * ctx.pi * tau2)
        self._inverse_tau2 = fp.from_number(1 / tau2)
        self._zero_mode, self._kappa, self._gamma, self._gamma_log2pi = [], [], [], []
        for a in weights:
            scale = (-1) ** (a + 1) * lam ** a / ctx.factorial(2 * a)
            self._zero_mode.append([fp.from_number(scale * ctx.mpf(c.numerator) / c.denominator)
                                    for c in _bernoulli_polynomial(2 * a)])
            self._kappa.append([_kappa(a, j, lam, ctx) for j in range(a)])
            gamma = log_coefficient(a, tau2, ctx)
            self._gamma.append(fp.from_number(gamma))
            self._gamma_log2pi.append(fp.from_number(2 * gamma * ctx.log(2 * ctx.pi)))
        self._slots = [(a, l) for a in weights for l in range(a)]
        self._kappa_fixed = [[fp.from_number(k) for k in row] for row in self._kappa]
        self._target = (fp.bits + SERIES_MARGIN_BITS) * math.log(2)
        self._abs_q_float = math.exp(-self._log_abs_q)
        self._tables = {method: taylor_table(self.orders, fp.bits, method == AROUND_HALF)
                        for method in (AROUND_ZERO, AROUND_HALF)} if self.orders else {}
        self._build_tables(tau, fp, ctx)
        phase = ctx.expjpi(2 * tau.real)
        self._phase = (fp.from_number(phase.real), fp.from_number(phase.imag))
        self.gmp_abs_q = fp.to_gmp(fp.from_number(ctx.exp(-2 * ctx.pi * tau2)))

    def _build_tables(self, tau, fp, ctx):
        target = (fp.bits + 30) * math.log(2)
        q = ctx.expjpi(2 * tau)
        kappa = dict(zip(self.weights, self._kappa))
        # Li(x0) and Li(y0): real coefficients of Re x0^m v^l and Re y0^m v^l
        direct_count = int(target / -math.log(WORST_POWER_RATIO)) + 2
        self._x0_direct = [fp.pack([fp.from_number(kappa[a][l] / ctx.mpf(m) ** (2 * a - 1 - l))
                                    for a, l in self._slots]) for m in range(1, direct_count + 1)]
        y0_count = int(target / (0.5 * self._log_abs_q)) + 2
        self._y0_direct = [fp.pack([fp.from_number(sum(
            (-1) ** l * math.comb(j, l) * kappa[a][j] / ctx.mpf(m) ** (2 * a - 1 - j)
            for j in range(l, a))) for a, l in self._slots]) for m in range(1, y0_count + 1)]
        # images k >= 1: complex coefficients of x0^m and y0^m, of size |q|^m
        image_count = int(target / self._log_abs_q) + 2
        plus, minus = [], []
        for m in range(1, image_count + 1):
            big_q = q ** m
            moments = _geometric_moments(big_q, max(self.weights) - 1)
            row_plus, row_minus = [], []
            for a, l in self._slots:
                terms = [(kappa[a][j] / ctx.mpf(m) ** (2 * a - 1 - j) * math.comb(j, l), j - l)
                         for j in range(l, a)]
                row_plus.append(sum((c * moments[i] for c, i in terms), ctx.mpc(0)))
                # x0^-m A_i(Q)(-v)^.. = y0^m (A_i(Q)/Q) (-v)^..; the 1 in A_i/Q is Li(y0)
                row_minus.append((-1) ** l * sum((c * (moments[i] / big_q - 1) for c, i in terms),
                                                 ctx.mpc(0)))
            plus.append(self._pack_complex(row_plus))
            minus.append(self._pack_complex(row_minus))
        self._x0_images, self._y0_images = plus, minus

    def _pack_complex(self, row):
        fp = self._fp
        return (fp.pack([fp.from_number(z.real) for z in row]),
                fp.pack([fp.from_number(z.imag) for z in row]))

    @staticmethod
    def _choose(point, fp) -> tuple:
        """(method, ratio): the expansion of Li(x0) with the smallest convergence ratio."""
        scale = fp.float_scale
        xf, yf = abs(float(point.x)) * scale, float(point.y) * scale
        best, ratio = AROUND_ZERO, math.hypot(xf, yf)
        half = 2 * math.hypot(xf - 0.5, yf)
        if half < ratio:
            best, ratio = AROUND_HALF, half
        power = max(math.exp(-2 * math.pi * yf), WORST_POWER_RATIO)
        if power < ratio:
            best, ratio = POWER_SERIES, power
        return best, ratio

    def needs_log(self, point) -> bool:
        return self._choose(point, self._fp)[0] != AROUND_ZERO

    def regular_parts(self, point, fp, g, r2, log_r2) -> list:
        bits = fp.bits
        one = fp.one
        x, y = point.x, point.y
        method, ratio = self._choose(point, fp)
        target = self._target
        # x0 = e^(2 pi i z), y0 = q / x0 = |q| e^(2 pi y) e^(2 pi i (tau1 - x))
        up = g.add(point.growth, 1)
        c, s = point.cos, point.sin
        cos2, sin2 = ((c * c - s * s) >> bits), ((2 * c * s) >> bits)
        x_size = fp.from_gmp(g.div(1, g.mul(up, up)))
        xr, xi = (x_size * cos2) >> bits, (x_size * sin2) >> bits
        y_size = fp.from_gmp(g.mul(g.mul(up, up), self.gmp_abs_q))
        pr_, pi_ = self._phase
        yr = (y_size * ((pr_ * cos2 + pi_ * sin2) >> bits)) >> bits
        yi = (y_size * ((pi_ * cos2 - pr_ * sin2) >> bits)) >> bits
        x_ratio, y_ratio = float(x_size) * fp.float_scale, float(y_size) * fp.float_scale
        abs_q = self._abs_q_float
        acc = _real_power_sum(self._y0_direct, yr, (y_size * y_size) >> bits,
                              _terms(target, y_ratio), bits)
        if method == POWER_SERIES:
            acc += _real_power_sum(self._x0_direct, xr, (x_size * x_size) >> bits,
                                   _terms(target, x_ratio), bits)
        acc += _complex_power_sum(self._x0_images, xr, xi, _terms(target, abs_q * x_ratio), bits)
        acc += _complex_power_sum(self._y0_images, yr, yi, _terms(target, abs_q * y_ratio), bits)
        slot_values = fp.unpack(acc, len(self._slots))
        v = (y * self._inverse_tau2) >> bits
        v_powers = [one]
        for _ in range(max(self.weights)):
            v_powers.append((v_powers[-1] * v) >> bits)
        if method != POWER_SERIES:
            singular = self._singular_term(method, x, y, ratio, target, fp)
        out = []
        index = 0
        r2_power, exponent = one, 0
        for k, a in enumerate(self.weights):
            value = _poly_fixed(self._zero_mode[k], v, bits)
            for l in range(a):
                value += (slot_values[index] * v_powers[l]) >> bits
                index += 1
            if method != POWER_SERIES:
                kappa = self._kappa_fixed[k]
                for j in range(a):
                    value += (((kappa[j] * v_powers[j]) >> bits)
                              * singular[self._index[2 * a - 1 - j]]) >> bits
            while exponent < a - 1:
                r2_power = (r2_power * r2) >> bits
                exponent += 1
            if method == AROUND_ZERO:
                value += (self._gamma_log2pi[k] * r2_power) >> bits
            else:
                value -= (((self._gamma[k] * r2_power) >> bits) * log_r2) >> bits
            out.append(value)
        return out

    def _singular_term(self, method, x, y, ratio, target, fp) -> list:
        """[Re Li_s(x0) for s in orders] (without its logarithm around z = 0), by a
        series in t with |t| = ratio; Re t^n follows a real three-term recurrence."""
        bits = fp.bits
        if method == AROUND_ZERO:
            tr, ti = -y, x                                # t = i z
        else:
            shift = fp.one >> 1
            tr, ti = -2 * y, 2 * (x - shift if x >= 0 else x + shift)   # t = 2 i (z -+ 1/2)
        table = self._tables[method]
        acc = (table[0] << bits) + _real_power_sum(table, tr, (tr * tr + ti * ti) >> bits,
                                                   _terms(target, ratio) - 1, bits, offset=1)
        return fp.unpack(acc, len(self.orders))


def _real_power_sum(table, re, norm, count, bits, offset=0):
    """sum_{m=1..count} table[offset+m-1] * Re(w^m) (unshifted), from Re w and |w|^2:
    Re w^(m+1) = 2 Re w Re w^m - |w|^2 Re w^(m-1)."""
    count = min(count, len(table) - offset)
    if count <= 0:
        return 0
    twice_re = 2 * re
    acc = table[offset] * re
    previous, current = mpz(1) << bits, re
    for coefficient in islice(table, offset + 1, offset + count):
        previous, current = current, (twice_re * current - norm * previous) >> bits
        acc += coefficient * current
    return acc


def _complex_power_sum(table, wr, wi, count, bits):
    """sum_{m=1..count} Re(table[m-1] * w^m) (unshifted) for packed complex rows."""
    acc = 0
    ar, ai = wr, wi
    for re_c, im_c in islice(table, count):
        acc += re_c * ar - im_c * ai
        ar, ai = (ar * wr - ai * wi) >> bits, (ar * wi + ai * wr) >> bits
    return acc


def _terms(target: float, ratio: float) -> int:
    """Terms of a geometric series with this ratio needed to reach e^-target."""
    if ratio <= 0:
        return 2
    return int(target / -math.log(ratio)) + 2


def _kappa(a, j, lam, ctx):
    return (2 * ctx.factorial(2 * a - 2 - j) * lam ** (j - a + 1)
            / (ctx.factorial(a - 1) * ctx.factorial(j) * ctx.factorial(a - 1 - j)))


def _poly_fixed(coeffs, x, bits):
    value = mpz(0)
    for c in reversed(coeffs):
        value = ((value * x) >> bits) + c
    return value


@lru_cache(maxsize=None)
def _bernoulli_polynomial(n: int) -> tuple:
    """B_n(x) as Fractions, lowest degree first."""
    from ledger.mgf.bernoulli import bernoulli_polynomial
    return tuple(bernoulli_polynomial(n))


def _geometric_moments(big_q, top: int) -> list:
    """A_i(Q) = sum_{k>=1} k^i Q^k = Q A_i^Euler(Q) / (1-Q)^(i+1), i = 0..top."""
    moments = []
    for i in range(top + 1):
        eulerian = [sum((-1) ** j * math.comb(i + 1, j) * (k + 1 - j) ** i for j in range(k + 2))
                    for k in range(max(i, 1))]
        numerator = sum(c * big_q ** k for k, c in enumerate(eulerian)) if i else 1
        moments.append(big_q * numerator / (1 - big_q) ** (i + 1))
    return moments


def green_value(a: int, u, v, tau, ctx):
    """G_a(u + v tau | tau) as an mpf of ``ctx`` (at its precision), for real u, v.

    >>> import mpmath
    >>> ctx = mpmath.MPContext(); ctx.dps = 30
    >>> tau = ctx.mpc("0.2", "1.1")
    >>> g = green_value(2, ctx.mpf("0.1"), ctx.mpf("0.3"), tau, ctx)
    >>> g_minus = green_value(2, ctx.mpf("-0.1"), ctx.mpf("-0.3"), tau, ctx)
    >>> abs(g - g_minus) < ctx.mpf(10) ** -28          # G_a(-z) = G_a(z)
    True
    """
    from ledger.mgf.modular import reduce_point

    if isinstance(a, bool) or not isinstance(a, int) or a < 1:
        raise LedgerError(f"the weight of G_a must be a positive integer, got {a!r}")
    bits = int(ctx.prec) + 30
    tau_f, x, y = reduce_point(ctx.mpf(u), ctx.mpf(v), ctx.mpc(tau), ctx)
    kernels = EdgeKernels(tau_f, [a], bits)
    fp = kernels.fp
    xf, yf = fp.from_number(x), fp.from_number(y)
    if xf == 0 and yf == 0:
        if a == 1:
            raise LedgerError("G_1 is infinite at a lattice point")
        value = kernels.regular_parts(xf, yf, mpz(0), mpz(0))[0]
    else:
        value = kernels.values(xf, yf)[0]
    return +fp.to_mpf(value, ctx)
