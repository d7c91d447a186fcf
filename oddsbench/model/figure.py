"""A figure: one quantity as its exact rational beside its decimal, the unit every layer shows."""

from __future__ import annotations

from collections.abc import Iterable
from dataclasses import dataclass
from typing import TYPE_CHECKING

if TYPE_CHECKING:  # the number module imports sympy: keep this one light
    from oddsbench.model.numbers import Rational


FLOAT_TINY = 2.2250738585072014e-308  # the smallest normal float: below it a decimal is underflow


@dataclass(frozen=True)
class Figure:
    """One quantity: the exact rational (None where exact arithmetic was skipped) and its decimal.

    ``log10`` is log10 of the value's size where the decimal cannot hold it (below the normal
    float range: the decimal is then 0.0, never a denormal); ``digits`` is how many significant
    digits of the decimal the float engine vouches for (None: all that are shown).
    """

    exact: Rational | None
    decimal: float
    log10: float | None = None
    digits: int | None = None


# Figures that are square roots of exact ones (the standard deviation per unit staked): their exact
# value is given only where it is rational, so they do not count when asking whether a result is exact.
ROOT_FIGURES = frozenset({"net_sd"})


def all_exact(named: Iterable[tuple[str, object]]) -> bool:
    """Whether every (name, exact) pair has its exact value, square roots aside."""
    return all(exact is not None for name, exact in named if name not in ROOT_FIGURES)
