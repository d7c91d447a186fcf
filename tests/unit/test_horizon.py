"""The total net after N rounds: exact convolution, the float path past its limits, and the normal law."""

from __future__ import annotations

import math
from math import comb
from statistics import NormalDist

import pytest
from conftest import RULESETS

from oddsbench.core import horizon, inline_round, load_game, make_settings
from oddsbench.model.errors import OddsbenchError
from oddsbench.model.numbers import QQ, to_float
from oddsbench.solve import horizon as engine

EVEN_MONEY = [(QQ(1), QQ(18, 37)), (QQ(-1), QQ(19, 37))]
PASS_LINE = [(QQ(1), QQ(244, 495)), (QQ(-1), QQ(251, 495))]
FIELD = [(QQ(-1), QQ(5, 9)), (QQ(1), QQ(7, 18)), (QQ(2), QQ(1, 36)), (QQ(3), QQ(1, 36))]


def test_ten_even_money_spins_of_a_37_pocket_wheel():
    # Binomial, first principles: ahead after 10 spins = more than 5 wins of 10 at 18/37; even = exactly 5.
    (ten,) = engine.horizons(EVEN_MONEY, QQ(1), [10])
    assert ten.method == "exact"
    assert ten.ahead.exact == QQ(1655010535112064, 4808584372417849)
    assert ten.even.exact == QQ(1179046873678464, 4808584372417849)
    ahead = sum(comb(10, k) * 18**k * 19 ** (10 - k) for k in range(6, 11))
    assert ten.ahead.exact == QQ(ahead, 37**10) and ten.even.exact == QQ(comb(10, 5) * 18**5 * 19**5, 37**10)
    assert ten.ahead.exact + ten.even.exact + ten.behind.exact == 1


def test_mean_and_variance_are_n_times_one_rounds_exactly():
    for h in engine.horizons(PASS_LINE, QQ(1), [1, 7, 250]):
        assert h.mean == h.rounds * QQ(-7, 495)
        assert h.variance == h.rounds * (1 - QQ(7, 495) ** 2)


def test_a_payout_of_three_to_two_puts_zero_off_the_lattice():
    # nets 3/2 (chance 2/5) and -1: after 2 rounds the totals are 3, 1/2 and -2: never even (arithmetic).
    (two,) = engine.horizons([(QQ(3, 2), QQ(2, 5)), (QQ(-1), QQ(3, 5))], QQ(1), [2])
    assert (two.low, two.step, two.support) == (QQ(-2), QQ(5, 2), 3)
    assert two.even.exact == 0 and two.ahead.exact == QQ(16, 25) and two.behind.exact == QQ(9, 25)


def test_the_return_range_holds_at_least_its_level_and_is_exact():
    (hundred,) = engine.horizons(PASS_LINE, QQ(1), [100])
    for band in hundred.rtp_ranges:
        assert band.inside.exact >= QQ(band.level, 100)
        assert band.low.exact <= QQ(488, 495) <= band.high.exact
        # the realised return is 1 + total / N: the ends are totals on the lattice -100, -98, ..., 100
        total = (band.low.exact - 1) * 100
        assert total == int(total) and int(total) % 2 == 0


@pytest.mark.parametrize("rounds", [10, 100, 1000, 10000])
def test_quantiles_approach_the_normal_ones_within_the_berry_esseen_bound(rounds):
    # de Moivre-Laplace with the Berry-Esseen bound: |F_N(x) - Phi((x - N mu) / (sigma sqrt N))| <=
    # C rho / (sigma^3 sqrt N), C = 0.4748 (Shevtsova 2011), rho = E|X - mu|^3. A quantile q of the law
    # therefore lies between the normal quantiles at level -/+ the bound (plus one lattice step).
    mu, variance = QQ(-7, 495), 1 - QQ(7, 495) ** 2
    rho = sum(abs(x - mu) ** 3 * p for x, p in PASS_LINE)
    sigma = math.sqrt(to_float(variance))
    bound = 0.4748 * to_float(rho) / (sigma**3 * math.sqrt(rounds))
    (h,) = engine.horizons(PASS_LINE, QQ(1), [rounds])
    normal = NormalDist(rounds * to_float(mu), sigma * math.sqrt(rounds))
    for level, quantile in h.quantiles:
        alpha = level / 100
        low = normal.inv_cdf(alpha - bound) if alpha - bound > 0 else -math.inf
        high = normal.inv_cdf(alpha + bound) + 2 if alpha + bound < 1 else math.inf
        assert low - 1e-9 <= quantile.decimal <= high + 1e-9
    # and the gap, measured in standard deviations, shrinks like the bound (1/sqrt N)
    gap = max(abs(q.decimal - n) for (_, q), (_, n) in zip(h.quantiles, h.normal_quantiles))
    assert gap / (sigma * math.sqrt(rounds)) <= 3 * bound + 2 / (sigma * math.sqrt(rounds))


