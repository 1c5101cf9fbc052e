"""``alpha-ledger new PROJECT --title T [--convention KEY=VALUE ...] [--background ID]``."""

from __future__ import annotations

from pathlib import Path

from ledger.book import Project
from ledger.commands.common import parse_assignments, print_json
from ledger.errors import ProjectError


def register(subparsers) -> None:
    parser = subparsers.add_parser(
        "new", help="create a new project file",
        description="Create a new project file with a title, declared conventions and, "
                    "optionally, standard backgrounds.")
    parser.add_argument("project", help="path of the new .toml file (must not exist)")
    parser.add_argument("--title", required=True, help="project title")
    parser.add_argument("--convention", action="append", default=[], metavar="KEY=VALUE",
                        help="declare a convention (repeatable); see 'conventions --list'")
    parser.add_argument("--background", action="append", default=[], metavar="ID",
                        help="add a known background by id, e.g. flat-iib (repeatable)")
    parser.add_argument("--json", action="store_true", help="print one JSON object")
    parser.set_defaults(run=run)


def run(args) -> int:
    path = Path(args.project)
    if path.exists():
        raise ProjectError(f"{path}: already exists; not overwritten")
    project = Project.new(args.title, parse_assignments(args.convention))
    for ident in args.background:
        project.add_background(known_background(ident))
    project.save(path)
    if args.json:
        print_json({"project": str(path), "title": project.title,
                    "conventions": project.conventions,
                    "backgrounds": [b.id for b in project.backgrounds]})
    else:
        print(f"created {path}")
    return 0


def known_background(ident: str):
    """A project background record for a catalogued background id."""
    from ledger.book import Background

    try:
        from ledger.amplitudes.backgrounds import known_backgrounds
    except ImportError:
        known_backgrounds = None
    catalogue = known_backgrounds() if known_backgrounds else {}
    if ident not in catalogue:
        known = ", ".join(sorted(catalogue)) or "none"
        raise ProjectError(f"unknown background {ident!r}; known: {known}")
    b = catalogue[ident]
    return Background(b.id, b.name, b.theory, b.dimension, b.compactification)
