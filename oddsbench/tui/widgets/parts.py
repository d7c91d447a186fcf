"""Rows of small fields for one part of a form: ``each`` and ``index`` ranges (name, from, to),
``let`` values (name, value), the cases of a ``to`` (when, to).

Typing in a cell edits the document at once (``Edited``). The button after the rows adds one
(``Added``); a row whose key cell (the name, or a case's ``to``) is left empty goes (``Removed``).
Widgets are rebuilt only when the number of rows changes, so a refresh never takes the cell the
user is typing in.
"""

from __future__ import annotations

from textual import on
from textual.app import ComposeResult
from textual.containers import Horizontal, Vertical
from textual.events import DescendantBlur
from textual.message import Message
from textual.widgets import Button, Input, Label, Static

from oddsbench.model.errors import Problem
from oddsbench.model.visible import visible
from oddsbench.tui.plain import plain
from oddsbench.tui.widgets.fields import Field, show_problems

COLUMNS = {
    "each": (("name", "f", 6), ("from", "from", 8), ("to", "to", 8)),
    "index": (("name", "t", 6), ("from", "from", 8), ("to", "to", 8)),
    "let": (("name", "name", 8), ("value", "expression", 22)),
    "cases": (("when", "condition (empty: always)", 18), ("to", "state", 16)),
}
BETWEEN = {"each": ("", " .. "), "index": ("", " .. "), "let": (" = ",), "cases": (" → ",)}
KEY_COLUMN = {"each": "name", "index": "name", "let": "name", "cases": "to"}
HINTS = {
    "each": "one outcome per value",
    "index": "one member per value",
    "let": "named values, in order",
    "cases": "the first whose condition holds",
}


class PartCell(Field):
    """One cell of a part's row."""

    def __init__(self, kind: str, row: int, column: str, placeholder: str, width: int, value: str = "") -> None:
        super().__init__(f"{kind}:{row}:{column}", placeholder, value=visible(value), classes="part-cell")
        self.kind = kind
        self.row = row
        self.column = column
        self.styles.width = width


class PartRow(Horizontal):
    """One row: its cells, then its message. It fills itself when mounted, so a row added while the
    group rebuilds shows its values at once."""

    def __init__(self, kind: str, index: int, label: str, values: tuple[str, ...], problems: list[Problem]) -> None:
        super().__init__(classes="part-row field-row")
        self.kind = kind
        self.index = index
        self.label = label
        self.values = values
        self.problems = problems

    def compose(self) -> ComposeResult:
        yield Label(self.label, classes="field-label")
        for position, (column, placeholder, width) in enumerate(COLUMNS[self.kind]):
            if position:
                yield Label(BETWEEN[self.kind][position - 1], classes="part-between")
            value = self.values[position] if position < len(self.values) else ""
            yield PartCell(self.kind, self.index, column, placeholder, width, value)
        yield Static("", classes="field-message")

    def on_mount(self) -> None:
        self.fill(self.values, self.problems)
        group = self.parent
        if isinstance(group, PartsGroup) and group.pending_focus == self.index:
            group.pending_focus = None
            self.query(PartCell).first().focus()

    def fill(self, values: tuple[str, ...], problems: list[Problem]) -> None:
        self.values, self.problems = values, problems
        if not self.is_mounted:
            return
        cells = list(self.query(PartCell).results(PartCell))
        for position, cell in enumerate(cells):
            cell.show(values[position] if position < len(values) else "")
        if cells:
            show_problems(self, cells[0], problems)


class PartsGroup(Vertical):
    """One part's rows; posts ``Edited``, ``Added`` and ``Removed`` for its editor to apply."""

    class Changed(Message):
        """Something about one group's rows; ``control`` is the group (for ``@on`` selectors)."""

        def __init__(self, group: PartsGroup, row: int = -1, column: str = "", value: str = "") -> None:
            super().__init__()
            self.group = group
            self.kind = group.kind
            self.row = row
            self.column = column
            self.value = value

        @property
        def control(self) -> PartsGroup:
            return self.group

    class Edited(Changed):
        """A cell was typed in."""

    class Added(Changed):
        """The add button was pressed."""

    class Removed(Changed):
        """A row's key cell was left empty."""

    def __init__(self, kind: str, label: str | None = None, **kwargs) -> None:
        super().__init__(classes="parts-group", **kwargs)
        self.kind = kind
        self.label = label or kind
        self.rows: tuple[tuple[str, ...], ...] = ()
        self.problems: dict[int | None, list[Problem]] = {}
        self.built = -1
        self.built_rows: list[PartRow] = []  # the rows of the last build (older ones may still be going)
        self.pending_focus: int | None = None  # a row just asked for: focused once it is there

    def compose(self) -> ComposeResult:
        with Horizontal(classes="parts-add-row"):
            yield Label(self.label, classes="field-label")
            yield Button(f"+ {self.label}", classes="parts-add", compact=True)
            yield Static(HINTS.get(self.kind, ""), classes="parts-hint")

    def show(self, rows: tuple[tuple[str, ...], ...], problems: dict[int | None, list[Problem]] | None = None) -> None:
        """The rows from the document; ``problems`` by row (None: the whole part)."""
        self.rows = rows
        self.problems = problems or {}
        if len(rows) != self.built:
            self._build()
        for row in self.built_rows:  # not the rows of an older build still being removed
            if row.index < len(rows):
                row.fill(rows[row.index], self.problems.get(row.index, []))
        general = self.problems.get(None, [])
        hint = self.query_one(".parts-hint", Static)
        hint.update(plain("\n".join(str(p) for p in general) or HINTS.get(self.kind, "")))
        hint.set_class(any(p.is_error for p in general), "-error")

    def _build(self) -> None:
        self.query(PartRow).remove()
        add_row = self.query_one(".parts-add-row")
        add_row.query_one(Label).update("" if self.rows else self.label)
        rows = [
            PartRow(self.kind, index, self.label if index == 0 else "", values, self.problems.get(index, []))
            for index, values in enumerate(self.rows)
        ]
        if rows:
            self.mount_all(rows, before=add_row)
        self.built = len(self.rows)
        self.built_rows = rows

    def focus_row(self, row: int) -> None:
        """Focus a row's first cell, now or as soon as the row is built (after the edit that adds it)."""
        cells = [cell for cell in self.query(PartCell).results(PartCell) if cell.row == row and cell.is_mounted]
        if cells and row < self.built:
            cells[0].focus()
        else:
            self.pending_focus = row

    @on(Input.Changed, ".part-cell")
    def _changed(self, event: Input.Changed) -> None:
        event.stop()
        cell = event.input
        if not isinstance(cell, PartCell) or not 0 <= cell.row < len(self.rows):
            return
        position = [name for name, *_ in COLUMNS[self.kind]].index(cell.column)
        if visible(self.rows[cell.row][position]) == cell.value:
            return
        if cell.column == KEY_COLUMN[self.kind] and not cell.value.strip():
            return  # a row without its key goes when the cell is left (below), not while retyping
        self.post_message(self.Edited(self, cell.row, cell.column, cell.value))

    def on_descendant_blur(self, event: DescendantBlur) -> None:
        cell = event.widget
        if isinstance(cell, PartCell) and cell.column == KEY_COLUMN[self.kind] and not cell.value.strip():
            if 0 <= cell.row < len(self.rows):
                self.post_message(self.Removed(self, cell.row))

    @on(Button.Pressed, ".parts-add")
    def _add(self, event: Button.Pressed) -> None:
        event.stop()
        self.post_message(self.Added(self))
