"""Round figures as rows (for tables and the TUI) and as the documented JSON object."""

from __future__ import annotations

from typing import Any

from oddsbench.model.numbers import text
from oddsbench.report.cautions import CAUTIONS, caution_block
from oddsbench.report.numbers_text import decimal_text, exact_text, render_table
from oddsbench.solve.round import Figure, RoundFigures

LABELS = {
    "expected_net": "expected net",
    "expected_staked": "expected staked",
    "house_edge": "house edge",
    "return_to_player": "return to player",
    "net_variance": "net variance",
    "expected_steps": "expected steps",
    "steps_variance": "steps variance",
    "ended_by": "ended by step N",
}
PERCENT_FIGURES = frozenset({"house_edge", "return_to_player", "ended_by"})


def figure_label(name: str, rounds: int | None = None) -> str:
    label = LABELS.get(name, name.replace("_", " "))
    return label.replace("N", str(rounds)) if name == "ended_by" and rounds is not None else label


def figure_cells(figure: Figure, percent: bool = False, width: int | None = 40) -> tuple[str, str]:
    """(exact, decimal) text of one figure."""
    return exact_text(figure.exact, width), decimal_text(figure.decimal, figure.exact, percent)


def round_rows(figures: RoundFigures) -> list[tuple[str, str, str]]:
    """quantity | exact | decimal rows: the figures, then the chance of each end state."""
    rows = []
    for name, figure in figures.figures.items():
        rows.append((figure_label(name, figures.rounds), *figure_cells(figure, name in PERCENT_FIGURES)))
    for name, figure in figures.end_probability.items():
        result = figures.end_results.get(name)
        label = f"ends in {name!r}" + (f" ({result})" if result else "")
        rows.append((label, *figure_cells(figure, percent=True)))
    for name, figure in figures.end_probability_by_step.items():
        rows.append((f"in {name!r} by step {figures.rounds}", *figure_cells(figure, percent=True)))
    return rows


def round_text(figures: RoundFigures, strategy: str | None = None) -> str:
    """The human output of ``oddsbench solve``."""
    heading = f"{figures.title}: one round from {figures.start!r} ({figures.states} states)"
    if strategy:
        heading += f", strategy {strategy!r}"
    table = render_table(["quantity", "exact", "decimal"], [list(row) for row in round_rows(figures)])
    parts = [heading, "", table]
    if figures.notes:
        parts += ["", "Notes:"] + [f"  - {note}" for note in figures.notes]
    parts += ["", caution_block()]
    return "\n".join(parts)


def figure_json(figure: Figure) -> dict[str, Any]:
    return {"exact": None if figure.exact is None else text(figure.exact), "decimal": figure.decimal}


def round_json(figures: RoundFigures, ruleset_title: str | None = None) -> dict[str, Any]:
    """The documented ``--json`` object of ``oddsbench solve``."""
    body: dict[str, Any] = {name: figure_json(figure) for name, figure in figures.figures.items()}
    body["end_probability"] = {name: figure_json(f) for name, f in figures.end_probability.items()}
    body["result_probability"] = {name: figure_json(f) for name, f in figures.result_probability.items()}
    if figures.rounds is not None:
        body["end_probability_by_step"] = {name: figure_json(f) for name, f in figures.end_probability_by_step.items()}
    out: dict[str, Any] = {
        "ruleset": ruleset_title or figures.title,
        "start": figures.start,
        "states": figures.states,
        "figures": body,
        "notes": list(figures.notes),
        "cautions": list(CAUTIONS),
    }
    if figures.rounds is not None:
        out["rounds"] = figures.rounds
    if figures.actions:
        out["policy"] = dict(figures.actions)
    return out
