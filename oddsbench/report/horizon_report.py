"""The total net after N rounds as text and as the documented JSON object (``oddsbench horizon``).

Formatting only: every value comes from ``core.horizon``. Quantiles and totals are money (the
round's nets as the file writes its pays); the return to player is the realised one over N rounds,
1 + total / (N x expected staked).
"""

from __future__ import annotations

from dataclasses import dataclass
from typing import TYPE_CHECKING, Any

from oddsbench.model.figure import Figure
from oddsbench.model.numbers import Rational, text, to_float
from oddsbench.report.cautions import HORIZON_CAUTIONS, caution_block
from oddsbench.report.figure_table import FigureTable, Shown, row, word
from oddsbench.report.json_output import envelope
from oddsbench.report.numbers_text import decimal_text, exact_text, figure_decimal_text, render_table
from oddsbench.report.round_report import figure_json

if TYPE_CHECKING:
    from oddsbench.core.results import Horizon, HorizonResults

EXACT_WIDTH = 40
METHODS = {"exact": "exact law", "float": "float convolution"}


def _percent(figure: Figure) -> str:
    return figure_decimal_text(figure, percent=True)


def _chance(key: str, label: str, figure: Figure) -> HorizonItem:
    return HorizonItem(key, label, _exact(figure.exact), _percent(figure), figure_decimal_text(figure))


def _exact(*values: Rational | None) -> tuple[Rational, ...] | None:
    return None if any(value is None for value in values) else values


def _rtp_text(figure: Figure) -> str:
    return f"{figure.decimal * 100:.4g} %"


def summary_rows(results: HorizonResults) -> list[list[str]]:
    """rounds | law | ahead | even | behind | realised return, 90 % range | normal approximation (decimals)."""
    rows = []
    for h in results.horizons:
        band = next((r for r in h.rtp_ranges if r.level == 90), None)
        rows.append(
            [
                f"{h.rounds:,}",
                h.method,
                _percent(h.ahead),
                _percent(h.even),
                _percent(h.behind),
                f"{_rtp_text(band.low)} .. {_rtp_text(band.high)}" if band else "-",
                f"{band.normal_low * 100:.4g} % .. {band.normal_high * 100:.4g} %" if band else "-",
            ]
        )
    return rows


SUMMARY_HEADERS = ["rounds", "law", "ahead", "even", "behind", "return, 90 % range", "normal approximation"]


@dataclass(frozen=True)
class HorizonItem:
    """One figure after N rounds: its key (for its meaning), its label, its exact value (one value, or
    the two ends of a range; None where only a decimal exists) and its decimal text."""

    key: str
    label: str
    exact: tuple[Rational, ...] | None
    decimal: str
    brief: str | None = None  # a shorter decimal for narrow columns (no percent form; ranges in percent, 3 digits)


def horizon_items(h: Horizon) -> list[HorizonItem]:
    """Every figure after ``h.rounds`` rounds, in the order the text and the workbench show them; each
    normal approximation on the row under the figure it approximates, named."""
    items = [
        _chance("horizon.ahead", "ahead (total > 0)", h.ahead),
        _chance("horizon.even", "even (total = 0)", h.even),
        _chance("horizon.behind", "behind (total < 0)", h.behind),
        HorizonItem("horizon.mean", "mean total", (h.mean,), decimal_text(to_float(h.mean), h.mean)),
        HorizonItem(
            "horizon.variance", "variance of the total", (h.variance,), decimal_text(to_float(h.variance), h.variance)
        ),
    ]
    normal = dict(h.normal_quantiles)
    for q, figure in h.quantiles:
        label = f"quantile {q} % of the total"
        items.append(HorizonItem(f"horizon.quantile[{q}]", label, _exact(figure.exact), decimal_text(figure.decimal)))
        items.append(
            HorizonItem(f"horizon.quantile_normal[{q}]", f"  normal approximation, {q} %", None, f"{normal[q]:.6g}")
        )
    for band in h.rtp_ranges:
        level = band.level
        items += [
            HorizonItem(
                f"horizon.return_range[{level}]",
                f"{level} % range of the return to player",
                _exact(band.low.exact, band.high.exact),
                f"{_rtp_text(band.low)} .. {_rtp_text(band.high)}",
                f"{band.low.decimal * 100:.3g}..{band.high.decimal * 100:.3g}",
            ),
            _chance(f"horizon.return_range_inside[{level}]", f"  chance inside the {level} % range", band.inside),
            HorizonItem(
                f"horizon.return_range_normal[{level}]",
                f"  normal approximation, {level} %",
                None,
                f"{band.normal_low * 100:.4g} % .. {band.normal_high * 100:.4g} %",
                f"{band.normal_low * 100:.3g}..{band.normal_high * 100:.3g}",
            ),
        ]
    return items


