"""Session figures as a table with one column per plan, and as the documented JSON object."""

from __future__ import annotations

from typing import TYPE_CHECKING, Any

from oddsbench.model.figure import Figure
from oddsbench.model.numbers import Rational, text, to_float
from oddsbench.report.cautions import caution_block
from oddsbench.report.figure_table import FigureTable, Shown, row, shown
from oddsbench.report.json_output import envelope
from oddsbench.report.numbers_text import csv_decimal, decimal_text, figure_decimal_text, render_table
from oddsbench.report.round_report import figure_json

if TYPE_CHECKING:  # result types only: the core (and the engines behind it) load when a question is asked
    from oddsbench.core.results import RoundDistribution, SessionFigures, SessionResults, SessionSettings

EXACT_WIDTH = 24
SHOWN_FINAL_VALUES = 8
SERIES_POINTS = 11

LABELS = {
    "goal_probability": "reach the goal",
    "ruin_probability": "ruin",
    "floor_probability": "stop at the floor",
    "time_cap_probability": "stopped by the time cap",
    "expected_rounds": "expected rounds",
    "rounds_variance": "rounds variance",
    "expected_staked": "expected total staked",
    "expected_final_bankroll": "expected final bankroll",
    "expected_net": "expected final - start",
    "edge_times_staked": "-(house edge) x staked",
    "first_bet": "first bet",
    "bet_fraction": "bet fraction of bankroll",
    "growth_rate_bits": "growth rate (bits/round)",
    "house_edge": "house edge",
}
WITHIN_LABELS = {
    "within_goal_probability": "goal within N rounds",
    "within_ruin_probability": "ruin within N rounds",
    "within_floor_probability": "floor within N rounds",
    "within_playing_probability": "still playing after N",
    "within_expected_bankroll": "expected bankroll after N",
}
PERCENT = frozenset(
    {"goal_probability", "ruin_probability", "floor_probability", "time_cap_probability", "house_edge"}
    | {name for name in WITHIN_LABELS if name.endswith("probability")}
)


def cell(figure: Figure | None, percent: bool = False) -> str:
    """``exact | decimal`` where an exact value exists, the decimal alone otherwise."""
    if figure is None:
        return "-"
    shown = figure_decimal_text(figure, percent)
    if figure.exact is None:
        return shown
    return f"{compact_exact(figure.exact)} | {shown}"


def compact_exact(value: Rational) -> str:
    """Short exact text for table cells; long values keep their leading digits and digit counts."""
    full = text(value)
    if len(full) <= EXACT_WIDTH:
        return full
    top, _, bottom = full.lstrip("-").partition("/")
    sign = "-" if full.startswith("-") else ""
    if not bottom:
        return f"{sign}{top[:6]}... ({len(top)} digits)"
    return f"{sign}{top[:4]}.../{bottom[:4]}... ({len(top)}/{len(bottom)} digits)"


def session_label(name: str, rounds: int | None = None) -> str:
    if name in WITHIN_LABELS:
        return WITHIN_LABELS[name].replace("N", str(rounds))
    return LABELS.get(name, name.replace("_", " "))


def session_names(results: list[SessionFigures]) -> list[str]:
    """The figures shown for plans side by side, in order (the "within N rounds" ones only when asked)."""
    names: list[str] = []
    for result in results:
        for name in result.figures:
            shown = name in WITHIN_LABELS or not name.startswith("within_")
            if shown and name not in names:
                names.append(name)
    return names


def session_rows(results: list[SessionFigures]) -> list[list[str]]:
    """Figure name | one cell per plan, for the CLI table."""
    rounds = next((r.rounds for r in results if r.rounds is not None), None)
    return [
        [session_label(name, rounds)] + [cell(r.figures.get(name), name in PERCENT) for r in results]
        for name in session_names(results)
    ]


def session_table(results: list[SessionFigures]) -> FigureTable:
    """Plans side by side as a screen table: each cell the exact value in full and its decimal."""
    rounds = next((r.rounds for r in results if r.rounds is not None), None)
    rows = tuple(
        row(
            f"session.{name}",
            session_label(name, rounds),
            (shown(r.figures.get(name), name in PERCENT) for r in results),
        )
        for name in session_names(results)
    )
    return FigureTable(tuple(r.plan for r in results), rows)


