"""Files a user names are read only when regular, and never past the byte cap (``stat`` is not trusted)."""

from __future__ import annotations

import os

import pytest

from oddsbench.model import file_read
from oddsbench.model.file_read import FileRefused, read_bytes_capped, read_text_capped


def test_a_regular_file_is_read_whole(tmp_path):
    path = tmp_path / "a.toml"
    path.write_bytes(b"x" * 1000)
    assert read_bytes_capped(path, 1000) == b"x" * 1000


def test_a_file_over_the_cap_is_refused_by_its_size(tmp_path):
    path = tmp_path / "a.toml"
    path.write_bytes(b"x" * 1001)
    with pytest.raises(FileRefused, match="file is 1,001 bytes, over the limit of 1,000"):
        read_bytes_capped(path, 1000)


def test_a_file_whose_size_lies_is_cut_at_the_cap_while_reading(tmp_path, monkeypatch):
    path = tmp_path / "a.toml"
    path.write_bytes(b"x" * 5000)
    real_fstat = os.fstat

    class ZeroSize:  # what /proc files and devices report
        def __init__(self, result):
            self.st_mode, self.st_size = result.st_mode, 0

    monkeypatch.setattr(file_read.os, "fstat", lambda fd: ZeroSize(real_fstat(fd)))
    reads = []
    real_read = os.read
    monkeypatch.setattr(file_read.os, "read", lambda fd, n: reads.append(n) or real_read(fd, n))
    with pytest.raises(FileRefused, match="more than 1,000 bytes"):
        read_bytes_capped(path, 1000)
    assert sum(reads) <= 1001, "never more than one byte past the cap is asked for"


def test_an_endless_device_is_refused_by_type():
    with pytest.raises(FileRefused, match="is a character device, not a regular file"):
        read_bytes_capped("/dev/zero", 1000)


def test_a_named_pipe_is_refused_without_waiting_for_a_writer(tmp_path):
    path = tmp_path / "pipe.toml"
    os.mkfifo(path)
    with pytest.raises(FileRefused, match="named pipe"):
        read_bytes_capped(path, 1000)


def test_a_loop_of_symbolic_links_and_a_missing_file_are_named(tmp_path):
    (tmp_path / "a").symlink_to("b")
    (tmp_path / "b").symlink_to("a")
    with pytest.raises(FileRefused, match="loop of symbolic links"):
        read_bytes_capped(tmp_path / "a", 1000)
    with pytest.raises(FileRefused, match="no such file") as refused:
        read_bytes_capped(tmp_path / "absent", 1000)
    assert refused.value.missing


def test_a_folder_gets_the_callers_reason(tmp_path):
    with pytest.raises(FileRefused, match="^is a folder, not a ruleset file$"):
        read_bytes_capped(tmp_path, 1000, "is a folder, not a ruleset file")


def test_text_that_is_not_utf8_names_the_first_bad_byte(tmp_path):
    path = tmp_path / "a.toml"
    path.write_bytes(b"ok \xff")
    with pytest.raises(FileRefused, match=r"not UTF-8 text \(bad byte at position 3\)"):
        read_text_capped(path, 1000)
