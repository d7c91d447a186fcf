"""Figures of play with no goal (``--goal none``): rows for tables and the workbench, text, and JSON."""

from __future__ import annotations

from typing import TYPE_CHECKING, Any

from oddsbench.model.numbers import text
from oddsbench.report.cautions import caution_block
from oddsbench.report.figure_table import FigureTable, Shown, row, word
from oddsbench.report.numbers_text import decimal_text, render_table

if TYPE_CHECKING:  # result types only: the core (and the engines behind it) load when a question is asked
    from oddsbench.core.results import Certified, NoGoalFigures, NoGoalRuin, RoundsToRuin

WRITTEN_OUT_WIDTH = 90
APPROXIMATION_LABEL = "approximation, not a bound (common practice, no source)"


def _full(value) -> str:
    """Exact text of any size: flint's own str is not bound by Python's 4,300-digit int limit."""
    return str(value)


def _cell(value, width: int | None = 40) -> str:
    """Like ``exact_text`` (cut in the middle with digit counts) but safe for huge rationals."""
    if value is None:
        return "-"
    full = _full(value)
    if width is None or len(full) <= width:
        return full
    parts = full.split("/")

    def short(digits: str) -> str:
        sign = "-" if digits.startswith("-") else ""
        digits = digits.lstrip("-")
        return sign + digits if len(digits) <= 14 else f"{sign}{digits[:5]}...{digits[-3:]} ({len(digits)} digits)"

    return "/".join(short(part) for part in parts)


def _certified_text(value: Certified | None) -> str:
    return "-" if value is None else value.text


def _rounds_cells(rounds: RoundsToRuin, width: int | None = 40) -> tuple[str, str]:
    if rounds.kind == "finite":
        if rounds.exact is not None:
            return _cell(rounds.exact, width), _certified_text(rounds.decimal)
        if rounds.lower is None:
            if rounds.decimal is None:
                return "finite", "not computed"
            return "algebraic", _certified_text(rounds.decimal)
        bounds = f"between {_cell(rounds.lower, width)} and {_cell(rounds.upper, width)}"
        return bounds, _certified_text(rounds.decimal)
    if rounds.kind == "infinite":
        return "infinite", "infinite"
    if rounds.kind == "none":
        return "no ruin", "-"
    return "not defined", "ruin is not certain"


def no_goal_items(figures: NoGoalFigures, width: int | None = 40) -> list[tuple[str, str, str, str]]:
    """(key, label, exact, decimal) of play with no goal; exact values cut to ``width`` (None: in full).
    Keys name each figure's meaning (``report/meanings.py``, after ``no_goal.``)."""
    ruin = figures.ruin
    items: list[tuple[str, str, str, str]] = [
        ("ruin", "ruin chance (play never stops)", ruin.ruin_exact_text, ruin.ruin.text)
    ]
    root = ruin.theta
    if root is not None:
        name = "theta: root in (0, 1) of E[t^X] = 1" if ruin.is_skip_free else "rho: root in (0, 1) of E[t^X] = 1"
        items.append(("root", name, root.exact_text, root.decimal.text))
    if ruin.adjustment_coefficient is not None:
        items.append(("adjustment", "adjustment coefficient R", ruin.adjustment_text, ruin.adjustment_coefficient.text))
    if ruin.lundberg is not None:
        label = "Lundberg upper bound exp(-R x bankroll)"
        items.append(("lundberg", label, ruin.lundberg_exact_text, ruin.lundberg.text))
    if ruin.diffusion is not None and ruin.diffusion_exponent is not None:
        label = "diffusion approximation (rule of thumb)"
        items.append(("diffusion", label, f"exp({text(ruin.diffusion_exponent)})", ruin.diffusion.text))
    if ruin.diffusion_ratio is not None:
        items.append(("diffusion_ratio", "  rule of thumb / exact", "", ruin.diffusion_ratio.text))
    edge_label = "long-run expected result per round" if figures.plan else "expected result per round (edge)"
    items.append(("mean", edge_label, _cell(ruin.mean * figures.walk.grid, width), ""))
    items.append(("rounds_to_ruin", "expected rounds to ruin", *_rounds_cells(ruin.rounds_to_ruin, width)))
    if ruin.rounds_if_ruined is not None:
        label = "expected rounds to ruin, when ruin comes"
        items.append(("rounds_if_ruined", label, *_rounds_cells(ruin.rounds_if_ruined, width)))
    check = ruin.truncation
    if check is not None:
        label = f"check: ruin before the bankroll reaches {_goal_text(figures)}"
        items.append(("truncation", label, _cell(check.lower, width), check.lower_decimal.text))
        power = "theta" if ruin.is_skip_free else "rho"
        items.append(("gap", "  its gap to the answer is at most", f"{power}^{check.goal}", check.gap_bound.text))
    return items


