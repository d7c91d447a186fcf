"""Play with no goal: risk of ruin on the bankroll walk without a top (sources beside each check).

Random walks (hypothesis) are in tests/property/test_ruin_properties.py."""

from __future__ import annotations

import math

import mpmath
import numpy as np
import pytest
from conftest import expected_rounds_by_truncation, levels_problem, scaled

from oddsbench.model.errors import OddsbenchError
from oddsbench.model.numbers import QQ, denominator, numerator
from oddsbench.solve.ruin import ruin_before_goal, solve_no_goal_ruin
from oddsbench.strategy.no_goal_play import no_goal_walk, solve_no_goal_play


def even_money(p):
    return {1: p, -1: 1 - p}


def value(certified) -> mpmath.mpf:
    return mpmath.mpf(certified.text)


# Feller, An Introduction to Probability Theory and Its Applications, Vol. I, ch. XIV sec. 2 (the
# classical ruin problem against an infinitely rich adversary): ruin from z is (q/p)^z when p > q
# and 1 when p <= q (from memory).
@pytest.mark.parametrize("p", [QQ(51, 100), QQ(3, 5), QQ(2, 3), QQ(9, 10)])
@pytest.mark.parametrize("z", [1, 5, 20])
def test_favourable_even_money_ruin_is_q_over_p_to_the_bankroll(p, z):
    ruin = solve_no_goal_ruin(even_money(p), z, check=False)
    q = 1 - p
    assert ruin.verdict == "possible"
    assert ruin.ruin_exact == QQ(numerator(q) ** z * denominator(p) ** z, numerator(p) ** z * denominator(q) ** z)
    assert ruin.theta.is_rational and ruin.theta.exact == q / p


@pytest.mark.parametrize("p", [QQ(1, 2), QQ(18, 37), QQ(9, 19), QQ(1, 3)])
def test_fair_and_subfair_even_money_ruin_is_exactly_one(p):
    ruin = solve_no_goal_ruin(even_money(p), 20)
    assert ruin.verdict == "certain"
    assert ruin.ruin_exact == 1
    assert "probability 1" in ruin.reason and "per round" in ruin.reason


# Wald's identity E[S_T] = mu E[T] (Feller Vol. I ch. XIV sec. 3 gives the expected duration
# z / (q - p) against an infinitely rich adversary, from memory).
def test_subfair_unit_loss_expected_rounds_is_bankroll_over_loss():
    ruin = solve_no_goal_ruin(even_money(QQ(18, 37)), 20)
    assert ruin.rounds_to_ruin.kind == "finite"
    assert ruin.rounds_to_ruin.exact == 740  # 20 / (1/37)


def test_single_number_bet_expected_rounds_is_bankroll_over_edge():
    # a 35-to-1 bet on a single-zero wheel loses 1/37 per round and only ever loses one unit
    ruin = solve_no_goal_ruin({35: QQ(1, 37), -1: QQ(36, 37)}, 20)
    assert ruin.ruin_exact == 1 and ruin.rounds_to_ruin.exact == 740


def test_fair_game_expected_rounds_to_ruin_is_infinite():
    ruin = solve_no_goal_ruin(even_money(QQ(1, 2)), 10)
    assert ruin.rounds_to_ruin.kind == "infinite"


def test_favourable_game_expected_rounds_to_ruin_is_not_defined():
    assert solve_no_goal_ruin(even_money(QQ(3, 5)), 10).rounds_to_ruin.kind == "not defined"


# Given ruin, a favourable even-money walk behaves like the walk with p and q swapped (Doob
# h-transform with h = (q/p)^k; common practice, no source), so E[T | ruin] = z / (p - q).
def test_rounds_when_ruin_comes_is_bankroll_over_edge_of_swapped_game():
    ruin = solve_no_goal_ruin(even_money(QQ(51, 100)), 20)
    assert ruin.rounds_if_ruined.exact == 1000


SKIP_FREE = {-1: QQ(2, 5), 1: QQ(2, 5), 2: QQ(1, 5)}  # loses 1, wins 1 or 2: several payouts


def test_skip_free_theta_is_the_root_of_its_quadratic():
    # E[t^X] = 1: 2/5 t^-1 + 2/5 t + 1/5 t^2 = 1 -> (t - 1)(t^2 + 3t - 2) = 0 -> theta = (sqrt 17 - 3) / 2
    ruin = solve_no_goal_ruin(SKIP_FREE, 3, digits=40)
    assert ruin.theta.polynomial_text == "t^2 + 3 t - 2"
    mpmath.mp.dps = 60
    theta = (mpmath.sqrt(17) - 3) / 2
    assert abs(value(ruin.theta.decimal) - theta) < mpmath.mpf(10) ** -39
    assert abs(value(ruin.ruin) - theta**3) < mpmath.mpf(10) ** -39


