"""Simulation results beside exact figures, as terminal text and as JSON."""

from __future__ import annotations

from typing import TYPE_CHECKING, Any

from oddsbench.model.numbers import text
from oddsbench.report.cautions import caution_block
from oddsbench.report.json_output import envelope
from oddsbench.report.numbers_text import decimal_text, exact_text, figure_decimal_text, render_table
from oddsbench.report.round_report import item_label

if TYPE_CHECKING:  # result types only: the core (and the engines behind it) load when a question is asked
    from oddsbench.core.results import Check, RoundSample, SessionSettings, Simulation

INSIDE = "inside"
OUTSIDE = "OUTSIDE <<"
NO_EXACT = "no exact value"


def check_label(name: str, sample: RoundSample | None = None) -> str:
    results = dict(zip(sample.end_names, sample.end_results)) if sample is not None else None
    return item_label(name, results)


def check_status(check: Check) -> str:
    if check.exact is None:
        return NO_EXACT
    return OUTSIDE if check.outside else INSIDE


def _number(value: float) -> str:
    return decimal_text(value)


def check_rows(checks: list[Check], sample: RoundSample | None = None) -> list[list[str]]:
    rows = []
    for check in checks:
        exact = check.exact
        rows.append(
            [
                check_label(check.name, sample),
                _number(check.estimate),
                f"[{_number(check.interval.low)}, {_number(check.interval.high)}]",
                exact_text(exact.exact) if exact is not None else "-",
                figure_decimal_text(exact) if exact is not None else "-",
                check_status(check),
            ]
        )
    return rows


def check_table(checks: list[Check], confidence: float, sample: RoundSample | None = None, sessions: bool = False):
    """Estimates beside the exact figures as a screen table: estimate, interval, exact, inside/OUTSIDE."""
    from oddsbench.report.figure_table import FigureTable, row, shown, word
    from oddsbench.report.round_report import is_percent
    from oddsbench.report.session_report import PERCENT, session_label

    rows = []
    for check in checks:
        name = check.name
        label = session_label(name) if sessions else check_label(name, sample)
        percent = name in PERCENT if sessions else is_percent(name)
        interval = f"[{_number(check.interval.low)}, {_number(check.interval.high)}]"
        exact = shown(check.exact, percent) or word("-")
        cells = (word(_number(check.estimate)), word(interval), exact, word(check_status(check)))
        rows.append(row(name, label, cells, "estimate." + (f"session.{name}" if sessions else name)))
    columns = ("estimate", f"{confidence * 100:g} % interval", "exact", "check")
    return FigureTable(columns, tuple(rows))


def verdict(checks: list[Check], confidence: float) -> str:
    compared = [c for c in checks if c.exact is not None]
    outside = [c for c in compared if c.outside]
    level = f"{confidence * 100:g} %"
    if not compared:
        return "No exact values to compare with."
    kind = "exact values" if all(c.exact.exact is not None for c in compared) else "solver values (decimal only)"
    if not outside:
        return f"All {len(compared)} {kind} lie inside their {level} intervals."
    names = ", ".join(check_label(c.name) for c in outside)
    return (
        f"{len(outside)} of {len(compared)} {kind} fall OUTSIDE their {level} intervals: {names}. "
        f"By chance alone about {(1 - confidence) * 100:g} in 100 would; run again with another seed "
        "or more trials to tell chance from a wrong model."
    )


def simulation_text(
    sample: RoundSample,
    checks: list[Check],
    confidence: float,
    strategy: str | None = None,
    solver_notes: tuple[str, ...] = (),
) -> str:
    """The human output of ``oddsbench simulate`` for rounds; ``solver_notes`` from the exact side."""
    heading = f"{sample.title}: {sample.trials:,} simulated rounds from {sample.start!r}, seed {sample.seed}" + (
        f", playing {strategy!r}" if strategy else ""
    )
    speed = (
        f"{sample.seconds:.2f} s, {sample.rounds_per_second:,.0f} rounds/s, "
        f"{sample.steps_taken:,} steps; intervals at {confidence * 100:g} %: "
        "Wilson for chances, normal for means and variances"
    )
    headers = ["quantity", "estimate", f"{confidence * 100:g} % interval", "exact", "exact decimal", "check"]
    table = render_table(headers, check_rows(checks, sample), right={1, 2, 3, 4})
    parts = [heading, speed, "", table, "", verdict(checks, confidence)]
    notes = simulation_notes(sample) + list(solver_notes)
    if notes:
        parts += ["", "Notes:"] + [f"  - {note}" for note in notes]
    parts += ["", caution_block()]
    return "\n".join(parts)


def simulation_notes(sample: RoundSample) -> list[str]:
    notes = []
    if sample.unfinished:
        notes.append(
            f"{sample.unfinished:,} of {sample.trials:,} rounds had not ended after {sample.max_steps:,} steps "
            "and are left out of the means; the estimates lean towards short rounds (raise --max-steps)"
        )
    return notes


