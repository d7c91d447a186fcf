"""Every figure of a bankroll session, exactly and in floating point.

With N = (I - Q)^-1 over the transient (bankroll, level) states and R the one-round chances of
being absorbed, the chance of reaching the goal from every bankroll is N r_goal, the expected
number of rounds N 1 (second moment N (2t - 1)), the expected total staked N s. One transposed
solve from the start, v = N^T e_start (expected visits), gives the whole distribution of the
final bankroll at once: P(end at a) = sum_i v_i R[i, a]. One sparse LU serves every solve.
With a time cap (``max_rounds``) the chain is no longer time-homogeneous, and the figures come
from stepping the distribution forward round by round; "within N rounds" figures likewise.
Exact results are the truth when the chain is small enough; decimals are checked against them.
"""

from __future__ import annotations

from collections.abc import Callable
from dataclasses import dataclass, field

import numpy as np

from oddsbench.chain.bankroll import FLOOR, GOAL, KIND_NAMES, RUIN, BankrollChain
from oddsbench.model import budget
from oddsbench.model.numbers import QQ, Rational, to_float
from oddsbench.solve.by_step import require_exact_steps
from oddsbench.solve.linear import ExactTooLarge, factor_exact, factor_float, identity_minus, identity_minus_float
from oddsbench.solve.linear.costs import ExactClock
from oddsbench.solve.round import Figure

DEFAULT_EXACT_LIMIT = 3_000
EXACT_STEP_BUDGET = 3_000_000
RELATIVE_TOLERANCE = 1e-8
ZERO_TOLERANCE = 1e-11
TINY = 1e-290
EXACT_WORK_LIMIT = 20_000_000


@dataclass(frozen=True)
class FinalValue:
    """One possible bankroll at the end (or after N rounds), how the session got there, its chance."""

    steps: int
    money: Rational
    kind: str
    chance: Figure


@dataclass(frozen=True)
class SessionSolution:
    """Raw session figures from the start state, the final distribution and the goal series."""

    figures: dict[str, Figure]
    final: tuple[FinalValue, ...]
    goal_series: tuple[float, ...]
    goal_series_exact: tuple[Rational, ...] | None
    after_rounds: tuple[FinalValue, ...] = ()
    rounds: int | None = None
    exact: bool = False
    notes: tuple[str, ...] = field(default=())


def solve_session(
    chain: BankrollChain,
    max_rounds: int | None = None,
    rounds: int | None = None,
    exact_limit: int = DEFAULT_EXACT_LIMIT,
    should_stop: Callable[[], bool] | None = None,
) -> SessionSolution:
    """Solve a session chain (both engines where exact is feasible) and collect its figures."""
    notes: list[str] = []
    use_exact = chain.size <= exact_limit
    if not use_exact:
        notes.append(
            f"exact arithmetic skipped: {chain.size:,} bankroll states exceed the exact limit of "
            f"{exact_limit:,} (raise it with --exact-limit); decimals are from the float engine"
        )
    elif max_rounds is None and exact_work(chain) > EXACT_WORK_LIMIT * max(exact_limit / DEFAULT_EXACT_LIMIT, 1):
        use_exact = False
        notes.append(
            f"exact arithmetic skipped: the {chain.size:,}-state system fills in too much for rational "
            "elimination (a plan with large or varied bets); decimals are from the float engine"
        )
    if max_rounds is not None:
        budget_ok = max_rounds * chain.target.size <= EXACT_STEP_BUDGET
        if use_exact and not budget_ok:
            notes.append(
                f"time cap of {max_rounds:,} rounds: exact stepping skipped (over {EXACT_STEP_BUDGET:,} "
                "updates); decimals are from the float engine"
            )
        use_exact = use_exact and budget_ok
        raw_decimal = _forward_decimal(chain, max_rounds)
        series = _capped_series_decimal(chain, max_rounds)
        raw_exact = series_exact = None
        if use_exact:
            capped = _exact_or_note(lambda: _capped_exact(chain, max_rounds, should_stop), notes, "time cap")
            raw_exact, series_exact = capped or (None, None)
            use_exact = capped is not None
    else:
        raw_decimal = _absorbing_decimal(chain, should_stop)
        raw_exact = None
        if use_exact:
            raw_exact = _exact_or_note(lambda: _absorbing_exact(chain, should_stop), notes, "session")
            use_exact = raw_exact is not None
        series = raw_decimal["series"]
        series_exact = raw_exact["series"] if raw_exact else None
    figures, final = _figures(chain, raw_exact, raw_decimal, notes, max_rounds)
    after: tuple[FinalValue, ...] = ()
    if rounds is not None:
        horizon = rounds if max_rounds is None else min(rounds, max_rounds)
        exact_within = use_exact and horizon * chain.target.size <= EXACT_STEP_BUDGET
        if use_exact and not exact_within:
            notes.append(f"figures within {horizon:,} rounds: exact stepping skipped; decimals only")
        within_decimal = _forward_decimal(chain, horizon)
        within_exact = None
        if exact_within:
            within_exact = _exact_or_note(
                lambda: _stepped_exact(chain, horizon, should_stop), notes, f"figures within {horizon:,} rounds"
            )
        within_figures, after = _figures(chain, within_exact, within_decimal, notes, horizon, prefix="within")
        figures.update(within_figures)
    goal_series, goal_exact = _series(chain, series, series_exact)
    _underflow_notes(figures, notes)
    goal = figures["goal_probability"]
    if goal.exact is None and goal.decimal == 0.0 and any(value > 0 for value in goal_series[:-1]):
        notes.append(
            "goal_probability: shown as 0 because it is below the float range (about 1e-308); the goal can "
            "be reached from higher bankrolls (see the series); solve a smaller grid exactly for its size"
        )
    return SessionSolution(
        figures=figures,
        final=final,
        goal_series=goal_series,
        goal_series_exact=goal_exact,
        after_rounds=after,
        rounds=rounds,
        exact=raw_exact is not None,
        notes=tuple(notes),
    )


