"""The result of play with no goal (``NoGoalRuin``) and the one builder every walk kind uses.

A figure that does not apply to a walk (no characteristic root when ruin is certain, no
diffusion figure for a progression, no exact fraction for an algebraic answer...) is ``None``,
and ``absent`` holds one line saying why, read with ``why_absent(name)``. The builder
``no_goal_ruin`` refuses a result that leaves a figure out without a reason, or that gives a
figure without the explanation shown beside it: there are no placeholder values.
"""

from __future__ import annotations

from collections.abc import Mapping, Sequence
from dataclasses import dataclass, field
from typing import Any

from oddsbench.model.errors import OddsbenchError
from oddsbench.model.numbers import QQ, Rational, text
from oddsbench.solve.ruin.balls import Certified, bits_for, certified, certified_exact, precision
from oddsbench.solve.ruin.law import Law, ceil_div
from oddsbench.solve.ruin.roots import CharacteristicRoot, ruin_by_roots

VERDICT_CERTAIN = "certain"
VERDICT_NEVER = "never"
VERDICT_POSSIBLE = "possible"

BOUNDED_JUMPS = "bounded jumps"  # one law at every level (skip-free when the only loss is one step)
CUT_BETS = "cut bets"  # the lowest levels have their own laws (a bet cut to what the bankroll covers)
PROGRESSION = "progression"  # the bet follows the plan's place in a series (a modulated walk)

# Figures a walk may lack, and the explanation fields that go with each when present.
OPTIONAL_FIGURES = (
    "variance",
    "ruin_exact",
    "ruin_closed_form",
    "theta",
    "adjustment_coefficient",
    "lundberg",
    "diffusion",
    "diffusion_ratio",
    "rounds_if_ruined",
    "truncation",
)
EXPLANATIONS = {
    "adjustment_coefficient": ("adjustment_text",),
    "lundberg": ("lundberg_text", "lundberg_exact_text"),
    "diffusion": ("diffusion_text", "diffusion_exponent"),
}


@dataclass(frozen=True)
class RoundsToRuin:
    """Expected number of rounds until ruin, or why there is no finite figure."""

    kind: str  # "finite", "infinite" (fair), "not defined" (ruin not certain), "none" (no ruin)
    exact: Rational | None  # when known as a rational
    lower: Rational | None  # proved bounds when the exact figure is not a rational
    upper: Rational | None
    decimal: Certified | None
    method: str


@dataclass(frozen=True)
class TruncationCheck:
    """P(ruin before the bankroll reaches ``goal``): an exact lower bound on the ruin chance."""

    goal: int  # in steps of the walk
    lower: Rational | None  # exact, when solved in exact arithmetic
    lower_decimal: Certified
    gap_bound: Certified  # psi - lower <= rho^goal
    consistent: bool  # the root result lies inside [lower, lower + gap bound]
    arithmetic: str = "exact"  # "exact", or "floating point" for systems too large for rationals
    goal_level: int = 0  # the goal in grid units above the ruin line (``goal`` may count steps)


@dataclass(frozen=True)
class WalkFacts:
    """What a walk is, in grid units: what each walk kind hands to the builder."""

    kind: str  # BOUNDED_JUMPS, CUT_BETS or PROGRESSION
    bankroll: int  # grid units above the ruin line
    jumps: Law  # the law at the full bet (for a progression: at its largest bet)
    step: int  # common divisor of the jumps: the walk moves in multiples of it
    steps_bankroll: int  # bankroll counted in steps: ceil(bankroll / step)
    mean: Rational  # expected result per round (for a progression: the long-run drift), grid units
    variance: Rational | None  # variance of one round's result (None for a progression)
    largest_loss: int  # in steps


@dataclass(frozen=True)
class NoGoalRuin:
    """Everything ``--goal none`` reports: ruin chance, how it was found, bounds, durations."""

    kind: str
    bankroll: int
    jumps: Law
    step: int
    steps_bankroll: int
    mean: Rational
    variance: Rational | None
    largest_loss: int
    verdict: str  # certain | never | possible
    reason: str
    ruin: Certified
    ruin_exact: Rational | None  # the ruin chance as one fraction, when rational and not huge
    ruin_closed_form: Any  # sympy/QQ exact object: theta**z, or None when only digits exist
    ruin_exact_text: str  # "(49/51)^20", "1", "theta^20 (theta = ...)", "algebraic: ..."
    method: str
    error_bound: str
    theta: CharacteristicRoot | None  # rho: the root in (0,1); theta when skip-free
    adjustment_coefficient: Certified | None  # R = -ln(rho) per step of the walk
    adjustment_text: str | None  # exact form of R: "ln(51/49)" or "-ln rho"
    lundberg: Certified | None  # exp(-R * steps_bankroll) = rho^steps_bankroll
    lundberg_text: str | None
    lundberg_exact_text: str | None  # "theta^20 (= the exact figure)", "rho^19"
    diffusion: Certified | None  # exp(-2 mean bankroll / variance): an approximation
    diffusion_text: str | None
    diffusion_exponent: Rational | None  # -2 mean bankroll / variance, exact
    diffusion_ratio: Certified | None  # approximation / exact ruin chance
    rounds_to_ruin: RoundsToRuin
    rounds_if_ruined: RoundsToRuin | None  # favourable skip-free walks: E[T | ruin]
    truncation: TruncationCheck | None
    notes: tuple[str, ...]
    digits: int
    absent: tuple[tuple[str, str], ...] = ()  # (figure, why it does not apply), for each None figure
    _reduced: Law = field(default=(), repr=False, compare=False)

    @property
    def is_skip_free(self) -> bool:
        return self.largest_loss == 1

    def why_absent(self, name: str) -> str:
        """Why figure ``name`` is None here (an empty string when it is present)."""
        return dict(self.absent).get(name, "")

    def ruin_from(self, bankroll: int, digits: int | None = None) -> Certified:
        """Ruin chance from another starting bankroll (grid units), same law: the whole curve."""
        if bankroll < 1:
            return certified_exact(QQ(1))
        if self.verdict == VERDICT_CERTAIN:
            return certified_exact(QQ(1))
        if self.verdict == VERDICT_NEVER:
            return certified_exact(QQ(0))
        level = ceil_div(bankroll, self.step)
        wanted = digits or self.digits
        if self.theta is not None and self.theta.is_rational and self.is_skip_free:
            with precision(bits_for(wanted, level)):
                return certified(self.theta.ball() ** level, wanted)
        by_roots = ruin_by_roots(self._reduced, self.largest_loss, level, wanted) if self._reduced else None
        if by_roots is None:
            raise OddsbenchError("the ruin curve needs the root method, which did not apply to this walk")
        return by_roots[0]


