"""The workbench: edit the game on the left, see every figure, exact beside decimal, everywhere.

The screen owns the open file (an ``EditSession``), the views and their keys. Editors post
``EditRequested``; the screen applies the edit, records it for undo, refreshes the editors from the
document and starts the background jobs (``jobs.py``): read the new text, then solve the round. Its
parts are mixins beside it, one concept each: the Edit view (``edit_view.py``), the views of figures
(``figure_views.py``), the jobs and their ends (``jobs.py``) and saving (``saving.py``).
"""

from __future__ import annotations

from pathlib import Path

from textual import on
from textual.app import ComposeResult
from textual.binding import Binding
from textual.screen import Screen
from textual.widgets import ContentSwitcher, Footer, Static, TextArea

from oddsbench.model.visible import visible
from oddsbench.tui.editing import EditSession
from oddsbench.tui.screens.workbench.edit_view import EditView
from oddsbench.tui.screens.workbench.figure_views import FigureViews
from oddsbench.tui.screens.workbench.horizon_view import HorizonViews
from oddsbench.tui.screens.workbench.jobs import Jobs
from oddsbench.tui.screens.workbench.layout import FIGURE_VIEWS, workbench_layout
from oddsbench.tui.screens.workbench.recovery import RecoveryCopy
from oddsbench.tui.screens.workbench.saving import Saving
from oddsbench.tui.widgets.edits import EditRequested
from oddsbench.tui.widgets.navigator import STATE, Navigator
from oddsbench.tui.widgets.source_view import SOURCE_HEADING, SOURCE_HEADING_CONTROLS
from oddsbench.tui.widgets.topbar import TopBar

WIDE = 150
TALL = 36  # rows from which the detail pane has room for more lines
ROOMY = 100  # columns from which the footer spaces its keys and names Ctrl+P (F1 lists it anyway)


