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
    from oddsbench.model.limits import DEFAULT_MAX_STATES

    parser.add_argument(
        "--max-states",
        type=positive_int,
        default=DEFAULT_MAX_STATES,
        metavar="STATES",
        help=f"refuse rulesets and chains with more states than this (default {DEFAULT_MAX_STATES:,})",
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
