"""A figure: one quantity as its exact rational beside its decimal, the unit every layer shows."""

from __future__ import annotations

from dataclasses import dataclass
from typing import TYPE_CHECKING

if TYPE_CHECKING:  # the number module imports sympy: keep this one light
    from oddsbench.model.numbers import Rational


@dataclass(frozen=True)
class Figure:
    """One quantity: the exact rational (None where exact arithmetic was skipped) and its decimal."""

    exact: Rational | None
    decimal: float
