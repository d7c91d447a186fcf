"""Recovery copies of unsaved edits: kept whole, found only for their own path, never a crash."""

from __future__ import annotations

import json

from oddsbench.model.recovery import (
    copy_path,
    discard_recovery,
    find_recovery,
    recovery_folder,
    write_recovery,
)

DISK = 'title = "on disk"\n'
EDITED = 'title = "edited, not saved"\n'


def test_the_environment_variable_chooses_the_folder(tmp_path, monkeypatch):
    monkeypatch.setenv("ODDSBENCH_RECOVERY_DIR", str(tmp_path / "copies"))
    assert recovery_folder() == tmp_path / "copies"


def test_without_the_variable_the_folder_is_under_the_state_home(tmp_path, monkeypatch):
    monkeypatch.delenv("ODDSBENCH_RECOVERY_DIR")
    monkeypatch.setenv("XDG_STATE_HOME", str(tmp_path / "state"))
    assert recovery_folder() == tmp_path / "state" / "oddsbench" / "recovery"


def test_a_written_copy_is_found_with_its_text_and_the_disk_unchanged(tmp_path):
    path = tmp_path / "game.toml"
    path.write_text(DISK)
    write_recovery(path, EDITED, DISK)
    found = find_recovery(path, DISK)
    assert found.problem is None
    assert found.copy.text == EDITED
    assert not found.copy.disk_changed(DISK)
    assert found.copy.disk_changed('title = "changed by someone else"\n')
    assert found.copy.written_local()[:2] == "20"


def test_the_copy_holds_the_absolute_path_and_no_temporary_file_is_left(tmp_path, recovery_folder):
    path = tmp_path / "game.toml"
    write_recovery(path, EDITED, DISK)
    files = list(recovery_folder.iterdir())
    assert files == [copy_path(path)]
    assert json.loads(files[0].read_text())["path"] == str(path.resolve())


def test_a_copy_equal_to_the_file_on_disk_is_not_offered(tmp_path):
    path = tmp_path / "game.toml"
    write_recovery(path, DISK, DISK)
    assert find_recovery(path, DISK).copy is None


def test_no_copy_means_nothing_found_and_no_problem(tmp_path):
    found = find_recovery(tmp_path / "game.toml", DISK)
    assert found.copy is None and found.problem is None


def test_a_broken_copy_is_ignored_with_a_one_line_problem(tmp_path):
    path = tmp_path / "game.toml"
    target = copy_path(path)
    target.parent.mkdir(parents=True, exist_ok=True)
    for broken in ('{"path": "x", "text": ', "[1, 2]", '{"path": 3}', "\udcff".encode("utf-8", "surrogatepass")):
        if isinstance(broken, bytes):
            target.write_bytes(broken)
        else:
            target.write_text(broken)
        found = find_recovery(path, DISK)
        assert found.copy is None
        assert found.problem.startswith(f"recovery copy {target} ignored:")
        assert "\n" not in found.problem


def test_a_copy_naming_another_path_is_ignored(tmp_path):
    path = tmp_path / "game.toml"
    write_recovery(tmp_path / "other.toml", EDITED, DISK)
    copy_path(tmp_path / "other.toml").rename(copy_path(path))
    found = find_recovery(path, DISK)
    assert found.copy is None and found.problem is None


def test_discarding_removes_the_copy_and_discarding_again_is_harmless(tmp_path):
    path = tmp_path / "game.toml"
    write_recovery(path, EDITED, DISK)
    discard_recovery(path)
    assert not copy_path(path).exists()
    discard_recovery(path)
    assert find_recovery(path, DISK).copy is None
