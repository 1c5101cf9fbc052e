"""``alpha-ledger eval EXPR --tau T [--digits D] [--json]``: the value of an expression at tau.

JSON: {"expr", "tau", "value", "error", "digits", "seconds"}; "value" is a
decimal string ('a+bi' / 'a-bi' when complex), "error" an upper bound on the
absolute error, "tau" the tau text in its canonical spelling.
"""

from __future__ import annotations

import re
import time

import mpmath

from ledger.commands.common import print_json


def register(subparsers) -> None:
    parser = subparsers.add_parser(
        "eval", help="value of an expression at a point tau, with an error bound",
        description="Evaluate an expression in modular graph functions (E(s), C(a,b,...), "
                    "graph(...), zeta(n), theta-family functions) at tau, e.g. "
                    "alpha-ledger eval 'C(2,1,1) - E(4)' --tau 0.27+1.31i --digits 30.")
    parser.add_argument("expr", metavar="EXPR", help="the expression, e.g. 'C(1,1,1) - E(3)'")
    parser.add_argument("--tau", required=True, metavar="T",
                        help="the point in the upper half plane, e.g. 0.27+1.31i, i, 2i")
    parser.add_argument("--digits", type=int, default=30, metavar="D",
                        help="significant digits wanted (default 30)")
    parser.add_argument("--json", action="store_true", help="print one JSON object")
    # let values such as '--tau -0.4+0.95i' through (argparse would take them for an option)
    parser._negative_number_matcher = re.compile(r"^-\.?\d")
    parser.set_defaults(run=run)


def compute(expr_text: str, tau_text: str, digits: int = 30, job=None) -> dict:
    """The command's JSON payload."""
    from ledger.expr import parse, to_text
    from ledger.expr.tau import normalise_tau_text, parse_tau
    from ledger.mgf.evaluate import evaluate, value_text

    expr = parse(expr_text)
    tau = parse_tau(tau_text)
    start = time.perf_counter()
    value = evaluate(expr, tau, digits, job)
    seconds = time.perf_counter() - start
    return {
        "expr": to_text(expr),
        "tau": normalise_tau_text(tau_text),
        "value": value_text(value, digits),
        "error": mpmath.nstr(value.error, 3),
        "digits": digits,
        "seconds": round(seconds, 3),
    }


def run(args) -> int:
    payload = compute(args.expr, args.tau, args.digits)
    if args.json:
        print_json(payload)
    else:
        print(f"{payload['expr']}  at tau = {payload['tau']}")
        print(f"  = {payload['value']}  (error <= {payload['error']}, "
              f"{payload['digits']} digits, {payload['seconds']:.2f} s)")
    return 0
