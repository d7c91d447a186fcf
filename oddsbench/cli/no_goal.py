"""``--goal none`` for the session command: endless play until ruin, no target.

The session command hands over the round's results, the bankroll and the plan; this module
checks that the plan's bet stays bounded (flat and timid plans), solves the unbounded walk and
prints the figures with the cautions.
"""

from __future__ import annotations

import argparse
import json
from collections.abc import Iterable

from oddsbench.cli.options import positive_int
from oddsbench.model.errors import OddsbenchError

NO_GOAL_WORDS = frozenset({"none", "no", "never"})
DEFAULT_NO_GOAL_DIGITS = 20
ENDLESS_PLANS = (
    "flat:B (a fixed bet of B), timid[:U] (always the smallest bet), or a capped progression "
    "martingale:B:K / paroli:B:K"
)


def is_no_goal(goal: object) -> bool:
    """``goal = "none"`` in a [session] table, or ``--goal none`` on the command line."""
    return isinstance(goal, str) and goal.strip().lower() in NO_GOAL_WORDS


def add_no_goal_arguments(parser: argparse.ArgumentParser) -> None:
    parser.add_argument(
        "--digits",
        type=positive_int,
        default=DEFAULT_NO_GOAL_DIGITS,
        metavar="N",
        help=f"with --goal none: significant digits of each decimal, each one proved (default "
        f"{DEFAULT_NO_GOAL_DIGITS})",
    )
    parser.add_argument(
        "--no-check",
        action="store_true",
        help="with --goal none: skip the exact truncation cross-check (faster for long bankrolls)",
    )


def endless_bet(plan: str | None, source: str = "--plan"):
    """The bet of a plan that can be played for ever: flat:B or timid[:U]; others are refused.

    Returns the bet, or None for plain ``timid`` (the minimum bet, whatever it is).
    """
    from oddsbench.model.expr import ExpressionError, evaluate_text
    from oddsbench.model.numbers import text

    if plan is None or plan.strip() == "":
        return None
    kind, _, amount = plan.strip().partition(":")
    kind = kind.strip().lower()
    if kind not in ("flat", "timid", "martingale", "paroli"):
        raise OddsbenchError(
            f"{source} {plan!r}: with no goal the bet must stay bounded; use {ENDLESS_PLANS}"
            + (" (bold play needs a goal to aim at)" if kind == "bold" else "")
        )
    if kind in ("martingale", "paroli"):
        raise OddsbenchError(f"{source} {plan!r}: a progression is read by endless_plan, not endless_bet")
    if not amount.strip():
        if kind == "flat":
            raise OddsbenchError(f"{source} {plan!r}: give the bet, e.g. flat:1")
        return None
    try:
        bet = evaluate_text(amount.strip())
    except ExpressionError as error:
        raise OddsbenchError(f"{source} {plan!r}: {error}") from None
    if bet <= 0:
        raise OddsbenchError(f"{source} {plan!r}: the bet must be positive, got {text(bet)}")
    return bet


def wants_no_goal(args: argparse.Namespace, table: dict | None) -> bool:
    """``--goal none``, or no --goal and ``goal = "none"`` in the ruleset's [session] table."""
    if getattr(args, "goal", None) is not None:
        return is_no_goal(args.goal)
    return bool(table) and is_no_goal(table.get("goal"))


def run_no_goal_session(args: argparse.Namespace, distribution, title: str, source: str, table: dict | None) -> int:
    """The ``session`` command with no goal: each plan (flat or timid) played until ruin.

    ``distribution`` is the session's round (outcomes with net, prob, extra per unit staked, and
    its ``cover``); ``table`` the ruleset's raw [session] table (its ``goal`` is "none" or unused).
    """
    from oddsbench.strategy.session import settings_from_table

    if getattr(args, "max_rounds", None) is not None or (table and "max_rounds" in table):
        raise OddsbenchError(
            f"{source}: --goal none plays until ruin; a time cap (max_rounds) needs a goal, or use --rounds N "
            "with a goal for the chance of ruin within N rounds"
        )
    defaults = settings_from_table({k: v for k, v in (table or {}).items() if k != "goal"}, source)
    settings = dict(defaults)
    for name in ("bankroll", "floor", "min_bet", "max_bet", "unit"):
        raw = getattr(args, name, None)
        if raw is not None:
            settings[name] = _money(raw, name.replace("_", "-"))
    if "bankroll" not in settings:
        raise OddsbenchError(f"{source}: session needs --bankroll (or bankroll in the [session] table)")
    outcomes = [(o.net, o.prob) for o in distribution.outcomes]
    plans = getattr(args, "plan", None) or ["timid"]
    bodies = []
    for plan in plans:
        kind, bet, series = endless_plan(plan)
        if kind == "timid":
            bet = settings.get("min_bet") or settings.get("unit") or 1
        kwargs = dict(
            cover=distribution.cover,
            digits=getattr(args, "digits", DEFAULT_NO_GOAL_DIGITS),
            check=not getattr(args, "no_check", False),
            unit=settings.get("unit"),
            min_bet=settings.get("min_bet"),
            max_bet=settings.get("max_bet"),
            floor=settings.get("floor") or 0,
        )
        if kind in ("martingale", "paroli"):
            kwargs.pop("check")
            kwargs["progression"] = (kind, series)
        if getattr(args, "json", False):
            bodies.append(_figures_json(outcomes, settings["bankroll"], bet, title, plan, kwargs))
        else:
            bodies.append(_figures_text(outcomes, settings["bankroll"], bet, title, plan, kwargs))
    if getattr(args, "json", False):
        print(json.dumps(bodies[0] if len(bodies) == 1 else {"title": title, "plans": bodies}, indent=2))
    else:
        from oddsbench.report.cautions import caution_block

        print("\n\n".join(bodies) + "\n\n" + caution_block())
    return 0


