"""The deck a round is dealt from (``[deck]``): its fields, and how many of each card or item it holds.

The fields are the file's own (copies, ranks, suits, remove, values, ace; or the items and their
counts); the table of counts is the reader's ``Deck`` as read from the text, shown, never
computed here. In the table of cards, ``-`` takes one copy of the highlighted card out (one more
entry in ``remove``) and ``+`` puts one back; in the table of items, ``a`` adds a label and ``d``
deletes one. A game with no deck offers one: ``c`` a deck of cards, ``i`` a deck of items.
"""

from __future__ import annotations

from textual import on
from textual.app import ComposeResult
from textual.binding import Binding
from textual.containers import Vertical
from textual.coordinate import Coordinate
from textual.widgets import DataTable, Input, Static

from oddsbench.model.deck import Deck
from oddsbench.model.document import RulesetDocument
from oddsbench.model.document_deck import DECK_FIELDS, DeckDocument
from oddsbench.model.errors import Problem
from oddsbench.model.places import place_of
from oddsbench.tui.plain import plain
from oddsbench.tui.widgets.edits import EditRequested
from oddsbench.tui.widgets.fields import Field, FieldRow

DECK_HINTS = {  # placeholders: what an empty field means, or an example
    "copies": "1; 6: a six-deck shoe",
    "ranks": "empty: 2 ... 10 J Q K A",
    "suits": "empty: 4 usual suits",
    "remove": "10, A of spades",
    "values": "A = 1, K = 10",
    "ace": "high, low or both",
}
ITEM_FIELDS = ("copies", "values")  # a deck of items has these too: its labels and counts are in the table
PREFIX = "deck-"  # field ids of this editor (``deck-copies``), apart from the outcome fields


class CardCounts(DataTable):
    """How many of each card (rank by suit) or each item the deck holds, as the reader read it."""

    BINDINGS = [
        Binding("minus", "take_out", "Take one out"),
        Binding("plus,equals_sign", "put_back", "Put one back"),
        Binding("a", "add_item", "Add item"),
        Binding("d,delete", "delete_item", "Delete item"),
    ]

    def check_action(self, action: str, parameters: tuple[object, ...]) -> bool | None:
        """Cards are taken out and put back; items are added and deleted: each table shows its own keys."""
        items = bool(self.query_ancestor(DeckEditor).items)
        if action in ("take_out", "put_back"):
            return not items
        if action in ("add_item", "delete_item"):
            return items
        return True

    def action_take_out(self) -> None:
        self.query_ancestor(DeckEditor).change_card(remove=True)

    def action_put_back(self) -> None:
        self.query_ancestor(DeckEditor).change_card(remove=False)

    def action_add_item(self) -> None:
        self.query_ancestor(DeckEditor).add_item()

    def action_delete_item(self) -> None:
        self.query_ancestor(DeckEditor).delete_item()


