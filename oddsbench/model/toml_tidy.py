"""After a table or an entry is deleted, the file reads as a careful hand would have left it.

tomlkit deletes an item with the space and comments it holds, but the comments written above a
table's header belong (in tomlkit's reading) to the table before it: deleting a table leaves its
own comment dangling above the next one, deleting the table before takes the next one's comment
with it, and the blank lines on both sides of the deleted entry end up side by side (a doubled
blank line, or one at the end of the file). ``tidy_removal`` compares the text before and after
the deletion line by line and, at each place where lines were removed:

- drops the comment written directly above the deleted entry (no blank line between), unless it
  heads a run of entries that goes on after the deleted one (``# pays`` above ``win = 2`` and
  ``lose = 1``: deleting ``win`` keeps it);
- puts back the comment written directly above the next entry, if the deletion took it;
- leaves the larger of the two blank runs that stood around the deleted entry (none at the
  start or the end of the file).

Only blank and comment lines change: the result is checked to read as the same TOML values as
the text it tidies, and if it does not, that text is kept as it is.
"""

from __future__ import annotations

import re
import tomllib
from difflib import SequenceMatcher

_MATCHER_LIMIT = 4_000_000  # lines x lines: past this a rewrite (not a deletion) is left as it is
_HEADER = re.compile(r"\s*\[\[?\s*[^\[\],{}=]+?\s*\]\]?\s*(#.*)?")


def _blank(line: str) -> bool:
    return not line.strip()


def _comment(line: str) -> bool:
    return line.lstrip().startswith("#")


def _header(line: str) -> bool:
    return _HEADER.fullmatch(line.rstrip("\r\n")) is not None


def _opens(line: str) -> bool:
    """A line that opens an array or an inline table spread over lines (``outcomes = [``)."""
    body = line.split("#", 1)[0].rstrip()
    return body.endswith(("[", "{"))


def _entry(line: str) -> bool:
    """A line of an entry: a key or a row, not a header, a comment or a closing bracket."""
    stripped = line.strip()
    return bool(stripped) and not _comment(line) and not _header(line) and not stripped.startswith(("]", "}"))


def _blanks_before(lines: list[str], index: int) -> int:
    count = 0
    while index - count > 0 and _blank(lines[index - count - 1]):
        count += 1
    return count


def _blanks_after(lines: list[str], index: int) -> int:
    count = 0
    while index + count < len(lines) and _blank(lines[index + count]):
        count += 1
    return count


def tidy_removal(before: str, after: str) -> str:
    """``after`` (``before`` with entries deleted) with the space and comments around each deletion
    as a careful hand leaves them; ``after`` itself if tidying would change a value."""
    if before == after:
        return after
    old = before.splitlines(keepends=True)
    new = after.splitlines(keepends=True)
    newline = "\r\n" if (old and old[0].endswith("\r\n")) else "\n"
    lines = list(new)
    opcodes = _removals(old, new)
    if opcodes is None:
        return after  # not lines removed but lines rewritten: nothing to tidy
    for place in range(len(opcodes) - 1, -1, -1):
        tag, i1, i2, j1, _ = opcodes[place]
        if tag != "delete":
            continue
        floor = opcodes[place - 1][1] if place > 0 and opcodes[place - 1][0] == "equal" else i1
        while i1 > floor and old[i1 - 1] == old[i2 - 1]:  # the same deletion, read as starting earlier
            i1, i2, j1 = i1 - 1, i2 - 1, j1 - 1
        _close_gap(old, lines, i1, i2, j1, newline)
    tidied = "".join(lines)
    if after.endswith("\n") and not tidied.endswith("\n"):
        return after
    try:
        same = tomllib.loads(tidied) == tomllib.loads(after)
    except tomllib.TOMLDecodeError:
        return after
    return tidied if same else after


def _removals(old: list[str], new: list[str]) -> list[tuple[str, int, int, int, int]] | None:
    """The runs of ``old`` kept and removed to give ``new`` (as ``SequenceMatcher`` opcodes), found
    in one pass when ``new`` is ``old`` less some lines (a deletion: linear even in a long file);
    else by ``SequenceMatcher`` on the part between the common start and end, if that is short."""
    start = 0
    while start < min(len(old), len(new)) and old[start] == new[start]:
        start += 1
    end = 0
    while end < min(len(old), len(new)) - start and old[-1 - end] == new[-1 - end]:
        end += 1
    middle_old, middle_new = old[start : len(old) - end], new[start : len(new) - end]
    runs: list[tuple[str, int, int, int, int]] = []
    i = j = 0
    while i < len(middle_old) and j < len(middle_new):
        first = i
        while i < len(middle_old) and middle_old[i] != middle_new[j]:
            i += 1
        if i > first:
            runs.append(("delete", first, i, j, j))
        first = i
        while i < len(middle_old) and j < len(middle_new) and middle_old[i] == middle_new[j]:
            i, j = i + 1, j + 1
        if i > first:
            runs.append(("equal", first, i, j - (i - first), j))
    if j < len(middle_new):
        if len(middle_old) * len(middle_new) > _MATCHER_LIMIT:
            return None
        runs = SequenceMatcher(None, middle_old, middle_new, autojunk=False).get_opcodes()
        if any(tag in ("insert", "replace") for tag, *_ in runs):
            return None
    elif i < len(middle_old):
        runs.append(("delete", i, len(middle_old), j, j))
    shifted = [(tag, a + start, b + start, c + start, d + start) for tag, a, b, c, d in runs]
    return (
        [("equal", 0, start, 0, start)] * (start > 0)
        + shifted
        + [("equal", len(old) - end, len(old), len(new) - end, len(new))] * (end > 0)
    )


def _close_gap(old: list[str], lines: list[str], i1: int, i2: int, seam: int, newline: str) -> None:
    """Tidy one place where ``old[i1:i2]`` was removed (``lines[seam]`` follows it now)."""
    removed = old[i1:i2]
    lead = _blanks_after(removed, 0)
    trail = _blanks_before(removed, len(removed))
    core = removed[lead : len(removed) - trail]
    if not core:
        return  # only blank lines went: nothing to tidy
    above = _blanks_before(old, i1) + lead  # blank lines between the deleted entry and what came before
    below = trail + _blanks_after(old, i2)  # ... and what comes after
    # The comment directly above the next entry, if the deletion took it, goes back.
    if below == 0 and i2 < len(old) and not _blank(old[i2]):
        start = len(core)
        while start > 0 and _comment(core[start - 1]):
            start -= 1
        rest = core[:start]
        if start < len(core) and any(_entry(line) or _header(line) for line in rest):
            lines[seam:seam] = core[start:]
            below = _blanks_before(rest, len(rest))
    # The comment directly above the deleted entry goes with it, unless it heads a run that goes on.
    if above == 0:
        start = seam
        while start > 0 and _comment(lines[start - 1]):
            start -= 1
        if start < seam:
            first = start == 0 or _blank(lines[start - 1]) or _header(lines[start - 1]) or _opens(lines[start - 1])
            goes_on = below == 0 and seam < len(lines) and _entry(lines[seam])
            if not (first and goes_on):
                del lines[start:seam]
                seam = start
                above = _blanks_before(lines, seam)
    # One blank run where the entry was: the larger of the two around it; none at either end of the file.
    start, end = seam - _blanks_before(lines, seam), seam + _blanks_after(lines, seam)
    if start == 0:
        wanted = above
    elif end == len(lines):
        wanted = below
    else:
        wanted = max(above, below)
    if end - start != wanted:
        lines[start:end] = [newline] * wanted
