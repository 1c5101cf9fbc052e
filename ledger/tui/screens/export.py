"""Choose entries, a format and a file; preview the table; write it."""

from __future__ import annotations

from pathlib import Path

from rich.text import Text
from textual.containers import Horizontal, ScrollableContainer
from textual.widgets import Input, Label, RadioSet, Static

from ledger.book import atomic_write
from ledger.errors import LedgerError, NotAvailableError
from ledger.tui import engine
from ledger.tui.screens.base import LedgerScreen
from ledger.tui.widgets.entries_table import operator_label
from ledger.tui.widgets.toggles import RadioChoice, TickList


class ExportScreen(LedgerScreen):
    AREA = "export"

    def __init__(self) -> None:
        super().__init__()
        self.format = "latex"
        self.text = ""

    def body(self):
        with Horizontal(id="export-main"):
            yield TickList(*[(f"{e.id} {operator_label(e)} g={e.genus}", e.id, True)
                             for e in self.project.entries], id="export-entries")
            with ScrollableContainer(id="export-preview"):
                yield Static("", id="export-text", markup=False)
        with Horizontal(id="export-options"):
            with RadioSet(id="export-format", compact=True):
                for fmt, (label, _) in engine.EXPORT_FORMATS.items():
                    yield RadioChoice(label, value=fmt == self.format, name=fmt)
            yield Label("to", classes="inline-label")
            yield Input(self._default_path(), id="export-path", compact=True)

    def _default_path(self) -> str:
        stem = Path(self.project.path).stem if self.project.path else "ledger"
        return f"{stem}{engine.EXPORT_FORMATS[self.format][1]}"

    def on_mount(self) -> None:
        self.query_one("#export-entries").border_title = "Entries (space toggles)"
        self.query_one("#export-preview").border_title = "Preview"
        self.query_one("#export-entries").focus()
        self._preview()

    def chosen(self) -> list[str]:
        return list(self.query_one(TickList).selected)

    def _preview(self) -> None:
        preview = self.query_one("#export-text", Static)
        self.query_one("#export-preview").scroll_home(animate=False)
        try:
            self.text = engine.export_text(self.project, self.chosen(), self.format)
        except NotAvailableError as error:
            self.text = ""
            preview.update(f"Not available yet: {error}.")
        except LedgerError as error:
            self.text = ""
            preview.update(f"✗ {error}")
        else:
            preview.update(Text(self.text, no_wrap=True, overflow="ignore"))
            self.call_after_refresh(self._scroll_to_table)
        self.refresh_bindings()

    def _scroll_to_table(self) -> None:
        """Show the table itself rather than the LaTeX preamble."""
        lines = self.text.splitlines()
        first = next((i for i, line in enumerate(lines) if line.startswith(("\\toprule", "|"))), 0)
        self.query_one("#export-preview").scroll_to(x=0, y=max(0, first - 2), animate=False)

    def on_selection_list_selected_changed(self, event) -> None:
        self._preview()

    def on_radio_set_changed(self, event: RadioSet.Changed) -> None:
        old_suffix = engine.EXPORT_FORMATS[self.format][1]
        self.format = event.pressed.name
        path = self.query_one("#export-path", Input)
        if path.value.endswith(old_suffix):
            path.value = path.value[: -len(old_suffix)] + engine.EXPORT_FORMATS[self.format][1]
        self._preview()

    def check_action(self, action: str, parameters) -> bool | None:
        if action == "write":
            return True if self.text else None
        return True

    def action_toggle_all(self) -> None:
        selection = self.query_one(TickList)
        if self.chosen():
            selection.deselect_all()
        else:
            selection.select_all()

    def on_input_submitted(self, event: Input.Submitted) -> None:
        event.stop()
        self.action_write()

    def action_write(self) -> None:
        from ledger.tui.dialogs.choice import ChoiceDialog

        if not self.text:
            return
        target = Path(self.query_one("#export-path", Input).value.strip())
        if not target.name:
            self.notify("type a file name", title="Cannot write", severity="warning")
            return
        if target.exists():
            self.app.push_screen(
                ChoiceDialog("File exists", f"{target} exists. Replace it?",
                             [("keep", "Keep it"), ("replace", "Replace")]),
                lambda answer: answer == "replace" and self._write(target))
        else:
            self._write(target)

    def _write(self, target: Path) -> None:
        try:
            atomic_write(target, self.text.encode("utf-8"), keep_backup=False)
        except LedgerError as error:
            self.app.show_error("Could not write the table", str(error))
            return
        self.notify(f"wrote {len(self.chosen())} entries to {target}", title="Exported")
