"""The document edits behind the workbench's forms: actions, kinds of state, strategies and their
rules, families and the parts of an outcome (``each``, ``let``, cases).

Every edit keeps the user's comments and order, leaves a file that reads as a ruleset (or, for an
edit that adds a blank to fill in, one the check flags by name), and undo/redo give back the text
byte for byte. The coin game is invented for these tests; Pig is a public dice game.
"""

from __future__ import annotations

from pathlib import Path

import pytest

from oddsbench.model.document import DocumentError, OutcomeList, RulesetDocument
from oddsbench.model.history import History
from oddsbench.model.load import read_ruleset_text

ROOT = Path(__file__).resolve().parents[2]
PIG = (ROOT / "rulesets" / "pig-turn.toml").read_text()

COIN = """\
# A coin with a second chance (invented for these tests).
[ruleset]
title = "Coin with a second chance"
start = "first"

[states.first]   # the first toss
outcomes = [
  { to = "won",   prob = "1/2", pay = 1 },   # heads
  { to = "offer", prob = "1/2" },            # tails: the offer
]

# the player decides here
[states.offer.choices]
accept = [{ to = "won", prob = "1/3", pay = 1 }, { to = "lost", pay = -1 }]
refuse = [{ to = "lost", pay = -1 }]

[states.won]
result = "win"

[states.lost]
result = "loss"

[strategies.eager]   # always accepts
offer = "accept"

[strategies.careful]
offer = "refuse"
"""
COMMENTS = ("# A coin with a second chance", "# the first toss", "# heads", "# tails: the offer", "# always accepts")


def edited(text: str, edit) -> str:
    """Apply ``edit`` to the document of ``text``; check comments survive and undo/redo restore the text."""
    document = RulesetDocument.from_text(text)
    edit(document)
    after = document.text()
    for line in text.splitlines():
        if line.lstrip().startswith("#"):
            assert line in after, f"comment lost: {line!r}"
    history = History(text)
    history.record(after, "an edit")
    history.undo()
    assert history.current == text
    history.redo()
    assert history.current == after
    return after


def ruleset_of(text: str):
    result = read_ruleset_text(text, "coin.toml")
    assert result.ruleset is not None, [problem.message for problem in result.problems]
    return result.ruleset


def errors_of(text: str) -> list[str]:
    return [problem.message for problem in read_ruleset_text(text, "coin.toml").errors]


def outcomes(ruleset, state: str, action: str | None = None) -> list[tuple[str, str, str]]:
    found = ruleset.state(state)
    listed = dict(found.choices)[action] if action else found.outcomes
    return [(o.to, str(o.prob), str(o.pay)) for o in listed]


def test_the_coin_game_reads_with_its_comments():
    assert ruleset_of(COIN).state("offer").actions == ("accept", "refuse")
    assert all(comment in COIN for comment in COMMENTS)


# ----- actions -----


def test_a_new_action_has_one_outcome_to_fill_in_and_reads_once_it_is_filled():
    where = OutcomeList("offer", "double")
    blank = edited(COIN, lambda doc: doc.add_action("offer", "double"))
    assert "double" in blank and errors_of(blank)  # an outcome that goes nowhere yet is flagged

    def fill(doc):
        doc.add_action("offer", "double")
        doc.set_outcome(where, 0, "to", "won")
        doc.set_outcome(where, 0, "prob", "1/2")
        doc.set_outcome(where, 0, "pay", "2")
        doc.add_outcome(where, to="lost")
        doc.set_outcome(where, 1, "prob", "1/2")
        doc.set_outcome(where, 1, "pay", "-1")

    ruleset = ruleset_of(edited(COIN, fill))
    assert ruleset.state("offer").actions == ("accept", "refuse", "double")
    assert outcomes(ruleset, "offer", "double") == [("won", "1/2", "2"), ("lost", "1/2", "-1")]


def test_an_action_name_taken_or_blank_is_refused():
    document = RulesetDocument.from_text(COIN)
    with pytest.raises(DocumentError, match="already an action 'refuse'"):
        document.add_action("offer", "refuse")
    with pytest.raises(DocumentError, match="must not be blank"):
        document.add_action("offer", "  ")
    assert document.text() == COIN


