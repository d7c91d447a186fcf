"""Write a file so that it is either the old content or the new, never a partial file."""

from __future__ import annotations

import contextlib
import os
import stat
import tempfile
from pathlib import Path

from oddsbench.model.errors import OddsbenchError


def write_text_atomically(path: str | Path, content: str) -> None:
    """A temporary file in the same folder, flushed to disk, then renamed over the target.

    The rename is atomic on one file system, so a crash or a full disk leaves the old file
    whole. The target keeps its permission bits; a failure is one OddsbenchError line.
    """
    path = Path(path)
    folder = path.parent if str(path.parent) else Path(".")
    try:
        mode = stat.S_IMODE(path.stat().st_mode)
    except FileNotFoundError:
        mode = None
    except OSError as error:
        raise OddsbenchError(f"{path}: cannot be saved: {error.strerror or error}") from None
    try:
        handle, temporary = tempfile.mkstemp(prefix=f".{path.name}.", suffix=".tmp", dir=folder)
    except OSError as error:
        raise OddsbenchError(f"{path}: cannot be saved: {error.strerror or error}") from None
    try:
        with os.fdopen(handle, "w", encoding="utf-8", newline="") as stream:
            stream.write(content)
            stream.flush()
            os.fsync(stream.fileno())
        if mode is not None:
            os.chmod(temporary, mode)
        else:
            os.chmod(temporary, 0o666 & ~_umask())
        os.replace(temporary, path)
    except OSError as error:
        with contextlib.suppress(OSError):
            os.unlink(temporary)
        raise OddsbenchError(f"{path}: cannot be saved: {error.strerror or error}") from None
    _sync_folder(folder)


def _umask() -> int:
    current = os.umask(0)
    os.umask(current)
    return current


def _sync_folder(folder: Path) -> None:
    """Make the rename itself durable where the platform allows it."""
    with contextlib.suppress(OSError, AttributeError):
        descriptor = os.open(folder, os.O_RDONLY)
        try:
            os.fsync(descriptor)
        finally:
            os.close(descriptor)
