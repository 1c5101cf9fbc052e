"""Numerical value, with an error bound, of any expression of the language at tau.

The expression is a sympy expression from :func:`ledger.expr.parse`: sums,
products, powers, rationals, constants (pi, zeta(n), ...) and atoms.  Each
distinct atom is evaluated once:

* E(s), C(a1..ar), general graphs: modular invariant, evaluated at tau reduced
  to the fundamental domain (general graphs by ``ledger.mgf.multivertex``);
* Laplace(expr): numerically, by ``ledger.mgf.laplace``;
* the theta family (Theta, Eta, Spin, Green, Etw, EllGenus): not modular
  invariant, evaluated at tau as given, by ``ledger.mgf.theta``.

Arithmetic runs in a private mpmath context on (value, error) pairs; when
cancellation leaves fewer digits than asked, the atoms are recomputed with
more digits.

>>> from ledger.expr import parse
>>> v = evaluate(parse("C(1,1,1) - E(3) - zeta(3)"), mpmath.mpc("0.1", "1.2"), digits=20)
>>> abs(v.value) <= v.error < 1e-19                   # Zagier: C(1,1,1) = E(3) + zeta(3)
True
"""

from __future__ import annotations

import importlib
import math

import mpmath
import sympy

from ledger.errors import ExpressionError, LedgerError, NotAvailableError
from ledger.mgf.approx import export
from ledger.mgf.jobs import Job, ensure_job
from ledger.mgf.modular import to_fundamental_domain
from ledger.mgf.values import Value, number_text

GUARD_DIGITS = 8
MAX_RETRIES = 2
MAX_DIGITS = 200
THETA_FAMILY = ("Theta", "Eta", "Spin", "Green", "Etw", "EllGenus")
GRAPH_FAMILY = ("E", "C", "GraphFunction")


def evaluate(expr, tau, digits: int = 30, job: Job | None = None) -> Value:
    """The value of ``expr`` at ``tau`` (mpc, complex or text like '0.27+1.31i')."""
    if isinstance(digits, bool) or not isinstance(digits, int) or not 1 <= digits <= MAX_DIGITS:
        raise LedgerError(f"digits must be an integer between 1 and {MAX_DIGITS}, got {digits!r}")
    if not isinstance(expr, sympy.Basic):
        expr = sympy.sympify(expr)
    job = ensure_job(job)
    tau = _as_tau(tau)
    atoms = sorted(_atoms(expr), key=sympy.default_sort_key)
    cache: dict = {}
    extra = 3
    for attempt in range(MAX_RETRIES + 1):
        ctx = mpmath.MPContext()
        ctx.dps = digits + extra + GUARD_DIGITS
        values = _atom_values(atoms, tau, digits + extra, cache, ctx, job)
        value, error = _walk(expr, values, ctx)
        size = abs(value)
        # retry only after cancellation that left some, but too few, digits; a value
        # indistinguishable from zero stays as it is, with its absolute error
        if (error <= ctx.mpf(10) ** (-digits) * size or error >= size
                or attempt == MAX_RETRIES or not atoms):
            break
        lost = math.ceil(float(ctx.log10(error / (size * ctx.mpf(10) ** (-digits)))))
        extra += min(max(lost, 2) + 2, 60)
    if isinstance(value, ctx.mpc) and value.imag == 0:
        value = value.real
    return Value(export(value), export(error), digits)


def value_text(value: Value, digits: int) -> str:
    """Decimal text of a value ('a+bi' / 'a-bi' when complex), ``digits`` significant digits.

    >>> value_text(Value(mpmath.mpc(1.5, -0.25), mpmath.mpf(0), 5), 5)
    '1.5-0.25i'
    """
    return number_text(value.value, digits)


def _as_tau(tau):
    if isinstance(tau, str):
        from ledger.expr.tau import parse_tau
        return parse_tau(tau)
    try:
        tau = mpmath.mpmathify(tau)  # keeps every bit of an mpmath number from any context
    except (TypeError, ValueError) as exc:
        raise LedgerError(f"tau must be a complex number, got {tau!r}") from exc
    if not mpmath.im(tau) > 0:
        raise LedgerError(f"tau must lie in the upper half plane (Im tau > 0), got {tau}")
    return tau


def _atoms(expr) -> set:
    """The atoms to evaluate: everything outside a Laplace, and each Laplace as a whole
    (its argument is evaluated by the Laplacian itself)."""
    names = GRAPH_FAMILY + THETA_FAMILY
    found = set()
    pending = [expr]
    while pending:
        node = pending.pop()
        if isinstance(node, sympy.Function) and type(node).__name__ == "Laplace":
            found.add(node)
        elif isinstance(node, sympy.Function) and type(node).__name__ in names:
            found.add(node)
        else:
            pending.extend(node.args)
    return found


def _atom_values(atoms, tau, digits, cache, ctx, job) -> dict:
    """{atom: (value, error)} in ctx, reusing cached values that are accurate enough;
    the dihedral atoms are computed together (one pass over the torus)."""
    need = ctx.mpf(10) ** (-digits)
    todo = [atom for atom in atoms
            if atom not in cache or cache[atom].error > need * abs(cache[atom].value)]
    reduced = None
    if any(_is_invariant(atom) for atom in todo):
        reduced = export(to_fundamental_domain(ctx.convert(tau), ctx))
    dihedrals = [atom for atom in todo if type(atom).__name__ == "C"]
    others = [atom for atom in todo if type(atom).__name__ != "C"]
    share = len(dihedrals) / len(todo) if todo else 0
    if dihedrals:
        from ledger.mgf.dihedral import dihedral_values
        weights = [tuple(int(a) for a in atom.args) for atom in dihedrals]
        for atom, value in zip(dihedrals, dihedral_values(weights, reduced, digits,
                                                          job.part(0, share))):
            cache[atom] = value
    for index, atom in enumerate(others):
        part = job.part(share + (1 - share) * index / len(others),
                        share + (1 - share) * (index + 1) / len(others))
        cache[atom] = _atom_value(atom, type(atom).__name__,
                                  reduced if _is_invariant(atom) else tau, digits, part)
        job.report(share + (1 - share) * (index + 1) / len(others), f"evaluated {atom}")
    return {atom: (ctx.convert(cache[atom].value), ctx.convert(cache[atom].error))
            for atom in atoms}


