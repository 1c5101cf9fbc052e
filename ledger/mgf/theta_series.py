"""Jacobi theta functions and the Dedekind eta function from their q-series.

Conventions (elliptic variable of period 1, nome q = exp(i pi tau)):

    theta_1(z|tau) = 2 sum_{n>=0} (-1)^n q^((n+1/2)^2) sin((2n+1) pi z)
    theta_2(z|tau) = 2 sum_{n>=0} q^((n+1/2)^2) cos((2n+1) pi z)
    theta_3(z|tau) = 1 + 2 sum_{n>=1} q^(n^2) cos(2 n pi z)
    theta_4(z|tau) = 1 + 2 sum_{n>=1} (-1)^n q^(n^2) cos(2 n pi z)
    eta(tau) = q^(1/12) prod_{n>=1} (1 - q^(2n))
             = sum_{m>=1} chi_12(m) exp(i pi tau m^2 / 12)

These are mpmath's ``jtheta(nu, pi*z, exp(i*pi*tau))`` (mpmath measures z in
units where the period is pi, so a z-derivative here is pi times mpmath's) and
python-flint's ``acb(z).modular_theta(tau)``.

The argument is first moved into the parallelogram |Re z| <= 1/2,
|Im z| <= tau2/2 with the quasi-periodicity
theta(z + tau) = eps exp(-i pi tau - 2 pi i z) theta(z), theta(z + 1) = eps' theta(z);
the series is then summed until a rigorous bound on the tail (geometric in
the ratio of consecutive terms) is below the working precision. The error
estimate is that tail bound plus a rounding allowance.

>>> t = jacobi_theta(3, 0, 1j, digits=20)
>>> mpmath.nstr(t.value, 20)   # theta_3(0|i) = pi^(1/4)/Gamma(3/4) (from memory)
'1.0864348112133080146'
>>> t.error < 1e-25
True
"""

from __future__ import annotations

import mpmath

from ledger.errors import LedgerError
from ledger.mgf.approx import Approx, as_complex, as_tau, refine
from ledger.mgf.values import Value

MAX_TERMS = 100_000

# theta_nu(z + 1) = SHIFT_BY_ONE[nu] theta_nu(z)
SHIFT_BY_ONE = {1: -1, 2: -1, 3: 1, 4: 1}
# theta_nu(z + tau) = SHIFT_BY_TAU[nu] exp(-i pi tau - 2 pi i z) theta_nu(z)
SHIFT_BY_TAU = {1: -1, 2: 1, 3: 1, 4: -1}


def jacobi_theta(nu: int, z, tau, digits: int = 30, derivative: int = 0) -> Value:
    """theta_nu(z|tau), or its ``derivative``-th z-derivative, with an error bound.

    >>> v = jacobi_theta(1, 0, 1j, derivative=1, digits=20)
    >>> eta = dedekind_eta(1j, digits=20).value
    >>> abs(v.value - 2 * mpmath.pi * eta ** 3) < 1e-14   # Jacobi's identity
    True
    """
    _check_nu(nu, (1, 2, 3, 4))
    if isinstance(derivative, bool) or not isinstance(derivative, int) or derivative < 0:
        raise LedgerError(f"derivative order must be a non-negative integer, got {derivative!r}")

    def compute(ctx):
        return theta_approx(ctx, nu, as_complex(z, ctx, "z"), as_tau(tau, ctx), derivative)

    return refine(compute, digits).to_value(digits)


def dedekind_eta(tau, digits: int = 30) -> Value:
    """eta(tau) with an error bound.

    >>> mpmath.nstr(dedekind_eta(1j, digits=20).value, 15)  # Gamma(1/4)/(2 pi^(3/4)), from memory
    '0.768225422326057'
    """
    return refine(lambda ctx: eta_approx(ctx, as_tau(tau, ctx)), digits).to_value(digits)


def theta1_prime(tau, digits: int = 30) -> Value:
    """theta_1'(0|tau) (= 2 pi eta(tau)^3 by Jacobi's identity).

    >>> mpmath.nstr(theta1_prime(2j, digits=20).value, 12)
    '1.30613223486'
    """
    return jacobi_theta(1, 0, tau, digits, derivative=1)


def theta_approx(ctx, nu: int, z, tau, derivative: int = 0) -> Approx:
    """theta_nu^(derivative)(z|tau) as an :class:`Approx` in the context ``ctx``."""
    shifts_tau = int(ctx.nint(z.imag / tau.imag))
    shifted = z - shifts_tau * tau
    shifts_one = int(ctx.nint(shifted.real))
    reduced = shifted - shifts_one
    # theta(z) = eps^n exp(i pi n^2 tau - 2 pi i n z) theta(z - n tau), n = shifts_tau,
    # and derivatives by Leibniz' rule on exp(-2 pi i n z).
    sign = SHIFT_BY_TAU[nu] ** (shifts_tau % 2) * SHIFT_BY_ONE[nu] ** (shifts_one % 2)
    exponent = shifts_tau ** 2 * tau - 2 * shifts_tau * z
    multiplier = sign * ctx.expjpi(exponent)
    multiplier_error = (abs(ctx.pi * exponent) + 10) * ctx.eps * abs(multiplier)
    total = Approx(ctx, ctx.zero, ctx.zero)
    slope = -2j * ctx.pi * shifts_tau
    for order in range(derivative + 1):
        if order < derivative and shifts_tau == 0:
            continue
        factor = ctx.binomial(derivative, order) * slope ** (derivative - order)
        total = total + Approx.exact(ctx, factor) * _theta_series(ctx, nu, reduced, tau, order)
    return total * Approx(ctx, multiplier, multiplier_error)


