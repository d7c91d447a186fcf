"""Argument types shared by commands: each bad value is one clear line and exit 2."""

from __future__ import annotations

import argparse


def positive_int(text: str) -> int:
    try:
        value = int(text)
    except ValueError:
        raise argparse.ArgumentTypeError(f"expected a whole number, got {text!r}") from None
    if value < 1:
        raise argparse.ArgumentTypeError(f"expected a whole number of at least 1, got {value}")
    return value


def non_negative_int(text: str) -> int:
    try:
        value = int(text)
    except ValueError:
        raise argparse.ArgumentTypeError(f"expected a whole number, got {text!r}") from None
    if value < 0:
        raise argparse.ArgumentTypeError(f"expected a whole number of at least 0, got {value}")
    return value


def positive_seconds(text: str) -> float:
    try:
        value = float(text)
    except ValueError:
        raise argparse.ArgumentTypeError(f"expected a number of seconds, got {text!r}") from None
    if not 0 < value < 10**7:  # also refuses nan and inf
        raise argparse.ArgumentTypeError(f"expected a number of seconds above 0 and below 10,000,000, got {text!r}")
    return value


def add_budget(parser: argparse.ArgumentParser) -> None:
    """``--budget`` and ``--memory``: the work budget of the command (``model/budget.py``)."""
    from oddsbench.model.budget import EXACT_RULE
    from oddsbench.model.defaults import DEFAULT_BUDGET_SECONDS, DEFAULT_MEMORY_MB

    group = parser.add_argument_group(
        "work budget", "every step estimates its cost first; what does not fit is refused or given in decimals only"
    )
    group.add_argument(
        "--budget",
        type=positive_seconds,
        default=DEFAULT_BUDGET_SECONDS,
        metavar="SECONDS",
        help=f"time the command may take, reading included (default {DEFAULT_BUDGET_SECONDS}); "
        + EXACT_RULE.replace("%", "%%"),
    )
    group.add_argument(
        "--memory",
        type=positive_int,
        default=DEFAULT_MEMORY_MB,
        metavar="MB",
        help=f"memory the command may hold, in MB (default {DEFAULT_MEMORY_MB:,})",
    )


def budget_of(args: argparse.Namespace):
    """The work budget a command asked for (None for a command without one: the workbench)."""
    if getattr(args, "budget", None) is None:
        return None
    from oddsbench.model.budget import Budget

    return Budget(args.budget, args.memory)


def add_max_states(parser: argparse.ArgumentParser) -> None:
    from oddsbench.model.defaults import DEFAULT_MAX_STATES

    parser.add_argument(
        "--max-states",
        type=positive_int,
        default=DEFAULT_MAX_STATES,
        metavar="STATES",
        help=f"refuse rulesets and chains with more states than this (default {DEFAULT_MAX_STATES:,})",
    )


def add_exact_bits(parser: argparse.ArgumentParser) -> None:
    from oddsbench.model.defaults import DEFAULT_EXACT_BITS

    parser.add_argument(
        "--exact-bits",
        type=positive_int,
        default=DEFAULT_EXACT_BITS,
        metavar="BITS",
        help=f"size limit of exact arithmetic: estimated bits held by the exact factors (default "
        f"{DEFAULT_EXACT_BITS:,}); past it the exact engine stops and decimals come from the float engine",
    )


def add_exact_limit(parser: argparse.ArgumentParser, default: int | None) -> None:
    """``--exact-limit``; ``default`` None leaves the question's own default (shown in the help)."""
    from oddsbench.model.defaults import SESSION_EXACT_LIMIT

    shown = default if default is not None else SESSION_EXACT_LIMIT
    parser.add_argument(
        "--exact-limit",
        type=non_negative_int,
        default=default,
        metavar="STATES",
        help=f"largest chain (transient states) solved in exact arithmetic (default {shown:,}); "
        "larger chains get decimals only, with a note",
    )


