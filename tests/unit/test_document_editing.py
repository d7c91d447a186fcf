"""Editing a ruleset's TOML keeps the user's comments, order and layout; saving is atomic."""

from __future__ import annotations

import stat
from pathlib import Path

import pytest

from oddsbench.model.atomic_write import write_text_atomically
from oddsbench.model.document import DocumentError, OutcomeList, RulesetDocument
from oddsbench.model.errors import OddsbenchError
from oddsbench.model.history import History
from oddsbench.model.load import read_ruleset_text
from oddsbench.model.places import Place, place_of

ROOT = Path(__file__).resolve().parents[2]
PASS_LINE = (ROOT / "rulesets" / "pass-line.toml").read_text()


def changed_lines(before: str, after: str) -> list[tuple[str, str]]:
    return [(a, b) for a, b in zip(before.splitlines(), after.splitlines()) if a != b]


def test_setting_a_probability_changes_only_that_value():
    document = RulesetDocument.from_text(PASS_LINE)
    document.set_outcome(OutcomeList("come-out"), 0, "prob", "9/36")
    after = document.text()
    assert changed_lines(PASS_LINE, after) == [
        (
            '  { to = "won",      prob = "8/36", pay = 1,  note = "7 or 11" },',
            '  { to = "won",      prob = "9/36", pay = 1,  note = "7 or 11" },',
        )
    ]


def test_whole_numbers_stay_integers_and_expressions_become_strings():
    document = RulesetDocument.from_text(PASS_LINE)
    where = OutcomeList("come-out")
    document.set_outcome(where, 0, "pay", "2")
    document.set_outcome(where, 1, "pay", "-3/2")
    assert "pay = 2," in document.text()
    assert 'pay = "-3/2"' in document.text()
    assert document.outcomes(where)[0]["pay"] == "2"


def test_an_emptied_optional_field_is_removed():
    document = RulesetDocument.from_text(PASS_LINE)
    document.set_outcome(OutcomeList("come-out"), 1, "note", "")
    assert '{ to = "lost", prob = "4/36", pay = -1 }' in document.text()


def test_renaming_a_state_renames_its_header_references_and_start_keeping_comments():
    text = PASS_LINE.replace("[states.point-4]", "# four is the hardest point\n[states.point-4]  # four")
    document = RulesetDocument.from_text(text)
    assert document.rename_state("point-4", "four") == 3  # the table, one target in come-out, one in itself
    document.rename_state("come-out", "first roll")
    after = document.text()
    assert "# four is the hardest point\n[states.four]  # four" in after
    assert '[states."first roll"]' in after and 'start = "first roll"' in after
    assert "point-4" not in after
    assert read_ruleset_text(after, "x").ruleset is not None


def test_renaming_onto_an_existing_state_is_refused():
    document = RulesetDocument.from_text(PASS_LINE)
    with pytest.raises(DocumentError, match="already exists"):
        document.rename_state("won", "lost")


def test_added_states_and_outcomes_read_back_as_a_valid_game():
    document = RulesetDocument.from_text(PASS_LINE)
    document.add_state("bonus")
    where = OutcomeList("bonus")
    document.add_outcome(where, to="won")
    document.add_outcome(where, to="lost")
    document.set_outcome(OutcomeList("come-out"), 1, "prob", "3/36")
    document.add_outcome(OutcomeList("come-out"), after=1, to="bonus")
    document.set_outcome(OutcomeList("come-out"), 2, "prob", "1/36")
    result = read_ruleset_text(document.text(), "x")
    assert result.ruleset is not None, [str(p) for p in result.problems]
    # the first outcome of a list takes all the chance; one added beside it has chance 0 until given one
    assert [outcome.prob for outcome in result.ruleset.state("bonus").outcomes] == [1, 0]


def test_a_new_outcome_goes_nowhere_until_a_target_is_typed_and_changes_no_chance():
    document = RulesetDocument.from_text(PASS_LINE)
    where = OutcomeList("come-out")
    added = document.add_outcome(where, after=0)
    assert added == 1
    assert document.outcomes(where)[1].fields["to"] == "" and document.outcomes(where)[1].fields["prob"] == "0"
    problems = [p for p in read_ruleset_text(document.text(), "x").problems if p.is_error]
    assert problems and all("outcome 2" in p.where for p in problems)  # flagged beside the new outcome only
    document.set_outcome(where, 1, "to", "won")
    assert read_ruleset_text(document.text(), "x").ruleset is not None


def test_deleting_and_moving_outcomes():
    document = RulesetDocument.from_text(PASS_LINE)
    where = OutcomeList("come-out")
    assert document.move_outcome(where, 0, 1) == 1
    assert [row["to"] for row in document.outcomes(where)][:2] == ["lost", "won"]
    document.delete_outcome(where, 0)
    assert [row["to"] for row in document.outcomes(where)][0] == "won"


def test_params_and_session_are_added_as_tables():
    document = RulesetDocument.from_text(PASS_LINE)
    document.add_param("p", "1/3")
    document.set_session("bankroll", "100")
    assert document.params() == [("p", "1/3")]
    assert document.session() == [("bankroll", "100")]
    assert read_ruleset_text(document.text(), "x").ruleset is not None


def test_history_merges_keystrokes_in_one_field_into_one_step():
    history = History("a")
    history.record("ab", "typing", field="note")
    history.record("abc", "typing", field="note")
    history.record("abcX", "other", field="prob")
    assert history.undo().text == "abcX"
    assert history.current == "abc"
    history.undo()
    assert history.current == "a"
    assert history.redo().text == "abc"


def test_a_new_edit_after_undo_drops_the_redo_branch():
    history = History("a")
    history.record("b", "one")
    history.undo()
    history.record("c", "two")
    assert not history.can_redo and history.current == "c"


def test_atomic_write_replaces_the_file_and_keeps_its_mode(tmp_path):
    target = tmp_path / "game.toml"
    target.write_text("old")
    target.chmod(0o640)
    write_text_atomically(target, "new")
    assert target.read_text() == "new"
    assert stat.S_IMODE(target.stat().st_mode) == 0o640
    assert [p.name for p in tmp_path.iterdir()] == ["game.toml"]


def test_atomic_write_to_a_missing_folder_is_one_clear_error(tmp_path):
    with pytest.raises(OddsbenchError, match="does not exist"):
        write_text_atomically(tmp_path / "no" / "game.toml", "x")


def test_a_save_keeps_the_files_permission_bits(tmp_path):
    # A failed save is covered in test_atomic_write.py (the move fails, the old file stays whole).
    target = tmp_path / "game.toml"
    target.write_text("old")
    target.chmod(0o640)
    write_text_atomically(target, "new")
    assert (target.read_text(), target.stat().st_mode & 0o777) == ("new", 0o640)


def test_places_of_the_readers_own_problems():
    bad_prob = PASS_LINE.replace('prob = "3/36" }', 'prob = "2" }', 1)
    assert Place("states", state="come-out", outcome=2, field="prob") in {
        place_of(p) for p in read_ruleset_text(bad_prob, "x").problems
    }
    bad_start = PASS_LINE.replace('start = "come-out"', 'start = "nowhere"')
    assert Place("ruleset", field="start") in {place_of(p) for p in read_ruleset_text(bad_start, "x").problems}
    bad_sum = PASS_LINE.replace('prob = "27/36"', 'prob = "26/36"')
    assert Place("states", state="point-4") in {place_of(p) for p in read_ruleset_text(bad_sum, "x").problems}
