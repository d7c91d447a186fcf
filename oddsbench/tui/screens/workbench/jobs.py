"""The workbench's background jobs as the screen sees them: starting one, and handling each job's
end once (its result, an error shown in its place, or a cancellation), with the first two jobs of
every new text: read it (the problems of ``oddsbench check``), then solve the round.

A mixin of ``WorkbenchScreen`` (``screen.py`` keeps the document, the views and the keys); what each
job runs, off the event loop, is in ``background.py``. The views of figures start their own jobs
(``figure_views.py``) through ``_start`` and are told of their end here.
"""

from __future__ import annotations

from functools import partial

from textual.widgets import ContentSwitcher
from textual.worker import Worker, WorkerState

from oddsbench.tui.analysis import Reading, RoundFailure, RoundResult, strategy_to_play
from oddsbench.tui.screens.workbench import background
from oddsbench.tui.screens.workbench.background import (
    HORIZON,
    READ,
    REPORT,
    ROUND,
    SESSIONS,
    SIMULATION,
    STRATEGIES,
    Job,
)
from oddsbench.tui.widgets.navigator import Navigator
from oddsbench.tui.widgets.problems import ProblemsPanel


class Jobs:
    """Starting the background jobs and showing how each ended (mixed into ``WorkbenchScreen``)."""

    def init_jobs(self) -> None:
        self.generation = 0  # of the text: a job's result for an older text is not shown
        self.reading: Reading | None = None
        self.result: RoundResult | None = None
        self.result_generation = -1
        self.solving = False
        self.status_note = ""
        self.jobs: dict[Worker, Job] = {}  # the background jobs running, by their worker

    def _start(self, job: Job, work, *args) -> None:
        """Run one job in a thread worker; a newer job of its group replaces (cancels) the older."""
        worker = self.run_worker(
            partial(work, *args), name=job.kind, group=job.group, exclusive=True, thread=True, exit_on_error=False
        )
        self.jobs[worker] = job

    def on_worker_state_changed(self, event: Worker.StateChanged) -> None:
        """Every job ends here once: with its result, with an error shown in its place, or cancelled (None)."""
        job = self.jobs.get(event.worker)
        if job is None or event.state not in (WorkerState.SUCCESS, WorkerState.ERROR, WorkerState.CANCELLED):
            return
        del self.jobs[event.worker]
        result = None
        if event.state == WorkerState.SUCCESS:
            result = event.worker.result
        elif event.state == WorkerState.ERROR and not background.is_cancellation(event.worker.error):
            result = job.failure(event.worker.error)
        ended = {
            READ: self._read,
            ROUND: self._solved,
            STRATEGIES: self._strategies_done,
            SESSIONS: self._sessions_done,
            SIMULATION: self._simulated,
            REPORT: self._report_written,
            HORIZON: self._horizon_done,
        }
        ended[job.kind](job.key, result)

    def analyse(self) -> None:
        """Read the text as it is now, then (if valid) solve its round: both in the background."""
        self.generation += 1
        self._start(Job(READ, self.generation), background.read, self.session.text, self.session.source)

    def _read(self, generation: int, reading: Reading | RoundFailure | None) -> None:
        """The new text is read: show its problems, then solve the round if it is valid."""
        if reading is None or generation != self.generation:
            return
        if isinstance(reading, RoundFailure):
            self._show_result(generation, reading)
            return
        self._show_reading(generation, reading)
        ruleset = reading.ruleset
        if ruleset is None:
            return
        strategy = strategy_to_play(ruleset, self.strategy)
        self._set_solving(generation, True)
        self._start(Job(ROUND, generation), background.solve_round, ruleset, strategy)

    def _solved(self, generation: int, result: RoundResult | RoundFailure | None) -> None:
        if result is None:
            self._cancelled(generation)
        else:
            self._show_result(generation, result)

    def _show_reading(self, generation: int, reading: Reading) -> None:
        if generation != self.generation:
            return
        self.reading = reading
        problems = self.shown_problems(reading)
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
        elif self.query_one("#views", ContentSwitcher).current == "horizon":
            self.solve_horizon()
        if ruleset is None:
            self._show_sessions()
            self._show_horizon()

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

    def action_resolve(self) -> None:
        if self.current_view == "simulation":
            self.run_simulation()
            return
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
        self._show_strategies()
