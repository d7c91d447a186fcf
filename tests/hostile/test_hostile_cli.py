"""Hostile and broken rulesets through the real command line, one subprocess each.

Every file in ``tests/hostile/cases/`` states in its header what must happen (``# expect-exit:`` and
``# expect:`` lines); further cases that cannot live in the repository (huge, not UTF-8, nested
past the TOML reader's depth) are written into a temporary folder. For each, ``check`` and
``solve`` must finish within a time bound, exit 2 (or 0 for warning-only files), print one line
per problem and nothing else on stderr, never a traceback, and never create the canary file
that the hostile expressions try to write.
"""

from __future__ import annotations

import os
import subprocess
import sys
from pathlib import Path

import pytest

from oddsbench.model.load import MAX_FILE_BYTES, read_ruleset_file

ROOT = Path(__file__).resolve().parents[2]
HOSTILE = Path(__file__).resolve().parent / "cases"
CANARY = "canary-created"
TIME_BOUND = 60  # seconds per command: generous for a loaded 2-core machine; a hang fails


def run_cli(*args: str, cwd: Path) -> subprocess.CompletedProcess[str]:
    env = dict(os.environ, PYTHONPATH=str(ROOT))
    env.pop("ODDSBENCH_DEBUG", None)
    return subprocess.run(
        [sys.executable, "-m", "oddsbench", *args],
        cwd=cwd,
        env=env,
        capture_output=True,
        text=True,
        encoding="utf-8",
        errors="replace",
        timeout=TIME_BOUND,
    )


def expectations(path: Path, command: str) -> tuple[int, list[str], list[str]]:
    """(exit code, message fragments, extra arguments) from the file's header comments;
    ``# expect-solve:`` fragments are for the solve command only (its notes)."""
    exit_code, fragments, extra = 2, [], []
    for line in path.read_text(encoding="utf-8").splitlines():
        if line.startswith("# expect-exit:"):
            exit_code = int(line.split(":", 1)[1])
        elif line.startswith("# expect:") or (line.startswith("# expect-solve:") and command == "solve"):
            fragments.append(line.split(":", 1)[1].strip())
        elif line.startswith("# args:"):
            extra = line.split(":", 1)[1].split()
    return exit_code, fragments, extra


def expected_stderr(path: Path, command: str) -> list[str]:
    """The lines stderr must hold exactly: one per problem as the reader reports them."""
    result = read_ruleset_file(path)
    if command == "check":
        return [str(problem) for problem in result.errors]
    if result.ruleset is None:
        return [str(problem) for problem in result.problems]
    return [str(problem) for problem in result.warnings]


def assert_handled(result: subprocess.CompletedProcess[str], exit_code: int, cwd: Path) -> None:
    assert result.returncode == exit_code, result.stderr
    assert "Traceback" not in result.stderr + result.stdout
    assert "internal error" not in result.stderr
    assert not (cwd / CANARY).exists(), "a ruleset managed to create a file"
    for line in result.stderr.splitlines():
        assert line.strip(), "blank line on stderr"


HOSTILE_FILES = sorted(HOSTILE.glob("*.toml"))


def test_the_hostile_table_covers_every_class_of_bad_input():
    prefixes = {path.stem.split("-")[0] for path in HOSTILE_FILES}
    classes = {"code", "number", "toml", "wrong", "names", "control", "deep", "self", "trapped", "unreachable"}
    assert classes | {"family", "numeric"} <= prefixes
    assert len(HOSTILE_FILES) >= 25


@pytest.mark.parametrize("command", ["check", "solve"])
@pytest.mark.parametrize("path", HOSTILE_FILES, ids=lambda path: path.stem)
def test_hostile_file_gives_one_line_per_problem_and_the_right_exit(path, command, tmp_path):
    exit_code, fragments, extra = expectations(path, command)
    result = run_cli(command, str(path), *extra, cwd=tmp_path)
    assert_handled(result, exit_code, tmp_path)
    assert result.stderr.splitlines() == expected_stderr(path, command)
    shown = result.stderr + result.stdout
    for fragment in fragments:
        if command == "solve" and fragment.startswith("warning:") and exit_code == 2:
            continue  # solve stops at errors; warnings of a failed file come with check
        assert fragment in shown, f"{fragment!r} missing from:\n{shown}"


def _write(tmp_path: Path, name: str, content: bytes) -> Path:
    path = tmp_path / name
    path.write_bytes(content)
    return path


HEAD = b'[ruleset]\ntitle = "generated"\nstart = "s0"\n'


