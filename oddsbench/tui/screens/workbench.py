"""The workbench: edit the game on the left, see every figure, exact beside decimal, everywhere.

The screen owns the open file (an ``EditSession``). Editors post ``EditRequested``; the screen
applies the edit, records it for undo, refreshes the editors from the document and starts a
worker that reads the new text (the problems of ``oddsbench check``) and solves the round.
"""

from __future__ import annotations

from pathlib import Path

from rich.text import Text
from textual import on, work
from textual.app import ComposeResult
from textual.binding import Binding
from textual.containers import Horizontal, Vertical
from textual.screen import Screen
from textual.widgets import ContentSwitcher, Footer, ProgressBar, Static, TextArea
from textual.worker import get_current_worker

from oddsbench.model.document import DocumentError
from oddsbench.model.errors import OddsbenchError, Problem
from oddsbench.model.places import place_of
from oddsbench.model.recovery import discard_recovery, write_recovery
from oddsbench.tui import analysis
from oddsbench.tui.analysis import Reading, RoundFailure, RoundResult
from oddsbench.tui.editing import EditSession
from oddsbench.tui.screens.dialogs import AskName, Choose
from oddsbench.tui.widgets.cautions import CautionsBar
from oddsbench.tui.widgets.edits import EditRequested
from oddsbench.tui.widgets.fields import Field
from oddsbench.tui.widgets.figures import FiguresTable, SummaryLine
from oddsbench.tui.widgets.navigator import PARAMS, SESSION, SETUP, STATE, Navigator
from oddsbench.tui.widgets.problems import ProblemsPanel
from oddsbench.tui.widgets.sessions import SessionsPanel
from oddsbench.tui.widgets.setup_editor import ParamsEditor, SessionEditor, SetupEditor
from oddsbench.tui.widgets.state_editor import StateEditor
from oddsbench.tui.widgets.strategies import StrategiesPanel

VIEWS = (
    ("edit", "Edit", "f2"),
    ("round", "Round", "f3"),
    ("strategies", "Strategies", "f4"),
    ("sessions", "Sessions", "f5"),
    ("source", "Source", "f6"),
)
SHORT_LABELS = {"strategies": "Strat", "sessions": "Sess", "source": "Src"}
GOALS = ("max-return", "max-win", "min-loss", "min-steps")
WIDE = 150


