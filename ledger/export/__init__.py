"""Tables of a project's entries: LaTeX (booktabs, compiles as is), Markdown and CSV.

Public API::

    export_text(project, fmt, selection=None) -> str     fmt in FORMATS
    parse_selection(["genus=1", "operator=D^4R^4,D^6R^4"]) -> dict
    escape_latex(text) -> str
"""

from __future__ import annotations

from ledger.errors import LedgerError
from ledger.export.latex import escape_latex, render_latex
from ledger.export.plain import render_csv, render_markdown
from ledger.export.rows import build_rows, parse_selection, select_entries

FORMATS = {"latex": render_latex, "markdown": render_markdown, "csv": render_csv}


def export_text(project, fmt: str, selection: dict | None = None) -> str:
    """The whole table in one format, built before anything is written.

    >>> from ledger.book import Project, Background
    >>> p = Project.new("Demo")
    >>> p.add_background(Background("flat-iib", "Type IIB, flat", "IIB", 10, "none"))
    >>> _ = p.add_entry(background="flat-iib", genus=1, operator="D^4R^4", structure="sigma2",
    ...                 coefficient="E(2)")
    >>> export_text(p, "csv").splitlines()[1].split(",")[:7]
    ['e0001', 'flat-iib', '1', 'D^4R^4', 'sigma2', '5', 'E(2)']
    """
    if fmt not in FORMATS:
        raise LedgerError(f"unknown export format {fmt!r}; known: {', '.join(FORMATS)}")
    rows = build_rows(project, select_entries(project, selection or {}))
    return FORMATS[fmt](project, rows)


__all__ = ["FORMATS", "escape_latex", "export_text", "parse_selection"]
