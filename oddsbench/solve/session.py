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
from oddsbench.model.figure import FLOAT_TINY, Figure
from oddsbench.model.numbers import QQ, Rational, to_float
from oddsbench.solve.bankroll_system import WalkView, float_system, skip_free_view
from oddsbench.solve.cancel import SolveCancelled
from oddsbench.solve.linear import factor_exact, factor_float, identity_minus, identity_minus_float

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
    goal_series_log10: np.ndarray | None = field(default=None, compare=False)  # log10 of each value (-inf: 0)


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
        raw_exact = _forward_exact(chain, max_rounds, should_stop) if use_exact else None
        series = _capped_series_decimal(chain, max_rounds)
        series_exact = _capped_series_exact(chain, max_rounds, should_stop) if use_exact else None
    else:
        raw_decimal = _absorbing_decimal(chain)
        raw_exact = _absorbing_exact(chain, should_stop) if use_exact else None
        series = raw_decimal["series"]
        series_exact = raw_exact["series"] if raw_exact else None
    figures, final = _figures(chain, raw_exact, raw_decimal, notes, max_rounds)
    if raw_exact is None:
        notes.extend(raw_decimal.get("notes", ()))
    after: tuple[FinalValue, ...] = ()
    if rounds is not None:
        horizon = rounds if max_rounds is None else min(rounds, max_rounds)
        exact_within = use_exact and horizon * chain.target.size <= EXACT_STEP_BUDGET
        if use_exact and not exact_within:
            notes.append(f"figures within {horizon:,} rounds: exact stepping skipped; decimals only")
        within_decimal = _forward_decimal(chain, horizon)
        within_exact = _forward_exact(chain, horizon, should_stop) if exact_within else None
        within_figures, after = _figures(chain, within_exact, within_decimal, notes, horizon, prefix="within")
        figures.update(within_figures)
    series_log10 = raw_decimal.get("series_log10") if max_rounds is None else None
    goal_series, goal_exact, goal_log10 = _series(chain, series, series_exact, series_log10)
    _underflow_notes(figures, notes)
    goal = figures["goal_probability"]
    if goal.exact is None and goal.log10 is None and goal.decimal == 0.0 and any(v > 0 for v in goal_series[:-1]):
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
        goal_series_log10=goal_log10,
    )


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


def _absorbing_decimal(chain: BankrollChain) -> dict:
    n = chain.size
    goal_columns, staked_unit = _rhs_columns(chain)
    values = chain.absorbing_values.astype(float) * to_float(chain.grid.step)
    if n == 0:
        return {"absorbed": np.zeros(len(values)), "start_absorbed": True, "series": np.zeros(0)}
    view = skip_free_view(chain)
    if view.walk is not None:
        return _walk_decimal(chain, view)
    r = chain.r_matrix()
    lu = factor_float(*float_system(chain))
    r_goal = np.asarray(r[:, goal_columns].sum(axis=1)).ravel()
    staked = chain.bets.astype(float) * to_float(staked_unit)
    solved = lu.solve(np.column_stack([r_goal, np.ones(n), staked]))
    h, t, s = solved[:, 0], solved[:, 1], solved[:, 2]
    start = max(chain.start, 0)
    spread = lu.solve(_centred_rhs(chain, t))
    visits = lu.solve_transposed(_unit(n, start))
    absorbed = r.T @ visits
    return {
        "absorbed": absorbed,
        "rounds": t[start],
        "rounds_second": spread[start] + t[start] ** 2,
        "rounds_variance": spread[start],
        "staked": s[start],
        "playing": np.zeros(0),
        "series": h,
        "values": values,
        "method": lu.method,
    }


SPLIT_TINY = 1e-12  # below this chance an overshoot past the far end is shown as one value, not split


def _walk_decimal(chain: BankrollChain, view: WalkView) -> dict:
    """Figures of a skip-free walk: end chances from positive terms in log space, moments by its
    Green function (or a band LU of the same walk), the final distribution from the start."""
    n = chain.size
    _, staked_unit = _rhs_columns(chain)
    factors = factor_float(view.walk)
    start = max(chain.start, 0)
    at = view.walk_level(start)
    near_decimal, near_log10 = factors.bottom_chance()  # the end the walk reaches exactly
    far_decimal, far_log10 = factors.top_chance()  # the end it may overshoot
    rounds_walk = factors.solve(np.ones(n))
    spread = view.chain_order(factors.solve(_centred_walk_rhs(view.walk, rounds_walk)))
    rounds = view.chain_order(rounds_walk)
    goal_decimal, goal_log10 = (near_decimal, near_log10) if view.mirrored else (far_decimal, far_log10)
    # where the walk's two ends sit among the chain's absorbing states
    low_value, goal_value = chain.grid.low - 1, chain.grid.goal
    near_value, far_value = (goal_value, low_value) if view.mirrored else (low_value, goal_value)
    index = {int(v): a for a, v in enumerate(chain.absorbing_values.tolist())}
    absorbed = np.zeros(len(chain.absorbing_values))
    absorbed_log10 = np.full(len(chain.absorbing_values), np.nan)
    absorbed[index[near_value]] = near_decimal[at]
    absorbed_log10[index[near_value]] = near_log10[at]
    notes = []
    far_total, far_total_log10 = far_decimal[at], far_log10[at]
    if view.walk.top == 1:
        absorbed[index[far_value]], absorbed_log10[index[far_value]] = far_total, far_total_log10
    else:
        row, bound = factors.visits_from(at)
        reliable = float(bound[row > 0].max(initial=0.0)) <= 1e-10
        if not reliable and far_total < SPLIT_TINY:
            absorbed[index[far_value]], absorbed_log10[index[far_value]] = far_total, far_total_log10
            past = "goal" if not view.mirrored else "ruin level"
            notes.append(
                f"the chance of ending past the {past} ({_power_text(far_total_log10)}) is shown at the {past} "
                "itself: too small to split by how far past it the last round went"
            )
        else:
            visits = view.chain_order(row if reliable else factors.solve_transposed(_unit(n, at)))
            far = np.zeros(len(absorbed))
            far_mask = chain.absorbing_kinds == GOAL if not view.mirrored else chain.absorbing_kinds != GOAL
            far += np.where(far_mask, chain.r_matrix().T @ visits, 0.0)
            absorbed = np.where(far_mask, far, absorbed)
    return {
        "absorbed": absorbed,
        "absorbed_log10": absorbed_log10,
        "rounds": rounds[start],
        "rounds_second": spread[start] + rounds[start] ** 2,
        "rounds_variance": spread[start],
        "staked": rounds[start] * int(chain.bets[0]) * to_float(staked_unit),
        "playing": np.zeros(0),
        "series": view.chain_order(goal_decimal),
        "series_log10": view.chain_order(goal_log10),
        "method": factors.method,
        "notes": notes,
    }