def test_skip_free_root_matches_truncation_at_large_goal_within_stated_bound():
    ruin = solve_no_goal_ruin(SKIP_FREE, 3, digits=30)
    goal = 80
    lower = ruin_before_goal(tuple(sorted(SKIP_FREE.items())), 3, goal)
    mpmath.mp.dps = 60
    gap = value(ruin.ruin) - mpmath.mpf(numerator(lower)) / denominator(lower)
    assert 0 <= gap <= value(ruin.theta.decimal) ** goal * (1 + mpmath.mpf(10) ** -20)
    check = ruin.truncation
    assert check is not None and check.consistent


def test_skip_free_ruin_agrees_with_a_seeded_simulation():
    # psi(3) = theta^3 ~ 0.1771; walks stopped at level 60 (ruin from there is below theta^60 ~ 1e-15)
    ruin = solve_no_goal_ruin(SKIP_FREE, 3)
    rng = np.random.default_rng(20261202)
    walks = 40_000
    level = np.full(walks, 3)
    alive = np.ones(walks, dtype=bool)
    ruined = np.zeros(walks, dtype=bool)
    for _ in range(2_000):
        if not alive.any():
            break
        draw = rng.choice([-1, 1, 2], size=alive.sum(), p=[0.4, 0.4, 0.2])
        level[alive] += draw
        ruined |= alive & (level <= 0)
        alive &= (level > 0) & (level < 60)
    estimate = ruined.mean()
    sigma = math.sqrt(ruin.ruin.value * (1 - ruin.ruin.value) / walks)
    assert abs(estimate - ruin.ruin.value) < 4 * sigma


def test_several_unit_losses_root_method_agrees_with_exact_truncation():
    law = {-2: QQ(1, 5), -1: QQ(1, 10), 1: QQ(3, 5), 2: QQ(1, 10)}
    ruin = solve_no_goal_ruin(law, 20, digits=25)
    assert ruin.method.startswith("roots of the characteristic polynomial")
    check = ruin.truncation
    assert check.consistent
    mpmath.mp.dps = 50
    lower = mpmath.mpf(numerator(check.lower)) / denominator(check.lower)
    assert lower <= value(ruin.ruin) <= lower + value(check.gap_bound)


def test_ruin_curve_from_other_bankrolls_matches_truncation():
    law = {-3: QQ(1, 5), -1: QQ(2, 5), 3: QQ(2, 5)}
    ruin = solve_no_goal_ruin(law, 30)
    ordered = tuple(sorted(law.items()))
    for start in (1, 2, 7):
        lower = ruin_before_goal(ordered, start, 400)
        assert abs(ruin.ruin_from(start).value - float(lower)) < 1e-9


def test_subfair_several_unit_losses_expected_rounds_matches_a_long_truncated_walk():
    import scipy.sparse as sp
    from scipy.sparse.linalg import spsolve

    law = {-2: 0.3, -1: 0.1, 1: 0.6}  # mean -0.1
    ruin = solve_no_goal_ruin({-2: QQ(3, 10), -1: QQ(1, 10), 1: QQ(3, 5)}, 20)
    assert ruin.rounds_to_ruin.lower == 200 and ruin.rounds_to_ruin.upper == 210  # Wald bounds
    size = 3_000  # levels 1..size; from level 20 reaching 3000 has negligible chance
    rows, cols, vals = [], [], []
    for k in range(1, size + 1):
        rows.append(k - 1), cols.append(k - 1), vals.append(1.0)
        for jump, chance in law.items():
            if 1 <= k + jump <= size:
                rows.append(k - 1), cols.append(k + jump - 1), vals.append(-chance)
    matrix = sp.csc_matrix((vals, (rows, cols)), shape=(size, size))
    durations = spsolve(matrix, np.ones(size))
    assert abs(ruin.rounds_to_ruin.decimal.value - durations[19]) < 1e-6


def test_diffusion_approximation_converges_to_exact_as_edge_shrinks():
    gaps = []
    for edge in (QQ(1, 20), QQ(1, 100), QQ(1, 1000)):
        ruin = solve_no_goal_ruin(even_money(QQ(1, 2) + edge / 2), 20, check=False)
        gaps.append(abs(ruin.diffusion_ratio.value - 1))
        assert "Brownian motion" in ruin.diffusion_text
    assert gaps[0] > gaps[1] > gaps[2] and gaps[2] < 1e-6


def test_tiny_ruin_chances_keep_their_exponent():
    ruin = solve_no_goal_ruin(even_money(QQ(51, 100)), 1_000_000, check=False)
    expected = 1_000_000 * math.log10(49 / 51)
    assert abs(ruin.ruin.log10 - expected) < 1e-6
    assert ruin.ruin.text.endswith("e-17375")
    assert ruin.ruin_exact_text == "(49/51)^1000000"


