"""Round figures as rows (for tables and the TUI) and as the documented JSON object."""

from __future__ import annotations

import re
from typing import TYPE_CHECKING, Any

from oddsbench.model.figure import FLOAT_TINY, Figure
from oddsbench.model.numbers import text
from oddsbench.report.cautions import caution_block
from oddsbench.report.json_output import envelope
from oddsbench.report.numbers_text import exact_text, figure_decimal_text, render_table, shown_log10
from oddsbench.report.return_table_report import net_law_json, return_shares_json, return_table_text

if TYPE_CHECKING:  # result types only: the core (and the engines behind it) load when a question is asked
    from oddsbench.core.results import RoundFigures, RoundResults

LABELS = {
    "expected_net": "expected net",
    "expected_staked": "expected staked",
    "house_edge": "house edge",
    "return_to_player": "return to player",
    "net_variance": "net variance",
    "net_sd": "net sd per unit staked",
    "hit_frequency": "hit frequency (net > 0)",
    "push_probability": "push (net = 0)",
    "loss_probability": "loss (net < 0)",
    "expected_steps": "expected steps",
    "steps_variance": "steps variance",
    "ended_by": "ended by step N",
}
PERCENT_FIGURES = frozenset(
    {"house_edge", "return_to_player", "ended_by", "hit_frequency", "push_probability", "loss_probability"}
)
# A square root (``net_sd``) has an exact value only where it is rational: its cell says why it is empty.
IRRATIONAL = "irrational"
_KEYED = re.compile(r"^(end_probability|result_probability|end_probability_by_step)\[(.*)\]$")


def figure_label(name: str, rounds: int | None = None) -> str:
    label = LABELS.get(name, name.replace("_", " "))
    return label.replace("N", str(rounds)) if name == "ended_by" and rounds is not None else label


def item_label(key: str, end_results: dict[str, str | None] | None = None, rounds: int | None = None) -> str:
    """The label of a figure keyed as the simulation and reports key it (``end_probability[double]``...)."""
    keyed = _KEYED.match(key)
    if not keyed:
        return figure_label(key, rounds)
    kind, name = keyed.groups()
    if kind == "result_probability":
        return f"{name} total"
    if kind == "end_probability_by_step":
        return f"in {name!r} by step {rounds}"
    result = (end_results or {}).get(name)
    return f"ends in {name!r}" + (f" ({result})" if result else "")


def is_percent(key: str) -> bool:
    """Chances and shares are shown with their percent form too."""
    return key in PERCENT_FIGURES or key.startswith(("end_probability", "result_probability"))


def figure_items(figures: RoundFigures) -> list[tuple[str, str, Figure]]:
    """(key, label, figure) for every figure of one round: the figures, each end state's chance, each
    result's total (every 'win' end together...), and the chances by step N when asked."""
    items = [(name, figure_label(name, figures.rounds), f) for name, f in figures.figures.items()]
    keyed = [("end_probability", figures.end_probability), ("result_probability", figures.result_probability)]
    keyed.append(("end_probability_by_step", figures.end_probability_by_step))
    for kind, chances in keyed:
        for name, f in chances.items():
            key = f"{kind}[{name}]"
            items.append((key, item_label(key, figures.end_results, figures.rounds), f))
    return items


def figure_cells(figure: Figure, percent: bool = False, width: int | None = 40) -> tuple[str, str]:
    """(exact, decimal) text of one figure."""
    return exact_text(figure.exact, width), figure_decimal_text(figure, percent)


def round_rows(figures: RoundFigures) -> list[tuple[str, str, str]]:
    """quantity | exact | decimal rows: the figures, then the chance of each end state."""
    rows = []
    for name, figure in figures.figures.items():
        exact, decimal = figure_cells(figure, name in PERCENT_FIGURES)
        rows.append((figure_label(name, figures.rounds), irrational_cell(name, figures) or exact, decimal))
    for name, figure in figures.end_probability.items():
        result = figures.end_results.get(name)
        label = f"ends in {name!r}" + (f" ({result})" if result else "")
        rows.append((label, *figure_cells(figure, percent=True)))
    for name, figure in figures.end_probability_by_step.items():
        rows.append((f"in {name!r} by step {figures.rounds}", *figure_cells(figure, percent=True)))
    return rows + hand_rows(figures)


def irrational_cell(name: str, figures: RoundFigures) -> str | None:
    """``irrational`` for the exact cell of a square root whose radicand is exact but not a square."""
    variance = figures.figures.get("net_variance")
    if name == "net_sd" and figures.figures[name].exact is None and variance is not None and variance.exact is not None:
        return IRRATIONAL
    return None


def hand_rows(figures: RoundFigures) -> list[tuple[str, str, str]]:
    """A round dealt in one draw of k: the hands, all equally likely, counted per end state."""
    hands = figures.hands
    if hands is None:
        return []
    rows = [(f"hands of {hands.count} from {hands.size:,} {hands.kind}s", f"{hands.total:,}", "all equally likely")]
    for name, count in hands.per_end:
        rows.append((f"  hands ending in {name!r}", f"{count:,}", f"{count:,} of {hands.total:,}"))
    return rows


