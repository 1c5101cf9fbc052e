"""Type II strings on T^4/Z_N x R^6, N = 2, 3, 4, 6 (orbifold limits of K3).

Backgrounds: ``t4z{N}-iia`` and ``t4z{N}-iib``, six non-compact dimensions and
16 supercharges (the twist (omega, omega^-1) lies in SU(2)).

Sectors (k, l), k, l mod N: twist g^k along the spatial circle, g^l inserted
in the trace; twist point u = (l + k tau)/N, i.e. characteristics
(alpha, beta) = (l/N, k/N). Light-cone chiral block of spin structure nu
(T^4 lattice sum and the non-compact zero modes left out):

    B_nu(k,l) = theta_nu(0)^2 theta_nu(u) theta_nu(-u) / (eta^6 theta_1(u) theta_1(-u)),
    B_nu(0,0) = theta_nu(0)^4 / eta^12,

and the sector partition function of spin structures (nu, nubar) is
Z = n(k,l) tau2^-2 B_nu conj(B_nubar), n(k,l) the number of fixed points.
Modular action: tau -> tau + 1 sends (k, l) -> (k, k + l) and nu = 2, 3, 4 ->
2, 4, 3 with signs +1, -1, -1 on B; tau -> -1/tau sends (k, l) -> (l, -k) and
nu = 2, 3, 4 -> 4, 3, 2 with the factor tau^-2 (tau^-4 untwisted). The GSO sum
sum_nu s_nu B_nu vanishes in every sector (Riemann identity): supersymmetry.

Genus-one integrands a project records: I_s = (1/N) sum_(k,l)!=(0,0) n(k,l) Etw(s, l/N, k/N),
the twisted Eisenstein sums (s = 1: twisted Green's functions) at the fixed
points, weighted by fixed points and summed over sectors. Sectors of one twist
order form one SL(2,Z) orbit, and summing a characteristic over all N-torsion
points gives N^(2-2s) E_s; by Moebius inversion over the divisors of N every
orbit sum, hence I_s, is a rational multiple of E_s (s >= 2) or a constant
(s = 1). That gives the exact Laurent polynomial and the renormalised integral
over F (0 for s >= 2, as for E_s; vol(F) = pi/3 times the constant for s = 1).
A single twisted sector lives on the fundamental domain of its stabiliser
Gamma in PSL(2,Z); unfolding, its integral there is that of its orbit sum over F.

>>> [b.id for b in orbifold_backgrounds()][:3]
['t4z2-iia', 't4z2-iib', 't4z3-iia']
>>> modular_image(4, (1, 2), "S"), modular_image(4, (1, 2), "T")
((2, 3), (1, 3))
>>> sector_summed_integrand(2, 1).expression
-16*log(2)
"""

from __future__ import annotations

from dataclasses import dataclass, field
from fractions import Fraction
from math import gcd

import sympy

from ledger.amplitudes.backgrounds import Background
from ledger.errors import LedgerError, NotAvailableError
from ledger.mgf.approx import Approx, as_tau, refine
from ledger.mgf.elliptic_genus import (
    ORBIFOLD_ORDERS,
    check_order,
    elliptic_genus_sector,
    fixed_point_weight,
    k3_elliptic_genus,
    k3_elliptic_genus_closed_form,
    sectors,
    twist_point,
)
from ledger.mgf.jobs import Job, ensure_job
from ledger.mgf.spin_sums import GSO_SIGNS
from ledger.mgf.theta_series import eta_approx, theta_approx
from ledger.mgf.theta import check_spin_structure
from ledger.mgf.twisted_sums import (
    as_weight,
    divisors,
    twisted_eisenstein_approx,
    twisted_eisenstein_laurent,
)
from ledger.mgf.values import Value

__all__ = [
    "orbifold_backgrounds", "orbifold_order", "sectors", "fixed_point_weight",
    "modular_image", "spin_structure_image", "sector_orbit", "sector_blocks",
    "sector_spin_sum", "sector_partition_function", "SectorIntegrand",
    "sector_summed_integrand", "sector_summed_integrand_value", "sector_integral",
    "orbifold_integrands",
    "elliptic_genus_sector", "k3_elliptic_genus", "k3_elliptic_genus_closed_form",
]

