"""The views of figures on the workbench screen: Round, Strategies, Sessions and Simulation, the
detail pane under them, the cells switch (exact, decimal, both), and writing a report.

A mixin of ``WorkbenchScreen`` (``screen.py`` keeps the document, the reading and the keys): each
view asks its background job (``background.py``) and shows the report text it gets back. Message
handlers are named ``on_...`` so Textual finds them through the screen's class.
"""

from __future__ import annotations

from pathlib import Path

from rich.text import Text
from textual.message import Message
from textual.widgets import ContentSwitcher, Static

from oddsbench.model.errors import OddsbenchError
from oddsbench.report.figure_table import CELL_KINDS
from oddsbench.tui import analysis
from oddsbench.tui.analysis import RoundFailure
from oddsbench.tui.plain import plain
from oddsbench.tui.reporting import report_path_problem, suggested_report_path
from oddsbench.tui.screens.dialogs import AskName, Choose
from oddsbench.tui.screens.workbench import background
from oddsbench.tui.screens.workbench.background import REPORT, SESSIONS, SIMULATION, STRATEGIES, Comparison, Job
from oddsbench.tui.screens.workbench.layout import FIGURE_VIEWS
from oddsbench.tui.simulating import SimulationAsk, read_whole_number
from oddsbench.tui.widgets.detail import DetailPane, FigureScreen
from oddsbench.tui.widgets.figure_grid import FigureGrid
from oddsbench.tui.widgets.figures import SummaryLine
from oddsbench.tui.widgets.sessions import SessionsPanel
from oddsbench.tui.widgets.simulation import SimulationPanel
from oddsbench.tui.widgets.stale import marked_heading
from oddsbench.tui.widgets.strategies import StrategiesPanel

MAX_SEED = 2**63 - 1
MAX_TRIALS = 10**9  # the workbench's own ceiling: a run of minutes at most (the command line allows more)


class SimulationProgress(Message):
    """From the simulation's thread: ``done`` of ``total`` trials played."""

    def __init__(self, done: int, total: int) -> None:
        super().__init__()
        self.done = done
        self.total = total


