"""``alpha-ledger expand --order W [--tree] [--reduce] [--json] [--background ID] [--into PROJECT]``.

Prints B_(p,q) (genus one) or T_(p,q) (tree level) for every sigma structure
with 2p + 3q <= W, each with its operator D^{2w}R^4 and alpha' order.  With
``--into`` the coefficients are also added to a project as computed entries.
"""

from __future__ import annotations

import shutil

from ledger.commands.common import print_json
from ledger.errors import ConventionError, NotAvailableError

DEFAULT_BACKGROUND = "flat-iib"
# The conventions that change the coefficients themselves (the others only
# change derived data such as Laurent polynomials and integrals).
_COEFFICIENT_CONVENTIONS = ("mandelstam", "graph_normalisation", "green_function", "amplitude_factor")


def register(subparsers) -> None:
    parser = subparsers.add_parser(
        "expand", help="alpha' expansion coefficients B_(p,q) (genus one) or tree level",
        description="Expand the four-graviton amplitude through weight W = 2p + 3q: at genus one "
                    "B_(p,q)(tau) in modular graph functions, with --tree the Virasoro-Shapiro "
                    "coefficients in odd zeta values; both in the basis "
                    "sigma2^p sigma3^q/(p! q!), sigma_k = s^k + t^k + u^k, s + t + u = 0.")
    parser.add_argument("--order", type=int, required=True, metavar="W",
                        help="highest weight 2p + 3q (D^{2W}R^4)")
    parser.add_argument("--tree", action="store_true", help="tree level instead of genus one")
    parser.add_argument("--reduce", action="store_true",
                        help="apply the known identities between graph functions (genus one)")
    parser.add_argument("--background", default=DEFAULT_BACKGROUND, metavar="ID",
                        help=f"background id (default {DEFAULT_BACKGROUND})")
    parser.add_argument("--into", metavar="PROJECT",
                        help="also add the coefficients to this project file as computed entries")
    parser.add_argument("--json", action="store_true")
    parser.set_defaults(run=run)


def compute(order: int, tree: bool, reduce: bool, background_id: str, job=None) -> dict:
    """The expansion as the JSON payload of the command (expressions as plain text)."""
    from ledger.amplitudes.backgrounds import get_background, is_flat
    from ledger.amplitudes.genus_one import genus_one_coefficients
    from ledger.amplitudes.operators import format_structure, operator_for
    from ledger.amplitudes.tree import tree_coefficients
    from ledger.expr import to_text

    background = get_background(background_id)
    if not is_flat(background):
        raise NotAvailableError(f"expand: only the flat backgrounds (flat-iia, flat-iib) can be "
                                f"expanded in this build, not {background_id!r}")
    if tree:
        coefficients = tree_coefficients(order, job)
    else:
        coefficients = genus_one_coefficients(order, reduce=reduce, job=job)
    rows = []
    for structure, expr in coefficients.items():
        operator = operator_for(structure)
        rows.append({"p": structure.p, "q": structure.q, "operator": operator.label,
                     "structure": format_structure(structure),
                     "alpha_order": operator.alpha_order, "expr": to_text(expr)})
    return {"genus": 0 if tree else 1, "order": order, "background": background.id,
            "reduced": bool(reduce and not tree), "coefficients": rows}


def run(args) -> int:
    payload = compute(args.order, args.tree, args.reduce, args.background)
    added = None
    if args.into:
        added = add_to_project(args.into, payload)
    if args.json:
        if added is not None:
            payload = {**payload, "project": added}
        print_json(payload)
    else:
        print_plain(payload)
        if added is not None:
            print_added(added)
    return 1 if added and added["differing"] else 0