THEORIES = ("IIA", "IIB")
TRANSFORMS = ("T", "S")
# tau -> tau + 1: nu -> image, B_nu -> sign * B_image;  tau -> -1/tau: nu -> image
T_ACTION = {2: (2, 1), 3: (4, -1), 4: (3, -1)}
S_ACTION = {2: 4, 3: 3, 4: 2}


def orbifold_backgrounds() -> list[Background]:
    """T^4/Z_N x R^6 for N = 2, 3, 4, 6, type IIA and IIB (ids like 't4z2-iib')."""
    return [Background(f"t4z{N}-{theory.lower()}", f"Type {theory} on T^4/Z_{N} x R^6",
                       theory, 6, f"T^4/Z_{N}", 16)
            for N in ORBIFOLD_ORDERS for theory in THEORIES]


def orbifold_order(background) -> int:
    """N for an orbifold background (a Background or its id).

    >>> orbifold_order("t4z6-iia")
    6
    """
    background_id = background if isinstance(background, str) else background.id
    for candidate in orbifold_backgrounds():
        if candidate.id == background_id:
            return int(candidate.compactification.split("Z_")[1])
    raise LedgerError(f"{background_id!r} is not a T^4/Z_N orbifold background")


def modular_image(N: int, sector: tuple[int, int], transform: str) -> tuple[int, int]:
    """The sector (k', l') with f_(k,l)(gamma tau) = f_(k',l')(tau), gamma = T or S."""
    N = check_order(N)
    k, l = sector
    if transform == "T":
        return k % N, (k + l) % N
    if transform == "S":
        return l % N, (-k) % N
    raise LedgerError(f"unknown modular transformation {transform!r}; use T or S")


def spin_structure_image(nu: int, transform: str) -> tuple[int, int]:
    """(image of nu, sign on the block) under T; under S the sign is +1 and the
    block picks up tau^-2 (tau^-4 in the untwisted sector)."""
    check_spin_structure(nu)
    if transform == "T":
        return T_ACTION[nu]
    if transform == "S":
        return S_ACTION[nu], 1
    raise LedgerError(f"unknown modular transformation {transform!r}; use T or S")


def sector_orbit(N: int, sector: tuple[int, int]) -> list[tuple[int, int]]:
    """The SL(2,Z) orbit of a sector (generated by T and S): the sectors of equal twist order.

    >>> len(sector_orbit(6, (2, 0))), len(sector_orbit(6, (1, 0)))
    (8, 24)
    """
    start = (sector[0] % N, sector[1] % N)
    orbit, frontier = {start}, [start]
    while frontier:
        current = frontier.pop()
        for transform in TRANSFORMS:
            image = modular_image(N, current, transform)
            if image not in orbit:
                orbit.add(image)
                frontier.append(image)
    return sorted(orbit)


def sector_blocks(N: int, k: int, l: int, tau, digits: int = 30) -> dict[int, Value]:
    """The chiral blocks B_nu(k, l)(tau), nu = 2, 3, 4."""
    N = check_order(N)
    return {nu: refine(lambda ctx, nu=nu: _block(ctx, N, k, l, nu, as_tau(tau, ctx)),
                       digits).to_value(digits)
            for nu in GSO_SIGNS}


def sector_spin_sum(N: int, k: int, l: int, tau, digits: int = 30) -> Value:
    """sum_nu s_nu B_nu(k, l)(tau): zero in every sector (space-time supersymmetry)."""
    N = check_order(N)

    def compute(ctx):
        tau_mp = as_tau(tau, ctx)
        total = Approx(ctx, ctx.zero, ctx.zero)
        for nu, sign in GSO_SIGNS.items():
            total = total + sign * _block(ctx, N, k, l, nu, tau_mp)
        return total

    return refine(compute, digits).to_value(digits)


