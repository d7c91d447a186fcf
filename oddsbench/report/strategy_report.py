"""Text and JSON for decisions: strategies side by side, the best play, a strategy's check."""

from __future__ import annotations

import textwrap
from typing import TYPE_CHECKING, Any

from oddsbench.model.figure import Figure
from oddsbench.report.cautions import caution_block
from oddsbench.report.figure_table import FigureTable
from oddsbench.report.json_output import envelope
from oddsbench.report.numbers_text import render_table
from oddsbench.report.round_report import (
    PERCENT_FIGURES,
    figure_cells,
    figure_json,
    figure_label,
    irrational_cell,
    round_result_json,
    round_rows,
)

if TYPE_CHECKING:  # result types only: the core (and the engines behind it) load when a question is asked
    from oddsbench.core.results import BestPolicy, BestResults, RoundResults, StrategyCheck

CELL_KINDS = ("both", "exact", "decimal")

SIDE_BY_SIDE_EXACT_WIDTH = 28
MAX_LISTED_IMPROVEMENTS = 40


def cell(
    figure: Figure | None, percent: bool = False, width: int | None = SIDE_BY_SIDE_EXACT_WIDTH, kind: str = "both"
) -> str:
    """One ``exact | decimal`` cell (or only one of them); ``-`` where a figure does not apply."""
    if figure is None:
        return "-"
    exact, decimal = figure_cells(figure, percent, None)
    if width is not None and len(exact) > width:
        exact = _compact(exact)
    if kind == "exact":
        return exact if figure.exact is not None else f"- | {decimal}"
    if kind == "decimal":
        return decimal
    return f"{exact} | {decimal}"


def _compact(exact: str) -> str:
    """A long fraction as its leading digits and digit counts: ``40609.../36561... (18/17 digits)``."""
    top, _, bottom = exact.partition("/")
    digits = len(top.lstrip("-"))
    if not bottom:
        return f"{top[:7]}... ({digits} digits)"
    return f"{top[:6]}.../{bottom[:5]}... ({digits}/{len(bottom)} digits)"


def comparison_rows(comparison: RoundResults, kind: str = "both") -> tuple[list[str], list[list[str]]]:
    """quantity, then one ``exact | decimal`` column per strategy (or per start state)."""
    first = comparison.figures[0] if comparison.figures else None
    names: list[str] = []
    ends: list[str] = []
    for figures in comparison.figures:
        names += [name for name in figures.figures if name not in names]
        ends += [name for name in figures.end_probability if name not in ends]
    rows = []
    for name in names:
        label = figure_label(name, first.rounds if first else None)
        percent = name in PERCENT_FIGURES
        cells = [cell(f.figures.get(name), percent, kind=kind) for f in comparison.figures]
        for i, figures in enumerate(comparison.figures):
            why = irrational_cell(name, figures)
            if why and kind != "decimal":
                cells[i] = cells[i].replace("-", why, 1)
        rows.append([label] + cells)
    zero = Figure(None, 0.0)
    for name in ends:
        result = next((f.end_results.get(name) for f in comparison.figures if name in f.end_results), None)
        label = f"ends in {name!r}" + (f" ({result})" if result else "")
        cells = []
        for figures in comparison.figures:
            figure = figures.end_probability.get(name)
            if figure is None:  # not reachable under this strategy: chance exactly 0
                figure = Figure(_zero(), 0.0) if figures.exact else zero
            cells.append(cell(figure, percent=True, kind=kind))
        rows.append([label] + cells)
    return ["quantity", *comparison.names], rows


def _zero():
    from oddsbench.model.numbers import QQ

    return QQ(0)


def comparison_text(comparison: RoundResults, kind: str = "both") -> str:
    """Side-by-side output of ``oddsbench solve``: per named strategy, or per start state (``--from``)."""
    count = len(comparison.columns)
    shown = {"both": "exact | decimal", "exact": "exact", "decimal": "decimal"}[kind]
    if comparison.compared != "starts":
        heading = (
            f"{comparison.title}: one round from {comparison.start!r} under each of {count} named "
            f"strateg{'y' if count == 1 else 'ies'} (cells: {shown})"
        )
    else:
        play = f", strategy {comparison.strategy!r}" if comparison.strategy else ""
        heading = f"{comparison.title}: one round from each of {count} start states{play} (cells: {shown})"
    headers, rows = comparison_rows(comparison, kind)
    parts = [heading, "", render_table(headers, rows)]
    notes = []
    for name, figures in zip(comparison.names, comparison.figures):
        for note in figures.notes:
            if all(note in other.notes for other in comparison.figures):
                if f"every strategy: {note}" not in notes:
                    notes.append(f"every strategy: {note}")
            else:
                notes.append(f"{name}: {note}")
    if notes:
        parts += ["", "Notes:"] + [f"  - {note}" for note in notes]
    parts += ["", caution_block()]
    return "\n".join(parts)