NEEDS_GOAL = "needs a goal"  # a plan that cannot play with no goal (its bet grows with the bankroll)
BESIDE = {  # rows of play with no goal shown beside plans with a goal: (key, label)
    "ruin": "with no goal: ruin chance",
    "rounds_to_ruin": "with no goal: rounds to ruin",
}


def no_goal_rows_beside(table: FigureTable, without_goal: SessionResults) -> FigureTable:
    """Plans with a goal, then the same plans played with no goal (ruin chance, expected rounds to
    ruin) in the same columns; ``-`` for a plan that needs a goal (bold play)."""
    from oddsbench.report.figure_table import word
    from oddsbench.report.no_goal_report import brief_decimal, no_goal_items

    by_plan = {
        plan.plan: {key: (exact, decimal) for key, _, exact, decimal in no_goal_items(plan.no_goal, width=None)}
        for plan in without_goal.plans
    }
    rows = list(table.rows)
    for key, label in BESIDE.items():
        cells = []
        for plan in table.columns:
            found = by_plan.get(plan, {}).get(key)
            cells.append(
                Shown(found[0] or None, found[1] or "-", brief_decimal(found[1])) if found else word(NEEDS_GOAL)
            )
        rows.append(row(f"no_goal.{key}", label, cells, "no_goal.bounded_ruin" if key == "ruin" else None))
    return FigureTable(table.columns, tuple(rows))


def _round_line(distribution: RoundDistribution) -> str:
    parts = [
        f"{text(o.net)}:{text(o.prob)}" + (f" (+{text(o.extra)} staked)" if o.extra else "")
        for o in distribution.outcomes
    ]
    return "net per unit staked : chance  " + ", ".join(parts)


def _settings_line(settings: SessionSettings) -> str:
    parts = [f"bankroll {text(settings.bankroll)}", f"goal {'none' if settings.goal is None else text(settings.goal)}"]
    if settings.floor:
        parts.append(f"floor {text(settings.floor)}")
    if settings.min_bet is not None:
        parts.append(f"min bet {text(settings.min_bet)}")
    if settings.max_bet is not None:
        parts.append(f"max bet {text(settings.max_bet)}")
    if settings.unit is not None:
        parts.append(f"unit {text(settings.unit)}")
    if settings.max_rounds is not None:
        parts.append(f"at most {settings.max_rounds:,} rounds")
    return ", ".join(parts)


def _final_lines(result: SessionFigures, values, title: str) -> list[str]:
    ordered = sorted(values, key=lambda v: -v.chance.decimal)
    shown = sorted(ordered[:SHOWN_FINAL_VALUES], key=lambda v: v.steps)
    lines = [f"  {result.plan}: {title}"]
    for value in shown:
        lines.append(f"    {text(value.money):>10} ({value.kind}): {cell(value.chance, percent=True)}")
    if len(ordered) > SHOWN_FINAL_VALUES:
        rest = sum(v.chance.decimal for v in ordered[SHOWN_FINAL_VALUES:])
        lines.append(f"    ... {len(ordered) - SHOWN_FINAL_VALUES:,} more values, together {decimal_text(rest)}")
    return lines


def series_sample(result: SessionFigures, points: int = SERIES_POINTS) -> list[tuple[Rational, Figure]]:
    """A few evenly spaced points of the goal-chance series (the whole series is in the API)."""
    size = len(result.goal_series)
    if size == 0:
        return []
    picks = sorted({round(k * (size - 1) / (points - 1)) for k in range(points)})
    return [(result.step * k, result.series_figure(k)) for k in picks]


def session_text(results: SessionResults, notes: list[str] | None = None) -> str:
    """The human output of ``oddsbench session``: plans side by side, or each plan played with no goal."""
    if results.no_goal:
        from oddsbench.report.no_goal_report import no_goal_text

        bodies = [
            no_goal_text(plan.no_goal, f"{results.title}, plan {plan.plan}", cautions=False) for plan in results.plans
        ]
        return "\n\n".join(bodies) + "\n\n" + caution_block()
    return bounded_text(results.title, results.distribution, results.settings, results.bounded, notes)


