"""The UI's door to the engine: the same functions the command line calls.

Each function here runs inside a worker thread, takes a
:class:`ledger.mgf.jobs.Job` for progress and cancellation, imports its engine
module lazily, and returns plain data (the derived-data records stored in an
entry).  A module that this build does not have yet raises
:class:`ledger.errors.NotAvailableError`, which the UI shows as
"not available yet".  Nothing here imports textual or touches a project.

>>> record = {"variable": "y", "terms": [{"power": 2, "coefficient": "1/45"},
...                                      {"power": -1, "coefficient": "zeta(3)"}]}
>>> round(float(laurent_at(record, 1.0)), 6)  # y = pi: pi^2/45 + zeta(3)/pi
0.601951
"""

from __future__ import annotations

import importlib
from dataclasses import dataclass
from typing import Optional

import mpmath
import sympy

from ledger import ENGINE_VERSION
from ledger.errors import LedgerError, NotAvailableError
from ledger.mgf.jobs import Job, ensure_job

DEFAULT_TAU = "0.27+1.31i"
PLOT_DIGITS = 12


def require(module_name: str, what: str):
    """Import an engine module, or raise NotAvailableError naming what is missing."""
    try:
        return importlib.import_module(module_name)
    except ModuleNotFoundError as missing:
        if missing.name and module_name.startswith(missing.name):
            raise NotAvailableError(f"{what} is not available yet in this build "
                                    f"({module_name} is missing)") from None
        raise


def available(module_name: str) -> bool:
    """True when this build has the engine module (without importing it)."""
    return importlib.util.find_spec(module_name) is not None


def _context(digits: int) -> mpmath.MPContext:
    ctx = mpmath.MPContext()
    ctx.dps = digits + 10
    return ctx


def parse_expression(text: str):
    from ledger.expr import parse

    return parse(text)


def parse_tau(text: str):
    module = require("ledger.expr.tau", "parsing tau")
    return module.parse_tau(text)


def value_record(expr_text: str, tau_text: str, digits: int, job: Optional[Job] = None) -> dict:
    """The value of an expression at tau, as stored in entry.derived["values"]."""
    check_digits(digits)
    expr = parse_expression(expr_text)
    tau_module = require("ledger.expr.tau", "parsing tau")
    tau = tau_module.parse_tau(tau_text)
    module = require("ledger.mgf.evaluate", "evaluation")
    value = module.evaluate(expr, tau, digits=digits, job=ensure_job(job))
    return {"tau": tau_module.normalise_tau_text(tau_text), "value": module.value_text(value, digits),
            "error": mpmath.nstr(value.error, 3), "digits": digits, "engine": ENGINE_VERSION}


def laurent_record(expr_text: str, digits: int, job: Optional[Job] = None) -> dict:
    """The Laurent polynomial in y = pi tau2, as the ``laurent`` command computes it.

    Exact coefficients are sympy text; a numerical one is a decimal with its "error".
    """
    check_digits(digits)
    parse_expression(expr_text)
    command = require("ledger.commands.laurent_cmd", "the Laurent polynomial")
    job = ensure_job(job)
    job.report(0.0, "Laurent polynomial")
    payload = command.compute(expr_text, digits, job)
    job.report(1.0, "Laurent polynomial: done")
    return {"variable": payload.get("variable", "y"), "terms": payload["terms"],
            "exact": bool(payload["exact"]), "digits": digits, "engine": ENGINE_VERSION}


def integral_record(expr_text: str, digits: int, job: Optional[Job] = None) -> dict:
    """The renormalised integral over F, as the ``integrate`` command computes it."""
    check_digits(digits)
    parse_expression(expr_text)
    command = require("ledger.commands.integrate_cmd", "the integral over the fundamental domain")
    payload = command.compute(expr_text, digits, "auto", ensure_job(job))
    return {"value": payload["decimal"], "exact": payload["value"] if payload["exact"] else "",
            "log_coefficient": payload["log_coefficient"],
            "divergent_terms": payload["divergent_terms"], "error": payload["error"],
            "digits": digits, "engine": ENGINE_VERSION}


