"""Session simulation agrees with the session solver within its intervals, and flags a wrong value."""

from pathlib import Path

import pytest

from oddsbench.chain.round_chain import build_round_chain
from oddsbench.model.load import load_ruleset
from oddsbench.model.numbers import QQ
from oddsbench.simulate.checks import session_checks
from oddsbench.simulate.round_sim import RoundPlayer
from oddsbench.simulate.session_sim import simulate_session
from oddsbench.solve.round_distribution import round_distribution
from oddsbench.strategy.session import SessionSettings, analyse_session, session_chain

RULESETS = Path(__file__).resolve().parents[2] / "rulesets"


def checks_for(name, settings, plan, trials=40_000, seed=1, truth_settings=None):
    round_chain = build_round_chain(load_ruleset(RULESETS / name))
    distribution = round_distribution(round_chain)
    figures = analyse_session(distribution, truth_settings or settings, plan)
    chain = session_chain(distribution, settings, plan, 5_000).chain
    sample = simulate_session(chain, trials, seed, RoundPlayer.of(round_chain), settings.max_rounds, plan=plan)
    return sample, session_checks(sample, figures)


def test_flat_bets_on_the_wheel_bracket_the_exact_ruin_figures():
    # even money at 18/37 from 10 to 20: the classical ruin formula (Feller, vol. 1, ch. XIV)
    sample, checks = checks_for("single-zero-wheel.toml", SessionSettings(QQ(10), QQ(20)), "flat:1")
    assert {c.name for c in checks} >= {"goal_probability", "ruin_probability", "expected_rounds", "expected_net"}
    assert [c.name for c in checks if c.outside] == []
    assert sample.ends["goal"] + sample.ends["ruin"] == sample.trials


@pytest.mark.parametrize(
    ("name", "settings", "plan"),
    [
        ("pass-line.toml", SessionSettings(QQ(10), QQ(30), max_rounds=50), "bold"),
        ("lantern-dice.toml", SessionSettings(QQ(20), QQ(40), floor=QQ(5)), "martingale:1:4"),
        ("field.toml", SessionSettings(QQ(10), QQ(20)), "best"),
    ],
)
def test_plans_on_the_bundled_games_bracket_every_solver_figure(name, settings, plan):
    _, checks = checks_for(name, settings, plan)
    assert [c.name for c in checks if c.outside] == []
    assert all(c.exact is not None for c in checks)


def test_a_wrong_session_value_is_flagged():
    # the "truth" is solved for a goal of 21 while the sessions play to 20: wrong on purpose
    _, checks = checks_for(
        "single-zero-wheel.toml",
        SessionSettings(QQ(10), QQ(20)),
        "flat:1",
        truth_settings=SessionSettings(QQ(10), QQ(21)),
    )
    assert {"goal_probability", "ruin_probability", "expected_rounds"} <= {c.name for c in checks if c.outside}


def test_the_same_seed_gives_the_same_sessions():
    first, _ = checks_for("pass-line.toml", SessionSettings(QQ(5), QQ(10)), "flat:1", trials=5_000, seed=4)
    again, _ = checks_for("pass-line.toml", SessionSettings(QQ(5), QQ(10)), "flat:1", trials=5_000, seed=4)
    assert first.ends == again.ends and first.rounds.mean == again.rounds.mean
