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
    ("horizon", "Horizon", "f10"),
)
SHORT_LABELS = {"strategies": "Strat", "sessions": "Sess", "source": "Src", "simulation": "Sim", "horizon": "Hzn"}
ROOMY = 100  # columns from which the bar spells every label out


class TopBar(Static):
    """Shows what the screen gives it (attributes down) and keeps no state of its own."""

    def show(self, current: str, session: EditSession, solving: bool, note: str) -> None:
        """``current`` is the view shown; ``note`` says what happened last (a cancel, a failure)."""
        path = session.path
        width = self.app.size.width
        wide = width >= ROOMY
        status = Text()
        status.append(plain(f"  {path.name if path else 'new ruleset'}"))
        if session.read_only and path is not None and wide:
            status.append(" (bundled)", style="dim")
        if session.dirty:
            status.append(" ● modified" if wide else " ●", style="bold yellow")
        if solving:
            status.append("  solving… Esc cancels", style="bold magenta")
        elif note:
            status.append(plain(f"  {note}", "magenta"))
        views = _views(current, wide)
        if not wide and views.cell_len + min(status.cell_len, 40) > width:
            views = _views(current, wide, keys_only=True)  # F1 names every view
        text = Text()
        if wide:
            text.append(" oddsbench ", style="bold reverse")
        self.update(text + views + status)


def _views(current: str, wide: bool, keys_only: bool = False) -> Text:
    """The views and their keys, the current one marked: every label, short labels, or (narrowest)
    the current view's label alone beside the other views' keys."""
    text = Text()
    for view, label, key in VIEWS:
        style = "bold reverse" if view == current else "dim"
        shown = label if wide else SHORT_LABELS.get(view, label)
        if keys_only and view != current:
            text.append(f" {key.upper()} ", style=style)
        else:
            text.append(f" {key.upper()} {shown} ", style=style)
    return text
