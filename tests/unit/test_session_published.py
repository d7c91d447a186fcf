"""Session figures against published values and closed forms (source beside each check)."""

from __future__ import annotations

import math

import pytest

from oddsbench.chain.round_distribution import parse_round_text
from oddsbench.model.numbers import QQ
from oddsbench.strategy.session import SessionSettings, analyse_session


def walk(p: QQ):
    return parse_round_text(f"1:{p.numerator}/{p.denominator},-1:{(1 - p).numerator}/{(1 - p).denominator}")


def session(p, z, a, plan="timid", **options):
    return analyse_session(walk(p), SessionSettings(QQ(z), QQ(a)), plan, **options)


def ruin_closed_form(p, z, a):
    """Feller, Vol. I, ch. XIV, eq. (2.4): q_z = ((q/p)^a - (q/p)^z) / ((q/p)^a - 1); fair: 1 - z/a."""
    q = 1 - p
    if p == q:
        return 1 - QQ(z, a)
    r = q / p
    return (r**a - r**z) / (r**a - 1)


def duration_closed_form(p, z, a):
    """Feller, Vol. I, ch. XIV, eq. (3.4): D_z = z/(q-p) - a/(q-p) (1-(q/p)^z)/(1-(q/p)^a); fair: z(a-z)."""
    q = 1 - p
    if p == q:
        return QQ(z * (a - z))
    r = q / p
    return QQ(z) / (q - p) - QQ(a) / (q - p) * (1 - r**z) / (1 - r**a)


# Feller, An Introduction to Probability Theory and Its Applications, Vol. I (3rd ed.), ch. XIV,
# section 2, table 1 "Illustrating the classical ruin problem" (from memory): p, z, a, probability
# of ruin, probability of success, expected gain, expected duration, at the printed precision.
# Every row was checked against the closed forms above (see test_feller_rows_match_closed_form).
FELLER_ROWS = [
    (QQ(1, 2), 9, 10, "0.1", "0.9", "0", "9"),
    (QQ(1, 2), 90, 100, "0.1", "0.9", "0", "900"),
    (QQ(1, 2), 900, 1000, "0.1", "0.9", "0", "90000"),
    (QQ(1, 2), 950, 1000, "0.05", "0.95", "0", "47500"),
    (QQ(1, 2), 8000, 10000, "0.2", "0.8", "0", "16000000"),
    (QQ(9, 20), 9, 10, "0.210", "0.790", "-1.1", "11"),
    (QQ(9, 20), 90, 100, "0.866", "0.134", "-76.6", "765.6"),
    (QQ(9, 20), 99, 100, "0.182", "0.818", "-17.2", "171.8"),
    (QQ(2, 5), 90, 100, "0.983", "0.017", "-88.3", "441.3"),
    (QQ(2, 5), 99, 100, "0.333", "0.667", "-32.3", "161.7"),
]


def printed(value: float, shown: str) -> bool:
    """Does ``value`` round to the table's printed figure (same number of decimals)?"""
    decimals = len(shown.partition(".")[2])
    return abs(value - float(shown)) <= 0.5 * 10**-decimals + 1e-12


@pytest.mark.parametrize(("p", "z", "a", "ruin", "success", "gain", "duration"), FELLER_ROWS)
def test_feller_ruin_table_rows(p, z, a, ruin, success, gain, duration):
    figures = session(p, z, a).figures
    assert printed(figures["ruin_probability"].decimal, ruin)
    assert printed(figures["goal_probability"].decimal, success)
    assert printed(figures["expected_net"].decimal, gain)
    # durations are printed to 0.1 in the biased rows, as whole numbers in the fair rows
    assert printed(figures["expected_rounds"].decimal, duration) or (
        "." not in duration and abs(figures["expected_rounds"].decimal - float(duration)) < 1e-6 * float(duration)
    )


# The closed form is evaluated exactly, so rows with goals over 1,000 are left to the chain test above.
@pytest.mark.parametrize(
    ("p", "z", "a", "ruin", "success", "gain", "duration"), [r for r in FELLER_ROWS if r[2] <= 1000]
)
def test_feller_rows_match_closed_form(p, z, a, ruin, success, gain, duration):
    assert printed(float(ruin_closed_form(p, z, a)), ruin)
    assert printed(float(duration_closed_form(p, z, a)), duration) or "." not in duration


@pytest.mark.parametrize(
    ("p", "z", "a"), [(QQ(9, 20), 9, 10), (QQ(9, 20), 90, 100), (QQ(2, 5), 99, 100), (QQ(1, 2), 90, 100)]
)
def test_exact_ruin_equals_closed_form_for_rational_p(p, z, a):
    figures = session(p, z, a).figures
    assert figures["ruin_probability"].exact == ruin_closed_form(p, z, a)


@pytest.mark.parametrize(("z", "a"), [(1, 2), (5, 10), (37, 100), (250, 400)])
def test_fair_game_expected_duration_is_z_times_a_minus_z(z, a):
    # Feller, Vol. I, ch. XIV, section 3: D_z = z (a - z) for p = q.
    assert session(QQ(1, 2), z, a).figures["expected_rounds"].exact == z * (a - z)


