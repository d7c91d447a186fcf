"""Atomic writes: whole file or nothing, no clobbering without force, no leftovers."""

import os

import pytest

from oddsbench.model import atomic_write
from oddsbench.model.atomic_write import write_atomically
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
