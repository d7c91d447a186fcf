"""A session's named figures and final distribution from raw solutions, exact beside decimal.

Exact values are the truth where they exist; each decimal from the float engine is checked
against them (a gap over the tolerance becomes a note), and values at the bottom of the float
range are named as possible rounding plateaus.
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np

from oddsbench.chain.bankroll import FLOOR, GOAL, KIND_NAMES, RUIN, BankrollChain
from oddsbench.model.figure import Figure
from oddsbench.model.numbers import QQ, Rational, to_float

RELATIVE_TOLERANCE = 1e-8
ZERO_TOLERANCE = 1e-11
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

    def put(name, exact_value, decimal_value):
        named[name] = (exact_value, float(decimal_value))

    absorbed_d = np.asarray(decimal["absorbed"], dtype=float)
    playing_d = np.asarray(decimal["playing"], dtype=float)
    for kind, name in ((GOAL, "goal_probability"), (RUIN, "ruin_probability"), (FLOOR, "floor_probability")):
        if kind == FLOOR and grid.floor == 0:
            continue
        mask = kinds == kind
        ex = sum((exact["absorbed"][a] for a in np.flatnonzero(mask)), QQ(0)) if exact else None
        put(name, ex, absorbed_d[mask].sum())
    if horizon is not None:
        ex = sum(exact["playing"], QQ(0)) if exact else None
        label = "playing_probability" if prefix else "time_cap_probability"
        put(label, ex, playing_d.sum())
    put("expected_rounds", exact["rounds"] if exact else None, decimal["rounds"])
    variance_e = exact["rounds_second"] - exact["rounds"] ** 2 if exact else None
    put("rounds_variance", variance_e, decimal["rounds_second"] - decimal["rounds"] ** 2)
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
    staked_e, staked_d = named["expected_staked"]
    put("edge_times_staked", None if staked_e is None else -edge * staked_e, -to_float(edge) * staked_d)
    figures = {}
    for name, (ex, dec) in named.items():
        key = f"{prefix}_{name}" if prefix else name
        figures[key] = _checked(key, ex, dec, notes, name)
    final = _distribution(chain, exact, absorbed_d, playing_d, notes, prefix)
    return figures, final


def _distribution(chain, exact, absorbed_d, playing_d, notes, prefix) -> tuple[FinalValue, ...]:
    grid = chain.grid
    rows: dict[tuple[int, str], list] = {}
    for a, (value, kind) in enumerate(zip(chain.absorbing_values.tolist(), chain.absorbing_kinds.tolist())):
        ex = exact["absorbed"][a] if exact else None
        entry = rows.setdefault((value, KIND_NAMES[kind]), [QQ(0) if exact else None, 0.0])
        if exact:
            entry[0] += ex
        entry[1] += float(absorbed_d[a])
    if playing_d.size:
        kind = "playing" if prefix else "time cap"
        for i, value in enumerate(chain.values.tolist()):
            if playing_d[i] == 0 and not (exact and exact["playing"][i] != 0):
                continue
            entry = rows.setdefault((value, kind), [QQ(0) if exact else None, 0.0])
            if exact:
                entry[0] += exact["playing"][i]
            entry[1] += float(playing_d[i])
    out = []
    for (value, kind), (ex, dec) in sorted(rows.items()):
        if (ex is not None and ex == 0) or (ex is None and dec == 0.0):
            continue
        figure = _checked(f"{prefix or 'final'} bankroll {value}", ex, dec, notes, "probability")
        out.append(FinalValue(value, grid.money(value), kind, figure))
    return tuple(out)


def _checked(name: str, exact: Rational | None, decimal: float, notes: list[str], kind: str) -> Figure:
    if exact is None:
        if not np.isfinite(decimal):
            notes.append(f"{name}: the float engine gave {decimal}; no exact value to fall back on")
        return Figure(None, float(decimal))
    truth = to_float(exact)
    tolerance = 1e-6 if "rounds" in kind else RELATIVE_TOLERANCE
    limit = max(tolerance * abs(truth), ZERO_TOLERANCE * (1 if "probability" in kind else max(1.0, abs(truth))))
    if not np.isfinite(decimal) or abs(decimal - truth) > limit:
        notes.append(
            f"numerical warning: {name}: float engine gives {decimal!r}, exact value is {truth!r}; "
            "the exact value is shown"
        )
    return Figure(exact, truth)


def goal_series_of(chain: BankrollChain, series, series_exact) -> tuple[tuple[float, ...], tuple | None]:
    """Goal chance (level 0) for every bankroll 0 .. goal in grid steps."""
    grid = chain.grid
    size = grid.goal + 1
    decimal = np.zeros(size)
    decimal[grid.goal] = 1.0
    width = grid.width
    if width:
        decimal[grid.low : grid.goal] = np.asarray(series, dtype=float)[:: chain.levels][:width]
    exact = None
    if series_exact is not None:
        exact = [QQ(0)] * size
        exact[grid.goal] = QQ(1)
        for k in range(width):
            exact[grid.low + k] = series_exact[k * chain.levels]
        decimal = np.array([to_float(v) for v in exact])
    return tuple(decimal.tolist()), (tuple(exact) if exact is not None else None)


def underflow_notes(figures: dict[str, Figure], notes: list[str]) -> None:
    for name, figure in figures.items():
        if figure.exact is None and 0 < abs(figure.decimal) < TINY:
            notes.append(
                f"{name}: {figure.decimal!r} is at the bottom of the float range and may be a rounding "
                "plateau rather than the true value; solve a smaller grid exactly to check"
            )
