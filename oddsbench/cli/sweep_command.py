"""``oddsbench sweep SPEC.toml``: a grid of rulesets solved exactly where feasible, locally or on Dask."""

from __future__ import annotations

import argparse
import sys

from oddsbench.cli.options import positive_int

DEFAULT_SHOWN = 200


def register(commands) -> None:
    parser = commands.add_parser(
        "sweep",
        help="solve a grid of parameter values and strategies; table, CSV and JSON",
        description="Read a sweep spec (a ruleset and the values to try for its parameters and "
        "strategies), solve every point of the grid exactly where feasible (else in decimals, "
        "said so), and print a table; --csv and --json write every figure of every point. Runs "
        "on local processes, or on an existing Dask cluster with --cluster.",
    )
    parser.add_argument("spec", help="sweep spec file (TOML)")
    parser.add_argument("--cluster", metavar="ADDRESS", help="Dask scheduler to run on, such as tcp://10.0.0.5:8786")
    parser.add_argument(
        "--workers",
        type=positive_int,
        metavar="N",
        help="local processes (default: one per core, or this process alone when the first point shows "
        "the whole sweep takes under 2 s; 1 = this process)",
    )
    parser.add_argument("--csv", metavar="PATH", help="write one row per point to this CSV file")
    parser.add_argument("--json", metavar="PATH", help="write every point to this JSON file")
    parser.add_argument("--force", action="store_true", help="replace existing output files")
    parser.add_argument("--no-progress", action="store_true", help="no progress bar")
    parser.add_argument(
        "--show",
        type=positive_int,
        default=DEFAULT_SHOWN,
        metavar="N",
        help=f"rows of the table to print (default {DEFAULT_SHOWN}); files always get every point",
    )
    parser.set_defaults(run=run)


def run(args: argparse.Namespace) -> int:

    from oddsbench.core import read_spec
    from oddsbench.core.sweeps import point_settings
    from oddsbench.model.atomic_write import check_target, write_atomically
    from oddsbench.report.cautions import caution_block
    from oddsbench.report.sweep_report import render_sweep_csv, render_sweep_json, sweep_table

    spec = read_spec(args.spec)
    for target in (args.csv, args.json):
        if target:
            check_target(target, force=args.force)  # refused before the work, not after it
    result = _run(spec, args)
    if result.errors:
        for solved in result.errors:
            point = result.points[solved.index]
            print(f"{spec.source}: point {point.index} ({point_settings(point)}): {solved.error}", file=sys.stderr)
        print(
            f"oddsbench: {len(result.errors)} of {len(result.points)} points failed; no files written", file=sys.stderr
        )
        return 2
    print(sweep_table(result, args.show))
    if len(result.points) > args.show:
        print(f"{len(result.points) - args.show:,} more points in the CSV and JSON files (or raise --show)")
    decimal_only = sum(1 for r in result.results if not r.exact)
    if decimal_only:
        print(f"{decimal_only:,} points were too large for exact arithmetic: decimals only (raise exact_limit)")
    if args.csv:
        write_atomically(args.csv, render_sweep_csv(result), force=args.force)
        print(f"wrote {args.csv}")
    if args.json:
        write_atomically(args.json, render_sweep_json(result), force=args.force)
        print(f"wrote {args.json}")
    print()
    print(caution_block())
    return 0


def _run(spec, args):
    from oddsbench.core import Work, sweep

    if args.no_progress:
        return sweep(spec, workers=args.workers, cluster=args.cluster)
    from rich.console import Console
    from rich.progress import BarColumn, MofNCompleteColumn, Progress, TextColumn, TimeElapsedColumn

    columns = (TextColumn("solving"), BarColumn(), MofNCompleteColumn(), TimeElapsedColumn())
    # the bar's own escapes go to the terminal as they are (stderr's ``raw``: main shows other text visibly)
    console = Console(file=getattr(sys.stderr, "raw", sys.stderr))
    with Progress(*columns, console=console, transient=True) as progress:
        bar = progress.add_task("sweep", total=spec.size)
        work = Work(progress=lambda done, total: progress.update(bar, completed=done))
        return sweep(spec, workers=args.workers, cluster=args.cluster, work=work)
