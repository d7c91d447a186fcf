"""The mark on figures that are not the current input's: first on the heading, so no width cuts it off."""

from __future__ import annotations

from rich.text import Text

from oddsbench.tui.plain import plain

TEXT_PROBLEMS = "the text now has problems"


def marked_heading(heading: str, stale: str | bool = False, busy: bool = False) -> Text:
    """A view's heading, with "last good figures (why)" in front and "solving…" behind when they apply
    (``stale`` True: the text has problems; a string: another reason)."""
    text = Text()
    if stale:
        why = stale if isinstance(stale, str) else TEXT_PROBLEMS
        text.append(f"last good figures ({why})", style="bold black on yellow")
        text.append(" ")
    text.append(plain(heading, "bold"))
    if busy:
        text.append("  solving…", style="magenta")
    return text