def test_renaming_an_action_renames_the_strategy_entries_that_choose_it():
    document = RulesetDocument.from_text(COIN)
    assert document.rename_action("offer", "refuse", "decline") == 1
    after = edited(COIN, lambda doc: doc.rename_action("offer", "refuse", "decline"))
    assert after == document.text()
    ruleset = ruleset_of(after)
    assert ruleset.state("offer").actions == ("accept", "decline")
    assert ruleset.strategy("careful").action_for(ruleset.state("offer")) == "decline"
    assert outcomes(ruleset, "offer", "decline") == [("lost", "1", "-1")]


def test_deleting_an_action_drops_its_outcomes_and_the_entries_that_chose_it():
    after = edited(COIN, lambda doc: doc.delete_action("offer", "accept"))
    assert '"accept"' not in after and "accept =" not in after
    assert "[strategies.eager]   # always accepts" in after
    # the strategy that chose it now has no word for the state: the check says so, by name
    assert errors_of(after) == ["no action and no default for decision state(s) 'offer'"]
    document = RulesetDocument.from_text(after)
    document.set_strategy_action("eager", "offer", "refuse")
    ruleset = ruleset_of(document.text())
    assert ruleset.state("offer").actions == ("refuse",)
    assert ruleset.strategy("eager").action_for(ruleset.state("offer")) == "refuse"


def test_the_last_action_cannot_be_deleted():
    document = RulesetDocument.from_text(COIN)
    document.delete_action("offer", "accept")
    with pytest.raises(DocumentError, match="a decision needs an action"):
        document.delete_action("offer", "refuse")


def test_moving_an_action_changes_only_the_order():
    after = edited(COIN, lambda doc: doc.move_action("offer", "refuse", -1))
    assert ruleset_of(after).state("offer").actions == ("refuse", "accept")
    document = RulesetDocument.from_text(COIN)
    assert document.move_action("offer", "accept", -1) is False  # already first
    assert document.text() == COIN


# ----- kinds of state -----


def test_plain_outcomes_become_one_action_and_back():
    decided = edited(COIN, lambda doc: doc.make_decision("first", "toss"))
    ruleset = ruleset_of(decided)
    assert ruleset.state("first").actions == ("toss",)
    assert {s.name: s.action_for(ruleset.state("first")) for s in ruleset.strategies} == {
        "eager": "toss",  # every strategy chooses the one action: each stays complete
        "careful": "toss",
    }
    assert outcomes(ruleset, "first", "toss") == [("won", "1/2", "1"), ("offer", "1/2", "0")]
    document = RulesetDocument.from_text(decided)
    assert document.make_plain("first") == 2  # the entries written go again
    back = ruleset_of(document.text())
    assert outcomes(back, "first") == outcomes(ruleset_of(COIN), "first")
    assert "# the first toss" in document.text()


def test_a_decision_of_two_actions_is_not_made_plain():
    document = RulesetDocument.from_text(COIN)
    with pytest.raises(DocumentError, match="between 2 actions"):
        document.make_plain("offer")
    with pytest.raises(DocumentError, match="a decision already"):
        document.make_decision("offer", "x")
    assert document.text() == COIN


def test_a_decision_made_plain_drops_the_strategy_entries_that_named_it():
    def edit(doc):
        doc.delete_action("offer", "refuse")
        assert doc.make_plain("offer") == 1  # eager's entry (careful's went with refuse)
        assert "offer" not in dict(doc.strategy_entries("careful"))

    ruleset = ruleset_of(edited(COIN, edit))
    assert not ruleset.state("offer").is_decision
    assert outcomes(ruleset, "offer") == [("won", "1/3", "1"), ("lost", "2/3", "-1")]


def test_an_end_state_turned_plain_or_a_decision_gets_an_outcome_to_fill_in():
    document = RulesetDocument.from_text(COIN)
    document.make_plain("won")
    assert document.state_kind("won") == "outcomes" and document.state_result("won") == ""
    assert [row["to"] for row in document.outcomes(OutcomeList("won"))] == [""]
    document = RulesetDocument.from_text(COIN)
    document.make_decision("lost", "again")
    assert document.state_kind("lost") == "choices" and document.actions("lost") == ["again"]


def test_a_state_made_an_end_loses_its_outcomes_and_entries():
    document = RulesetDocument.from_text(COIN)
    assert document.make_end("offer") == 2
    document.set_state_result("offer", "push")
    ruleset = ruleset_of(document.text())
    assert ruleset.state("offer").is_end and ruleset.state("offer").result == "push"


