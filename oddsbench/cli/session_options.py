"""Session options shared by ``simulate`` and ``report``: bankroll, goal, limits and betting plans.

The same names as ``oddsbench session``; a ruleset's ``[session]`` table gives the defaults.
"""

from __future__ import annotations

import argparse

from oddsbench.cli.options import positive_int

DEFAULT_PLANS = ("timid", "bold")
MONEY_OPTIONS = ("bankroll", "goal", "floor", "min_bet", "max_bet", "unit")


def add_session_options(parser: argparse.ArgumentParser) -> None:
    group = parser.add_argument_group(
        "sessions", "repeat the round from a bankroll under betting plans (defaults from the file's [session])"
    )
    group.add_argument("--session", action="store_true", help="sessions with the file's [session] settings")
    group.add_argument("--bankroll", metavar="MONEY", help="starting bankroll")
    group.add_argument("--goal", metavar="MONEY", help="stop once the bankroll reaches or passes this")
    group.add_argument("--floor", metavar="MONEY", help="stop-loss: stop at or below this (default 0)")
    group.add_argument("--min-bet", metavar="MONEY", help="table minimum (default: the betting unit)")
    group.add_argument("--max-bet", metavar="MONEY", help="table maximum (default: none)")
    group.add_argument("--unit", metavar="MONEY", help="betting unit (default: min bet, else 1)")
    group.add_argument("--max-rounds", type=positive_int, metavar="N", help="time cap: stop after N rounds")
    group.add_argument(
        "--plan", action="append", metavar="PLAN", help="betting plan, repeatable (default: timid and bold)"
    )


def wants_session(args: argparse.Namespace) -> bool:
    return bool(
        args.session
        or args.plan
        or args.max_rounds is not None
        or any(getattr(args, name) is not None for name in MONEY_OPTIONS)
    )


def session_settings(args: argparse.Namespace, ruleset):
    """Settings from the options over the ruleset's ``[session]`` table (bankroll and goal required)."""
    from oddsbench.model.errors import OddsbenchError
    from oddsbench.model.expr import ExpressionError, evaluate_text
    from oddsbench.strategy.session import merge_settings, settings_from_table

    overrides = {}
    for name in MONEY_OPTIONS:
        raw = getattr(args, name)
        if raw is None:
            continue
        try:
            overrides[name] = evaluate_text(raw)
        except ExpressionError as error:
            raise OddsbenchError(f"--{name.replace('_', '-')} {raw!r}: {error}") from None
    overrides["max_rounds"] = args.max_rounds
    defaults = settings_from_table(ruleset.session, ruleset.source)
    return merge_settings(defaults, overrides, ruleset.source)


def session_plans(args: argparse.Namespace) -> list[str]:
    return list(args.plan or DEFAULT_PLANS)
