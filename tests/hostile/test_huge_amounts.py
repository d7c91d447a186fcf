"""Amounts of any size typed on the command line: a figure, or one line and exit 2, never exit 70.

A bet, minimum or extra stake too large for any bankroll on the grid is cut to what the bankroll
covers (the session rules), so its figures are those of a bet the bankroll can just cover; a
net result too large to keep in 64-bit grid steps is refused in one line.
"""

from __future__ import annotations

import pytest
from conftest import RULESETS, run_cli

PASS_LINE = str(RULESETS / "pass-line.toml")
BOUNDED = ("--bankroll", "100", "--goal", "200")
# Pass line: P(win) = 244/495 (Ethier, The Doctrine of Chances, 2010). Staking the whole bankroll of 100
# toward a goal of 200 ends after one round: the goal with chance 244/495.
ONE_ROUND_GOAL = "244/495"


def row(out: str, quantity: str) -> str:
    """The cells of one row of a session table, spaces folded."""
    for line in out.splitlines():
        if line.startswith(quantity + "  "):
            return " ".join(line[len(quantity) :].split())
    raise AssertionError(f"no row {quantity!r} in:\n{out}")


def one_line(err: str) -> str:
    lines = err.splitlines()
    assert len(lines) == 1, err
    assert "internal error" not in lines[0] and "Traceback" not in err
    return lines[0]


@pytest.mark.parametrize("plan", ["flat:10^60", "martingale:10^60:3", "paroli:10^60:3"])
def test_a_planned_bet_of_any_size_is_cut_to_the_bankroll(capsys, plan):
    code, out, err = run_cli(capsys, "session", PASS_LINE, *BOUNDED, "--plan", plan)
    assert code == 0, err
    assert row(out, "reach the goal").startswith(ONE_ROUND_GOAL + " |")


@pytest.mark.parametrize("plan", ["timid", "best"])
def test_a_minimum_bet_no_bankroll_covers_is_ruin_at_the_start(capsys, plan):
    code, out, err = run_cli(capsys, "session", PASS_LINE, *BOUNDED, "--min-bet", "10^60", "--plan", plan)
    assert code == 0, err
    assert row(out, "ruin") == "1 | 1 (100 %)"
    _, same, _ = run_cli(capsys, "session", PASS_LINE, *BOUNDED, "--min-bet", "1000", "--plan", plan)
    assert same.splitlines()[1:] == out.splitlines()[1:], "as with any other minimum above the bankroll"


def test_an_extra_stake_no_bankroll_covers_is_ruin_at_the_start(capsys):
    code, out, err = run_cli(capsys, "session", "--round", "1:1/2:10^60,-1:1/2", *BOUNDED, "--plan", "timid")
    assert code == 0, err
    assert row(out, "ruin") == "1 | 1 (100 %)"


def test_a_huge_win_with_bold_play_is_computed(capsys):
    # Win 10^12 or lose 1, each with chance 1/2; bold play from 100 toward 200 bets 1 each round:
    # the first win reaches the goal, a hundred losses ruin: ruin chance 2^-100 = 7.88861e-31.
    code, out, err = run_cli(capsys, "session", "--round", "10^12:1/2,-1:1/2", *BOUNDED, "--plan", "bold")
    assert code == 0, err
    assert "7.88861e-31" in out


@pytest.mark.parametrize(
    ("args", "fragment"),
    [
        (("--round", "10^50:10^-50,-1:1-10^-50", *BOUNDED), "a session handles moves up to"),
        (("--round", "10^50:10^-50,-1:1-10^-50", "--bankroll", "100", "--goal", "none"), "play with no goal handles"),
        (("--round", "1:1/2,-1:1/2", "--bankroll", "100", "--goal", "10^60"), "session goal is about 10^60 grid steps"),
        (("--round", "1:1/2,-1:1/2", *BOUNDED, "--unit", "10^-60"), "grid steps; the limit is 50,000,000"),
        ((PASS_LINE, *BOUNDED, "--floor", "10^60"), "must be below the bankroll"),
    ],
)
def test_an_amount_too_large_for_the_grid_is_one_line(capsys, args, fragment):
    code, _, err = run_cli(capsys, "session", *args)
    assert code == 2
    assert fragment in one_line(err)


def test_a_round_whose_first_result_is_a_loss_is_read_as_the_value_of_round(capsys):
    code, out, err = run_cli(capsys, "session", "--round", "-1:1/2,1:1/2", *BOUNDED, "--plan", "flat:1")
    assert code == 0, err
    assert row(out, "reach the goal") == "1/2 | 0.5 (50 %)"  # a fair game: bankroll / goal (Feller, ch. XIV)


def test_a_bad_option_is_one_line_not_the_usage_block(capsys):
    with pytest.raises(SystemExit) as ended:
        run_cli(capsys, "session", "--round")
    assert ended.value.code == 2
    line = one_line(capsys.readouterr().err)
    assert line == "oddsbench session: argument --round: expected one argument (see oddsbench session --help)"
