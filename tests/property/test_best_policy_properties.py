"""Property: on small random games, policy iteration's value equals the best over every play.

The independent check enumerates every deterministic play, solves each that ends the round with
the round solver, and takes the best; the certificate must hold exactly for the policy found.
"""

from __future__ import annotations

import itertools

from hypothesis import given, settings
from hypothesis import strategies as st

from oddsbench.chain.round_chain import build_round_chain
from oddsbench.model.errors import OddsbenchError
from oddsbench.model.load import load_ruleset_text
from oddsbench.solve.round import solve_round
from oddsbench.strategy.best_policy import best_policy


@st.composite
def small_games(draw):
    """Up to 4 decision states with 2 actions each; every action may loop back, win or lose."""
    count = draw(st.integers(1, 4))
    lines = ['[ruleset]\ntitle = "random"\nstart = "s0"\n']
    for i in range(count):
        lines.append(f"[states.s{i}.choices]")
        for action in ("a", "b"):
            targets = [f"s{j}" for j in range(count)] + ["won", "lost"]
            weights = draw(st.lists(st.integers(0, 3), min_size=len(targets), max_size=len(targets)))
            weights[-1 if draw(st.booleans()) else -2] += 1  # some chance to end, so some play ends
            total = sum(weights)
            outcomes = []
            for target, weight in zip(targets, weights):
                if weight:
                    pay = draw(st.integers(-2, 3))
                    outcomes.append(f'{{ to = "{target}", prob = "{weight}/{total}", pay = {pay} }}')
            lines.append(f"{action} = [{', '.join(outcomes)}]")
    lines.append('[states.won]\nresult = "win"\n[states.lost]\nresult = "loss"\n')
    return "\n".join(lines), count


def brute_force(ruleset, count: int, figure) -> object:
    best = None
    for actions in itertools.product("ab", repeat=count):
        policy = {f"s{i}": action for i, action in enumerate(actions)}
        try:
            figures = solve_round(build_round_chain(ruleset, policy))
        except OddsbenchError:
            continue  # this play can go on for ever
        value = figure(figures)
        best = value if best is None or value > best else best
    return best


@settings(max_examples=30, deadline=None)
@given(small_games())
def test_max_return_equals_the_best_of_every_play(game):
    text, count = game
    ruleset = load_ruleset_text(text, "random.toml")
    try:
        found = best_policy(ruleset, "max-return")
    except OddsbenchError as error:  # a game whose best return comes from never ending is refused, and said so
        assert "no best play that ends the round" in str(error)
    else:
        assert found.certified
        expected = brute_force(ruleset, count, lambda f: f.figures["expected_net"].exact)
        # Every play that ends the round is enumerated, and the best found is among them.
        assert found.value.exact == expected


def win_chance(figures):
    from oddsbench.model.numbers import QQ

    win = figures.result_probability.get("win")
    return win.exact if win is not None else QQ(0)


@settings(max_examples=30, deadline=None)
@given(small_games())
def test_max_win_equals_the_best_of_every_play(game):
    text, count = game
    ruleset = load_ruleset_text(text, "random.toml")
    found = best_policy(ruleset, "max-win")
    assert found.certified
    expected = brute_force(ruleset, count, win_chance)
    assert found.value.exact == expected