def round_heading(figures: RoundFigures, strategy: str | None = None) -> str:
    """What was solved: the game, the start, the chain's size and the strategy played."""
    heading = f"{figures.title}: one round from {figures.start!r} ({figures.states} states)"
    if strategy:
        heading += f", strategy {strategy!r}"
    return heading


SUMMARY_EXACT_WIDTH = 12  # a summary shows an exact value this short or its decimal alone


def summary_items(figures: RoundFigures, strategy: str | None = None) -> list[tuple[str, str, str]]:
    """The headline figures of a round in a few words each, (label, exact or "", decimal).

    A game of money: house edge, return to player, expected steps. A game of points (stake 0, no
    house edge): the expected result, each result's total (how often a turn scores, busts...) and
    the expected steps. With decisions, the strategy played comes first.
    """
    items: list[tuple[str, str, str]] = []
    if strategy:
        items.append(("strategy", "", repr(strategy)))
    names = [name for name in ("house_edge", "return_to_player") if name in figures.figures]
    if not names:
        names = ["expected_net"]
    for name in names:
        items.append(_summary_item(figure_label(name), figures.figures[name], name in PERCENT_FIGURES))
    if "house_edge" not in figures.figures:
        for result, chance in figures.result_probability.items():
            items.append(_summary_item(f"{result} total", chance, True))
    if "expected_steps" in figures.figures:
        items.append(_summary_item(figure_label("expected_steps"), figures.figures["expected_steps"], False))
    return items


def _summary_item(label: str, figure: Figure, percent: bool) -> tuple[str, str, str]:
    exact = exact_text(figure.exact, None) if figure.exact is not None else ""
    decimal = figure_decimal_text(figure, percent)
    return label, exact if len(exact) <= SUMMARY_EXACT_WIDTH else "", decimal


def round_text(figures: RoundFigures, strategy: str | None = None) -> str:
    """The human output of ``oddsbench solve``."""
    heading = round_heading(figures, strategy)
    table = render_table(["quantity", "exact", "decimal"], [list(row) for row in round_rows(figures)])
    parts = [heading, "", table]
    returns = return_table_text(figures)
    if returns:
        parts += ["", returns]
    if figures.notes:
        parts += ["", "Notes:"] + [f"  - {note}" for note in figures.notes]
    parts += ["", caution_block()]
    return "\n".join(parts)


def figure_json(figure: Figure) -> dict[str, Any]:
    """``{"exact", "decimal", "log10"}``: ``log10`` (of the size) only where a float cannot hold the
    value, and then ``decimal`` is null; ``digits`` where the float engine vouches for fewer than all."""
    power = shown_log10(figure)
    decimal = figure.decimal
    if power is not None or (decimal != 0 and abs(decimal) < FLOAT_TINY):
        decimal = None
    out: dict[str, Any] = {
        "exact": None if figure.exact is None else text(figure.exact),
        "decimal": decimal,
        "log10": power,
    }
    if figure.digits is not None:
        out["digits"] = figure.digits
    return out


def round_result_json(figures: RoundFigures, strategy: str | None = None) -> dict[str, Any]:
    """One round's object: where it starts, the strategy played, every figure (exact text, decimal), notes."""
    body: dict[str, Any] = {name: figure_json(figure) for name, figure in figures.figures.items()}
    body["end_probability"] = {name: figure_json(f) for name, f in figures.end_probability.items()}
    body["result_probability"] = {name: figure_json(f) for name, f in figures.result_probability.items()}
    if figures.rounds is not None:
        body["end_probability_by_step"] = {name: figure_json(f) for name, f in figures.end_probability_by_step.items()}
    result = {
        "start": figures.start,
        "strategy": strategy,
        "states": figures.states,
        "rounds": figures.rounds,
        "figures": body,
        "net_law": net_law_json(figures),
        "return_shares": return_shares_json(figures),
        "policy": dict(figures.actions),
        "notes": list(figures.notes),
    }
    if figures.hands is not None:
        hands = figures.hands
        result["hands"] = {
            "count": hands.count,
            "size": hands.size,
            "kind": hands.kind,
            "total": str(hands.total),  # exact counts are text, as every exact value (past 2^53 too)
            "per_end": {name: str(count) for name, count in hands.per_end},
        }
    return result


def solve_json(results: RoundResults) -> dict[str, Any]:
    """The ``--json`` object of ``oddsbench solve``: one shape for one round, strategies or start states."""
    return envelope(
        "solve",
        {
            "ruleset": results.title,
            "compared": results.compared,
            "results": [round_result_json(column.figures, column.strategy) for column in results.columns],
        },
    )


def solve_text(results: RoundResults, cells: str = "both") -> str:
    """The human output of ``oddsbench solve``: one table, or one column per strategy or start state."""
    if results.compared is None:
        return round_text(results.columns[0].figures, results.columns[0].strategy)
    from oddsbench.report.strategy_report import comparison_text

    return comparison_text(results, cells)
