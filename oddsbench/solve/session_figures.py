"""A session's named figures and final distribution from raw solutions, exact beside decimal.

Exact values are the truth where they exist; each decimal from the float engine is checked
against them by the one rule of solve/checked.py, and values at the bottom of the float range are
named once per figure as possible rounding plateaus.
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np

from oddsbench.chain.bankroll import FLOOR, GOAL, KIND_NAMES, RUIN, BankrollChain
from oddsbench.model.figure import FLOAT_TINY, Figure
from oddsbench.model.float_series import FloatSeries
from oddsbench.model.numbers import QQ, Rational, to_float
from oddsbench.solve.checked import Tolerance, checked_figure

# durations lose digits with the grid's length (NUMERICS.md); underflow is named once per figure
# (underflow_notes), not once per final bankroll
TOLERANCE = Tolerance(relative=1e-8, absolute=1e-11, small_notes=False)
ROUNDS_TOLERANCE = Tolerance(relative=1e-6, absolute=1e-11, small_notes=False)
TINY = 1e-290


@dataclass(frozen=True)
class FinalValue:
    """One possible bankroll at the end (or after N rounds), how the session got there, its chance."""

    steps: int
    money: Rational
    kind: str
    chance: Figure


def session_figures(chain, exact, decimal, notes, horizon, prefix: str = ""):
    """Named figures and the bankroll distribution, exact where available, checked both ways."""
    grid = chain.grid
    step_float = to_float(grid.step)
    start_money = grid.money(grid.start)
    kinds = chain.absorbing_kinds
    values = chain.absorbing_values
    if chain.start < 0:
        where = -1 - chain.start
        absorbed_exact = [QQ(1) if a == where else QQ(0) for a in range(len(values))]
        exact = {"absorbed": absorbed_exact, "rounds": QQ(0), "rounds_second": QQ(0), "staked": QQ(0), "playing": []}
        decimal = {
            "absorbed": np.array([float(x) for x in absorbed_exact]),
            "rounds": 0.0,
            "rounds_second": 0.0,
            "staked": 0.0,
            "playing": np.zeros(0),
        }
    named: dict[str, tuple] = {}

    def put(name, exact_value, decimal_value, log10=None):
        named[name] = (exact_value, float(decimal_value), log10)

    absorbed_d = np.asarray(decimal["absorbed"], dtype=float)
    absorbed_log10 = decimal.get("absorbed_log10")
    playing_d = np.asarray(decimal["playing"], dtype=float)
    for kind, name in ((GOAL, "goal_probability"), (RUIN, "ruin_probability"), (FLOOR, "floor_probability")):
        if kind == FLOOR and grid.floor == 0:
            continue
        mask = kinds == kind
        ex = sum((exact["absorbed"][a] for a in np.flatnonzero(mask)), QQ(0)) if exact else None
        total = absorbed_d[mask].sum()
        put(name, ex, total, _sum_log10(absorbed_log10, mask) if total < FLOAT_TINY else None)
    if horizon is not None:
        ex = sum(exact["playing"], QQ(0)) if exact else None
        label = "playing_probability" if prefix else "time_cap_probability"
        put(label, ex, playing_d.sum())
    put("expected_rounds", exact["rounds"] if exact else None, decimal["rounds"])
    variance_e = exact["rounds_second"] - exact["rounds"] ** 2 if exact else None
    variance_d = decimal.get("rounds_variance", decimal["rounds_second"] - decimal["rounds"] ** 2)
    put("rounds_variance", variance_e, variance_d)
    put("expected_staked", exact["staked"] if exact else None, decimal["staked"])
    final_d = float(absorbed_d @ (values.astype(float) * step_float))
    if playing_d.size:
        final_d += float(playing_d @ (chain.values.astype(float) * step_float))
    final_e = None
    if exact:
        final_e = sum((p * grid.money(int(v)) for p, v in zip(exact["absorbed"], values.tolist())), QQ(0))
        final_e += sum((p * grid.money(int(v)) for p, v in zip(exact["playing"], chain.values.tolist())), QQ(0))
    label_final = "expected_bankroll" if prefix else "expected_final_bankroll"
    put(label_final, final_e, final_d)
    edge = chain.distribution.house_edge
    put("expected_net", None if final_e is None else final_e - start_money, final_d - to_float(start_money))
    staked_e, staked_d, _ = named["expected_staked"]
    put("edge_times_staked", None if staked_e is None else -edge * staked_e, -to_float(edge) * staked_d)
    figures = {}
    digits = decimal.get("digits", {})
    for name, (ex, dec, log10) in named.items():
        key = f"{prefix}_{name}" if prefix else name
        tolerance = ROUNDS_TOLERANCE if "rounds" in name else TOLERANCE
        figures[key] = checked_figure(key, ex, dec, notes, tolerance, log10, digits.get(name))
    final = _distribution(chain, exact, absorbed_d, playing_d, notes, prefix, absorbed_log10)
    return figures, final


def _sum_log10(log10s, mask) -> float | None:
    """log10 of a sum of chances given by their log10s (None where none is known)."""
    if log10s is None:
        return None
    known = log10s[mask]
    known = known[np.isfinite(known)]
    if not known.size:
        return None
    top = float(known.max())
    return top + float(np.log10(np.sum(10.0 ** (known - top))))


def _distribution(chain, exact, absorbed_d, playing_d, notes, prefix, absorbed_log10=None) -> tuple[FinalValue, ...]:
    grid = chain.grid
    rows: dict[tuple[int, str], list] = {}
    for a, (value, kind) in enumerate(zip(chain.absorbing_values.tolist(), chain.absorbing_kinds.tolist())):
        ex = exact["absorbed"][a] if exact else None
        entry = rows.setdefault((value, KIND_NAMES[kind]), [QQ(0) if exact else None, 0.0, None])
        if exact:
            entry[0] += ex
        entry[1] += float(absorbed_d[a])
        if absorbed_log10 is not None and np.isfinite(absorbed_log10[a]) and absorbed_d[a] < FLOAT_TINY:
            entry[2] = float(absorbed_log10[a])
    if playing_d.size:
        kind = "playing" if prefix else "time cap"
        for i, value in enumerate(chain.values.tolist()):
            if playing_d[i] == 0 and not (exact and exact["playing"][i] != 0):
                continue
            entry = rows.setdefault((value, kind), [QQ(0) if exact else None, 0.0, None])
            if exact:
                entry[0] += exact["playing"][i]
            entry[1] += float(playing_d[i])
    out = []
    for (value, kind), (ex, dec, log10) in sorted(rows.items()):
        if (ex is not None and ex == 0) or (ex is None and dec == 0.0 and log10 is None):
            continue
        figure = checked_figure(f"{prefix or 'final'} bankroll {value}", ex, dec, notes, TOLERANCE, log10)
        out.append(FinalValue(value, grid.money(value), kind, figure))
    return tuple(out)


def goal_series_of(chain: BankrollChain, series, series_exact, series_log10=None):
    """Goal chance (level 0) for every bankroll 0 .. goal in grid steps: decimals, exact values
    where the exact engine ran, and log10s where the float engine gave them (a value below the
    float range has decimal 0.0 and its size in the log10)."""
    grid = chain.grid
    size = grid.goal + 1
    decimal = np.zeros(size)
    decimal[grid.goal] = 1.0
    width = grid.width
    if width:
        decimal[grid.low : grid.goal] = np.asarray(series, dtype=float)[:: chain.levels][:width]
    log10 = None
    if series_log10 is not None:
        log10 = np.full(size, -np.inf)
        log10[grid.goal] = 0.0
        if width:
            log10[grid.low : grid.goal] = np.asarray(series_log10, dtype=float)[:: chain.levels][:width]
    exact = None
    if series_exact is not None:
        exact = [QQ(0)] * size
        exact[grid.goal] = QQ(1)
        for k in range(width):
            exact[grid.low + k] = series_exact[k * chain.levels]
        decimal = np.array([to_float(v) for v in exact])
    decimal[np.abs(decimal) < FLOAT_TINY] = 0.0
    return (
        FloatSeries(decimal),
        (tuple(exact) if exact is not None else None),
        log10,
    )


def underflow_notes(figures: dict[str, Figure], notes: list[str]) -> None:
    for name, figure in figures.items():
        if figure.exact is None and figure.log10 is None and 0 < abs(figure.decimal) < TINY:
            notes.append(
                f"{name}: {figure.decimal!r} is at the bottom of the float range and may be a rounding "
                "plateau rather than the true value; solve a smaller grid exactly to check"
            )