def brief_decimal(digits: str) -> str | None:
    """A proved decimal of many digits in the six significant digits of the other tables (None: not a number)."""
    try:
        value = float(digits)
    except ValueError:
        return None
    return decimal_text(value)


def no_goal_rows(figures: NoGoalFigures) -> list[tuple[str, str, str]]:
    """quantity | exact | decimal rows of play with no goal."""
    return [(label, exact, decimal) for _, label, exact, decimal in no_goal_items(figures)]


def no_goal_table(plans: list[tuple[str, NoGoalFigures]]) -> FigureTable:
    """Plans played with no goal side by side as a screen table (exact values in full)."""
    labels: dict[str, str] = {}
    cells: list[dict[str, Shown]] = []
    for _, figures in plans:
        by_key = {}
        for key, label, exact, decimal in no_goal_items(figures, width=None):
            labels.setdefault(key, label)
            by_key[key] = (
                Shown(exact or None, decimal or "-", brief_decimal(decimal)) if (exact or decimal) else word("-")
            )
        cells.append(by_key)
    rows = tuple(row(f"no_goal.{key}", label, (c.get(key) for c in cells)) for key, label in labels.items())
    return FigureTable(tuple(plan for plan, _ in plans), rows)


def _goal_text(figures: NoGoalFigures) -> str:
    walk, ruin = figures.walk, figures.ruin
    goal_level = ruin.truncation.goal_level if ruin.truncation else 0
    return _cell((goal_level + walk.low - 1) * walk.grid)


def no_goal_explanations(figures: NoGoalFigures) -> list[str]:
    """The sentences under the table: method, error bound, bound, approximation, check."""
    ruin = figures.ruin
    lines: list[str] = []
    if ruin.ruin_exact is not None and ruin.ruin_exact_text != _full(ruin.ruin_exact):
        lines.append(f"Exactly: {ruin.ruin_exact_text} = {_cell(ruin.ruin_exact, WRITTEN_OUT_WIDTH)}.")
    lines.append(f"Method: {ruin.method}.")
    lines.append(f"Error bound of the decimal: {ruin.error_bound}.")
    if ruin.lundberg is not None:
        lines.append(f"Lundberg bound: {ruin.lundberg_text}.")
    if ruin.diffusion is not None:
        lines.append(f"Diffusion figure: {ruin.diffusion_text}: an {APPROXIMATION_LABEL}.")
    else:
        lines.append(f"Diffusion figure: {ruin.why_absent('diffusion')}.")
    comparison = _comparison(ruin)
    if comparison:
        lines.append(comparison)
    lines.append(f"Expected rounds: {ruin.rounds_to_ruin.method}.")
    if ruin.rounds_if_ruined is not None:
        lines.append(f"When ruin comes: {ruin.rounds_if_ruined.method}.")
    if ruin.truncation is not None:
        power = "theta" if ruin.is_skip_free else "rho"
        lines.append(
            f"Check: ruin before a goal, solved in {ruin.truncation.arithmetic} arithmetic, is a lower bound that "
            "rises to the answer; "
            f"the gap is at most {power}^goal; the result above lies inside it"
            f" ({'yes' if ruin.truncation.consistent else 'NO'})."
        )
    return lines