def _centred_rhs(chain: BankrollChain, rounds: np.ndarray) -> np.ndarray:
    """One round's share of the variance of the number of rounds, from every state: the variance of
    1 + (rounds left after it), sum_o p_o (1 + t(next) - t(k))^2, a sum of squares. Solving with it gives
    the variance itself (the law of total variance), never as E[T^2] - E[T]^2, which cancels."""
    after = np.where(chain.target >= 0, rounds[np.maximum(chain.target, 0)], 0.0)
    return ((1.0 + after - rounds[:, None]) ** 2 * chain.probabilities()[None, :]).sum(axis=1)


def _centred_walk_rhs(walk, rounds: np.ndarray) -> np.ndarray:
    """``_centred_rhs`` for a walk with one law at every level, by shifted slices instead of a gather."""
    n = walk.size
    total = np.zeros(n)
    for jump, prob in zip(walk.jumps.tolist(), walk.probs.tolist()):
        after = np.zeros(n)
        if abs(jump) < n:
            after[max(-jump, 0) : n - max(jump, 0)] = rounds[max(jump, 0) : n + min(jump, 0)]
        total += prob * (1.0 + after - rounds) ** 2
    return total


def _unit(size: int, at: int) -> np.ndarray:
    e = np.zeros(size)
    e[at] = 1.0
    return e


def _power_text(log10: float) -> str:
    """A log10 as a power of ten for notes (the report layer formats figures)."""
    exponent = int(np.floor(log10))
    return f"about {10 ** (log10 - exponent):.3g}e{exponent:+d}"


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
    for step in range(steps):
        if should_stop is not None and step % 64 == 0 and should_stop():
            raise SolveCancelled
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
    for _ in range(steps):
        h = q @ h + r_goal
    return h


def _capped_series_exact(chain: BankrollChain, steps: int, should_stop) -> list | None:
    n = chain.size
    if n == 0:
        return None
    q_rows, r_rows = chain.exact_rows()
    goal_set = set(np.flatnonzero(chain.absorbing_kinds == GOAL).tolist())
    r_goal = [sum((p for a, p in row.items() if a in goal_set), QQ(0)) for row in r_rows]
    h = [QQ(0)] * n
    for step in range(steps):
        if should_stop is not None and step % 64 == 0 and should_stop():
            raise SolveCancelled
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
        figures[key] = _checked(key, ex, dec, notes, name, log10, digits.get(name))
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
        figure = _checked(f"{prefix or 'final'} bankroll {value}", ex, dec, notes, "probability", log10)
        out.append(FinalValue(value, grid.money(value), kind, figure))
    return tuple(out)


def _checked(
    name: str,
    exact: Rational | None,
    decimal: float,
    notes: list[str],
    kind: str,
    log10: float | None = None,
    digits: int | None = None,
) -> Figure:
    if exact is None:
        if not np.isfinite(decimal):
            notes.append(f"{name}: the float engine gave {decimal}; no exact value to fall back on")
        if log10 is not None:
            return Figure(None, 0.0, log10)
        return Figure(None, float(decimal), None, digits)
    truth = to_float(exact)
    tolerance = 1e-6 if "rounds" in kind else RELATIVE_TOLERANCE
    limit = max(tolerance * abs(truth), ZERO_TOLERANCE * (1 if "probability" in kind else max(1.0, abs(truth))))
    if not np.isfinite(decimal) or abs(decimal - truth) > limit:
        notes.append(
            f"numerical warning: {name}: float engine gives {decimal!r}, exact value is {truth!r}; "
            "the exact value is shown"
        )
    return Figure(exact, truth)


def _series(chain: BankrollChain, series, series_exact, series_log10=None):
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
    decimal = np.where(np.abs(decimal) < FLOAT_TINY, 0.0, decimal)
    return (
        tuple(decimal.tolist()),
        (tuple(exact) if exact is not None else None),
        log10,
    )


def _underflow_notes(figures: dict[str, Figure], notes: list[str]) -> None:
    for name, figure in figures.items():
        if figure.exact is None and figure.log10 is None and 0 < abs(figure.decimal) < TINY:
            notes.append(
                f"{name}: {figure.decimal!r} is at the bottom of the float range and may be a rounding "
                "plateau rather than the true value; solve a smaller grid exactly to check"
            )
