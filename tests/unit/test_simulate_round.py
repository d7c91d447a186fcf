"""Round simulation agrees with the exact engine within its intervals, and flags a wrong value."""

from pathlib import Path

import numpy as np

from oddsbench.chain.round_chain import build_round_chain
from oddsbench.model.load import load_ruleset, load_ruleset_text
from oddsbench.model.numbers import QQ
from oddsbench.simulate.checks import round_checks
from oddsbench.simulate.intervals import wilson_interval
from oddsbench.simulate.round_sim import simulate_round
from oddsbench.solve.round import solve_round

RULESETS = Path(__file__).resolve().parents[2] / "rulesets"
PASS_LINE = RULESETS / "pass-line.toml"
WHEEL = RULESETS / "single-zero-wheel.toml"


def checks_for(path, trials=200_000, seed=1, truth_from=None):
    chain = build_round_chain(load_ruleset(path))
    truth = chain if truth_from is None else truth_from
    return round_checks(simulate_round(chain, trials, seed), solve_round(truth))


def test_pass_line_simulation_brackets_every_exact_figure():
    # house edge 7/495 of the pass line: S. N. Ethier, The Doctrine of Chances (2010), as in test_published_values
    checks = checks_for(PASS_LINE)
    assert {c.name: c.exact.exact for c in checks}["house_edge"] == QQ(7, 495)
    assert [c.name for c in checks if c.outside] == []
    assert len(checks) == 11


def test_wheel_simulation_brackets_every_exact_figure():
    # even-money bet on 37 pockets: win chance 18/37, edge 1/37 (common practice, no source)
    checks = checks_for(WHEEL, seed=7)
    assert [c.name for c in checks if c.outside] == []


def test_a_deliberately_wrong_exact_value_is_flagged():
    # the "truth" here is a pass line whose come-out roll wins 9/36 and loses 3/36: wrong on purpose
    wrong = (
        PASS_LINE.read_text()
        .replace('prob = "8/36"', 'prob = "9/36"')
        .replace('prob = "4/36", pay = -1', 'prob = "3/36", pay = -1')
    )
    wrong_chain = build_round_chain(load_ruleset_text(wrong, "wrong.toml"))
    flagged = {c.name for c in checks_for(PASS_LINE, truth_from=wrong_chain) if c.outside}
    assert {"expected_net", "house_edge", "return_to_player", "end_probability[won]"} <= flagged


def test_the_same_seed_gives_the_same_sample_and_another_seed_does_not():
    chain = build_round_chain(load_ruleset(PASS_LINE))
    first, again, other = (simulate_round(chain, 50_000, seed) for seed in (3, 3, 4))
    assert first.net.mean == again.net.mean and list(first.end_counts) == list(again.end_counts)
    assert first.net.mean != other.net.mean


def test_every_trial_ends_in_exactly_one_end_state():
    sample = simulate_round(build_round_chain(load_ruleset(PASS_LINE)), 30_001, 5)
    assert int(sample.end_counts.sum()) == 30_001 and sample.unfinished == 0


def test_rounds_cut_short_by_the_step_limit_are_counted_not_hidden():
    sample = simulate_round(build_round_chain(load_ruleset(PASS_LINE)), 20_000, 2, max_steps=1)
    # after one roll only 7, 11, 2, 3 and 12 have settled: 12/36 of rounds (two dice: common practice)
    ended = int(sample.end_counts.sum())
    assert sample.unfinished == 20_000 - ended
    interval = wilson_interval(ended, 20_000, 0.999)
    assert interval.contains(1 / 3)


def test_a_many_outcome_state_is_drawn_with_its_own_chances():
    text = """
[ruleset]
title = "five faces"
start = "roll"
[states.roll]
outcomes = [
  { to = "a", prob = "1/2" }, { to = "b", prob = "1/4" }, { to = "c", prob = "1/8" },
  { to = "d", prob = "1/16" }, { to = "e", prob = "1/16" },
]
[states.a]
[states.b]
[states.c]
[states.d]
[states.e]
"""
    chain = build_round_chain(load_ruleset_text(text))
    sample = simulate_round(chain, 100_000, 11)
    chances = dict(zip(sample.end_names, np.array([1 / 2, 1 / 4, 1 / 8, 1 / 16, 1 / 16])))
    for name, count in zip(sample.end_names, sample.end_counts):
        assert wilson_interval(int(count), 100_000, 0.999).contains(chances[name])