def test_decimal_digits_are_correct_to_the_last_shown():
    ruin = solve_no_goal_ruin(even_money(QQ(51, 100)), 20, digits=25)
    mpmath.mp.dps = 60
    truth = (mpmath.mpf(49) / 51) ** 20
    shown = value(ruin.ruin)
    assert abs(shown - truth) <= mpmath.mpf(10) ** (-25)
    assert len(ruin.ruin.text.replace("0.", "", 1)) == 25


def test_no_losing_result_means_no_ruin():
    ruin = solve_no_goal_ruin({0: QQ(1, 2), 1: QQ(1, 2)}, 3)
    assert ruin.verdict == "never" and ruin.ruin_exact == 0


def test_chances_that_do_not_add_up_to_one_are_refused():
    with pytest.raises(OddsbenchError, match="add up to 9/10"):
        solve_no_goal_ruin({1: QQ(1, 2), -1: QQ(2, 5)}, 3)


def test_flat_bet_of_two_units_on_an_even_bankroll_never_needs_a_cut_bet():
    # bankroll 20, bet 2 on even money: the bankroll stays even and ruin is (q/p)^10 in steps of 2
    figures = solve_no_goal_play([(QQ(1), QQ(51, 100)), (QQ(-1), QQ(49, 100))], 2, 20)
    assert figures.walk.bottom == ((QQ(1), ((-1, QQ(49, 100)), (1, QQ(51, 100)))),)
    assert figures.ruin.ruin_exact == QQ(49**10, 51**10)


def test_cut_bets_near_the_bottom_match_exact_truncation():
    # bankroll 5, bet 2, ruin below 1: at a bankroll of 1 the bet is cut to 1 (the session rules)
    from oddsbench.solve import ruin
    from oddsbench.solve.ruin import CutBetWalk, ruin_before_goal_levels

    figures = solve_no_goal_play([(QQ(1), QQ(3, 5)), (QQ(-1), QQ(2, 5))], 2, 5)
    walk = figures.walk
    assert walk.level == 5 and len(walk.bottom) == 1
    problem = CutBetWalk(walk.jumps, tuple(law for _, law in walk.bottom), 5)
    lower = ruin_before_goal_levels(problem.law_at, 5, 300)
    assert figures.ruin.ruin_exact is not None  # theta = 2/3 is rational: one exact system
    assert 0 <= figures.ruin.ruin_exact - lower < QQ(1, 10**20)
    assert ruin.VERDICT_POSSIBLE == figures.ruin.verdict


def test_bankroll_that_cannot_cover_one_bet_is_refused():
    with pytest.raises(OddsbenchError, match="cannot cover the minimum bet"):
        no_goal_walk([(QQ(1), QQ(1, 2)), (QQ(-1), QQ(1, 2))], 3, 2, unit=1, min_bet=3)


def test_float_truncation_agrees_with_exact_truncation():
    from oddsbench.solve.ruin import ruin_before_goal_float

    law = tuple(sorted({-2: QQ(1, 5), -1: QQ(1, 10), 1: QQ(3, 5), 2: QQ(1, 10)}.items()))
    assert abs(ruin_before_goal_float(law, 7, 120) - float(ruin_before_goal(law, 7, 120))) < 1e-14


def test_large_systems_are_checked_in_floating_point():
    # a favourable 35-to-1 bet (won 1 time in 30): the check needs thousands of levels of band 36
    ruin = solve_no_goal_ruin({35: QQ(1, 30), -1: QQ(29, 30)}, 50)
    assert ruin.truncation.arithmetic == "floating point" and ruin.truncation.consistent
    assert any("floating point" in note for note in ruin.notes)


@pytest.mark.parametrize(
    "law",
    [SKIP_FREE, {-2: QQ(1, 5), -1: QQ(1, 10), 1: QQ(3, 5), 2: QQ(1, 10)}],
    ids=["skip-free payouts", "losses of one and two"],
)
def test_cut_bets_with_irrational_roots_match_exact_truncation(law):
    from oddsbench.solve.ruin import ruin_before_goal_levels, solve_cut_bet_ruin

    tail, bottom = scaled(law, 3), [scaled(law, 1), scaled(law, 2)]
    ruin = solve_cut_bet_ruin(tail, bottom, 10)
    assert ruin.truncation.consistent
    lower = ruin_before_goal_levels(levels_problem(tail, bottom, 10).law_at, 10, 500)
    assert abs(ruin.ruin.value - float(lower)) < 1e-12
    assert ruin.ruin.value <= ruin.lundberg.value


