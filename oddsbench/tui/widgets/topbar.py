"""The line at the top: the views and their keys, the open file, and what the workbench is doing."""

from __future__ import annotations

from rich.text import Text
from textual.widgets import Static

from oddsbench.tui.editing import EditSession
from oddsbench.tui.plain import plain

VIEWS = (
    ("edit", "Edit", "f2"),
    ("round", "Round", "f3"),
    ("strategies", "Strategies", "f4"),
    ("sessions", "Sessions", "f5"),
    ("source", "Source", "f6"),
    ("simulation", "Simulation", "f7"),
)
SHORT_LABELS = {"strategies": "Strat", "sessions": "Sess", "source": "Src", "simulation": "Sim"}
ROOMY = 100  # columns from which the bar spells every label out


class TopBar(Static):
    """Shows what the screen gives it (attributes down) and keeps no state of its own."""

    def show(self, current: str, session: EditSession, solving: bool, note: str) -> None:
        """``current`` is the view shown; ``note`` says what happened last (a cancel, a failure)."""
        path = session.path
        wide = self.app.size.width >= ROOMY
        text = Text()
        if wide:
            text.append(" oddsbench ", style="bold reverse")
        for view, label, key in VIEWS:
            style = "bold reverse" if view == current else "dim"
            shown = label if wide else SHORT_LABELS.get(view, label)
            text.append(f" {key.upper()} {shown} ", style=style)
        text.append(plain(f"  {path.name if path else 'new ruleset'}"))
        if session.read_only and path is not None and wide:
            text.append(" (bundled)", style="dim")
        if session.dirty:
            text.append(" ● modified" if wide else " ●", style="bold yellow")
        if solving:
            text.append("  solving… Esc cancels", style="bold magenta")
        elif note:
            text.append(plain(f"  {note}", "magenta"))
        self.update(text)
