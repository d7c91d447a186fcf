"""``oddsbench open FILE`` (and ``oddsbench`` alone): the terminal workbench.

Textual is imported only here, when the workbench starts, so the other commands stay quick.
"""

from __future__ import annotations

import argparse
import sys


def register(commands) -> None:
    parser = commands.add_parser(
        "open",
        help="open a ruleset in the workbench (a missing file is offered for creation)",
        description="Open the terminal workbench on FILE: edit states and payoffs and see every "
        "figure, exact beside decimal. Without FILE, the bundled demo game opens.",
    )
    parser.add_argument("file", nargs="?", help="ruleset file (TOML)")
    parser.set_defaults(run=run)


def run(args: argparse.Namespace) -> int:
    return run_workbench(args.file)


def run_workbench(path: str | None) -> int:
    from oddsbench.model.errors import OddsbenchError

    if not (sys.stdin.isatty() and sys.stdout.isatty()):
        raise OddsbenchError("the workbench needs a terminal; use `oddsbench check` or `oddsbench solve` in scripts")
    from oddsbench.tui.app import create_app

    create_app(path).run()
    return 0
