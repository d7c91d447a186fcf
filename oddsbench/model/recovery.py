"""Recovery copies of unsaved workbench edits, so a killed session does not lose them.

One small JSON file per edited path, in a folder of its own (``ODDSBENCH_RECOVERY_DIR``, else
``$XDG_STATE_HOME/oddsbench/recovery``, else ``~/.local/state/oddsbench/recovery``). A copy holds
the absolute path, the unsaved text, the SHA-256 of the file's text when editing began and the
time it was written. Copies go through ``write_atomically``, so a kill mid-write leaves the last
whole copy; reading one never raises: a broken copy is reported as a one-line problem instead.

* One owner at a time: a workbench claims a path with ``claim_recovery`` (``fcntl.flock`` on a
  lock file beside the copy; the lock dies with its process, so a killed session frees it). Only
  the owner writes, offers or removes that path's copies; a second workbench on the same file is
  told who holds it and leaves them alone.
* Keep means keep: ``keep_copy`` moves the live copy aside (``DIGEST-kept-TIME.json``), where
  the next edit's copy and an undo back to the saved text cannot reach it; it is offered again
  at the next opening, with the live copy, one after the other.
* Copies are read like any file a user did not write for us: regular files only, under
  ``MAX_COPY_BYTES`` (``model/file_read.py``), their text under the ruleset size limit.
"""

from __future__ import annotations

import contextlib
import errno
import fcntl
import hashlib
import json
import os
from dataclasses import dataclass, field, replace
from datetime import UTC, datetime
from pathlib import Path

from oddsbench.model.atomic_write import write_atomically
from oddsbench.model.errors import OddsbenchError
from oddsbench.model.file_read import FileRefused, kind_refusal, read_text_capped
from oddsbench.model.load import MAX_FILE_BYTES

ENV_VAR = "ODDSBENCH_RECOVERY_DIR"
FORMAT = 1
MAX_COPY_BYTES = 4 * MAX_FILE_BYTES + 4_096  # the text of a ruleset at the limit, JSON-escaped, and the fields
KEPT = "-kept-"


@dataclass(frozen=True)
class RecoveryCopy:
    """Unsaved text of ``path``; ``disk_sha`` is the hash of the file's text when editing began;
    ``file`` is where the copy lives (the live copy, or one kept aside)."""

    path: str
    text: str
    disk_sha: str | None
    written: str  # ISO time, UTC
    file: Path | None = field(default=None, compare=False)

    @property
    def kept(self) -> bool:
        return self.file is not None and KEPT in self.file.name

    def disk_changed(self, disk_text: str | None) -> bool:
        """Whether the file on disk is no longer the text the edits started from."""
        return self.disk_sha != text_sha(disk_text)

    def written_local(self) -> str:
        """When the copy was written, in local time, for a dialog."""
        try:
            return datetime.fromisoformat(self.written).astimezone().strftime("%Y-%m-%d %H:%M")
        except ValueError:
            return "an unknown time"


@dataclass(frozen=True)
class Lookup:
    """What was found for a path: a copy worth offering, or nothing, and a problem line if a copy was broken."""

    copy: RecoveryCopy | None = None
    problem: str | None = None


def recovery_folder() -> Path:
    override = os.environ.get(ENV_VAR)
    if override:
        return Path(override).expanduser()
    state = os.environ.get("XDG_STATE_HOME")
    base = Path(state).expanduser() if state else Path.home() / ".local" / "state"
    return base / "oddsbench" / "recovery"


def absolute(path: Path) -> str:
    try:
        return str(Path(path).expanduser().resolve())
    except (OSError, RuntimeError):  # RuntimeError: a loop of symbolic links
        return str(Path(path).expanduser().absolute())


def _digest(path: Path) -> str:
    return hashlib.sha256(absolute(path).encode("utf-8")).hexdigest()[:32]


def copy_path(path: Path) -> Path:
    """The live copy's file for ``path``: named from a hash of the absolute path (any characters are safe)."""
    return recovery_folder() / f"{_digest(path)}.json"


def kept_paths(path: Path) -> list[Path]:
    """The copies of ``path`` kept aside, newest first."""
    try:
        return sorted(recovery_folder().glob(f"{_digest(path)}{KEPT}*.json"), reverse=True)
    except OSError:
        return []


def text_sha(text: str | None) -> str | None:
    return None if text is None else hashlib.sha256(text.encode("utf-8")).hexdigest()


def _folder() -> Path:
    folder = recovery_folder()
    try:
        folder.mkdir(parents=True, exist_ok=True, mode=0o700)
    except OSError as error:
        raise OddsbenchError(f"{folder}: cannot hold recovery copies: {error.strerror or error}") from None
    return folder


def write_recovery(path: Path, text: str, disk_text: str | None) -> Path:
    """Keep ``text`` as the live recovery copy of ``path``. Raises OddsbenchError if it cannot be written."""
    _folder()
    record = {
        "format": FORMAT,
        "path": absolute(path),
        "text": text,
        "disk_sha256": text_sha(disk_text),
        "written": datetime.now(UTC).isoformat(timespec="seconds"),
    }
    return write_atomically(copy_path(path), json.dumps(record, ensure_ascii=False), force=True)


