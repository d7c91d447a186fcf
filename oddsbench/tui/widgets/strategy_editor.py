"""One strategy: the action in each decision state, the ``default``, and the rules over families, in
one table; the highlighted row's fields below. Space cycles an action through those on offer."""

from __future__ import annotations

from dataclasses import dataclass

from rich.text import Text
from textual import on
from textual.app import ComposeResult
from textual.binding import Binding
from textual.containers import Vertical
from textual.widgets import DataTable, Input, Static

from oddsbench.model.document import RulesetDocument
from oddsbench.model.errors import Problem
from oddsbench.model.places import place_of
from oddsbench.model.visible import visible
from oddsbench.tui.plain import plain
from oddsbench.tui.widgets.edits import EditRequested
from oddsbench.tui.widgets.fields import Field, FieldRow
from oddsbench.tui.widgets.state_editor import heading

DEFAULT = "default"
RULE_FIELDS = ("family", "when", "action")


@dataclass(frozen=True)
class StrategyRow:
    """A row of the table: ``default``, a state's entry, or a rule (``rule`` its 0-based number)."""

    kind: str  # "default", "state" or "rule"
    key: str
    action: str
    offered: tuple[str, ...]
    note: str
    rule: int | None = None
    family: str = ""
    when: str = ""


def strategy_rows(document: RulesetDocument, name: str) -> list[StrategyRow]:
    entries = dict(document.strategy_entries(name))
    every = [action for owner, family in document.decision_owners() for action in document.actions(owner, family)]
    offered_anywhere = tuple(dict.fromkeys(every))
    default = entries.get(DEFAULT, "")
    rows = [StrategyRow("default", DEFAULT, default, offered_anywhere, "wherever nothing else chooses")]
    decisions = [state for state in document.state_names() if document.state_kind(state) == "choices"]
    for state in decisions:
        action = entries.get(state, "")
        note = "" if action else (f"plays the default ({default})" if default else "no action yet")
        rows.append(StrategyRow("state", state, action, tuple(document.actions(state)), note))
    for key, action in entries.items():
        if key != DEFAULT and key not in decisions:
            rows.append(StrategyRow("state", key, action, (), "by hand (a family member or no decision state)"))
    for number, rule in enumerate(document.strategy_rules(name)):
        family = rule["family"]
        offered = tuple(document.actions(family, True)) if family in document.family_names() else ()
        note = f"{family}: {rule['when'] or 'every member'}"
        rows.append(
            StrategyRow("rule", f"rule {number + 1}", rule["action"], offered, note, number, family, rule["when"])
        )
    return rows


class StrategyTable(DataTable):
    """Keys: Space cycles the action, ``a`` adds a rule, ``d`` clears or deletes, Ctrl+Up/Down move a rule."""

    BINDINGS = [
        Binding("enter", "edit_row", "Edit", show=False, priority=True),
        Binding("space", "cycle", "Next action"),
        Binding("a,insert", "add_rule", "Add rule"),
        Binding("d,delete", "clear", "Clear / delete"),
        Binding("ctrl+up", "move(-1)", "Rule earlier", show=False),
        Binding("ctrl+down", "move(1)", "Rule later", show=False),
    ]

    @property
    def editor(self) -> StrategyEditor:
        return self.query_ancestor(StrategyEditor)

    def action_edit_row(self) -> None:
        self.editor.enter_form()

    def action_cycle(self) -> None:
        self.editor.cycle()

    def action_add_rule(self) -> None:
        self.editor.add_rule()

    def action_clear(self) -> None:
        self.editor.clear()

    def action_move(self, offset: int) -> None:
        self.editor.move_rule(offset)


