"""Play with no goal as the user sees it: text with exact beside decimal, bound, approximation, cautions."""

from __future__ import annotations

import pytest

from oddsbench.core import inline_round, make_settings, sessions
from oddsbench.model.defaults import is_no_goal
from oddsbench.model.errors import OddsbenchError
from oddsbench.model.numbers import QQ
from oddsbench.report.cautions import CAUTIONS
from oddsbench.report.session_report import session_json, session_text
from oddsbench.strategy.plans import parse_plan

EVEN_51 = "1:51/100,-1:49/100"


def run_no_goal(round_text: str, bankroll, bet, as_json: bool = False):
    """What ``oddsbench session --round ROUND --bankroll B --goal none --plan flat:BET`` prints (or its JSON)."""
    settings = make_settings(bankroll=str(bankroll), goal="none", plans=[f"flat:{bet}"])
    results = sessions(inline_round(round_text), settings)
    if as_json:
        return session_json(results)
    print(session_text(results))


def test_favourable_even_money_text_shows_exact_power_decimal_bound_and_approximation(capsys):
    run_no_goal(EVEN_51, 20, QQ(1))
    out = capsys.readouterr().out
    assert "(49/51)^20" in out
    assert "0.44928102674559246400" in out  # (49/51)^20, 20 digits (checked with mpmath in the engine tests)
    assert "Lundberg upper bound" in out
    assert "diffusion approximation" in out and "approximation, not a bound" in out
    assert "exp(-2000/2499)" in out
    for caution in CAUTIONS:
        assert caution in out


def test_subfair_text_says_ruin_is_certain_with_the_reason(capsys):
    run_no_goal("1:18/37,-1:19/37", 20, QQ(1))
    out = capsys.readouterr().out
    assert "Ruin is certain: probability exactly 1" in out
    assert "-1/37" in out and "(< 0)" in out
    assert "740" in out


def test_json_carries_exact_decimal_bound_and_cautions():
    document = run_no_goal(EVEN_51, 20, QQ(1), as_json=True)
    body = document["plans"][0]
    assert body["goal"] == "none" and body["verdict"] == "possible"
    assert body["ruin"]["closed_form"] == "(49/51)^20"
    assert body["ruin"]["exact"] == "6366805760909027985741435139224001/14171098670753043575626125424226001"
    assert body["diffusion_approximation"]["exponent"] == "-2000/2499"
    assert document["cautions"] == list(CAUTIONS)


@pytest.mark.parametrize("word", ["none", "None", " NONE "])
def test_goal_none_is_recognised(word):
    assert is_no_goal(word)


def test_a_numeric_goal_is_not_no_goal():
    assert not is_no_goal(100) and not is_no_goal("100")


def test_flat_and_timid_plans_give_bounded_bets():
    flat, timid = parse_plan("flat:2", no_goal=True), parse_plan("timid", no_goal=True)
    assert (flat.kind, flat.amount) == ("flat", 2) and (timid.kind, timid.amount) == ("timid", None)


@pytest.mark.parametrize("no_goal", [False, True])
def test_timid_takes_no_value_with_the_same_line_with_a_goal_and_without(no_goal):
    # timid always bets the table minimum; the minimum is a setting (--min-bet), not part of the plan
    with pytest.raises(OddsbenchError) as refused:
        parse_plan("timid:1/2", no_goal=no_goal)
    assert str(refused.value) == (
        "plan 'timid:1/2': timid takes no value: it always bets the table minimum "
        "(set that as the session's min_bet, or use flat:B for a fixed bet of B)"
    )


@pytest.mark.parametrize("plan", ["bold", "fraction:1/10", "kelly", "best"])
def test_plans_without_a_bounded_bet_are_refused_with_one_line(plan):
    with pytest.raises(OddsbenchError, match="bet must stay bounded"):
        parse_plan(plan, no_goal=True)


def test_huge_bankrolls_print_without_writing_out_giant_fractions(capsys):
    # (49/51)^5000 has about 8,500 digits per part: beyond Python's 4,300-digit str limit
    run_no_goal(EVEN_51, 5000, QQ(1))
    closed_form = run_no_goal(EVEN_51, 10**6 + 1, QQ(2), as_json=True)["plans"][0]["ruin"]["closed_form"]
    out = capsys.readouterr().out
    assert "(49/51)^5000" in out and "49/50 x (49/51)^500000" in closed_form


def test_cut_bet_closed_form_is_exact(capsys):
    # bankroll 5, bet 2, even money 51/49: at 1 the bet is cut to 1, so psi(1) = 49/100 + 51/100 x 49/51
    run_no_goal(EVEN_51, 5, QQ(2))
    out = capsys.readouterr().out
    assert "49/50 x (49/51)^2" in out and "cut to what the bankroll covers" in out
