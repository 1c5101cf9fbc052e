"""Check boxes and radio buttons whose state shows as a character, not only as a colour."""

from __future__ import annotations

from rich.segment import Segment
from textual.strip import Strip
from textual.widgets import Checkbox, RadioButton, SelectionList


class TickBox(Checkbox):
    """A check box drawn [X] when on and [ ] when off."""

    @property
    def BUTTON_INNER(self) -> str:  # noqa: N802 - textual reads this class-level name
        return "X" if self.value else " "


class RadioChoice(RadioButton):
    """A radio button drawn (●) when chosen and ( ) otherwise."""

    @property
    def BUTTON_INNER(self) -> str:  # noqa: N802
        return "●" if self.value else " "


class TickList(SelectionList):
    """A selection list whose boxes read [X] when chosen and [ ] otherwise."""

    def render_line(self, y: int) -> Strip:
        line = super().render_line(y)
        segments = list(line)
        index = self.scroll_offset.y + y
        if len(segments) < 3 or not 0 <= index < self.option_count:
            return line
        chosen = self.get_option_at_index(index).value in self._selected
        box = segments[1]
        segments[1] = Segment("X" if chosen else " ", box.style, box.control)
        return Strip(segments, line.cell_length)
