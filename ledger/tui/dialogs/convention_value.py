"""Change one declared convention: a choice among its allowed values, or a rational."""

from __future__ import annotations

from textual.widgets import Input, OptionList, Static
from textual.widgets.option_list import Option

from ledger.book.conventions import check_value
from ledger.errors import LedgerError
from ledger.tui.dialogs.base import Dialog


class ConventionDialog(Dialog):
    """Returns the new value of ``key`` (a ConventionKey), or None."""

    def __init__(self, key, current: str) -> None:
        super().__init__(f"Convention: {key.name}")
        self.key = key
        self.current = current

    def body(self):
        yield Static(f"{self.key.meaning} (engine default: {self.key.default})",
                     classes="dialog-text", markup=False)
        if self.key.values:
            options = [Option(f"{value}  —  {meaning}" + ("  (current)" if value == self.current else ""),
                              id=value)
                       for value, meaning in self.key.values.items()]
            yield OptionList(*options, id="values")
        else:
            yield Input(self.current, id="value", placeholder="a non-zero rational, e.g. 1/2")

    def on_mount(self) -> None:
        if self.key.values:
            options = self.query_one("#values", OptionList)
            options.highlighted = list(self.key.values).index(self.current) \
                if self.current in self.key.values else 0
            options.focus()
        else:
            self.query_one("#value").focus()

    def answer(self):
        if self.key.values:
            options = self.query_one("#values", OptionList)
            value = options.get_option_at_index(options.highlighted or 0).id
        else:
            value = self.query_one("#value", Input).value.strip()
        try:
            check_value(self.key.name, value)
        except LedgerError as error:
            raise ValueError(str(error)) from None
        return value

    def on_option_list_option_selected(self, event: OptionList.OptionSelected) -> None:
        event.stop()
        self.action_ok()

    def on_input_submitted(self, event: Input.Submitted) -> None:
        event.stop()
        self.action_ok()
