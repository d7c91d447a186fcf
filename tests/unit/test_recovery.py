"""Recovery copies of unsaved edits: kept whole, found only for their own path, never a crash."""

from __future__ import annotations

import json
import os
import subprocess
import sys
from pathlib import Path

from oddsbench.model.load import MAX_FILE_BYTES
from oddsbench.model.recovery import (
    MAX_COPY_BYTES,
    claim_recovery,
    copy_path,
    discard_copy,
    discard_recovery,
    find_recovery,
    keep_copy,
    recovery_folder,
    write_recovery,
)

ROOT = Path(__file__).resolve().parents[2]

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


def test_one_claim_at_a_time_and_the_lock_dies_with_its_holder(tmp_path):
    path = tmp_path / "game.toml"
    first = claim_recovery(path)
    assert first.owned and first.problem is None
    second = claim_recovery(path)  # a second open of the lock file conflicts, as another process would
    assert not second.owned and second.holder == os.getpid()
    first.release()
    third = claim_recovery(path)
    assert third.owned
    third.release()


def test_a_claim_held_by_another_process_names_it_and_ends_with_it(tmp_path):
    path = tmp_path / "game.toml"
    holder = subprocess.Popen(
        [sys.executable, "-c", HOLD_CLAIM, str(path)],
        env=dict(os.environ, PYTHONPATH=str(ROOT)),
        stdout=subprocess.PIPE,
        text=True,
    )
    try:
        assert holder.stdout.readline().strip() == "claimed"
        claim = claim_recovery(path)
        assert not claim.owned and claim.holder == holder.pid
    finally:
        holder.kill()
        holder.wait(timeout=30)
    claim = claim_recovery(path)
    assert claim.owned, "a killed holder leaves no lock behind"
    claim.release()


HOLD_CLAIM = """
import sys, time
from pathlib import Path
from oddsbench.model.recovery import claim_recovery
claim = claim_recovery(Path(sys.argv[1]))
print("claimed" if claim.owned else "not claimed", flush=True)
time.sleep(120)
"""


def test_a_kept_copy_is_out_of_reach_of_the_next_copy_and_offered_after_it(tmp_path):
    path = tmp_path / "game.toml"
    write_recovery(path, EDITED, DISK)
    kept = keep_copy(find_recovery(path, DISK).copy)
    assert kept.kept and not copy_path(path).exists()
    write_recovery(path, "newer edits\n", DISK)  # the next session's edits
    discard_recovery(path)  # ... undone back to the saved text
    assert kept.file.exists()
    found = find_recovery(path, DISK)
    assert found.copy.text == EDITED and found.copy.kept
    assert find_recovery(path, DISK, skip=frozenset({kept.file})).copy is None
    discard_copy(found.copy)
    assert find_recovery(path, DISK).copy is None


def test_copies_are_read_only_when_regular_and_under_the_cap(tmp_path):
    path = tmp_path / "game.toml"
    target = copy_path(path)
    target.parent.mkdir(parents=True, exist_ok=True)
    os.mkfifo(target)  # reading a FIFO would wait for a writer forever
    assert "named pipe" in find_recovery(path, DISK).problem
    target.unlink()
    target.symlink_to("/dev/zero")  # endless
    assert "character device" in find_recovery(path, DISK).problem
    target.unlink()
    target.write_text(json.dumps({"path": str(path), "text": "x" * (MAX_COPY_BYTES + 1)}))
    assert "over the limit" in find_recovery(path, DISK).problem
    record = {"path": str(path.resolve()), "text": "x" * (MAX_FILE_BYTES + 1), "disk_sha256": None, "written": "t"}
    target.write_text(json.dumps(record))
    assert "its text is over the limit" in find_recovery(path, DISK).problem
