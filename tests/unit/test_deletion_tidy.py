"""Deleting a table or an entry leaves the file as a careful hand would: no doubled blank line, no
blank line at the end, no comment of the deleted entry left dangling above the next one, and the
next entry's own comment kept. Each test reads the saved text itself."""

from __future__ import annotations

import tomllib

import pytest

from oddsbench.model.document import RulesetDocument
from oddsbench.model.document_base import OutcomeList
from oddsbench.model.toml_tidy import tidy_removal
from tests.tui.helpers import RULESETS

HAND_WRITTEN = """\
# A hand-written game
[ruleset]
title = "t"
start = "a"

[params]
# pays
win = 2
lose = 1

[states.a]
# the first roll
outcomes = [
  # a six
  { to = "b", prob = "1/6", pay = "win" },
  # not a six
  { to = "c", prob = "5/6" },
]

# b is the second roll
[states.b]
result = "win"
# c loses
[states.c]
result = "loss"

[[states.d.outcomes]]
to = "b"
prob = "1/2"

# the other half
[[states.d.outcomes]]
to = "c"
prob = "1/2"

# plans
[strategies.one]
default = "x"

[strategies.two]
default = "y"
"""


def deleted(edit, text: str = HAND_WRITTEN) -> str:
    document = RulesetDocument.from_text(text)
    edit(document)
    return document.text()


def without(text: str, *parts: str) -> str:
    for part in parts:
        assert text.count(part) == 1, part
        text = text.replace(part, "")
    return text


def assert_tidy(text: str) -> None:
    assert "\n\n\n" not in text, "a doubled blank line"
    assert text.endswith("\n") and not text.endswith("\n\n"), "a blank line at the end of the file"
    assert not text.startswith("\n")


def test_deleting_the_last_strategy_leaves_no_blank_line_at_the_end_of_the_file():
    text = deleted(lambda doc: doc.delete_strategy("two"))
    assert text == without(HAND_WRITTEN, '\n[strategies.two]\ndefault = "y"\n')
    assert_tidy(text)


def test_deleting_a_strategy_takes_its_comment_and_one_of_the_blank_lines_around_it():
    text = deleted(lambda doc: doc.delete_strategy("one"))
    assert text == without(HAND_WRITTEN, '# plans\n[strategies.one]\ndefault = "x"\n\n')


def test_deleting_a_table_keeps_the_comment_written_above_the_next_one():
    # tomlkit reads "# c loses" as the end of [states.b]: deleting b must not take it.
    text = deleted(lambda doc: doc.delete_state("b"))
    assert text == without(HAND_WRITTEN, '# b is the second roll\n[states.b]\nresult = "win"\n')
    assert "# c loses\n[states.c]" in text


def test_deleting_a_state_leaves_no_comment_of_it_above_the_next_state():
    text = deleted(lambda doc: doc.delete_state("c"))
    assert text == without(HAND_WRITTEN, '# c loses\n[states.c]\nresult = "loss"\n')
    assert "# c loses" not in text
    assert_tidy(text)


def test_deleting_a_state_with_comments_inside_keeps_the_next_states_comment_and_one_blank_line():
    text = deleted(lambda doc: doc.delete_state("a"))
    start, end = HAND_WRITTEN.index("[states.a]"), HAND_WRITTEN.index("# b is the second roll")
    assert text == HAND_WRITTEN[:start] + HAND_WRITTEN[end:]
    assert_tidy(text)


@pytest.mark.parametrize(
    ("index", "gone"),
    [
        (0, '  # a six\n  { to = "b", prob = "1/6", pay = "win" },\n'),
        (1, '  # not a six\n  { to = "c", prob = "5/6" },\n'),
    ],
)
def test_deleting_an_outcome_row_takes_its_comment(index, gone):
    text = deleted(lambda doc: doc.delete_outcome(OutcomeList("a"), index))
    assert text == without(HAND_WRITTEN, gone)


def test_deleting_a_row_of_an_array_of_tables_keeps_the_next_rows_comment():
    text = deleted(lambda doc: doc.delete_outcome(OutcomeList("d"), 0))
    assert text == without(HAND_WRITTEN, '[[states.d.outcomes]]\nto = "b"\nprob = "1/2"\n\n')
    assert '# the other half\n[[states.d.outcomes]]\nto = "c"' in text


def test_deleting_the_last_row_of_an_array_of_tables_takes_its_comment_and_keeps_the_next_tables():
    text = deleted(lambda doc: doc.delete_outcome(OutcomeList("d"), 1))
    assert text == without(HAND_WRITTEN, '# the other half\n[[states.d.outcomes]]\nto = "c"\nprob = "1/2"\n\n')
    assert "# plans\n[strategies.one]" in text


def test_a_comment_that_heads_a_run_of_parameters_stays_while_the_run_goes_on():
    text = deleted(lambda doc: doc.delete_param("win"))
    assert text == without(HAND_WRITTEN, "win = 2\n")
    assert "[params]\n# pays\nlose = 1\n\n" in text


def test_deleting_the_last_parameter_keeps_one_blank_line_before_the_next_table():
    text = deleted(lambda doc: doc.delete_param("lose"))
    assert text == without(HAND_WRITTEN, "lose = 1\n")