class WorkbenchScreen(EditView, FigureViews, HorizonViews, Jobs, Saving, Screen):
    """One open ruleset: editors, problems, figures and cautions."""

    AUTO_FOCUS = None  # the focus follows the view shown (on_screen_resume), not the first focusable widget

    BINDINGS = [
        # The views' keys come first, even in the source text (whose own F6 and F7 select text).
        Binding("f2", "view('edit')", "Edit view", show=False, priority=True),
        Binding("f3", "view('round')", "Round view", show=False, priority=True),
        Binding("f4", "view('strategies')", "Strategies view", show=False, priority=True),
        Binding("f5", "view('sessions')", "Sessions view", show=False, priority=True),
        Binding("f6", "view('source')", "Source view", show=False, priority=True),
        Binding("f7", "view('simulation')", "Simulation view", show=False, priority=True),
        Binding("f8", "write_report", "Write a report (md, csv, json)", show=False, priority=True),
        Binding("f10", "view('horizon')", "Horizon view", show=False, priority=True),
        Binding("ctrl+s", "save", "Save", priority=True),
        Binding("f12", "save_as", "Save as", show=False),
        Binding("ctrl+z", "undo", "Undo", show=False, priority=True),
        Binding("ctrl+y", "redo", "Redo", show=False, priority=True),
        Binding("ctrl+o", "open", "Open a ruleset", show=False),
        Binding("ctrl+n", "new", "New ruleset from the template", show=False),
        Binding("escape", "escape", "Cancel a solve or a run; back to the table or list", show=False),
        Binding("ctrl+r", "resolve", "Solve again (in Simulation: run)", show=False),
        Binding("s", "next_strategy", "Next strategy (round, strategies, horizon)", show=False),
        Binding("g", "next_goal", "Next goal of the best play (strategies)", show=False),
    ]

    def __init__(self, session: EditSession, folder: Path) -> None:
        super().__init__()
        self.session = session
        self.folder = folder
        self.strategy: str | None = None
        self.entry: str | None = None
        self.force_fields = False  # set while undo/redo/source edits put document values into fields
        self.init_jobs()
        self.init_figure_views()
        self.init_horizon_view()
        self.recovery = RecoveryCopy()

    # ----- layout -----

    def compose(self) -> ComposeResult:
        yield from workbench_layout()

    def on_mount(self) -> None:
        self.query_one("#progress").display = False
        self.query_one("#source-text", TextArea).cursor_blink = getattr(self.app, "cursor_blinks", True)
        self._fit_width(self.app.size.width, self.app.size.height)
        self._fit_detail()
        document = self.session.document
        start = document.head().get("start") if document is not None else None
        self.refresh_document(STATE + start if start and start in document.state_names() else None)
        self.query_one(Navigator).focus()

    def on_unmount(self) -> None:
        self.recovery.release()

    def on_resize(self, event) -> None:
        self._fit_width(event.size.width, event.size.height)

    def _fit_width(self, width: int, height: int | None = None) -> None:
        self.set_class(width >= WIDE, "-wide")
        self.set_class((height or self.app.size.height) >= TALL, "-tall")
        for footer in self.query(Footer):  # one line at any width: never a wrapped key
            footer.compact = width < ROOMY
            footer.show_command_palette = width >= ROOMY
        if self.is_mounted:
            self._update_topbar()

    # ----- showing the document -----

    def refresh_document(self, select: str | None = None) -> None:
        """Every editor from the document, then a fresh read and solve in the background."""
        self._update_topbar()
        document = self.session.document
        navigator = self.query_one(Navigator)
        problems = self.reading.problems if self.reading else ()
        navigator.disabled = document is None
        if document is not None:
            navigator.show(document, select, self._failing_states(problems))
        self._show_editor(problems)
        self.show_toml_problem()
        if self.query_one("#views", ContentSwitcher).current == "source":
            self._fill_source()
        self.sync_recovery()
        self.analyse()

    # ----- recovery copy -----

    def sync_recovery(self) -> None:
        """Unsaved changes are kept in a recovery copy; back at the saved text, the copy goes."""
        warning = self.recovery.sync(self.session)
        if warning:
            self.notify(warning, severity="warning")

    def drop_recovery(self) -> None:
        """The unsaved changes were saved or given up: their recovery copy is no longer wanted."""
        self.recovery.drop()

    def _update_topbar(self) -> None:
        current = self.query_one("#views", ContentSwitcher).current
        self.query_one(TopBar).show(current, self.session, self.solving, self.status_note)

    def _fill_source(self) -> None:
        area = self.query_one("#source-text", TextArea)
        shown = visible(self.session.text, multiline=True)
        if area.text != shown:
            area.load_text(shown)
        heading = SOURCE_HEADING if shown == self.session.text else SOURCE_HEADING_CONTROLS
        self.query_one("#source-heading", Static).update(heading)

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
            message = event.done(outcome.result) if event.done is not None else None
            if message:
                self.notify(message)

    @on(TextArea.Changed, "#source-text")
    def _source_changed(self, event: TextArea.Changed) -> None:
        text = event.text_area.text
        if text != visible(self.session.text, multiline=True):  # an edit, not the file shown
            self.session.replace_text(text)
            self.refresh_forms()

    # ----- actions -----

    def action_view(self, view: str) -> None:
        switcher = self.query_one("#views", ContentSwitcher)
        switcher.current = view
        self.session.seal()
        self._fit_detail()
        if view == "source":
            self._fill_source()
        self._focus_view(view)
        if view == "strategies":
            self.compare_strategies()
        elif view == "sessions":
            self.compare_sessions()
        elif view == "horizon":
            self.solve_horizon()
        if view in FIGURE_VIEWS:
            self._announce_first_figure()
        self._update_topbar()

    def _focus_view(self, view: str) -> None:
        """The focus goes to the view shown: keys never reach a widget the user cannot see."""
        target = {
            "source": "#source-text",
            "round": "#round-table",
            "strategies": "#strategies-table",
            "sessions": "#plans-field",
            "simulation": "#sim-trials",
            "horizon": "#horizon-rounds",
        }.get(view)
        wanted = self.query_one(target) if target else self.query_one(Navigator)
        chain = self.focus_chain
        if wanted not in chain:  # hidden (a table with nothing to show): the first that can take it in the view
            shown = self.query_one(f"#{view}")
            wanted = next((widget for widget in chain if shown in widget.ancestors_with_self), None)
        self.set_focus(wanted)

    def on_screen_resume(self) -> None:
        """Back from the help or a dialog: if what had the focus is hidden now (Textual would give it
        to the state list, hidden behind another view), the view shown takes it."""
        if self.focused is None or self.focused not in self.focus_chain:
            self._focus_view(self.query_one("#views", ContentSwitcher).current or "edit")

    def action_undo(self) -> None:
        step = self.session.undo()
        if step is None:
            self.notify("nothing to undo")
            return
        self.notify(f"undone: {step.label}")
        self.refresh_forms()

    def action_redo(self) -> None:
        step = self.session.redo()
        if step is None:
            self.notify("nothing to redo")
            return
        self.notify(f"redone: {step.label}")
        self.refresh_forms()

    def refresh_forms(self) -> None:
        """Show the document again with every form refilled from the text (after undo, redo or a
        recovered copy, where the text changed under the fields)."""
        self.force_fields = True
        try:
            self.refresh_document()
        finally:
            self.force_fields = False

    def action_escape(self) -> None:
        busy = {
            "analysis": self.solving,
            "strategies": self.strategy_comparison.busy,
            "sessions": self.session_comparison.busy,
            "simulation": self.simulating,
            "horizon": self.horizon_comparison.busy,
            "report": self.writing_report,
        }
        if any(busy.values()):
            for group in (group for group, running in busy.items() if running):
                self.workers.cancel_group(self, group)  # each job's end is shown in on_worker_state_changed
            return
        if self.current_view == "edit":
            self.escape_in_edit()
        elif self.current_view == "horizon":
            self.escape_in_horizon()

    def action_open(self) -> None:
        self.app.action_open()

    def action_new(self) -> None:
        self.app.action_new()
