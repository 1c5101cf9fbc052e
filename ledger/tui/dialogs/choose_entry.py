"""Pick one entry of the project (to attach results to it)."""

from __future__ import annotations

from textual.widgets import OptionList
from textual.widgets.option_list import Option

from ledger.tui.dialogs.base import Dialog
from ledger.tui.display import coefficient_unicode, genus_label, operator_unicode, structure_unicode


def entry_line(entry) -> str:
    return (f"{entry.id}  {operator_unicode(entry.operator)} {structure_unicode(entry.structure)}"
            f"  {genus_label(entry.genus)}  {entry.background}  {coefficient_unicode(entry.coefficient)}")


class ChooseEntryDialog(Dialog):
    """Returns the chosen entry id, or None."""

    def __init__(self, title: str, entries, preselect: str | None = None) -> None:
        super().__init__(title)
        self.entries = list(entries)
        self.preselect = preselect

    def body(self):
        yield OptionList(*[Option(entry_line(e), id=e.id) for e in self.entries], id="entries")

    def on_mount(self) -> None:
        options = self.query_one("#entries", OptionList)
        options.focus()
        if self.preselect:
            try:
                options.highlighted = options.get_option_index(self.preselect)
            except Exception:  # noqa: BLE001 - an unknown id simply leaves the first highlighted
                pass
        elif self.entries:
            options.highlighted = 0

    def answer(self):
        options = self.query_one("#entries", OptionList)
        if options.highlighted is None:
            raise ValueError("the project has no entries")
        return options.get_option_at_index(options.highlighted).id

    def on_option_list_option_selected(self, event: OptionList.OptionSelected) -> None:
        event.stop()
        self.dismiss(event.option.id)
