"""``alpha-ledger conventions``: show, list or change a project's declared conventions.

``conventions PROJECT [--json]`` shows the declaration; ``conventions PROJECT
KEY=VALUE ...`` changes the declaration only (stored values are not rescaled,
unless ``--rescale`` is given, which converts every entry exactly);
``conventions --list [--json]`` lists every key, its values and their meaning.
"""

from __future__ import annotations

from ledger.book import CONVENTION_KEYS, Project
from ledger.book.conventions import convention_key, validate_conventions
from ledger.book.transform import convert_project, describe_change
from ledger.commands.common import parse_assignments, print_json
from ledger.errors import LedgerError


def register(subparsers) -> None:
    parser = subparsers.add_parser(
        "conventions", help="show, list or change a project's conventions",
        description="Show a project's declared conventions, change them (KEY=VALUE; the stored "
                    "values are NOT rescaled unless --rescale), or --list every key and value.")
    parser.add_argument("project", nargs="?", metavar="PROJECT")
    parser.add_argument("assignments", nargs="*", metavar="KEY=VALUE",
                        help="new declarations, e.g. mandelstam=alpha'/2")
    parser.add_argument("--list", action="store_true", help="list every key and its allowed values")
    parser.add_argument("--rescale", action="store_true",
                        help="also convert every stored coefficient and number to the new conventions")
    parser.add_argument("--force", action="store_true",
                        help="save even if the file changed on disk since it was read")
    parser.add_argument("--json", action="store_true", help="print one JSON object")
    parser.set_defaults(run=run)


def catalogue() -> list[dict]:
    """Every key with its default, allowed values and meanings."""
    return [{"key": key.name, "meaning": key.meaning, "default": key.default,
             "values": [{"value": value, "meaning": meaning} for value, meaning in key.values.items()],
             "free_form": key.free_form} for key in CONVENTION_KEYS]


def _print_catalogue() -> None:
    for record in catalogue():
        print(f"{record['key']}: {record['meaning']} (default {record['default']})")
        for value in record["values"]:
            print(f"  {value['value']:<22}{value['meaning']}")
        if record["free_form"]:
            print(f"  {'(other)':<22}{record['free_form']}")


def run(args) -> int:
    if args.list:
        if args.project or args.assignments or args.rescale:
            raise LedgerError("conventions --list takes no project or KEY=VALUE")
        if args.json:
            print_json({"keys": catalogue()})
        else:
            _print_catalogue()
        return 0
    if not args.project:
        raise LedgerError("conventions: give a PROJECT, or --list")
    if args.rescale and not args.assignments:
        raise LedgerError("conventions: --rescale needs KEY=VALUE assignments")
    project = Project.load(args.project)
    if not args.assignments:
        _show(project, args.json)
        return 0
    return _change(project, parse_assignments(args.assignments), args)


def _show(project, as_json: bool) -> None:
    if as_json:
        print_json({"project": str(project.path), "conventions": project.conventions})
        return
    for name, value in project.conventions.items():
        meaning = convention_key(name).values.get(value) or convention_key(name).free_form
        print(f"{name:<20}{value:<22}{meaning}")


def _change(project, changes: dict, args) -> int:
    new = validate_conventions({**project.conventions, **changes})
    steps = [{"key": key, "from": project.conventions[key], "to": new[key],
              "effect": describe_change(key, project.conventions[key], new[key])}
             for key in new if new[key] != project.conventions[key]]
    if steps:
        if args.rescale:
            converted = convert_project(project, new)
            for entry in converted.entries:
                project.record(entry, "rescaled", ", ".join(f"{s['key']} {s['from']} -> {s['to']}"
                                                               for s in steps))
            project.entries = converted.entries
        project.conventions = new
        project.dirty = True
        project.save(force=args.force)
    if args.json:
        print_json({"project": str(project.path), "conventions": project.conventions,
                    "changed": steps, "rescaled": bool(args.rescale and steps)})
        return 0
    if not steps:
        print("no change: the project already declares these conventions")
        return 0
    for step in steps:
        print(f"{step['key']}: {step['from']} -> {step['to']}")
    if args.rescale:
        print(f"rescaled {len(project.entries)} entries: " + "; ".join(s["effect"] for s in steps))
    else:
        print("declaration changed only: stored coefficients, Laurent polynomials, integrals and "
              "values were NOT rescaled (use --rescale to convert them)")
    return 0
