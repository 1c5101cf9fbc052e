"""The overview's table of entries: one row per entry, sortable by any column."""

from __future__ import annotations

import math

from textual.widgets import DataTable

from ledger.tui.display import (
    coefficient_unicode, integral_short, operator_with_structure,
)

MIN_COEFFICIENT_WIDTH = 16
OTHER_COLUMNS_WIDTH = 32  # operator, genus and status with their padding, the border
COLUMNS = (("operator", "Operator"), ("genus", "g"), ("coefficient", "Coefficient"),
           ("status", "Status"), ("integral", "∫F renorm."), ("source", "Source"), ("id", "Id"))
SORTABLE = tuple(key for key, _ in COLUMNS)


def _integral_number(entry) -> float:
    try:
        return float(entry.derived.get("integral", {}).get("value", "nan"))
    except (TypeError, ValueError):
        return math.nan


def sort_key(column: str, backgrounds: dict):
    """The sort key of a column; 'operator' groups by background (in ``backgrounds`` order)
    and genus, then sorts by alpha' order and sigma_3 power."""
    keys = {
        "id": lambda e: e.id,
        "operator": lambda e: (backgrounds.get(e.background, 0), e.genus, e.alpha_order,
                               e.exponents[1], e.id),
        "genus": lambda e: (e.genus, e.alpha_order, e.id),
        "coefficient": lambda e: (e.coefficient, e.id),
        "status": lambda e: (e.status, e.alpha_order, e.id),
        "integral": lambda e: (math.isnan(_integral_number(e)), _integral_number(e)
                               if not math.isnan(_integral_number(e)) else 0.0, e.id),
        "source": lambda e: (e.provenance.describe(), e.id),
    }
    return keys[column]


def operator_label(entry) -> str:
    return operator_with_structure(entry.operator, entry.structure)


def shorten(text: str, width: int) -> str:
    return text if len(text) <= width else text[: width - 1] + "…"


class EntriesTable(DataTable):
    """Rows keyed by entry id; ``show`` refills it from a list of entries."""

    _shown = None

    def on_mount(self) -> None:
        self.cursor_type = "row"
        self.zebra_stripes = True
        for key, label in COLUMNS:
            self.add_column(label, key=key)

    def on_resize(self, event) -> None:
        if self._shown is not None:
            self.show(*self._shown)

    def show(self, entries, column: str = "operator", reverse: bool = False,
             backgrounds: tuple = ()) -> None:
        """Fill the table; ``backgrounds`` gives the order of background ids."""
        self._shown = (entries, column, reverse, backgrounds)
        rank = {ident: index for index, ident in enumerate(backgrounds)}
        keep = self.selected_id()
        self.clear()
        width = max(MIN_COEFFICIENT_WIDTH, self.size.width - OTHER_COLUMNS_WIDTH)
        for entry in sorted(entries, key=sort_key(column, rank), reverse=reverse):
            self.add_row(
                operator_label(entry),
                str(entry.genus),
                shorten(coefficient_unicode(entry.coefficient), width),
                entry.status,
                integral_short(entry.derived.get("integral", {})),
                entry.provenance.describe(),
                entry.id,
                key=entry.id,
            )
        if keep is not None and keep in self.rows:
            self.move_cursor(row=self.get_row_index(keep))

    def selected_id(self) -> str | None:
        if not self.row_count:
            return None
        try:
            return self.coordinate_to_cell_key(self.cursor_coordinate).row_key.value
        except Exception:  # noqa: BLE001 - an empty or refreshing table has no selection
            return None
