"""Where a computed expression goes: background, genus, operator, sigma structure, source."""

from __future__ import annotations

from textual.containers import Horizontal
from textual.widgets import Input, Label, Select, Static

from ledger.amplitudes.operators import Operator, format_structure, structures_of_weight
from ledger.book import Background, Provenance
from ledger.errors import LedgerError
from ledger.tui.dialogs.base import Dialog
from ledger.tui.display import (
    alpha_unicode, coefficient_unicode, genus_label, operator_unicode, structure_unicode,
)

MAX_WEIGHT = 10
WEIGHTS = [w for w in range(MAX_WEIGHT + 1) if w != 1]


def catalogue_backgrounds() -> dict:
    from ledger.amplitudes.backgrounds import known_backgrounds

    return known_backgrounds()


class RecordDialog(Dialog):
    """Returns {"background": Background, "new_background": bool, "genus", "operator",
    "structure", "provenance": Provenance, "notes"} or None."""

    def __init__(self, project, coefficient_text: str, weight: int = 0, genus: int = 1,
                 carried: list[str] = ()) -> None:
        super().__init__("Record as a new entry")
        self.project = project
        self.coefficient_text = coefficient_text
        self.carried = list(carried)
        self.weight = weight if weight in WEIGHTS else 0
        self.genus = genus

    def _background_options(self):
        options = [(f"{b.id}: {b.name}", b.id) for b in self.project.backgrounds]
        for ident, b in catalogue_backgrounds().items():
            if self.project.background(ident) is None:
                options.append((f"{ident}: {b.name} (adds it to the project)", ident))
        return options

    def body(self):
        backgrounds = self._background_options()
        operators = [(f"{operator_unicode(Operator(w).label)}  {alpha_unicode(3 + w)}", w) for w in WEIGHTS]
        names = {"values": "its value", "laurent": "its Laurent polynomial", "integral": "its integral"}
        extra = " with " + ", ".join(names[c] for c in self.carried) if self.carried else ""
        yield Static(f"{coefficient_unicode(self.coefficient_text)}{extra}; operator and level "
                     "guessed from the transcendental weight.", classes="dialog-text", markup=False)
        with Horizontal(classes="field"):
            yield Label("Background", classes="field-label")
            yield Select(backgrounds, id="background", allow_blank=False, compact=True,
                         value=backgrounds[0][1] if backgrounds else Select.BLANK)
        with Horizontal(classes="field"):
            yield Label("Genus", classes="field-label")
            yield Select([(genus_label(g), g) for g in (0, 1, 2)], id="genus", allow_blank=False,
                         value=self.genus, compact=True)
        with Horizontal(classes="field"):
            yield Label("Operator", classes="field-label")
            yield Select(operators, id="operator", allow_blank=False, value=self.weight, compact=True)
        with Horizontal(classes="field"):
            yield Label("σ structure", classes="field-label")
            yield Select(self._structures(self.weight), id="structure", allow_blank=False,
                         compact=True)
        with Horizontal(classes="field"):
            yield Label("Source", classes="field-label")
            yield Input(id="source", compact=True,
                        placeholder="arXiv:eq, e.g. 1502.06698:(2.11); empty = computed")
        with Horizontal(classes="field"):
            yield Label("Notes", classes="field-label")
            yield Input(id="notes", compact=True, placeholder="free text")

    @staticmethod
    def _structures(weight: int):
        return [(structure_unicode(format_structure(s)), format_structure(s))
                for s in structures_of_weight(weight)]

    def on_select_changed(self, event: Select.Changed) -> None:
        if event.select.id == "operator" and event.value != Select.BLANK:
            structure = self.query_one("#structure", Select)
            structure.set_options(self._structures(int(event.value)))

    def on_input_submitted(self, event: Input.Submitted) -> None:
        event.stop()
        self.action_ok()

    def answer(self):
        background_id = self.query_one("#background", Select).value
        if background_id == Select.BLANK:
            raise ValueError("choose a background")
        background = self.project.background(background_id)
        new_background = background is None
        if new_background:
            b = catalogue_backgrounds()[background_id]
            background = Background(b.id, b.name, b.theory, b.dimension, b.compactification)
        weight = int(self.query_one("#operator", Select).value)
        structure = self.query_one("#structure", Select).value
        source = self.query_one("#source", Input).value.strip()
        if source:
            arxiv, _, equation = source.partition(":")
            try:
                provenance = Provenance.from_dict(
                    {"kind": "reference", "arxiv": arxiv.strip(), "equation": equation.strip()},
                    "new entry")
            except LedgerError as error:
                raise ValueError(str(error)) from None
        else:
            from ledger import ENGINE_VERSION

            provenance = Provenance("computed", ENGINE_VERSION)
        return {"background": background, "new_background": new_background,
                "genus": int(self.query_one("#genus", Select).value),
                "operator": Operator(weight).label, "structure": structure,
                "provenance": provenance, "notes": self.query_one("#notes", Input).value.strip()}
