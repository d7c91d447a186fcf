"""``oddsbench solve``: the human table and the documented JSON object."""

from __future__ import annotations

import json
import subprocess
import sys

from conftest import RULESETS, run_cli

from oddsbench.report.cautions import CAUTIONS


def test_json_gives_house_edge_7_of_495_for_pass_line(capsys):
    # Pass line edge 7/495: Ethier, The Doctrine of Chances, ch. 15 (from memory).
    code, out, _ = run_cli(capsys, "solve", RULESETS / "pass-line.toml", "--json")
    data = json.loads(out)
    (result,) = data["results"]
    assert code == 0
    assert result["figures"]["house_edge"]["exact"] == "7/495"
    assert abs(result["figures"]["house_edge"]["decimal"] - 7 / 495) < 1e-15
    assert result["figures"]["end_probability"]["won"]["exact"] == "244/495"
    assert data["ruleset"] == "Pass line" and result["start"] == "come-out" and result["states"] == 9
    assert data["notes"] == [] and result["notes"] == []
    assert data["command"] == "solve" and data["version"] == 2


def test_human_table_shows_exact_beside_decimal_and_percent(capsys):
    code, out, _ = run_cli(capsys, "solve", RULESETS / "pass-line.toml")
    line = next(row for row in out.splitlines() if row.startswith("house edge"))
    assert code == 0
    assert line.split() == ["house", "edge", "7/495", "0.0141414", "(1.414", "%)"]


def test_human_output_carries_every_caution(capsys):
    _, out, _ = run_cli(capsys, "solve", RULESETS / "field.toml")
    for caution in CAUTIONS:
        assert caution in out


def test_rounds_option_adds_chance_ended_by_step(capsys):
    _, out, _ = run_cli(capsys, "solve", RULESETS / "pass-line.toml", "--rounds", "1", "--json")
    data = json.loads(out)
    # After one roll only the come-out naturals and craps have ended: 12/36 = 1/3.
    figures = data["results"][0]["figures"]
    assert figures["ended_by"]["exact"] == "1/3"
    assert figures["end_probability_by_step"]["won"]["exact"] == "2/9"


def test_exact_limit_zero_gives_decimals_only_with_a_note(capsys):
    _, out, _ = run_cli(capsys, "solve", RULESETS / "pass-line.toml", "--json", "--exact-limit", "0")
    data = json.loads(out)
    (result,) = data["results"]
    assert result["figures"]["house_edge"]["exact"] is None
    assert abs(result["figures"]["house_edge"]["decimal"] - 7 / 495) < 1e-12
    assert any("exact arithmetic skipped" in note for note in result["notes"])


def test_console_module_runs_as_a_program():
    done = subprocess.run(
        [sys.executable, "-m", "oddsbench", "solve", str(RULESETS / "single-zero-wheel.toml"), "--json"],
        capture_output=True,
        text=True,
        timeout=120,
    )
    assert done.returncode == 0, done.stderr
    assert json.loads(done.stdout)["results"][0]["figures"]["house_edge"]["exact"] == "1/37"


def test_bad_option_value_exits_2(capsys):
    import pytest

    with pytest.raises(SystemExit) as stop:
        run_cli(capsys, "solve", RULESETS / "pass-line.toml", "--rounds", "zero")
    assert stop.value.code == 2