def add_session_options(
    parser: argparse.ArgumentParser, with_goal_help: str | None = None, switch: bool = False
) -> None:
    """The session settings of ``session``, ``simulate`` and ``report`` (names as in a [session] table);
    ``switch`` adds ``--session`` (the file's [session] as it is)."""
    group = parser.add_argument_group(
        "sessions", "repeat the round from a bankroll under betting plans (defaults from the file's [session])"
    )
    if switch:
        group.add_argument("--session", action="store_true", help="sessions with the file's [session] settings")
    group.add_argument("--bankroll", metavar="MONEY", help="starting bankroll")
    group.add_argument(
        "--goal", metavar="MONEY", help=with_goal_help or "stop once the bankroll reaches or passes this"
    )
    group.add_argument("--floor", metavar="MONEY", help="stop-loss: stop once the bankroll is at or below (default 0)")
    group.add_argument("--min-bet", metavar="MONEY", help="table minimum (default: the betting unit)")
    group.add_argument("--max-bet", metavar="MONEY", help="table maximum (default: none)")
    group.add_argument(
        "--unit",
        metavar="MONEY",
        help="betting unit: bets are whole multiples (default 1, or a fractional min bet, refined to a plan's own "
        "amounts such as flat:1/2)",
    )
    group.add_argument("--max-rounds", type=positive_int, metavar="N", help="time cap: stop after N rounds")
    group.add_argument(
        "--plan", action="append", metavar="PLAN", help="betting plan, repeatable (default: timid and bold)"
    )


def wants_session(args: argparse.Namespace) -> bool:
    """Whether ``simulate`` or ``report`` was asked for sessions (``--session`` or any session option)."""
    from oddsbench.core.settings import MONEY_FIELDS

    return bool(
        getattr(args, "session", False)
        or args.plan
        or args.max_rounds is not None
        or any(getattr(args, name) is not None for name in MONEY_FIELDS)
    )


def session_request_of(args: argparse.Namespace):
    """The session options as the core's ``SessionRequest`` (amounts read exactly; one line when bad)."""
    from oddsbench.core.settings import MONEY_FIELDS, session_request
    from oddsbench.model.defaults import NO_GOAL_DIGITS

    return session_request(
        **{name: getattr(args, name, None) for name in MONEY_FIELDS},
        max_rounds=args.max_rounds,
        plans=tuple(args.plan or ()),
        digits=getattr(args, "digits", NO_GOAL_DIGITS),
        check=not getattr(args, "no_check", False),
    )


def settings_of(args: argparse.Namespace, sessions: bool = False, **fixed):
    """The core's one ``Settings`` from a command's options (those it does not have keep their defaults)."""
    from oddsbench.core.settings import Settings

    values = {}
    for name in ("exact_limit", "exact_bits", "max_states", "rounds", "trials", "seed", "confidence", "max_steps"):
        if getattr(args, name, None) is not None:
            values[name] = getattr(args, name)
    if getattr(args, "start", None) is not None:
        values["starts"] = args.start
    strategy = getattr(args, "strategy", None)
    if strategy:
        values["strategies"] = tuple(strategy) if isinstance(strategy, list) else (strategy,)
    if sessions:
        values["session"] = session_request_of(args)
    values.update(fixed)
    return Settings(**values)


def load_game(path: str):
    """Read a ruleset for a command: warnings go to stderr one line each, errors raise RulesetError
    (exit 2), so no command silently drops what the reader found."""
    import sys

    from oddsbench.core.game import load_game as read

    game = read(path)
    for warning in game.warnings:
        print(warning, file=sys.stderr)
    return game


def file_or_round(args: argparse.Namespace, command: str):
    """The game of a command that takes a ruleset FILE or an inline ``--round NET:PROB,...``: exactly one."""
    from oddsbench.core import inline_round
    from oddsbench.model.errors import OddsbenchError

    if (args.file is None) == (args.round is None):
        raise OddsbenchError(f"{command}: give a ruleset FILE or --round NET:PROB,..., not both and not neither")
    return inline_round(args.round, "--round") if args.round is not None else load_game(args.file)


OPTION_NAMES = {"plans": "--plan"}  # settings whose option is not ``--`` and the key


def option_of(setting: str) -> str:
    """The command line's way to change a setting the core names (``model/errors.py``, ``SettingProblem``):
    its option, ``--`` and the key (``min_bet`` -> ``--min-bet``) unless ``OPTION_NAMES`` says otherwise."""
    return OPTION_NAMES.get(setting) or "--" + setting.replace("_", "-")


def error_line(error: BaseException) -> str:
    """An error as the command line says it: a setting problem ends with the options that change it."""
    from oddsbench.model.errors import with_ways

    return with_ways(error, option_of, "change with ")