@pytest.mark.parametrize(
    "law", [PASS_LINE, [(QQ(-1), QQ(5, 9)), (QQ(1), QQ(7, 18)), (QQ(2), QQ(1, 36)), (QQ(3), QQ(1, 36))]]
)
def test_the_float_convolution_agrees_with_the_exact_law(monkeypatch, law):
    exact = engine.horizons(law, QQ(1), [1000])[0]
    monkeypatch.setattr(engine, "exact_fits", lambda lattice, n: False)
    floated = engine.horizons(law, QQ(1), [1000])[0]
    assert floated.method == "float" and floated.error_bound == engine.FLOAT_CHANCE_ERROR
    for name in ("ahead", "even", "behind"):
        assert abs(getattr(floated, name).decimal - getattr(exact, name).decimal) <= engine.FLOAT_CHANCE_ERROR
    assert [q.decimal for _, q in floated.quantiles] == [q.decimal for _, q in exact.quantiles]
    assert floated.quantiles[0][1].exact is None and floated.mean == exact.mean


def test_past_the_exact_limits_the_law_is_a_float_convolution_with_a_note():
    (h,) = engine.horizons(PASS_LINE, QQ(1), [10_000])
    assert h.method == "float" and h.ahead.exact is None
    assert any("float convolution" in note for note in h.notes)
    assert h.mean == 10_000 * QQ(-7, 495)


def test_rounds_beyond_the_float_limit_are_refused_in_one_line():
    with pytest.raises(OddsbenchError, match="over the limit"):
        engine.horizons(PASS_LINE, QQ(1), [engine.FLOAT_SUPPORT])
    with pytest.raises(OddsbenchError, match="from 1 to"):
        engine.horizons(PASS_LINE, QQ(1), [0])


def test_a_ruleset_with_several_pays_per_round_uses_its_net_law():
    results = horizon(load_game(RULESETS / "lantern-dice.toml"), [1, 2])
    one = results.horizons[0]
    figures = {value.net: value.probability for value in _net_law(RULESETS / "lantern-dice.toml")}
    assert one.ahead.exact == sum((p for net, p in figures.items() if net > 0), QQ(0))
    assert one.even.exact == figures.get(QQ(0), QQ(0))


def _net_law(path):
    from oddsbench.core import round_figures

    return round_figures(load_game(path)).columns[0].figures.return_table.law


def test_a_game_of_points_has_no_return_range():
    results = horizon(load_game(RULESETS / "pig-turn.toml"), [3], make_settings(strategies=["hold-at-20"]))
    assert results.expected_staked is None and results.horizons[0].rtp_ranges == ()
    assert results.horizons[0].behind.exact == 0  # Pig never loses points


def test_an_inline_round_is_per_unit_staked():
    results = horizon(inline_round("1:18/37,-1:19/37"), [10])
    assert results.return_to_player.exact == QQ(36, 37)
    assert results.horizons[0].ahead.exact == QQ(1655010535112064, 4808584372417849)


def test_a_game_with_decisions_needs_one_strategy():
    with pytest.raises(OddsbenchError, match="choose one strategy"):
        horizon(load_game(RULESETS / "pig-turn.toml"), [3])
