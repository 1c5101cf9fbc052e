"""Small helpers shared by subcommands: JSON output and argument parsing.

>>> parse_assignments(["mandelstam=alpha'/2"])
{'mandelstam': "alpha'/2"}
"""

from __future__ import annotations

import json
import sys

from ledger.errors import LedgerError


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