def _exact_or_note(compute: Callable, notes: list[str], what: str):
    """The exact result, or None with a note when exact arithmetic would not fit the work budget."""
    try:
        return compute()
    except ExactTooLarge as error:
        notes.append(f"{what}: exact arithmetic stopped: {error}; decimals are from the float engine")
        return None


def _stepped_exact(chain: BankrollChain, steps: int, should_stop) -> dict | None:
    """``_forward_exact`` once its cost is known to fit (``by_step.require_exact_steps``)."""
    probabilities = [outcome.prob for outcome in chain.distribution.outcomes]
    require_exact_steps(probabilities, chain.target.size, steps, f"{steps:,} exact rounds")
    return _forward_exact(chain, steps, should_stop)


def _capped_exact(chain: BankrollChain, steps: int, should_stop) -> tuple[dict | None, list | None]:
    """The exact session and goal series with a time cap: forward and backward stepping."""
    probabilities = [outcome.prob for outcome in chain.distribution.outcomes]
    require_exact_steps(probabilities, 2 * chain.target.size, steps, f"{steps:,} exact rounds")
    return _forward_exact(chain, steps, should_stop), _capped_series_exact(chain, steps, should_stop)


def exact_work(chain: BankrollChain) -> int:
    """Estimated cost of the exact solve: entries of L and U (no reordering) times the state count.

    Exact values carry about as many digits as there are states, so the rational work grows like
    fill x size. The fill is read from a float factorisation in the same (natural) order.
    """
    n = chain.size
    if n == 0:
        return 0
    return factor_float(identity_minus_float(chain.q_matrix()), order="natural").stored * n


def _rhs_columns(chain: BankrollChain):
    """Per transient state: one-round chance of reaching the goal, and money staked per round."""
    grid = chain.grid
    goal_columns = chain.absorbing_kinds == GOAL
    staked_unit = grid.unit * chain.distribution.expected_staked
    return goal_columns, staked_unit


def _absorbing_decimal(chain: BankrollChain, should_stop=None) -> dict:
    n = chain.size
    goal_columns, staked_unit = _rhs_columns(chain)
    r = chain.r_matrix()
    values = chain.absorbing_values.astype(float) * to_float(chain.grid.step)
    if n == 0:
        return {"absorbed": np.zeros(len(values)), "start_absorbed": True, "series": np.zeros(0)}
    # value-major bankroll levels: eliminated from the top while the band's fill fits
    lu = factor_float(identity_minus_float(chain.q_matrix()), order="from-top", should_stop=should_stop)
    r_goal = np.asarray(r[:, goal_columns].sum(axis=1)).ravel()
    staked = chain.bets.astype(float) * to_float(staked_unit)
    solved = lu.solve(np.column_stack([r_goal, np.ones(n), staked]))
    h, t, s = solved[:, 0], solved[:, 1], solved[:, 2]
    start = max(chain.start, 0)
    second = lu.solve(2 * t - 1)
    e = np.zeros(n)
    e[start] = 1.0
    visits = lu.solve_transposed(e)
    absorbed = r.T @ visits
    return {
        "absorbed": absorbed,
        "rounds": t[start],
        "rounds_second": second[start],
        "staked": s[start],
        "playing": np.zeros(0),
        "series": h,
        "values": values,
    }


def _absorbing_exact(chain: BankrollChain, should_stop) -> dict | None:
    n = chain.size
    goal_columns, staked_unit = _rhs_columns(chain)
    q_rows, r_rows = chain.exact_rows()
    if n == 0:
        return None
    lu = factor_exact(identity_minus(q_rows), should_stop=should_stop)
    goal_set = set(np.flatnonzero(goal_columns).tolist())
    r_goal = [sum((p for a, p in row.items() if a in goal_set), QQ(0)) for row in r_rows]
    h = lu.solve(r_goal)
    t = lu.solve([QQ(1)] * n)
    staked = lu.solve([staked_unit * int(b) for b in chain.bets.tolist()])
    start = max(chain.start, 0)
    second = lu.solve([2 * x - 1 for x in t])
    e = [QQ(0)] * n
    e[start] = QQ(1)
    visits = lu.solve_transposed(e)
    absorbed = [QQ(0)] * len(chain.absorbing_values)
    for i, row in enumerate(r_rows):
        if visits[i] != 0:
            for a, p in row.items():
                absorbed[a] += visits[i] * p
    return {
        "absorbed": absorbed,
        "rounds": t[start],
        "rounds_second": second[start],
        "staked": staked[start],
        "playing": [],
        "series": h,
    }


