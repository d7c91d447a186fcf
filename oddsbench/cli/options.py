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


def add_exact_limit(parser: argparse.ArgumentParser, default: int) -> None:
    parser.add_argument(
        "--exact-limit",
        type=non_negative_int,
        default=default,
        metavar="STATES",
        help=f"largest chain (transient states) solved in exact arithmetic (default {default:,}); "
        "larger chains get decimals only, with a note",
    )


def load_with_warnings(path: str, params=None):
    """Read a ruleset for a command: warnings go to stderr one line each, errors raise
    RulesetError (exit 2), so no command silently drops what the reader found."""
    import sys

    from oddsbench.model.errors import RulesetError
    from oddsbench.model.load import read_ruleset_file

    loaded = read_ruleset_file(path, params)
    if loaded.ruleset is None:
        raise RulesetError(loaded.problems)
    for warning in loaded.warnings:
        print(warning, file=sys.stderr)
    return loaded.ruleset