def _huge(tmp_path: Path) -> Path:
    filler = b"# padding " + b"x" * 90 + b"\n"
    return _write(tmp_path, "huge.toml", HEAD + filler * (MAX_FILE_BYTES // len(filler) + 10))


def _not_utf8(tmp_path: Path) -> Path:
    return _write(tmp_path, "latin1.toml", HEAD + '[states.s0]\nabout = "café"\n'.encode("latin-1"))


def _binary(tmp_path: Path) -> Path:
    return _write(tmp_path, "binary.toml", bytes(range(256)) * 8)


def _empty(tmp_path: Path) -> Path:
    return _write(tmp_path, "empty.toml", b"")


def _deep_arrays(tmp_path: Path) -> Path:
    return _write(tmp_path, "deep.toml", HEAD + b"x = " + b"[" * 20_000 + b"]" * 20_000 + b"\n")


def _long_trap(tmp_path: Path) -> Path:
    count = 20_000
    states = b"".join(b'[states.s%d]\noutcomes = [{ to = "s%d" }]\n' % (i, i + 1) for i in range(count))
    return _write(tmp_path, "trap.toml", HEAD + states + b'[states.s%d]\noutcomes = [{ to = "s0" }]\n' % count)


def _many_unknown_targets(tmp_path: Path) -> Path:
    outcomes = b", ".join(b'{ to = "u%d", prob = "1/4000" }' % i for i in range(4000))
    known = b"".join(b"[states.v%d]\n" % i for i in range(4000))
    return _write(tmp_path, "targets.toml", HEAD + b"[states.s0]\noutcomes = [" + outcomes + b"]\n" + known)


def _folder(tmp_path: Path) -> Path:
    folder = tmp_path / "folder.toml"
    folder.mkdir()
    return folder


def _fifo(tmp_path: Path) -> Path:
    path = tmp_path / "pipe.toml"
    os.mkfifo(path)  # no writer ever comes: a reader that waits for one hangs
    return path


def _endless_device(tmp_path: Path) -> Path:
    path = tmp_path / "zero.toml"
    path.symlink_to("/dev/zero")  # stat says 0 bytes; reading never ends
    return path


def _link_loop(tmp_path: Path) -> Path:
    (tmp_path / "a.toml").symlink_to("b.toml")
    (tmp_path / "b.toml").symlink_to("a.toml")
    return tmp_path / "a.toml"


GENERATED = {
    "huge": (_huge, "huge.toml: file is"),
    "not-utf8": (_not_utf8, "latin1.toml: is not UTF-8 text (bad byte at position"),
    "binary": (_binary, "binary.toml: is not UTF-8 text"),
    "empty": (_empty, "empty.toml: file is empty"),
    "deep-arrays": (_deep_arrays, "deep.toml: not valid TOML: nested too deeply"),
    "long-trap": (_long_trap, "trap.toml: state 's0': the round can never end from here: trapped in {'s0', 's1'"),
    "many-unknown-targets": (_many_unknown_targets, "targets.toml: state 's0', outcome 4000, to: unknown state"),
    "folder": (_folder, "folder.toml: is a folder, not a ruleset file"),
    "missing": (lambda tmp_path: tmp_path / "nowhere.toml", "nowhere.toml: no such file"),
    "fifo": (_fifo, "pipe.toml: is a named pipe (FIFO), not a regular file"),
    "endless-device": (_endless_device, "zero.toml: is a character device, not a regular file"),
    "link-loop": (_link_loop, "a.toml: is a loop of symbolic links"),
}


@pytest.mark.parametrize("command", ["check", "solve"])
@pytest.mark.parametrize("case", sorted(GENERATED))
def test_generated_hostile_file_is_refused_in_one_line_each(case, command, tmp_path):
    build, fragment = GENERATED[case]
    path = build(tmp_path)
    result = run_cli(command, str(path), cwd=tmp_path)
    assert_handled(result, 2, tmp_path)
    assert result.stderr.splitlines() == expected_stderr(path, command)
    assert any(line.startswith(fragment) for line in result.stderr.splitlines()), result.stderr


def test_state_limit_is_reported_with_both_figures(tmp_path):
    path = HOSTILE / "names-odd.toml"
    for command in ("check", "solve"):
        result = run_cli(command, str(path), "--max-states", "3", cwd=tmp_path)
        assert_handled(result, 2, tmp_path)
        assert result.stderr.splitlines() == [
            "oddsbench: names-odd.toml: the ruleset has 4 states, over the state limit of 3 "
            "(raise it with --max-states)"
        ]


def test_a_byte_order_mark_is_accepted(tmp_path):
    text = (HOSTILE / "names-odd.toml").read_text(encoding="utf-8")
    path = _write(tmp_path, "bom.toml", b"\xef\xbb\xbf" + text.encode("utf-8"))
    result = run_cli("check", str(path), cwd=tmp_path)
    assert_handled(result, 0, tmp_path)
    assert "bom.toml: valid: 4 states" in result.stdout


def test_bad_option_values_exit_2_in_one_line(tmp_path):
    result = run_cli("solve", str(HOSTILE / "names-odd.toml"), "--max-states", "lots", cwd=tmp_path)
    assert result.returncode == 2
    assert "Traceback" not in result.stderr
    assert "--max-states: expected a whole number, got 'lots'" in result.stderr


@pytest.mark.parametrize("case", ["fifo", "endless-device", "link-loop"])
def test_a_sweep_naming_a_file_that_is_not_regular_is_refused_in_one_line(case, tmp_path):
    build, fragment = GENERATED[case]
    named = build(tmp_path).name
    spec = tmp_path / "spec.toml"
    spec.write_text(f'[sweep]\nruleset = "{named}"\n\n[params]\np = ["1/2"]\n')
    result = run_cli("sweep", str(spec), cwd=tmp_path)
    assert_handled(result, 2, tmp_path)
    reason = fragment.split(": ", 1)[1]
    assert result.stderr.splitlines() == [f"spec.toml: [sweep], ruleset: '{named}': {reason}"]
    result = run_cli("sweep", named, cwd=tmp_path)  # the spec itself
    assert_handled(result, 2, tmp_path)
    assert result.stderr.splitlines() == [f"{named}: {reason}"]