def horizon_rows(h: Horizon) -> list[list[str]]:
    """quantity | exact | decimal for one number of rounds (long exact values shortened)."""
    rows = []
    for item in horizon_items(h):
        exact = (
            "" if item.exact is None else " .. ".join(exact_text(v, EXACT_WIDTH // len(item.exact)) for v in item.exact)
        )
        rows.append([item.label, exact, item.decimal])
    return rows


def rounds_column(rounds: int) -> str:
    """A column of figures after ``rounds`` rounds, as the workbench and its detail pane name it."""
    return f"N = {rounds:,}"


def horizon_table(results: HorizonResults) -> FigureTable:
    """The figures after each number of rounds side by side, one column per N, for a screen: the law
    used (exact or float), then every item of ``horizon_items`` with its exact value in full."""
    columns = tuple(rounds_column(h.rounds) for h in results.horizons)
    per_rounds = [horizon_items(h) for h in results.horizons]
    rows = [row("horizon.law", "law", [word(h.method) for h in results.horizons])]
    for index, first in enumerate(per_rounds[0]):
        cells = []
        for items in per_rounds:
            item = items[index]
            exact = None if item.exact is None else " .. ".join(text(v) for v in item.exact)
            cells.append(Shown(exact, item.decimal, item.brief))
        rows.append(row(first.key, first.label, cells, first.key.split("[")[0]))
    return FigureTable(columns, tuple(rows))


def heading_lines(results: HorizonResults) -> tuple[str, str]:
    """What is asked (the game, its start and strategy) and one round's figures, as two lines."""
    play = f" from {results.start!r}" if results.start else ""
    if results.strategy:
        play += f", strategy {results.strategy!r}"
    one = (
        f"One round: expected net {text(results.expected_net.exact)} ({decimal_text(results.expected_net.decimal)}), "
        f"variance {exact_text(results.net_variance.exact, 24)} ({decimal_text(results.net_variance.decimal)})"
    )
    rtp = results.return_to_player
    if rtp is not None:
        one += f", return to player {exact_text(rtp.exact, 24)} ({_rtp_text(rtp)})"
    return (
        f"{results.title}: the total net after N independent rounds{play}",
        one + f"; {len(results.law):,} net value(s).",
    )


RANGE_NOTE = (
    "the return-to-player range lies between the (100 - level)/2 % and (100 + level)/2 % quantiles of the "
    "law (it holds at least the level; the exact chance inside is shown); the normal approximation (de "
    "Moivre-Laplace) uses the exact mean and standard deviation"
)


def horizon_notes(results: HorizonResults) -> list[str]:
    """The notes of the round and of each N (where the exact law gave way to floats, and why)."""
    notes = list(results.notes)
    for h in results.horizons:
        notes += [f"{h.rounds:,} rounds: {note}" for note in h.notes]
    return notes + [RANGE_NOTE]


def horizon_text(results: HorizonResults) -> str:
    """The human output of ``oddsbench horizon``: a summary table, then every figure for each N."""
    parts = list(heading_lines(results))
    parts += ["", render_table(SUMMARY_HEADERS, summary_rows(results))]
    for h in results.horizons:
        parts += ["", _block_heading(h), "", render_table(["quantity", "exact", "decimal"], horizon_rows(h))]
    parts += ["", "Notes:"] + [f"  - {note}" for note in horizon_notes(results)]
    parts += ["", caution_block() + "\n" + "\n".join(f"  - {line}" for line in HORIZON_CAUTIONS)]
    return "\n".join(parts)


def _block_heading(h: Horizon) -> str:
    last = h.low + h.step * (h.support - 1)
    return (
        f"After {h.rounds:,} round(s): {METHODS[h.method]}, {h.support:,} possible totals from {text(h.low)} to "
        f"{text(last)} in steps of {text(h.step)}"
    )


def horizon_json(results: HorizonResults) -> dict[str, Any]:
    """The ``--json`` object of ``oddsbench horizon``."""
    body: dict[str, Any] = {
        "ruleset": results.title,
        "start": results.start,
        "strategy": results.strategy,
        "round": {
            "expected_net": figure_json(results.expected_net),
            "net_variance": figure_json(results.net_variance),
            "expected_staked": None if results.expected_staked is None else figure_json(results.expected_staked),
            "return_to_player": None if results.return_to_player is None else figure_json(results.return_to_player),
            "net_law": [
                {"net": figure_json(Figure(net, to_float(net))), "probability": figure_json(Figure(p, to_float(p)))}
                for net, p in results.law
            ],
        },
        "horizons": [_horizon_json(h) for h in results.horizons],
        "notes": list(results.notes) + [f"{h.rounds} rounds: {note}" for h in results.horizons for note in h.notes],
    }
    out = envelope("horizon", body)
    out["cautions"] = out["cautions"] + list(HORIZON_CAUTIONS)
    return out


def _horizon_json(h: Horizon) -> dict[str, Any]:
    normal = dict(h.normal_quantiles)
    return {
        "rounds": h.rounds,
        "method": h.method,
        "support": h.support,
        "lowest": figure_json(Figure(h.low, to_float(h.low))),
        "step": figure_json(Figure(h.step, to_float(h.step))),
        "mean": figure_json(Figure(h.mean, to_float(h.mean))),
        "variance": figure_json(Figure(h.variance, to_float(h.variance))),
        "ahead": figure_json(h.ahead),
        "even": figure_json(h.even),
        "behind": figure_json(h.behind),
        "quantiles": {str(q): figure_json(f) for q, f in h.quantiles},
        "normal_quantiles": {str(q): normal[q] for q, _ in h.quantiles},
        "rtp_range": {
            str(band.level): {
                "low": figure_json(band.low),
                "high": figure_json(band.high),
                "chance_inside": figure_json(band.inside),
                "normal_low": band.normal_low,
                "normal_high": band.normal_high,
            }
            for band in h.rtp_ranges
        },
        "chance_error": h.error_bound,
    }
