"""The total net after N rounds as text and as the documented JSON object (``oddsbench horizon``).

Formatting only: every value comes from ``core.horizon``. Quantiles and totals are money (the
round's nets as the file writes its pays); the return to player is the realised one over N rounds,
1 + total / (N x expected staked).
"""

from __future__ import annotations

from typing import TYPE_CHECKING, Any

from oddsbench.model.figure import Figure
from oddsbench.model.numbers import text, to_float
from oddsbench.report.cautions import HORIZON_CAUTIONS, caution_block
from oddsbench.report.json_output import envelope
from oddsbench.report.numbers_text import decimal_text, exact_text, render_table
from oddsbench.report.round_report import figure_json

if TYPE_CHECKING:
    from oddsbench.core.results import Horizon, HorizonResults

EXACT_WIDTH = 40
METHODS = {"exact": "exact law", "float": "float convolution"}


def _percent(figure: Figure) -> str:
    return decimal_text(figure.decimal, figure.exact, percent=True)


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


def horizon_rows(h: Horizon) -> list[list[str]]:
    """quantity | exact | decimal for one number of rounds."""
    rows = [
        ["ahead (total > 0)", exact_text(h.ahead.exact, EXACT_WIDTH), _percent(h.ahead)],
        ["even (total = 0)", exact_text(h.even.exact, EXACT_WIDTH), _percent(h.even)],
        ["behind (total < 0)", exact_text(h.behind.exact, EXACT_WIDTH), _percent(h.behind)],
        ["mean total", exact_text(h.mean, EXACT_WIDTH), decimal_text(to_float(h.mean), h.mean)],
        ["variance of the total", exact_text(h.variance, EXACT_WIDTH), decimal_text(to_float(h.variance), h.variance)],
    ]
    normal = dict(h.normal_quantiles)
    for q, figure in h.quantiles:
        rows.append(
            [
                f"quantile {q} % of the total",
                exact_text(figure.exact, EXACT_WIDTH),
                f"{decimal_text(figure.decimal)}  (normal approximation {normal[q]:.6g})",
            ]
        )
    for band in h.rtp_ranges:
        exact = "-"
        if band.low.exact is not None:
            exact = f"{exact_text(band.low.exact, 18)} .. {exact_text(band.high.exact, 18)}"
        rows.append(
            [
                f"return to player, {band.level} % range",
                exact,
                f"{_rtp_text(band.low)} .. {_rtp_text(band.high)} (chance inside {decimal_text(band.inside.decimal)})",
            ]
        )
        rows.append(
            [
                f"  normal approximation, {band.level} %",
                "",
                f"{band.normal_low * 100:.4g} % .. {band.normal_high * 100:.4g} % (from the exact sd)",
            ]
        )
    return rows


def _heading(results: HorizonResults) -> list[str]:
    play = f" from {results.start!r}" if results.start else ""
    if results.strategy:
        play += f", strategy {results.strategy!r}"
    lines = [f"{results.title}: the total net after N independent rounds{play}"]
    one = (
        f"One round: expected net {text(results.expected_net.exact)} ({decimal_text(results.expected_net.decimal)}), "
        f"variance {exact_text(results.net_variance.exact, 24)} ({decimal_text(results.net_variance.decimal)})"
    )
    rtp = results.return_to_player
    if rtp is not None:
        one += f", return to player {exact_text(rtp.exact, 24)} ({_rtp_text(rtp)})"
    return lines + [one + f"; {len(results.law):,} net value(s)."]


def horizon_text(results: HorizonResults) -> str:
    """The human output of ``oddsbench horizon``: a summary table, then every figure for each N."""
    parts = _heading(results)
    parts += ["", render_table(SUMMARY_HEADERS, summary_rows(results))]
    for h in results.horizons:
        parts += ["", _block_heading(h), "", render_table(["quantity", "exact", "decimal"], horizon_rows(h))]
    notes = list(results.notes)
    for h in results.horizons:
        notes += [f"{h.rounds:,} rounds: {note}" for note in h.notes]
    notes.append(
        "the return-to-player range lies between the (100 - level)/2 % and (100 + level)/2 % quantiles of the "
        "law (it holds at least the level; the exact chance inside is shown); the normal approximation (de "
        "Moivre-Laplace) uses the exact mean and standard deviation"
    )
    parts += ["", "Notes:"] + [f"  - {note}" for note in notes]
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
