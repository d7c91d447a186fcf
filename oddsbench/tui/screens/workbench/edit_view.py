"""The Edit view's part of the workbench screen: which editor shows for the entry picked in the list,
Enter into an editor and Esc out of it, and the commands of the list and the outcome table.

A mixin of ``WorkbenchScreen`` (``screen.py`` keeps the document, the reading and the keys); its
message handlers are named ``on_...`` so Textual finds them through the screen's class. Enter is a
priority key in the list and the tables: the focus moves before the next key arrives, so keys typed
at once after Enter land in the field.
"""

from __future__ import annotations

from textual.widgets import ContentSwitcher, Static

from oddsbench.model.errors import OddsbenchError, Problem
from oddsbench.model.places import place_of
from oddsbench.tui import analysis
from oddsbench.tui.plain import plain
from oddsbench.tui.screens.workbench.commands import entry_command, outcome_command, param_command
from oddsbench.tui.widgets.deck_editor import CardCounts, DeckEditor
from oddsbench.tui.widgets.family_editor import FamilyEditor
from oddsbench.tui.widgets.fields import Field
from oddsbench.tui.widgets.navigator import DECK, FAMILY, PARAMS, SESSION, SETUP, STATE, STRATEGY, Navigator
from oddsbench.tui.widgets.outcomes import OutcomeCommand, OutcomesPanel, OutcomeTable
from oddsbench.tui.widgets.setup_editor import ParamsEditor, SessionEditor, SetupEditor
from oddsbench.tui.widgets.source_view import SourceView
from oddsbench.tui.widgets.state_editor import StateEditor
from oddsbench.tui.widgets.strategy_editor import StrategyEditor, StrategyTable

EDITORS = {
    SETUP: "setup-editor",
    PARAMS: "params-editor",
    SESSION: "session-editor",
    DECK: "deck-editor",
    STATE: "state-editor",
    FAMILY: "family-editor",
    STRATEGY: "strategy-editor",
}


def failing_entries(problems: tuple[Problem, ...]) -> set[str]:
    """The states, families and strategies with an error, as list entries (marked there); a state
    made by a family marks its family."""
    failing = set()
    for problem in problems:
        if not problem.is_error:
            continue
        place = place_of(problem)
        if place.family:
            failing.add(FAMILY + place.family)
        elif place.state:
            failing.add(place.state)  # the list marks hand-written states by name
        if place.section == "strategies" and place.name:
            failing.add(STRATEGY + place.name)
    return failing


