"""Atomic writes: whole file or nothing, no clobbering without force, no leftovers."""

import os
import stat

import pytest

from oddsbench.model import atomic_write
from oddsbench.model.atomic_write import DiskChanged, OnDisk, disk_text, write_atomically, write_text_atomically
from oddsbench.model.errors import OddsbenchError


def test_writes_the_whole_text(tmp_path):
    target = write_atomically(tmp_path / "a.txt", "hello\n")
    assert target.read_text() == "hello\n"
    assert os.listdir(tmp_path) == ["a.txt"]


def test_refuses_an_existing_file_without_force(tmp_path):
    target = tmp_path / "a.txt"
    target.write_text("old")
    with pytest.raises(OddsbenchError, match="already exists"):
        write_atomically(target, "new")
    assert target.read_text() == "old"
    assert os.listdir(tmp_path) == ["a.txt"]


def test_a_failed_move_leaves_the_old_file_and_no_temporary(tmp_path, monkeypatch):
    target = tmp_path / "a.txt"
    target.write_text("old")

    def broken_replace(*_args):
        raise OSError(28, "No space left on device")

    monkeypatch.setattr(atomic_write.os, "replace", broken_replace)
    with pytest.raises(OddsbenchError, match="No space left"):
        write_atomically(target, "new", force=True)
    assert target.read_text() == "old"
    assert os.listdir(tmp_path) == ["a.txt"]


def test_refuses_a_folder_as_target(tmp_path):
    with pytest.raises(OddsbenchError, match="is a folder"):
        write_atomically(tmp_path, "x", force=True)


def test_only_a_regular_file_is_replaced_even_with_force(tmp_path):
    fifo = tmp_path / "pipe"
    os.mkfifo(fifo)
    with pytest.raises(OddsbenchError, match="is a named pipe .*only regular files are replaced"):
        write_atomically(fifo, "x", force=True)
    assert stat.S_ISFIFO(os.lstat(fifo).st_mode)
    assert sorted(os.listdir(tmp_path)) == ["pipe"], "no temporary file left"


def test_a_symbolic_link_is_written_through_and_stays_a_link(tmp_path):
    (tmp_path / "real").mkdir()
    target = tmp_path / "real" / "game.toml"
    target.write_text("old")
    link = tmp_path / "game.toml"
    link.symlink_to(target)
    write_atomically(link, "new", force=True)
    assert link.is_symlink() and os.readlink(link) == str(target)
    assert target.read_text() == "new"


def test_a_loop_of_links_is_refused(tmp_path):
    (tmp_path / "a").symlink_to("b")
    (tmp_path / "b").symlink_to("a")
    with pytest.raises(OddsbenchError, match="loop of symbolic links"):
        write_atomically(tmp_path / "a", "x", force=True)


def test_a_name_at_the_length_limit_is_written(tmp_path):
    name = "r" * 250 + ".md"  # 253 bytes: a temporary name built by adding to it would pass 255
    target = write_atomically(tmp_path / name, "whole")
    assert target.read_text() == "whole"
    assert os.listdir(tmp_path) == [name]


def test_a_file_changed_since_it_was_read_is_not_overwritten(tmp_path):
    target = tmp_path / "game.toml"
    target.write_text("as opened")
    opened = OnDisk(disk_text(target))
    target.write_text("changed by another program")
    with pytest.raises(DiskChanged, match="changed on disk since it was opened or last saved"):
        write_text_atomically(target, "my edits", expect=opened)
    assert target.read_text() == "changed by another program"
    assert os.listdir(tmp_path) == ["game.toml"]
    write_text_atomically(target, "my edits", expect=OnDisk("changed by another program"))
    assert target.read_text() == "my edits"


def test_a_new_file_that_appeared_meanwhile_is_not_overwritten(tmp_path):
    target = tmp_path / "new.toml"
    target.write_text("someone else's")
    with pytest.raises(DiskChanged, match="was created on disk"):
        write_text_atomically(target, "mine", expect=OnDisk(None))