def policy_runs(policy: tuple[tuple[str, str], ...]) -> list[tuple[str, str, int, str]]:
    """Consecutive states (in file order) with the same action, as (first, last, count, action)."""
    runs: list[list] = []
    for state, action in policy:
        if runs and runs[-1][3] == action:
            runs[-1][1] = state
            runs[-1][2] += 1
        else:
            runs.append([state, state, 1, action])
    return [tuple(run) for run in runs]


def best_text(best: BestPolicy, every_state: bool = False) -> str:
    """The human output of ``oddsbench best``."""
    parts = [f"{best.title}: best play for goal {best.goal} from {best.start!r}", ""]
    if best.policy:
        if every_state:
            parts.append("Best action in every decision state:")
            rows = [[state, action] for state, action in best.policy]
            parts.append(render_table(["state", "action"], rows, right=set()))
        else:
            parts.append(
                f"Best action in each of the {len(best.policy)} decision states "
                "(consecutive states with the same action on one line):"
            )
            rows = []
            for first, last, count, action in policy_runs(best.policy):
                states = first if count == 1 else f"{first} .. {last}"
                rows.append([states, str(count), action])
            parts.append(render_table(["states", "count", "action"], rows, right={1}))
        parts.append("")
    exact, decimal = figure_cells(best.value, best.goal in ("max-win", "min-loss"))
    parts.append(render_table(["value", "exact", "decimal"], [[best.value_label, exact, decimal]]))
    parts += ["", *textwrap.wrap(f"Certificate: {best.certificate.statement}", 100)]
    if best.certificate.ties:
        parts.append("Ties (the first action listed in the file is reported where the round still surely ends):")
        for tie in best.certificate.ties[:MAX_LISTED_IMPROVEMENTS]:
            parts.append(f"  - {tie.state}: {tie.chosen}, exactly as good as {', '.join(tie.equally_good)}")
        more = len(best.certificate.ties) - MAX_LISTED_IMPROVEMENTS
        if more > 0:
            parts.append(f"  - and {more} more (all in --json)")
    parts.append(
        f"Policy iteration: {best.iterations} evaluation(s); {len(best.reached)} of {len(best.policy)} "
        "decision states are reached under this play."
    )
    if best.figures is not None:
        rows = [list(row) for row in round_rows(best.figures)]
        parts += [
            "",
            "Every figure of the round under this play:",
            render_table(["quantity", "exact", "decimal"], rows),
        ]
        notes = [note for note in best.figures.notes if note not in best.notes]
        if notes:
            parts += [f"  ({note})" for note in notes]
    if best.notes:
        parts += ["", "Notes:"] + [f"  - {note}" for note in best.notes]
    parts += ["", caution_block()]
    return "\n".join(parts)


def best_summary(best: BestPolicy) -> str:
    """The best play in a few lines for a screen that shows its figures elsewhere: the value, the
    action in each run of decision states, the certificate."""
    exact, decimal = figure_cells(best.value, best.goal in ("max-win", "min-loss"))
    parts = [f"{best.value_label}: {exact} = {decimal}" if exact != "-" else f"{best.value_label}: {decimal}"]
    runs = policy_runs(best.policy)
    shown = runs[:MAX_LISTED_IMPROVEMENTS]
    if shown:
        parts.append(f"Best action in each of the {len(best.policy)} decision states:")
        for first, last, count, action in shown:
            states = first if count == 1 else f"{first} .. {last} ({count})"
            parts.append(f"  {states}: {action}")
        if len(runs) > len(shown):
            parts.append(f"  ... and {len(runs) - len(shown)} more runs (oddsbench best --json lists all)")
    parts.append(f"Certificate: {best.certificate.statement}")
    if best.certificate.ties:
        parts.append(f"Ties: {len(best.certificate.ties)} state(s) where another action is exactly as good.")
    parts += [f"Note: {note}" for note in best.notes]
    return "\n".join(parts)


def best_json(results: BestResults) -> dict[str, Any]:
    """The ``--json`` object of ``oddsbench best``: the best play (null when only strategies were checked)
    and every strategy checked against it (an empty list when none was)."""
    return envelope(
        "best",
        {
            "ruleset": results.title,
            "start": results.start,
            "goal": results.goal,
            "best": None if results.best is None else best_play_json(results.best),
            "checks": [check_json(check) for check in results.checks],
        },
    )


