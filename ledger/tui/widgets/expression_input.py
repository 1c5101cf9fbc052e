"""An expression field that parses as you type: the result in screen math, or the
column of the first error marked under the text."""

from __future__ import annotations

from textual.containers import Vertical
from textual.message import Message
from textual.widgets import Input, Static

from ledger.errors import ExpressionError, LedgerError
from ledger.tui.display import coefficient_unicode



class ExpressionInput(Vertical):
    """``text`` is the typed expression; ``valid`` whether it parses."""

    class Checked(Message):
        def __init__(self, valid: bool) -> None:
            super().__init__()
            self.valid = valid

    def __init__(self, text: str = "", **kwargs) -> None:
        super().__init__(**kwargs)
        self._initial_text = text
        self.valid = False

    def compose(self):
        yield Input(self._initial_text, compact=True, classes="expression-field",
                    placeholder="e.g. C(1,1,1) - E(3) + zeta(3)/3")
        yield Static("", classes="expression-feedback", markup=False)

    def on_mount(self) -> None:
        self._check(self._initial_text)

    @property
    def text(self) -> str:
        return self.query_one(Input).value

    @text.setter
    def text(self, value: str) -> None:
        self.query_one(Input).value = value

    def focus(self, scroll_visible: bool = True):
        self.query_one(Input).focus(scroll_visible)
        return self

    def on_input_changed(self, event: Input.Changed) -> None:
        event.stop()
        self._check(event.value)

    def _check(self, text: str) -> None:
        feedback = self.query_one(".expression-feedback", Static)
        if not text.strip():
            self.valid = False
            feedback.update("E(3), C(2,1,1), graph(0-1,1-2,2-0:2), zeta(3), 2/5 with + - * / ^")
            self.set_class(False, "-invalid")
        else:
            from ledger.expr import parse

            try:
                parse(text)
            except ExpressionError as error:
                self.valid = False
                column = error.column or len(text) + 1
                shift = self.query_one(Input).styles.padding.left
                feedback.update(" " * (shift + column - 1) + f"↑ column {column}: {error.reason}")
            except LedgerError as error:
                self.valid = False
                feedback.update(f"✗ {error}")
            else:
                self.valid = True
                feedback.update("= " + coefficient_unicode(text))
            self.set_class(not self.valid, "-invalid")
        self.post_message(self.Checked(self.valid))
