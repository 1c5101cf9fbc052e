"""Identity finder: rational coefficients q_i with target = sum_i q_i basis_i.

Two sources of equations:

* exact Laurent polynomials: for every power of y and every transcendental
  monomial (products of zeta values, zeta_sv(3,5,3), pi) the coefficients
  must match, a linear system over Q (distinct products of odd zeta values
  are taken to be linearly independent over Q, the standard conjecture);
* values at points of the fundamental domain: what the Laurent polynomials
  leave free (functions with equal Laurent polynomials, or no exact Laurent
  polynomial at all) is fixed by an integer relation (PSLQ) among random
  rational combinations of the values at several points.

The candidate is then checked at points not used to find it; the residual
|target - sum q_i basis_i| relative to the size of the terms, in digits, is
``residual_digits``.  No relation is an answer (found = False), not an error.

>>> from ledger.expr import parse
>>> result = find_identity(parse("C(1,1,1) - 2*E(2)^2"), [parse("E(3)"), parse("E(2)^2"), parse("zeta(3)")])
>>> result.found, [str(q) for _, q in result.coefficients]      # Zagier: C(1,1,1) = E(3) + zeta(3)
(True, ['1', '-2', '1'])
"""

from __future__ import annotations

import random
from dataclasses import dataclass
from typing import Callable, Optional

import mpmath
import sympy

from ledger.errors import LedgerError
from ledger.mgf.approx import export
from ledger.mgf.jobs import Job, ensure_job
from ledger.mgf.values import Value

# points of the fundamental domain used to find (FIT) and to check (CHECK)
FIT_POINTS = ("0.11+1.07i", "-0.23+0.98i", "0.31+1.41i", "0.04+2.13i", "-0.37+1.19i", "0.19+0.99i")
CHECK_POINTS = ("0.17+1.23i", "-0.41+0.93i", "0.27+1.66i")


@dataclass(frozen=True)
class IdentityResult:
    """``coefficients`` is ((basis expression, sympy Rational), ...) when found."""

    found: bool
    coefficients: tuple
    residual_digits: float
    method: str  # "laurent", "laurent+values" or "values"


def find_identity(target, basis, digits: int = 30, job: Optional[Job] = None,
                  values: Optional[Callable] = None, use_laurent: bool = True) -> IdentityResult:
    """Search rational q with target = sum q_i basis_i (module docstring).

    ``values(expr, tau, digits) -> Value`` overrides the evaluator;
    ``use_laurent=False`` finds the coefficients from values alone.
    """
    job = ensure_job(job)
    target = sympy.sympify(target)
    basis = [sympy.sympify(b) for b in basis]
    if not basis:
        raise LedgerError("the basis is empty: give at least one expression")
    if len(set(basis)) != len(basis):
        raise LedgerError("the basis lists the same expression twice")
    values = values or _default_values
    job.report(0.0, "Laurent polynomials")
    status, particular, nullspace = (_laurent_constraints(target, basis, digits) if use_laurent
                                     else ("unavailable", None, None))
    if status == "inconsistent":
        return IdentityResult(False, (), 0.0, "laurent")
    method = "laurent"
    if status == "unavailable":  # every coefficient is left to the values
        particular = [sympy.Integer(0)] * len(basis)
        nullspace = sympy.eye(len(basis))
        method = "values"
    cache: dict = {}

    def value(expr, tau):
        if (expr, tau) not in cache:
            cache[(expr, tau)] = values(expr, tau, digits + 5) if _has_function(expr) \
                else _constant_value(expr, digits + 5)
        return cache[(expr, tau)]

    exprs = [target] + basis
    coefficients = list(particular)
    if nullspace.cols:
        method = "values" if method == "values" else "laurent+values"
        free = _fit_free_parameters(particular, nullspace, exprs, value, digits, job.part(0.05, 0.7))
        if free is None:
            return IdentityResult(False, (), 0.0, method)
        coefficients = list(sympy.Matrix(particular) + nullspace * sympy.Matrix(free))
    residual = _check(coefficients, exprs, value, digits, job.part(0.7, 1.0))
    found = residual >= digits - 8
    pairs = tuple((b, sympy.Rational(q)) for b, q in zip(basis, coefficients))
    return IdentityResult(found, pairs if found else (), residual, method)


def _constant_value(expr, digits: int) -> Value:
    ctx = mpmath.MPContext()
    ctx.dps = digits + 5
    return Value(export(ctx.convert(str(sympy.N(expr, digits + 5)))), mpmath.mpf(0), digits)


