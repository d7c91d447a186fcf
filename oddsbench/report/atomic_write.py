"""The one way reports and exports reach the disk: whole or not at all, never clobbering by default.

The text goes to a temporary file in the target's own folder (same file system), is flushed
and fsynced, then moved into place in one step: ``os.replace`` when overwriting is allowed,
``os.link`` otherwise, which fails if the target appeared meanwhile instead of replacing it.
A reader never sees a half-written file, and a failure leaves no partial file behind.
"""

from __future__ import annotations

import contextlib
import errno
import os
import tempfile
from pathlib import Path

from oddsbench.model.errors import OddsbenchError


def _default_mode() -> int:
    mask = os.umask(0)
    os.umask(mask)
    return 0o666 & ~mask


def write_atomically(path: str | Path, content: str | bytes, force: bool = False) -> Path:
    """Write ``content`` to ``path``; refuse an existing file unless ``force``. Returns the path."""
    target = Path(path)
    folder = target.parent if str(target.parent) else Path(".")
    if not folder.is_dir():
        raise OddsbenchError(f"{target}: the folder {str(folder)!r} does not exist")
    if target.is_dir():
        raise OddsbenchError(f"{target}: is a folder, not a file")
    if target.exists() and not force:
        raise OddsbenchError(f"{target}: already exists and was not overwritten (add --force to replace it)")
    data = content.encode("utf-8") if isinstance(content, str) else content
    try:
        handle = tempfile.NamedTemporaryFile(dir=folder, prefix=f".{target.name}.", suffix=".tmp", delete=False)
    except OSError as error:
        raise OddsbenchError(f"{target}: cannot write in {str(folder)!r}: {error.strerror or error}") from None
    temporary = Path(handle.name)
    try:
        with handle:
            handle.write(data)
            handle.flush()
            os.fsync(handle.fileno())
        os.chmod(temporary, _default_mode())
        _move_into_place(temporary, target, force)
    except OSError as error:
        raise OddsbenchError(f"{target}: cannot be written: {error.strerror or error}") from None
    finally:
        with contextlib.suppress(FileNotFoundError):
            temporary.unlink()
    _sync_folder(folder)
    return target


def _move_into_place(temporary: Path, target: Path, force: bool) -> None:
    if force:
        os.replace(temporary, target)
        return
    try:
        os.link(temporary, target)
    except FileExistsError:
        raise OddsbenchError(f"{target}: already exists and was not overwritten (add --force to replace it)") from None
    except OSError as error:
        if error.errno not in (errno.EPERM, errno.ENOTSUP, errno.EXDEV, errno.EMLINK, errno.ENOSYS):
            raise
        if target.exists():  # file systems without hard links: check, then replace
            raise OddsbenchError(
                f"{target}: already exists and was not overwritten (add --force to replace it)"
            ) from None
        os.replace(temporary, target)


def _sync_folder(folder: Path) -> None:
    """Make the rename itself durable where the platform allows opening folders."""
    try:
        descriptor = os.open(folder, os.O_RDONLY)
    except OSError:
        return
    try:
        os.fsync(descriptor)
    except OSError:
        pass
    finally:
        os.close(descriptor)