class StrategyEditor(Vertical):
    """Edit one ``[strategies.NAME]`` table."""

    def __init__(self, **kwargs) -> None:
        super().__init__(**kwargs)
        self.strategy: str | None = None
        self.rows: list[StrategyRow] = []
        self.families: list[str] = []
        self.problems: list[tuple[Problem, object]] = []
        self.pending_row: int | None = None  # where the cursor goes once the edit asked for is shown
        self.pending_enter = False

    def compose(self) -> ComposeResult:
        yield Static("", id="strategy-heading", classes="editor-heading")
        yield Static("", id="strategy-message", classes="field-message")
        yield StrategyTable(cursor_type="row", id="strategy-table")
        with Vertical(id="strategy-form"):
            yield FieldRow("strategy-family", "family", "a family with choices")
            yield FieldRow("strategy-when", "when", "condition on its index, or empty")
            yield FieldRow("strategy-action", "action", "")

    def on_mount(self) -> None:
        self.query_one(StrategyTable).add_columns("for", "action", "note")

    @property
    def current(self) -> StrategyRow | None:
        row = self.query_one(StrategyTable).cursor_row
        return self.rows[row] if 0 <= row < len(self.rows) else None

    def show(self, document: RulesetDocument, name: str, problems: tuple[Problem, ...]) -> None:
        if name != self.strategy:
            self.query_one(StrategyTable).move_cursor(row=0)
        self.strategy = name
        self.rows = strategy_rows(document, name)
        self.families = [family for family in document.family_names() if document.actions(family, True)]
        self.problems = [(p, place) for p in problems if (place := place_of(p)).section == "strategies"]
        self.problems = [(p, place) for p, place in self.problems if place.name == name]
        rules = sum(1 for row in self.rows if row.kind == "rule")
        chosen = sum(1 for row in self.rows if row.kind == "state" and row.action)
        detail = f"{chosen} state{'s' if chosen != 1 else ''} chosen · {rules} rule{'s' if rules != 1 else ''}"
        self.query_one("#strategy-heading", Static).update(heading("Strategy", name, detail))
        table = self.query_one(StrategyTable)
        cursor = table.cursor_row if self.pending_row is None else self.pending_row
        self.pending_row = None
        table.clear()
        for row in self.rows:
            failing = bool(self._row_problems(row, None))
            label = plain(row.key, "red bold" if failing else ("bold" if row.kind != "state" else ""), multiline=False)
            action = plain(row.action, multiline=False) if row.action else Text("—", style="dim")
            table.add_row(label, action, plain(row.note, "dim", multiline=False))
        if table.row_count:
            table.move_cursor(row=min(max(cursor, 0), table.row_count - 1))
        general = [p for p, place in self.problems if place.rule is None and place.field is None]
        message = self.query_one("#strategy-message", Static)
        message.update(plain("\n".join(str(p) for p in general)))
        message.set_class(any(p.is_error for p in general), "-error")
        message.display = bool(general)
        self._load_form()
        if self.pending_enter:
            self.pending_enter = False
            self.query_one("#field-strategy-when", Field).enter()

    def _row_problems(self, row: StrategyRow, field: str | None) -> list[Problem]:
        found = []
        for problem, place in self.problems:
            if row.kind == "rule" and place.rule == row.rule and (field is None or place.field in (field, None)):
                found.append(problem)
            elif row.kind != "rule" and place.rule is None and place.field == row.key:
                found.append(problem)
        return found

    def _load_form(self) -> None:
        row = self.current
        rule = row is not None and row.kind == "rule"
        for field in RULE_FIELDS:
            field_row = self.query_one(f"#field-strategy-{field}", Field).parent
            assert isinstance(field_row, FieldRow)
            field_row.display = field == "action" or rule
            field_row.input.disabled = row is None
            value = {"family": row.family, "when": row.when, "action": row.action}[field] if row else ""
            field_row.input.show(value)
            if field == "action":
                field_row.input.placeholder = visible(", ".join(row.offered)) if row and row.offered else "an action"
            if field == "family":
                field_row.input.placeholder = visible(", ".join(self.families)) or "a family with choices"
            problems = self._row_problems(row, field) if row else []
            if not rule and field == "action" and row is not None:
                problems = self._row_problems(row, None)
            field_row.show_problems(problems if field != "action" or not rule else self._row_problems(row, "action"))

    @on(DataTable.RowHighlighted, "#strategy-table")
    def _moved(self, event: DataTable.RowHighlighted) -> None:
        event.stop()
        self._load_form()

    def enter_form(self) -> None:
        row = self.current
        if row is not None:
            self.query_one("#field-strategy-family" if row.kind == "rule" else "#field-strategy-action", Field).enter()

    # ----- edits -----

    @on(Input.Changed, "#strategy-form Field")
    def _changed(self, event: Input.Changed) -> None:
        event.stop()
        row, name = self.current, self.strategy
        if row is None or name is None or not isinstance(event.input, Field):
            return
        field, value = event.input.field.removeprefix("strategy-"), event.input.value
        current = {"family": row.family, "when": row.when, "action": row.action}[field]
        if value == visible(current):
            return
        if row.kind == "rule":
            index = row.rule
            self._post(
                lambda doc: doc.set_strategy_rule(name, index, field, value),
                f"rule {index + 1} of {name}",
                f"strategy:{name}:rule:{index}:{field}",
            )
        elif field == "action":
            key = row.key
            self._post(
                lambda doc: doc.set_strategy_action(name, key, value), f"{key} in {name}", f"strategy:{name}:{key}"
            )

    def cycle(self) -> None:
        """The next action on offer for the highlighted row (after the last: none, for a state or the default)."""
        row, name = self.current, self.strategy
        if row is None or name is None or not row.offered:
            return
        choices = list(row.offered) + ([] if row.kind == "rule" else [""])
        following = choices[(choices.index(row.action) + 1) % len(choices)] if row.action in choices else choices[0]
        if row.kind == "rule":
            index = row.rule
            self._post(
                lambda doc: doc.set_strategy_rule(name, index, "action", following), f"rule {index + 1} of {name}"
            )
        else:
            key = row.key
            self._post(lambda doc: doc.set_strategy_action(name, key, following), f"{key} in {name}")

    def add_rule(self) -> None:
        name = self.strategy
        if name is None:
            return
        if not self.families:
            self.app.notify("rules choose actions over a family with choices; this file has none", severity="warning")
            return
        row = self.current
        after = row.rule if row is not None and row.kind == "rule" else None
        family = row.family if row is not None and row.kind == "rule" and row.family else self.families[0]
        offered = next((r.offered for r in self.rows if r.kind == "rule" and r.family == family), ())
        action = offered[0] if offered else ""
        self._post(
            lambda doc: doc.add_strategy_rule(name, family, action or _first(doc, family), after), f"new rule in {name}"
        )
        self.pending_row = (self.rows.index(row) + 1) if after is not None else len(self.rows)
        self.pending_enter = True

    def clear(self) -> None:
        row, name = self.current, self.strategy
        if row is None or name is None:
            return
        if row.kind == "rule":
            index = row.rule
            self._post(lambda doc: doc.delete_strategy_rule(name, index), f"delete rule {index + 1} of {name}")
        elif row.action:
            key = row.key
            self._post(lambda doc: doc.set_strategy_action(name, key, ""), f"clear {key} in {name}")

    def move_rule(self, offset: int) -> None:
        row, name = self.current, self.strategy
        if row is None or name is None or row.kind != "rule":
            return
        index = row.rule
        self.pending_row = self.query_one(StrategyTable).cursor_row + offset
        self._post(lambda doc: doc.move_strategy_rule(name, index, offset), f"move rule {index + 1} of {name}")

    def _post(self, edit, label: str, field: str | None = None) -> None:
        self.post_message(EditRequested(edit, label, field))


def _first(document: RulesetDocument, family: str) -> str:
    actions = document.actions(family, True)
    return actions[0] if actions else ""
