"""What each figure means, in one plain sentence: the detail pane of the workbench and anyone else
who explains a figure (one copy of each sentence).

Figures are named as the core names them: round figures by their name (``house_edge``), keyed
chances as the simulation and reports key them (``end_probability[double]``,
``result_probability[win]``, ``end_probability_by_step[double]``), session figures with a
``session.`` prefix (``session.ruin_probability``), play with no goal with ``no_goal.``, a
strategy's check with ``check.``, figures after N rounds with ``horizon.`` and simulated estimates
with ``estimate.`` before the name of the figure they estimate.
"""

from __future__ import annotations

import re

RUIN = "the bankroll can no longer cover the minimum bet"

ROUND = {
    "expected_net": "The average net result of one round (what is won minus what is lost), over very many rounds; "
    "negative means the player loses on average.",
    "expected_staked": "The average amount put at risk in one round: the stake plus every extra stake the round "
    "asks for.",
    "house_edge": "The share of each unit staked that the house keeps on average: minus the expected net "
    "divided by the expected amount staked.",
    "return_to_player": "The share of each unit staked that comes back to the player on average: one minus the "
    "house edge.",
    "net_variance": "How widely one round's net result spreads around its average (the square of its standard "
    "deviation).",
    "net_sd": "The standard deviation of one round's net result per unit staked: how far a round typically "
    "lands from its average. Its exact value exists only where the square root is rational.",
    "hit_frequency": "The chance that one round ends with the player ahead (net result above zero).",
    "push_probability": "The chance that one round ends even: the net result is exactly zero.",
    "loss_probability": "The chance that one round ends with the player behind (net result below zero).",
    "net_law": "The chance that one round's net result is exactly this value, and its contribution (chance x "
    "net) to the expected net: the contributions add up to the expected net.",
    "return_share": "A step that pays: its pay, the expected number of times one round takes it, and its share "
    "(times x pay) of the expected net; the shares add up to the expected net.",
    "expected_steps": "The average number of steps (moves from state to state) one round takes before it ends.",
    "steps_variance": "How widely the number of steps in one round spreads around its average.",
    "ended_by": "The chance that the round has ended within the given number of steps.",
    "hands": "How many hands the round's single draw can deal, each exactly as likely as any other: every chance "
    "above is a count of hands divided by this number.",
    "hands_ending": "How many of the equally likely hands end the round in this end state.",
}

SESSION = {
    "goal_probability": "The chance that the bankroll reaches the goal before play stops for any other reason.",
    "ruin_probability": f"The chance of ruin: {RUIN}, so play stops before the goal.",
    "floor_probability": "The chance that play stops at the stop-loss floor (the bankroll falls to it or below).",
    "time_cap_probability": "The chance that the time cap (the most rounds allowed) ends the session first.",
    "expected_rounds": "The average number of rounds a session lasts, from the first bet until it stops.",
    "rounds_variance": "How widely the number of rounds in a session spreads around its average.",
    "expected_staked": "The average total of every bet placed over the whole session.",
    "expected_final_bankroll": "The average bankroll when the session stops.",
    "expected_net": "The average of the final bankroll minus the starting one: what a session wins or loses "
    "on average.",
    "edge_times_staked": "A check, not a new figure: by optional stopping the average session result must equal "
    "minus the house edge times the average total staked, whatever the plan; it matches the row "
    "'expected final - start' exactly when the solve is right.",
    "first_bet": "The first bet the plan places, from the starting bankroll.",
    "bet_fraction": "The share of the bankroll the plan bets each round.",
    "growth_rate_bits": "How fast the bankroll grows per round on average, in bits (log base 2 of the growth "
    "factor); the Kelly plan makes it largest.",
    "house_edge": "The house edge of the round the session repeats: the share of each unit staked the house "
    "keeps on average.",
    "within_goal_probability": "The chance that the goal is reached within the given number of rounds.",
    "within_ruin_probability": f"The chance of ruin ({RUIN}) within the given number of rounds.",
    "within_floor_probability": "The chance that play stops at the floor within the given number of rounds.",
    "within_playing_probability": "The chance that the session is still going after the given number of rounds.",
    "within_expected_bankroll": "The average bankroll after the given number of rounds (sessions that stopped "
    "earlier keep their final bankroll).",
}

