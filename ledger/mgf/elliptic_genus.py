"""Elliptic genus of the orbifold T^4/Z_N (N = 2, 3, 4, 6), sector by sector.

Z_N acts on T^4 = C^2/Lambda by (w1, w2) -> (omega w1, omega^-1 w2),
omega = exp(2 pi i/N) (holonomy in SU(2), so half the supersymmetry
survives). A sector (k, l) has the twist g^k along the spatial circle and
g^l inserted in the trace; its twist variable is u = (l + k tau)/N, i.e. the
torsion point alpha + beta tau with (alpha, beta) = (l/N, k/N). Its elliptic
genus is

    Z_(k,l)(z|tau) = n(k,l) theta_1(u + z) theta_1(u - z) / theta_1(u)^2,

with n(k,l) = (2 sin(pi d/N))^4, d = gcd(k, l, N), the number of points fixed
by the twist (Lefschetz): 16, 9, 4, 1 for twists of order 2, 3, 4, 6, and 0
for the untwisted sector without insertion (the T^4 genus vanishes). The K3
elliptic genus is (1/N) sum_(k,l) Z_(k,l); for every N it should equal
8 [(theta_2(z)/theta_2)^2 + (theta_3(z)/theta_3)^2 + (theta_4(z)/theta_4)^2]
(Eguchi, Ooguri, Taormina, Yang 1989), which is 24 at z = 0.

>>> fixed_point_weight(4, 2, 0), fixed_point_weight(6, 1, 3), fixed_point_weight(3, 0, 0)
(16, 1, 0)
>>> round(float(k3_elliptic_genus(3, 0, 1j, digits=15).value.real), 12)
24.0
"""

from __future__ import annotations

from math import gcd

import sympy

from ledger.errors import LedgerError
from ledger.mgf.approx import Approx, as_complex, as_tau, refine
from ledger.mgf.jobs import Job, ensure_job
from ledger.mgf.theta_series import theta_approx
from ledger.mgf.twisted_sums import RATIONAL_COSINES
from ledger.mgf.values import Value

ORBIFOLD_ORDERS = (2, 3, 4, 6)


def check_order(N) -> int:
    """N as an int if Z_N acts crystallographically on T^4 with SU(2) holonomy."""
    if isinstance(N, sympy.Basic) and N.is_Integer:
        N = int(N)
    if isinstance(N, bool) or N not in ORBIFOLD_ORDERS:
        raise LedgerError(f"T^4/Z_N needs N in {', '.join(map(str, ORBIFOLD_ORDERS))}, got {N!r}")
    return N


def sectors(N: int) -> list[tuple[int, int]]:
    """All sectors (k, l), 0 <= k, l < N, the untwisted (0, 0) first.

    >>> sectors(2)
    [(0, 0), (0, 1), (1, 0), (1, 1)]
    """
    N = check_order(N)
    return [(k, l) for k in range(N) for l in range(N)]


def twist_order(N: int, k: int, l: int) -> int:
    """The order N/gcd(k, l, N) of the twist in sector (k, l)."""
    return check_order(N) // gcd(gcd(k % N, l % N), N)


def fixed_point_weight(N: int, k: int, l: int) -> int:
    """n(k, l) = (2 sin(pi/order))^4 = 4 (1 - cos(2 pi/order))^2, an integer here."""
    value = 4 * (1 - RATIONAL_COSINES[twist_order(N, k, l)]) ** 2
    return int(value)


def elliptic_genus_sector(N: int, k: int, l: int, z, tau, digits: int = 30) -> Value:
    """Z_(k,l)(z|tau) of T^4/Z_N (see the module docstring).

    >>> v = elliptic_genus_sector(2, 0, 1, 0, 1j, digits=15)
    >>> round(float(v.value.real), 12)   # n(0, 1) = 16 fixed points
    16.0
    """
    N = check_order(N)

    def compute(ctx):
        return _sector_genus(ctx, N, k, l, as_complex(z, ctx, "z"), as_tau(tau, ctx))

    return refine(compute, digits).to_value(digits)


def k3_elliptic_genus(N: int, z, tau, digits: int = 30, job: Job | None = None) -> Value:
    """(1/N) sum over the sectors of T^4/Z_N: the elliptic genus of K3.

    >>> a = k3_elliptic_genus(2, 0.3 + 0.1j, 1.1j, digits=20).value
    >>> b = k3_elliptic_genus_closed_form(0.3 + 0.1j, 1.1j, digits=20).value
    >>> abs(a - b) < 1e-14
    True
    """
    N = check_order(N)
    job = ensure_job(job)

    def compute(ctx):
        z_mp, tau_mp = as_complex(z, ctx, "z"), as_tau(tau, ctx)
        total = Approx(ctx, ctx.zero, ctx.zero)
        representatives = _pair_representatives(N)
        for index, ((k, l), multiplicity) in enumerate(representatives):
            job.report(index / len(representatives), f"sector ({k},{l})")
            total = total + multiplicity * _sector_genus(ctx, N, k, l, z_mp, tau_mp)
        return total / N

    return refine(compute, digits).to_value(digits)


def k3_elliptic_genus_closed_form(z, tau, digits: int = 30) -> Value:
    """8 sum_{nu=2,3,4} (theta_nu(z)/theta_nu(0))^2.

    >>> round(float(k3_elliptic_genus_closed_form(0, 0.2 + 1j, digits=15).value.real), 12)
    24.0
    """

    def compute(ctx):
        z_mp, tau_mp = as_complex(z, ctx, "z"), as_tau(tau, ctx)
        total = Approx(ctx, ctx.zero, ctx.zero)
        for nu in (2, 3, 4):
            ratio = theta_approx(ctx, nu, z_mp, tau_mp) / theta_approx(ctx, nu, ctx.mpc(0), tau_mp)
            total = total + ratio * ratio
        return 8 * total

    return refine(compute, digits).to_value(digits)


def twist_point(N: int, k: int, l: int, tau):
    """u = (l + k tau)/N, the torsion point of sector (k, l)."""
    return (l + k * tau) / N


def _sector_genus(ctx, N: int, k: int, l: int, z, tau) -> Approx:
    weight = fixed_point_weight(N, k, l)
    if weight == 0:
        return Approx(ctx, ctx.zero, ctx.zero)
    u = twist_point(N, k, l, tau)
    numerator = theta_approx(ctx, 1, u + z, tau) * theta_approx(ctx, 1, u - z, tau)
    denominator = theta_approx(ctx, 1, u, tau)
    return weight * (numerator / (denominator * denominator))


def _pair_representatives(N: int) -> list[tuple[tuple[int, int], int]]:
    """One sector of each pair {(k, l), (-k, -l)} (equal genera) and its multiplicity."""
    seen: dict[tuple[int, int], int] = {}
    for k, l in sectors(N):
        partner = ((-k) % N, (-l) % N)
        if partner in seen:
            seen[partner] += 1
        else:
            seen[(k, l)] = 1
    return [(sector, count) for sector, count in seen.items() if fixed_point_weight(N, *sector)]
