"""Figures beside the exact ruin chance: the adjustment coefficient and the diffusion rule of thumb.

The diffusion figure exp(-2 x edge x bankroll / variance) is the players' rule of thumb, from a
Brownian motion with the same mean and variance per round (common practice, no source): an
approximation, never a bound, shown with its ratio to the proved figure.
"""

from __future__ import annotations

from typing import Any

from oddsbench.model.numbers import QQ, text
from oddsbench.solve.ruin.balls import arb_of, bits_for, certified, precision
from oddsbench.solve.ruin.result import WalkFacts
from oddsbench.solve.ruin.roots import CharacteristicRoot

DIFFUSION_LABEL = "exp(-2 x edge x bankroll / variance), from Brownian motion with the same mean and variance per round"
NO_VARIANCE = "not applicable: the round has no variance"


def diffusion_figures(walk: WalkFacts, ruin_ball, digits: int) -> tuple[dict[str, Any], dict[str, str]]:
    """(builder fields, absent reasons) of the rule of thumb and its ratio to the ruin chance ``ruin_ball``."""
    mean, variance, level = walk.mean, walk.variance, walk.bankroll
    if not variance:
        return {}, {"diffusion": NO_VARIANCE, "diffusion_ratio": NO_VARIANCE}
    exponent = QQ(-2) * mean * QQ(level) / variance
    with precision(bits_for(digits, level)):
        value = certified(arb_of(exponent).exp(), digits)
    fields: dict[str, Any] = {"diffusion": value, "diffusion_text": DIFFUSION_LABEL, "diffusion_exponent": exponent}
    if ruin_ball is not None and ruin_ball > 0:
        with precision(bits_for(digits, level)):
            fields["diffusion_ratio"] = certified(arb_of(exponent).exp() / ruin_ball, min(digits, 12))
        return fields, {}
    return fields, {"diffusion_ratio": "the ruin chance is not proved above 0, so there is no ratio to it"}


def adjustment_text(rho: CharacteristicRoot, step: int, name: str = "rho") -> str:
    """The exact form of R = -ln rho per grid unit: ``ln(51/49)`` or ``-ln rho / 2 per unit``."""
    per_step = "" if step == 1 else f" / {step} per unit"
    if rho.is_rational:
        inverse = QQ(1) / rho.exact
        return f"ln({text(inverse)}){per_step}"
    return f"-ln {name}{per_step}"