def sector_partition_function(N: int, k: int, l: int, nu: int, nubar: int, tau,
                              digits: int = 30) -> Value:
    """n(k,l) tau2^-2 B_nu(k,l) conj(B_nubar(k,l)) for a twisted sector."""
    N = check_order(N)
    if k % N == 0 and l % N == 0:
        raise NotAvailableError("the untwisted sector (0,0) carries the T^4 lattice sum, "
                                "which depends on the T^4 moduli")
    weight = fixed_point_weight(N, k, l)
    check_spin_structure(nu)
    check_spin_structure(nubar)

    def compute(ctx):
        tau_mp = as_tau(tau, ctx)
        left = _block(ctx, N, k, l, nu, tau_mp)
        right = _block(ctx, N, k, l, nubar, tau_mp).conjugate()
        return weight * left * right / Approx.exact(ctx, tau_mp.imag ** 2)

    return refine(compute, digits).to_value(digits)


def _block(ctx, N: int, k: int, l: int, nu: int, tau) -> Approx:
    origin = ctx.mpc(0)
    zero_modes = theta_approx(ctx, nu, origin, tau)
    if k % N == 0 and l % N == 0:
        return zero_modes ** 4 / eta_approx(ctx, tau) ** 12
    u = twist_point(N, k, l, tau)
    numerator = zero_modes ** 2 * theta_approx(ctx, nu, u, tau) * theta_approx(ctx, nu, -u, tau)
    denominator = eta_approx(ctx, tau) ** 6 * theta_approx(ctx, 1, u, tau) * theta_approx(ctx, 1, -u, tau)
    return numerator / denominator


@dataclass(frozen=True)
class SectorIntegrand:
    """Exact data of I_s for T^4/Z_N (see the module docstring)."""

    order: int
    weight: int
    terms: tuple  # ((k, l, n(k,l)), ...) over the twisted sectors
    expression: sympy.Expr  # c*E(s) for s >= 2, the constant for s = 1
    laurent: dict = field(compare=False)  # {power of y = pi tau2: exact coefficient}
    integral: sympy.Expr  # renormalised integral over F, measure d^2tau/tau2^2
    log_coefficient: sympy.Expr
    method: str

    def as_record(self) -> dict:
        """Plain data for a project entry or JSON: expressions as re-parseable text,
        Laurent coefficients as sympy-parsable strings.

        >>> sector_summed_integrand(2, 2).as_record()["reduced"]
        '-6*E(2)'
        """
        from ledger.expr import to_text

        return {
            "order": self.order,
            "weight": self.weight,
            "expr": to_text(self.sector_expression()),
            "reduced": str(self.expression),
            "laurent": [{"power": power, "coefficient": str(coefficient)}
                        for power, coefficient in sorted(self.laurent.items(), reverse=True)],
            "integral": str(self.integral),
            "log_coefficient": str(self.log_coefficient),
            "exact": True,
            "method": self.method,
        }

    def sector_expression(self) -> sympy.Expr:
        """The integrand as a sum of Green/Etw atoms, one per twisted sector."""
        from ledger.expr.atoms import Etw, Green

        total = sympy.Integer(0)
        for k, l, weight in self.terms:
            alpha, beta = sympy.Rational(l, self.order), sympy.Rational(k, self.order)
            atom = Green(alpha, beta) if self.weight == 1 else Etw(self.weight, alpha, beta)
            total += sympy.Rational(weight, self.order) * atom
        return total


def sector_summed_integrand(N: int, s: int) -> SectorIntegrand:
    """I_s for T^4/Z_N with its exact reduction, Laurent polynomial and integral over F.

    >>> i2 = sector_summed_integrand(3, 2)
    >>> i2.expression, i2.integral
    (-8*E(2)/3, 0)
    """
    from ledger.expr.atoms import E

    N = check_order(N)
    s = as_weight(s)
    terms = tuple((k, l, fixed_point_weight(N, k, l)) for k, l in sectors(N) if (k, l) != (0, 0))
    coefficient = sum((sympy.Rational(fixed_point_weight(N, d, 0), N) * _exact_gcd_class_sum(N, d, s)
                       for d in divisors(N) if d < N), sympy.Integer(0))
    if s == 1:
        return SectorIntegrand(N, s, terms, coefficient, {0: coefficient},
                               sympy.expand(coefficient * sympy.pi / 3), sympy.Integer(0),
                               "constant in tau (distribution relation of the Green's function); "
                               "times vol(F) = pi/3")
    laurent = {power: coefficient * c for power, c in twisted_eisenstein_laurent(s, 0, 0).items()}
    return SectorIntegrand(N, s, terms, coefficient * E(s), laurent, sympy.Integer(0),
                           sympy.Integer(0),
                           "rational multiple of E_s; the renormalised integral of E_s over F vanishes")