def _default_values(expr, tau, digits):
    from ledger.mgf.evaluate import evaluate

    return evaluate(expr, tau, digits)


def _has_function(expr) -> bool:
    from ledger.expr.atoms import modular_atoms

    return bool(modular_atoms(expr))


def _laurent_constraints(target, basis, digits) -> tuple:
    """(status, particular solution, nullspace matrix) from exact Laurent polynomials.

    status is "solved", "inconsistent" (no rational relation can exist) or
    "unavailable" (some Laurent polynomial is not known exactly).
    """
    from ledger.mgf.laurent import laurent_polynomial

    try:
        polynomials = [laurent_polynomial(e, digits) for e in [target] + basis]
    except LedgerError:  # e.g. a holomorphic theta-family atom has none
        return "unavailable", None, None
    if not all(p.exact for p in polynomials):
        return "unavailable", None, None
    tables = [{(k, m): c for k, m, c in _monomial_terms(p)} for p in polynomials]
    keys = sorted({key for table in tables for key in table}, key=str)
    matrix = sympy.Matrix([[table.get(key, 0) for table in tables[1:]] for key in keys]) \
        if keys else sympy.zeros(0, len(basis))
    vector = sympy.Matrix([tables[0].get(key, 0) for key in keys]) if keys else sympy.zeros(0, 1)
    try:
        solution, params = matrix.gauss_jordan_solve(vector)
    except ValueError:  # inconsistent
        return "inconsistent", None, None
    particular = list(solution.subs({p: 0 for p in params}))
    if params.shape[0] == 0:
        return "solved", particular, sympy.zeros(len(basis), 0)
    return "solved", particular, sympy.Matrix([list(solution.diff(p)) for p in params]).T


def _monomial_terms(polynomial):
    for k, c in polynomial.terms:
        for monomial, rational in sympy.expand(c).as_coefficients_dict().items():
            if rational != 0:
                yield k, monomial, sympy.Rational(rational)


def _fit_free_parameters(particular, nullspace, exprs, value, digits, job):
    """Rational t with target - sum (particular + N t)_i basis_i = 0, by PSLQ."""
    ctx = mpmath.MPContext()
    ctx.dps = digits + 5
    rng = random.Random(20240601)
    weights = [[sympy.Rational(rng.randint(1, 97), rng.randint(1, 97)) for _ in FIT_POINTS]
               for _ in range(2)]
    relations = []
    for w_index, w in enumerate(weights):
        residual, columns = ctx.zero, [ctx.zero] * nullspace.cols
        for j, tau in enumerate(FIT_POINTS):
            job.report((w_index * len(FIT_POINTS) + j) / (2 * len(FIT_POINTS)), f"values at {tau}")
            point = [ctx.re(ctx.convert(value(e, tau).value)) for e in exprs]
            weight = ctx.mpf(w[j].p) / w[j].q
            base = point[0] - sum(ctx.mpf(sympy.Rational(q).p) / sympy.Rational(q).q * v
                                  for q, v in zip(particular, point[1:]))
            residual += weight * base
            for col in range(nullspace.cols):
                columns[col] += weight * sum(ctx.mpf(sympy.Rational(n).p) / sympy.Rational(n).q * v
                                             for n, v in zip(nullspace.col(col), point[1:]))
        with ctx.workdps(max(digits - 5, 16)):  # mpmath's PSLQ needs at least 53 bits
            relation = ctx.pslq([residual] + columns, maxcoeff=10 ** max(3, (digits - 10) // (nullspace.cols + 1)),
                                maxsteps=10 ** 5)
        if relation is None or relation[0] == 0:
            return None
        relations.append([sympy.Rational(-r, relation[0]) for r in relation[1:]])
    if relations[0] != relations[1]:
        return None
    return relations[0]


def _check(coefficients, exprs, value, digits, job) -> float:
    """Agreement in digits at the CHECK_POINTS: -log10(max |residual| / size)."""
    ctx = mpmath.MPContext()
    ctx.dps = digits + 10
    worst = ctx.zero
    for j, tau in enumerate(CHECK_POINTS):
        job.report(j / len(CHECK_POINTS), f"checking at {tau}")
        point = [ctx.re(ctx.convert(value(e, tau).value)) for e in exprs]
        terms = [point[0]] + [-(ctx.mpf(sympy.Rational(q).p) / sympy.Rational(q).q) * v
                              for q, v in zip(coefficients, point[1:])]
        size = max(abs(t) for t in terms)
        if size == 0:
            continue
        worst = max(worst, abs(sum(terms)) / size)
    if worst == 0:
        return float(digits + 10)
    return float(-ctx.log10(worst))
