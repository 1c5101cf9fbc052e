"""Small helpers shared by subcommands: JSON output and argument parsing.

>>> parse_assignments(["mandelstam=alpha'/2"])
{'mandelstam': "alpha'/2"}
"""

from __future__ import annotations

import json
import sys

import mpmath

from ledger.errors import LedgerError
from ledger.mgf.values import Value


def print_json(payload: dict) -> None:
    """Print exactly one JSON object on stdout."""
    json.dump(payload, sys.stdout, ensure_ascii=False)
    sys.stdout.write("\n")


def parse_assignments(items: list[str]) -> dict:
    """Turn ['KEY=VALUE', ...] into a dict; a malformed item is bad input."""
    result = {}
    for item in items or []:
        key, sep, value = item.partition("=")
        if not sep or not key.strip():
            raise LedgerError(f"expected KEY=VALUE, got {item!r}")
        result[key.strip()] = value.strip()
    return result


def decimal_text(value: Value, digits: int) -> str:
    """The decimal string of a Value: ``digits`` significant digits, fewer if the error says so."""
    shown = digits
    if value.error:
        shown = max(1, min(digits, int(value.correct_digits()) + 1))
    return mpmath.nstr(value.value, shown, strip_zeros=False)


def error_text(value: Value) -> str:
    return mpmath.nstr(value.error, 3)


def through_identities(compute_for, expr):
    """``(compute_for(expr), None)``, or when that is not available for a general graph,
    ``(compute_for(reduced), reduced)`` with the identity table applied (rows name their sources).

    >>> from ledger.expr import parse
    >>> through_identities(lambda e: e.free_symbols, parse("zeta(3)"))
    (set(), None)
    """
    from ledger.amplitudes.identities import apply_identities
    from ledger.errors import NotAvailableError

    try:
        return compute_for(expr), None
    except NotAvailableError:
        reduced = apply_identities(expr)
        if reduced == expr:
            raise
        return compute_for(reduced), reduced
