"""The Horizon view's work: the total net after N rounds for the loaded game under one strategy, as
report text (the table, its notes) and the core's own decimals for the two charts. Pure: runs in a
thread worker; the core computes, the report layer words, nothing here does arithmetic on figures."""

from __future__ import annotations

from collections.abc import Callable
from dataclasses import dataclass

from oddsbench.core.settings import Settings
from oddsbench.model.defaults import DEFAULT_HORIZON_ROUNDS
from oddsbench.model.errors import OddsbenchError
from oddsbench.model.ruleset import Ruleset
from oddsbench.report.figure_table import FigureTable
from oddsbench.tui.analysis import RoundFailure, _game, _played, _work
from oddsbench.tui.setting_ways import problem_line

ROUNDS_TEXT = ", ".join(str(n) for n in DEFAULT_HORIZON_ROUNDS)  # what the rounds field shows at first
CHART_LEVELS = (90, 99)  # the return-range bands drawn (every level is in the table)
POINTS_QUANTILES = (5, 95)  # a game of points (nothing staked) draws its total's range instead


@dataclass(frozen=True)
class RoundsRefused:
    """The core refused the numbers of rounds asked for (the law would be too large): said beside the
    rounds field, the last good figures kept."""

    message: str


@dataclass(frozen=True)
class Band:
    """One range drawn against N: its name, and its low and high ends at each N (the core's decimals)."""

    label: str
    low: tuple[float, ...]
    high: tuple[float, ...]


@dataclass(frozen=True)
class HorizonView:
    """What the Horizon view shows: heading lines, the table (one column per N), the notes, and the
    charts' series: the chance ahead, the bands of the realised return (or of the total, for a game of
    points) with their round ticks, all against N on a log scale."""

    heading: str
    one_round: str
    table: FigureTable
    notes: tuple[str, ...]
    rounds: tuple[int, ...]
    positions: tuple[float, ...]  # where each N sits on the charts' log axis
    ahead: tuple[float, ...]
    bands: tuple[Band, ...]
    expected: float | None  # the expected return to player (None: a game of points)
    band_title: str
    rounds_ticks: tuple[tuple[float, str], ...]
    band_ticks: tuple[tuple[float, str], ...]


def horizon_text(
    ruleset: Ruleset,
    strategy: str | None,
    rounds: tuple[int, ...],
    should_stop: Callable[[], bool] | None = None,
) -> HorizonView | RoundsRefused | RoundFailure:
    """``oddsbench horizon`` for the workbench; raises ``SolveCancelled`` when ``should_stop`` says so."""
    from oddsbench.core.horizons import TooManyRounds, horizon

    try:
        results = horizon(_game(ruleset), rounds, Settings(strategies=_played(ruleset, strategy)), _work(should_stop))
    except TooManyRounds as error:
        return RoundsRefused(str(error))  # said beside the rounds field: no way to add
    except OddsbenchError as error:
        return RoundFailure(problem_line(error))
    return horizon_view(results)


def horizon_view(results) -> HorizonView:
    """The view's text and series from the core's ``HorizonResults``."""
    from oddsbench.report.chart_ticks import log_positions, log_ticks, nice_ticks, percent_ticks
    from oddsbench.report.horizon_report import heading_lines, horizon_notes, horizon_table

    solved = results.horizons
    rounds = tuple(h.rounds for h in solved)
    rtp = results.return_to_player
    if rtp is not None:
        bands = tuple(
            Band(
                f"{level} % range",
                tuple(band.low.decimal for h in solved for band in h.rtp_ranges if band.level == level),
                tuple(band.high.decimal for h in solved for band in h.rtp_ranges if band.level == level),
            )
            for level in CHART_LEVELS
        )
        title = "realised return after N rounds"
    else:
        low, high = POINTS_QUANTILES
        bands = (
            Band(
                f"{low}-{high} % of the total",
                tuple(dict(h.quantiles)[low].decimal for h in solved),
                tuple(dict(h.quantiles)[high].decimal for h in solved),
            ),
        )
        title = "total after N rounds"
    values = [value for band in bands for value in band.low + band.high]
    if rtp is not None:
        values.append(rtp.decimal)
        band_ticks = percent_ticks(min(values), max(values))
    else:
        band_ticks = nice_ticks(min(values), max(values))
    heading, one_round = heading_lines(results)
    return HorizonView(
        heading=heading,
        one_round=one_round,
        table=horizon_table(results),
        notes=tuple(horizon_notes(results)),
        rounds=rounds,
        positions=tuple(log_positions(rounds)),
        ahead=tuple(h.ahead.decimal for h in solved),
        bands=bands,
        expected=None if rtp is None else rtp.decimal,
        band_title=title,
        rounds_ticks=tuple(log_ticks(min(rounds), max(rounds))),
        band_ticks=tuple(band_ticks),
    )
