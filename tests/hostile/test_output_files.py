"""Files the command line writes: only regular files are replaced, links are written through,
long names fit, and each refusal is one line with exit 2."""

from __future__ import annotations

import os
import stat

from conftest import RULESETS, run_cli

PASS_LINE = str(RULESETS / "pass-line.toml")


def test_report_never_replaces_a_fifo_even_with_force(capsys, tmp_path):
    node = tmp_path / "node"
    os.mkfifo(node)  # stands in for a device such as /dev/null: not a regular file
    code, _, err = run_cli(capsys, "report", PASS_LINE, "-o", node, "--force")
    assert code == 2
    reason = "is a named pipe (FIFO), not a regular file: only regular files are replaced"
    assert err.splitlines() == [f"oddsbench: {node}: {reason}"]
    assert stat.S_ISFIFO(os.lstat(node).st_mode) and os.listdir(tmp_path) == ["node"]


def test_report_through_a_link_writes_the_target_and_keeps_the_link(capsys, tmp_path):
    target = tmp_path / "kept" / "report.md"
    target.parent.mkdir()
    target.write_text("old report")
    link = tmp_path / "report.md"
    link.symlink_to(target)
    code, _, err = run_cli(capsys, "report", PASS_LINE, "-o", link, "--force")
    assert code == 0, err
    assert link.is_symlink() and "7/495" in target.read_text()  # pass line house edge (Ethier, 2010)


def test_report_to_a_name_at_the_length_limit(capsys, tmp_path):
    name = "a" * 250 + ".md"
    code, _, err = run_cli(capsys, "report", PASS_LINE, "-o", tmp_path / name)
    assert code == 0, err
    assert os.listdir(tmp_path) == [name]


def test_an_output_that_cannot_be_written_is_refused_before_the_work(capsys, tmp_path):
    """The output is checked first: the ruleset is never read (a missing one would be named)."""
    taken = tmp_path / "taken.csv"
    taken.write_text("someone's figures")
    missing = str(tmp_path / "missing.toml")
    refusal = f"oddsbench: {taken}: already exists and was not overwritten (add --force to replace it)"
    for argv in (
        ("report", missing, "-o", taken),
        ("session", missing, "--goal", "20", "--bankroll", "10", "--series-csv", taken),
    ):
        code, _, err = run_cli(capsys, *argv)
        assert code == 2
        assert err.splitlines() == [refusal]
    assert taken.read_text() == "someone's figures"
