"""What a factorisation and its solves will cost, estimated before they run, and the clock that
stops exact arithmetic when its share of the work budget is spent (``model/budget.py``).

Exact arithmetic is optional: past its share of the time, or of the memory, it gives way to the
float engine (``ExactTooLarge``, which callers turn into "decimals only, with a note"). Its time
is hard to foresee from sizes: a walk whose probability has a 60-digit denominator factors in
a fifth of a second, but each solve then works on numbers of 200,000 bits, row after row, and
takes 10 s. So the estimate of a solve is measured on the factor's own largest numbers: one
multiply-and-subtract timed on them, times the entries a solve touches.
"""

from __future__ import annotations

import math
import time
from collections.abc import Callable, Sequence
from dataclasses import dataclass

from oddsbench.model import budget
from oddsbench.model.budget import TIME_OPTION, seconds_text
from oddsbench.model.errors import OddsbenchError
from oddsbench.model.numbers import QQ, Rational
from oddsbench.solve.cancel import SolveCancelled, current_stop

EXACT_MEMORY_SHARE = 0.6  # of the memory budget: exact factors past it give way to decimals
POLL_ROWS = 64
POLL_OPERATIONS = 4096
POLL_SECONDS = 0.05  # exact work asks whether to stop at least this often, however dear its rows grow
SAMPLE_REPEATS = 3
MIN_FORECAST_SECONDS = 0.5  # the pace of the first rows is not read before this
FORECAST_ROWS = 8
MAX_GROWTH_POWER = 4.0
SOLVE_WORK_FACTOR = 0.5  # measured: a solve row costs about half a timed multiply-subtract per entry touched


class ExactTooLarge(OddsbenchError):
    """The exact factors or solves would outgrow the size or time limit; callers fall back to decimals only."""


def factor_bits(stored: int, added: int, max_bits: int | None, row: int, size: int) -> int:
    """The exact factors' estimated size (numbers stored times the pivot's bits) after one more row
    of ``added`` bits: ``ExactTooLarge`` past ``max_bits`` (None: no limit), so elimination stops early."""
    stored += added
    if max_bits is not None and stored > max_bits:
        raise ExactTooLarge(
            f"the exact factors reach about {stored:,} bits at state {row + 1:,} of {size:,}, "
            f"over the exact size limit of {max_bits:,} bits (raise it with --exact-bits)"
        )
    return stored


def bits(value: Rational) -> int:
    return QQ.numer(value).bit_length() + QQ.denom(value).bit_length()


class ExactClock:
    """Polled inside exact elimination and solves: the caller's cancel check, the budget's
    deadline and memory guard, and the share of both that exact arithmetic may use.

    ``tick`` is called every row (or step): it polls once ``POLL_SECONDS`` have passed, so a stop is
    seen within one row however dear rows grow. Row counts alone are not enough: a solve's rows work
    on numbers that grow with the row (a 1,000-state walk with a 60-digit probability spends 5 s
    on 64 rows of its transposed solve).

    It also forecasts: rows of an elimination grow dearer as numbers and fill grow (a dense
    system's row i costs about i^2), so the time to come is read from how the time so far grew
    with the rows done (T(i) ~ i^m, m fitted between half-way and now, 1 <= m <= 4), and the work
    stops as soon as the forecast exceeds what is left, not when the time has run out.
    """

    def __init__(self, should_stop: Callable[[], bool] | None, size: int, doing: str) -> None:
        self.should_stop = should_stop
        self.size = size
        self.doing = doing
        self.began = time.monotonic()
        self.due = self.began
        self.history: list[tuple[int, float]] = []

    def tick(self, done: int) -> None:
        """``poll`` when ``POLL_SECONDS`` have passed since the last poll (one clock read otherwise)."""
        if time.monotonic() >= self.due:
            self.poll(done)

    def poll(self, done: int) -> None:
        """Stop with ``SolveCancelled``, ``OverBudget`` or ``ExactTooLarge``; ``done`` of ``size`` rows are done."""
        self.due = time.monotonic() + POLL_SECONDS
        asked = self.should_stop or current_stop()
        if asked is not None and asked():
            raise SolveCancelled
        budget.check()
        current = budget.current()
        if current is None:
            return
        left = current.exact_left()
        where = f"at state {done:,} of {self.size:,}"
        if left <= 0:
            raise ExactTooLarge(
                f"the exact {self.doing} used its share of the time budget {where} (raise it with {TIME_OPTION})"
            )
        if budget.memory_in_use() > EXACT_MEMORY_SHARE * current.memory_bytes:
            raise ExactTooLarge(
                f"the exact {self.doing} filled its share of the memory budget {where} "
                f"(raise it with {budget.MEMORY_OPTION})"
            )
        spent = time.monotonic() - self.began
        total = self.forecast(done, spent)
        if total - spent > left:
            raise ExactTooLarge(
                f"the exact {self.doing} would take about {seconds_text(total)} ({where} after "
                f"{seconds_text(spent)}), more than exact arithmetic's share of the time budget "
                f"(raise it with {TIME_OPTION})"
            )

    def forecast(self, done: int, spent: float) -> float:
        """Seconds the whole work will take, from its pace so far (``spent`` while it is not readable)."""
        if done > 0:
            self.history.append((done, spent))
        if done < FORECAST_ROWS or spent < MIN_FORECAST_SECONDS or done >= self.size:
            return spent
        half = next(((d, t) for d, t in self.history if 2 * d >= done), None)
        power = 1.0
        if half is not None and 0 < half[0] < done and 0 < half[1] < spent:
            power = math.log(spent / half[1]) / math.log(done / half[0])
        power = min(max(power, 1.0), MAX_GROWTH_POWER)
        return spent * (self.size / done) ** power


