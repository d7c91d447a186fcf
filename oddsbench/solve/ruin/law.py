"""The law of one round of a walk: net results in whole grid steps and their exact chances."""

from __future__ import annotations

import math
from collections.abc import Mapping

from oddsbench.model.errors import OddsbenchError
from oddsbench.model.numbers import QQ, Rational, count_text, denominator, numerator, text

Law = tuple[tuple[int, Rational], ...]  # (jump in grid steps, chance), sorted by jump
MAX_LAW_SPAN = 1_000_000  # largest win + largest loss, in steps of their gcd: the size of every polynomial and table


def normalise_law(jumps: Mapping[int, Rational]) -> Law:
    """Sorted (jump, chance) pairs; zero chances dropped; whole jumps and a total of 1 checked."""
    if not jumps:
        raise OddsbenchError("no results given for the round")
    law: dict[int, Rational] = {}
    total = QQ(0)
    for jump, chance in jumps.items():
        if not isinstance(jump, int):
            raise OddsbenchError(f"result {jump!r} is not a whole number of grid units")
        chance = QQ(chance)
        if chance < 0:
            raise OddsbenchError(f"result {jump}: negative chance {text(chance)}")
        if chance == 0:
            continue
        law[jump] = law.get(jump, QQ(0)) + chance
        total += chance
    if total != 1:
        raise OddsbenchError(f"the chances of the round's results add up to {text(total)}, not 1")
    span = (max(law) - min(min(law), 0)) // law_step(tuple(law.items()))
    if span > MAX_LAW_SPAN:
        raise OddsbenchError(
            f"one round moves the bankroll across {count_text(span)} grid steps (from the largest loss to the largest "
            f"win); play with no goal handles at most {MAX_LAW_SPAN:,}"
        )
    return tuple(sorted(law.items()))


def law_moments(law: Law) -> tuple[Rational, Rational]:
    """(mean, variance) of one round's result, exactly."""
    mean = sum((QQ(j) * p for j, p in law), QQ(0))
    second = sum((QQ(j * j) * p for j, p in law), QQ(0))
    return mean, second - mean * mean


def law_step(law: Law) -> int:
    """The greatest common divisor of the jumps: the walk moves in multiples of it."""
    step = 0
    for jump, _ in law:
        step = math.gcd(step, jump)
    return step or 1


def reduced_law(law: Law, step: int) -> Law:
    """The law counted in steps of ``step`` grid units."""
    return tuple((jump // step, chance) for jump, chance in law)


def largest_loss(law: Law) -> int:
    """The largest loss of one round (0 when no result loses)."""
    return -min(0, law[0][0])


def ceil_div(a: int, b: int) -> int:
    return -((-a) // b)


def rational_power(base: Rational, power: int) -> Rational:
    """base^power as one fraction (numerator and denominator raised separately)."""
    if power >= 0:
        return QQ(numerator(base) ** power, denominator(base) ** power)
    return QQ(denominator(base) ** (-power), numerator(base) ** (-power))