def check_digits(digits) -> None:
    if not isinstance(digits, int) or isinstance(digits, bool) or not 5 <= digits <= 200:
        raise LedgerError(f"digits must be a whole number from 5 to 200, got {digits!r}")


@dataclass(frozen=True)
class ComputeRequest:
    """What the compute screen asks for: any of value, Laurent polynomial, integral."""

    expr_text: str
    tau_text: str
    digits: int
    value: bool = True
    laurent: bool = False
    integral: bool = False


def compute(request: ComputeRequest, job: Optional[Job] = None) -> dict:
    """Run the requested computations; returns {"values": [...], "laurent": ..., "integral": ...}.

    Nothing is returned until everything finished, so a cancelled or failed
    run leaves no partial result behind.
    """
    job = ensure_job(job)
    parts = [name for name in ("value", "laurent", "integral") if getattr(request, name)]
    if not parts:
        raise LedgerError("choose at least one of: value at tau, Laurent polynomial, integral")
    parse_expression(request.expr_text)  # bad input fails before any work
    result = {}
    for index, name in enumerate(parts):
        share = job.part(index / len(parts), (index + 1) / len(parts))
        if name == "value":
            result["values"] = [value_record(request.expr_text, request.tau_text, request.digits,
                                             share)]
        elif name == "laurent":
            result[name] = laurent_record(request.expr_text, request.digits, share)
        else:
            result[name] = integral_record(request.expr_text, request.digits, share)
    return result


def laurent_at(laurent: dict, tau2, ctx=None):
    """The stored Laurent polynomial evaluated at y = pi * tau2."""
    from ledger.book.quantities import parse_exact

    ctx = ctx or _context(PLOT_DIGITS)
    y = ctx.pi * ctx.mpf(tau2)
    total = ctx.mpf(0)
    for term in laurent.get("terms", []):
        coefficient = parse_exact(str(term["coefficient"]), "a stored Laurent coefficient")
        total += ctx.mpf(sympy.N(coefficient, ctx.dps)) * y ** int(term["power"])
    return total


@dataclass(frozen=True)
class LineSamples:
    """A coefficient and its Laurent polynomial along tau = tau1 + i tau2."""

    tau1: float
    tau2: tuple[float, ...]
    values: tuple[float, ...]
    laurent: tuple[float, ...]
    errors: tuple[float, ...]  # upper bounds on the evaluation error
    gaps: tuple[float, ...]  # |value - Laurent polynomial|, formed before rounding to floats


def sample_line(expr_text: str, tau1: float, tau2_min: float, tau2_max: float, points: int,
                job: Optional[Job] = None) -> LineSamples:
    """Evaluate an expression and its Laurent polynomial at points on a vertical line."""
    if not 0 < tau2_min < tau2_max:
        raise LedgerError("the plot range needs 0 < tau2 min < tau2 max")
    if not 2 <= points <= 400:
        raise LedgerError("the number of plot points must be from 2 to 400")
    from ledger.expr.atoms import modular_atoms

    if not modular_atoms(parse_expression(expr_text)):
        raise LedgerError(f"{expr_text} does not depend on tau: there is nothing to plot")
    job = ensure_job(job)
    laurent = laurent_record(expr_text, PLOT_DIGITS, job.part(0.0, 0.1))
    expr = parse_expression(expr_text)
    evaluate = require("ledger.mgf.evaluate", "evaluation").evaluate
    ctx = _context(PLOT_DIGITS)
    heights, values, polynomial, errors, gaps = [], [], [], [], []
    for k in range(points):
        tau2 = tau2_min + (tau2_max - tau2_min) * k / (points - 1)
        job.report(0.1 + 0.9 * k / points, f"τ₂ = {tau2:.3g}")
        value = evaluate(expr, mpmath.mpc(tau1, tau2), digits=PLOT_DIGITS, job=None)
        real = ctx.re(ctx.mpmathify(value.value))
        near = laurent_at(laurent, tau2, ctx)
        heights.append(tau2)
        values.append(float(real))
        errors.append(float(value.error))
        polynomial.append(float(near))
        gaps.append(float(abs(real - near)))
    job.report(1.0, "plot: done")
    return LineSamples(tau1, tuple(heights), tuple(values), tuple(polynomial), tuple(errors),
                       tuple(gaps))


