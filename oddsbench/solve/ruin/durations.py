"""Expected rounds until ruin with no goal: Wald's identity, the mean overshoot, the walk given ruin.

* Subfair walks reach ruin in finite expected time. Wald's identity E[S_T] = mu E[T] gives
  E[T] = bankroll / |mu| when the only loss is one step (the walk lands exactly on 0), and
  (bankroll + mean overshoot) / |mu| in general, the overshoot from the roots inside the disc.
* Fair walks take infinite expected time (were it finite, Wald would give E[S_T] = 0, but
  S_T <= -bankroll).
* Favourable skip-free walks: given ruin, the walk is the Doob h-transform with h(k) = theta^k,
  a subfair walk with chances p_j theta^j, so E[T | ruin] = bankroll / its expected loss.
"""

from __future__ import annotations

from oddsbench.model.errors import OddsbenchError
from oddsbench.model.numbers import QQ, Rational, text
from oddsbench.solve.ruin.balls import (
    arb_of,
    certified,
    certified_exact,
    enough,
    precision,
    with_retries,
)
from oddsbench.solve.ruin.law import Law, rational_power
from oddsbench.solve.ruin.result import RoundsToRuin
from oddsbench.solve.ruin.roots import (
    MAX_SPAN,
    CharacteristicRoot,
    characteristic_polynomial,
    combination,
    fit_boundary,
    real_root_ball,
    roots_inside,
)

FAIR_GAME = (
    "fair game: ruin is certain but its expected time is infinite (Wald: a finite mean time "
    "would force the mean result at ruin to be 0, yet it is at most -bankroll)"
)
NOT_CERTAIN = (
    "ruin is not certain: with positive chance play goes on for ever, so the plain expected time to ruin is infinite"
)
NOT_CERTAIN_SHORT = "ruin is not certain: the plain expected time to ruin is infinite"


def subfair_rounds(reduced: Law, level: int, drift: Rational, loss_steps: int, digits: int) -> RoundsToRuin:
    """E[T] for a subfair walk: Wald's identity, with the mean overshoot from the roots if d > 1."""
    loss = -drift
    if loss_steps == 1:
        value = QQ(level) / loss
        return RoundsToRuin(
            "finite",
            value,
            value,
            value,
            certified_exact(value, digits),
            "Wald's identity: the walk lands exactly on 0, so E[rounds] = bankroll / expected loss per round",
        )
    lower = QQ(level) / loss
    upper = QQ(level + loss_steps - 1) / loss
    decimal = None
    method = (
        f"Wald's identity with overshoot: ruin lands between 0 and -{loss_steps - 1} steps, so "
        "E[rounds] lies between bankroll / loss and (bankroll + largest loss - 1) / loss"
    )
    low_first = characteristic_polynomial(reduced)
    if len(low_first) - 1 <= MAX_SPAN:
        decimal = _subfair_rounds_by_roots(low_first, level, loss, loss_steps, digits)
        if decimal is not None:
            method = (
                "Wald's identity plus the mean overshoot: E[rounds from k] = k / loss + a combination "
                f"of 1 and the {loss_steps - 1} roots inside the unit disc, zero on the ruin levels; "
                f"proved bounds [{text(lower)}, {text(upper)}]"
            )
    return RoundsToRuin("finite", None, lower, upper, decimal, method)


def _subfair_rounds_by_roots(low_first, level: int, loss: Rational, loss_steps: int, digits: int):
    from flint import acb

    def compute():
        found = roots_inside(low_first)
        if found is None:
            return None
        inside, simple = found
        if not simple or len(inside) != loss_steps - 1:
            return ("not-applicable",)
        bases = [acb(1)] + inside
        loss_ball = arb_of(loss)
        boundary = [(-k, -acb(-k) / loss_ball) for k in range(loss_steps)]
        coefficients = fit_boundary(bases, boundary)
        value = (acb(level) / loss_ball + combination(tuple(zip(coefficients, bases)), level)).real
        return ("ok", value)

    def good(result) -> bool:
        return result is not None and (result[0] == "not-applicable" or enough(result[1], digits))

    try:
        result, bits = with_retries(compute, digits, level, good)
    except OddsbenchError:
        return None
    if result[0] != "ok":
        return None
    with precision(bits):
        return certified(result[1], digits)


def rounds_if_ruined(reduced: Law, level: int, theta: CharacteristicRoot, digits: int) -> RoundsToRuin:
    """E[T | ruin] for a favourable skip-free walk (the walk given ruin has chances p_j theta^j)."""
    method = "given ruin the walk has chances p_j theta^j (subfair); Wald: bankroll / its expected loss"
    if theta.is_rational:
        tilted = sum((QQ(j) * p * rational_power(theta.exact, j) for j, p in reduced), QQ(0))
        value = QQ(level) / -tilted
        return RoundsToRuin("finite", value, value, value, certified_exact(value, digits), method)

    def compute():
        from flint import arb

        theta_ball = real_root_ball(theta.polynomial, 0, 1)
        tilted = arb(0)
        for j, p in reduced:
            tilted += arb_of(p) * j * theta_ball**j
        return arb(level) / -tilted

    ball, bits = with_retries(compute, digits, level, lambda b: enough(b, digits))
    with precision(bits):
        decimal = certified(ball, digits)
    return RoundsToRuin("finite", None, None, None, decimal, method)
