"""The skip-free session engine against the exact engine on random small paytables (hypothesis).

A flat bet of one unit on a paytable that loses at most one unit (or, mirrored, wins at most one)
is solved by the skip-free walk (decimals only, ``exact_limit=0``) and by rational elimination:
every chance agrees to 1e-12 relative where it is in the float range and to 1e-10 in log10 below
it; expected rounds, their variance and staked to 1e-9 relative (their digits are vouched for).
"""

from __future__ import annotations

import os

from hypothesis import given, settings
from hypothesis import strategies as st

from oddsbench.chain.round_distribution import RoundOutcome, make_distribution
from oddsbench.model.figure import FLOAT_TINY
from oddsbench.model.numbers import QQ, log10_abs, to_float
from oddsbench.solve.bankroll_system import skip_free_view
from oddsbench.strategy.session import SessionSettings, analyse_session, session_chain

EXAMPLES = int(os.environ.get("ODDSBENCH_HEAVY_EXAMPLES", "25"))
CHANCES = ("goal_probability", "ruin_probability")
MOMENTS = ("expected_rounds", "rounds_variance", "expected_staked", "expected_final_bankroll")


@st.composite
def paytables(draw):
    """1-4 whole wins of 1..30 units (or, mirrored, losses), one loss (win) of one unit, maybe a push;
    chances from weights down to 10^-9, so goal chances reach far below the float range."""
    pays = draw(st.lists(st.integers(1, 30), min_size=1, max_size=4, unique=True))
    scales = draw(st.lists(st.sampled_from([1, 10, 10**3, 10**6, 10**9]), min_size=len(pays), max_size=len(pays)))
    weights = [QQ(draw(st.integers(1, 9)), scale) for scale in scales]
    push = QQ(draw(st.integers(0, 3)), 10)
    total = sum(weights, QQ(0))
    shares = [w / total * (1 - push) * QQ(draw(st.integers(1, 8)), 10) for w in weights]
    single = 1 - push - sum(shares, QQ(0))
    mirrored = draw(st.booleans())
    sign = -1 if mirrored else 1
    outcomes = [RoundOutcome(QQ(sign * pay), share) for pay, share in zip(pays, shares)]
    outcomes.append(RoundOutcome(QQ(-sign), single))
    if push:
        outcomes.append(RoundOutcome(QQ(0), push))
    return make_distribution("random paytable", outcomes)


def agree(name, figure, exact):
    truth = to_float(exact)
    if exact == 0:
        assert figure.decimal == 0.0 and figure.log10 is None, name
    elif truth >= FLOAT_TINY:
        assert abs(figure.decimal - truth) <= 1e-12 * truth, (name, figure.decimal, truth)
    else:
        assert figure.decimal == 0.0 and figure.log10 is not None, name
        assert abs(figure.log10 - log10_abs(exact)) <= 1e-10 * abs(figure.log10), (name, figure.log10)


@settings(max_examples=EXAMPLES, deadline=None)
@given(table=paytables(), above=st.integers(0, 40), gap=st.integers(1, 60))
def test_skip_free_sessions_match_the_exact_engine(table, above, gap):
    start = int(table.cover) + above  # a bankroll that covers the worst loss of one unit bet
    settings_ = SessionSettings(QQ(start), QQ(start + gap))
    assert skip_free_view(session_chain(table, settings_, "flat:1").chain).walk is not None
    decimal = analyse_session(table, settings_, "flat:1", exact_limit=0)
    exact = analyse_session(table, settings_, "flat:1", exact_limit=10_000)
    assert exact.goal_series_exact is not None
    for name in CHANCES:
        agree(name, decimal.figures[name], exact.figures[name].exact)
    for k, value in enumerate(exact.goal_series_exact):
        agree(f"series[{k}]", decimal.series_figure(k), value)
    scale = max(1.0, to_float(exact.figures["expected_rounds"].exact)) ** 2  # a variance of 0 is met to rounding
    for name in MOMENTS:
        truth = to_float(exact.figures[name].exact)
        assert abs(decimal.figures[name].decimal - truth) <= 1e-9 * abs(truth) + 1e-15 * scale, name