class DeckEditor(Vertical):
    """Edit ``[deck]``; each problem of ``oddsbench check`` beside its field."""

    BINDINGS = [
        Binding("c", "add_deck(False)", "Add a deck of cards", show=False),
        Binding("i", "add_deck(True)", "Add a deck of items", show=False),
    ]
    can_focus = True

    def __init__(self, **kwargs) -> None:
        super().__init__(**kwargs)
        self.document: RulesetDocument | None = None
        self.deck: Deck | None = None
        self.values: dict[str, str] = {}
        self.items: list[tuple[str, str]] = []
        self.layout_key: tuple = ()
        self.item_label: str | None = None  # the item whose count the field edits
        self.problems: list[Problem] = []

    def compose(self) -> ComposeResult:
        yield Static("Deck: what the round is dealt from, without putting anything back", classes="editor-heading")
        yield Static("", id="deck-summary")
        yield Static("", id="deck-message", classes="field-message")
        with Vertical(id="deck-card-form"):
            for field in DECK_FIELDS:
                yield FieldRow(PREFIX + field, field, DECK_HINTS[field])
        yield CardCounts(cursor_type="cell", id="deck-counts")
        yield FieldRow(PREFIX + "item", "count", "of the highlighted item")
        yield Static("", id="deck-keys", classes="field-message")

    # ----- showing -----

    def show(self, document: RulesetDocument, deck: Deck | None, problems: tuple[Problem, ...]) -> None:
        """Reload from the document and from the reader's deck (None while the file has errors)."""
        self.document = document
        self.deck = deck
        edits = DeckDocument(document)
        has_deck, items = edits.has_deck(), edits.is_items()
        self.values = edits.fields() if has_deck else {}
        self.items = edits.items() if items else []
        mine = self.problems = [p for p in problems if place_of(p).section == "deck"]
        self.query_one("#deck-card-form").display = has_deck
        self.query_one(CardCounts).display = has_deck
        self.query_one(CardCounts).refresh_bindings()
        self._item_row().display = items
        self.can_focus = not has_deck  # the keys c and i need the focus while there is nothing else to edit
        summary = self.query_one("#deck-summary", Static)
        if not has_deck:
            summary.update("This round is not dealt from a deck. Press c to add a deck of 52 cards, i a deck of items.")
        elif deck is None:
            summary.update("The counts show once the ruleset reads without errors.")
        else:
            summary.update(plain(f"{deck.describe()}: the table shows how many of each are in it"))
        for row in self.query("#deck-card-form FieldRow").results(FieldRow):
            field = row.field[len(PREFIX) :]
            row.display = not items or field in ITEM_FIELDS
            row.input.show(self.values.get(field, ""))
            row.show_problems([p for p in mine if place_of(p).field == field])
        beside = (*ITEM_FIELDS, "items") if items else DECK_FIELDS  # problems of these show beside their field
        general = [p for p in mine if place_of(p).field not in beside]
        message = self.query_one("#deck-message", Static)
        message.update(plain("\n".join(str(p) for p in general)))
        message.set_class(any(p.is_error for p in general), "-error")
        self._fill_counts(deck if has_deck else None, items)
        self._load_item(mine)
        keys = self.query_one("#deck-keys", Static)
        if not has_deck:
            keys.update("")
        elif items:
            keys.update("In the table: a adds an item, d deletes one; Enter edits the count.")
        else:
            keys.update("In the table: - takes one of the highlighted card out, + puts one back.")

    def _item_row(self) -> FieldRow:
        return next(row for row in self.query(FieldRow).results(FieldRow) if row.field == PREFIX + "item")

    def _fill_counts(self, deck: Deck | None, items: bool) -> None:
        table = self.query_one(CardCounts)
        cursor = table.cursor_coordinate
        key = (True,) if items else (deck.ranks if deck else (), deck.suits if deck else ())
        if key != self.layout_key:
            table.clear(columns=True)
            self.layout_key = key
            cursor = Coordinate(0, 0 if items else 1)  # a new deck: the first count, not the rank's name
            if items:
                table.add_columns("item", "count", "in the deck")
            elif deck is not None:
                table.add_columns("rank", *deck.suits, "all")
        else:
            table.clear()
        if items:
            read = dict(zip(deck.ranks, (row[0] for row in deck.counts))) if deck is not None else {}
            for label, count in self.items:
                table.add_row(plain(label), plain(count), f"{read[label]:,}" if label in read else "", key=label)
        elif deck is not None:
            for index, (rank, row) in enumerate(zip(deck.ranks, deck.counts)):
                table.add_row(plain(rank), *(f"{count:,}" for count in row), f"{deck.rank_total(index):,}")
        if table.row_count:
            table.cursor_coordinate = table.validate_cursor_coordinate(cursor)

    def _load_item(self, problems: list[Problem]) -> None:
        row = self._item_row()
        if not (row.input.has_focus and self.item_label is not None):
            self.item_label = self.current_item  # while a count is typed, the field keeps to its item
        label = self.item_label
        row.input.disabled = label is None
        row.input.show(dict(self.items).get(label, "") if label else "")
        row.show_problems([p for p in problems if place_of(p).field == "items" and place_of(p).name == label])

    @property
    def current_item(self) -> str | None:
        table = self.query_one(CardCounts)
        if not self.items or not 0 <= table.cursor_row < len(self.items):
            return None
        return self.items[table.cursor_row][0]

    @property
    def current_card(self) -> tuple[str, str] | None:
        """The rank and suit under the cursor in the table of cards (None on the rank or total column)."""
        deck = self.deck
        if deck is None or deck.items:
            return None
        table = self.query_one(CardCounts)
        row, column = table.cursor_coordinate
        if not 0 <= row < len(deck.ranks) or not 1 <= column <= len(deck.suits):
            return None
        return deck.ranks[row], deck.suits[column - 1]

    # ----- editing -----

    @on(DataTable.CellHighlighted, "#deck-counts")
    def _moved(self, event: DataTable.CellHighlighted) -> None:
        event.stop()
        if self.items and self.document is not None:
            self._load_item(self.problems)

    @on(DataTable.CellSelected, "#deck-counts")
    def _chosen(self, event: DataTable.CellSelected) -> None:
        event.stop()
        if self.items:
            self._item_row().input.focus()

    @on(Input.Changed)
    def _changed(self, event: Input.Changed) -> None:
        event.stop()
        if not isinstance(event.input, Field) or not event.input.field.startswith(PREFIX):
            return
        field, value = event.input.field[len(PREFIX) :], event.input.value
        if field == "item":
            label = self.item_label
            if label is None or dict(self.items).get(label) == value:
                return
            self.post_message(
                EditRequested(
                    lambda doc: DeckDocument(doc).set_item(label, value), f"[deck] item {label}", f"deck:item:{label}"
                )
            )
            return
        if self.values.get(field, "") == value:
            return
        self.values[field] = value
        self.post_message(
            EditRequested(lambda doc: DeckDocument(doc).set_field(field, value), f"[deck] {field}", f"deck:{field}")
        )

    @on(Input.Submitted)
    def _submitted(self, event: Input.Submitted) -> None:
        event.stop()
        self.screen.focus_next()

    def change_card(self, remove: bool) -> None:
        card = self.current_card
        if card is None:
            self.notify("Highlight a card (a rank under a suit) first.", severity="warning")
            return
        rank, suit = card
        if remove:
            self.post_message(
                EditRequested(lambda doc: DeckDocument(doc).remove_card(rank, suit), f"remove {rank} of {suit}")
            )
        else:
            self.post_message(
                EditRequested(lambda doc: DeckDocument(doc).return_card(rank, suit), f"return {rank} of {suit}")
            )

    def add_item(self) -> None:
        if not self.items:
            return
        from oddsbench.tui.screens.dialogs import AskName

        taken = {label for label, _ in self.items}

        def check(new: str) -> str | None:
            return f"the deck already has an item {new!r}" if new in taken else None

        def added(new: str | None) -> None:
            if new:
                self.post_message(EditRequested(lambda doc: DeckDocument(doc).add_item(new, "1"), f"new item {new}"))

        self.app.push_screen(AskName("Label of the new item (letters, digits and _)", check=check), added)

    def delete_item(self) -> None:
        label = self.current_item
        if label is not None:
            self.post_message(EditRequested(lambda doc: DeckDocument(doc).delete_item(label), f"delete item {label}"))

    def action_add_deck(self, items: bool) -> None:
        if self.document is not None and not DeckDocument(self.document).has_deck():
            kind = "items" if items else "cards"
            self.post_message(EditRequested(lambda doc: DeckDocument(doc).add_deck(items), f"new deck of {kind}"))
