"""The simulation view: how many trials, which seed, rounds or whole sessions; a progress bar while
it runs (Esc cancels); then each estimate and its interval beside the exact figure, inside or OUTSIDE."""

from __future__ import annotations

from rich.text import Text
from textual import on
from textual.app import ComposeResult
from textual.containers import Horizontal, Vertical, VerticalScroll
from textual.message import Message
from textual.widgets import Input, Label, ProgressBar, Static, Switch

from oddsbench.tui.analysis import RoundFailure
from oddsbench.tui.plain import plain
from oddsbench.tui.simulating import SimulationResult
from oddsbench.tui.widgets.fields import Field
from oddsbench.tui.widgets.figure_grid import FigureGrid
from oddsbench.tui.widgets.stale import marked_heading

HINT = "Enter or Ctrl+R runs, Esc cancels · empty: default trials, a fresh seed · sessions: F5's plans"


class SimulationPanel(VerticalScroll):
    """Asks for a run with ``RunRequested``; the screen runs it and hands back progress and results."""

    class RunRequested(Message):
        """Run with the fields as typed (the screen reads and checks them)."""

        def __init__(self, trials: str, seed: str, sessions: bool) -> None:
            super().__init__()
            self.trials = trials
            self.seed = seed
            self.sessions = sessions

    def compose(self) -> ComposeResult:
        with Horizontal(classes="field-row", id="sim-fields"):
            yield Label("trials", classes="field-label")
            yield Field("trials", "default", moves_on_enter=False, id="sim-trials")
            yield Label("seed", classes="field-label sim-label")
            yield Field("seed", "fresh", moves_on_enter=False, id="sim-seed")
            yield Label("sessions", classes="field-label sim-label")
            yield Switch(False, id="sim-sessions")
        yield Static("", id="sim-message", classes="field-message")
        yield Static(HINT, classes="dialog-detail", id="sim-hint")
        yield ProgressBar(total=100, show_eta=False, id="sim-progress")
        yield Static(
            Text("Nothing simulated yet: Enter runs.", style="dim"), id="sim-heading", classes="figures-heading"
        )
        yield Vertical(id="sim-parts")
        yield Static("", id="sim-verdict")
        yield Static("", id="sim-notes", classes="notes")

    def on_mount(self) -> None:
        self.query_one("#sim-progress").display = False

    def request(self) -> None:
        trials = self.query_one("#sim-trials", Field).value
        seed = self.query_one("#sim-seed", Field).value
        sessions = self.query_one("#sim-sessions", Switch).value
        self.post_message(self.RunRequested(trials, seed, sessions))

    @on(Input.Submitted)
    def _submitted(self, event: Input.Submitted) -> None:
        event.stop()
        self.request()

    @on(Switch.Changed)
    def _switched(self, event: Switch.Changed) -> None:
        event.stop()

    def show_message(self, message: str, error: bool = True) -> None:
        shown = self.query_one("#sim-message", Static)
        shown.update(plain(message))
        shown.set_class(error and bool(message), "-error")

    def started(self, total: int) -> None:
        bar = self.query_one("#sim-progress", ProgressBar)
        bar.update(total=total, progress=0)
        bar.display = True
        self.show_message("")

    def progress(self, done: int, total: int) -> None:
        self.query_one("#sim-progress", ProgressBar).update(total=total, progress=done)

    def ended(self) -> None:
        self.query_one("#sim-progress").display = False

    def show(
        self, result: SimulationResult | RoundFailure | None, stale: bool = False, kind: str | None = None
    ) -> None:
        heading = self.query_one("#sim-heading", Static)
        parts = self.query_one("#sim-parts", Vertical)
        if result is None:
            return
        if isinstance(result, RoundFailure):
            heading.update(plain(result.message, "yellow"))
            parts.remove_children()
            self.query_one("#sim-verdict", Static).update("")
            self.query_one("#sim-notes", Static).update("")
            return
        heading.update(marked_heading(result.heading, stale))
        grids = list(parts.query(FigureGrid))
        if len(grids) != len(result.parts):
            parts.remove_children()
            widgets = []
            for index, _ in enumerate(result.parts):
                widgets.append(Static("", classes="section-heading", id=f"sim-part-heading-{index}"))
                widgets.append(FigureGrid(classes="figure-grid", id=f"sim-table-{index}"))
            parts.mount_all(widgets)
            self.call_after_refresh(self._fill, result, kind)
        else:
            self._fill(result, kind)
        verdict = plain(result.verdict, "bold red" if result.outside else "green")
        self.query_one("#sim-verdict", Static).update(verdict)
        self.query_one("#sim-notes", Static).update(plain("\n".join(f"note: {note}" for note in result.notes)))

    def _fill(self, result: SimulationResult, kind: str | None) -> None:
        for index, (title, table) in enumerate(result.parts):
            headings = self.query(f"#sim-part-heading-{index}")
            grids = self.query(f"#sim-table-{index}")
            if not headings or not grids:
                return  # replaced by a newer result meanwhile
            headings.first(Static).update(plain(title, "bold"))
            headings.first().display = bool(title)
            grids.first(FigureGrid).show(table, kind)
