"""``alpha-ledger laurent EXPR [--digits D] [--json]``: the Laurent polynomial in y = pi*tau2.

JSON: {"expr", "variable": "y", "variable_definition": "pi*tau2",
"terms": [{"power": k, "coefficient": sympy-parsable string, "error"?}], "exact": bool};
an inexact coefficient is a decimal and carries its "error".
"""

from __future__ import annotations

import sympy

from ledger.commands.common import decimal_text, error_text, print_json, through_identities
from ledger.mgf.values import Value


def register(subparsers) -> None:
    parser = subparsers.add_parser(
        "laurent", help="Laurent polynomial in y = pi*tau2 (exact where identified)",
        description="The tau1-independent power-law part of EXPR in y = pi*tau2 (exponentially "
                    "small terms dropped). Coefficients are exact zeta values when identified with "
                    "digits to spare and confirmed at a second precision, else decimals with an error.")
    parser.add_argument("expr", metavar="EXPR", help="expression, e.g. 'C(2,1,1)' or 'laplace(E(3))'")
    parser.add_argument("--digits", type=int, default=30, metavar="D",
                        help="precision of any inexact coefficient (default 30)")
    parser.add_argument("--json", action="store_true", help="print one JSON object")
    parser.set_defaults(run=run)


def compute(text: str, digits: int = 30, job=None) -> dict:
    """The JSON payload for EXPR."""
    from ledger.expr import parse, to_text
    from ledger.mgf.laurent import laurent_polynomial

    expr = parse(text)
    polynomial, reduced = through_identities(lambda e: laurent_polynomial(e, digits, job), expr)
    terms = []
    for power, c in polynomial.terms:
        if isinstance(c, Value):
            terms.append({"power": power, "coefficient": decimal_text(c, digits), "error": error_text(c)})
        else:
            terms.append({"power": power, "coefficient": sympy.sstr(c)})
    return {"expr": to_text(expr), "variable": "y", "variable_definition": "pi*tau2",
            "terms": terms, "exact": polynomial.exact, "text": polynomial.to_text(),
            **({"via_identities": to_text(reduced)} if reduced is not None else {})}


def run(args) -> int:
    from ledger.mgf.approx import working_context

    working_context(args.digits)  # validates the digits
    payload = compute(args.expr, args.digits)
    if args.json:
        print_json({k: v for k, v in payload.items() if k != "text"})
        return 0
    print(f"{payload['expr']} = {payload['text']} + O(exp(-2y)),  y = pi*tau2")
    if "via_identities" in payload:
        print(f"  (through the identity table: {payload['expr']} = {payload['via_identities']})")
    if not payload["exact"]:
        inexact = [t for t in payload["terms"] if "error" in t]
        print(f"{len(inexact)} coefficient(s) not identified exactly (decimals with errors):")
        for term in inexact:
            print(f"  y^{term['power']}: {term['coefficient']} +- {term['error']}")
    return 0
