"""Session engine properties on random games (hypothesis): identities that hold exactly for every plan."""

from __future__ import annotations

import os

from conftest import NAMED_PLANS
from hypothesis import given, settings
from hypothesis import strategies as st

from oddsbench.chain.round_distribution import RoundOutcome, make_distribution
from oddsbench.model.numbers import QQ
from oddsbench.strategy.session import SessionSettings, analyse_session

EXAMPLES = int(os.environ.get("ODDSBENCH_HEAVY_EXAMPLES", "25"))


@st.composite
def games(draw):
    """A random round: 2-4 distinct whole net results in -2..4 (at least one loss), random chances."""
    nets = draw(st.lists(st.integers(-2, 4), min_size=2, max_size=4, unique=True).filter(lambda n: min(n) < 0))
    weights = draw(st.lists(st.integers(1, 9), min_size=len(nets), max_size=len(nets)))
    total = sum(weights)
    return make_distribution("random", [RoundOutcome(QQ(n), QQ(w, total)) for n, w in zip(nets, weights)])


@settings(max_examples=EXAMPLES, deadline=None)
@given(game=games(), start=st.integers(1, 12), gap=st.integers(1, 12), plan=st.sampled_from(NAMED_PLANS))
def test_optional_stopping_identity_holds_exactly_on_random_games(game, start, gap, plan):
    # Optional stopping (Doob): E[final] - start = E[sum of round nets] = -(house edge) x E[staked].
    result = analyse_session(game, SessionSettings(QQ(start), QQ(start + gap)), plan)
    figures = result.figures
    assert figures["expected_net"].exact == figures["edge_times_staked"].exact
    total = figures["goal_probability"].exact + figures["ruin_probability"].exact
    assert total == 1
    assert sum((v.chance.exact for v in result.final), QQ(0)) == 1