def find_recovery(path: Path, disk_text: str | None, skip: frozenset[Path] = frozenset()) -> Lookup:
    """The copy of ``path`` worth offering (the live one first, then those kept aside, newest
    first, leaving out ``skip``): none if absent, for another path, or equal to ``disk_text``."""
    problem = None
    for file in [copy_path(path), *kept_paths(path)]:
        if file in skip:
            continue
        found = _read_copy(file)
        if found.problem and problem is None:
            problem = found.problem
        copy = found.copy
        if copy is not None and copy.path == absolute(path) and copy.text != disk_text:
            return Lookup(copy, problem)
    return Lookup(problem=problem)


def _read_copy(file: Path) -> Lookup:
    try:
        raw = read_text_capped(file, MAX_COPY_BYTES)
    except FileRefused as refused:
        return Lookup() if refused.missing else Lookup(problem=f"recovery copy {file} ignored: {refused}")
    try:
        record = json.loads(raw)
        fields = {"path": record["path"], "text": record["text"], "disk_sha": record["disk_sha256"]}
        copy = RecoveryCopy(**fields, written=record["written"], file=file)
        if not all(isinstance(value, str) for value in (copy.path, copy.text, copy.written)):
            raise TypeError("path, text and written must be text")
        if copy.disk_sha is not None and not isinstance(copy.disk_sha, str):
            raise TypeError("disk_sha256 must be text")
    except (ValueError, KeyError, TypeError, RecursionError) as error:
        return Lookup(problem=f"recovery copy {file} ignored: it is broken ({str(error)[:120]})")
    if len(copy.text.encode("utf-8", "surrogatepass")) > MAX_FILE_BYTES:
        return Lookup(problem=f"recovery copy {file} ignored: its text is over the limit of {MAX_FILE_BYTES:,} bytes")
    return Lookup(copy)


def keep_copy(copy: RecoveryCopy) -> RecoveryCopy:
    """Move the live copy aside so later edits (and an undo) leave it alone; a kept copy stays as it is."""
    if copy.file is None or copy.kept:
        return copy
    stamp = datetime.now(UTC).strftime("%Y%m%dT%H%M%S%f")
    aside = copy.file.with_name(f"{copy.file.stem}{KEPT}{stamp}.json")
    try:
        os.replace(copy.file, aside)
    except OSError as error:
        raise OddsbenchError(f"recovery copy {copy.file} could not be kept aside: {error.strerror or error}") from None
    return replace(copy, file=aside)


def discard_copy(copy: RecoveryCopy) -> None:
    """Remove one copy (live or kept) after the user restored or discarded it."""
    if copy.file is not None:
        with contextlib.suppress(OSError):
            copy.file.unlink()


def discard_recovery(path: Path) -> None:
    """Remove the live copy of ``path`` if there is one (a failure to remove is not worth stopping for)."""
    with contextlib.suppress(OSError):
        copy_path(path).unlink()


@dataclass
class Claim:
    """A workbench's claim on a path's recovery copies. ``owned`` False: another live workbench
    (process ``holder``) has them; ``problem``: why no lock could be taken (copies work unlocked)."""

    owned: bool
    holder: int | None = None
    problem: str | None = None
    _descriptor: int | None = None
    _lock: Path | None = None

    def release(self) -> None:
        """Give the claim up (the process ending does the same)."""
        if self._descriptor is None:
            return
        with contextlib.suppress(OSError):
            if self._lock is not None:
                os.unlink(self._lock)  # while still locked: a later claimant makes a fresh file
        with contextlib.suppress(OSError):
            os.close(self._descriptor)
        self._descriptor = None


def claim_recovery(path: Path) -> Claim:
    """Claim ``path``'s copies for this process, or learn which process has them."""
    try:
        lock = _folder() / f"{_digest(path)}.lock"
    except OddsbenchError as error:
        return Claim(owned=True, problem=str(error))
    for _ in range(5):  # the holder may remove the lock file between our open and our lock
        try:
            descriptor = os.open(lock, os.O_RDWR | os.O_CREAT | os.O_NOFOLLOW | os.O_NONBLOCK | os.O_CLOEXEC, 0o600)
        except OSError as error:
            return Claim(owned=True, problem=f"recovery lock {lock} cannot be opened: {error.strerror or error}")
        try:
            status = os.fstat(descriptor)
            refusal = kind_refusal(status.st_mode)
            if refusal is not None:
                os.close(descriptor)
                return Claim(owned=True, problem=f"recovery lock {lock} {refusal}")
            try:
                fcntl.flock(descriptor, fcntl.LOCK_EX | fcntl.LOCK_NB)
            except OSError as error:
                if error.errno not in (errno.EWOULDBLOCK, errno.EAGAIN, errno.EACCES):
                    raise
                holder = _holder(descriptor)
                os.close(descriptor)
                return Claim(owned=False, holder=holder)
            try:
                same = os.stat(lock, follow_symlinks=False).st_ino == status.st_ino
            except FileNotFoundError:
                same = False
            if not same:
                os.close(descriptor)
                continue
            os.ftruncate(descriptor, 0)
            os.write(descriptor, f"{os.getpid()}\n".encode())
            return Claim(owned=True, _descriptor=descriptor, _lock=lock)
        except OSError as error:
            with contextlib.suppress(OSError):
                os.close(descriptor)
            return Claim(owned=True, problem=f"recovery lock {lock}: {error.strerror or error}")
    return Claim(owned=True, problem=f"recovery lock {lock} kept changing; copies are written unlocked")


def _holder(descriptor: int) -> int | None:
    """The process id the holder wrote into the lock file (None if unreadable)."""
    try:
        written = os.pread(descriptor, 32, 0).decode("ascii").strip()
        return int(written) if written.isdigit() else None
    except (OSError, UnicodeDecodeError):
        return None
