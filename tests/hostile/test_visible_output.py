"""Control and escape sequences from files and arguments never reach the terminal: they are shown as escapes."""

from __future__ import annotations

from conftest import RULESETS, run_cli

from oddsbench.model.visible import first_unsafe, visible

TITLE_ESCAPE = "\x1b]0;PWNED\x07"  # would retitle the terminal window
CLEAR_AND_BLINK = "\x1b[2J\x1b[5m"


def test_visible_writes_controls_direction_marks_and_c1_codes_as_escapes():
    assert visible("a\x1b[2Jb\x07\u202ec\x9b") == "a\\x1b[2Jb\\x07\\u202ec\\x9b"
    assert visible("tab\tline\nend\r", multiline=True) == "tab\tline\nend\\x0d"  # a carriage return can overwrite
    assert visible("plain: 7/495 é ♠") == "plain: 7/495 é ♠"
    assert visible(visible(TITLE_ESCAPE)) == visible(TITLE_ESCAPE), "showing twice changes nothing"


def test_the_reader_and_the_display_share_one_rule():
    for character in ("\x1b", "\x00", "\x7f", "\x85", "\u202e", "\u2066"):
        assert first_unsafe(f"x{character}") == f"U+{ord(character):04X}"
        assert character not in visible(character)
    assert first_unsafe("a\tb\nc", multiline=True) is None


def test_a_file_name_with_escapes_is_shown_escaped(capsys, tmp_path):
    name = tmp_path / f"{TITLE_ESCAPE}.toml"
    code, out, err = run_cli(capsys, "check", name)
    assert code == 2
    assert "\x1b" not in err + out and "\x07" not in err + out
    assert err.strip() == "\\x1b]0;PWNED\\x07.toml: no such file"


def test_a_sweep_title_with_escapes_is_printed_escaped(capsys, tmp_path):
    spec = tmp_path / "spec.toml"
    ruleset = RULESETS / "pass-line.toml"
    spec.write_text(f'[sweep]\ntitle = "\\u001b[2J\\u001b[5mblink"\nruleset = "{ruleset}"\n')
    code, out, err = run_cli(capsys, "sweep", spec, "--no-progress")
    assert code == 0, err
    assert "\x1b" not in out + err
    assert "\\x1b[2J\\x1b[5mblink" in out