NO_GOAL = {
    "ruin": f"With no goal play never stops by choice: the chance that ruin comes some day, when {RUIN}.",
    "root": "The root in (0, 1) of E[t^X] = 1 for one round's result X in betting units: the ruin chance is made "
    "of powers of it.",
    "adjustment": "The adjustment coefficient R: how fast the ruin chance falls as the starting bankroll grows "
    "(roughly by a factor exp(-R) per unit).",
    "lundberg": "An upper bound on the ruin chance, exp(-R x bankroll): the exact figure is at or below it.",
    "diffusion": "A players' rule of thumb that treats the bankroll as a drift plus noise: an approximation, "
    "not a bound.",
    "diffusion_ratio": "The rule of thumb divided by the exact ruin chance: 1 would mean it is exact.",
    "mean": "The average result of one round for this plan over the long run: negative means the bankroll drifts down.",
    "rounds_to_ruin": "The average number of rounds until ruin (infinite when ruin may never come).",
    "rounds_if_ruined": "The average number of rounds until ruin, counting only the plays that end in ruin.",
    "truncation": "A check: the chance of ruin before the bankroll reaches a far goal, solved separately; it is "
    "a lower bound that rises to the ruin chance above.",
    "gap": "How far that check can be from the ruin chance at most.",
    "bounded_ruin": f"With no goal (play never stops by choice): the chance that ruin comes some day, when {RUIN}; "
    "beside the session with the goal, to show what stopping at the goal protects.",
}

CHECK = {
    "value": "The value of the goal when playing this strategy from the start of the round.",
    "best_value": "The value of the goal under the best play: no strategy does better.",
    "gain": "How much this state's value rises when only its action changes to the better one.",
}

HORIZON = {
    "law": "How the law of the total after N rounds was found: 'exact' by exact convolution, 'float' by a float "
    "convolution past the exact limits (each chance then within a stated error; mean and variance still exact).",
    "ahead": "The chance that the total net after N independent rounds is above zero: the player is ahead.",
    "even": "The chance that the total net after N independent rounds is exactly zero.",
    "behind": "The chance that the total net after N independent rounds is below zero: the player is behind.",
    "mean": "The average total net after N rounds: N times one round's expected net, exactly.",
    "variance": "How widely the total after N rounds spreads around its average: N times one round's variance.",
    "quantile": "The total that the total net after N rounds stays at or below with at least this chance (the "
    "smallest such total of the law).",
    "quantile_normal": "The same quantile from the normal approximation (de Moivre-Laplace) with the exact mean and "
    "standard deviation: compare it with the exact quantile above.",
    "return_range": "Where the realised return to player over N rounds (1 + total / (N x expected staked)) lands "
    "with at least this chance: between the law's lower and upper quantiles. It narrows as N grows, around "
    "the expected return, never away from the house edge.",
    "return_range_inside": "The exact chance that the realised return lands inside the range above: at least the "
    "level, more where the law jumps.",
    "return_range_normal": "The same range from the normal approximation (de Moivre-Laplace) with the exact mean and "
    "standard deviation: an approximation, close to the exact range when N is large.",
}

_KEYED = re.compile(r"^(end_probability|result_probability|end_probability_by_step)\[(.*)\]$")


def meaning(key: str) -> str:
    """One sentence saying what the figure named ``key`` means; a plain fallback for names not listed."""
    if key.startswith("estimate."):
        return (
            f"Estimated by simulation. {meaning(key.removeprefix('estimate.'))} The interval holds the true value "
            "at the chosen confidence if the model is right: 'inside' when the exact figure falls in it."
        )
    for prefix, table in (("session.", SESSION), ("no_goal.", NO_GOAL), ("check.", CHECK), ("horizon.", HORIZON)):
        if key.startswith(prefix):
            return table.get(key.removeprefix(prefix), _fallback(key.removeprefix(prefix)))
    keyed = _KEYED.match(key)
    if keyed:
        kind, name = keyed.groups()
        if kind == "end_probability":
            return f"The chance that one round finishes in the end state {name!r}."
        if kind == "result_probability":
            return (
                f"The chance that one round ends in any end state marked {name!r}: the {name} total over every "
                "such end state."
            )
        return f"The chance that the round has reached {name!r} within the given number of steps."
    return ROUND.get(key, _fallback(key))


def _fallback(name: str) -> str:
    return f"The figure {name.replace('_', ' ')!r} as the solver names it."
