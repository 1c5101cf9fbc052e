"""Ask for a file path, with the project files nearby as suggestions."""

from __future__ import annotations

from pathlib import Path

from textual.suggester import SuggestFromList
from textual.widgets import Input, Static

from ledger.tui.dialogs.base import Dialog


def nearby_projects() -> list[str]:
    """Project files (TOML with a schema_version) here and in projects/, for completion."""
    candidates = sorted(Path(".").glob("*.toml")) + sorted(Path("projects").glob("*.toml"))
    return [str(p) for p in candidates if _looks_like_project(p)]


def _looks_like_project(path: Path) -> bool:
    try:
        with path.open("rb") as stream:
            return b"schema_version" in stream.read(4096)
    except OSError:
        return False


class PathDialog(Dialog):
    """Returns the typed path (text), or None."""

    def __init__(self, title: str, prompt: str, initial: str = "") -> None:
        super().__init__(title)
        self.prompt = prompt
        self.initial = initial

    def body(self):
        yield Static(self.prompt, classes="dialog-text", markup=False)
        suggestions = nearby_projects()
        yield Input(self.initial, id="path", placeholder="path/to/file",
                    suggester=SuggestFromList(suggestions, case_sensitive=True) if suggestions else None)
        if suggestions:
            shown = ", ".join(suggestions[:4]) + (" ..." if len(suggestions) > 4 else "")
            yield Static(f"nearby: {shown} (→ completes)", classes="dialog-hint", markup=False)

    def answer(self):
        text = self.query_one("#path", Input).value.strip()
        if not text:
            raise ValueError("type a file path")
        return text

    def on_input_submitted(self, event: Input.Submitted) -> None:
        event.stop()
        self.action_ok()
