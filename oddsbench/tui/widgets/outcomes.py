"""The outcomes of a state or of a family in one table, grouped by action for a decision (the action in
every row), and the highlighted outcome's form below: its fields, then, where the family language is
in use, ``when``, ``each``, ``let`` and the cases of its ``to``.

Keys on the table add, delete and move outcomes and manage the actions; commands that need a name
go up as ``OutcomeCommand`` for the screen to ask and apply.
"""

from __future__ import annotations

from collections.abc import Callable
from dataclasses import dataclass

from rich.text import Text
from textual import on
from textual.app import ComposeResult
from textual.binding import Binding
from textual.containers import Vertical, VerticalScroll
from textual.message import Message
from textual.widgets import DataTable, Input

from oddsbench.model.document import OUTCOME_FIELDS, OutcomeList, OutcomeRow, RulesetDocument
from oddsbench.model.errors import Problem
from oddsbench.model.visible import visible
from oddsbench.tui.plain import plain
from oddsbench.tui.widgets.edits import EditRequested
from oddsbench.tui.widgets.fields import Field, FieldRow
from oddsbench.tui.widgets.parts import PartCell, PartsGroup

FIELD_HINTS = {
    "to": "next state",
    "prob": "8/36, or empty",
    "pay": "net win: 1, -1",
    "stake": "extra at risk",
    "note": "a few words",
    "when": "condition, or empty",
}
FORM_FIELDS = (*OUTCOME_FIELDS, "when")
PARTS = ("each", "let", "cases")

# Which problems belong where: given (list, outcome index or None, field or None) -> problems.
ProblemsAt = Callable[[OutcomeList | None, int | None, str | None], list[Problem]]


@dataclass(frozen=True)
class Entry:
    """One row of the table: an outcome of one list, or an action without outcomes (index None)."""

    where: OutcomeList
    index: int | None
    row: OutcomeRow | None


class OutcomeCommand(Message):
    """A command on the outcomes' owner that needs the screen: a name to ask, or a question."""

    def __init__(self, command: str, owner: str, family: bool, action: str | None) -> None:
        super().__init__()
        self.command = command
        self.owner = owner
        self.family = family
        self.action = action


class OutcomeTable(DataTable):
    """Every outcome of the state (or family). Keys here add, delete and move outcomes and actions."""

    BINDINGS = [
        Binding("enter", "edit_row", "Edit", show=False, priority=True),
        Binding("a,insert", "add_outcome", "Add outcome"),
        Binding("d,delete", "delete_outcome", "Delete outcome"),
        Binding("ctrl+up", "move(-1)", "Move up", show=False),
        Binding("ctrl+down", "move(1)", "Move down", show=False),
        Binding("c", "command('add-action')", "New action (choice)"),
        Binding("r", "command('rename-action')", "Rename action", show=False),
        Binding("x", "command('delete-action')", "Delete action", show=False),
        Binding("less_than_sign", "move_action(-1)", "Action earlier", show=False),
        Binding("greater_than_sign", "move_action(1)", "Action later", show=False),
        Binding("k", "command('kind')", "Kind of state", show=False),
    ]

    @property
    def panel(self) -> OutcomesPanel:
        return self.query_ancestor(OutcomesPanel)

    def action_edit_row(self) -> None:
        self.panel.enter_form()

    def action_add_outcome(self) -> None:
        self.panel.add_outcome()

    def action_delete_outcome(self) -> None:
        self.panel.delete_outcome()

    def action_move(self, offset: int) -> None:
        self.panel.move_outcome(offset)

    def action_move_action(self, offset: int) -> None:
        self.panel.move_action(offset)

    def action_command(self, command: str) -> None:
        self.panel.command(command)


class OutcomeForm(VerticalScroll):
    """The fields of one outcome, and its parts where the family language is in use."""

    def compose(self) -> ComposeResult:
        for field in FORM_FIELDS:
            yield FieldRow(field, field, FIELD_HINTS[field])
        for kind in PARTS:
            yield PartsGroup(kind, id=f"part-{kind}")

    def show(self, row: OutcomeRow | None, extended: bool, problems_at: Callable[[str | None], list[Problem]]) -> None:
        for field_row in self.query(FieldRow).results(FieldRow):
            field = field_row.field
            field_row.display = field != "when" or extended
            cases = bool(row and row.cases)
            field_row.input.disabled = row is None or (field == "to" and cases)
            field_row.input.placeholder = "(the cases below)" if field == "to" and cases else FIELD_HINTS[field]
            field_row.input.show(row.fields.get(field, "") if row else "")
            problems = problems_at(field) if row else []
            if row is not None and field == "to":
                problems = problems + problems_at(None)  # an outcome's problems that name no field
            field_row.show_problems(problems)
        for group in self.query(PartsGroup).results(PartsGroup):
            group.display = extended and row is not None
            if row is not None:
                part = "let" if group.kind == "let" else group.kind
                group.show(row.part(part), {None: problems_at(part)})