def test_new_states_of_each_kind():
    def edit(doc):
        doc.add_state("bonus", "choices", ("take", "leave"))
        doc.add_state("tie", "end")
        doc.add_state("spin")

    document = RulesetDocument.from_text(edited(COIN, edit))
    assert [document.state_kind(name) for name in ("bonus", "tie", "spin")] == ["choices", "end", "outcomes"]
    assert document.actions("bonus") == ["take", "leave"]
    assert document.state_result("tie") == "win"
    with pytest.raises(DocumentError, match="two actions with one name"):
        document.add_state("twice", "choices", ("a", "a"))


# ----- references -----


def test_references_to_a_state_are_named_in_words():
    document = RulesetDocument.from_text(COIN)
    assert document.state_references("offer") == ["state 'first', outcome 2", "strategy 'eager'", "strategy 'careful'"]
    assert document.state_references("first") == ["the round's start"]
    assert document.state_references("lost") == [
        "state 'offer', choice 'accept', outcome 2",
        "state 'offer', choice 'refuse', outcome 1",
    ]


def test_deleting_a_state_drops_its_strategy_entries():
    document = RulesetDocument.from_text(COIN)
    assert document.delete_state("offer") == 2
    assert "offer =" not in document.text()


# ----- strategies -----


def test_a_strategy_copied_renamed_and_deleted():
    def edit(doc):
        doc.add_strategy("daring", copy_of="careful")
        doc.set_strategy_action("daring", "offer", "accept")
        doc.rename_strategy("eager", "keen")
        doc.delete_strategy("careful")

    after = edited(COIN, edit)
    ruleset = ruleset_of(after)
    assert [strategy.name for strategy in ruleset.strategies] == ["keen", "daring"]
    assert ruleset.strategy("daring").action_for(ruleset.state("offer")) == "accept"
    assert "[strategies.keen]   # always accepts" in after


def test_a_strategy_with_a_default_and_an_entry_removed_by_emptying_it():
    def edit(doc):
        doc.add_strategy("plain", default="refuse")
        doc.set_strategy_action("eager", "offer", "")
        doc.set_strategy_action("eager", "default", "refuse")

    ruleset = ruleset_of(edited(COIN, edit))
    assert ruleset.strategy("plain").default == "refuse"
    assert dict(RulesetDocument.from_text(edited(COIN, edit)).strategy_entries("eager")) == {"default": "refuse"}


def test_strategy_names_taken_or_rules_as_a_state_are_refused():
    document = RulesetDocument.from_text(COIN)
    with pytest.raises(DocumentError, match="already exists"):
        document.add_strategy("eager")
    with pytest.raises(DocumentError, match="already exists"):
        document.rename_strategy("eager", "careful")
    with pytest.raises(DocumentError, match="not a state"):
        document.set_strategy_action("eager", "rules", "x")
    with pytest.raises(DocumentError, match="no strategy named 'bold'"):
        document.delete_strategy("bold")
    assert document.text() == COIN


def test_rules_over_a_family_are_added_edited_moved_and_deleted_in_order():
    def edit(doc):
        assert doc.add_strategy_rule("hold-at-20", "turn", "hold") == 1
        doc.set_strategy_rule("hold-at-20", 1, "when", "t >= 5 and t < 8")
        doc.set_strategy_rule("hold-at-20", 0, "action", "roll")
        assert doc.move_strategy_rule("hold-at-20", 1, -1) == 0

    after = edited(PIG, edit)
    document = RulesetDocument.from_text(after)
    assert document.strategy_rules("hold-at-20") == [
        {"family": "turn", "when": "t >= 5 and t < 8", "action": "hold"},
        {"family": "turn", "when": "t >= 20", "action": "roll"},
    ]
    ruleset = read_ruleset_text(after, "pig-turn.toml").ruleset
    strategy = ruleset.strategy("hold-at-20")
    assert [strategy.action_for(ruleset.state(f"turn-{t}")) for t in (4, 6, 20)] == ["roll", "hold", "roll"]
    document.delete_strategy_rule("hold-at-20", 0)
    document.delete_strategy_rule("hold-at-20", 0)
    assert "rules" not in dict(document.strategy_entries("hold-at-20"))
    assert document.strategy_rules("hold-at-20") == []
    with pytest.raises(DocumentError, match="no rule 1"):
        document.delete_strategy_rule("hold-at-20", 0)


# ----- families -----