@pytest.mark.parametrize(("p", "z", "a"), [(QQ(18, 37), 10, 30), (QQ(9, 20), 90, 100), (QQ(3, 5), 4, 50)])
def test_biased_game_expected_duration_formula(p, z, a):
    # Feller, Vol. I, ch. XIV, eq. (3.4).
    assert session(p, z, a).figures["expected_rounds"].exact == duration_closed_form(p, z, a)


def test_large_even_money_grid_matches_closed_form_in_decimal():
    # 20,000 states: decimal engine only; closed form evaluated as r^(z-a)(1-r^-z)/(1-r^-a) (no overflow).
    p, z, a = 0.4995, 10_000, 20_000
    result = analyse_session(parse_round_text("1:4995/10000,-1:5005/10000"), SessionSettings(QQ(z), QQ(a)), "timid")
    r = (1 - p) / p
    success = r ** (z - a) * (1 - r**-z) / (1 - r**-a)
    assert result.figures["goal_probability"].exact is None
    assert math.isclose(result.figures["goal_probability"].decimal, success, rel_tol=1e-8)


def bold_recursion(p, x: QQ) -> QQ:
    """Dubins and Savage, How to Gamble If You Must (1965): bold play's chance of reaching 1 from x
    satisfies Q(x) = p Q(2x) for x <= 1/2 and Q(x) = p + q Q(2x - 1) above; dyadic x end the recursion."""
    if x >= 1:
        return QQ(1)
    if x <= 0:
        return QQ(0)
    if x <= QQ(1, 2):
        return p * bold_recursion(p, 2 * x)
    return p + (1 - p) * bold_recursion(p, 2 * x - 1)


def test_bold_play_matches_its_functional_recursion():
    p = QQ(18, 37)
    result = analyse_session(walk(p), SessionSettings(QQ(1), QQ(64)), "bold")
    assert result.goal_series_exact is not None
    for k, value in enumerate(result.goal_series_exact):
        assert value == bold_recursion(p, QQ(k, 64))


def test_bold_play_is_at_least_timid_play_in_a_subfair_even_money_game():
    # Dubins and Savage (1965): bold play is optimal in subfair red-and-black; timid play is not.
    settings = SessionSettings(QQ(30), QQ(100))
    bold = analyse_session(walk(QQ(18, 37)), settings, "bold")
    timid = analyse_session(walk(QQ(18, 37)), settings, "timid")
    for b, t in zip(bold.goal_series_exact, timid.goal_series_exact):
        assert b >= t
    assert bold.figures["goal_probability"].exact > timid.figures["goal_probability"].exact


def test_kelly_fraction_is_p_minus_q_over_b():
    # Kelly (1956), A New Interpretation of Information Rate: f* = p - q/b for a b-to-1 bet.
    from oddsbench.strategy.kelly import kelly_fraction

    assert kelly_fraction(parse_round_text("3:1/3,-1:2/3")).exact == QQ(1, 3) - QQ(2, 3) / 3
    assert kelly_fraction(parse_round_text("1:3/5,-1:2/5")).exact == QQ(1, 5)


def test_kelly_growth_rate_in_bits_is_one_minus_binary_entropy_for_even_money():
    # Kelly (1956): at f* = p - q the rate is G = 1 + p log2 p + q log2 q (bits per bet; log base 2).
    from oddsbench.strategy.kelly import growth_bits, kelly_fraction

    distribution = parse_round_text("1:3/5,-1:2/5")
    rate = growth_bits(distribution, kelly_fraction(distribution).decimal)
    assert math.isclose(rate, 1 + 0.6 * math.log2(0.6) + 0.4 * math.log2(0.4), rel_tol=1e-12)


def test_kelly_is_zero_for_a_game_without_positive_expectation():
    from oddsbench.strategy.kelly import kelly_fraction

    assert kelly_fraction(walk(QQ(18, 37))).exact == 0


@pytest.mark.parametrize("series", [1, 3, 5])
def test_martingale_series_fails_with_chance_q_to_the_k(series):
    # A series of k doubled bets fails only when all k lose: q^k (common practice, no source).
    # Bankroll 2^k - 1 covers exactly one series; a won series nets +1 and reaches the goal.
    q = QQ(19, 37)
    bankroll = 2**series - 1
    result = analyse_session(
        walk(QQ(18, 37)), SessionSettings(QQ(bankroll), QQ(bankroll + 1)), f"martingale:1:{series}"
    )
    assert result.figures["ruin_probability"].exact == q**series


def test_martingale_series_expected_net_is_minus_edge_times_staked():
    result = analyse_session(walk(QQ(18, 37)), SessionSettings(QQ(63), QQ(64)), "martingale:1:6")
    figures = result.figures
    assert figures["expected_net"].exact == -QQ(1, 37) * figures["expected_staked"].exact
    # the staked amount of one series: sum over the k bets of 2^i times the chance of reaching bet i
    q = QQ(19, 37)
    assert figures["expected_staked"].exact == sum((2**i * q**i for i in range(6)), QQ(0))
