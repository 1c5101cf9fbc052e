"""A small line plot drawn with braille dots (2 x 4 dots per character cell).

Curves are told apart by their stroke, not their colour: a solid line and a
dotted line, named in the legend.  Points that are not finite break the line.

>>> canvas = BrailleCanvas(2, 1)
>>> canvas.line(0, 0, 3, 3)
>>> canvas.rows()
['⠑⢄']
"""

from __future__ import annotations

import math
from dataclasses import dataclass
from typing import Sequence

from rich.text import Text
from textual.widget import Widget

# bit of the dot at (column, row) inside one braille cell
_DOT = {(0, 0): 0x01, (0, 1): 0x02, (0, 2): 0x04, (1, 0): 0x08,
        (1, 1): 0x10, (1, 2): 0x20, (0, 3): 0x40, (1, 3): 0x80}
Y_LABEL_WIDTH = 9


class BrailleCanvas:
    """A grid of ``width`` x ``height`` cells; dots addressed from the top left."""

    def __init__(self, width: int, height: int) -> None:
        self.width, self.height = width, height
        self._cells = [[0] * width for _ in range(height)]

    def dot(self, x: int, y: int) -> None:
        if 0 <= x < 2 * self.width and 0 <= y < 4 * self.height:
            self._cells[y // 4][x // 2] |= _DOT[(x % 2, y % 4)]

    def line(self, x0: int, y0: int, x1: int, y1: int, every: int = 1) -> None:
        """Bresenham's line; ``every`` > 1 draws only every n-th dot (a dotted stroke)."""
        dx, dy = abs(x1 - x0), -abs(y1 - y0)
        sx, sy = (1 if x0 < x1 else -1), (1 if y0 < y1 else -1)
        error, step = dx + dy, 0
        while True:
            if step % every == 0:
                self.dot(x0, y0)
            if x0 == x1 and y0 == y1:
                return
            step += 1
            double = 2 * error
            if double >= dy:
                error += dy
                x0 += sx
            if double <= dx:
                error += dx
                y0 += sy

    def rows(self) -> list[str]:
        return ["".join(chr(0x2800 + bits) for bits in row) for row in self._cells]


@dataclass(frozen=True)
class Series:
    label: str
    xs: Sequence[float]
    ys: Sequence[float]
    dotted: bool = False


def _finite(value) -> bool:
    return value is not None and math.isfinite(value)


def data_range(series: Sequence[Series], axis: str) -> tuple[float, float]:
    values = [v for s in series for v in getattr(s, axis) if _finite(v)]
    if not values:
        return (0.0, 1.0)
    low, high = min(values), max(values)
    if high == low:
        return (low - 1.0, high + 1.0)
    if axis == "ys":
        pad = 0.04 * (high - low)
        return (low - pad, high + pad)
    return (low, high)


def tick(value: float) -> str:
    return f"{value:.3g}" if abs(value) < 1e4 or value == 0 else f"{value:.2e}"


def plot_lines(series: Sequence[Series], width: int, height: int, x_label: str) -> list[str]:
    """The plot as text lines (y ticks, braille area, x axis, x ticks) for width x height cells."""
    plot_width = max(4, width - Y_LABEL_WIDTH - 1)
    plot_height = max(2, height - 2)
    (x_low, x_high), (y_low, y_high) = data_range(series, "xs"), data_range(series, "ys")
    canvas = BrailleCanvas(plot_width, plot_height)

    def to_dot(x: float, y: float) -> tuple[int, int]:
        column = round((x - x_low) / (x_high - x_low) * (2 * plot_width - 1))
        row = round((y_high - y) / (y_high - y_low) * (4 * plot_height - 1))
        return column, row

    for s in series:
        previous = None
        for x, y in zip(s.xs, s.ys):
            if not (_finite(x) and _finite(y)):
                previous = None
                continue
            point = to_dot(x, y)
            if previous is None:
                canvas.dot(*point)
            else:
                canvas.line(*previous, *point, every=3 if s.dotted else 1)
            previous = point
    def row_value(row: int) -> float:  # the y at the middle of a cell row
        return y_high - (4 * row + 1.5) / (4 * plot_height - 1) * (y_high - y_low)

    labels = {row: tick(row_value(row)) for row in (0, (plot_height - 1) // 2, plot_height - 1)}
    lines = [f"{labels.get(i, ''):>{Y_LABEL_WIDTH}}│{row}" for i, row in enumerate(canvas.rows())]
    lines.append(" " * Y_LABEL_WIDTH + "└" + "─" * plot_width)
    left, right = tick(x_low), tick(x_high)
    middle = f"{x_label}"
    gap = plot_width - len(left) - len(right) - len(middle)
    lines.append(" " * (Y_LABEL_WIDTH + 1) + left + " " * max(1, gap // 2) + middle
                 + " " * max(1, gap - gap // 2) + right)
    return lines


class BraillePlot(Widget):
    """Shows ``series`` over the widget's size; ``plot`` replaces them."""

    def __init__(self, **kwargs) -> None:
        super().__init__(**kwargs)
        self.series: list[Series] = []
        self.x_label = "x"
        self.empty_text = "nothing to plot yet"

    def plot(self, series: Sequence[Series], x_label: str) -> None:
        self.series = list(series)
        self.x_label = x_label
        self.refresh()

    def clear(self, empty_text: str) -> None:
        self.series = []
        self.empty_text = empty_text
        self.refresh()

    def render(self) -> Text:
        if not self.series:
            return Text(self.empty_text, style="italic")
        legend = "   ".join(("┈ " if s.dotted else "━ ") + s.label for s in self.series)
        lines = plot_lines(self.series, self.size.width, self.size.height - 1, self.x_label)
        return Text("\n".join([legend] + lines), no_wrap=True, overflow="crop")
