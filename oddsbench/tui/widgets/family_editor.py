"""A family of states in three panes: its fields (member name, index ranges, ``when``, ``let``,
``result``, ``about``), its outcome templates (the state editor's table and form), and its members
as the reader expands them, read-only, with their outcomes and the figures from the highlighted
one. The text is read again after every keystroke, so the member count and the problems follow.
"""

from __future__ import annotations

from collections import defaultdict

from rich.text import Text
from textual import on, work
from textual.app import ComposeResult
from textual.containers import Vertical
from textual.widgets import DataTable, Input, Static, TabbedContent, TabPane
from textual.worker import get_current_worker

from oddsbench.model.document import OutcomeList, RulesetDocument
from oddsbench.model.errors import OddsbenchError, Problem
from oddsbench.model.places import Place, place_of
from oddsbench.model.ruleset import Ruleset
from oddsbench.model.visible import visible
from oddsbench.tui.family_members import MemberRow, member_figures, members_of
from oddsbench.tui.plain import plain
from oddsbench.tui.widgets.edits import EditRequested
from oddsbench.tui.widgets.fields import Field, FieldRow
from oddsbench.tui.widgets.outcomes import OutcomesPanel
from oddsbench.tui.widgets.parts import PartsGroup
from oddsbench.tui.widgets.state_editor import heading, matches

FAMILY_FIELDS = (
    ("state", "state", 'member names: "turn-{t}"'),
    ("when", "when", "which index values give a member"),
    ("result", "result", "for members that end the round"),
    ("about", "about", "a few words"),
)
PREFIX = "family-"  # family fields' ids stay apart from the outcome form's


class MembersPanel(Vertical):
    """Every member with its index values; the highlighted one's outcomes and figures."""

    def __init__(self, **kwargs) -> None:
        super().__init__(**kwargs)
        self.rows: tuple[MemberRow, ...] = ()
        self.ruleset: Ruleset | None = None
        self.strategy: str | None = None
        self.asked: tuple | None = None

    def compose(self) -> ComposeResult:
        yield Static("", id="members-heading", classes="editor-heading")
        yield DataTable(cursor_type="row", id="members-table")
        yield DataTable(cursor_type="row", id="member-outcomes", show_cursor=False)
        yield Static("", id="member-figures-heading", classes="figures-heading")
        yield DataTable(cursor_type="row", id="member-figures", show_cursor=False)

    def show(self, family: str, reading, strategy: str | None) -> None:
        members = getattr(reading, "members", {}) if reading is not None else {}
        tables = getattr(reading, "member_tables", {}) if reading is not None else {}
        count, rows = members_of(family, members, tables)
        self.ruleset = reading.ruleset if reading is not None else None
        self.strategy = strategy
        shown = f"{count:,} member{'s' if count != 1 else ''}"
        if count > len(rows):
            shown += f" (the first {len(rows):,} listed)"
        if reading is not None and reading.ruleset is None:
            shown += " · figures wait until the file has no errors"
        self.query_one("#members-heading", Static).update(plain(shown, "bold"))
        table = self.query_one("#members-table", DataTable)
        if rows != self.rows or not table.columns:
            cursor = table.cursor_row
            variables = [name for name, _ in rows[0].index] if rows else []
            table.clear(columns=True)
            table.add_columns("state", *[plain(name) for name in variables], "kind", "outcomes")
            for row in rows:
                cells = [plain(row.state, multiline=False), *[value for _, value in row.index]]
                table.add_row(*cells, row.kind, str(len(row.outcomes)))
            if table.row_count:
                table.move_cursor(row=min(max(cursor, 0), table.row_count - 1))
            self.rows = rows
        self._show_member()

    @property
    def current(self) -> MemberRow | None:
        row = self.query_one("#members-table", DataTable).cursor_row
        return self.rows[row] if 0 <= row < len(self.rows) else None

    @on(DataTable.RowHighlighted, "#members-table")
    def _moved(self, event: DataTable.RowHighlighted) -> None:
        event.stop()
        self._show_member()

    def _show_member(self) -> None:
        member = self.current
        outcomes = self.query_one("#member-outcomes", DataTable)
        outcomes.clear(columns=True)
        outcomes.add_columns("action", "to", "prob", "pay", "stake", "note")
        for action, fields in member.outcomes if member else ():
            cells = [fields.get(key, "") for key in ("to", "prob", "pay", "stake", "note")]
            outcomes.add_row(*[plain(cell, multiline=False) for cell in (action, *cells)])
        key = (member.state if member else None, id(self.ruleset), self.strategy)
        if key == self.asked:
            return
        self.asked = key
        heading = self.query_one("#member-figures-heading", Static)
        self.query_one("#member-figures", DataTable).clear(columns=True)
        if member is None or self.ruleset is None:
            heading.update(Text("figures from a member appear when the file has no errors", style="dim"))
            return
        heading.update(plain(f"solving the round from {member.state!r}…", "magenta"))
        self._solve(self.ruleset, member.state, self.strategy, key)

    @work(thread=True, exclusive=True, group="member-figures", exit_on_error=False)
    def _solve(self, ruleset: Ruleset, state: str, strategy: str | None, key: tuple) -> None:
        worker = get_current_worker()
        try:
            result = member_figures(ruleset, state, strategy, should_stop=lambda: worker.is_cancelled)
        except (OddsbenchError, ArithmeticError, ValueError, MemoryError) as error:
            result = str(error)
        except Exception as error:  # noqa: BLE001 - a solve that fails is shown, never ends the app
            if worker.is_cancelled:
                return
            result = f"the round from {state!r} could not be solved: {error}"
        if not worker.is_cancelled:
            self.app.call_from_thread(self._solved, key, result)

    def _solved(self, key: tuple, result) -> None:
        if key != self.asked:
            return
        heading = self.query_one("#member-figures-heading", Static)
        table = self.query_one("#member-figures", DataTable)
        table.clear(columns=True)
        if isinstance(result, str):
            heading.update(plain(result, "yellow"))
            return
        heading.update(plain(result.heading, "bold"))
        table.add_columns("quantity", "exact", "decimal")
        for label, exact, decimal in result.rows:
            table.add_row(plain(label), Text(exact, justify="right"), Text(decimal, justify="right"))


