"""A figure: one quantity as its exact rational beside its decimal, the unit every layer shows."""

from __future__ import annotations

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