class OutcomesPanel(Vertical):
    """An owner's outcome lists in one table and the highlighted outcome's form."""

    def __init__(self, family: bool = False, table_id: str | None = None, **kwargs) -> None:
        super().__init__(**kwargs)
        self.family = family
        self.table_id = table_id
        self.owner: str | None = None
        self.entries: list[Entry] = []
        self.extended = family
        self.problems_at: ProblemsAt = lambda where, index, field: []
        self.decision = False
        self.pending_row: int | None = None  # where the cursor goes once the edit asked for is shown

    def compose(self) -> ComposeResult:
        yield OutcomeTable(cursor_type="row", classes="outcome-table", id=self.table_id)
        yield OutcomeForm(classes="outcome-form")

    @property
    def table(self) -> OutcomeTable:
        return self.query_one(OutcomeTable)

    @property
    def current(self) -> Entry | None:
        row = self.table.cursor_row
        return self.entries[row] if 0 <= row < len(self.entries) else None

    def show(self, document: RulesetDocument, owner: str, problems_at: ProblemsAt) -> None:
        """Reload from the document (after any edit, undo or redo), keeping the cursor where it was."""
        if owner != self.owner:
            self.table.move_cursor(row=0)
        self.owner = owner
        self.problems_at = problems_at
        lists = document.outcome_lists(owner, self.family)
        self.decision = any(where.action is not None for where in lists)
        entries: list[Entry] = []
        for where in lists:
            rows = document.outcomes(where)
            entries += [Entry(where, index, row) for index, row in enumerate(rows)] or [Entry(where, None, None)]
        self.entries = entries
        self.extended = self.family or any(entry.row and entry.row.uses_family_parts for entry in entries)
        self._fill_table()
        self._load_form()

    def _fill_table(self) -> None:
        table = self.table
        row = table.cursor_row if self.pending_row is None else self.pending_row
        self.pending_row = None
        columns = (("action",) if self.decision else ()) + ("#",) + OUTCOME_FIELDS
        if [str(column.label) for column in table.columns.values()] != list(columns):
            table.clear(columns=True)
            for column in columns:
                table.add_column(column, key=column)
        else:
            table.clear()
        for entry in self.entries:
            failing = bool(entry.index is not None and self.problems_at(entry.where, entry.index, "*"))
            cells: list[Text | str] = [plain(entry.where.action or "", "bold")] if self.decision else []
            if entry.row is None:
                cells += [Text("", style="dim"), Text("(no outcomes: a adds one)", style="dim italic")]
                cells += [""] * (len(OUTCOME_FIELDS) - 1)
            else:
                cells.append(Text(str((entry.index or 0) + 1), style="red bold" if failing else ""))
                for field in OUTCOME_FIELDS:
                    value = entry.row.fields[field]
                    if field == "to" and entry.row.cases:
                        value = " | ".join(target for _, target in entry.row.cases)
                    cells.append(plain(value, multiline=False))
            table.add_row(*cells)
        if table.row_count:
            table.move_cursor(row=min(max(row, 0), table.row_count - 1))

    def _load_form(self) -> None:
        entry = self.current
        row = entry.row if entry else None

        def at(field: str | None) -> list[Problem]:
            return self.problems_at(entry.where, entry.index, field) if entry and row else []

        self.query_one(OutcomeForm).show(row, self.extended, at)

    @on(DataTable.RowHighlighted, ".outcome-table")
    def _row_moved(self, event: DataTable.RowHighlighted) -> None:
        event.stop()
        self._load_form()

    def enter_form(self) -> None:
        """Enter on a row: into its first field, the text selected so that typing replaces it."""
        entry = self.current
        if entry is None or entry.row is None:
            return
        first = "prob" if entry.row.fields["to"] and not entry.row.cases else "to"
        if entry.row.cases:
            first = "prob"
        self.query_one(f"#field-{first}", Field).enter()

    # ----- edits -----

    @on(Input.Changed)
    def _changed(self, event: Input.Changed) -> None:
        event.stop()
        field = event.input
        entry = self.current
        if not isinstance(field, Field) or isinstance(field, PartCell) or entry is None or entry.row is None:
            return
        name, value = field.field, field.value
        if name not in FORM_FIELDS or visible(entry.row.fields.get(name, "")) == value:
            return
        entry.row.fields[name] = value
        where, index = entry.where, entry.index
        if name in OUTCOME_FIELDS:
            self.table.update_cell_at((self.table.cursor_row, self._column(name)), plain(value, multiline=False))
        self._post(
            lambda doc: doc.set_outcome(where, index, name, value),
            f"{name} of outcome {index + 1} in {where.state}",
            f"{where.owner_label}:{where.action}:{index}:{name}",
        )

    @on(PartsGroup.Edited)
    def _part_edited(self, event: PartsGroup.Edited) -> None:
        event.stop()
        entry = self.current
        if entry is None or entry.index is None:
            return
        where, index = entry.where, entry.index
        kind, row, column, value = event.kind, event.row, event.column, event.value
        self._post(
            lambda doc: doc.set_outcome_part(where, index, kind, row, column, value),
            f"{kind} of outcome {index + 1} in {where.state}",
            f"{where.owner_label}:{where.action}:{index}:{kind}:{row}:{column}",
        )

    @on(PartsGroup.Added)
    def _part_added(self, event: PartsGroup.Added) -> None:
        event.stop()
        entry = self.current
        if entry is None or entry.index is None:
            return
        where, index, kind = entry.where, entry.index, event.kind
        rows = entry.row.part(kind) if entry.row else ()
        self._post(lambda doc: doc.add_outcome_part(where, index, kind), f"new {kind} in outcome {index + 1}")
        group = self.query_one(f"#part-{kind}", PartsGroup)
        new_row = len(rows) - 1 if kind == "cases" and rows else len(rows)
        group.pending_focus = max(new_row, 0)

    @on(PartsGroup.Removed)
    def _part_removed(self, event: PartsGroup.Removed) -> None:
        event.stop()
        entry = self.current
        if entry is None or entry.index is None:
            return
        where, index, kind, row = entry.where, entry.index, event.kind, event.row
        self._post(lambda doc: doc.delete_outcome_part(where, index, kind, row), f"remove {kind} row {row + 1}")

    def add_outcome(self) -> None:
        entry = self.current
        if entry is None:
            if self.owner is None or self.decision:
                return
            where = OutcomeList(self.owner, None, self.family)
            self.pending_row = 0
            self._post(lambda doc: doc.add_outcome(where), f"new outcome in {self.owner}")
            return
        where, after = entry.where, entry.index
        self.pending_row = self.table.cursor_row + (1 if after is not None else 0)
        self._post(lambda doc: doc.add_outcome(where, after), f"new outcome in {where.state}")

    def delete_outcome(self) -> None:
        entry = self.current
        if entry is None or entry.index is None:
            return
        where, index = entry.where, entry.index
        self._post(lambda doc: doc.delete_outcome(where, index), f"delete outcome {index + 1} in {where.state}")

    def move_outcome(self, offset: int) -> None:
        entry = self.current
        if entry is None or entry.index is None:
            return
        same = [e for e in self.entries if e.where == entry.where]
        if not 0 <= entry.index + offset < len(same):
            return
        where, index = entry.where, entry.index
        self.pending_row = self.table.cursor_row + offset
        self._post(lambda doc: doc.move_outcome(where, index, offset), f"move outcome {index + 1} in {where.state}")

    def move_action(self, offset: int) -> None:
        entry = self.current
        if entry is None or entry.where.action is None or self.owner is None:
            return
        owner, family, action = self.owner, self.family, entry.where.action
        self._post(lambda doc: doc.move_action(owner, action, offset, family), f"move action {action}")

    def command(self, command: str) -> None:
        if self.owner is None:
            return
        entry = self.current
        action = entry.where.action if entry else None
        self.post_message(OutcomeCommand(command, self.owner, self.family, action))

    def _post(self, edit, label: str, field: str | None = None) -> None:
        self.post_message(EditRequested(edit, label, field))

    def _column(self, field: str) -> int:
        return OUTCOME_FIELDS.index(field) + (2 if self.decision else 1)