def bounded_text(
    title: str,
    distribution: RoundDistribution,
    settings: SessionSettings,
    results: list[SessionFigures],
    notes: list[str] | None = None,
) -> str:
    """Plans with a goal, one column each: the table, final bankrolls, the goal chance by bankroll, notes."""
    heading = f"{title}: bankroll session, {_settings_line(settings)}"
    headers = ["quantity"] + [r.plan for r in results]
    parts = [heading, _round_line(distribution), "", render_table(headers, session_rows(results))]
    parts += ["", "Final bankroll (most likely values):"]
    for result in results:
        parts += _final_lines(result, result.final, f"{result.states:,} states")
    after = [r for r in results if r.after_rounds]
    if after:
        parts += ["", f"Bankroll after {after[0].rounds} rounds (most likely values):"]
        for result in after:
            parts += _final_lines(result, result.after_rounds, "")
    parts += ["", "Chance of reaching the goal by starting bankroll (decimal):"]
    sample_rows = []
    samples = [series_sample(r) for r in results]
    for i, (money, _) in enumerate(samples[0]):
        sample_rows.append([text(money)] + [figure_decimal_text(s[i][1]) if i < len(s) else "-" for s in samples])
    parts.append(render_table(["bankroll"] + [r.plan for r in results], sample_rows))
    all_notes = list(notes or [])
    for result in results:
        all_notes.extend(n for n in result.notes if n not in all_notes)
    all_notes.append("check: optional stopping gives expected final - start = -(house edge) x expected staked")
    parts += ["", "Notes:"] + [f"  - {note}" for note in all_notes]
    parts += ["", caution_block()]
    return "\n".join(parts)


def _final_json(values) -> list[dict[str, Any]]:
    return [
        {
            "bankroll": {"exact": text(v.money), "decimal": to_float(v.money)},
            "kind": v.kind,
            "probability": figure_json(v.chance),
        }
        for v in values
    ]


def plan_json(result: SessionFigures, series: bool = False) -> dict[str, Any]:
    """One bounded plan's object: every figure, the final bankroll's distribution, optionally the series."""
    body: dict[str, Any] = {
        "plan": result.plan,
        "goal": "bounded",
        "states": result.states,
        "figures": {name: figure_json(f) for name, f in result.figures.items()},
        "final_bankroll": _final_json(result.final),
        "rounds": result.rounds,
        "bankroll_after_rounds": _final_json(result.after_rounds) if result.rounds is not None else None,
        "goal_probability_by_bankroll": None,
        "notes": list(result.notes),
    }
    if series:
        body["goal_probability_by_bankroll"] = [
            {"bankroll": text(result.step * k), **figure_json(result.series_figure(k))}
            for k in range(len(result.goal_series))
        ]
    return body


def settings_json(settings: SessionSettings) -> dict[str, Any]:
    return {
        "bankroll": text(settings.bankroll),
        "goal": "none" if settings.goal is None else text(settings.goal),
        "floor": text(settings.floor),
        "min_bet": None if settings.min_bet is None else text(settings.min_bet),
        "max_bet": None if settings.max_bet is None else text(settings.max_bet),
        "unit": None if settings.unit is None else text(settings.unit),
        "max_rounds": settings.max_rounds,
    }


def round_outcomes_json(distribution: RoundDistribution) -> list[dict[str, str]]:
    return [
        {"net": text(o.net), "probability": text(o.prob), "extra_stake": text(o.extra)} for o in distribution.outcomes
    ]


def plans_json(results: SessionResults, series: bool = False) -> list[dict[str, Any]]:
    """Every plan's object, in order: ``goal`` says whether it was solved with a goal ("bounded") or none."""
    from oddsbench.report.no_goal_report import no_goal_json

    plans = []
    for plan in results.plans:
        if plan.bounded is not None:
            plans.append(plan_json(plan.bounded, series))
        else:
            plans.append({"plan": plan.plan, **no_goal_json(plan.no_goal)})
    return plans


def session_json(results: SessionResults, series: bool = False) -> dict[str, Any]:
    """The ``--json`` object of ``oddsbench session``: the same top-level keys for one plan or several,
    a goal or none; ``plans`` is a list in the order asked."""
    return envelope(
        "session",
        {
            "ruleset": results.title,
            "round": round_outcomes_json(results.distribution),
            "strategy": results.strategy,
            "settings": settings_json(results.settings),
            "plans": plans_json(results, series),
        },
    )


def series_csv(results: list[SessionFigures]) -> str:
    """bankroll, then the goal chance under each plan: one line per bankroll value (decimals)."""
    lines = ["bankroll," + ",".join(r.plan for r in results)]
    size = max(len(r.goal_series) for r in results)
    step = results[0].step
    for k in range(size):
        lines.append(",".join([text(step * k)] + [csv_decimal(r.series_figure(k)) for r in results]))
    return "\n".join(lines) + "\n"
