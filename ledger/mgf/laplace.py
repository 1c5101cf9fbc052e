"""The Laplacian Delta = 4 tau2^2 d_tau d_taubar = tau2^2 (d^2/dtau1^2 + d^2/dtau2^2).

Exactly on Laurent polynomials (y^2 d^2/dy^2, see
:meth:`ledger.mgf.laurent.LaurentPolynomial.laplacian`), numerically on
values by central differences, and through a table of known Laplace
equations (Delta - lambda) f = source used by the integration route of
:mod:`ledger.mgf.integrate`.

Numerical rule: the second derivative in each direction by the central
difference of order 2p at step h, with h chosen so that the difference of
order 2p-4 already meets the requested precision for a function analytic in
a disc of radius tau2/2 (modular graph functions are real-analytic in the
upper half plane, with singularities on the real axis).  The error is the
larger of |D_2p - D_(2p-2)| and |D_(2p-2) - D_(2p-4)| (convergence in the
order is not always monotone: for C(2,1,1) one step of the order can gain
almost nothing) plus the propagated error of the values.

>>> import mpmath
>>> from ledger.mgf.values import Value
>>> def f(tau, digits):  # tau2^3 + tau1^2 tau2: Delta f = 6 tau2^3 + 2 tau2^3 = 8 tau2^3
...     ctx = mpmath.MPContext(); ctx.dps = digits + 10
...     t = ctx.mpc(tau)
...     return Value(t.imag ** 3 + t.real ** 2 * t.imag, ctx.mpf(0), digits)
>>> d = numerical_laplacian(f, mpmath.mpc("0.1", "1.5"), 20)
>>> mpmath.nstr(d.value, 15), d.error < 1e-20
('27.0', True)
"""

from __future__ import annotations

from dataclasses import dataclass
from typing import Callable, Optional

import mpmath
import sympy

from ledger.mgf.approx import as_tau, export
from ledger.mgf.jobs import Job, ensure_job
from ledger.mgf.values import Value

ORDER = 7  # stencil half-width p: central difference of order 2p


def central_difference_weights(p: int, ctx) -> list:
    """Weights w_k, k = 0..p, of f''(0) ~ (w_0 f(0) + sum_k w_k (f(kh) + f(-kh))) / h^2,
    exact to order h^(2p).

    >>> ctx = mpmath.MPContext(); ctx.dps = 20
    >>> [mpmath.nstr(w, 10) for w in central_difference_weights(1, ctx)]
    ['-2.0', '1.0']
    """
    weights = [ctx.zero] * (p + 1)
    for k in range(1, p + 1):
        product = ctx.one
        for j in range(1, p + 1):
            if j != k:
                product *= ctx.mpf(j * j) / (j * j - k * k)
        weights[k] = product / (k * k)  # d/dt at t = 0 of the Lagrange basis in t = x^2
        weights[0] -= 2 * weights[k]
    return weights


def numerical_laplacian(function: Callable, tau, digits: int = 30,
                        job: Optional[Job] = None) -> Value:
    """Delta f at tau from values ``function(tau, digits) -> Value``."""
    job = ensure_job(job)
    ctx = mpmath.MPContext()
    ctx.dps = digits + 10
    tau = as_tau(tau, ctx)
    tau2 = tau.imag
    radius = tau2 / 2
    p = ORDER
    step = radius * ctx.mpf(10) ** (-(digits + 3) / (2 * p - 4))
    # each value loses about 2 log10(radius/step) digits to the differencing
    lost = int(2 * (digits + 3) / (2 * p - 4)) + 3
    value_digits = digits + lost + 5
    ctx.dps = value_digits + 10
    rules = [central_difference_weights(order, ctx) for order in (p, p - 1, p - 2)]
    points = [tau] + [tau + s * k * step * direction
                      for direction in (1, 1j) for k in range(1, p + 1) for s in (1, -1)]
    values, errors = [], []
    for index, point in enumerate(points):
        job.report(index / len(points), f"Laplacian: value {index + 1} of {len(points)}")
        v = function(point, value_digits)
        values.append(ctx.re(ctx.convert(v.value)))
        errors.append(ctx.convert(v.error))
    centre, centre_error = values[0], errors[0]

    def second_derivatives(weights):
        total, propagated = ctx.zero, ctx.zero
        for offset in (0, 2 * p):  # tau1 direction, then tau2 direction
            total += weights[0] * centre
            propagated += abs(weights[0]) * centre_error
            for k in range(1, len(weights)):
                i = 1 + offset + 2 * (k - 1)
                total += weights[k] * (values[i] + values[i + 1])
                propagated += abs(weights[k]) * (errors[i] + errors[i + 1])
        return total / step ** 2, propagated / step ** 2

    (fine, propagated), (middle, _), (coarse, _) = (second_derivatives(w) for w in rules)
    scale = tau2 ** 2
    result = scale * fine
    truncation = max(abs(fine - middle), abs(middle - coarse))
    error = scale * (truncation + propagated) + 10 * ctx.eps * abs(result)
    return Value(export(result), export(error), digits)


def laplacian_value(expr, tau, digits: int = 30, job: Optional[Job] = None) -> Value:
    """Delta expr at tau, numerically from values of expr (ledger.mgf.evaluate)."""
    from ledger.mgf.evaluate import evaluate

    return numerical_laplacian(lambda t, d: evaluate(expr, t, d), tau, digits, job)


@dataclass(frozen=True)
class LaplaceEquation:
    """(Delta - eigenvalue) lhs = source, with its published origin."""

    lhs: str
    eigenvalue: int
    source: str
    reference: str

    def parsed(self) -> tuple:
        from ledger.expr import parse

        return parse(self.lhs), sympy.Integer(self.eigenvalue), parse(self.source)


# Each row is checked exactly on Laurent polynomials and numerically in
# tests/mgf/test_laplace.py.
LAPLACE_EQUATIONS: tuple = (
    LaplaceEquation("C(1,1,1)", 6, "-6*zeta(3)",
                    "from C(1,1,1) = E(3) + zeta(3): D. Zagier; D'Hoker, Green, Vanhove 2015, arXiv:1502.06698"),
    LaplaceEquation("C(2,1,1)", 2, "9*E(4) - E(2)^2",
                    "D'Hoker, Green, Vanhove 2015, arXiv:1502.06698"),
    LaplaceEquation("C(3,1,1)", 6, "86/5*E(5) - 4*E(2)*E(3) + zeta(5)/10",
                    "D'Hoker, Green, Vanhove 2015, arXiv:1502.06698 (from memory)"),
    LaplaceEquation("C(2,2,1)", 20, "-2/3*zeta(5)",
                    "from C(2,2,1) = 2/5 E(5) + zeta(5)/30: D'Hoker, Green, Vanhove 2015, arXiv:1502.06698"),
)


def known_laplace_equation(atom):
    """(eigenvalue, source) with (Delta - eigenvalue) atom = source, or None.

    >>> from ledger.expr import parse
    >>> known_laplace_equation(parse("E(3)"))
    (6, 0)
    >>> known_laplace_equation(parse("C(2,1,1)"))
    (2, -E(2)**2 + 9*E(4))
    """
    from ledger.expr.atoms import E

    if isinstance(atom, E):
        s = int(atom.args[0])
        return s * (s - 1), sympy.Integer(0)
    for equation in LAPLACE_EQUATIONS:
        lhs, eigenvalue, source = equation.parsed()
        if lhs == atom:
            return int(eigenvalue), source
    return None