class EditView:
    """Behaviour of the Edit view (mixed into ``WorkbenchScreen``)."""

    def _failing_states(self, problems: tuple[Problem, ...]) -> set[str]:
        return failing_entries(problems)

    def _show_editor(self, problems: tuple[Problem, ...]) -> None:
        document = self.session.document
        editors = self.query_one("#editors", ContentSwitcher)
        if document is None:
            editors.current = "toml-problem"
            message = plain(self.session.toml_message or "", "bold red")
            message.append("\nThe forms come back once the file reads as TOML: fix it in the Source view (F6).")
            message.append("\nThe figures shown are the last good ones.", style="yellow")
            self.query_one("#toml-problem", Static).update(message)
            return
        entry = self.query_one(Navigator).current_entry or SETUP
        kind = next((prefix for prefix in EDITORS if entry.startswith(prefix)), SETUP)
        name = entry[len(kind) :]
        if kind == STATE and name not in document.state_names():
            return
        if kind == FAMILY and name not in document.family_names():
            return
        if kind == STRATEGY and name not in document.strategy_names():
            return
        editors.current = EDITORS[kind]
        if kind == SETUP:
            self.query_one(SetupEditor).show(document, problems)
        elif kind == PARAMS:
            self.query_one(ParamsEditor).show(document, problems)
        elif kind == SESSION:
            self.query_one(SessionEditor).show(document, self._session_problem())
        elif kind == DECK:
            deck = self.reading.ruleset.deck if self.reading and self.reading.ruleset else None
            self.query_one(DeckEditor).show(document, deck, problems)
        elif kind == STATE:
            self.query_one(StateEditor).show(document, name, problems)
        elif kind == FAMILY:
            self.query_one(FamilyEditor).show(document, name, self.reading, self.strategy)
        elif kind == STRATEGY:
            self.query_one(StrategyEditor).show(document, name, problems)

    def show_toml_problem(self) -> None:
        """Text that is not TOML: its line and column above the source (the line marked), in the Edit
        view in place of the forms, and in the top bar of every view; the figures stay the last good."""
        message = self.session.toml_message
        place = self.session.toml_place
        self.query_one(SourceView).show_problem(message, place.line if message and place else None)
        if message:
            self.status_note = message
        elif self.status_note.startswith("not valid TOML"):
            self.status_note = ""
        self._update_topbar()

    def shown_problems(self, reading) -> tuple[Problem, ...]:
        """The reading's problems, or, for text that is not TOML, that one line in the words of every view."""
        message = self.session.toml_message
        return (Problem(self.session.source, "", message),) if message else reading.problems

    def _session_problem(self) -> OddsbenchError | None:
        """The first problem of the [session] table, as the core finds it (naming the setting)."""
        ruleset = self.reading.ruleset if self.reading else None
        if ruleset is None or not ruleset.session:
            return None
        try:
            analysis.session_settings_of(ruleset)
        except OddsbenchError as error:
            return error
        return None

    def enter_editor(self, entry: str) -> None:
        """Enter in the list: show the entry's editor and move the focus into it now."""
        if entry != self.entry:
            self.entry = entry
            self.session.seal()
            self._show_editor(self.reading.problems if self.reading else ())
        editors = self.query_one("#editors", ContentSwitcher)
        current = editors.current
        target = None
        if current == "state-editor":
            editor = self.query_one(StateEditor)
            target = editor.query_one("#end-form Field") if editor.has_class("-end") else editor.query_one(OutcomeTable)
        elif current == "family-editor":
            self.query_one(FamilyEditor).focus_tabs()
            return
        elif current == "strategy-editor":
            target = self.query_one(StrategyTable)
        elif current == "params-editor":
            target = self.query_one("#params-table")
        elif current == "deck-editor":
            target = self.query_one(CardCounts)
        elif current in ("setup-editor", "session-editor"):
            target = self.query_one(f"#{current} Field")
        if current == "deck-editor" and target not in self.focus_chain:
            target = self.query_one(DeckEditor)  # no deck yet: its keys add one
        if isinstance(target, Field):
            target.enter()
        elif target is not None:
            self.set_focus(target)

    def escape_in_edit(self) -> None:
        """Esc in a field goes back to the table of its editor, where it is shown, else to the list; the
        focus chain holds exactly the widgets that can take focus now."""
        focused = self.focused
        if isinstance(focused, Field):
            for ancestor in focused.ancestors:
                if isinstance(ancestor, OutcomesPanel):
                    target = ancestor.table
                elif isinstance(ancestor, StrategyEditor):
                    target = ancestor.query_one(StrategyTable)
                elif isinstance(ancestor, ParamsEditor):
                    target = ancestor.query_one("#params-table")
                elif isinstance(ancestor, DeckEditor):
                    target = ancestor.query_one(CardCounts)
                elif isinstance(ancestor, StateEditor):  # a field of the draw, above the outcomes
                    target = ancestor.query_one(OutcomeTable)
                elif isinstance(ancestor, FamilyEditor):
                    target = ancestor.query_one("#family-tabs Tabs")
                else:
                    continue
                if target in self.focus_chain:
                    self.set_focus(target)
                    return
                break
        self.set_focus(self.query_one(Navigator))

    # ----- messages from the editors -----

    def on_navigator_picked(self, event: Navigator.Picked) -> None:
        event.stop()
        if event.entry == self.entry:
            return
        self.entry = event.entry
        self.session.seal()
        self._show_editor(self.reading.problems if self.reading else ())

    def on_navigator_command(self, event: Navigator.Command) -> None:
        event.stop()
        if self.session.document is not None:
            members = getattr(self.reading, "members", {}) if self.reading else {}
            entry_command(self, self.session.document, event.command, event.entry, members)

    def on_outcome_command(self, event: OutcomeCommand) -> None:
        event.stop()
        if self.session.document is not None:
            outcome_command(self, self.session.document, event.command, event.owner, event.family, event.action)

    def on_params_editor_param_command(self, event: ParamsEditor.ParamCommand) -> None:
        event.stop()
        if self.session.document is not None:
            param_command(self, self.session.document, event.command, event.name)