def _is_invariant(atom) -> bool:
    """Graph functions (and Laplacians of them) are evaluated at the reduced tau."""
    family = type(atom).__name__
    return family in GRAPH_FAMILY or (family == "Laplace" and not _has_theta(atom))


def _has_theta(atom) -> bool:
    return any(type(a).__name__ in THETA_FAMILY for a in sympy.preorder_traversal(atom))


def _atom_value(atom, family, tau, digits, job) -> Value:
    if family == "E":
        from ledger.mgf.eisenstein import eisenstein_value
        return eisenstein_value(int(atom.args[0]), tau, digits, job)
    if family == "GraphFunction":
        return _optional("ledger.mgf.multivertex", "graph_value", "general graph functions")(
            atom.graph, tau, digits, job)
    if family == "Laplace":
        laplacian = _optional("ledger.mgf.laplace", "laplacian_value", "the Laplacian")
        return laplacian(atom.args[0], tau, digits, job)
    theta_value = _optional("ledger.mgf.theta", "theta_atom_value", "theta functions")
    return theta_value(atom, tau, digits)


def _optional(module_name: str, function: str, what: str):
    try:
        module = importlib.import_module(module_name)
    except ModuleNotFoundError as exc:
        if exc.name != module_name:
            raise
        raise NotAvailableError(f"evaluating {what} is not available in this build") from exc
    try:
        return getattr(module, function)
    except AttributeError as exc:
        raise NotAvailableError(f"evaluating {what} is not available in this build") from exc


def _walk(expr, values, ctx):
    """(value, error bound) of expr in ctx."""
    if expr in values:
        return values[expr]
    if expr.is_Float:  # a binary float is exactly the number it holds
        value = ctx.make_mpf(expr._mpf_)
        return value, _rounding(ctx, abs(value))
    if expr.is_Rational:
        return ctx.mpf(int(expr.p)) / int(expr.q), _rounding(ctx, abs(ctx.mpf(int(expr.p)) / int(expr.q)))
    if isinstance(expr, sympy.Add):
        total, error = ctx.zero, ctx.zero
        for term in expr.args:
            v, e = _walk(term, values, ctx)
            total += v
            error += e
        return total, error + _rounding(ctx, abs(total))
    if isinstance(expr, sympy.Mul):
        product, error = ctx.one, ctx.zero
        for factor in expr.args:
            v, e = _walk(factor, values, ctx)
            product, error = product * v, abs(product) * e + abs(v) * error + error * e
        return product, error + _rounding(ctx, abs(product))
    if isinstance(expr, sympy.Pow):
        return _power(expr, values, ctx)
    if isinstance(expr, sympy.zeta) and len(expr.args) == 1 and expr.args[0].is_Integer:
        n = int(expr.args[0])
        if n == 1:
            raise ExpressionError("zeta(1) diverges")
        value = ctx.zeta(n)
        return value, _rounding(ctx, abs(value))
    if not expr.free_symbols and not _atoms(expr):
        return _constant(expr, ctx)
    raise ExpressionError(f"cannot evaluate {expr} numerically")


def _power(expr, values, ctx):
    base, exponent = expr.args
    v, e = _walk(base, values, ctx)
    if exponent.is_Integer:
        n = int(exponent)
        if n < 0:
            if abs(v) <= e:
                raise LedgerError(f"division by a value indistinguishable from zero in {expr}")
            v, e = 1 / v, e / (abs(v) * (abs(v) - e))
            n = -n
        value = v ** n
        error = (abs(v) + e) ** n - abs(v) ** n
        return value, error + _rounding(ctx, abs(value))
    if not base.free_symbols and not _atoms(base) and not exponent.free_symbols:
        return _constant(expr, ctx)
    p = ctx.mpf(sympy.Float(exponent, ctx.dps + 5))
    if isinstance(v, ctx.mpc) or v <= 2 * e:
        raise LedgerError(f"cannot raise {base} to the non-integer power {exponent} here")
    value = v ** p
    # |d(v^p)/dv| = |p| v^(p-1), taken at the worse end of [v - e, v + e]
    error = abs(p) * e * max((v - e) ** (p - 1), (v + e) ** (p - 1))
    return value, error + _rounding(ctx, abs(value))


def _constant(expr, ctx):
    """A number without atoms (pi, log(2), sqrt(3), ...) to the context's precision."""
    try:
        number = sympy.N(expr, ctx.dps + 10)
        real, imag = number.as_real_imag()
        value = ctx.mpc(ctx.mpf(str(real)), ctx.mpf(str(imag)))
    except (TypeError, ValueError) as exc:
        raise ExpressionError(f"cannot evaluate {expr} numerically") from exc
    if value.imag == 0:
        value = value.real
    return value, ctx.mpf(10) ** (-(ctx.dps + 5)) * max(1, abs(value)) + _rounding(ctx, abs(value))


def _rounding(ctx, size):
    return 4 * ctx.eps * size