class WorkbenchScreen(Screen):
    """One open ruleset: editors, problems, figures and cautions."""

    BINDINGS = [
        Binding("f2", "view('edit')", "Edit"),
        Binding("f3", "view('round')", "Round"),
        Binding("f4", "view('strategies')", "Strategies", show=False),
        Binding("f5", "view('sessions')", "Sessions", show=False),
        Binding("f6", "view('source')", "Source", show=False),
        Binding("g", "next_goal", "Next goal (strategies)", show=False),
        Binding("ctrl+s", "save", "Save", priority=True),
        Binding("f12", "save_as", "Save as", show=False),
        Binding("ctrl+z", "undo", "Undo", priority=True),
        Binding("ctrl+y", "redo", "Redo", priority=True),
        Binding("ctrl+o", "open", "Open", show=False),
        Binding("ctrl+n", "new", "New", show=False),
        Binding("escape", "escape", "Cancel solve / back to list", show=False),
        Binding("ctrl+r", "resolve", "Solve again", show=False),
        Binding("s", "next_strategy", "Next strategy", show=False),
    ]

    def __init__(self, session: EditSession, folder: Path) -> None:
        super().__init__()
        self.session = session
        self.folder = folder
        self.generation = 0
        self.reading: Reading | None = None
        self.result: RoundResult | None = None
        self.result_generation = -1
        self.solving = False
        self.strategy: str | None = None
        self.status_note = ""
        self.entry: str | None = None
        self.force_fields = False  # set while undo/redo/source edits put document values into fields
        self.goal = GOALS[0]
        self.strategies_result = None
        self.strategies_key: tuple | None = None
        self.strategies_busy = False
        self.plans = analysis.DEFAULT_PLANS
        self.sessions_result = None
        self.sessions_key: tuple | None = None
        self.sessions_busy = False
        self.recovery_for: Path | None = None  # the path whose recovery copy this screen wrote
        self.recovery_failed = False

    # ----- layout -----

    def compose(self) -> ComposeResult:
        yield Static("", id="topbar")
        with ContentSwitcher(initial="edit", id="views"):
            with Horizontal(id="edit"):
                yield Navigator(id="navigator")
                with Vertical(id="editor-area"):
                    with ContentSwitcher(initial="state-editor", id="editors"):
                        yield SetupEditor(id="setup-editor")
                        yield ParamsEditor(id="params-editor")
                        yield SessionEditor(id="session-editor")
                        yield StateEditor(id="state-editor")
                    yield ProblemsPanel(id="problems")
                with Vertical(id="side-figures"):
                    yield Static("", classes="figures-heading", id="side-heading")
                    yield FiguresTable(id="side-table")
            with Vertical(id="round"):
                yield Static("", classes="figures-heading", id="round-heading")
                yield ProgressBar(total=None, show_eta=False, show_percentage=False, id="progress")
                yield FiguresTable(id="round-table")
                yield Static("", id="round-notes")
            with Vertical(id="strategies"):
                yield StrategiesPanel(id="strategies-panel")
            with Vertical(id="sessions"):
                yield SessionsPanel(", ".join(analysis.DEFAULT_PLANS), id="sessions-panel")
            with Vertical(id="source"):
                yield Static(
                    "The file as text: anything the forms do not cover. Edits here are undoable too.",
                    classes="editor-heading",
                )
                yield TextArea("", id="source-text", soft_wrap=False, show_line_numbers=True)
        yield SummaryLine("", id="summary")
        yield CautionsBar(id="cautions")
        yield Footer()

    def on_mount(self) -> None:
        self.query_one("#progress").display = False
        self.query_one("#source-text", TextArea).cursor_blink = getattr(self.app, "cursor_blinks", True)
        self._fit_width(self.app.size.width)
        document = self.session.document
        start = document.head().get("start") if document is not None else None
        self.refresh_document(STATE + start if start and start in document.state_names() else None)
        self.query_one(Navigator).focus()

    def on_resize(self, event) -> None:
        self._fit_width(event.size.width)

    def _fit_width(self, width: int) -> None:
        self.set_class(width >= WIDE, "-wide")
        if self.is_mounted:
            self._update_topbar()

    # ----- showing the document -----

    def refresh_document(self, select: str | None = None) -> None:
        """Every editor from the document, then a fresh read and solve in the background."""
        self._update_topbar()
        document = self.session.document
        navigator = self.query_one(Navigator)
        problems = self.reading.problems if self.reading else ()
        if document is not None:
            navigator.disabled = False
            navigator.show(document, select, self._failing_states(problems))
            self._show_editor(problems)
        else:
            navigator.disabled = True
            self.query_one("#views", ContentSwitcher).current = "source"
        if self.query_one("#views", ContentSwitcher).current == "source":
            self._fill_source()
        self.sync_recovery()
        self.analyse()

    # ----- recovery copy -----

    def sync_recovery(self) -> None:
        """Unsaved changes are kept in a recovery copy; back at the saved text, the copy goes."""
        path = self.session.path
        if self.session.dirty and path is not None:
            if self.recovery_for is not None and self.recovery_for != path:
                discard_recovery(self.recovery_for)
            try:
                write_recovery(path, self.session.text, self.session.saved_text)
            except OddsbenchError as error:
                if not self.recovery_failed:
                    self.notify(f"no recovery copy: {error}", severity="warning")
                self.recovery_failed = True
                return
            self.recovery_for = path
        else:
            self.drop_recovery()

    def drop_recovery(self) -> None:
        """The unsaved changes were saved or given up: their recovery copy is no longer wanted."""
        if self.recovery_for is not None:
            discard_recovery(self.recovery_for)
            self.recovery_for = None

    def _failing_states(self, problems: tuple[Problem, ...]) -> set[str]:
        return {place.state for p in problems if p.is_error if (place := place_of(p)).state}

    def _show_editor(self, problems: tuple[Problem, ...]) -> None:
        document = self.session.document
        if document is None:
            return
        entry = self.query_one(Navigator).current_entry or SETUP
        editors = self.query_one("#editors", ContentSwitcher)
        if entry == SETUP:
            editors.current = "setup-editor"
            self.query_one(SetupEditor).show(document, problems)
        elif entry == PARAMS:
            editors.current = "params-editor"
            self.query_one(ParamsEditor).show(document, problems)
        elif entry == SESSION:
            editors.current = "session-editor"
            self.query_one(SessionEditor).show(document, self._session_problem())
        elif entry.startswith(STATE) and entry[len(STATE) :] in document.state_names():
            editors.current = "state-editor"
            self.query_one(StateEditor).show(document, entry[len(STATE) :], problems)

    def _update_topbar(self) -> None:
        wide = self.app.size.width >= 100
        text = Text()
        if wide:
            text.append(" oddsbench ", style="bold reverse")
        current = self.query_one("#views", ContentSwitcher).current
        for view, label, key in VIEWS:
            style = "bold reverse" if view == current else "dim"
            shown = label if wide else SHORT_LABELS.get(view, label)
            text.append(f" {key.upper()} {shown} ", style=style)
        path = self.session.path
        text.append(f"  {path.name if path else 'new ruleset'}")
        if self.session.read_only and path is not None and wide:
            text.append(" (bundled)", style="dim")
        if self.session.dirty:
            text.append(" ● modified" if wide else " ●", style="bold yellow")
        if self.solving:
            text.append("  solving… Esc cancels", style="bold magenta")
        elif self.status_note:
            text.append(f"  {self.status_note}", style="magenta")
        self.query_one("#topbar", Static).update(text)

    def _fill_source(self) -> None:
        area = self.query_one("#source-text", TextArea)
        if area.text != self.session.text:
            area.load_text(self.session.text)

    # ----- background reading and solving -----

    def analyse(self) -> None:
        self.generation += 1
        self._analyse(self.session.text, self.session.source, self.strategy, self.generation)

    @work(thread=True, exclusive=True, group="analysis")
    def _analyse(self, text: str, source: str, strategy: str | None, generation: int) -> None:
        from oddsbench.core.work import Cancelled as SolveCancelled

        worker = get_current_worker()
        reading = analysis.read(text, source)
        if worker.is_cancelled:
            return
        self.app.call_from_thread(self._show_reading, generation, reading)
        if reading.ruleset is None:
            return
        ruleset = reading.ruleset
        if ruleset.has_decisions and strategy not in {s.name for s in ruleset.strategies}:
            strategy = ruleset.strategies[0].name if ruleset.strategies else None
        self.app.call_from_thread(self._set_solving, generation, True)
        try:
            result = analysis.solve_round_text(ruleset, strategy, should_stop=lambda: worker.is_cancelled)
        except SolveCancelled:
            self.app.call_from_thread(self._cancelled, generation)
            return
        except (OddsbenchError, ArithmeticError, ValueError, MemoryError) as error:
            result = RoundFailure(f"the round could not be solved: {error}")
        if not worker.is_cancelled:
            self.app.call_from_thread(self._show_result, generation, result)

    def _show_reading(self, generation: int, reading: Reading) -> None:
        if generation != self.generation:
            return
        self.reading = reading
        problems = reading.problems
        ruleset = reading.ruleset
        valid = "valid"
        if ruleset is not None:
            ends = sum(1 for state in ruleset.states if state.is_end)
            valid = f"{self.session.source}: valid: {len(ruleset.states)} states, {ends} end states"
        self.query_one(ProblemsPanel).show(problems, valid)
        if self.session.document is not None:
            self.query_one(Navigator).show(self.session.document, failing=self._failing_states(problems))
            self._show_editor(problems)
        if ruleset is None:
            self._show_figures(stale=True)
            self._show_strategies()
        elif self.query_one("#views", ContentSwitcher).current == "strategies":
            self.compare_strategies()
        elif self.query_one("#views", ContentSwitcher).current == "sessions":
            self.compare_sessions()
        if ruleset is None:
            self._show_sessions()

    def _set_solving(self, generation: int, solving: bool) -> None:
        if generation != self.generation:
            return
        self.solving = solving
        self.status_note = ""
        self.query_one("#progress").display = solving
        self._update_topbar()

    def _cancelled(self, generation: int) -> None:
        if generation != self.generation:
            return
        self.solving = False
        self.status_note = "solve cancelled: figures are from the last finished solve (Ctrl+R solves again)"
        self.query_one("#progress").display = False
        self._update_topbar()
        self._show_figures(stale=True)

    def _show_result(self, generation: int, result: RoundResult | RoundFailure) -> None:
        if generation != self.generation:
            return
        self.solving = False
        self.query_one("#progress").display = False
        if isinstance(result, RoundFailure):
            self.status_note = result.message
            self._update_topbar()
            self._show_figures(stale=True)
            return
        self.strategy = result.strategy
        self.result = result
        self.result_generation = generation
        self.status_note = ""
        self._update_topbar()
        self._show_figures(stale=False)

    def _show_figures(self, stale: bool) -> None:
        result = self.result
        summary = self.query_one(SummaryLine)
        if result is None:
            summary.update(Text("no figures yet: the ruleset has problems", style="yellow"))
            for heading in self.query(".figures-heading").results(Static):
                heading.update(Text("no figures yet: the ruleset has problems", style="yellow"))
            return
        summary.show(result, stale)
        heading = Text(result.heading, style="bold")
        if stale:
            heading.append("  (last good figures: the current text has problems)", style="yellow")
        for widget in self.query(".figures-heading").results(Static):
            widget.update(heading)
        for table in self.query(FiguresTable).results(FiguresTable):
            table.show(result)
        notes = self.query_one("#round-notes", Static)
        notes.update("\n".join(f"note: {note}" for note in result.notes))

    def compare_strategies(self) -> None:
        """Solve every strategy and the best play, unless this text and goal are solved already."""
        ruleset = self.reading.ruleset if self.reading else None
        if ruleset is None:
            return
        key = (self.session.text, self.goal)
        if key == self.strategies_key:
            return
        self.strategies_key = key
        self.strategies_busy = True
        self._show_strategies()
        self._compare(ruleset, self.goal, key)

    @work(thread=True, exclusive=True, group="strategies")
    def _compare(self, ruleset, goal: str, key: tuple) -> None:
        from oddsbench.core.work import Cancelled as SolveCancelled

        worker = get_current_worker()
        try:
            result = analysis.strategies_text(ruleset, goal, should_stop=lambda: worker.is_cancelled)
        except SolveCancelled:
            self.app.call_from_thread(self._strategies_cancelled, key)
            return
        except (ArithmeticError, ValueError, MemoryError) as error:
            result = RoundFailure(f"the strategies could not be solved: {error}")
        if not worker.is_cancelled:
            self.app.call_from_thread(self._strategies_done, key, result)

    def _strategies_done(self, key: tuple, result) -> None:
        if key != self.strategies_key:
            return
        self.strategies_busy = False
        self.strategies_result = result
        self._show_strategies()

    def _strategies_cancelled(self, key: tuple) -> None:
        if key == self.strategies_key:
            self.strategies_busy = False
            self.strategies_key = None
            self._show_strategies()

    def _show_strategies(self) -> None:
        stale = self.reading is not None and self.reading.ruleset is None
        self.query_one(StrategiesPanel).show(self.strategies_result, stale=stale, busy=self.strategies_busy)

    def _session_problem(self) -> str | None:
        """The first problem of the [session] table, as the sessions command words it."""
        ruleset = self.reading.ruleset if self.reading else None
        if ruleset is None or not ruleset.session:
            return None
        try:
            analysis.session_settings_of(ruleset)
        except OddsbenchError as error:
            return str(error)
        return None

    def compare_sessions(self) -> None:
        ruleset = self.reading.ruleset if self.reading else None
        if ruleset is None:
            return
        key = (self.session.text, self.plans, self.strategy)
        if key == self.sessions_key:
            return
        self.sessions_key = key
        self.sessions_busy = True
        self._show_sessions()
        self._sessions(ruleset, self.strategy, self.plans, key)

    @work(thread=True, exclusive=True, group="sessions")
    def _sessions(self, ruleset, strategy, plans, key: tuple) -> None:
        from oddsbench.core.work import Cancelled as SolveCancelled

        worker = get_current_worker()
        try:
            result = analysis.sessions_text(ruleset, strategy, plans, should_stop=lambda: worker.is_cancelled)
        except SolveCancelled:
            self.app.call_from_thread(self._sessions_cancelled, key)
            return
        except (ArithmeticError, ValueError, MemoryError) as error:
            result = RoundFailure(f"the sessions could not be solved: {error}")
        if not worker.is_cancelled:
            self.app.call_from_thread(self._sessions_done, key, result)

    def _sessions_done(self, key: tuple, result) -> None:
        if key != self.sessions_key:
            return
        self.sessions_busy = False
        self.sessions_result = result
        self._show_sessions()

    def _sessions_cancelled(self, key: tuple) -> None:
        if key == self.sessions_key:
            self.sessions_busy = False
            self.sessions_key = None
            self._show_sessions()

    def _show_sessions(self) -> None:
        stale = self.reading is not None and self.reading.ruleset is None
        self.query_one(SessionsPanel).show(self.sessions_result, stale=stale, busy=self.sessions_busy)

    @on(SessionsPanel.PlansChanged)
    def _plans_changed(self, event: SessionsPanel.PlansChanged) -> None:
        event.stop()
        panel = self.query_one(SessionsPanel)
        try:
            plans = analysis.parse_plans(event.text)
        except OddsbenchError as error:
            panel.show_plan_problem(str(error))
            return
        panel.show_plan_problem("")
        self.plans = plans
        self.compare_sessions()

    def action_next_goal(self) -> None:
        self.goal = GOALS[(GOALS.index(self.goal) + 1) % len(GOALS)]
        self.notify(f"best play for goal {self.goal}")
        self.compare_strategies()

    # ----- edits -----

    @on(EditRequested)
    def _edit(self, event: EditRequested) -> None:
        event.stop()
        outcome = self.session.apply(event.edit, event.label, event.field)
        if outcome.refused:
            self.notify(outcome.refused, severity="error")
            return
        if outcome.changed:
            self.refresh_document(event.select)

    @on(Navigator.Picked)
    def _picked(self, event: Navigator.Picked) -> None:
        event.stop()
        if event.entry == self.entry:
            return
        self.entry = event.entry
        self.session.seal()
        self._show_editor(self.reading.problems if self.reading else ())

    @on(Navigator.StateCommand)
    def _state_command(self, event: Navigator.StateCommand) -> None:
        event.stop()
        document = self.session.document
        if document is None:
            return
        names = set(document.state_names())

        def free(name: str) -> str | None:
            if not name:
                return "a state name is needed"
            return f"a state named {name!r} already exists" if name in names else None

        if event.command in {"add", "add-end"}:
            kind = "end" if event.command == "add-end" else "outcomes"

            def added(name: str | None) -> None:
                if name:
                    self.post_message(
                        EditRequested(lambda doc: doc.add_state(name, kind), f"new state {name}", select=STATE + name)
                    )

            question = "Name of the new end state" if kind == "end" else "Name of the new state"
            self.app.push_screen(AskName(question, check=free), added)
        elif event.command == "rename":
            old = event.state

            def renamed(name: str | None) -> None:
                if name and name != old:
                    self.post_message(
                        EditRequested(
                            lambda doc: doc.rename_state(old, name), f"rename {old} to {name}", select=STATE + name
                        )
                    )

            self.app.push_screen(
                AskName(
                    f"Rename state {old!r} (every reference follows)",
                    old,
                    check=lambda n: None if n == old else free(n),
                ),
                renamed,
            )
        elif event.command == "delete":
            name = event.state
            self.post_message(EditRequested(lambda doc: doc.delete_state(name), f"delete state {name}"))
            self.notify(f"deleted state {name!r}: Ctrl+Z brings it back")

    @on(ParamsEditor.ParamCommand)
    def _param_command(self, event: ParamsEditor.ParamCommand) -> None:
        event.stop()
        document = self.session.document
        if document is None:
            return
        if event.command == "add":
            taken = {name for name, _ in document.params()}

            def check(name: str) -> str | None:
                if not name.isidentifier():
                    return "a parameter name must be letters, digits and _ (not starting with a digit)"
                return f"a parameter named {name!r} already exists" if name in taken else None

            def added(name: str | None) -> None:
                if name:
                    self.post_message(EditRequested(lambda doc: doc.add_param(name, "0"), f"new parameter {name}"))

            self.app.push_screen(AskName("Name of the new parameter", check=check), added)
        elif event.command == "delete" and event.name:
            name = event.name
            self.post_message(EditRequested(lambda doc: doc.delete_param(name), f"delete parameter {name}"))

    @on(TextArea.Changed, "#source-text")
    def _source_changed(self, event: TextArea.Changed) -> None:
        text = event.text_area.text
        if text != self.session.text:
            self.session.replace_text(text)
            self._refresh_forced()

    # ----- actions -----

    def action_view(self, view: str) -> None:
        switcher = self.query_one("#views", ContentSwitcher)
        if self.session.document is None and view != "source":
            self.notify("the file is not valid TOML: fix it in the source view first", severity="warning")
            view = "source"
        switcher.current = view
        self.session.seal()
        if view == "source":
            self._fill_source()
            self.query_one("#source-text").focus()
        elif view == "round":
            self.query_one("#round-table").focus()
        elif view == "strategies":
            self.query_one("#strategies-table").focus()
            self.compare_strategies()
        elif view == "sessions":
            self.query_one("#plans-field").focus()
            self.compare_sessions()
        else:
            self.query_one(Navigator).focus()
        self._update_topbar()

    def action_undo(self) -> None:
        step = self.session.undo()
        if step is None:
            self.notify("nothing to undo")
            return
        self.notify(f"undone: {step.label}")
        self._refresh_forced()

    def action_redo(self) -> None:
        step = self.session.redo()
        if step is None:
            self.notify("nothing to redo")
            return
        self.notify(f"redone: {step.label}")
        self._refresh_forced()

    def _refresh_forced(self) -> None:
        self.force_fields = True
        try:
            self.refresh_document()
        finally:
            self.force_fields = False

    def action_escape(self) -> None:
        if self.solving or self.strategies_busy or self.sessions_busy:
            if self.solving:
                self.workers.cancel_group(self, "analysis")
                self._cancelled(self.generation)
            if self.strategies_busy:
                self.workers.cancel_group(self, "strategies")
                self._strategies_cancelled(self.strategies_key)
            if self.sessions_busy:
                self.workers.cancel_group(self, "sessions")
                self._sessions_cancelled(self.sessions_key)
            return
        if self.query_one("#views", ContentSwitcher).current == "edit":
            # Esc in a field goes back to the table of its editor, where it is shown (an end state has
            # none), else to the list; the focus chain holds exactly the widgets that can take focus now.
            if isinstance(self.focused, Field):
                editor = self.query_one("#editors", ContentSwitcher).current
                target = {"state-editor": "#outcomes", "params-editor": "#params-table"}.get(editor)
                table = self.query_one(target) if target is not None else None
                if table is not None and table in self.focus_chain:
                    table.focus()
                    return
            self.query_one(Navigator).focus()

    def action_resolve(self) -> None:
        self.analyse()

    def action_next_strategy(self) -> None:
        ruleset = self.reading.ruleset if self.reading else None
        if ruleset is None or not ruleset.has_decisions or not ruleset.strategies:
            self.notify("this game has no decisions, so no strategies to switch")
            return
        names = [s.name for s in ruleset.strategies]
        index = names.index(self.strategy) if self.strategy in names else -1
        self.strategy = names[(index + 1) % len(names)]
        self.notify(f"round solved under strategy {self.strategy!r}")
        self.analyse()

    def action_save(self) -> None:
        if self.session.read_only:
            self.action_save_as()
            return
        self._save(None)

    def action_save_as(self) -> None:
        path = self.session.path
        suggested = self.folder / path.name if path is not None else self.folder / "new-game.toml"
        if path is not None and not self.session.read_only:
            suggested = path

        def check(value: str) -> str | None:
            if not value:
                return "a file name is needed"
            target = Path(value).expanduser()
            if target.is_dir():
                return f"{value} is a folder"
            if not target.parent.is_dir():
                return f"no folder {target.parent}"
            return None

        def chosen(value: str | None) -> None:
            if not value:
                return
            target = Path(value).expanduser()
            if target.exists() and target != self.session.path:

                def answered(answer: str) -> None:
                    if answer == "o":
                        self._save(target)

                self.app.push_screen(
                    Choose(f"{target} exists. Overwrite it?", [("o", "Overwrite"), ("c", "Cancel")]), answered
                )
                return
            self._save(target)

        self.app.push_screen(AskName("Save as (path)", str(suggested), check=check), chosen)

    def _save(self, path: Path | None) -> bool:
        try:
            saved = self.session.save(path)
        except (OddsbenchError, DocumentError) as error:
            self.notify(str(error), severity="error")
            return False
        errors = [p for p in (self.reading.problems if self.reading else ()) if p.is_error]
        message = f"saved {saved}"
        if errors:
            message += f" (with {len(errors)} problem(s): `oddsbench check` will report them)"
        self.notify(message, severity="warning" if errors else "information")
        self.sync_recovery()
        self._update_topbar()
        return True

    def action_open(self) -> None:
        self.app.action_open()

    def action_new(self) -> None:
        self.app.action_new()
