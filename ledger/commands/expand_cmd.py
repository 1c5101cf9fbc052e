"""``alpha-ledger expand --order W [--tree] [--reduce] [--json] [--background ID] [--into PROJECT]``.

Prints B_(p,q) (genus one) or T_(p,q) (tree level) for every sigma structure
with 2p + 3q <= W, each with its operator D^{2w}R^4 and alpha' order.  With
``--into`` the coefficients are also added to a project as computed entries.
"""

from __future__ import annotations

import shutil
import textwrap

from ledger.amplitudes.backgrounds import get_background, is_flat
from ledger.commands.common import print_json

DEFAULT_BACKGROUND = "flat-iib"


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
    parser.add_argument("--no-derive", action="store_true",
                        help="with --into: add coefficients only, without Laurent polynomials, "
                             "integrals and reference values")
    parser.add_argument("--json", action="store_true")
    parser.set_defaults(run=run)


def compute(order: int, tree: bool, reduce: bool, background_id: str, job=None) -> dict:
    """The expansion as the JSON payload of the command (expressions as plain text)."""
    from ledger.amplitudes.genus_one import genus_one_coefficients
    from ledger.amplitudes.operators import format_structure, operator_for
    from ledger.amplitudes.tree import tree_coefficients
    from ledger.expr import to_text

    background = get_background(background_id)
    if not is_flat(background) and not tree:
        return orbifold_genus_one(background, order)
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
    payload = {"genus": 0 if tree else 1, "order": order, "background": background.id,
               "reduced": bool(reduce and not tree), "coefficients": rows}
    if not is_flat(background):
        payload["note"] = ORBIFOLD_TREE_NOTE
    return payload


ORBIFOLD_TREE_NOTE = (
    "gravitons polarised and moving in R^6 are untwisted states, and the sphere has no twisted "
    "sectors: the tree amplitude is the ten-dimensional one, the T^4/Z_N volume absorbed in the "
    "six-dimensional coupling (common practice)")


ORBIFOLD_GENUS_ONE_GAP = (
    "the genus-one D^{2w}R^4 coefficients of this orbifold are not derived: the untwisted "
    "sector carries the T^4 lattice sum (moduli dependent) and the map from the twisted-sector "
    "integrands above to the sigma structures is not worked out, so no entry is recorded")


def orbifold_genus_one(background, order: int) -> dict:
    """What genus one gives on T^4/Z_N: no coefficient rows, the sector-summed integrands
    I_1..I_W (weight s <= W) with their exact reductions, Laurent polynomials and integrals.

    >>> payload = orbifold_genus_one(get_background("t4z2-iib"), 2)
    >>> payload["coefficients"], [i["reduced"] for i in payload["sector_integrands"]]
    ([], ['-16*log(2)', '-6*E(2)'])
    """
    from ledger.amplitudes.orbifold import orbifold_integrands

    integrands = orbifold_integrands(background, max(1, order))
    return {"genus": 1, "order": order, "background": background.id, "reduced": False,
            "coefficients": [], "sector_integrands": [i.as_record() for i in integrands],
            "missing": ORBIFOLD_GENUS_ONE_GAP}


def run(args) -> int:
    payload = compute(args.order, args.tree, args.reduce, args.background)
    added = None
    if args.into:
        added = add_to_project(args.into, payload, derive=not args.no_derive)
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
    if "sector_integrands" in payload:
        print_sector_integrands(payload, width)
        return
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
    if "note" in payload:
        print(textwrap.fill(payload["note"], width, initial_indent="Note: ", subsequent_indent="  "))


def print_sector_integrands(payload: dict, width: int) -> None:
    print(f"Genus one, background {payload['background']}: sector-summed integrands")
    print("  I_s = (1/N) sum over twisted sectors (k,l) of n(k,l) Etw(s, l/N, k/N), "
          "n = number of fixed points")
    for item in payload["sector_integrands"]:
        print(wrap_terms(item["expr"], width, f"I_{item['weight']} = "))
        print(f"    = {item['reduced']};  RN int_F = {item['integral']}")
    print(textwrap.fill(payload["missing"], width, initial_indent="Not recorded: ",
                        subsequent_indent="  "))


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


def add_to_project(path: str, payload: dict, derive: bool = True, job=None) -> dict:
    """Merge the expansion into the project file (see ledger.book.fill) and save if it changed."""
    from ledger.book import Project
    from ledger.book.fill import merge_expansion

    project = Project.load(path)
    result = merge_expansion(project, payload, derive=derive, job=job)
    if project.dirty:
        project.save()
    return result


def print_added(added: dict) -> None:
    print(f"{added['path']}: added {len(added['added'])} entries"
          + (f" ({', '.join(added['added'])})" if added["added"] else "")
          + f", derived data updated for {len(added['updated'])}"
          + f", {len(added['unchanged'])} already present and equal")
    if "sector_integrands" in added:
        stored = ", ".join(added["sector_integrands"]) or "none changed"
        print(f"  sector-summed integrands kept with the background: {stored}")
    if added["verified"]:
        print(f"  cited entries confirmed by the computation (marked verified): "
              f"{', '.join(added['verified'])}")
    if added["differing"]:
        print(f"  entries whose coefficient differs from the computation (marked conflict, "
              f"coefficient left untouched): {', '.join(added['differing'])}")