@pytest.mark.parametrize("name", ["hold-at-10", "hold-at-15", "hold-at-25"])
def test_deleting_any_strategy_of_pig_leaves_the_file_as_if_it_had_never_been_written(name):
    original = (RULESETS / "pig-turn.toml").read_text(encoding="utf-8")
    text = deleted(lambda doc: doc.delete_strategy(name), original)
    threshold = name.rsplit("-", 1)[1]
    rule = f'{{ family = "turn", when = "t >= {threshold}", action = "hold" }}'
    block = f'[strategies.{name}]\ndefault = "roll"\nrules = [{rule}]\n'
    expected = original.replace("\n" + block, "") if name == "hold-at-25" else original.replace(block + "\n", "")
    assert text == expected
    assert_tidy(text)


def test_deleting_a_family_tidies_the_family_and_every_strategy_rule_that_named_it():
    original = (RULESETS / "pig-turn.toml").read_text(encoding="utf-8")
    text = deleted(lambda doc: doc.delete_family("turn"), original)
    assert "[families" not in text and "rules = " not in text and "Hold is listed first" not in text
    assert_tidy(text)
    assert '[strategies.hold-at-10]\ndefault = "roll"\n\n[strategies.hold-at-15]' in text


def test_deleting_an_action_takes_the_comment_written_above_it():
    original = (RULESETS / "pig-turn.toml").read_text(encoding="utf-8")
    text = deleted(lambda doc: doc.delete_action("turn", "hold", family=True), original)
    assert "Hold is listed first" not in text and "choices.hold" not in text
    assert 'when = "t != 1"                 # a total of 1 cannot happen\nchoices.roll = [' in text
    assert_tidy(text)


@pytest.mark.parametrize("kind", ["strategy", "state", "family"])
def test_adding_then_deleting_gives_back_the_text_byte_for_byte(kind):
    original = (RULESETS / "pig-turn.toml").read_text(encoding="utf-8")
    document = RulesetDocument.from_text(original)
    if kind == "strategy":
        document.add_strategy("careful", default="hold")
        document.delete_strategy("careful")
    elif kind == "state":
        document.add_state("bust", kind="end")
        document.delete_state("bust")
    else:
        document.add_family("spare", "spare-{n}", "n", "1", "3")
        document.delete_family("spare")
    assert document.text() == original


def test_every_entry_of_every_bundled_ruleset_deletes_tidily():
    """Each state, strategy, family and parameter of each bundled ruleset, one at a time: the text
    after is tidy wherever the file was, and reads as the same TOML less what was deleted."""
    for path in sorted(RULESETS.glob("*.toml")):
        original = path.read_text(encoding="utf-8")
        document = RulesetDocument.from_text(original)
        deletions = [("states", name, "delete_state") for name in document.state_names()]
        deletions += [("strategies", name, "delete_strategy") for name in document.strategy_names()]
        deletions += [("families", name, "delete_family") for name in document.family_names()]
        deletions += [("params", name, "delete_param") for name, _ in document.params()]
        for table, name, method in deletions:
            text = deleted(lambda doc, method=method, name=name: getattr(doc, method)(name), original)
            assert "\n\n\n" not in text or "\n\n\n" in original, (path.name, name)
            assert text.endswith("\n") and not text.endswith("\n\n"), (path.name, name)
            assert name not in tomllib.loads(text).get(table, {}), (path.name, name)


def test_tidying_never_changes_a_value():
    # Blank lines inside a multi-line string are the string's own: the tidy keeps them.
    before = 'a = 1\n\nb = """\nx\n\n"""\n\nc = 2\n'
    after = 'a = 1\n\nb = """\nx\n\n"""\n\n'
    assert tidy_removal(before, after) == 'a = 1\n\nb = """\nx\n\n"""\n'
    assert tomllib.loads(tidy_removal(before, after)) == tomllib.loads(after)


def test_the_file_keeps_its_own_line_endings_and_spacing_elsewhere():
    before = "a = 1\r\n\r\n\r\nb = 2\r\n\r\nc = 3\r\n\r\nd = 4\r\n"
    after = "a = 1\r\n\r\n\r\nb = 2\r\n\r\n\r\nd = 4\r\n"
    assert tidy_removal(before, after) == "a = 1\r\n\r\n\r\nb = 2\r\n\r\nd = 4\r\n"


def test_a_line_rewritten_rather_than_removed_is_left_as_it_is():
    # Deleting the last row of a one-line array rewrites the line: no blank line is touched.
    before = "a = [1, 2]\n\n\nb = 1\n"
    after = "a = [1]\n\n\nb = 1\n"
    assert tidy_removal(before, after) == after


def test_deletions_far_apart_in_a_long_file_are_each_tidied():
    states = "".join(f'# state {i}\n[states.s{i}]\nresult = "win"\n\n' for i in range(400))
    strategies = '[strategies.plan]\ndefault = "x"\n# about s200\ns200 = "y"\n'
    text = deleted(lambda doc: doc.delete_state("s200"), '[ruleset]\nstart = "s0"\n\n' + states + strategies)
    assert "# state 200\n" not in text and "s200" not in text and "# about s200" not in text
    assert '# state 199\n[states.s199]\nresult = "win"\n\n# state 201\n' in text
    assert_tidy(text)