def orbifold_integrands(background, max_weight: int = 3) -> list[SectorIntegrand]:
    """I_1, ..., I_max_weight for an orbifold background (a Background or its id):
    what ``expand --background t4zN-...`` records.

    >>> [i.weight for i in orbifold_integrands("t4z3-iib", 2)]
    [1, 2]
    """
    N = orbifold_order(background)
    return [sector_summed_integrand(N, s) for s in range(1, as_weight(max_weight) + 1)]


def sector_summed_integrand_value(N: int, s: int, tau, digits: int = 30,
                                  job: Job | None = None) -> Value:
    """I_s(tau) summed sector by sector from the twisted lattice sums (independent of
    the exact reduction in :func:`sector_summed_integrand`)."""
    N, s = check_order(N), as_weight(s)
    job = ensure_job(job)
    twisted = [(k, l) for k, l in sectors(N) if (k, l) != (0, 0)]

    def compute(ctx):
        tau_mp = as_tau(tau, ctx)
        total = Approx(ctx, ctx.zero, ctx.zero)
        for index, (k, l) in enumerate(twisted):
            job.report(index / len(twisted), f"sector ({k},{l})")
            term = twisted_eisenstein_approx(ctx, s, Fraction(l, N), Fraction(k, N), tau_mp, job)
            total = total + Approx.exact(ctx, ctx.mpf(fixed_point_weight(N, k, l)) / N) * term
        return total

    return refine(compute, digits).to_value(digits)


def sector_integral(N: int, sector: tuple[int, int], s: int) -> tuple[sympy.Expr, int]:
    """(renormalised integral of Etw(s, l/N, k/N) over the fundamental domain of its
    stabiliser Gamma in PSL(2,Z), index [PSL(2,Z) : Gamma]), by unfolding to F.

    >>> sector_integral(2, (0, 1), 1)
    (-2*pi*log(2)/3, 3)
    """
    N, s = check_order(N), as_weight(s)
    k, l = sector[0] % N, sector[1] % N
    if (k, l) == (0, 0):
        raise LedgerError("the untwisted sector (0,0) is the Eisenstein series itself; integrate over F")
    d = gcd(gcd(k, l), N)
    orbit = sector_orbit(N, (k, l))
    self_conjugate = ((-k) % N, (-l) % N) == (k, l)
    index = len(orbit) if self_conjugate else len(orbit) // 2
    if s > 1:
        return sympy.Integer(0), index
    share = 1 if self_conjugate else sympy.Rational(1, 2)
    return sympy.expand(share * _exact_gcd_class_sum(N, d, 1) * sympy.pi / 3), index


def _exact_gcd_class_sum(N: int, d: int, s: int) -> sympy.Expr:
    """sum of Etw(s, l/N, k/N) over the sectors with gcd(k, l, N) = d, as c E_s
    (the coefficient c for s >= 2, the constant for s = 1), by Moebius inversion of
    sum over (D Z/N)^2 minus the origin = ((N/D)^(2-2s) - 1) E_s (-2 log(N/D) at s = 1)."""
    total = sympy.Integer(0)
    for D in divisors(N):
        if D % d:
            continue
        mu = sympy.mobius(D // d)
        if s == 1:
            total += mu * -2 * _log_of_integer(N // D)
        else:
            total += mu * (sympy.Rational(N, D) ** (2 - 2 * s) - 1)
    return total


def _log_of_integer(n: int) -> sympy.Expr:
    """log n as a combination of logarithms of primes."""
    return sum((e * sympy.log(p) for p, e in sympy.factorint(n).items()), sympy.Integer(0))
