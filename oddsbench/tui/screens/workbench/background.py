"""The background work of the workbench: what each worker runs, off the event loop, and which job it is.

Each job is a plain function of its inputs, run in a thread worker; it polls the worker's
cancellation through ``should_stop`` and returns its result (expected failures become a
``RoundFailure`` to show). The screen starts jobs with ``run_worker`` and handles every worker's
end once, in ``on_worker_state_changed``: success, error and cancellation alike.
"""

from __future__ import annotations

from dataclasses import dataclass

from textual.worker import get_current_worker

from oddsbench.model.errors import OddsbenchError
from oddsbench.tui import analysis
from oddsbench.tui.analysis import Reading, RoundFailure, SolveCancelled
from oddsbench.tui.setting_ways import problem_line

READ, ROUND, STRATEGIES, SESSIONS = "read", "round", "strategies", "sessions"
SIMULATION, REPORT, HORIZON = "simulation", "report", "horizon"
# Jobs in one group replace each other: a new text's reading cancels the solve of the old text.
GROUPS = {
    READ: "analysis",
    ROUND: "analysis",
    STRATEGIES: "strategies",
    SESSIONS: "sessions",
    SIMULATION: "simulation",
    REPORT: "report",
    HORIZON: "horizon",
}
SOLVE_FAILURES = (ArithmeticError, ValueError, MemoryError)  # numbers out of reach, not a bug
FAILED = {
    READ: "the file could not be read",
    ROUND: "the round could not be solved",
    STRATEGIES: "the strategies could not be solved",
    SESSIONS: "the sessions could not be solved",
    SIMULATION: "the simulation could not run",
    REPORT: "the report could not be written",
    HORIZON: "the figures after N rounds could not be found",
}


@dataclass(frozen=True)
class Job:
    """One piece of background work: its kind, and the key its result belongs to (the text's
    generation for reading and the round; the inputs for strategies and sessions)."""

    kind: str
    key: object

    @property
    def group(self) -> str:
        return GROUPS[self.kind]

    def failure(self, error: BaseException) -> RoundFailure:
        """An unexpected error in the job, shown in place of its figures instead of ending the app."""
        return RoundFailure(f"{FAILED[self.kind]}: {error}")


def is_cancellation(error: BaseException | None) -> bool:
    return isinstance(error, SolveCancelled)


def read(text: str, source: str) -> Reading:
    """The problems of ``oddsbench check`` and, when there are none, the ruleset."""
    return analysis.read(text, source)


def solve_round(ruleset, strategy: str | None):
    return _shown(ROUND, (OddsbenchError, *SOLVE_FAILURES), analysis.solve_round_text, ruleset, strategy)


def compare_strategies(ruleset, goal: str):
    return _shown(STRATEGIES, SOLVE_FAILURES, analysis.strategies_text, ruleset, goal)


def compare_sessions(ruleset, strategy: str | None, plans):
    return _shown(SESSIONS, SOLVE_FAILURES, analysis.sessions_text, ruleset, strategy, plans)


def simulate(ruleset, strategy: str | None, ask, progress):
    """Play at random through the core; ``progress(done, total)`` is called from this thread."""
    from oddsbench.tui.simulating import simulate_text

    return _shown(SIMULATION, SOLVE_FAILURES, simulate_text, ruleset, strategy, ask, progress=progress)


def horizon(ruleset, strategy: str | None, rounds: tuple[int, ...]):
    """The total net after each number of rounds, through the core."""
    from oddsbench.tui.horizons import horizon_text

    return _shown(HORIZON, SOLVE_FAILURES, horizon_text, ruleset, strategy, rounds)


def write_report(ruleset, text: str, plans, path, force: bool):
    from oddsbench.tui.reporting import write_report as write

    return _shown(REPORT, (OSError, *SOLVE_FAILURES), write, ruleset, text, plans, path, force)


def _shown(kind: str, expected: tuple[type[BaseException], ...], solve, *args, **options):
    """Run ``solve`` with the worker's cancel check; an expected failure becomes a message to show."""
    worker = get_current_worker()
    try:
        return solve(*args, should_stop=lambda: worker.is_cancelled, **options)
    except SolveCancelled:
        raise
    except expected as error:
        return RoundFailure(f"{FAILED[kind]}: {problem_line(error)}")


class Comparison:
    """A view solved in the background (strategies, sessions, horizon): the inputs last asked for, whether
    their job runs, and the last result. A job's end counts only for the inputs last asked for."""

    def __init__(self) -> None:
        self.key: object = None
        self.busy = False
        self.result = None

    def ask(self, key: object) -> bool:
        """Start on ``key``; False when these inputs are solved or under way already."""
        if key == self.key:
            return False
        self.key, self.busy = key, True
        return True

    def ended(self, key: object, result) -> bool:
        """The job for ``key`` ended with ``result`` (None: cancelled); True when the view changes."""
        if key != self.key:
            return False
        self.busy = False
        if result is None:
            self.key = None  # asked again, the same inputs are solved again
        else:
            self.result = result
        return True

    def refused(self, key: object) -> bool:
        """The job for ``key`` ended in a refusal that asking again would repeat: the last result stays
        and these inputs are not asked for again until they change. True when the view changes."""
        if key != self.key:
            return False
        self.busy = False
        return True
