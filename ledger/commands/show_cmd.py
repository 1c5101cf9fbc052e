"""``alpha-ledger show PROJECT [--json]``: list a project's backgrounds and entries."""

from __future__ import annotations

from ledger.book import Project
from ledger.book.sector_records import sector_records_of
from ledger.commands.common import print_json


def register(subparsers) -> None:
    parser = subparsers.add_parser("show", help="list a project's backgrounds and entries",
                                   description="Print the project's title, conventions, "
                                               "backgrounds and one line per entry.")
    parser.add_argument("project")
    parser.add_argument("--json", action="store_true")
    parser.set_defaults(run=run)


def run(args) -> int:
    project = Project.load(args.project)
    if args.json:
        print_json(project.to_dict())
        return 0
    print(project.title)
    print("conventions: " + ", ".join(f"{k}={v}" for k, v in project.conventions.items()))
    for background in project.backgrounds:
        print(f"background {background.id}: {background.name}")
        for entry in project.entries:
            if entry.background != background.id:
                continue
            print(f"  {entry.id}  genus {entry.genus}  {entry.operator:<9} {entry.structure:<14} "
                  f"alpha'^{entry.alpha_order}  {entry.coefficient}  [{entry.status}; "
                  f"{entry.provenance.describe()}]")
        for record in sector_records_of(background):
            print(f"  sector integrand {record.get('name')} = {record.get('reduced')}"
                  f"  (RN int_F = {record.get('integral')}; {len(record.get('values', []))} values)")
    return 0