def expand(order: int, tree: bool, reduce: bool, background_id: str, job: Optional[Job] = None) -> dict:
    """The alpha' expansion as the ``expand`` command computes it (its JSON payload)."""
    module = require("ledger.commands.expand_cmd", "the alpha' expansion")
    return module.compute(order, tree, reduce, background_id, job)


@dataclass(frozen=True)
class DiffRow:
    status: str  # same / different / conflict / only-in-first / only-in-second
    key: tuple  # (background, genus, operator, (p, q))
    first: object  # Entry or None
    second: object
    factor: str = ""
    details: tuple[str, ...] = ()


@dataclass(frozen=True)
class DiffResult:
    rows: tuple[DiffRow, ...]
    alignment: tuple[str, ...]  # one line per convention the second was converted in
    aligned: bool  # False when compared as written (no convention alignment available)
    cause: str = ""


def diff(first, second, job: Optional[Job] = None) -> DiffResult:
    """Compare two projects entry by entry, after aligning conventions when this build can."""
    job = ensure_job(job)
    job.report(0.0, "comparing")
    try:
        compare = require("ledger.compare", "the convention-aligned diff")
    except NotAvailableError:
        return _diff_as_written(first, second)
    result = compare.diff_projects(first, second)
    rows = []
    for item in result.entries:
        factor = item.factor
        details = []
        if item.comparison is not None:
            for part in item.comparison.items:
                if part.status == "same":
                    details.append(f"{part.item}: same")
                    continue
                how = f"factor {part.factor.text()}" if part.factor is not None else "not a pure factor"
                details += [f"{part.item}: different, {how}", f"  A: {part.first}", f"  B: {part.second}"]
                if part.detail:
                    details.append(f"  {part.detail}")
        if item.cause is not None:
            details.append(f"cause: {item.cause.describe()}")
        rows.append(DiffRow(item.status, item.key, item.first, item.second,
                            factor.text() if factor is not None and item.status != "same" else "",
                            tuple(details)))
    alignment = tuple(f"{step.key}: {step.source} → {step.target} ({step.effect})"
                      for step in result.alignment)
    job.report(1.0, "compared")
    return DiffResult(tuple(rows), alignment, True,
                      result.cause.describe() if result.cause is not None else "")


def _diff_as_written(first, second) -> DiffResult:
    from ledger.tui.project_edits import same_expression

    rows = []
    by_key = {}
    for entry in second.entries:
        by_key.setdefault(entry.key(), []).append(entry)
    for entry in first.entries:
        matches = by_key.get(entry.key())
        other = matches.pop(0) if matches else None
        if other is None:
            rows.append(DiffRow("only-in-first", entry.key(), entry, None))
        else:
            same = same_expression(entry.coefficient, other.coefficient)
            rows.append(DiffRow("same" if same else "different", entry.key(), entry, other,
                                details=(f"A: {entry.coefficient}", f"B: {other.coefficient}")))
    rows += [DiffRow("only-in-second", e.key(), None, e) for left in by_key.values() for e in left]
    differing = tuple(f"{k}: {first.conventions[k]} (A) vs {second.conventions[k]} (B)"
                      for k in first.conventions if first.conventions[k] != second.conventions.get(k))
    return DiffResult(tuple(rows), differing, False)


EXPORT_FORMATS = {"latex": ("LaTeX", ".tex"), "markdown": ("Markdown", ".md"), "csv": ("CSV", ".csv")}


def export_text(project, entry_ids: list[str], fmt: str) -> str:
    """The table of the chosen entries in one format, as the ``export`` command writes it."""
    module = require("ledger.export", "export")
    if not entry_ids:
        raise LedgerError("choose at least one entry to export")
    return module.export_text(project, fmt, {"id": list(entry_ids)})
