"""``alpha-ledger identify EXPR --basis EXPR,EXPR,... [--digits D] [--json]``.

Finds rational coefficients with EXPR = sum q_i basis_i from exact Laurent
polynomials and values at several points, then checks the relation at points
not used to find it.  JSON: {"expr", "found", "coefficients": [{"basis", "value"}],
"residual_digits", "method"}; finding no relation is an answer (exit 0).
"""

from __future__ import annotations

import math

from ledger.commands.common import print_json
from ledger.errors import LedgerError


def register(subparsers) -> None:
    parser = subparsers.add_parser(
        "identify", help="rational relation between an expression and a basis",
        description="Search rational q_i with EXPR = sum q_i B_i for the basis B_i (graph functions, "
                    "products, zeta values, 1), from Laurent polynomials and values, verified at "
                    "fresh points of the fundamental domain.")
    parser.add_argument("expr", metavar="EXPR")
    parser.add_argument("--basis", required=True, metavar="EXPR,EXPR,...",
                        help="comma-separated basis expressions (commas inside parentheses are kept)")
    parser.add_argument("--digits", type=int, default=30, metavar="D", help="working digits (default 30)")
    parser.add_argument("--json", action="store_true", help="print one JSON object")
    parser.set_defaults(run=run)


def split_top_level(text: str) -> list:
    """Split at commas outside parentheses.

    >>> split_top_level("C(2,1,1), E(4),E(2)^2")
    ['C(2,1,1)', 'E(4)', 'E(2)^2']
    """
    parts, depth, current = [], 0, []
    for char in text:
        if char == "," and depth == 0:
            parts.append("".join(current).strip())
            current = []
            continue
        depth += (char == "(") - (char == ")")
        if depth < 0:
            raise LedgerError(f"unbalanced ')' in the basis {text!r}")
        current.append(char)
    parts.append("".join(current).strip())
    if any(not p for p in parts):
        raise LedgerError(f"empty expression in the basis {text!r}")
    return parts


def compute(text: str, basis_text: str, digits: int = 30, job=None) -> dict:
    from ledger.expr import parse, to_text
    from ledger.mgf.identify import find_identity

    expr = parse(text)
    basis = [parse(part) for part in split_top_level(basis_text)]
    result = find_identity(expr, basis, digits, job)
    residual = result.residual_digits
    return {"expr": to_text(expr), "found": result.found,
            "coefficients": [{"basis": to_text(b), "value": str(q)} for b, q in result.coefficients],
            "residual_digits": round(residual, 2) if math.isfinite(residual) else None,
            "method": result.method}


def run(args) -> int:
    from ledger.mgf.approx import working_context

    working_context(args.digits)
    payload = compute(args.expr, args.basis, args.digits)
    if args.json:
        print_json(payload)
        return 0
    if not payload["found"]:
        print(f"no rational relation found for {payload['expr']} in this basis")
        return 0
    combination = " + ".join(f"({c['value']})*{c['basis']}" for c in payload["coefficients"] if c["value"] != "0")
    print(f"{payload['expr']} = {combination or '0'}")
    print(f"checked at fresh points: agreement to {payload['residual_digits']} digits ({payload['method']})")
    return 0
