"""A read-only sheet of an orbifold background's sector-summed integrands.

They are kept with the background, not as entries (the map to D^{2w}R^4 is not
derived): the sheet shows each I_s as the sector sum, its reduced form, Laurent
polynomial, renormalised integral and the values stored at the reference points.
"""

from __future__ import annotations

from textual.widgets import Static

from ledger.book.sector_records import sector_records_of
from ledger.tui.display import (coefficient_unicode, error_text, laurent_unicode, short_number,
                                sympy_unicode)


def sector_sheet_text(background) -> str:
    """Rich text for the sheet.

    >>> from ledger.book.model import Background
    >>> b = Background("t4z2-iib", "Type IIB on T^4/Z_2 x R^6", "IIB", 6, "T^4/Z_2",
    ...     {"sector_integrands": [{"name": "I_2", "expr": "8*Etw(2,0,1/2)", "reduced": "-6*E(2)",
    ...       "laurent": [], "integral": "0", "log_coefficient": "0", "values": []}]})
    >>> print(sector_sheet_text(b).splitlines()[3])
    [b]I_2[/b] = −6 E₂
    """
    lines = [f"[b]{background.name}[/b]",
             "I_s = (1/N) Σ over twisted sectors (k,l) of n(k,l) Etw(s, l/N, k/N); "
             "kept with the background: their map to D²ʷR⁴ is not derived.", ""]
    for record in sector_records_of(background):
        laurent = {"variable": "y", "terms": record.get("laurent", [])}
        lines += [f"[b]{record.get('name', '?')}[/b] = {_reduced_unicode(str(record.get('reduced', '?')))}",
                  f"  sectors: {coefficient_unicode(str(record.get('expr', '?')))}",
                  f"  Laurent: {laurent_unicode(laurent)}",
                  f"  ∫F renormalised: {sympy_unicode(str(record.get('integral', '?')))}"
                  f" (log L: {sympy_unicode(str(record.get('log_coefficient', '0')))})"]
        for stored in record.get("values", []):
            if isinstance(stored, dict):
                lines.append(f"  τ = {stored.get('tau', '?')}: {short_number(str(stored.get('value', '?')), 15)}"
                             f" ± {error_text(str(stored.get('error', '?')))}")
        lines.append("")
    return "\n".join(lines)


def _reduced_unicode(text: str) -> str:
    """c E_s in the expression language, or an exact constant such as -16*log(2)."""
    shown = coefficient_unicode(text)
    return sympy_unicode(text) if shown == text else shown


class SectorSheet(Static):
    """Shown in place of the entries table while a 'sector integrands' node is selected."""

    def show_background(self, background) -> None:
        self.update(sector_sheet_text(background))
