"""Markdown and CSV tables of a project's entries.

Markdown uses the unicode printer (E₂, ζ(3)) and escapes the characters that
Markdown would read as markup; CSV keeps the plain-text expression syntax (which
re-parses) and one column per field, so a spreadsheet or script can use it.

>>> escape_markdown("a|b *c* <x>")
'a\\\\|b \\\\*c\\\\* \\\\<x\\\\>'
"""

from __future__ import annotations

import csv
import io

from ledger.export.rows import Row, laurent_line
from ledger.expr import to_text, to_unicode

_MARKDOWN_SPECIAL = set("\\`*_[]<>|#")
_SUPERSCRIPT = str.maketrans("0123456789-", "⁰¹²³⁴⁵⁶⁷⁸⁹⁻")


def escape_markdown(text: str) -> str:
    """Text safe inside a Markdown table cell (one line, markup characters escaped)."""
    flat = " ".join(str(text).split())
    return "".join("\\" + c if c in _MARKDOWN_SPECIAL else c for c in flat)


def _unicode_laurent(row: Row, variable: str) -> str:
    if row.laurent is None:
        return "—"
    symbol = "y" if variable == "pi*tau2" else "τ₂"
    return laurent_line(row.laurent, symbol, to_unicode, " ", lambda k: str(k).translate(_SUPERSCRIPT))


def _unicode_number(value) -> str:
    if value is None:
        return "—"
    return f"{value}…" if isinstance(value, str) else to_unicode(value)


def render_markdown(project, rows: list[Row]) -> str:
    variable = project.conventions["laurent_variable"]
    lines = [f"# {escape_markdown(project.title)}", ""]
    if project.description:
        lines += [escape_markdown(project.description), ""]
    lines.append("Conventions: " + "; ".join(f"{k} = `{v}`" for k, v in project.conventions.items())
                 + ". Each coefficient multiplies σ₂ᵖσ₃ᵠ/(p! q!); — means not computed.")
    lines += ["", "| Background | Operator | Genus | α′ order | Coefficient | Laurent polynomial | "
                  "Integrated value | Source |",
              "|---|---|---|---|---|---|---|---|"]
    for row in rows:
        entry = row.entry
        integral = _unicode_number(row.integral)
        if row.log_coefficient is not None:
            integral += f"; log L: {_unicode_number(row.log_coefficient)}"
        cells = [entry.background, f"{entry.operator} ({entry.structure})", str(entry.genus),
                 str(entry.alpha_order), to_unicode(row.coefficient), _unicode_laurent(row, variable),
                 integral, f"{entry.id}: {row.source}"]
        lines.append("| " + " | ".join(escape_markdown(c) for c in cells) + " |")
    notes = [row.entry for row in rows if row.entry.notes]
    if notes:
        lines += ["", "Notes:", ""] + [f"- {e.id}: {escape_markdown(e.notes)}" for e in notes]
    return "\n".join(lines) + "\n"


CSV_COLUMNS = ("id", "background", "genus", "operator", "structure", "alpha_order", "coefficient",
               "laurent_variable", "laurent", "integral", "integral_log_coefficient", "source_kind",
               "source", "status", "notes")


def render_csv(project, rows: list[Row]) -> str:
    variable = project.conventions["laurent_variable"]
    symbol = "y" if variable == "pi*tau2" else "tau2"
    buffer = io.StringIO()
    writer = csv.writer(buffer, lineterminator="\n")
    writer.writerow(CSV_COLUMNS)
    for row in rows:
        entry = row.entry
        laurent = "" if row.laurent is None else laurent_line(
            row.laurent, symbol, to_text, "*", lambda k: f"^{k}" if k >= 0 else f"^({k})")
        writer.writerow([
            entry.id, entry.background, entry.genus, entry.operator, entry.structure,
            entry.alpha_order, to_text(row.coefficient), symbol if row.laurent is not None else "",
            laurent, _plain(row.integral), _plain(row.log_coefficient),
            "cited" if entry.provenance.kind == "reference" else "computed", entry.provenance.describe(),
            entry.status, " ".join(entry.notes.split()),
        ])
    return buffer.getvalue()


def _plain(value) -> str:
    if value is None:
        return ""
    return value if isinstance(value, str) else to_text(value)
