"""Sweep results as a terminal table (rich), CSV (one row per point) and JSON."""

from __future__ import annotations

import csv
import io
from typing import TYPE_CHECKING, Any

from oddsbench.model.numbers import parse_fraction
from oddsbench.report.cautions import CAUTIONS
from oddsbench.report.json_output import dumps, envelope
from oddsbench.report.numbers_text import decimal_text, exact_text, render_table
from oddsbench.report.round_report import figure_label
from oddsbench.report.ruleset_echo import file_digest

if TYPE_CHECKING:  # result types only: the core (and the engines behind it) load when a question is asked
    from oddsbench.core.results import SweepResult

EXACT_COLUMN_WIDTH = 30


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
    return envelope(
        "sweep",
        {
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
        },
    )


def render_sweep_json(result: SweepResult) -> str:
    return dumps(sweep_json(result)) + "\n"


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


def sweep_label(name: str) -> str:
    if name.startswith("session."):
        return f"{figure_label(name.removeprefix('session.'))} (session)"
    return figure_label(name)


def sweep_table(result: SweepResult, limit: int | None = None) -> str:
    """A plain aligned table: settings, then each chosen figure's exact value (shortened) and decimal."""
    spec = result.spec
    labels = [label for label, _ in result.points[0].settings] if result.points else []
    headers = list(labels)
    for name in spec.figures:
        headers += [f"{sweep_label(name)} exact", sweep_label(name)]
    shown = list(zip(result.points, result.results))
    if limit is not None:
        shown = shown[:limit]
    rows = []
    for point, solved in shown:
        cells = [value for _, value in point.settings]
        found = {name: (exact, decimal) for name, exact, decimal in solved.figures}
        for name in spec.figures:
            exact, decimal = found.get(name, (None, None))
            if solved.error is not None or decimal is None:
                cells += ["error" if solved.error else "-", "-"]
                continue
            exact_cell = "(decimal only)" if exact is None else exact_text(parse_fraction(exact), EXACT_COLUMN_WIDTH)
            cells += [exact_cell, decimal_text(decimal)]
        rows.append(cells)
    title = f"{spec.title}: {len(result.points):,} points, {result.runner}, {result.seconds:.2f} s"
    return title + "\n\n" + render_table(headers, rows, right=set(range(len(headers))))
