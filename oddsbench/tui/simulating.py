"""The Simulation view's work: play the round (or whole sessions) at random through the core and
set every estimate beside its exact figure, as report text. Pure: runs in a thread worker."""

from __future__ import annotations

from collections.abc import Callable
from dataclasses import dataclass

from oddsbench.core.game import Game
from oddsbench.core.settings import SessionRequest, Settings
from oddsbench.core.work import Work
from oddsbench.model.defaults import DEFAULT_ROUND_TRIALS, DEFAULT_SESSION_TRIALS
from oddsbench.model.errors import OddsbenchError
from oddsbench.model.ruleset import Ruleset
from oddsbench.report.figure_table import FigureTable
from oddsbench.tui.analysis import RoundFailure
from oddsbench.tui.setting_ways import problem_line


@dataclass(frozen=True)
class SimulationAsk:
    """What to simulate: ``trials`` (None: the default), ``seed`` (None: a fresh one, reported), rounds
    or sessions (the Sessions view's plans, the file's [session] settings)."""

    trials: int | None
    seed: int | None
    sessions: bool
    plans: tuple[str, ...] = ()

    def total(self) -> int:
        return self.trials or (DEFAULT_SESSION_TRIALS if self.sessions else DEFAULT_ROUND_TRIALS)


@dataclass(frozen=True)
class SimulationResult:
    """A heading, one table per part (the round, or each plan), the verdict and the notes."""

    heading: str
    parts: tuple[tuple[str, FigureTable], ...]
    verdict: str
    outside: int
    notes: tuple[str, ...]
    seed: int


def read_whole_number(text: str, what: str, low: int, high: int) -> int | None:
    """A field's whole number (commas and underscores allowed), None when empty; one line when bad."""
    cleaned = text.strip().replace(",", "").replace("_", "")
    if not cleaned:
        return None
    if not cleaned.isdigit():
        raise OddsbenchError(f"{what}: expected a whole number, got {text.strip()!r}")
    value = int(cleaned)
    if not low <= value <= high:
        raise OddsbenchError(f"{what}: must be from {low:,} to {high:,}, got {value:,}")
    return value


def simulate_text(
    ruleset: Ruleset,
    strategy: str | None,
    ask: SimulationAsk,
    should_stop: Callable[[], bool] | None = None,
    progress: Callable[[int, int], None] | None = None,
) -> SimulationResult | RoundFailure:
    """``oddsbench simulate`` for the workbench: the estimates, their intervals and the exact figures."""
    from oddsbench.core.simulation import simulate
    from oddsbench.report.simulation_report import (
        check_table,
        session_heading,
        session_notes,
        simulation_notes,
        verdict,
    )

    strategies = (strategy,) if strategy is not None and ruleset.has_decisions else ()
    session = SessionRequest(plans=ask.plans) if ask.sessions else None
    settings = Settings(strategies=strategies, trials=ask.trials, seed=ask.seed, session=session)
    work = Work(should_stop=should_stop or (lambda: False), progress=progress or (lambda done, total: None))
    try:
        result = simulate(Game(ruleset.source, ruleset=ruleset), settings, work)
    except OddsbenchError as error:
        return RoundFailure(problem_line(error))
    confidence = result.confidence
    play = f", playing {result.play!r}" if result.play else ""
    if not result.of_sessions:
        sample = result.sample
        heading = f"{result.title}: {sample.trials:,} simulated rounds from {sample.start!r}, seed {result.seed}{play}"
        checks = list(result.checks)
        parts = (("", check_table(checks, confidence, sample)),)
        notes = simulation_notes(sample) + list(result.figures.notes if result.figures else ())
    else:
        heading = f"{result.title}: simulated sessions, seed {result.seed}{play}"
        checks, parts, notes = [], [], []
        for run in result.runs:
            checks += run.checks
            table = check_table(list(run.checks), confidence, sessions=True)
            parts.append((session_heading(run.sample, timing=False), table))
            notes += session_notes(run.sample) + [f"{run.sample.plan}: {note}" for note in run.figures.notes]
        parts = tuple(parts)
    outside = sum(1 for check in checks if check.outside)
    return SimulationResult(heading, parts, verdict(checks, confidence), outside, tuple(notes), result.seed)