def _largest(values: Sequence[Rational]) -> int:
    best, index = -1, 0
    for i, value in enumerate(values):
        size = bits(value)
        if size > best:
            best, index = size, i
    return index


def solve_seconds(pivots: Sequence[Rational], entry: Rational, touched: int) -> float:
    """Estimated seconds of one solve: ``touched`` entries (L, U and the pivots), each costing about
    a multiply-and-subtract on the largest numbers of the factors, timed on the factors' own values
    (the solution's values share the determinant's denominator, so they are as large)."""
    if not pivots:
        return 0.0
    big = _largest(pivots)
    a = pivots[big]
    b = pivots[big - 1] if big > 0 else a
    return SOLVE_WORK_FACTOR * touched * fastest(lambda: a - entry * b)


def fastest(operation: Callable[[], object]) -> float:
    """Seconds of the fastest of a few runs of ``operation`` (the fastest: a busy machine only adds)."""
    best = float("inf")
    for _ in range(SAMPLE_REPEATS):
        began = time.perf_counter()
        operation()
        best = min(best, time.perf_counter() - began)
    return best


def require_exact_seconds(seconds: float, what: str) -> None:
    """``ExactTooLarge`` when ``seconds`` of exact work do not fit exact arithmetic's share of the time."""
    current = budget.current()
    if current is None:
        return
    left = current.exact_left()
    if seconds > left:
        raise ExactTooLarge(
            f"{what} would take about {seconds_text(seconds)}, more than the {seconds_text(max(left, 0))} left of "
            f"exact arithmetic's share of the time budget (raise it with {TIME_OPTION})"
        )


# Float factorisations: measured on bankroll walks (SuperLU, natural order; LAPACK band storage).
SUPERLU_BYTES_PER_STATE = 350  # SuperLU's own arrays per column, beside the factors' entries
SUPERLU_BYTES_PER_ENTRY = 24  # value, row index and SuperLU's working copies, per stored entry
BAND_BYTES_PER_ENTRY = 8
DETACH_STATES = 50_000  # from this size a float factorisation runs where it can be abandonned
DETACH_ENTRIES = 2_000_000


@dataclass(frozen=True)
class FloatCost:
    """What a float factorisation will hold (``memory`` bytes, a lower bound where the fill is not
    known beforehand) and whether it is long enough to run detached (``solve/detached.py``)."""

    size: int
    stored: int
    memory: float
    detach: bool


def float_cost(system, order: str) -> FloatCost:
    """The cost of factoring ``system`` (a ``BandMatrix`` or a scipy sparse matrix) in ``order``."""
    from oddsbench.solve.linear.banded import BandMatrix
    from oddsbench.solve.linear.structure import structure_of

    if isinstance(system, BandMatrix):
        stored = system.size * (2 * system.lower + system.upper + 1)
        return FloatCost(system.size, stored, BAND_BYTES_PER_ENTRY * stored, stored >= DETACH_ENTRIES)
    shape = structure_of(system)
    stored = shape.stored
    if order != "fill-reducing" and shape.band_fits:
        stored = shape.size * (shape.lower + shape.upper + 1)  # elimination in order fills the band
    memory = SUPERLU_BYTES_PER_STATE * shape.size + SUPERLU_BYTES_PER_ENTRY * stored
    return FloatCost(shape.size, stored, memory, shape.size >= DETACH_STATES or stored >= DETACH_ENTRIES)