def no_goal_text(figures: NoGoalFigures, title: str = "round", cautions: bool = True) -> str:
    """The human output of ``oddsbench session ... --goal none``."""
    walk, ruin = figures.walk, figures.ruin
    heading = (
        f"{title}: play with no goal, until ruin. Round {figures.round_text}; "
        f"{'plan ' + figures.plan if figures.plan else 'flat bet ' + text(walk.bet)}; "
        f"bankroll {text(walk.bankroll)}. Ruin: the bankroll can no longer cover the minimum bet "
        f"(it needs {text(walk.low * walk.grid)})."
    )
    if walk.floor:
        heading += f" Play also stops at the floor {text(walk.floor)}, counted as ruin here."
    if walk.bottom and figures.plan:
        heading += f" Below {text(walk.full_bet_from)} bets are cut to what the bankroll covers."
    elif walk.bottom:
        cut = ", ".join(text(bet) for bet in sorted({bet for bet, _ in walk.bottom}))
        heading += f" Below {text(walk.full_bet_from)} the bet is cut to what the bankroll covers ({cut})."
    verdict = {
        "certain": "Ruin is certain: probability exactly 1. Reason:",
        "never": "Ruin cannot happen: probability 0. Reason:",
        "possible": "Verdict:",
    }[ruin.verdict]
    table = render_table(["quantity", "exact", "decimal"], [list(row) for row in no_goal_rows(figures)])
    parts = [heading, "", f"{verdict} {ruin.reason}.", "", table, ""]
    parts += no_goal_explanations(figures)
    notes = list(ruin.notes) + [
        f"decimals are shown to at most {ruin.digits} significant digits, each proved by interval "
        "arithmetic (--digits N for more)",
    ]
    parts += ["", "Notes:"] + [f"  - {note}" for note in notes]
    if cautions:
        parts += ["", caution_block()]
    return "\n".join(parts)


def _comparison(ruin: NoGoalRuin) -> str:
    """How far the players' rule of thumb is from the exact figure, in words."""
    ratio = ruin.diffusion_ratio
    if ratio is None:
        return ""
    off = (ratio.value - 1) * 100
    side = "above" if off > 0 else "below"
    return f"The rule of thumb is {abs(off):.3g} % {side} the exact figure (ratio {ratio.text[:10]})."


def _certified_json(value: Certified | None) -> dict[str, Any] | None:
    if value is None:
        return None
    return {"digits": value.text, "radius": value.radius, "log10": value.log10}


def _rounds_json(rounds: RoundsToRuin | None) -> dict[str, Any] | None:
    if rounds is None:
        return None
    return {
        "kind": rounds.kind,
        "exact": None if rounds.exact is None else _full(rounds.exact),
        "lower": None if rounds.lower is None else _full(rounds.lower),
        "upper": None if rounds.upper is None else _full(rounds.upper),
        "decimal": _certified_json(rounds.decimal),
        "method": rounds.method,
    }


def no_goal_json(figures: NoGoalFigures) -> dict[str, Any]:
    """One plan played with no goal, as an object of ``session --json``'s ``plans`` (``goal``: "none")."""
    walk, ruin = figures.walk, figures.ruin
    root = ruin.theta
    check = ruin.truncation
    return {
        "goal": "none",
        "bet": text(walk.bet),
        "bankroll": text(walk.bankroll),
        "grid_unit": text(walk.grid),
        "walk_jumps": {str(jump): text(chance) for jump, chance in walk.jumps},
        "ruin_level": walk.level,
        "verdict": ruin.verdict,
        "reason": ruin.reason,
        "ruin": {
            "exact": None if ruin.ruin_exact is None else _full(ruin.ruin_exact),
            "closed_form": ruin.ruin_exact_text,
            "decimal": _certified_json(ruin.ruin),
            "method": ruin.method,
            "error_bound": ruin.error_bound,
        },
        "root": None
        if root is None
        else {
            "polynomial": root.polynomial_text,
            "exact": root.exact_text,
            "decimal": _certified_json(root.decimal),
        },
        "adjustment_coefficient": _certified_json(ruin.adjustment_coefficient),
        "lundberg_bound": _certified_json(ruin.lundberg),
        "diffusion_approximation": None
        if ruin.diffusion is None
        else {
            **_certified_json(ruin.diffusion),
            "exponent": None if ruin.diffusion_exponent is None else text(ruin.diffusion_exponent),
            "ratio_to_exact": _certified_json(ruin.diffusion_ratio),
            "label": APPROXIMATION_LABEL,
        },
        "expected_result_per_round": text(ruin.mean * walk.grid),
        "expected_rounds_to_ruin": _rounds_json(ruin.rounds_to_ruin),
        "expected_rounds_if_ruined": _rounds_json(ruin.rounds_if_ruined),
        "truncation_check": None
        if check is None
        else {
            "goal_steps": check.goal,
            "lower": None if check.lower is None else _full(check.lower),
            "arithmetic": check.arithmetic,
            "lower_decimal": _certified_json(check.lower_decimal),
            "gap_at_most": _certified_json(check.gap_bound),
            "consistent": check.consistent,
        },
        "notes": list(ruin.notes),
    }
