"""``alpha-ledger integrate EXPR [--digits D] [--route R] [--json]``: renormalised integral over F.

Measure d^2tau/tau2^2, F cut at tau2 = L, positive powers of L dropped, the
log L coefficient reported separately.  JSON: {"expr", "value" (the closed
form when exact, else a decimal), "decimal", "exact", "log_coefficient",
"divergent_terms": [{"power": n, "coefficient"}] (of L^n), "error", "route",
"checks": [{"route", "value", "error"}]}.
"""

from __future__ import annotations

import sympy

from ledger.commands.common import decimal_text, error_text, print_json, through_identities
from ledger.mgf.values import Value


def register(subparsers) -> None:
    from ledger.mgf.integrate import ROUTES

    parser = subparsers.add_parser(
        "integrate", help="renormalised integral over the fundamental domain",
        description="int_F EXPR d^2tau/tau2^2 with F cut at tau2 = L: the L^0 term, the log L "
                    "coefficient and the dropped positive powers of L. Route 'laplace' uses Laplace "
                    "equations and closed forms, 'quadrature' integrates numerically (plus the exact "
                    "Laurent tail), 'both' checks one against the other, 'auto' prefers the exact one.")
    parser.add_argument("expr", metavar="EXPR")
    parser.add_argument("--digits", type=int, default=15, metavar="D", help="digits (default 15)")
    parser.add_argument("--route", choices=ROUTES, default="auto")
    parser.add_argument("--json", action="store_true", help="print one JSON object")
    parser.set_defaults(run=run)


def _coefficient_text(c, digits: int) -> str:
    return decimal_text(c, digits) if isinstance(c, Value) else sympy.sstr(c)


def compute(text: str, digits: int = 15, route: str = "auto", job=None) -> dict:
    from ledger.expr import parse, to_text
    from ledger.mgf.integrate import integrate_over_fundamental_domain

    expr = parse(text)
    result, reduced = through_identities(
        lambda e: integrate_over_fundamental_domain(e, digits, route, job), expr)
    exact = result.exact is not None
    decimal = decimal_text(result.value, digits)
    return {
        "expr": to_text(expr),
        "value": sympy.sstr(result.exact) if exact else decimal,
        "decimal": decimal,
        "exact": exact,
        "log_coefficient": _coefficient_text(result.log_coefficient, digits),
        "divergent_terms": [{"power": n, "coefficient": _coefficient_text(c, digits)}
                            for n, c in result.divergent_terms],
        "error": error_text(result.value),
        "route": result.route,
        "checks": [{"route": name, "value": decimal_text(v, digits), "error": error_text(v)}
                   for name, v in result.checks],
        **({"via_identities": to_text(reduced)} if reduced is not None else {}),
    }


def run(args) -> int:
    from ledger.mgf.approx import working_context

    working_context(args.digits)
    payload = compute(args.expr, args.digits, args.route)
    if args.json:
        print_json(payload)
        return 0
    print(f"RN int_F {payload['expr']} d^2tau/tau2^2 = {payload['value']}")
    if "via_identities" in payload:
        print(f"  (through the identity table: {payload['expr']} = {payload['via_identities']})")
    if payload["exact"]:
        print(f"  = {payload['decimal']}")
    else:
        print(f"  error {payload['error']} (route: {payload['route']})")
    dropped = " + ".join(f"({t['coefficient']}) L^{t['power']}" for t in payload["divergent_terms"])
    print(f"dropped: {dropped or 'nothing'}; log L coefficient: {payload['log_coefficient']}")
    for check in payload["checks"]:
        print(f"check by {check['route']}: {check['value']} +- {check['error']}")
    return 0
