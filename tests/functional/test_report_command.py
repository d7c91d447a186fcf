"""``oddsbench report``: files parse back, carry every figure and the cautions, never clobber."""

import csv
import io
import json
from pathlib import Path

from oddsbench.cli.main import main
from oddsbench.report.cautions import CAUTIONS

RULESETS = Path(__file__).resolve().parents[2] / "rulesets"
PASS_LINE = str(RULESETS / "pass-line.toml")
WHEEL = str(RULESETS / "single-zero-wheel.toml")


def test_csv_report_parses_back_with_exact_figures_and_cautions(tmp_path, capsys):
    target = tmp_path / "pass.csv"
    assert main(["report", PASS_LINE, "--output", str(target)]) == 0
    rows = list(csv.DictReader(io.StringIO(target.read_text())))
    figures = {row["quantity"]: row for row in rows if row["section"] == "round"}
    # 7/495: S. N. Ethier, The Doctrine of Chances (2010), as in test_published_values
    assert figures["house_edge"]["exact"] == "7/495"
    assert float(figures["house_edge"]["decimal"]) == 7 / 495
    assert figures["end_probability[won]"]["exact"] == "244/495"
    assert [row["note"] for row in rows if row["section"] == "caution"] == list(CAUTIONS)
    assert any(row["section"] == "source" for row in rows)
    assert "wrote" in capsys.readouterr().out


def test_json_report_parses_back_and_echoes_the_ruleset(tmp_path):
    target = tmp_path / "wheel.json"
    assert main(["report", WHEEL, "--output", str(target)]) == 0
    body = json.loads(target.read_text())
    assert body["cautions"] == list(CAUTIONS)
    assert body["ruleset"]["text"] == Path(WHEEL).read_text()
    assert body["ruleset"]["params"]["pockets"]["exact"] == "37"
    (round_,) = body["rounds"]
    # 1/37 for an even-money bet on a single-zero wheel: common practice, no source
    assert round_["figures"]["house_edge"] == {"exact": "1/37", "decimal": 1 / 37, "log10": None}
    assert body["sources"] and all(item["reference"] for item in body["sources"])


def test_markdown_report_carries_cautions_figures_and_sources(tmp_path):
    target = tmp_path / "pass.md"
    assert main(["report", PASS_LINE, "-o", str(target)]) == 0
    text = target.read_text()
    assert all(line in text for line in CAUTIONS)
    assert "| house edge | 7/495 |" in text and "## Method and sources" in text and "```" in text


def test_an_existing_file_is_kept_without_force_and_replaced_with_it(tmp_path, capsys):
    target = tmp_path / "out.json"
    target.write_text("keep me")
    assert main(["report", PASS_LINE, "--output", str(target)]) == 2
    assert target.read_text() == "keep me"
    assert "already exists" in capsys.readouterr().err
    assert main(["report", PASS_LINE, "--output", str(target), "--force"]) == 0
    assert json.loads(target.read_text())["rounds"][0]["figures"]["house_edge"]["exact"] == "7/495"
    assert sorted(p.name for p in tmp_path.iterdir()) == ["out.json"]


def test_a_missing_folder_is_one_line_and_no_file(tmp_path, capsys):
    target = tmp_path / "nowhere" / "out.md"
    assert main(["report", PASS_LINE, "--output", str(target)]) == 2
    assert "does not exist" in capsys.readouterr().err and not target.exists()


def test_strategies_are_reported_side_by_side(tmp_path, choice_game):
    game = choice_game
    target = tmp_path / "coin.json"
    assert main(["report", str(game), "--output", str(target)]) == 0
    body = json.loads(target.read_text())
    edges = {r["strategy"]: r["figures"]["house_edge"]["exact"] for r in body["rounds"]}
    # eager: win 1/2 + 1/2 * 1/3 = 2/3, net 1/3, edge -1/3; careful: win 1/2, edge 0 (arithmetic)
    assert edges == {"eager": "-1/3", "careful": "0"}
    assert body["strategies_compared"]["columns"] == ["quantity", "eager", "careful"]


def test_one_named_strategy_restricts_the_report(capsys, choice_game):
    game = choice_game
    assert main(["report", str(game), "--format", "json", "--strategy", "careful"]) == 0
    body = json.loads(capsys.readouterr().out)
    assert [r["strategy"] for r in body["rounds"]] == ["careful"] and body["strategies_compared"] is None


def test_session_comparison_parses_back_from_csv_and_json(tmp_path):
    csv_path, json_path = tmp_path / "s.csv", tmp_path / "s.json"
    common = ["report", WHEEL, "--bankroll", "5", "--goal", "10", "--plan", "bold", "--plan", "timid"]
    assert main(common + ["-o", str(csv_path)]) == 0
    assert main(common + ["-o", str(json_path)]) == 0
    rows = [row for row in csv.DictReader(io.StringIO(csv_path.read_text())) if row["section"] == "session"]
    goal = {row["subject"]: row["exact"] for row in rows if row["quantity"] == "goal_probability"}
    # bold play from 5 to 10 at even money is one spin: 18/37 (Dubins and Savage; arithmetic)
    assert goal["bold"] == "18/37"
    body = json.loads(json_path.read_text())
    plans = {p["plan"]: p for p in body["sessions"]["plans"]}
    assert plans["bold"]["figures"]["goal_probability"]["exact"] == "18/37"
    assert body["sessions"]["settings"]["bankroll"] == "5" and body["cautions"] == list(CAUTIONS)
    assert any(source["topic"] == "session" for source in body["sources"])


def test_markdown_report_has_the_sessions_compared_table(tmp_path):
    target = tmp_path / "s.md"
    assert main(["report", WHEEL, "--session", "--plan", "bold", "-o", str(target)]) == 0
    text = target.read_text()
    assert "## Sessions compared" in text and "| goal probability | 18/37 |" in text
