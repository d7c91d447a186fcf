"""Deck games refused while the deal is expanded: the file reads well, but some hand breaks a rule.

Each case goes through the real command line (``check``; one also through ``solve``, which deals the
same way): exit 2, exactly one line on
stderr naming the file, the state (with the hands held where they matter) and the reason, never a
traceback, within the time bound. Misuse the reader already catches is in the table of ``cases/``.
"""

from __future__ import annotations

import pytest

from tests.hostile.test_hostile_cli import assert_handled, run_cli

HEAD = '[ruleset]\ntitle = "hostile"\nstart = "deal"\n'

CASES = {
    "no-case-fits": (
        HEAD
        + "[deck]\nitems = { red = 1, blue = 1 }\n[states.deal]\ndraw = 1\n"
        + 'outcomes = [{ when = "count(hand, red) == 1", to = "done" }]\n[states.done]\n',
        "oddsbench: cards.toml: state 'deal': no outcome's 'when' holds (with hand: 1 blue) "
        "(end the list with an outcome without 'when')",
    ),
    "drawing-past-the-end": (
        HEAD
        + "[deck]\nitems = { red = 2 }\n[states.deal]\ndraw = 1\n"
        + 'outcomes = [{ when = "cards(hand) == 3", to = "done" }, { to = "deal" }]\n[states.done]\n',
        "oddsbench: cards.toml: state 'deal [hand: 2 red]': draws 1 item(s), but only 0 are left",
    ),
    "division-by-a-count": (
        HEAD
        + "[deck]\nitems = { red = 1, blue = 1 }\n[states.deal]\ndraw = 1\n"
        + 'outcomes = [{ to = "done", pay = "1 / count(hand, red)" }]\n[states.done]\n',
        "oddsbench: cards.toml: state 'deal', outcome 1: division by zero (with hand: 1 blue)",
    ),
    "too-many-hands": (
        HEAD
        + '[deck]\n[states.deal]\ndraw = 5\noutcomes = [{ to = "look" }]\n'
        + '[states.look]\noutcomes = [{ when = "flush(hand)", to = "done" }, { to = "done" }]\n[states.done]\n',
        "oddsbench: cards.toml: dealing the round looks at more than 500,000 hands (the limit), "
        "at state 'deal' (drawing 5 of 52)",
    ),
    "strategy-offers-nothing": (
        HEAD
        + '[deck]\nitems = { red = 1, blue = 1 }\n[states.deal]\ndraw = 1\noutcomes = [{ to = "pick" }]\n'
        + '[states.pick.choices]\nkeep = [{ when = "count(hand, red) == 1", to = "done" }]\n'
        + 'swap = [{ to = "done" }]\n[states.done]\n'
        + '[strategies.keeper]\npick = "keep"\n',
        "oddsbench: cards.toml: strategy 'keeper': no action it names is offered at 'pick [hand: 1 blue]' "
        "(offered: swap)",
    ),
}


@pytest.mark.parametrize(("case", "command"), [(case, "check") for case in sorted(CASES)] + [("no-case-fits", "solve")])
def test_a_hand_that_breaks_a_rule_is_one_line(case, command, tmp_path):
    text, line = CASES[case]
    path = tmp_path / "cards.toml"
    path.write_text(text, encoding="utf-8")
    result = run_cli(command, str(path), cwd=tmp_path)
    assert_handled(result, 2, tmp_path)
    assert result.stderr.splitlines() == [line]


def test_the_state_limit_refuses_a_large_deal_in_one_line(tmp_path):
    path = tmp_path / "cards.toml"
    text = HEAD + '[deck]\n[states.deal]\ndraw = 2\noutcomes = [{ to = "look" }]\n'
    text += '[states.look]\noutcomes = [{ when = "flush(hand)", to = "done" }, { to = "done" }]\n[states.done]\n'
    path.write_text(text, encoding="utf-8")
    for command in ("check", "solve"):
        result = run_cli(command, str(path), "--max-states", "100", cwd=tmp_path)
        assert_handled(result, 2, tmp_path)
        assert result.stderr.splitlines() == [
            "oddsbench: cards.toml: dealing the round from 'deal' reaches more than 100 states, over the state "
            "limit (raise it with --max-states)"
        ]
