"""A report's text in the format asked: the one way ``oddsbench report`` and the workbench render a
report (the caller solves with ``core.report_figures`` and writes with ``write_atomically``)."""

from __future__ import annotations

from pathlib import Path
from typing import TYPE_CHECKING

if TYPE_CHECKING:  # light to import: the command line reads FORMATS while it builds its options
    from oddsbench.core.results import ReportFigures

FORMATS = ("md", "csv", "json")
SUFFIXES = {".md": "md", ".markdown": "md", ".csv": "csv", ".json": "json"}


def report_format(requested: str | None, output: str | Path | None) -> str:
    """The format asked for, else the one the output's suffix names, else Markdown."""
    if requested:
        return requested
    if output:
        return SUFFIXES.get(Path(output).suffix.lower(), "md")
    return "md"


def render_report(figures: ReportFigures, fmt: str) -> str:
    """The whole report as text: Markdown, CSV or JSON."""
    from oddsbench.report.document import build_report
    from oddsbench.report.render_csv import render_csv
    from oddsbench.report.render_json import render_json
    from oddsbench.report.render_markdown import render_markdown

    renderers = {"md": render_markdown, "csv": render_csv, "json": render_json}
    return renderers[fmt](build_report(figures))
