"""``alpha-ledger export PROJECT (--latex | --markdown | --csv) [-o FILE] [--select K=V ...]``.

The table is built completely before anything is written; an existing FILE is
not overwritten without --force, and the project file itself never is.
"""

from __future__ import annotations

import sys
from pathlib import Path

from ledger.book import Project, atomic_write
from ledger.commands.common import print_json
from ledger.errors import LedgerError
from ledger.export import export_text, parse_selection


def register(subparsers) -> None:
    parser = subparsers.add_parser(
        "export", help="write a LaTeX, Markdown or CSV table of a project's entries",
        description="Write a table (operator, genus, alpha' order, coefficient, Laurent polynomial, "
                    "integrated value, source) of the selected entries. LaTeX output is a complete "
                    "document that compiles with pdflatex.")
    parser.add_argument("project", metavar="PROJECT")
    fmt = parser.add_mutually_exclusive_group(required=True)
    fmt.add_argument("--latex", dest="format", action="store_const", const="latex")
    fmt.add_argument("--markdown", dest="format", action="store_const", const="markdown")
    fmt.add_argument("--csv", dest="format", action="store_const", const="csv")
    parser.add_argument("-o", "--output", metavar="FILE", help="write to FILE instead of stdout")
    parser.add_argument("--force", action="store_true", help="overwrite an existing FILE")
    parser.add_argument("--select", action="append", default=[], metavar="KEY=VALUE[,VALUE]",
                        help="keep entries matching (repeatable, all must hold); keys: id, "
                             "background, genus, operator, structure, status, source (computed|cited)")
    parser.add_argument("--json", action="store_true", help="print one JSON object")
    parser.set_defaults(run=run)


def run(args) -> int:
    project = Project.load(args.project)
    text = export_text(project, args.format, parse_selection(args.select))
    output = Path(args.output) if args.output else None
    if output is not None:
        _check_target(output, Path(args.project), args.force)
        atomic_write(output, text.encode("utf-8"), keep_backup=False)
    if args.json:
        payload = {"format": args.format, "output": str(output) if output else None,
                   "characters": len(text)}
        if output is None:
            payload["text"] = text
        print_json(payload)
    elif output is None:
        sys.stdout.write(text)
    else:
        print(f"wrote {output} ({args.format})")
    return 0


def _check_target(output: Path, project_path: Path, force: bool) -> None:
    if output.exists() and output.resolve() == project_path.resolve():
        raise LedgerError(f"{output}: is the project file itself; not overwritten")
    if output.is_dir():
        raise LedgerError(f"{output}: is a directory")
    if output.exists() and not force:
        raise LedgerError(f"{output}: already exists; not overwritten (use --force)")
