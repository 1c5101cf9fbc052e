"""``alpha-ledger add PROJECT --background ID --genus G --operator OP --expr EXPR ...``."""

from __future__ import annotations

import sys

from ledger import ENGINE_VERSION
from ledger.amplitudes.operators import structures_of_weight
from ledger.book import Project, Provenance, structure_exponents, structure_label
from ledger.commands.common import print_json
from ledger.errors import LedgerError


def register(subparsers) -> None:
    parser = subparsers.add_parser(
        "add", help="append one entry to a project",
        description="Append one entry and print its id; every other entry stays untouched.")
    parser.add_argument("project")
    parser.add_argument("--background", required=True, help="background id in the project")
    parser.add_argument("--genus", required=True, type=int)
    parser.add_argument("--operator", required=True, help="R^4, D^4R^4, D^6R^4, ...")
    parser.add_argument("--structure", help="sigma structure, e.g. 'sigma2^3' or 'sigma3^2' "
                                            "(needed only when the operator has two)")
    parser.add_argument("--expr", required=True, help="the coefficient, e.g. 'E(2)'")
    parser.add_argument("--source", metavar="ARXIV:EQ",
                        help="cite a reference, e.g. 1502.06698:(2.11); without it the entry "
                             "is marked as computed here")
    parser.add_argument("--note", default="", help="free text")
    parser.add_argument("--json", action="store_true")
    parser.set_defaults(run=run)


def run(args) -> int:
    from ledger.book import operator_weight
    from ledger.expr import parse, to_text

    project = Project.load(args.project)
    weight = operator_weight(args.operator)
    structure = args.structure
    if structure is None:
        options = [(o.p, o.q) for o in structures_of_weight(weight)]
        if len(options) != 1:
            labels = " or ".join(repr(structure_label(*o)) for o in options)
            raise LedgerError(f"{args.operator} has {len(options)} sigma structures: "
                              f"give --structure {labels}")
        structure = structure_label(*options[0])
    coefficient = to_text(parse(args.expr))
    existing = project.find(args.background, args.genus, args.operator,
                            structure_exponents(structure))
    if args.source:
        arxiv, _, equation = args.source.partition(":")
        provenance = Provenance("reference", "", arxiv.strip(), equation.strip())
    else:
        provenance = Provenance("computed", ENGINE_VERSION)
    entry = project.add_entry(background=args.background, genus=args.genus,
                              operator=args.operator, structure=structure,
                              coefficient=coefficient, notes=args.note, provenance=provenance)
    project.save()
    if existing is not None:  # allowed (a second source), but say so
        print(f"alpha-ledger: note: entry {existing.id} already holds {args.background} genus "
              f"{args.genus} {args.operator} {structure}; added {entry.id} beside it", file=sys.stderr)
    if args.json:
        print_json({"id": entry.id, "project": str(project.path)})
    else:
        print(entry.id)
    return 0
