"""Writing a report from the workbench: the same solve, renderer and atomic writer as ``oddsbench
report``. Pure: runs in a thread worker; the path dialog is in ``screens/workbench/figure_views.py``."""

from __future__ import annotations

from collections.abc import Callable
from pathlib import Path

from oddsbench.core.game import Game
from oddsbench.core.settings import SessionRequest, Settings
from oddsbench.core.work import Work
from oddsbench.model.errors import OddsbenchError
from oddsbench.model.ruleset import Ruleset
from oddsbench.report.writing import FORMATS, report_format
from oddsbench.tui.analysis import RoundFailure, session_settings_of
from oddsbench.tui.file_targets import path_problem
from oddsbench.tui.setting_ways import problem_line


def suggested_report_path(source_path: Path | None, folder: Path) -> Path:
    """``NAME-report.md`` in the working folder (a bundled game's report too), relative to the
    current folder when it is inside it."""
    stem = source_path.stem if source_path is not None else "new-game"
    target = folder / f"{stem}-report.md"
    try:
        return target.resolve().relative_to(Path.cwd().resolve())
    except ValueError:
        return target


def report_path_problem(value: str) -> str | None:
    """Why a report cannot be written to the typed path, or None."""
    problem = path_problem(value)
    if problem is not None:
        return problem
    if Path(value).expanduser().suffix.lower() not in (".md", ".markdown", ".csv", ".json"):
        return f"end the name with .md, .csv or .json (the report's format: {', '.join(FORMATS)})"
    return None


def write_report(
    ruleset: Ruleset,
    text: str,
    plans: tuple[str, ...],
    path: Path,
    force: bool,
    should_stop: Callable[[], bool] | None = None,
) -> str | RoundFailure:
    """Solve what ``oddsbench report`` reports (every named strategy; the sessions of the file's
    [session] table under ``plans`` when it has one) and write it atomically; the message to show."""
    from oddsbench.core.reports import report_figures
    from oddsbench.model.atomic_write import write_atomically
    from oddsbench.report.writing import render_report

    session = None
    skipped = ""
    if ruleset.session:
        try:
            session_settings_of(ruleset)
            session = SessionRequest(plans=plans)
        except OddsbenchError as error:
            skipped = f" (no sessions: {problem_line(error)})"
    game = Game(ruleset.source, ruleset=ruleset, text=text)
    fmt = report_format(None, path)
    try:
        figures = report_figures(game, Settings(session=session), Work(should_stop=should_stop or (lambda: False)))
        rendered = render_report(figures, fmt)
        written = write_atomically(path, rendered, force=force)
    except OddsbenchError as error:
        return RoundFailure(f"no report written: {problem_line(error)}")
    return f"wrote {written} ({fmt}, {len(rendered.encode('utf-8')):,} bytes){skipped}"
