"""Sweep results as a terminal table (rich), CSV (one row per point) and JSON."""

from __future__ import annotations

import csv
import io
import json
from typing import Any

from oddsbench.report.cautions import CAUTIONS
from oddsbench.report.numbers_text import decimal_text
from oddsbench.report.round_report import figure_label
from oddsbench.report.ruleset_echo import file_digest
from oddsbench.sweep.runners import SweepResult

EXACT_COLUMN_WIDTH = 24


def figure_names(result: SweepResult) -> list[str]:
    """Every figure any point produced, in order of first appearance."""
    names: list[str] = []
    for point in result.results:
        names += [name for name, _, _ in point.figures if name not in names]
    return names


def sweep_json(result: SweepResult) -> dict[str, Any]:
    spec = result.spec
    points = []
    for point, solved in zip(result.points, result.results):
        entry: dict[str, Any] = {"index": point.index, "settings": dict(point.settings), "exact": solved.exact}
        if solved.error is not None:
            entry["error"] = solved.error
        entry["figures"] = {name: {"exact": exact, "decimal": decimal} for name, exact, decimal in solved.figures}
        entry["notes"] = list(solved.notes)
        points.append(entry)
    return {
        "sweep": {
            "title": spec.title,
            "spec": spec.source,
            "ruleset": spec.ruleset_path.name,
            "ruleset_sha256": file_digest(spec.ruleset_text),
            "axes": [{"kind": a.kind, "name": a.name, "values": [a.shown(v) for v in a.values]} for a in spec.axes],
            "figures": list(spec.figures),
            "points": len(result.points),
            "runner": result.runner,
            "seconds": result.seconds,
        },
        "points": points,
        "cautions": list(CAUTIONS),
    }


def render_sweep_json(result: SweepResult) -> str:
    return json.dumps(sweep_json(result), indent=2, ensure_ascii=False) + "\n"


def render_sweep_csv(result: SweepResult) -> str:
    """One row per point: settings, then exact and decimal of every figure; cautions at the end."""
    names = figure_names(result)
    labels = [label for label, _ in result.points[0].settings] if result.points else []
    header = ["point", *labels, "exact"]
    for name in names:
        header += [f"{name} exact", f"{name} decimal"]
    header += ["notes"]
    buffer = io.StringIO()
    writer = csv.writer(buffer, lineterminator="\n")
    writer.writerow(header)
    for point, solved in zip(result.points, result.results):
        found = {name: (exact, decimal) for name, exact, decimal in solved.figures}
        row = [str(point.index), *[value for _, value in point.settings], "yes" if solved.exact else "no"]
        for name in names:
            exact, decimal = found.get(name, (None, None))
            row += ["" if exact is None else exact, "" if decimal is None else repr(decimal)]
        row.append(" | ".join(([solved.error] if solved.error else []) + list(solved.notes)))
        writer.writerow(row)
    for line in CAUTIONS:
        writer.writerow(["caution", line])
    return buffer.getvalue()


def sweep_table(result: SweepResult, limit: int | None = None):
    """A rich Table: settings, then each chosen figure exact and decimal."""
    from rich.table import Table

    spec = result.spec
    table = Table(title=f"{spec.title} ({len(result.points):,} points, {result.runner}, {result.seconds:.2f} s)")
    labels = [label for label, _ in result.points[0].settings] if result.points else []
    for label in labels:
        table.add_column(label, justify="right")
    for name in spec.figures:
        table.add_column(f"{figure_label(name)} exact", justify="right", overflow="fold")
        table.add_column(figure_label(name), justify="right")
    shown = list(zip(result.points, result.results))
    if limit is not None:
        shown = shown[:limit]
    for point, solved in shown:
        cells = [value for _, value in point.settings]
        found = {name: (exact, decimal) for name, exact, decimal in solved.figures}
        for name in spec.figures:
            if solved.error is not None:
                cells += ["error", ""]
                continue
            exact, decimal = found.get(name, (None, None))
            if decimal is None:
                cells += ["-", "-"]
                continue
            if exact is not None and len(exact) > EXACT_COLUMN_WIDTH:
                exact = exact[: EXACT_COLUMN_WIDTH - 3] + "..."
            cells += [exact if exact is not None else "(decimal only)", decimal_text(decimal)]
        table.add_row(*cells)
    return table
