"""A state's draw (``draw``): how many cards at random, into which hand, and any named cards taken first.

Shown above a state's outcomes in a game dealt from a deck (and in any state that draws, so a
draw left in a game without a deck can be seen and emptied). Emptying every field removes the
draw; a count alone into the default hand is written ``draw = N``.
"""

from __future__ import annotations

from textual import on
from textual.app import ComposeResult
from textual.containers import Horizontal
from textual.widgets import Input

from oddsbench.model.document import RulesetDocument
from oddsbench.model.document_deck import DEFAULT_HAND, DRAW_FIELDS, DeckDocument
from oddsbench.model.errors import Problem
from oddsbench.model.places import place_of
from oddsbench.tui.widgets.edits import EditRequested
from oddsbench.tui.widgets.fields import Field, FieldRow

DRAW_HINTS = {
    "count": "how many",
    "hand": DEFAULT_HAND,
    "take": "A, 6 of hearts",
}
PREFIX = "draw-"


class DrawEditor(Horizontal):
    """The three fields of one state's draw, each with the reader's problem beside it."""

    def __init__(self, **kwargs) -> None:
        super().__init__(**kwargs)
        self.state: str | None = None
        self.values: dict[str, str] = {}

    def compose(self) -> ComposeResult:
        for field in DRAW_FIELDS:
            yield FieldRow(PREFIX + field, "draw" if field == "count" else field, DRAW_HINTS[field])

    def show(self, document: RulesetDocument, state: str, problems: tuple[Problem, ...]) -> None:
        edits = DeckDocument(document)
        self.state = state
        self.values = edits.draw(state)
        drawing = any(self.values.values())
        self.display = document.state_kind(state) != "end" and (edits.has_deck() or drawing)
        for row in self.query(FieldRow).results(FieldRow):
            field = row.field[len(PREFIX) :]
            row.input.show(self.values[field])
            mine = []
            for problem in problems:
                place = place_of(problem)
                if place.section == "states" and place.state == state and place.outcome is None:
                    if place.field == "draw" and _draw_field(problem) == field:
                        mine.append(problem)
            row.show_problems(mine)

    @on(Input.Changed)
    def _changed(self, event: Input.Changed) -> None:
        event.stop()
        if not isinstance(event.input, Field) or not event.input.field.startswith(PREFIX) or self.state is None:
            return
        field, value, state = event.input.field[len(PREFIX) :], event.input.value, self.state
        if self.values.get(field, "") == value:
            return
        self.values[field] = value
        self.post_message(
            EditRequested(
                lambda doc: DeckDocument(doc).set_draw(state, field, value),
                f"draw {field} in {state}",
                f"{state}:draw:{field}",
            )
        )

    @on(Input.Submitted)
    def _submitted(self, event: Input.Submitted) -> None:
        event.stop()
        self.screen.focus_next()


def _draw_field(problem: Problem) -> str:
    """Which field of a draw a problem is about: ``state 'x', draw, hand`` is the hand; a problem of the
    draw as a whole (``state 'x', draw``) goes beside the count."""
    rest = problem.where.rpartition(", draw")[2]
    named = rest.removeprefix(", ").split(",")[0].strip()
    return named if named in DRAW_FIELDS else "count"
