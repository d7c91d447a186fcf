"""``oddsbench session FILE``: risk of ruin, session length and betting plans, one column per plan."""

from __future__ import annotations

import argparse
import json

from oddsbench.cli.options import add_exact_limit, positive_int

DEFAULT_EXACT_LIMIT = 3_000
DEFAULT_PLANS = ("timid", "bold")


def _plans_help() -> str:
    from oddsbench.strategy.plans import PLAN_HELP

    return "\n".join(f"  {name:<16} {about}" for name, about in PLAN_HELP)


def register(commands) -> None:
    parser = commands.add_parser(
        "session",
        help="bankroll sessions: chance of the goal, risk of ruin, session length, betting plans",
        formatter_class=argparse.RawDescriptionHelpFormatter,
        description="A session repeats one round from a starting bankroll until the bankroll reaches "
        "the goal, falls to the floor (stop-loss), can no longer cover the minimum bet (ruin), or the "
        "time cap is hit. Figures for each betting plan, exact beside decimal: chance of the goal, of "
        "ruin, expected rounds and their variance, expected total staked, expected final bankroll and "
        "its distribution, and the optional-stopping check.",
        epilog="Betting plans (--plan, repeatable; amounts are money, exact, e.g. 1/2):\n"
        + _plans_help()
        + "\n\nEvery bet is raised to --min-bet, cut to --max-bet and to what the bankroll covers for the "
        "round's worst loss (extra stakes included).\nA ruleset's [session] table gives defaults "
        "(bankroll, goal, floor, min_bet, max_bet, unit, max_rounds); options override them.\n"
        "Examples:\n  oddsbench session rulesets/single-zero-wheel.toml --bankroll 100 --goal 200 "
        "--plan flat:1 --plan bold\n  oddsbench session --round '1:18/37,-1:19/37' --bankroll 10 --goal 20 "
        "--plan kelly:1/2 --plan best\n\nFigures are mathematics, not advice.",
    )
    parser.add_argument("file", nargs="?", help="ruleset file (TOML); or give --round instead")
    parser.add_argument(
        "--round",
        metavar="NET:PROB,...",
        help="an inline round instead of a file: net result per unit staked : probability, comma "
        "separated, e.g. '1:18/37,-1:19/37' (an optional third field is an extra stake)",
    )
    parser.add_argument("--bankroll", metavar="MONEY", help="starting bankroll")
    parser.add_argument(
        "--goal",
        metavar="MONEY",
        help="stop once the bankroll reaches or passes this; 'none': never stop at a target, play until ruin "
        "(risk of ruin on the unbounded walk, exact)",
    )
    parser.add_argument("--floor", metavar="MONEY", help="stop-loss: stop once the bankroll is at or below (default 0)")
    parser.add_argument("--min-bet", metavar="MONEY", help="table minimum (default: the betting unit)")
    parser.add_argument("--max-bet", metavar="MONEY", help="table maximum (default: none)")
    parser.add_argument(
        "--unit", metavar="MONEY", help="betting unit: bets are whole multiples (default 1, or a fractional min bet)"
    )
    parser.add_argument("--max-rounds", type=positive_int, metavar="N", help="time cap: stop after N rounds")
    parser.add_argument(
        "--rounds", type=positive_int, metavar="N", help="also ruin within N rounds and the bankroll after N"
    )
    parser.add_argument(
        "--plan", action="append", metavar="PLAN", help="betting plan (repeatable; default: timid, bold)"
    )
    parser.add_argument("--strategy", metavar="NAME", help="play the ruleset's named strategy in each round")
    parser.add_argument("--json", action="store_true", help="print one JSON object")
    parser.add_argument(
        "--series", action="store_true", help="with --json: the goal chance for every starting bankroll"
    )
    parser.add_argument("--series-csv", metavar="FILE", help="write the goal chance for every starting bankroll as CSV")
    parser.add_argument("--force", action="store_true", help="let --series-csv replace an existing file")
    add_exact_limit(parser, DEFAULT_EXACT_LIMIT)
    from oddsbench.cli.no_goal import add_no_goal_arguments

    add_no_goal_arguments(parser)
    parser.set_defaults(run=run)


def _money(value: str | None, option: str):
    if value is None:
        return None
    from oddsbench.model.errors import OddsbenchError
    from oddsbench.model.expr import ExpressionError, evaluate_text

    try:
        return evaluate_text(value)
    except ExpressionError as error:
        raise OddsbenchError(f"--{option} {value!r}: {error}") from None


def run(args: argparse.Namespace) -> int:
    from oddsbench.chain.round_distribution import parse_round_text
    from oddsbench.model.errors import OddsbenchError
    from oddsbench.report.session_report import series_csv, session_json, session_text
    from oddsbench.strategy.session import analyse_session, merge_settings, settings_from_table

    if (args.file is None) == (args.round is None):
        raise OddsbenchError("session: give a ruleset FILE or --round NET:PROB,..., not both and not neither")
    from oddsbench.cli.no_goal import is_no_goal, run_no_goal_session, wants_no_goal

    defaults: dict = {}
    table: dict | None = None
    if args.round is not None:
        distribution = parse_round_text(args.round)
        title, source = "Inline round", "--round"
    else:
        from oddsbench.cli.options import load_with_warnings
        from oddsbench.solve.round_distribution import round_distribution_of

        ruleset = load_with_warnings(args.file)
        distribution = round_distribution_of(ruleset, _policy(ruleset, args.strategy))
        title, source = ruleset.title, ruleset.source
        table = dict(ruleset.session)
    if wants_no_goal(args, table):
        _refuse_with_no_goal(args, source)
        return run_no_goal_session(args, distribution, title, source, table)
    if table is not None:
        # goal = "none" in the table is overridden by a numeric --goal here
        defaults = settings_from_table({k: v for k, v in table.items() if not (k == "goal" and is_no_goal(v))}, source)
    overrides = {
        name: _money(getattr(args, name), name.replace("_", "-"))
        for name in ("bankroll", "goal", "floor", "min_bet", "max_bet", "unit")
    }
    overrides["max_rounds"] = args.max_rounds
    settings = merge_settings(defaults, overrides, source)
    plans = args.plan or list(DEFAULT_PLANS)
    results = [analyse_session(distribution, settings, plan, args.exact_limit, args.rounds) for plan in plans]
    if args.series_csv:
        from oddsbench.model.atomic_write import write_atomically

        write_atomically(args.series_csv, series_csv(results), force=args.force)
    if args.json:
        print(json.dumps(session_json(title, distribution, settings, results, series=args.series), indent=2))
    else:
        print(session_text(title, distribution, settings, results))
    return 0


def _refuse_with_no_goal(args: argparse.Namespace, source: str) -> None:
    """Options that need a goal, named in one line when combined with --goal none."""
    from oddsbench.model.errors import OddsbenchError

    for option, given in (("--rounds", args.rounds), ("--series", args.series), ("--series-csv", args.series_csv)):
        if given:
            raise OddsbenchError(f"{source}: {option} needs a goal; with --goal none the session only ends at ruin")


def _policy(ruleset, strategy_name: str | None) -> dict:
    from oddsbench.model.errors import OddsbenchError

    if strategy_name is None:
        return {}
    try:
        strategy = ruleset.strategy(strategy_name)
    except KeyError:
        known = ", ".join(s.name for s in ruleset.strategies) or "none defined"
        raise OddsbenchError(f"{ruleset.source}: unknown strategy {strategy_name!r} (known: {known})") from None
    return {state.name: strategy.action_for(state) for state in ruleset.states if state.is_decision}