class FigureViews:
    """State and behaviour of the views of figures (mixed into ``WorkbenchScreen``)."""

    def init_figure_views(self) -> None:
        self.cells = CELL_KINDS[0]
        self.goal = GOALS[0]
        self.strategy_comparison = Comparison()
        self.plans = analysis.DEFAULT_PLANS
        self.session_comparison = Comparison()
        self.simulation = None  # the last simulation's result (or why it could not run)
        self.simulating = False
        self.writing_report = False

    @property
    def strategies_result(self):
        """The strategies side by side (or why they could not be solved), as last solved."""
        return self.strategy_comparison.result

    @property
    def sessions_result(self):
        """The plans' sessions side by side (or why they could not be solved), as last solved."""
        return self.session_comparison.result

    @property
    def current_view(self) -> str:
        return self.query_one("#views", ContentSwitcher).current or "edit"

    # ----- the round -----

    def _show_figures(self, stale: bool) -> None:
        result = self.result
        summary = self.query_one(SummaryLine)
        if result is None:
            message = Text("no figures yet: the ruleset has problems", style="yellow")
            summary.update(message)
            for heading in self.query(".figures-heading").results(Static):
                if heading.id in ("round-heading", "side-heading"):
                    heading.update(message)
            return
        summary.show(result, stale)
        heading = marked_heading(result.heading, stale)
        for widget_id in ("#round-heading", "#side-heading"):
            self.query_one(widget_id, Static).update(heading)
        for grid_id in ("#round-table", "#side-table"):
            self.query_one(grid_id, FigureGrid).show(result.table, self.cells)
        for name, text, table in (
            ("law", result.law_heading, result.law),
            ("shares", result.shares_heading, result.shares),
        ):
            self.query_one(f"#{name}-heading", Static).update(plain(text))
            grid = self.query_one(f"#{name}-table", FigureGrid)
            grid.show(table, self.cells)
            grid.display = bool(table)
        notes = self.query_one("#round-notes", Static)
        notes.update(plain("\n".join(f"note: {note}" for note in result.notes)))

    # ----- the detail pane and the cells -----

    def on_figure_grid_highlighted(self, event: FigureGrid.Highlighted) -> None:
        event.stop()
        in_view = self.query_one(f"#{self.current_view}") in event.grid.ancestors
        if event.grid.has_focus or (in_view and not isinstance(self.focused, FigureGrid)):
            self.query_one(DetailPane).show(event.row, event.column_name, event.cell)

    def _announce_first_figure(self) -> None:
        """A view was opened: the detail pane shows its first table's highlighted figure, or says how."""
        view = self.query_one(f"#{self.current_view}")
        for grid in view.query(FigureGrid).results(FigureGrid):
            if grid.table and grid.display:
                grid.announce()
                return
        self.query_one(DetailPane).clear_figure()

    def on_figure_grid_opened(self, event: FigureGrid.Opened) -> None:
        event.stop()
        self.app.push_screen(FigureScreen(event.row, event.column_name, event.cell))

    def on_figure_grid_cells_cycled(self, event: FigureGrid.CellsCycled) -> None:
        event.stop()
        self.cells = CELL_KINDS[(CELL_KINDS.index(self.cells) + 1) % len(CELL_KINDS)]
        for grid in self.query(FigureGrid).results(FigureGrid):
            grid.set_kind(self.cells)
        fitted = event_grid_kind(self.focused)
        shown = f" (shown: {fitted})" if fitted and fitted != self.cells else ""
        self.notify(f"cells: {self.cells}{shown}; the detail pane shows every figure whole", timeout=3)

    def _fit_detail(self) -> None:
        self.set_class(self.current_view in FIGURE_VIEWS, "-figures")

    # ----- strategies -----

    def compare_strategies(self) -> None:
        """Solve every strategy and the best play, unless this text and goal are solved already."""
        ruleset = self.reading.ruleset if self.reading else None
        comparison = self.strategy_comparison
        if ruleset is not None and comparison.ask((self.session.text, self.goal)):
            self._show_strategies()
            self._start(Job(STRATEGIES, comparison.key), background.compare_strategies, ruleset, self.goal)

    def _strategies_done(self, key: tuple, result) -> None:
        if self.strategy_comparison.ended(key, result):
            self._show_strategies()

    def _show_strategies(self) -> None:
        stale = self.reading is not None and self.reading.ruleset is None
        comparison = self.strategy_comparison
        panel = self.query_one(StrategiesPanel)
        panel.show(comparison.result, stale=stale, busy=comparison.busy, strategy=self.strategy, kind=self.cells)

    def action_next_goal(self) -> None:
        self.goal = GOALS[(GOALS.index(self.goal) + 1) % len(GOALS)]
        self.notify(f"best play for goal {self.goal}")
        self.compare_strategies()

    # ----- sessions -----

    def compare_sessions(self) -> None:
        """Solve every plan's session, unless this text, these plans and this strategy are solved already."""
        ruleset = self.reading.ruleset if self.reading else None
        comparison = self.session_comparison
        if ruleset is not None and comparison.ask((self.session.text, self.plans, self.strategy)):
            self._show_sessions()
            self._start(Job(SESSIONS, comparison.key), background.compare_sessions, ruleset, self.strategy, self.plans)

    def _sessions_done(self, key: tuple, result) -> None:
        if self.session_comparison.ended(key, result):
            self._show_sessions()

    def _show_sessions(self) -> None:
        stale = self.reading is not None and self.reading.ruleset is None
        comparison = self.session_comparison
        self.query_one(SessionsPanel).show(comparison.result, stale=stale, busy=comparison.busy, kind=self.cells)

    def on_sessions_panel_plans_changed(self, event: SessionsPanel.PlansChanged) -> None:
        """New plans: solved at once; a plan that does not read keeps the last good figures, marked."""
        event.stop()
        panel = self.query_one(SessionsPanel)
        try:
            plans = analysis.parse_plans(event.text)
        except OddsbenchError as error:
            panel.show_plan_problem(str(error))
            self._show_sessions()
            return
        panel.show_plan_problem("")
        self.plans = plans
        self._show_sessions()
        self.compare_sessions()

    # ----- simulation -----

    def on_simulation_panel_run_requested(self, event: SimulationPanel.RunRequested) -> None:
        event.stop()
        self.run_simulation(event.trials, event.seed, event.sessions)

    def run_simulation(self, trials_text: str | None = None, seed_text: str | None = None, sessions=None) -> None:
        panel = self.query_one(SimulationPanel)
        if trials_text is None:
            panel.request()  # read the fields, then come back here
            return
        ruleset = self.reading.ruleset if self.reading else None
        if ruleset is None:
            panel.show_message("the ruleset has problems: fix them first (F2)")
            return
        try:
            trials = read_whole_number(trials_text, "trials", 1, MAX_TRIALS)
            seed = read_whole_number(seed_text, "seed", 0, MAX_SEED)
        except OddsbenchError as error:
            panel.show_message(str(error))
            return
        ask = SimulationAsk(trials, seed, bool(sessions), self.plans if sessions else ())
        self.simulating = True
        panel.started(ask.total())
        screen = self

        def progress(done: int, total: int) -> None:
            screen.post_message(SimulationProgress(done, total))

        self._start(Job(SIMULATION, ask), background.simulate, ruleset, self.strategy, ask, progress)

    def on_simulation_progress(self, event: SimulationProgress) -> None:
        event.stop()
        if self.simulating:
            self.query_one(SimulationPanel).progress(event.done, event.total)

    def _simulated(self, ask: SimulationAsk, result) -> None:
        self.simulating = False
        panel = self.query_one(SimulationPanel)
        panel.ended()
        if result is None:
            panel.show_message("simulation cancelled: the figures shown are from the last finished run")
            return
        self.simulation = result
        panel.show(result, kind=self.cells)
        if not isinstance(result, RoundFailure):
            panel.show_message(f"seed {result.seed}: type it in the seed field to repeat this run", error=False)

    # ----- reports -----

    def action_write_report(self) -> None:
        """Ask for a path (its suffix names the format), then solve and write as ``oddsbench report`` does."""
        ruleset = self.reading.ruleset if self.reading else None
        if ruleset is None:
            self.notify("the ruleset has problems: a report needs a valid ruleset", severity="warning")
            return
        if self.writing_report:
            self.notify("a report is being written (Esc cancels it)")
            return
        text = self.session.text

        def chosen(value: str | None) -> None:
            if not value:
                return
            target = Path(value).expanduser()
            if target.exists():

                def answered(answer: str) -> None:
                    if answer == "r":
                        self._write_report(ruleset, text, target, force=True)

                question = f"{target} exists. Replace it with the new report?"
                self.app.push_screen(Choose(question, [("r", "Replace"), ("c", "Cancel")]), answered)
                return
            self._write_report(ruleset, text, target, force=False)

        default = suggested_report_path(self.session.path, self.folder)
        question = "Write a report (.md, .csv or .json: the suffix names the format)"
        self.app.push_screen(AskName(question, str(default), check=report_path_problem), chosen)

    def _write_report(self, ruleset, text: str, path: Path, force: bool) -> None:
        self.writing_report = True
        self.notify(f"writing the report to {path}…", timeout=2)
        job = Job(REPORT, path)
        self._start(job, background.write_report, ruleset, text, self.plans, path, force)

    def _report_written(self, path: Path, result) -> None:
        self.writing_report = False
        if result is None:
            self.notify("report cancelled: nothing was written", severity="warning")
        elif isinstance(result, RoundFailure):
            self.notify(result.message, severity="error")
        else:
            self.notify(result)


GOALS = ("max-return", "max-win", "min-loss", "min-steps")


def event_grid_kind(widget) -> str | None:
    """The cells a focused grid shows after fitting (they may be fewer than asked for)."""
    if isinstance(widget, FigureGrid) and widget.fitted is not None:
        return widget.fitted.kind
    return None
