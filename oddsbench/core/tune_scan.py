"""Tuning a piecewise figure: scan the parameter, then bisect every crossing of the target exactly.

Where a parameter enters through ``floor``, a comparison, an ``if`` or a field that shapes the
chain, the figure is only piecewise a rational function of it, so ``tune`` cannot reconstruct it.
Here it is evaluated exactly at scanned values (the file's own value and steps doubling away from
it, or evenly across ``--between LO,HI``), and each pair of neighbouring valid values where the
figure minus the target changes sign is bisected at exact midpoints until the bracket is no
wider than the tolerance. A crossing may be a jump (a step of a piecewise function): the figure at
both ends of the bracket is reported. Crossings between two scanned values that cancel out (the
figure crossing twice) are not seen: the scan says which values it looked at.
"""

from __future__ import annotations

import math
import re
from dataclasses import dataclass

from oddsbench.core.tune_points import FigureAt, Point, shown_figure
from oddsbench.model.figure import Figure
from oddsbench.model.numbers import QQ, Rational, is_integer, text

DOUBLINGS = 20  # scanned values on each side: the step doubles each time, up to 2^20 steps away
WHOLE_DOUBLINGS = 10  # a parameter taking whole values (a count): up to 1024 away
EVEN_STEPS = 32  # with --between: that many intervals between its ends
MAX_BRACKETS = 8
MAX_BISECTIONS = 400


@dataclass(frozen=True)
class Bracket:
    """A crossing of the target: the parameter lies in [low, high] (low == high: hit exactly there);
    the figure at both ends (exact, as the round gives it)."""

    low: Rational
    high: Rational
    figure_low: Figure
    figure_high: Figure
    steps: int

    @property
    def exact(self) -> bool:
        return self.low == self.high


DECIMAL = r"\s*(-?)(\d+)(?:\.(\d+))?(?:e([+-]?\d+))?\s*"


def decimal_rational(spelled: str) -> Rational:
    """The exact rational of a decimal in scientific or plain notation (``-1.25e-3``), from the digits."""
    match = re.fullmatch(DECIMAL, spelled)
    if match is None:
        raise ValueError(f"not a decimal: {spelled!r}")
    sign, whole, fraction, exponent = match.groups()
    fraction = fraction or ""
    value = QQ(int(whole + fraction), 10 ** len(fraction)) * QQ(10) ** int(exponent or 0)
    return -value if sign else value


def last_digit_unit(spelled: str) -> Rational:
    """One unit of the last digit of a decimal (``1.25e-3``: 10^-5), exactly."""
    match = re.fullmatch(DECIMAL, spelled)
    if match is None:
        raise ValueError(f"not a decimal: {spelled!r}")
    _sign, _whole, fraction, exponent = match.groups()
    return QQ(10) ** (int(exponent or 0) - len(fraction or ""))


def scan(
    at: FigureAt,
    current: Rational,
    goal: Rational,
    tolerance: Rational,
    between: tuple[Rational, Rational] | None,
    counts: bool = False,
) -> tuple[tuple[Bracket, ...], tuple[Rational, Rational], tuple[str, ...], bool]:
    """The crossings of ``goal`` found by the scan (nearest the file's value first), the range
    scanned, notes, and whether only whole values were scanned (then each bracket is two
    neighbouring whole values, found exactly: no tolerance applies). ``counts``: the parameter sets
    a count in the file (whole values only)."""
    whole = is_integer(current) and (counts or _whole_numbers_only(at, current))
    if between is not None:
        low, high = between
        values = [low + (high - low) * k / EVEN_STEPS for k in range(EVEN_STEPS + 1)]
        if whole:
            values = sorted({QQ(math.floor(v)) for v in values} | {QQ(math.ceil(high))})
    elif whole:
        values = sorted({current, *(current + sign * 2**k for k in range(WHOLE_DOUBLINGS + 1) for sign in (1, -1))})
    else:
        step = max(abs(current), QQ(1)) / 64
        values = sorted({current, *(current + sign * step * 2**k for k in range(DOUBLINGS + 1) for sign in (1, -1))})
    points = [at(value) for value in values]
    valid = [p for p in points if p.problem is None]
    notes = []
    if whole:
        notes.append(f"{at.name} takes whole numbers only (not valid halfway between two): whole brackets")
    if len(valid) < len(points):
        first = next(p.problem for p in points if p.problem is not None)
        notes.append(
            f"the file is not valid at {len(points) - len(valid)} of {len(points)} scanned values (e.g. {first})"
        )
    found: list[Bracket] = []
    for left, right in zip(valid, valid[1:]):
        if left.figure == goal:
            found.append(_hit(at, left))
        elif (left.figure - goal) * (right.figure - goal) < 0:
            found.append(_bisect(at, left, right, goal, QQ(1) if whole else tolerance, whole, notes))
    if valid and valid[-1].figure == goal:
        found.append(_hit(at, valid[-1]))
    found.sort(key=lambda b: abs(b.low - current))
    if len(found) > MAX_BRACKETS:
        notes.append(f"{len(found)} crossings found: the {MAX_BRACKETS} nearest the file's value are shown")
    return tuple(found[:MAX_BRACKETS]), (values[0], values[-1]), tuple(notes), whole


def _whole_numbers_only(at: FigureAt, current: Rational) -> bool:
    """Whether the parameter counts something (the file is valid at its whole value and the next,
    not halfway between): then only whole values are scanned and bisected."""
    return at(current + QQ(1, 2)).problem is not None and at(current + 1).problem is None


def _hit(at: FigureAt, point: Point) -> Bracket:
    shown = shown_figure(at.figure, point.figure)
    return Bracket(point.value, point.value, shown, shown, 0)


def _bisect(
    at: FigureAt, left: Point, right: Point, goal: Rational, tolerance: Rational, whole: bool, notes: list[str]
) -> Bracket:
    """Exact bisection of a sign change of figure - goal between two valid values (whole midpoints
    for a parameter taking whole values: the bracket ends one apart)."""
    low, high = left, right
    steps = 0
    while high.value - low.value > tolerance and steps < MAX_BISECTIONS:
        halfway = (low.value + high.value) / 2
        middle = at(QQ(math.floor(halfway)) if whole else halfway)
        steps += 1
        if middle.problem is not None:
            notes.append(f"bisection stopped at {text(middle.value)}: the file is not valid there ({middle.problem})")
            break
        if middle.figure == goal:
            return _hit(at, middle)
        if (middle.figure - goal) * (low.figure - goal) > 0:
            low = middle
        else:
            high = middle
    return Bracket(
        low.value, high.value, shown_figure(at.figure, low.figure), shown_figure(at.figure, high.figure), steps
    )
