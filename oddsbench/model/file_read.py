"""The one way oddsbench reads a file a user names: regular files only, never more than a cap.

``stat`` cannot be trusted for a size: ``/dev/zero`` and ``/proc`` files say 0 and never end, a
FIFO blocks until a writer comes, a file can grow while it is read. So the file is opened
without blocking and without becoming a controlling terminal, its type is checked on the open
descriptor (what is read is what was checked), and at most ``limit + 1`` bytes are read: one
byte too many is enough to refuse. Folders, FIFOs, devices and sockets are refused by type,
a loop of symbolic links by name; every refusal is one short reason, without the path, for the
caller to place (``file: reason``).
"""

from __future__ import annotations

import errno
import os
import stat
from pathlib import Path

from oddsbench.model.errors import OddsbenchError

_CHUNK = 1 << 16
_KINDS = (
    (stat.S_ISDIR, "is a folder"),
    (stat.S_ISFIFO, "is a named pipe (FIFO), not a regular file"),
    (stat.S_ISCHR, "is a character device, not a regular file"),
    (stat.S_ISBLK, "is a block device, not a regular file"),
    (stat.S_ISSOCK, "is a socket, not a regular file"),
)
_REASONS = {
    errno.ENOENT: "no such file",
    errno.ELOOP: "is a loop of symbolic links",
    errno.EACCES: "cannot be read: permission denied",
    errno.ENXIO: "is a socket or device with nothing behind it, not a regular file",
    errno.ENOTDIR: "no such file (a part of the path is not a folder)",
    errno.ENAMETOOLONG: "the name is too long",
}


class FileRefused(OddsbenchError):
    """A file that is not read; the message is the reason only, e.g. ``is a named pipe (FIFO), ...``."""

    def __init__(self, reason: str, missing: bool = False) -> None:
        super().__init__(reason)
        self.missing = missing


def kind_refusal(mode: int) -> str | None:
    """Why a file of this ``st_mode`` is not read or replaced (None for a regular file)."""
    for test, reason in _KINDS:
        if test(mode):
            return reason
    return None if stat.S_ISREG(mode) else "is not a regular file"


def os_reason(error: OSError) -> str:
    """One short reason for an ``OSError`` met on a user's file."""
    return _REASONS.get(error.errno or 0) or f"cannot be read: {error.strerror or error}"


def read_bytes_capped(path: str | Path, limit: int, folder_reason: str | None = None) -> bytes:
    """The bytes of a regular file of at most ``limit`` bytes, or ``FileRefused`` with the reason.

    ``folder_reason`` replaces the reason given for a folder (``is a folder, not a ruleset file``).
    """
    flags = os.O_RDONLY | getattr(os, "O_NONBLOCK", 0) | getattr(os, "O_NOCTTY", 0) | getattr(os, "O_CLOEXEC", 0)
    try:
        descriptor = os.open(path, flags)
    except OSError as error:
        if error.errno == errno.EISDIR:
            raise FileRefused(folder_reason or "is a folder") from None
        raise FileRefused(os_reason(error), missing=error.errno == errno.ENOENT) from None
    try:
        mode = os.fstat(descriptor).st_mode
        refusal = kind_refusal(mode)
        if refusal is not None:
            raise FileRefused(folder_reason if folder_reason and stat.S_ISDIR(mode) else refusal)
        size = os.fstat(descriptor).st_size
        if size > limit:
            raise FileRefused(f"file is {size:,} bytes, over the limit of {limit:,}")
        chunks: list[bytes] = []
        held = 0
        while held <= limit:
            chunk = os.read(descriptor, min(_CHUNK, limit + 1 - held))
            if not chunk:
                break
            chunks.append(chunk)
            held += len(chunk)
        if held > limit:
            raise FileRefused(f"file is more than {limit:,} bytes, over the limit of {limit:,}")
        return b"".join(chunks)
    except BlockingIOError:
        raise FileRefused("cannot be read without waiting (not a regular file)") from None
    except OSError as error:
        raise FileRefused(os_reason(error)) from None
    finally:
        os.close(descriptor)


def read_text_capped(path: str | Path, limit: int, folder_reason: str | None = None) -> str:
    """``read_bytes_capped`` decoded as UTF-8 (a refusal names the first bad byte)."""
    raw = read_bytes_capped(path, limit, folder_reason)
    try:
        return raw.decode("utf-8")
    except UnicodeDecodeError as error:
        raise FileRefused(f"is not UTF-8 text (bad byte at position {error.start})") from None
