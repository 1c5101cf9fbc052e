"""``alpha-ledger check PROJECT ...``: validate, then recompute stored values.

Validation failures are bad input (exit 2).  A recomputed value that
disagrees with the stored one beyond both error bounds is a difference
(exit 1).  The file is never written.
"""

from __future__ import annotations

from ledger.book import Project
from ledger.book.recheck import recheck_background, recheck_entry
from ledger.commands.common import print_json

DEFAULT_DIGITS = 15


def register(subparsers) -> None:
    parser = subparsers.add_parser(
        "check", help="validate project files and recompute their stored values",
        description="Validate each project file; then recompute every stored value at its "
                    "reference tau (to at most --digits) and compare within the error bounds "
                    "(entries, and the sector-summed integrands kept with orbifold backgrounds).")
    parser.add_argument("projects", nargs="+", metavar="PROJECT")
    parser.add_argument("--digits", type=int, default=DEFAULT_DIGITS,
                        help=f"digits for recomputation (default {DEFAULT_DIGITS})")
    parser.add_argument("--no-recompute", action="store_true", help="only validate")
    parser.add_argument("--json", action="store_true")
    parser.set_defaults(run=run)


def run(args) -> int:
    projects = [Project.load(path) for path in args.projects]  # all validated before any work
    report, differences = [], 0
    engine_missing = False
    for project in projects:
        checked = []
        if not args.no_recompute:
            try:
                for entry in project.entries:
                    checked.extend(recheck_entry(entry, args.digits, project.conventions))
                for background in project.backgrounds:
                    checked.extend(recheck_background(background, args.digits))
            except ImportError:
                engine_missing = True
        bad = [c for c in checked if not c["agrees"]]
        differences += len(bad)
        report.append({"project": str(project.path), "entries": len(project.entries),
                       "values_checked": len(checked), "disagreements": bad})
    if args.json:
        print_json({"ok": differences == 0, "projects": report,
                    "recomputed": not (args.no_recompute or engine_missing)})
    else:
        for item in report:
            status = "ok" if not item["disagreements"] else f"{len(item['disagreements'])} disagreement(s)"
            print(f"{item['project']}: valid, {item['entries']} entries, "
                  f"{item['values_checked']} values recomputed: {status}")
            for bad in item["disagreements"]:
                print(f"  entry {bad['entry']} at tau={bad['tau']}: differs by {bad['difference']}")
        if engine_missing:
            print("values not recomputed: the evaluator is not available in this build")
    return 1 if differences else 0
