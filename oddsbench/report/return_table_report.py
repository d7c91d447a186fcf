"""The return table of a round as rows, text and JSON: the net law and each paying step's share.

Formatting only: the engine (``solve/return_table.py``) computed every value; this module labels
and lays them out for ``solve``, reports (Markdown, CSV, JSON) and the workbench's Round view.
"""

from __future__ import annotations

from typing import TYPE_CHECKING, Any

from oddsbench.model.figure import Figure
from oddsbench.model.numbers import Rational, text, to_float
from oddsbench.report.numbers_text import decimal_text, exact_text, render_table

if TYPE_CHECKING:
    from oddsbench.core.results import NetValue, RoundFigures

NET_TEXT_ROWS = 30  # net values shown in text; every one is in --json
SCREEN_LAW_ROWS = 1_000  # net values a screen table lists (a table of 10,000 took 1.5 s to redraw)
SHARE_TEXT_ROWS = 20  # paying steps shown in text (largest shares first when there are more)
LAW_HEADERS = ["net", "chance", "chance (decimal)", "contribution", "contribution (decimal)"]
SHARE_HEADERS = ["step", "pay", "times taken", "share of expected net", "decimal"]


def value_json(value: Rational) -> dict[str, Any]:
    """``{"exact": "7/495", "decimal": 0.0141..., "log10": null}`` for an exact value (a power of ten
    in ``log10`` where a float cannot hold it, as every figure)."""
    from oddsbench.report.round_report import figure_json  # round_report lists this module's tables

    return figure_json(Figure(value, to_float(value)))


def step_label(source: str, action: str | None, target: str) -> str:
    return f"{source} [{action}] -> {target}" if action else f"{source} -> {target}"


def net_law_rows(figures: RoundFigures, limit: int | None = NET_TEXT_ROWS, width: int | None = 40) -> list[list[str]]:
    """net | chance | decimal | contribution | decimal, in order of the net (at most ``limit`` rows)."""
    table = figures.return_table
    if table is None or table.law is None:
        return []
    shown = table.law if limit is None else table.law[:limit]
    return [
        [
            exact_text(value.net, width),
            exact_text(value.probability, width),
            decimal_text(to_float(value.probability), value.probability, percent=True),
            exact_text(value.contribution, width),
            decimal_text(to_float(value.contribution), value.contribution),
        ]
        for value in shown
    ]


def share_rows(figures: RoundFigures, limit: int | None = SHARE_TEXT_ROWS, width: int | None = 40) -> list[list[str]]:
    """step | pay | times taken | share of the expected net | decimal; the largest shares first past ``limit``."""
    table = figures.return_table
    if table is None:
        return []
    shares = list(table.shares)
    if limit is not None and len(shares) > limit:
        shares = sorted(shares, key=lambda s: -abs(to_float(s.contribution)))[:limit]
    return [
        [
            step_label(s.source, s.action, s.target),
            exact_text(s.pay, width),
            exact_text(s.taken, width),
            exact_text(s.contribution, width),
            decimal_text(to_float(s.contribution), s.contribution),
        ]
        for s in shares
    ]


def law_title(figures: RoundFigures) -> str:
    """The net law's one-line title on a screen ("" with no return table)."""
    table = figures.return_table
    if table is None:
        return ""
    if table.law is None:
        return f"net law: {table.values:,} values, too many to list (see the notes)"
    if table.values > SCREEN_LAW_ROWS:
        return (
            f"net law: the {SCREEN_LAW_ROWS:,} likeliest of {table.values:,} values shown, in order of the net; "
            "every value: oddsbench solve --json, or a report (F8)"
        )
    return f"net law: {table.values:,} value(s); contribution = chance x net, summing to the expected net"


def screen_law(figures: RoundFigures) -> tuple[NetValue, ...]:
    """The net values a screen lists: all of them up to ``SCREEN_LAW_ROWS``, else that many of the
    likeliest (the largest chances, ties to the smaller net), in order of the net."""
    table = figures.return_table
    if table is None or table.law is None:
        return ()
    if len(table.law) <= SCREEN_LAW_ROWS:
        return table.law
    order = sorted(range(len(table.law)), key=lambda i: (-table.law[i].probability, i))
    return tuple(table.law[i] for i in sorted(order[:SCREEN_LAW_ROWS]))


SHARES_TITLE = "each paying step's share of the expected net (times taken x pay)"


def return_table_text(figures: RoundFigures) -> str:
    """The net law and the shares of the expected net, for ``oddsbench solve`` (empty when not listed)."""
    table = figures.return_table
    if table is None:
        return ""
    parts = []
    if table.law is not None:
        parts += [f"Net result of the round: {table.values:,} value(s), each with its chance and its contribution"]
        parts += ["(chance x net; the contributions add up to the expected net)", ""]
        parts += [render_table(LAW_HEADERS, net_law_rows(figures), right=set(range(len(LAW_HEADERS))))]
        if table.values > NET_TEXT_ROWS:
            parts += [f"... {table.values - NET_TEXT_ROWS:,} more value(s): every one is in --json"]
    if table.shares:
        parts += ["", "Where the expected net comes from: each paying step, the expected times a round takes it,"]
        parts += ["and its share (times x pay)", ""]
        parts += [render_table(SHARE_HEADERS, share_rows(figures))]
        if len(table.shares) > SHARE_TEXT_ROWS:
            parts += [
                f"... the {SHARE_TEXT_ROWS} largest of {len(table.shares):,} paying steps; every one is in --json"
            ]
    return "\n".join(parts).strip("\n")


def net_law_json(figures: RoundFigures) -> list[dict[str, Any]] | None:
    """``[{"net", "probability", "contribution"}, ...]`` each ``{"exact", "decimal"}``; None when not listed."""
    table = figures.return_table
    if table is None or table.law is None:
        return None
    return [
        {"net": value_json(v.net), "probability": value_json(v.probability), "contribution": value_json(v.contribution)}
        for v in table.law
    ]


def return_shares_json(figures: RoundFigures) -> list[dict[str, Any]] | None:
    """Each paying step: ``from``, ``action``, ``to``, and ``pay``, ``taken``, ``contribution`` as exact | decimal."""
    table = figures.return_table
    if table is None:
        return None
    return [
        {
            "from": s.source,
            "action": s.action,
            "to": s.target,
            "pay": value_json(s.pay),
            "taken": value_json(s.taken),
            "contribution": value_json(s.contribution),
        }
        for s in table.shares
    ]


def return_table_csv_rows(figures: RoundFigures, subject: str) -> list[tuple[str, str, str, str, str, str]]:
    """Long-form CSV rows: one per net value (probability and contribution) and per paying step."""
    table = figures.return_table
    if table is None:
        return []
    rows = []
    for value in table.law or ():
        net = text(value.net)
        rows.append(
            ("net_law", subject, f"P(net = {net})", text(value.probability), repr(to_float(value.probability)), "")
        )
        rows.append(
            (
                "net_law",
                subject,
                f"contribution(net = {net})",
                text(value.contribution),
                repr(to_float(value.contribution)),
                "",
            )
        )
    for s in table.shares:
        rows.append(
            (
                "return_share",
                subject,
                step_label(s.source, s.action, s.target),
                text(s.contribution),
                repr(to_float(s.contribution)),
                f"pay {text(s.pay)}, taken {text(s.taken)} times on average",
            )
        )
    return rows
