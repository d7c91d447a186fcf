"""A report's content, taken from the core's results and rendered to Markdown, CSV or JSON.

Nothing here solves: ``build_report(figures)`` arranges what ``core.report_figures`` solved.
"""

from __future__ import annotations

from dataclasses import dataclass, field
from typing import TYPE_CHECKING, Any

from oddsbench import __version__
from oddsbench.model.ruleset import Ruleset
from oddsbench.report.cautions import CAUTIONS
from oddsbench.report.method_sources import ROUND_SOURCES, SESSION_SOURCES, MethodSource

if TYPE_CHECKING:  # result types only: the core (and the engines behind it) load when a question is asked
    from oddsbench.core.results import ReportFigures, RoundColumn


@dataclass(frozen=True)
class ReportDocument:
    ruleset: Ruleset
    content: str
    rounds: tuple[RoundColumn, ...]  # one round per way of playing (``strategy`` None: no decisions)
    sources: tuple[MethodSource, ...] = ROUND_SOURCES
    cautions: tuple[str, ...] = CAUTIONS
    extra_sections: tuple[Any, ...] = field(default=())
    version: str = __version__

    @property
    def compares_strategies(self) -> bool:
        return len(self.rounds) > 1


def build_report(figures: ReportFigures) -> ReportDocument:
    """Everything a report shows: the rounds, and the sessions compared when they were asked for."""
    from oddsbench.report.session_section import SessionSection

    game = figures.game
    document = ReportDocument(game.ruleset, game.text or "", figures.rounds.columns)
    if figures.sessions is None:
        return document
    return ReportDocument(
        document.ruleset,
        document.content,
        document.rounds,
        sources=document.sources + SESSION_SOURCES,
        extra_sections=(SessionSection(figures.sessions),),
    )
