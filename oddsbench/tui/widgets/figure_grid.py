"""A table of figures that fits its width: short cells (exact, decimal or both), the whole figure on demand.

The report layer decides every cell's text (``report/figure_table.fit_table``) from the width this
widget has; the widget only draws it, keeps the cursor, and says which figure is highlighted so the
detail pane can show it whole.
"""

from __future__ import annotations

from rich.text import Text
from textual.binding import Binding
from textual.message import Message
from textual.widgets import DataTable

from oddsbench.report.figure_table import CELL_KINDS, FigureRow, FigureTable, FittedTable, Shown, fit_table
from oddsbench.tui.plain import plain


class FigureGrid(DataTable):
    """Figures by row, one column per strategy or plan (or exact and decimal for one round)."""

    BINDINGS = [
        Binding("c", "cycle_cells", "Cells"),
        Binding("enter", "open_figure", "Whole figure"),
    ]

    class Highlighted(Message):
        """The cursor is on ``row`` of ``table``, figure column ``column``: show it in the detail pane."""

        def __init__(self, grid: FigureGrid, row: FigureRow, column: int) -> None:
            super().__init__()
            self.grid = grid
            self.row = row
            self.column = column

        @property
        def column_name(self) -> str:
            columns = self.grid.table.columns if self.grid.table else ()
            return columns[self.column] if self.column < len(columns) else ""

        @property
        def cell(self) -> Shown | None:
            cells = self.row.cells
            return cells[self.column] if self.column < len(cells) else None

    class Opened(Highlighted):
        """Enter on a figure: show it whole."""

    class CellsCycled(Message):
        """Switch every table between exact, decimal and both."""

    def __init__(self, **kwargs) -> None:
        super().__init__(cursor_type="row", zebra_stripes=False, **kwargs)
        self.table: FigureTable | None = None
        self.kind = CELL_KINDS[0]
        self.fitted: FittedTable | None = None
        self._width = 0

    def show(self, table: FigureTable | None, kind: str | None = None) -> None:
        """Show ``table`` with cells of ``kind`` (None: keep the kind), fitted to the width there is."""
        self.table = table
        if kind is not None:
            self.kind = kind
        self._draw()

    def set_kind(self, kind: str) -> None:
        if kind != self.kind:
            self.kind = kind
            self._draw()

    @property
    def available_width(self) -> int:
        """The width to fit: this table's own once laid out, else its container's."""
        for widget in (self, self.parent):
            width = getattr(widget, "content_region", None)
            if width is not None and width.width > 0:
                return width.width
        return self.app.size.width

    def on_resize(self) -> None:
        if self.available_width != self._width:
            self._draw()

    def _draw(self) -> None:
        row, column = self.cursor_coordinate
        self.clear(columns=True)
        table = self.table
        if table is None:
            self.fitted = None
            return
        self._width = self.available_width
        fitted = fit_table(table, self._width, self.kind)
        self.fitted = fitted
        self.cursor_type = "row" if len(table.columns) == 1 else "cell"
        for header in fitted.headers:
            self.add_column(plain(header, multiline=False))
        for cells in fitted.rows:
            self.add_row(plain(cells[0], multiline=False), *(Text(cell, justify="right") for cell in cells[1:]))
        if self.row_count:
            column = max(1, column) if self.cursor_type == "cell" else 0
            self.move_cursor(row=min(row, self.row_count - 1), column=column)
        self._announce(self.Highlighted)

    def figure_at(self, row: int, column: int) -> tuple[FigureRow, int] | None:
        """The figure row under the cursor and its figure column (the label column means the first)."""
        if self.table is None or not 0 <= row < len(self.table.rows):
            return None
        figure_column = 0 if len(self.table.columns) == 1 else max(0, column - 1)
        return self.table.rows[row], figure_column

    def announce(self) -> None:
        """Say which figure is highlighted (the detail pane shows it)."""
        self._announce(self.Highlighted)

    def _announce(self, kind) -> None:
        found = self.figure_at(*self.cursor_coordinate)
        if found is not None:
            self.post_message(kind(self, *found))

    def on_data_table_row_highlighted(self, event: DataTable.RowHighlighted) -> None:
        event.stop()
        self._announce(self.Highlighted)

    def on_data_table_cell_highlighted(self, event: DataTable.CellHighlighted) -> None:
        event.stop()
        self._announce(self.Highlighted)

    def on_focus(self) -> None:
        self._announce(self.Highlighted)

    def action_open_figure(self) -> None:
        self._announce(self.Opened)

    def action_cycle_cells(self) -> None:
        self.post_message(self.CellsCycled())

    def on_data_table_row_selected(self, event: DataTable.RowSelected) -> None:
        event.stop()

    def on_data_table_cell_selected(self, event: DataTable.CellSelected) -> None:
        event.stop()