def test_a_family_renamed_takes_its_rules_along_and_a_deleted_one_takes_them_away():
    document = RulesetDocument.from_text(PIG)
    assert document.family_references("turn") == [f"strategy 'hold-at-{n}', rule 1" for n in (10, 15, 20, 25)]
    assert document.rename_family("turn", "total") == 4
    assert document.strategy_rules("hold-at-10")[0]["family"] == "total"
    assert read_ruleset_text(document.text(), "pig-turn.toml").ruleset is not None
    assert document.delete_family("total") == 4
    assert all(document.strategy_rules(name) == [] for name in document.strategy_names())


def test_a_new_family_expands_to_its_members_once_its_outcome_has_a_target():
    def edit(doc):
        doc.add_family("ladder", variable="k", low="1", high="3")
        doc.set_outcome(OutcomeList("ladder", family=True), 0, "to", "won")

    after = edited(COIN, edit)
    result = read_ruleset_text(after, "coin.toml")
    assert result.ruleset is not None
    assert sorted(name for name, member in result.members.items() if member.family == "ladder") == [
        "ladder-1",
        "ladder-2",
        "ladder-3",
    ]
    assert RulesetDocument.from_text(after).family_part("ladder", "index") == (("k", "1", "3"),)


def test_a_familys_index_range_and_fields_edited_in_place():
    def edit(doc):
        doc.set_family_part("turn", "index", 0, "to", "120")
        doc.set_family_field("turn", "about", "every turn total")

    after = edited(PIG, edit)
    assert "index = { t = [0, 120] }" in after
    assert 'when = "t != 1"                 # a total of 1 cannot happen' in after
    result = read_ruleset_text(after, "pig-turn.toml")
    assert result.ruleset is not None
    assert len([m for m in result.members.values() if m.family == "turn"]) == 120  # 0..120 without 1
    with pytest.raises(DocumentError, match="unknown family field"):
        RulesetDocument.from_text(PIG).set_family_field("turn", "colour", "red")


def test_let_values_of_a_family_added_named_and_removed():
    document = RulesetDocument.from_text(PIG)
    assert document.add_family_part("turn", "let") == 0
    document.set_family_part("turn", "let", 0, "name", "bank")
    document.set_family_part("turn", "let", 0, "value", "t + 0")
    assert document.family_part("turn", "let") == (("bank", "t + 0"),)
    assert read_ruleset_text(document.text(), "pig-turn.toml").ruleset is not None
    document.delete_family_part("turn", "let", 0)
    assert "let" not in document.text().split("[states.held]")[0]
    with pytest.raises(DocumentError, match="needs an index variable"):
        document.delete_family_part("turn", "index", 0)


# ----- parts of an outcome -----


def test_a_first_case_keeps_the_old_target_as_the_last_case_and_deleting_it_restores_a_plain_target():
    where = OutcomeList("first")
    document = RulesetDocument.from_text(COIN)
    assert document.add_outcome_part(where, 1, "cases") == 0
    assert document.outcomes(where)[1].cases == (("", ""), ("", "offer"))
    document.set_outcome_part(where, 1, "cases", 0, "when", "1 == 0")
    document.set_outcome_part(where, 1, "cases", 0, "to", "lost")
    ruleset_of(document.text())  # the cases read as a ruleset
    assert document.outcomes(where)[1].cases == (("1 == 0", "lost"), ("", "offer"))
    document.delete_outcome_part(where, 1, "cases", 0)
    assert document.outcomes(where)[1]["to"] == "offer" and document.outcomes(where)[1].cases == ()
    assert outcomes(ruleset_of(document.text()), "first") == outcomes(ruleset_of(COIN), "first")


def test_each_and_let_in_a_family_outcome():
    where = OutcomeList("turn", "roll", family=True)
    document = RulesetDocument.from_text(PIG)
    assert document.outcomes(where)[1].each == (("f", "2", "6"),)
    assert document.add_outcome_part(where, 1, "let") == 0
    row = document.outcomes(where)[1]
    assert row.lets[0][0] not in {"f", "t"}  # a free name, not the outcome's own variable
    document.set_outcome_part(where, 1, "let", 0, "name", "next")
    document.set_outcome_part(where, 1, "let", 0, "value", "t + f")
    document.set_outcome(where, 1, "to", "turn-{next}")
    assert read_ruleset_text(document.text(), "pig-turn.toml").ruleset is not None
    assert document.move_outcome_part(where, 1, "each", 0, 1) == 0  # one row: it stays
    document.delete_outcome_part(where, 1, "let", 0)
    assert document.outcomes(where)[1].lets == ()