def check_json(check: Check) -> dict[str, Any]:
    exact = check.exact
    return {
        "name": check.name,
        "estimate": check.estimate,
        "interval": [check.interval.low, check.interval.high],
        "method": check.method,
        "exact": None if exact is None or exact.exact is None else text(exact.exact),
        "exact_decimal": None if exact is None else exact.decimal,
        "outside": check.outside,
    }


def simulate_text(simulation: Simulation) -> str:
    """The human output of ``oddsbench simulate``: rounds, or one table per plan for sessions."""
    if not simulation.of_sessions:
        notes = simulation.figures.notes if simulation.figures is not None else ()
        return simulation_text(simulation.sample, simulation.checks, simulation.confidence, simulation.play, notes)
    shown = settings_shown(simulation.session)
    line = f"{simulation.title}: sessions " + ", ".join(f"{k} {v}" for k, v in shown.items())
    if simulation.play:
        line += f"; each round playing {simulation.play!r}"
    runs = [(run.sample, run.checks, run.figures) for run in simulation.runs]
    return session_simulation_text(runs, simulation.confidence, line)


def settings_shown(settings: SessionSettings) -> dict[str, Any]:
    """The session settings that are set, as text (whole numbers as numbers)."""
    return {
        name: (text(value) if not isinstance(value, int) else value)
        for name, value in vars(settings).items()
        if value is not None
    }


def simulate_json(simulation: Simulation) -> dict[str, Any]:
    """The ``--json`` object of ``oddsbench simulate``: ``rounds`` (null for sessions) and ``sessions``
    (null for rounds), with every estimate, its interval and the exact figure beside it."""
    rounds = None
    outside = [check.name for check in simulation.checks if check.outside]
    if not simulation.of_sessions:
        sample = simulation.sample
        rounds = {
            "start": sample.start,
            "trials": sample.trials,
            "seconds": sample.seconds,
            "rounds_per_second": sample.rounds_per_second,
            "unfinished": sample.unfinished,
            "policy": dict(sample.actions),
            "estimates": [check_json(check) for check in simulation.checks],
            "notes": simulation_notes(sample) + list(simulation.figures.notes),
        }
    sessions = None
    if simulation.of_sessions:
        plans = []
        for run in simulation.runs:
            sample = run.sample
            outside += [f"{sample.plan}: {check.name}" for check in run.checks if check.outside]
            plans.append(
                {
                    "plan": sample.plan,
                    "trials": sample.trials,
                    "seconds": sample.seconds,
                    "rounds_played": sample.rounds_played,
                    "played_on_chain": sample.played_on_chain,
                    "ends": dict(sample.ends),
                    "estimates": [check_json(check) for check in run.checks],
                    "outside": [check.name for check in run.checks if check.outside],
                    "notes": session_notes(sample) + list(run.figures.notes),
                }
            )
        from oddsbench.report.session_report import settings_json

        sessions = {"settings": settings_json(simulation.session), "plans": plans}
    return envelope(
        "simulate",
        {
            "ruleset": simulation.title,
            "seed": simulation.seed,
            "confidence": simulation.confidence,
            "play": simulation.play,
            "rounds": rounds,
            "sessions": sessions,
            "outside": outside,
        },
    )


def session_heading(sample, timing: bool = True) -> str:
    heading = f"{sample.title}: {sample.trials:,} simulated sessions under plan {sample.plan!r}, seed {sample.seed}"
    if not timing:
        return heading
    where = "by playing the round's chain" if sample.played_on_chain else "drawn from the round's distribution"
    return (
        f"{heading} ({where}; {sample.seconds:.2f} s, {sample.rounds_played:,} rounds, "
        f"{sample.rounds_per_second:,.0f} rounds/s)"
    )


def session_notes(sample) -> list[str]:
    if not sample.unfinished:
        return []
    return [
        f"{sample.unfinished:,} of {sample.trials:,} sessions were still playing after {sample.safety_rounds:,} "
        "rounds and are left out of the means: the estimates lean towards short sessions"
    ]


def session_simulation_text(runs, confidence: float, settings_line: str, solver_notes: tuple[str, ...] = ()) -> str:
    """The human output of ``oddsbench simulate`` for sessions: one table per plan."""
    headers = ["quantity", "estimate", f"{confidence * 100:g} % interval", "exact", "exact decimal", "check"]
    parts = [settings_line]
    notes = list(solver_notes)
    all_checks: list[Check] = []
    for sample, checks, figures in runs:
        parts += ["", session_heading(sample), "", render_table(headers, check_rows(checks), right={1, 2, 3, 4})]
        notes += session_notes(sample) + [f"{sample.plan}: {note}" for note in figures.notes]
        all_checks += checks
    parts += ["", verdict(all_checks, confidence)]
    if notes:
        parts += ["", "Notes:"] + [f"  - {note}" for note in notes]
    parts += ["", caution_block()]
    return "\n".join(parts)