def best_play_json(best: BestPolicy) -> dict[str, Any]:
    certificate = best.certificate
    return {
        "value_label": best.value_label,
        "value": figure_json(best.value),
        "policy": dict(best.policy),
        "certified": best.certified,
        "certificate": {
            "holds": certificate.holds,
            "exact": certificate.exact,
            "decision_states": certificate.decision_states,
            "pairs_checked": certificate.pairs_checked,
            "largest_gain": figure_json(certificate.largest_gain),
            "ties": {
                tie.state: {"chosen": tie.chosen, "equally_good": list(tie.equally_good)} for tie in certificate.ties
            },
            "statement": certificate.statement,
        },
        "reached": list(best.reached),
        "iterations": best.iterations,
        "figures": round_result_json(best.figures)["figures"] if best.figures is not None else None,
        "notes": list(best.notes),
    }


def check_text(check: StrategyCheck) -> str:
    """The human output of ``oddsbench best --check-strategy NAME``."""
    percent = check.goal in ("max-win", "min-loss")
    parts = [f"{check.title}: strategy {check.strategy!r} held against goal {check.goal}", ""]
    rows = [
        [f"{check.value_label} under {check.strategy!r}", *figure_cells(check.value, percent)],
        [f"{check.value_label} under the best play", *figure_cells(check.best_value, percent)],
    ]
    parts += [render_table(["value", "exact", "decimal"], rows), ""]
    kind = "exactly" if check.exact else "in floating point only"
    if check.optimal:
        parts += textwrap.wrap(
            f"Optimal: checked {kind} in all {check.decision_states} decision states, no single change of "
            f"action improves any state (Bellman optimality holds for {check.strategy!r}).",
            100,
        )
    else:
        reached = [i for i in check.improvements if i.reached]
        parts.append(
            f"Improvable: in {len(check.improvements)} decision state(s) a single change of action does "
            f"better ({len(reached)} of them reached under the strategy), checked {kind}:"
        )
        rows = [
            [i.state, i.action, i.better, *figure_cells(i.gain), "yes" if i.reached else "no"]
            for i in check.improvements[:MAX_LISTED_IMPROVEMENTS]
        ]
        parts.append(render_table(["state", "plays", "better", "gain exact", "gain decimal", "reached"], rows, {3, 4}))
        more = len(check.improvements) - MAX_LISTED_IMPROVEMENTS
        if more > 0:
            parts.append(f"... and {more} more (all in --json)")
        parts.append("The gain is the rise in that state's value from changing its action alone.")
    if check.notes:
        parts += ["", "Notes:"] + [f"  - {note}" for note in check.notes]
    parts += ["", caution_block()]
    return "\n".join(parts)


def improvement_table(check: StrategyCheck) -> FigureTable:
    """Where a strategy loses against the best play, as a screen table: one row per decision state
    where a single change of action does better, the gain in full."""
    from oddsbench.report.figure_table import FigureTable, row, shown, word

    rows = tuple(
        row("check.gain", i.state, (word(i.action), word(i.better), shown(i.gain), word("yes" if i.reached else "no")))
        for i in check.improvements
    )
    return FigureTable(("plays", "better", "gain", "reached"), rows)


def check_summary(check: StrategyCheck) -> str:
    """One sentence: whether the strategy is optimal for the goal, else in how many states it loses."""
    kind = "exactly" if check.exact else "in floating point only"
    if check.optimal:
        return (
            f"{check.strategy!r} is optimal for {check.goal}: checked {kind} in all {check.decision_states} "
            "decision states, no single change of action does better."
        )
    reached = sum(1 for i in check.improvements if i.reached)
    return (
        f"{check.strategy!r} loses against the best play for {check.goal} in {len(check.improvements)} decision "
        f"state(s), {reached} of them reached under it (checked {kind}); the gain is what changing that "
        "state's action alone would add to its value."
    )


def check_json(check: StrategyCheck) -> dict[str, Any]:
    return {
        "strategy": check.strategy,
        "value_label": check.value_label,
        "value": figure_json(check.value),
        "best_value": figure_json(check.best_value),
        "optimal": check.optimal,
        "exact": check.exact,
        "decision_states": check.decision_states,
        "improvements": [
            {
                "state": i.state,
                "action": i.action,
                "better": i.better,
                "gain": figure_json(i.gain),
                "reached": i.reached,
            }
            for i in check.improvements
        ],
        "notes": list(check.notes),
    }
