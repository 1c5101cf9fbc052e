"""The entry view's body: everything known about one entry, as labelled sections."""

from __future__ import annotations

from rich.table import Table
from rich.text import Text
from textual.widgets import Static

from ledger.tui.display import (
    alpha_unicode, coefficient_unicode, error_text, genus_label, grouped_digits, laurent_unicode,
    operator_unicode, structure_unicode, superscript, sympy_unicode, value_line,
)

LABEL_WIDTH = 13


def laurent_text(derived: dict) -> Text:
    laurent = derived.get("laurent")
    if not laurent:
        return Text("not computed (l computes it)", style="italic")
    kind = "exact" if laurent.get("exact") else f"numerical, {laurent.get('digits', '?')} digits"
    engine = f", engine {laurent['engine']}" if laurent.get("engine") else ""
    variable = {"y": "y = πτ₂", "tau2": "in τ₂"}.get(laurent.get("variable", "y"),
                                                   str(laurent.get("variable")))
    return Text.assemble(laurent_unicode(laurent), (f"\n{variable}; {kind}{engine}", "dim"))


def values_text(derived: dict) -> Text:
    values = derived.get("values") or []
    if not values:
        return Text("none stored (v computes the value at the default τ)", style="italic")
    text = Text()
    for index, record in enumerate(values):
        if index:
            text.append("\n")
        text.append(f"τ = {record.get('tau', '?')}\n", style="bold")
        text.append(value_line(record))
    return text


def integral_text(derived: dict) -> Text:
    integral = derived.get("integral")
    if not integral:
        return Text("not computed (i computes it)", style="italic")
    text = Text()
    if integral.get("exact"):
        text.append(f"exact  {sympy_unicode(integral['exact'])}\n")
    if integral.get("value"):
        error = error_text(integral["error"]) if integral.get("error") else "no error estimate"
        text.append(f"value  {grouped_digits(integral['value'])}  ± {error}\n")
    log = integral.get("log_coefficient") or "0"
    text.append(f"log L  {sympy_unicode(log)} · log L  (the threshold term, kept apart)\n"
                if log not in ("0", "") else "log L  no log L term\n")
    divergent = integral.get("divergent_terms") or []
    if divergent:
        text.append("dropped  " + " + ".join(_power_of_l(t) for t in divergent)
                    + "  (positive powers of the cut-off L)\n")
    text.append(f"∫F dμ with the cut-off τ₂ ≤ L, L → ∞; {integral.get('digits', '?')} digits"
                + (f", engine {integral['engine']}" if integral.get("engine") else ""), style="dim")
    return text


def _power_of_l(term) -> str:
    """A dropped divergent term {"power": n, "coefficient": c} as 'c·Lⁿ'."""
    if not isinstance(term, dict):
        return sympy_unicode(str(term))
    power = int(term.get("power", 1))
    coefficient = sympy_unicode(str(term.get("coefficient", "?")))
    if " " in coefficient:
        coefficient = f"({coefficient})"
    return f"{coefficient}·L{superscript(power) if power != 1 else ''}"


def _history(entry) -> Text:
    if not entry.history:
        return Text("—")
    lines = []
    for item in reversed(entry.history[-8:]):
        detail = f" ({item['detail']})" if item.get("detail") else ""
        lines.append(f"{item.get('at', '?')}  {item.get('event', '?')}{detail}")
    return Text("\n".join(lines))


def entry_table(entry, background) -> Table:
    """The sections of an entry as a two-column rich table."""
    table = Table.grid(padding=(0, 1), expand=True)
    table.add_column(style="bold", width=LABEL_WIDTH, no_wrap=True)
    table.add_column(ratio=1)
    where = background.name if background is not None else entry.background
    table.add_row("Operator", f"{operator_unicode(entry.operator)}  structure "
                  f"{structure_unicode(entry.structure)}  at {alpha_unicode(entry.alpha_order)}")
    table.add_row("Where", f"{genus_label(entry.genus)}, {entry.background} ({where})")
    table.add_row("Status", entry.status)
    table.add_row("Coefficient", Text(coefficient_unicode(entry.coefficient)))
    table.add_row("", Text(f"plain text: {entry.coefficient}", style="dim"))
    if entry.genus == 0 and not entry.derived:
        table.add_row("τ-dependence", "none: at tree level the coefficient is a number "
                      "(no Laurent polynomial, values or integral over F)")
    else:
        if entry.derived.get("computed_from"):
            table.add_row("Reduced", Text(coefficient_unicode(str(entry.derived["computed_from"]))
                                          + "\n(same function by the identity table; the data below "
                                            "are computed from it)", style="dim"))
        table.add_row("Laurent", laurent_text(entry.derived))
        table.add_row("Values", values_text(entry.derived))
        table.add_row("Integral F", integral_text(entry.derived))
    table.add_row("Provenance", entry.provenance.describe())
    table.add_row("Notes", Text(entry.notes or "— (n edits)"))
    table.add_row("History", _history(entry))
    return table


class EntrySheet(Static):
    """Shows one entry; ``show(entry, background)`` redraws it."""

    def show(self, entry, background) -> None:
        self.update(entry_table(entry, background))
