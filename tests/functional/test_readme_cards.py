"""The README's card side bet, as a new user would copy it: check it, solve it, see the hands.

The figures are worked out by hand in the README (first principles: of the 207 cards left after the
first, 3 are the same card, 12 more the same rank, 48 more the same suit)."""

from __future__ import annotations

import re

from conftest import ROOT, run_cli


def readme_side_bet() -> str:
    text = (ROOT / "README.md").read_text(encoding="utf-8")
    section = text[text.index("### A card side bet of your own") :]
    return re.search(r"```toml\n(.*?)```", section, re.S).group(1)


def test_the_readme_side_bet_checks_and_is_dealt(capsys, tmp_path):
    path = tmp_path / "two-card-match.toml"
    path.write_text(readme_side_bet(), encoding="utf-8")
    code, out, err = run_cli(capsys, "check", path)
    assert (code, err) == (0, "")
    assert out.strip() == (
        "two-card-match.toml: valid: 5 states, 4 end states; dealt from 208 cards (13 ranks x 4 suits): "
        "1 state from 'deal'"
    )


def test_the_readme_side_bet_solves_to_the_figures_shown(capsys, tmp_path):
    path = tmp_path / "two-card-match.toml"
    path.write_text(readme_side_bet(), encoding="utf-8")
    code, out, _ = run_cli(capsys, "solve", path)
    assert code == 0
    shown = (ROOT / "README.md").read_text(encoding="utf-8")
    for line in out.splitlines():
        if line.startswith(("house edge", "ends in", "hands of", "  hands ending")):
            assert line in shown, line
    assert "4/69" in out and "312 of 21,528" in out


def test_solve_json_counts_hands_as_exact_text(capsys, tmp_path):
    import json

    path = tmp_path / "two-card-match.toml"
    path.write_text(readme_side_bet(), encoding="utf-8")
    code, out, _ = run_cli(capsys, "solve", path, "--json")
    assert code == 0
    hands = json.loads(out)["results"][0]["hands"]
    assert hands == {
        "count": 2,
        "size": 208,
        "kind": "card",
        "total": "21528",
        "per_end": {"suited-pair": "312", "pair": "1248", "suited": "4992", "no-match": "14976"},
    }


def test_deck_games_run_through_every_command(capsys, tmp_path):
    pair = ROOT / "rulesets" / "pair-side-bet-six-decks.toml"
    code, out, _ = run_cli(capsys, "session", pair, "--bankroll", "10", "--goal", "20", "--plan", "flat:1")
    assert code == 0 and "-1:288/311, 12:23/311" in out
    code, out, _ = run_cli(capsys, "simulate", pair, "--trials", "20000", "--seed", "7")
    assert code == 0 and "23/311" in out
    code, out, _ = run_cli(capsys, "report", pair, "--format", "md")
    assert code == 0 and "| deck | 312 cards (13 ranks x 4 suits) |" in out
    dealer = ROOT / "rulesets" / "dealer-six-decks-stands-soft-17.toml"
    code, out, _ = run_cli(capsys, "solve", dealer, "--from", "up-6")
    assert code == 0 and "4889207690384513/11562740373574775" in out


def test_deck_game_json_validates_against_the_schemas(capsys):
    import json

    from jsonschema import Draft202012Validator

    from oddsbench.schemas import schema

    three = ROOT / "rulesets" / "three-card-hands.toml"
    for command, args in (("solve", ["--json"]), ("report", ["--format", "json"])):
        code, out, _ = run_cli(capsys, command, three, *args)
        assert code == 0
        document = json.loads(out)
        Draft202012Validator(schema(command)).validate(document)
    assert document["ruleset"]["deck"] == "52 cards (13 ranks x 4 suits)"
    assert document["rounds"][0]["hands"]["per_end"]["straight"] == "720"
