"""Recompute the values a project stores and compare them within both error bounds.

Entries are recomputed from their coefficient (read in the project's conventions),
orbifold sector integrands from their sector sum and from their reduced form.
A stored value that cannot be read is bad input (a ProjectError naming where).

>>> from ledger.book.model import Entry
>>> entry = Entry.from_dict({"id": "e1", "background": "flat-iib", "genus": 1,
...     "operator": "D^4R^4", "structure": "sigma2", "alpha_order": 5, "coefficient": "E(2)",
...     "provenance": {"kind": "computed"}, "derived": {"values": [
...         {"tau": "i", "value": "0.61064372945", "error": "1e-11", "digits": 11}]}})
>>> [(r["entry"], r["agrees"]) for r in recheck_entry(entry, 15)]
[('e1', True)]
"""

from __future__ import annotations

import re

from ledger.errors import LedgerError, ProjectError


def recheck_entry(entry, digits: int, conventions: dict | None = None, job=None) -> list[dict]:
    """Recompute the stored values of one entry; one result per stored value.

    The coefficient is read in the project's conventions: the engine evaluates its
    engine form (same function, engine atoms), which gives the project's own numbers.
    """
    from ledger.book.transform import engine_form
    from ledger.expr import parse

    expr = engine_form(parse(entry.coefficient), conventions or {})
    return [compare_stored(stored, [expr], digits, entry.id, f"entry {entry.id!r}", job)
            for stored in _stored_values(entry.derived.get("values", []), f"entry {entry.id!r}")]


def recheck_background(background, digits: int, job=None) -> list[dict]:
    """Recompute every stored sector-integrand value of a background from its ``expr``
    and from its ``reduced`` form; one result per stored value."""
    from ledger.book.sector_records import reduced_form, sector_records_of
    from ledger.expr import parse

    results = []
    for record in sector_records_of(background, strict=True):
        where = f"background {background.id!r} sector integrand {record.get('name')!r}"
        try:
            forms = [parse(_text(record, "expr", where)), reduced_form(_text(record, "reduced", where))]
        except ProjectError:
            raise
        except LedgerError as error:
            raise ProjectError(f"{where}: {error}") from None
        label = f"{background.id}:{record.get('name')}"
        results += [compare_stored(stored, forms, digits, label, where, job)
                    for stored in _stored_values(record.get("values", []), where)]
    return results


def compare_stored(stored: dict, forms: list, digits: int, label: str, where: str, job=None) -> dict:
    """Evaluate each form at the stored tau and compare with the stored value.

    ``digits`` caps the recomputation (never more than the stored digits)."""
    from ledger.book.quantities import parse_number, working_context
    from ledger.expr.tau import parse_tau
    from ledger.mgf.evaluate import evaluate

    stored_digits = stored.get("digits", digits)
    if not isinstance(stored_digits, int) or isinstance(stored_digits, bool):
        raise ProjectError(f"{where}: stored digits must be an integer, got {stored_digits!r}")
    try:
        use = max(5, min(stored_digits, digits))
        ctx = working_context(use)
        stored_value = parse_number(stored.get("value"), ctx, "stored value")
        stored_error = parse_number(stored.get("error", "0"), ctx, "stored error")
        tau = parse_tau(_text(stored, "tau", where))
    except (LedgerError, TypeError, ValueError) as error:
        raise ProjectError(f"{where}: {error}") from None
    rounding = _rounding(str(stored.get("value")), stored_value, ctx)
    worst, agrees = ctx.zero, True
    for form in forms:
        value = evaluate(form, tau, use, job)
        difference = abs(stored_value - value.value)
        worst = max(worst, difference)
        agrees &= bool(difference <= abs(stored_error) + value.error + rounding
                       + ctx.mpf(10) ** (-use) * abs(value.value))
    return {"entry": label, "tau": stored["tau"], "digits": use, "agrees": agrees,
            "difference": ctx.nstr(worst, 3)}


def _rounding(text: str, value, ctx):
    """A bound on the rounding of a stored decimal: one unit of its last significant digit
    relative to the value (the stored error bounds the computation, not the printing).

    >>> import mpmath
    >>> ctx = mpmath.MPContext()
    >>> ctx.nstr(_rounding("0.0369402917", ctx.mpf("0.0369402917"), ctx), 6)  # 9 significant digits
    '3.69403e-10'
    """
    mantissas = re.findall(r"(\d+(?:\.\d*)?)(?:[eE][+-]?\d+)?", text)
    significant = max((len(m.replace(".", "").lstrip("0")) for m in mantissas), default=0)
    return ctx.mpf(10) ** (1 - max(significant, 1)) * abs(value)


def _stored_values(values, where: str) -> list:
    if not isinstance(values, list) or not all(isinstance(v, dict) for v in values):
        raise ProjectError(f"{where}: stored 'values' must be an array of tables")
    return values


def _text(record: dict, key: str, where: str) -> str:
    value = record.get(key)
    if not isinstance(value, str):
        raise ProjectError(f"{where}: field '{key}' must be text, got {value!r}")
    return value