def test_cut_bets_subfair_expected_rounds_match_a_long_truncated_walk():
    from oddsbench.solve.ruin import solve_cut_bet_ruin

    p, q = QQ(18, 37), QQ(19, 37)
    tail, bottom = {3: p, -3: q}, [{1: p, -1: q}, {2: p, -2: q}]
    ruin = solve_cut_bet_ruin(tail, bottom, 20)
    assert ruin.verdict == "certain" and ruin.rounds_to_ruin.exact is not None
    # E[rounds] by first-step analysis on levels 1..3000 (reaching 3000 from 20 is negligible)
    durations = expected_rounds_by_truncation(levels_problem(tail, bottom, 20), 20, size=3_000)
    assert abs(float(ruin.rounds_to_ruin.exact) - durations) < 1e-6


def test_pushes_do_not_change_the_ruin_chance_but_stretch_the_rounds():
    plain = solve_no_goal_ruin({1: QQ(9, 19), -1: QQ(10, 19)}, 10)
    with_pushes = solve_no_goal_ruin({1: QQ(9, 38), -1: QQ(10, 38), 0: QQ(1, 2)}, 10)
    assert plain.ruin_exact == with_pushes.ruin_exact == 1
    assert with_pushes.rounds_to_ruin.exact == 2 * plain.rounds_to_ruin.exact
    favourable = solve_no_goal_ruin({1: QQ(3, 10), -1: QQ(1, 5), 0: QQ(1, 2)}, 7)
    assert favourable.ruin_exact == QQ(2**7, 3**7)


def test_a_cancel_check_stops_the_solve():
    from oddsbench.solve.cancel import SolveCancelled

    with pytest.raises(SolveCancelled):
        solve_no_goal_ruin(SKIP_FREE, 3, should_stop=lambda: True)


def test_the_exact_closed_form_evaluates_to_the_shown_digits():
    # sympy evaluates CRootOf(...)**3 by its own (mpmath-based) root refinement: an independent check
    ruin = solve_no_goal_ruin(SKIP_FREE, 3, digits=30)
    independent = ruin.ruin_closed_form.evalf(40)
    assert abs(mpmath.mpf(str(independent)) - value(ruin.ruin)) < mpmath.mpf(10) ** -30


# Markov-modulated walks: Lundberg's inequality with the verified pair (R, h) (Asmussen and
# Albrecher, Ruin Probabilities, ch. VII, Markov-modulated models, from memory).
def test_losing_martingale_is_certain_ruin_with_exact_long_run_drift():
    from oddsbench.strategy.no_goal_play import solve_no_goal_progression

    figures = solve_no_goal_progression([(QQ(1), QQ(18, 37)), (QQ(-1), QQ(19, 37))], "martingale", 1, 4, 20)
    assert figures.ruin.verdict == "certain" and figures.ruin.ruin_exact == 1
    assert figures.ruin.mean < 0


def test_favourable_martingale_lies_between_truncations_and_their_bound():
    from oddsbench.solve.ruin import progression_ruin_before_goal
    from oddsbench.strategy.no_goal_play import solve_no_goal_progression

    figures = solve_no_goal_progression([(QQ(1), QQ(3, 5)), (QQ(-1), QQ(2, 5))], "martingale", 1, 3, 6)
    assert figures.ruin.verdict == "possible"
    p, q = QQ(3, 5), QQ(2, 5)

    def moves_at(level, state):
        bet = min(2**state, level)
        return ((bet, p, 0), (-bet, q, state + 1 if state + 1 < 3 else 0))

    lower = float(progression_ruin_before_goal(3, moves_at, 6, 0, 200))
    assert lower - 1e-12 <= figures.ruin.ruin.value <= lower + 1e-9
    assert figures.ruin.ruin.value <= figures.ruin.lundberg.value


def test_no_goal_is_the_limit_of_bounded_sessions_as_the_goal_grows():
    # same rules as bounded sessions (cut bets near the bottom): goal 600 is already within 1e-5
    from oddsbench.chain.round_distribution import parse_round_text
    from oddsbench.model.numbers import QQ
    from oddsbench.strategy.no_goal_play import solve_no_goal_play
    from oddsbench.strategy.session import SessionSettings, analyse_session

    for spelled, bet, bankroll in (
        ("1:51/100,-1:49/100", 2, 7),
        ("3/2:1/2,-1:1/2", 2, 5),
        ("2:1/5,1:2/5,-1:2/5", 3, 4),
    ):
        distribution = parse_round_text(spelled)
        bounded = [
            analyse_session(
                distribution, SessionSettings(bankroll=QQ(bankroll), goal=QQ(goal)), f"flat:{bet}", exact_limit=0
            )
            .figures["ruin_probability"]
            .decimal
            for goal in (100, 600)
        ]
        no_goal = solve_no_goal_play(
            [(o.net, o.prob) for o in distribution.outcomes], bet, bankroll, cover=distribution.cover, check=False
        ).ruin.ruin.value
        assert bounded[0] <= bounded[1] <= no_goal + 1e-12
        assert no_goal - bounded[1] < 1e-5