def no_goal_ruin(
    walk: WalkFacts,
    *,
    verdict: str,
    reason: str,
    ruin: Certified,
    exact_text: str,
    method: str,
    error_bound: str,
    rounds_to_ruin: RoundsToRuin,
    notes: Sequence[str],
    digits: int,
    absent: Mapping[str, str],
    ruin_exact: Rational | None = None,
    closed_form: Any = None,
    theta: CharacteristicRoot | None = None,
    adjustment_coefficient: Certified | None = None,
    adjustment_text: str | None = None,
    lundberg: Certified | None = None,
    lundberg_text: str | None = None,
    lundberg_exact_text: str | None = None,
    diffusion: Certified | None = None,
    diffusion_text: str | None = None,
    diffusion_exponent: Rational | None = None,
    diffusion_ratio: Certified | None = None,
    rounds_if_ruined: RoundsToRuin | None = None,
    truncation: TruncationCheck | None = None,
    reduced: Law = (),
) -> NoGoalRuin:
    """The one way a ``NoGoalRuin`` is made: every absent figure needs its reason in ``absent``."""
    result = NoGoalRuin(
        kind=walk.kind,
        bankroll=walk.bankroll,
        jumps=walk.jumps,
        step=walk.step,
        steps_bankroll=walk.steps_bankroll,
        mean=walk.mean,
        variance=walk.variance,
        largest_loss=walk.largest_loss,
        verdict=verdict,
        reason=reason,
        ruin=ruin,
        ruin_exact=ruin_exact,
        ruin_closed_form=closed_form,
        ruin_exact_text=exact_text,
        method=method,
        error_bound=error_bound,
        theta=theta,
        adjustment_coefficient=adjustment_coefficient,
        adjustment_text=adjustment_text,
        lundberg=lundberg,
        lundberg_text=lundberg_text,
        lundberg_exact_text=lundberg_exact_text,
        diffusion=diffusion,
        diffusion_text=diffusion_text,
        diffusion_exponent=diffusion_exponent,
        diffusion_ratio=diffusion_ratio,
        rounds_to_ruin=rounds_to_ruin,
        rounds_if_ruined=rounds_if_ruined,
        truncation=truncation,
        notes=tuple(notes),
        digits=digits,
        absent=tuple((name, absent[name]) for name in OPTIONAL_FIGURES if name in absent),
        _reduced=reduced,
    )
    for name in OPTIONAL_FIGURES:
        missing = getattr(result, name) is None
        if missing != (name in absent):
            state = "missing without a reason" if missing else "given with a reason for its absence"
            raise ValueError(f"internal: no-goal figure {name!r} is {state}")
        for explanation in EXPLANATIONS.get(name, ()):
            if (getattr(result, explanation) is None) != missing:
                raise ValueError(f"internal: {explanation!r} must be given exactly when {name!r} is")
    return result


NO_ROOT = "ruin is settled exactly; no characteristic root is needed"
NO_ADJUSTMENT_COEFFICIENT = "not applicable: no adjustment coefficient R > 0 when the expected result is <= 0"


def settled_ruin(
    walk: WalkFacts,
    *,
    verdict: str,
    ruin: Rational,
    reason: str,
    method: str,
    diffusion_reason: str,
    rounds: RoundsToRuin,
    notes: Sequence[str],
    digits: int,
    bound_reason: str = NO_ADJUSTMENT_COEFFICIENT,
    more_absent: Mapping[str, str] | None = None,
) -> NoGoalRuin:
    """A ruin chance settled without any root or truncation: exactly 0 or exactly 1."""
    return no_goal_ruin(
        walk,
        verdict=verdict,
        reason=reason,
        ruin=certified_exact(ruin, digits),
        ruin_exact=ruin,
        closed_form=ruin,
        exact_text=text(ruin),
        method=method,
        error_bound="none: exact",
        rounds_to_ruin=rounds,
        notes=notes,
        digits=digits,
        absent={
            "theta": NO_ROOT,
            "adjustment_coefficient": bound_reason,
            "lundberg": bound_reason,
            "diffusion": diffusion_reason,
            "diffusion_ratio": diffusion_reason,
            "rounds_if_ruined": "ruin is settled exactly: there is no separate duration given ruin",
            "truncation": "ruin is settled exactly: there is nothing to cross-check",
            **(more_absent or {}),
        },
    )
