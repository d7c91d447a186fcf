"""Round figures of the bundled games against published values (source beside each check)."""

from __future__ import annotations

import pytest
from conftest import solve_file, solve_text

from oddsbench.model.numbers import QQ


def exact(figures, name):
    return figures.figures[name].exact


# Pass line: win 244/495, house edge 7/495 and 557/165 rolls per decision.
# Source: S. N. Ethier, The Doctrine of Chances (Springer, 2010), ch. 15 on craps (from memory);
# the 244/495 win chance is also worked in Grinstead and Snell, Introduction to Probability (from memory).
def test_pass_line_wins_244_of_495():
    figures = solve_file("pass-line.toml")
    assert figures.end_probability["won"].exact == QQ(244, 495)


def test_pass_line_house_edge_is_7_of_495():
    assert exact(solve_file("pass-line.toml"), "house_edge") == QQ(7, 495)


def test_pass_line_expected_rolls_per_decision_is_557_of_165():
    assert exact(solve_file("pass-line.toml"), "expected_steps") == QQ(557, 165)


# Wheels: even-money edge 1/37 (single zero) and 1/19 (double zero); the five-number bet paying
# 6 to 1 on a double-zero wheel has edge 3/38. Source: Ethier, The Doctrine of Chances, ch. 13 on
# roulette (from memory); common practice, no source, for the five-number figure.
@pytest.mark.parametrize(
    ("file", "edge"),
    [
        ("single-zero-wheel.toml", QQ(1, 37)),
        ("double-zero-wheel.toml", QQ(1, 19)),
        ("double-zero-five-number.toml", QQ(3, 38)),
    ],
)
def test_wheel_house_edges(file, edge):
    assert exact(solve_file(file), "house_edge") == edge


def test_wheel_return_to_player_is_one_minus_edge():
    figures = solve_file("single-zero-wheel.toml")
    assert exact(figures, "return_to_player") == QQ(36, 37)


# Field with 2 paying double and 12 triple: edge 1/36 (common practice, no source).
def test_field_with_double_and_triple_has_edge_1_of_36():
    assert exact(solve_file("field.toml"), "house_edge") == QQ(1, 36)


def deuce_game_formula(p):
    """Chance of winning a game to four points, win by two, from point chance p.

    P = p^4 (1 + 4q + 10 q^2) + 20 p^3 q^3 * p^2 / (1 - 2pq): win 4-0, 4-1, 4-2, or reach deuce
    (20 ways) and win from it. Source: P. K. Newton and J. B. Keller, Probability of winning at
    tennis I. Theory and data, Studies in Applied Mathematics 114 (2005) 241-269 (from memory).
    """
    q = 1 - p
    return p**4 * (1 + 4 * q + 10 * q**2) + 20 * p**3 * q**3 * p**2 / (1 - 2 * p * q)


@pytest.mark.parametrize("p", [QQ(1, 2), QQ(3, 5), QQ(2, 5), QQ(51, 100), QQ(9, 10), QQ(1, 7)])
def test_deuce_game_matches_closed_form(p, rulesets_dir):
    text = (rulesets_dir / "deuce-game.toml").read_text()
    text = text.replace('p = "3/5"', f'p = "{p}"')
    figures = solve_text(text)
    assert figures.end_probability["won"].exact == deuce_game_formula(p)


def throws_until(face_chance: str, throws: int) -> str:
    """A ruleset: throw up to ``throws`` times, win at the first success."""
    parts = ['[ruleset]\ntitle = "de Mere"\nstart = "throw-1"\n']
    for i in range(1, throws + 1):
        miss = f"throw-{i + 1}" if i < throws else "lost"
        parts.append(
            f'[states.throw-{i}]\noutcomes = [ {{ to = "won", prob = "{face_chance}", pay = 1 }}, '
            f'{{ to = "{miss}", pay = {"-1" if miss == "lost" else "0"} }} ]\n'
        )
    parts.append('[states.won]\nresult = "win"\n[states.lost]\nresult = "loss"\n')
    return "\n".join(parts)


# de Mere's problems: at least one six in 4 throws of a die is 671/1296; at least one double six
# in 24 throws of two dice is 1 - (35/36)^24, and 25 throws is the first count above 1/2.
# Source: Grinstead and Snell, Introduction to Probability, ch. 1 historical remarks (from memory).
def test_de_mere_one_six_in_four_throws():
    figures = solve_text(throws_until("1/6", 4))
    assert figures.end_probability["won"].exact == QQ(671, 1296)


def test_de_mere_double_six_in_24_throws():
    figures = solve_text(throws_until("1/36", 24))
    assert figures.end_probability["won"].exact == 1 - QQ(35, 36) ** 24


def test_de_mere_25_throws_is_the_first_count_above_one_half():
    chances = {n: solve_text(throws_until("1/36", n)).end_probability["won"].exact for n in (24, 25)}
    assert chances[24] < QQ(1, 2) < chances[25]


def test_chance_ended_by_step_n_is_one_minus_miss_chance_to_the_n():
    text = """
[ruleset]
title = "wait for a double six"
start = "wait"
[states.wait]
outcomes = [ { to = "done", prob = "1/36" }, { to = "wait", prob = "35/36" } ]
[states.done]
"""
    figures = solve_text(text, rounds=25)
    assert figures.figures["ended_by"].exact == 1 - QQ(35, 36) ** 25


# Geometric waiting time with success chance p: mean 1/p, variance (1-p)/p^2.
# Source: Feller, An Introduction to Probability Theory and Its Applications, Vol. I, ch. XI (from memory).
@pytest.mark.parametrize("p", [QQ(1, 6), QQ(2, 7), QQ(9, 10)])
def test_geometric_waiting_time_mean_and_variance(p):
    text = f'''
[ruleset]
title = "geometric"
start = "wait"
[params]
p = "{p}"
[states.wait]
outcomes = [ {{ to = "done", prob = "p" }}, {{ to = "wait", prob = "1 - p" }} ]
[states.done]
'''
    figures = solve_text(text)
    assert exact(figures, "expected_steps") == 1 / p
    assert exact(figures, "steps_variance") == (1 - p) / p**2


def test_lantern_dice_edge_counts_the_raise_as_staked():
    # Invented demo game: expected net -1/18 on an expected stake of 5/3, so edge 1/30
    # (worked by hand in rulesets/lantern-dice.toml's rules).
    figures = solve_file("lantern-dice.toml")
    assert exact(figures, "expected_net") == QQ(-1, 18)
    assert exact(figures, "expected_staked") == QQ(5, 3)
    assert exact(figures, "house_edge") == QQ(1, 30)
    assert figures.result_probability["push"].exact == QQ(1, 6)


def test_net_variance_matches_enumeration_for_two_step_round():
    # Two fair coin steps paying +1 or -1 each: net is -2, 0, 2 with chances 1/4, 1/2, 1/4,
    # so variance 2 (direct enumeration).
    text = """
[ruleset]
title = "two coins"
start = "a"
[states.a]
outcomes = [ { to = "b", pay = 1 }, { to = "b", pay = -1 } ]
[states.b]
outcomes = [ { to = "end", pay = 1 }, { to = "end", pay = -1 } ]
[states.end]
"""
    figures = solve_text(text)
    assert figures.figures["net_variance"].exact == 2
    assert figures.figures["expected_net"].exact == 0
