"""The one way oddsbench writes files (reports, exports, workbench saves, recovery copies): whole or not at all.

The text goes to a temporary file in the target's own folder (same file system), is flushed
and fsynced, then moved into place in one step: ``os.replace`` when overwriting is allowed,
``os.link`` otherwise, which fails if the target appeared meanwhile instead of replacing it.
A reader never sees a half-written file, and a failure leaves no partial file behind.

What is never replaced: anything but a regular file (a device such as ``/dev/null``, a FIFO, a
folder, a socket), even with ``force``; without ``force``, any existing file. A symbolic link is
written through: its target gets the text, the link stays. ``expect`` (the text the file held
when it was read or last written, None for no file) makes the write refuse with ``DiskChanged``
when another program changed the file since; the check is made just before the move.
The temporary name is cut to fit the file system's name limit, however long the target's name.
"""

from __future__ import annotations

import contextlib
import errno
import os
import stat
import tempfile
from dataclasses import dataclass
from pathlib import Path

from oddsbench.model.errors import OddsbenchError
from oddsbench.model.file_read import FileRefused, kind_refusal, os_reason, read_text_capped

MAX_COMPARED_BYTES = 64_000_000  # a file larger than this counts as changed (it was not ours)


class DiskChanged(OddsbenchError):
    """The file on disk is no longer what was read or last written; nothing was written."""


@dataclass(frozen=True)
class OnDisk:
    """What a file held when it was read or last written: its text, or None when there was no file."""

    text: str | None


def check_target(path: str | Path, force: bool = False) -> Path:
    """The file ``write_atomically`` would write (a link's target), or the one-line refusal it would
    give: a command checks its output this way before the work, not after."""
    target = Path(path)
    real = _through_links(target)
    folder = real.parent if str(real.parent) else Path(".")
    if not folder.is_dir():
        raise OddsbenchError(f"{target}: the folder {str(folder)!r} does not exist")
    existing = _existing_mode(target, real)
    if existing is not None:
        refusal = kind_refusal(existing)
        if stat.S_ISDIR(existing):
            raise OddsbenchError(f"{target}: is a folder, not a file")
        if refusal is not None:
            raise OddsbenchError(f"{target}: {refusal}: only regular files are replaced")
        if not force:
            raise OddsbenchError(f"{target}: already exists and was not overwritten (add --force to replace it)")
    return real


def write_atomically(path: str | Path, content: str | bytes, force: bool = False, expect: OnDisk | None = None) -> Path:
    """Write ``content`` to ``path``; refuse an existing file unless ``force``. Returns the path."""
    target = Path(path)
    real = check_target(target, force)
    folder = real.parent if str(real.parent) else Path(".")
    data = content.encode("utf-8") if isinstance(content, str) else content
    mode = _mode_for(real)
    try:
        handle = tempfile.NamedTemporaryFile(
            dir=folder, prefix=f".{_short_name(real.name, folder)}.", suffix=".tmp", delete=False
        )
    except OSError as error:
        raise OddsbenchError(f"{target}: cannot write in {str(folder)!r}: {error.strerror or error}") from None
    temporary = Path(handle.name)
    try:
        with handle:
            handle.write(data)
            handle.flush()
            os.fsync(handle.fileno())
        os.chmod(temporary, mode)
        if expect is not None:
            _check_unchanged(target, real, expect)
        _move_into_place(temporary, real, target, force)
    except OSError as error:
        raise OddsbenchError(f"{target}: cannot be written: {error.strerror or error}") from None
    finally:
        with contextlib.suppress(FileNotFoundError):
            temporary.unlink()
    _sync_folder(folder)
    return target


def write_text_atomically(path: str | Path, content: str, expect: OnDisk | None = None) -> None:
    """Save over an existing file (the workbench's save): same guarantees, overwriting allowed."""
    write_atomically(path, content, force=True, expect=expect)


def disk_text(path: str | Path) -> str | None:
    """The text a file holds now (None when there is no file), for ``OnDisk`` and ``expect``.

    Raises ``FileRefused`` for a file that cannot be compared (not regular, not UTF-8, too large).
    """
    try:
        return read_text_capped(path, MAX_COMPARED_BYTES)
    except FileRefused as refused:
        if refused.missing:
            return None
        raise


def _through_links(target: Path) -> Path:
    """The file a symbolic link names (links followed to the end), so a save keeps the link."""
    if not target.is_symlink():
        return target
    try:
        return Path(os.path.realpath(target, strict=True))
    except FileNotFoundError:  # a dangling link: write the file it names
        return Path(os.path.realpath(target))
    except OSError as error:
        raise OddsbenchError(f"{target}: {os_reason(error)}") from None


def _existing_mode(target: Path, real: Path) -> int | None:
    """The ``st_mode`` of what is at the real path now (a link is not followed again), or None."""
    try:
        return os.lstat(real).st_mode
    except FileNotFoundError:
        return None
    except OSError as error:
        raise OddsbenchError(f"{target}: {os_reason(error)}") from None


def _check_unchanged(target: Path, real: Path, expect: OnDisk) -> None:
    try:
        now = disk_text(real)
    except FileRefused:
        now = "\0changed"
    if now != expect.text:
        happened = "was deleted" if now is None else "was created" if expect.text is None else "changed"
        raise DiskChanged(f"{target}: {happened} on disk since it was opened or last saved; nothing was written")


def _short_name(name: str, folder: Path) -> str:
    """``name`` cut (in bytes, on a character boundary) so ``.NAME.XXXXXXXX.tmp`` fits the name limit."""
    try:
        limit = os.pathconf(folder, "PC_NAME_MAX")
    except (OSError, ValueError):
        limit = 255
    room = max(limit - 16, 1)  # ".", ".", 8 random characters, ".tmp", and a margin
    encoded = name.encode("utf-8", "surrogateescape")
    return name if len(encoded) <= room else encoded[:room].decode("utf-8", "ignore")


def _mode_for(target: Path) -> int:
    """The target's own permission bits when it exists (a save keeps them), else the umask default."""
    try:
        return stat.S_IMODE(target.stat().st_mode)
    except OSError:
        mask = os.umask(0)
        os.umask(mask)
        return 0o666 & ~mask


def _move_into_place(temporary: Path, real: Path, target: Path, force: bool) -> None:
    if force:
        os.replace(temporary, real)
        return
    try:
        os.link(temporary, real)
    except FileExistsError:
        raise OddsbenchError(f"{target}: already exists and was not overwritten (add --force to replace it)") from None
    except OSError as error:
        if error.errno not in (errno.EPERM, errno.ENOTSUP, errno.EXDEV, errno.EMLINK, errno.ENOSYS):
            raise
        if os.path.lexists(real):  # file systems without hard links: check, then replace
            raise OddsbenchError(
                f"{target}: already exists and was not overwritten (add --force to replace it)"
            ) from None
        os.replace(temporary, real)


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
