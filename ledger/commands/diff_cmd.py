"""``alpha-ledger diff A B [--json]``: compare two projects after aligning conventions.

Exit 0 when equal after alignment, 1 when different, 2 on bad input.
"""

from __future__ import annotations

from ledger.book import Project
from ledger.commands.common import print_json
from ledger.compare import diff_projects, format_text, to_json


def register(subparsers) -> None:
    parser = subparsers.add_parser(
        "diff", help="compare two projects after aligning their conventions",
        description="Match entries by background, genus, operator and sigma structure; bring the "
                    "second project into the first's conventions; compare exact forms symbolically "
                    "and numbers to the smaller precision. Exit 0 if equal, 1 if different.")
    parser.add_argument("first", metavar="A", help="the first project (its conventions are used)")
    parser.add_argument("second", metavar="B", help="the second project")
    parser.add_argument("--json", action="store_true", help="print one JSON object")
    parser.set_defaults(run=run)


def run(args) -> int:
    first, second = Project.load(args.first), Project.load(args.second)
    diff = diff_projects(first, second)
    if args.json:
        print_json(to_json(diff, args.first, args.second))
    else:
        print(format_text(diff, args.first, args.second))
    return 0 if diff.equal else 1