def print_plain(payload: dict) -> None:
    width = max(60, shutil.get_terminal_size((100, 24)).columns)
    if payload["genus"] == 1:
        form = "after known identities" if payload["reduced"] else "raw graph form"
        print(f"Genus one, background {payload['background']} ({form}):")
        print("  B(s,t,u|tau) = sum B_(p,q) sigma2^p sigma3^q/(p! q!),  s + t + u = 0")
        name = "B"
    else:
        print(f"Tree level, background {payload['background']}:")
        print("  T = Gamma(1-s)Gamma(1-t)Gamma(1-u)/(s t u Gamma(1+s)Gamma(1+t)Gamma(1+u))")
        print("    = 3/sigma3 + sum T_(p,q) sigma2^p sigma3^q/(p! q!)")
        name = "T"
    for row in payload["coefficients"]:
        print(f"{row['operator']:<9} alpha'^{row['alpha_order']:<3} {row['structure']}")
        lead = f"  {name}_({row['p']},{row['q']}) = "
        print(wrap_terms(row["expr"], width, lead))


def wrap_terms(text: str, width: int, lead: str) -> str:
    """Break a sum between its terms (never inside parentheses), indenting continuations.

    >>> print(wrap_terms("E(2) + C(1,1,1) - graph(0-1, 0-2, 1-2:2)", 24, "B = "))
    B = E(2) + C(1,1,1)
        - graph(0-1, 0-2, 1-2:2)
    """
    pieces, depth, start = [], 0, 0
    for i, char in enumerate(text):
        depth += (char == "(") - (char == ")")
        if depth == 0 and text.startswith((" + ", " - "), i):
            pieces.append(text[start:i])
            start = i + 1
    pieces.append(text[start:])
    lines, current = [], lead + pieces[0]
    for piece in pieces[1:]:
        if len(current) + 1 + len(piece) > width:
            lines.append(current)
            current = " " * len(lead) + piece
        else:
            current += " " + piece
    return "\n".join(lines + [current])


def add_to_project(path: str, payload: dict) -> dict:
    """Add one computed entry per coefficient; entries already present are left untouched.

    An existing entry counts as equal when the difference vanishes after the identities
    of the table (so a raw and a reduced form of the same coefficient agree).
    """
    from ledger import ENGINE_VERSION
    from ledger.amplitudes.backgrounds import get_background
    from ledger.amplitudes.identities import apply_identities
    from ledger.book import Background, Project, Provenance, default_conventions
    from ledger.expr import parse

    project = Project.load(path)
    engine = default_conventions()
    differing_conventions = [k for k in _COEFFICIENT_CONVENTIONS
                             if project.conventions.get(k) != engine[k]]
    if differing_conventions:
        raise ConventionError(
            f"{path}: declares {', '.join(f'{k}={project.conventions[k]}' for k in differing_conventions)}; "
            "expand computes in the engine's conventions, so it does not add entries to this project")
    background = get_background(payload["background"])
    if project.background(background.id) is None:
        project.add_background(Background(background.id, background.name, background.theory,
                                          background.dimension, background.compactification,
                                          {"supercharges": background.supercharges}))
    note = ("tree level, T = Gamma(1-s)Gamma(1-t)Gamma(1-u)/(s t u Gamma(1+s)Gamma(1+t)Gamma(1+u)), "
            "pole 3/sigma3 excluded" if payload["genus"] == 0 else
            "genus-one integrand B_(p,q), " + ("after known identities" if payload["reduced"]
                                               else "raw graph form"))
    added, unchanged, differing = [], [], []
    for row in payload["coefficients"]:
        existing = project.find(background.id, payload["genus"], row["operator"], (row["p"], row["q"]))
        if existing is not None:
            same = apply_identities(parse(existing.coefficient) - parse(row["expr"])) == 0
            (unchanged if same else differing).append(existing.id)
            continue
        entry = project.add_entry(background=background.id, genus=payload["genus"],
                                  operator=row["operator"], structure=row["structure"],
                                  coefficient=row["expr"], notes=note,
                                  provenance=Provenance("computed", ENGINE_VERSION))
        added.append(entry.id)
    if added:
        project.save()
    return {"path": str(project.path), "added": added, "unchanged": unchanged,
            "differing": differing}


def print_added(added: dict) -> None:
    print(f"{added['path']}: added {len(added['added'])} entries"
          + (f" ({', '.join(added['added'])})" if added["added"] else "")
          + f", {len(added['unchanged'])} already present and equal")
    if added["differing"]:
        print(f"  already present with a different coefficient (left untouched): "
              f"{', '.join(added['differing'])}")