def _forward_decimal(chain: BankrollChain, steps: int) -> dict:
    """Step the distribution over states ``steps`` rounds from the start."""
    n = chain.size
    goal_columns, staked_unit = _rhs_columns(chain)
    absorbed = np.zeros(len(chain.absorbing_values))
    if n == 0 or chain.start < 0:
        return {"absorbed": absorbed, "rounds": 0.0, "rounds_second": 0.0, "staked": 0.0, "playing": np.zeros(n)}
    q_t = chain.q_matrix().T.tocsr()
    r_t = chain.r_matrix().T.tocsr()
    staked = chain.bets.astype(float) * to_float(staked_unit)
    d = np.zeros(n)
    d[chain.start] = 1.0
    rounds = second = spent = 0.0
    for step in range(steps):
        if step % 64 == 0:
            budget.check(f"the session stepped over {steps:,} rounds")
        alive = d.sum()
        if alive == 0.0:
            break
        rounds += alive
        second += (2 * step + 1) * alive
        spent += float(d @ staked)
        absorbed += r_t @ d
        d = q_t @ d
    return {"absorbed": absorbed, "rounds": rounds, "rounds_second": second, "staked": spent, "playing": d}


def _forward_exact(chain: BankrollChain, steps: int, should_stop) -> dict | None:
    n = chain.size
    if n == 0 or chain.start < 0:
        return None
    _, staked_unit = _rhs_columns(chain)
    q_rows, r_rows = chain.exact_rows()
    bets = chain.bets.tolist()
    d: dict[int, Rational] = {chain.start: QQ(1)}
    absorbed = [QQ(0)] * len(chain.absorbing_values)
    rounds = second = spent = QQ(0)
    clock = ExactClock(should_stop, steps, "stepping")
    for step in range(steps):
        if step % 64 == 0:
            clock.poll(step)
        if not d:
            break
        alive = sum(d.values(), QQ(0))
        rounds += alive
        second += (2 * step + 1) * alive
        spent += staked_unit * sum((w * bets[i] for i, w in d.items()), QQ(0))
        nxt: dict[int, Rational] = {}
        for i, w in d.items():
            for j, p in q_rows[i].items():
                nxt[j] = nxt.get(j, QQ(0)) + w * p
            for a, p in r_rows[i].items():
                absorbed[a] += w * p
        d = {j: w for j, w in nxt.items() if w != 0}
    playing = [QQ(0)] * n
    for i, w in d.items():
        playing[i] = w
    return {"absorbed": absorbed, "rounds": rounds, "rounds_second": second, "staked": spent, "playing": playing}


def _capped_series_decimal(chain: BankrollChain, steps: int) -> np.ndarray:
    """Chance of reaching the goal within ``steps`` rounds from every state (backward stepping)."""
    n = chain.size
    if n == 0:
        return np.zeros(0)
    q = chain.q_matrix()
    r = chain.r_matrix()
    r_goal = np.asarray(r[:, chain.absorbing_kinds == GOAL].sum(axis=1)).ravel()
    h = np.zeros(n)
    for step in range(steps):
        if step % 64 == 0:
            budget.check(f"the goal chances within {steps:,} rounds")
        moved = q @ h + r_goal
        if np.array_equal(moved, h):  # a fixed point in floating point: every further round gives it again
            break
        h = moved
    return h


def _capped_series_exact(chain: BankrollChain, steps: int, should_stop) -> list | None:
    n = chain.size
    if n == 0:
        return None
    q_rows, r_rows = chain.exact_rows()
    goal_set = set(np.flatnonzero(chain.absorbing_kinds == GOAL).tolist())
    r_goal = [sum((p for a, p in row.items() if a in goal_set), QQ(0)) for row in r_rows]
    h = [QQ(0)] * n
    clock = ExactClock(should_stop, steps, "stepping")
    for step in range(steps):
        if step % 64 == 0:
            clock.poll(step)
        h = [r_goal[i] + sum((p * h[j] for j, p in q_rows[i].items()), QQ(0)) for i in range(n)]
    return h


def _figures(chain, exact, decimal, notes, horizon, prefix: str = ""):
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


def _series(chain: BankrollChain, series, series_exact) -> tuple[tuple[float, ...], tuple | None]:
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


def _underflow_notes(figures: dict[str, Figure], notes: list[str]) -> None:
    for name, figure in figures.items():
        if figure.exact is None and 0 < abs(figure.decimal) < TINY:
            notes.append(
                f"{name}: {figure.decimal!r} is at the bottom of the float range and may be a rounding "
                "plateau rather than the true value; solve a smaller grid exactly to check"
            )
