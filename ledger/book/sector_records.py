"""Sector-summed integrands of an orbifold background, kept in its project record.

For T^4/Z_N x R^6 the engine computes I_s, the twisted Eisenstein sums at the
fixed points summed over the twisted sectors (:mod:`ledger.amplitudes.orbifold`).
They are not D^{2w}R^4 coefficients (that map is not derived), so they are kept
with the background, not as entries:

    [[backgrounds.sector_integrands]]
    name = "I_2"          weight = 2
    expr = "..."          (the sector sum, in Etw/green atoms)
    reduced = "-6*E(2)"   laurent = [...]   integral = "0"   log_coefficient = "0"
    values = [{tau, value, error, digits, engine}, ...]
    provenance = {kind = "computed", engine = "..."}

Values are summed sector by sector from the twisted lattice sums; the check
(:mod:`ledger.book.recheck`) recomputes them from ``expr`` and ``reduced`` with the
general evaluator, a second
route (here -6 E_2(2i) = -6.4117...).

>>> records = plan_sector_records({"sector_integrands": [
...     {"weight": 2, "order": 2, "expr": "x", "reduced": "-6*E(2)", "laurent": [],
...      "integral": "0", "log_coefficient": "0", "exact": True, "method": "m"}]},
...     taus=("2i",), digits=10)
>>> records[0]["name"], records[0]["values"][0]["value"][:8]
('I_2', '-6.41175')
"""

from __future__ import annotations

from ledger import ENGINE_VERSION
from ledger.mgf.jobs import ensure_job

RECORD_KEY = "sector_integrands"


def sector_records_of(background, strict: bool = False) -> list[dict]:
    """The sector-integrand records kept with a background (none for other backgrounds).

    Lenient for display (anything that is not a table is skipped); ``strict`` makes a
    malformed field bad input instead, as ``check`` needs.
    """
    records = background.extra.get(RECORD_KEY, [])
    well_formed = isinstance(records, list) and all(isinstance(r, dict) for r in records)
    if strict and not well_formed:
        from ledger.errors import ProjectError

        raise ProjectError(f"background {background.id!r}: field '{RECORD_KEY}' must be an array of tables")
    return [r for r in records if isinstance(r, dict)] if isinstance(records, list) else []


def plan_sector_records(payload: dict, taus=None, digits: int | None = None, job=None) -> list[dict]:
    """Project records for the payload's sector integrands, values computed (read-only)."""
    from ledger.amplitudes.orbifold import sector_summed_integrand_value
    from ledger.book.fill import REFERENCE_TAUS, VALUE_DIGITS
    from ledger.commands.common import decimal_text, error_text
    from ledger.expr.tau import parse_tau

    taus = REFERENCE_TAUS if taus is None else taus
    digits = VALUE_DIGITS if digits is None else digits
    job = ensure_job(job)
    items = payload.get(RECORD_KEY, [])
    records = []
    for index, item in enumerate(items):
        part = job.part(index / len(items), (index + 1) / len(items))
        values = []
        for i, tau in enumerate(taus):
            part.report(i / len(taus), f"I_{item['weight']} at tau = {tau}")
            value = sector_summed_integrand_value(item["order"], item["weight"], parse_tau(tau),
                                                  digits, part)
            values.append({"tau": tau, "value": decimal_text(value, digits), "error": error_text(value),
                           "digits": digits, "engine": ENGINE_VERSION})
        records.append({
            "name": f"I_{item['weight']}", "weight": item["weight"], "expr": item["expr"],
            "reduced": item["reduced"], "laurent": item["laurent"], "integral": item["integral"],
            "log_coefficient": item["log_coefficient"], "method": item["method"], "values": values,
            "provenance": {"kind": "computed", "engine": ENGINE_VERSION}})
    return records


def store_sector_records(background, records: list[dict]) -> list[str]:
    """Put the records on a project background (by name; same data left alone).

    Returns the names that were added or replaced.
    """
    kept = {r.get("name"): r for r in sector_records_of(background)}
    changed = []
    for record in records:
        if kept.get(record["name"]) != record:
            kept[record["name"]] = record
            changed.append(record["name"])
    if changed:
        background.extra[RECORD_KEY] = sorted(kept.values(), key=lambda r: r.get("weight", 0))
    return changed


def reduced_form(text: str):
    """The reduced integrand: expression text (c*E(s)) or an exact constant (c*log N)."""
    from ledger.book.quantities import parse_exact
    from ledger.errors import ExpressionError, LedgerError
    from ledger.expr import parse

    try:
        return parse(text)
    except ExpressionError as not_an_expression:
        try:
            return parse_exact(text, "a sector integrand's reduced form")
        except LedgerError:
            raise LedgerError(f"reduced form {text!r}: {not_an_expression}") from None