def _theta_series(ctx, nu: int, w, tau, order: int) -> Approx:
    """The q-series of theta_nu^(order)(w|tau) at a reduced point w."""
    a = ctx.pi * tau.imag            # |q^(k^2)| = exp(-a k^2)
    b = 2 * ctx.pi * abs(w.imag)     # |exp(+-2 pi i k w)| <= exp(b k)
    odd = nu == 1
    k = ctx.mpf(0.5) if nu in (1, 2) else ctx.mpf(0)
    index = 0
    total = ctx.zero
    magnitude_sum = ctx.zero
    largest = ctx.zero
    while True:
        term, bound = _theta_term(ctx, nu, odd, index, k, w, tau, order)
        total += term
        magnitude_sum += bound
        largest = max(largest, bound)
        k += 1
        index += 1
        tail = _tail_bound(ctx, a, b, k, order)
        if tail is not None and tail <= ctx.eps * largest:
            break
        if index > MAX_TERMS:
            raise LedgerError(f"tau = {mpmath.nstr(tau, 6)} is too close to the real axis "
                              "for the theta series; move it towards the fundamental domain")
    rounding = (10 + 4 * index) * ctx.eps * magnitude_sum
    return Approx(ctx, total, tail + rounding)


def _theta_term(ctx, nu, odd, index, k, w, tau, order):
    """The (k, -k) pair of the series and an upper bound on its modulus."""
    growth = 2 * ctx.pi * abs(w.imag) * k - ctx.pi * tau.imag * k * k
    if k == 0:
        value = ctx.one if order == 0 else ctx.zero
        return value, abs(value)
    nome_power = ctx.expjpi(tau * k * k)
    up = ctx.expjpi(2 * k * w)
    down = ctx.expjpi(-2 * k * w)
    frequency = 2j * ctx.pi * k
    pair = frequency ** order * up + (-1 if odd else 1) * (-frequency) ** order * down
    prefactor = {1: -1j * (-1) ** index, 2: 1, 3: 1, 4: (-1) ** index}[nu]
    bound = 2 * (2 * ctx.pi * k) ** order * ctx.exp(growth)
    return prefactor * nome_power * pair, bound


def _tail_bound(ctx, a, b, k, order):
    """Bound on sum_{j>=0} of the pair bounds at k + j, or None if not yet decaying.

    The ratio of consecutive bounds, ((k+1)/k)^order exp(-a(2k+1) + b),
    decreases with k, so the tail is at most first/(1 - ratio).
    """
    ratio = ((k + 1) / k) ** order * ctx.exp(-a * (2 * k + 1) + b)
    if ratio >= ctx.mpf(0.5):
        return None
    first = 2 * (2 * ctx.pi * k) ** order * ctx.exp(-a * k * k + b * k)
    return 2 * first / (1 - ratio)


def eta_approx(ctx, tau) -> Approx:
    """eta(tau) = sum_{m>=1} chi_12(m) exp(i pi tau m^2/12) in the context ``ctx``."""
    a = ctx.pi * tau.imag / 12
    total = ctx.zero
    magnitude_sum = ctx.zero
    count = 0
    for m in _coprime_to_six():
        if m > 1:
            # remaining terms have m' >= m, consecutive exponents grow by >= 4m + 4
            ratio = ctx.exp(-a * (4 * m + 4))
            tail = 2 * ctx.exp(-a * m * m) / (1 - ratio)
            if ratio < 0.5 and tail <= ctx.eps * ctx.exp(-a):
                break
        sign = 1 if m % 12 in (1, 11) else -1
        term = sign * ctx.expjpi(tau * m * m / 12)
        total += term
        magnitude_sum += abs(term)
        count += 1
        if count > MAX_TERMS:
            raise LedgerError(f"tau = {mpmath.nstr(tau, 6)} is too close to the real axis "
                              "for the eta series; move it towards the fundamental domain")
    return Approx(ctx, total, tail + (10 + 4 * count) * ctx.eps * magnitude_sum)


def _coprime_to_six():
    m = 1
    while True:
        yield m
        yield m + 4
        m += 6


def _check_nu(nu, allowed) -> None:
    if isinstance(nu, bool) or not isinstance(nu, int) or nu not in allowed:
        names = ", ".join(str(n) for n in allowed)
        raise LedgerError(f"theta index must be one of {names}, got {nu!r}")
