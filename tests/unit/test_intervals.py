"""Wilson and normal intervals against published values."""

import pytest

from oddsbench.simulate.intervals import normal_interval, wilson_interval, z_value


def test_z_value_of_95_percent():
    # 1.959964: standard normal table (common practice, no source)
    assert z_value(0.95) == pytest.approx(1.959964, abs=1e-6)


@pytest.mark.parametrize(
    ("successes", "trials", "low", "high"),
    [
        # R. G. Newcombe, Statistics in Medicine 17 (1998) 857-872, table II, Wilson 95 % (from memory)
        (81, 263, 0.2553, 0.3662),
        (0, 20, 0.0, 0.1611),
    ],
)
def test_wilson_interval_matches_newcombe(successes, trials, low, high):
    interval = wilson_interval(successes, trials, 0.95)
    assert interval.low == pytest.approx(low, abs=1e-4)
    assert interval.high == pytest.approx(high, abs=1e-4)


def test_normal_interval_is_symmetric_about_the_estimate():
    interval = normal_interval(2.0, 0.5, 0.95)
    assert interval.low == pytest.approx(2.0 - 0.979982, abs=1e-6)
    assert interval.high == pytest.approx(2.0 + 0.979982, abs=1e-6)


def test_a_zero_width_interval_contains_its_own_value():
    assert normal_interval(1.0, 0.0).contains(1.0)
    assert not normal_interval(1.0, 0.0).contains(1.001)


def test_wilson_interval_of_no_successes_starts_at_exactly_zero():
    # the score interval's lower end is 0 at 0 successes (Wilson 1927; arithmetic)
    assert wilson_interval(0, 20_000, 0.99).low == 0.0
    assert wilson_interval(20_000, 20_000, 0.99).high == 1.0
