"""Properties of the law after N rounds on random net laws (hypothesis): N = 1 is the net law, the
exact convolution agrees with brute force, and mean and variance scale exactly with N."""

from __future__ import annotations

from hypothesis import given, settings
from hypothesis import strategies as st

from oddsbench.model.numbers import QQ
from oddsbench.solve.horizon import horizons


@st.composite
def net_laws(draw):
    """(net, chance) pairs: distinct nets with small denominators (payouts like 3 to 2), chances summing to 1."""
    count = draw(st.integers(1, 5))
    nets = draw(
        st.lists(
            st.builds(lambda top, bottom: QQ(top, bottom), st.integers(-6, 8), st.sampled_from([1, 2, 4])),
            min_size=count,
            max_size=count,
            unique=True,
        )
    )
    weights = [draw(st.integers(1, 9)) for _ in nets]
    total = sum(weights)
    return [(net, QQ(weight, total)) for net, weight in zip(nets, weights)]


def brute_force(law, rounds):
    totals = {QQ(0): QQ(1)}
    for _ in range(rounds):
        following = {}
        for total, chance in totals.items():
            for net, p in law:
                following[total + net] = following.get(total + net, QQ(0)) + chance * p
        totals = following
    return totals


@settings(max_examples=60, deadline=None)
@given(net_laws())
def test_one_round_is_the_net_law(law):
    (one,) = horizons(law, QQ(1), [1])
    assert one.ahead.exact == sum((p for net, p in law if net > 0), QQ(0))
    assert one.even.exact == sum((p for net, p in law if net == 0), QQ(0))
    assert one.behind.exact == sum((p for net, p in law if net < 0), QQ(0))
    nets = sorted(net for net, _ in law)
    assert all(q.exact in nets for _, q in one.quantiles)


@settings(max_examples=40, deadline=None)
@given(net_laws(), st.integers(1, 5))
def test_the_exact_convolution_is_the_brute_force_law(law, rounds):
    (h,) = horizons(law, QQ(1), [rounds])
    totals = brute_force(law, rounds)
    assert h.ahead.exact == sum((p for t, p in totals.items() if t > 0), QQ(0))
    assert h.even.exact == totals.get(QQ(0), QQ(0))
    for level, quantile in h.quantiles:
        below = sum((p for t, p in totals.items() if t < quantile.exact), QQ(0))
        assert below < QQ(level, 100) <= below + totals[quantile.exact]


@settings(max_examples=40, deadline=None)
@given(net_laws(), st.integers(1, 60))
def test_mean_and_variance_scale_exactly_and_chances_split_the_law(law, rounds):
    mean = sum((net * p for net, p in law), QQ(0))
    variance = sum((net * net * p for net, p in law), QQ(0)) - mean * mean
    (h,) = horizons(law, QQ(1), [rounds])
    assert h.mean == rounds * mean and h.variance == rounds * variance
    assert h.ahead.exact + h.even.exact + h.behind.exact == 1
    assert all(band.inside.exact >= QQ(band.level, 100) for band in h.rtp_ranges)
