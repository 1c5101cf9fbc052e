"""The key bar at the bottom of every screen: all active keys, wrapped over lines.

Textual's footer is one line and would cut keys off at 80 columns; this bar
wraps instead, so every key of the screen is on screen.  Clicking a key
presses it.  Disabled keys are shown in parentheses (not only dimmed).
"""

from __future__ import annotations

from dataclasses import dataclass

from rich.text import Text
from textual import events
from textual.widget import Widget


@dataclass(frozen=True)
class _Item:
    key: str
    display: str
    label: str
    enabled: bool

    @property
    def text(self) -> str:
        body = f"{self.display} {self.label}"
        return body if self.enabled else f"({body})"


class KeyBar(Widget):
    """Every shown binding of the active screen, wrapped to the width."""

    def __init__(self, **kwargs):
        super().__init__(**kwargs)
        self._hitboxes: list[tuple[int, int, int, str]] = []

    def on_mount(self) -> None:
        self.screen.bindings_updated_signal.subscribe(self, self._bindings_changed)

    def _bindings_changed(self, screen) -> None:
        self.refresh(layout=True)

    def items(self) -> list[_Item]:
        """Shown bindings from the focused widget up to the app.

        Unlike ``screen.active_bindings``, a key taken by a hidden widget binding
        (enter in a table) does not hide the screen's binding of that key.
        """
        local, global_ = [], []
        taken, seen = set(), set()
        for namespace, bindings in self.screen._modal_binding_chain:
            for key, binding in bindings:
                if not binding.show or not binding.description or key in taken:
                    continue
                state = self.app._check_action_state(binding.action, namespace)
                if state is False or (binding.action, binding.description) in seen:
                    continue
                taken.add(key)
                seen.add((binding.action, binding.description))
                item = _Item(key, self.app.get_key_display(binding), binding.description, bool(state))
                (global_ if namespace is self.app else local).append(item)
        return local + global_

    def _layout_lines(self, width: int) -> list[list[_Item]]:
        lines: list[list[_Item]] = [[]]
        used = 0
        for item in self.items():
            size = len(item.text) + 2
            if lines[-1] and used + size > width:
                lines.append([])
                used = 0
            lines[-1].append(item)
            used += size
        return lines

    def get_content_height(self, container, viewport, width: int) -> int:
        return max(1, len(self._layout_lines(width)))

    def render(self) -> Text:
        text = Text(no_wrap=True, overflow="crop")
        self._hitboxes = []
        key_style = self.get_component_rich_style("key-bar--key")
        for row, line in enumerate(self._layout_lines(self.size.width)):
            if row:
                text.append("\n")
            column = 0
            for item in line:
                start = column
                if item.enabled:
                    text.append(f" {item.display} ", style=key_style)
                    text.append(f"{item.label} ")
                else:
                    text.append(f" {item.text} ", style="dim")
                column += len(item.text) + 2
                self._hitboxes.append((row, start, column, item.key))
        return text

    COMPONENT_CLASSES = {"key-bar--key"}

    def on_click(self, event: events.Click) -> None:
        for row, start, stop, key in self._hitboxes:
            if event.y == row and start <= event.x < stop:
                event.stop()
                self.app.simulate_key(key)
                return