def _money(value: str, option: str):
    from oddsbench.model.expr import ExpressionError, evaluate_text

    try:
        return evaluate_text(value)
    except ExpressionError as error:
        raise OddsbenchError(f"--{option} {value!r}: {error}") from None


def _solve(outcomes, bankroll, bet, kwargs):
    from oddsbench.strategy.no_goal_play import solve_no_goal_play, solve_no_goal_progression

    kwargs = dict(kwargs)
    progression = kwargs.pop("progression", None)
    if progression is not None:
        kind, series = progression
        return solve_no_goal_progression(outcomes, kind, bet, series, bankroll, **kwargs)
    return solve_no_goal_play(outcomes, bet, bankroll, **kwargs)


def _figures_json(outcomes, bankroll, bet, title, plan, kwargs) -> dict:
    from oddsbench.report.no_goal_report import no_goal_json

    body = no_goal_json(_solve(outcomes, bankroll, bet, kwargs), title)
    body["plan"] = plan
    return body


def _figures_text(outcomes, bankroll, bet, title, plan, kwargs) -> str:
    from oddsbench.report.no_goal_report import no_goal_text

    return no_goal_text(_solve(outcomes, bankroll, bet, kwargs), f"{title}, plan {plan}", cautions=False)


def endless_plan(plan: str, source: str = "--plan") -> tuple[str, object, int]:
    """(kind, amount, series) of a plan that can be played for ever; others refused in one line."""
    from oddsbench.model.expr import ExpressionError, evaluate_text
    from oddsbench.model.numbers import is_integer, text, to_int

    kind = plan.strip().split(":")[0].strip().lower()
    if kind not in ("martingale", "paroli"):
        return ("timid", None, 1) if endless_bet(plan, source) is None else ("flat", endless_bet(plan, source), 1)
    fields = [field.strip() for field in plan.strip().split(":")[1:]]
    if len(fields) != 2 or not all(fields):
        raise OddsbenchError(f"{source} {plan!r}: {kind} takes a base bet and a series cap, e.g. {kind}:1:5")
    try:
        base, series = evaluate_text(fields[0]), evaluate_text(fields[1])
    except ExpressionError as error:
        raise OddsbenchError(f"{source} {plan!r}: {error}") from None
    if base <= 0:
        raise OddsbenchError(f"{source} {plan!r}: the base bet must be positive, got {text(base)}")
    if not is_integer(series) or not 1 <= series <= 30:
        raise OddsbenchError(f"{source} {plan!r}: the series cap must be a whole number from 1 to 30")
    return kind, base, to_int(series)


def run_no_goal(
    outcomes: Iterable[tuple[object, object]],
    bankroll,
    bet,
    cover=None,
    digits: int = DEFAULT_NO_GOAL_DIGITS,
    check: bool = True,
    as_json: bool = False,
    title: str = "round",
    unit=None,
    min_bet=None,
    floor=0,
) -> int:
    """Solve and print endless play; ``outcomes`` are (net per unit bet, chance), exact.

    ``bet`` None means timid play: always the minimum bet.
    """
    from oddsbench.report.no_goal_report import no_goal_json, no_goal_text
    from oddsbench.strategy.no_goal_play import solve_no_goal_play

    if bet is None:
        bet = min_bet if min_bet is not None else (unit if unit is not None else 1)
    figures = solve_no_goal_play(
        list(outcomes),
        bet,
        bankroll,
        cover=cover,
        digits=digits,
        check=check,
        unit=unit,
        min_bet=min_bet,
        floor=floor,
    )
    if as_json:
        print(json.dumps(no_goal_json(figures, title), indent=2))
    else:
        print(no_goal_text(figures, title))
    return 0