class FamilyEditor(Vertical):
    """Edit one family: fields and parts, outcome templates, and see its members."""

    def __init__(self, **kwargs) -> None:
        super().__init__(**kwargs)
        self.family: str | None = None
        self.fields: dict[str, str] = {}

    def compose(self) -> ComposeResult:
        yield Static("", id="family-heading", classes="editor-heading")
        yield Static("", id="family-message", classes="field-message")
        with TabbedContent(id="family-tabs"):
            with TabPane("Family", id="family-pane-fields"):
                for field, label, hint in FAMILY_FIELDS:
                    yield FieldRow(PREFIX + field, label, hint)
                yield PartsGroup("index", id="family-index")
                yield PartsGroup("let", id="family-let")
            with TabPane("Outcomes", id="family-pane-outcomes"):
                yield OutcomesPanel(family=True, id="family-outcomes")
            with TabPane("Members", id="family-pane-members"):
                yield MembersPanel(id="family-members")

    def show(self, document: RulesetDocument, family: str, reading, strategy: str | None) -> None:
        self.family = family
        self.fields = document.family_fields(family)
        problems = reading.problems if reading is not None else ()
        mine = [(p, place) for p in problems if (place := place_of(p)).family == family]
        templates = [(p, place) for p, place in mine if place.section == "families"]
        count = sum(1 for member in (getattr(reading, "members", None) or {}).values() if member.family == family)
        detail = f"{self.fields['state'] or '?'} · {count:,} member{'s' if count != 1 else ''}"
        self.query_one("#family-heading", Static).update(heading("Family", family, detail))
        for field, _, _ in FAMILY_FIELDS:
            row = self.query_one(f"#field-{PREFIX}{field}", Field).parent
            assert isinstance(row, FieldRow)
            row.input.show(self.fields[field])
            row.show_problems(self._at_field(templates, field))
        for kind in ("index", "let"):
            names = [row[0] for row in document.family_part(family, kind)]
            self.query_one(f"#family-{kind}", PartsGroup).show(
                document.family_part(family, kind), _by_row(templates, kind, names)
            )

        def problems_at(where: OutcomeList | None, index: int | None, field: str | None) -> list[Problem]:
            outcome = [(p, place) for p, place in templates if place.outcome is not None or place.action is not None]
            return [p for p, place in outcome if matches(place, where, index, field)]

        self.query_one(OutcomesPanel).show(document, family, problems_at)
        self.query_one(MembersPanel).show(family, reading, strategy)
        beside = self._at_field(templates, "state") + self._at_field(templates, "when")
        general = [
            p
            for p, place in templates
            if place.outcome is None and place.action is None and place.field is None and p not in beside
        ]
        lines = [str(p) for p in general] + _grouped([(p, place) for p, place in mine if place.section == "states"])
        message = self.query_one("#family-message", Static)
        more = f"\n… {len(lines) - 4} more in the problems below" if len(lines) > 4 else ""
        message.update(plain("\n".join(lines[:4]) + more))
        message.set_class(bool(lines), "-error")
        message.display = bool(lines)

    def _at_field(self, templates: list[tuple[Problem, Place]], field: str) -> list[Problem]:
        """Problems of one field; a template's own parse error names no field, only its text."""
        found = [p for p, place in templates if place.field == field and place.outcome is None and place.action is None]
        value = self.fields.get(field, "")
        if field in ("state", "when") and value:
            found += [
                p
                for p, place in templates
                if place.field is None and place.outcome is None and place.action is None and repr(value) in p.message
            ]
        return found

    def focus_tabs(self) -> None:
        self.query_one("#family-tabs Tabs").focus()

    # ----- edits -----

    @on(Input.Changed, ".field-row > Field")
    def _field_changed(self, event: Input.Changed) -> None:
        field = event.input
        if not isinstance(field, Field) or not field.field.startswith(PREFIX) or self.family is None:
            return
        event.stop()
        name, value, family = field.field[len(PREFIX) :], field.value, self.family
        if visible(self.fields.get(name, "")) == value:
            return
        self.fields[name] = value
        self.post_message(
            EditRequested(
                lambda doc: doc.set_family_field(family, name, value),
                f"{name} of family {family}",
                f"family:{family}:{name}",
            )
        )

    @on(PartsGroup.Edited, "#family-index, #family-let")
    def _part_edited(self, event: PartsGroup.Edited) -> None:
        event.stop()
        family, kind, row, column, value = self.family, event.kind, event.row, event.column, event.value
        if family is not None:
            self.post_message(
                EditRequested(
                    lambda doc: doc.set_family_part(family, kind, row, column, value),
                    f"{kind} of family {family}",
                    f"family:{family}:{kind}:{row}:{column}",
                )
            )

    @on(PartsGroup.Added, "#family-index, #family-let")
    def _part_added(self, event: PartsGroup.Added) -> None:
        event.stop()
        family, kind = self.family, event.kind
        if family is None:
            return
        group = self.query_one(f"#family-{kind}", PartsGroup)
        count = len(group.rows)
        self.post_message(
            EditRequested(lambda doc: doc.add_family_part(family, kind), f"new {kind} in family {family}")
        )
        group.pending_focus = count

    @on(PartsGroup.Removed, "#family-index, #family-let")
    def _part_removed(self, event: PartsGroup.Removed) -> None:
        event.stop()
        family, kind, row = self.family, event.kind, event.row
        if family is not None:
            self.post_message(
                EditRequested(lambda doc: doc.delete_family_part(family, kind, row), f"remove {kind} row {row + 1}")
            )


def _by_row(templates: list[tuple[Problem, Place]], kind: str, names: list[str]) -> dict[int | None, list[Problem]]:
    found: dict[int | None, list[Problem]] = defaultdict(list)
    for problem, place in templates:
        if place.field == kind and place.outcome is None and place.action is None:
            found[names.index(place.part) if place.part in names else None].append(problem)
    return dict(found)


def _grouped(members: list[tuple[Problem, Place]]) -> list[str]:
    """Problems of the members, one line per kind of problem: a family can make hundreds of them."""
    by_message: dict[tuple[str | None, str | None, str], list[Place]] = defaultdict(list)
    for problem, place in members:
        by_message[(place.action, place.field, problem.message)].append(place)
    lines = []
    for (action, field, message), places in by_message.items():
        where = ", ".join(part for part in (f"choice {action!r}" if action else "", field or "") if part)
        first = f"{places[0].state!r} at {places[0].index}"
        count = f"{len(places)} members" if len(places) > 1 else "member"
        lines.append(f"{count}{', ' + where if where else ''}: {message} (first: {first})")
    return lines
