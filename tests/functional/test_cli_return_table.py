"""The return table from the command line: ``solve`` text and ``--json``, and the reports."""

from __future__ import annotations

import json

from conftest import RULESETS, run_cli

from oddsbench.model.numbers import QQ, parse_fraction


def test_solve_text_shows_the_net_law_and_the_shares(capsys):
    code, out, _ = run_cli(capsys, "solve", RULESETS / "field.toml")
    assert code == 0
    assert "hit frequency (net > 0)" in out and "4/9" in out
    assert "net sd per unit staked" in out and "irrational" in out
    assert "Net result of the round: 4 value(s)" in out
    assert "roll -> won-12" in out  # the triple payout's share of the expected net


def test_solve_json_has_the_figures_and_the_net_law_in_the_documented_keys(capsys):
    code, out, _ = run_cli(capsys, "solve", RULESETS / "pass-line.toml", "--json")
    assert code == 0
    result = json.loads(out)["results"][0]
    figures = result["figures"]
    # Ethier, "The Doctrine of Chances" (2010): pass line wins 244/495, loses 251/495, no push.
    assert figures["hit_frequency"]["exact"] == "244/495"
    assert figures["push_probability"]["exact"] == "0"
    assert figures["loss_probability"]["exact"] == "251/495"
    assert figures["net_sd"]["exact"] is None and 0.9998 < figures["net_sd"]["decimal"] < 1
    law = result["net_law"]
    assert [entry["net"]["exact"] for entry in law] == ["-1", "1"]
    total = sum((parse_fraction(entry["contribution"]["exact"]) for entry in law), QQ(0))
    assert total == parse_fraction(figures["expected_net"]["exact"])
    shares = result["return_shares"]
    assert {"from": "come-out", "action": None, "to": "won"}.items() <= shares[0].items()
    assert sum((parse_fraction(s["contribution"]["exact"]) for s in shares), QQ(0)) == QQ(-7, 495)


def test_decimals_only_gives_a_null_net_law_with_a_note(capsys):
    code, out, _ = run_cli(capsys, "solve", RULESETS / "field.toml", "--exact-limit", "0", "--json")
    result = json.loads(out)["results"][0]
    assert code == 0 and result["net_law"] is None and result["return_shares"] is None
    assert "hit_frequency" not in result["figures"]
    assert any("return table" in note for note in result["notes"])


def test_reports_carry_the_return_table(capsys, tmp_path):
    for form in ("md", "csv", "json"):
        target = tmp_path / f"field.{form}"
        code, _, _ = run_cli(capsys, "report", RULESETS / "field.toml", "--output", target)
        assert code == 0
        content = target.read_text(encoding="utf-8")
        if form == "md":
            assert "Net result of the round" in content and "| 3 | 1/36 |" in content
        elif form == "csv":
            assert "net_law,as written,P(net = 3),1/36," in content
        else:
            assert json.loads(content)["rounds"][0]["net_law"][-1]["net"]["exact"] == "3"
