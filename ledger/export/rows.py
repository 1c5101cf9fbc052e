"""Selecting entries and turning each into the cells every table format shares.

A selection is a list of ``KEY=VALUE[,VALUE...]`` items, all of which must
hold (values within one item are alternatives).  Keys: id, background, genus,
operator, structure, status, source (computed or cited).

>>> parse_selection(["genus=1", "operator=D^4R^4,D^6R^4"])
{'genus': ['1'], 'operator': ['D^4R^4', 'D^6R^4']}
"""

from __future__ import annotations

from dataclasses import dataclass

import sympy

from ledger.book.model import operator_weight, structure_exponents
from ledger.book.quantities import (
    looks_exact, parse_exact, parse_number, record_digits, working_context,
)
from ledger.book.transform import convert_laurent
from ledger.errors import LedgerError

SELECT_KEYS = ("id", "background", "genus", "operator", "structure", "status", "source")
SHOWN_DIGITS = 12


def parse_selection(items: list[str] | None) -> dict:
    """{key: [alternatives]} from KEY=VALUE[,VALUE...] items; bad keys are bad input."""
    selection: dict[str, list[str]] = {}
    for item in items or []:
        key, sep, value = item.partition("=")
        key = key.strip()
        if not sep or not value.strip():
            raise LedgerError(f"--select expects KEY=VALUE, got {item!r}")
        if key not in SELECT_KEYS:
            raise LedgerError(f"--select: unknown key {key!r}; known keys: {', '.join(SELECT_KEYS)}")
        values = [v.strip() for v in value.split(",") if v.strip()]
        if key == "source" and any(v not in ("computed", "cited") for v in values):
            raise LedgerError(f"--select source must be 'computed' or 'cited', got {value!r}")
        if key == "genus" and any(not v.isdigit() for v in values):
            raise LedgerError(f"--select genus must be a non-negative integer, got {value!r}")
        selection.setdefault(key, []).extend(values)
    for value in selection.get("operator", []):
        operator_weight(value)
    for value in selection.get("structure", []):
        structure_exponents(value)
    return selection


def _matches(entry, key: str, values: list[str]) -> bool:
    if key == "genus":
        return entry.genus in {int(v) for v in values}
    if key == "operator":
        return entry.weight in {operator_weight(v) for v in values}
    if key == "structure":
        return entry.exponents in {structure_exponents(v) for v in values}
    if key == "source":
        return ("cited" if entry.provenance.kind == "reference" else "computed") in values
    return getattr(entry, key) in values


def select_entries(project, selection: dict) -> list:
    """The selected entries, ordered by background (project order), genus, weight, sigma_3 power."""
    chosen = [e for e in project.entries if all(_matches(e, k, v) for k, v in selection.items())]
    if not chosen:
        what = "; ".join(f"{k}={','.join(v)}" for k, v in selection.items()) or "no entries at all"
        raise LedgerError(f"nothing to export: no entry matches ({what})")
    order = {b.id: i for i, b in enumerate(project.backgrounds)}
    return sorted(chosen, key=lambda e: (order.get(e.background, len(order)), e.genus, e.weight,
                                         e.exponents[1]))


@dataclass
class Row:
    """What every format shows for one entry (exact parts as sympy, numbers as text)."""

    entry: object
    coefficient: object
    laurent: list | None  # [(power, sympy constant or decimal text)], in the declared variable
    integral: object  # sympy constant, decimal text, or None
    log_coefficient: object
    source: str


def build_rows(project, entries) -> list[Row]:
    """Rows for the given entries, reading every derived record (bad data is bad input)."""
    rows = []
    for entry in entries:
        try:
            rows.append(_row(project, entry))
        except LedgerError as error:
            message = str(error)
            raise LedgerError(message if message.startswith("entry ") else f"entry {entry.id}: {message}") \
                from None
    return rows


def _row(project, entry) -> Row:
    from ledger.expr import parse

    derived = entry.derived or {}
    laurent = None
    if "laurent" in derived:
        record = convert_laurent(derived["laurent"], project.conventions, project.conventions)
        exact, digits = bool(record.get("exact")), record_digits(record)
        laurent = [(_power(t), _constant(t.get("coefficient"), exact, digits)) for t in record["terms"]]
    integral = log_coefficient = None
    if "integral" in derived:
        record = derived["integral"]
        if record.get("exact"):
            integral = parse_exact(record["exact"], "integral")
        elif record.get("value") not in (None, ""):
            integral = _decimal(record["value"], record_digits(record))
        if record.get("log_coefficient") not in (None, "", "0"):
            log_coefficient = _constant(str(record["log_coefficient"]), False, record_digits(record))
    return Row(entry, parse(entry.coefficient), laurent, integral, log_coefficient, source_text(entry))


def source_text(entry) -> str:
    """'computed (engine 0.1.0), verified' or 'cited arXiv:... eq. ..., unverified'."""
    return f"{entry.provenance.describe()}, {entry.status}"


def _power(term) -> int:
    power = term.get("power") if isinstance(term, dict) else None
    if isinstance(power, bool) or not isinstance(power, int):
        raise LedgerError(f"a Laurent term needs an integer power, got {power!r}")
    return power


def _constant(text, exact: bool, digits: int):
    """Exact text (or text without a decimal point or exponent) -> sympy; else a decimal."""
    text = str(text)
    if exact or looks_exact(text):
        return parse_exact(text, "value")
    return _decimal(text, digits)


def _decimal(text, digits: int) -> str:
    """A decimal's text rounded to the digits it claims, at most 12."""
    shown = min(digits, SHOWN_DIGITS)
    ctx = working_context(shown)
    return ctx.nstr(parse_number(str(text), ctx, "value"), shown)


def laurent_line(terms, variable: str, constant, times: str, power) -> str:
    """A Laurent polynomial on one line, in decreasing powers.

    ``constant`` prints an exact coefficient, ``power(k)`` the exponent mark.

    >>> laurent_line([(-1, sympy.zeta(3)), (2, sympy.Rational(1, 45))], "y", str, "*",
    ...              lambda k: f"^{k}")
    '1/45*y^2 + zeta(3)*y^-1'
    """
    pieces = []
    for k, c in sorted(terms, key=lambda t: -t[0]):
        text = c if isinstance(c, str) else constant(c)
        wrapped = isinstance(c, sympy.Add)
        negative = not wrapped and text.lstrip()[:1] in ("-", "\u2212")
        magnitude = text.lstrip()[1:].lstrip() if negative else (f"({text})" if wrapped else text)
        monomial = "" if k == 0 else variable + (power(k) if k != 1 else "")
        if not monomial:
            body = magnitude
        else:
            body = monomial if magnitude == "1" else f"{magnitude}{times}{monomial}"
        pieces.append(("-" if negative else "+", body))
    if not pieces:
        return "0"
    first_sign, first_body = pieces[0]
    return ("-" if first_sign == "-" else "") + first_body + "".join(
        f" {sign} {body}" for sign, body in pieces[1:])
