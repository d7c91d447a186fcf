"""The sessions view: the plans to compare, their figures side by side, and two charts."""

from __future__ import annotations

from rich.text import Text
from textual import on
from textual.app import ComposeResult
from textual.containers import Horizontal, VerticalScroll
from textual.message import Message
from textual.widgets import DataTable, Input, Label, Static
from textual_plotext import PlotextPlot

from oddsbench.tui.analysis import RoundFailure, SessionsResult
from oddsbench.tui.plain import plain
from oddsbench.tui.widgets.fields import Field


class SessionsPanel(VerticalScroll):
    """Plans are typed here (not saved in the file); bankroll, goal and limits are the file's [session]."""

    class PlansChanged(Message):
        def __init__(self, text: str) -> None:
            super().__init__()
            self.text = text

    def __init__(self, plans: str, **kwargs) -> None:
        super().__init__(**kwargs)
        self.plans = plans

    def compose(self) -> ComposeResult:
        with Horizontal(classes="field-row"):
            yield Label("plans", classes="field-label")
            yield Field("plans", "timid, bold, flat:2", id="plans-field")
            yield Static("", id="plans-message", classes="field-message")
        yield Static(
            "bankroll, goal and limits: Edit view (F2), Session; plans: timid, bold, flat:B, fraction:F, "
            "kelly[:F], martingale:B:K, paroli:B:K, best",
            classes="dialog-detail",
        )
        yield Static("", id="sessions-heading", classes="figures-heading")
        yield DataTable(cursor_type="row", id="sessions-table")
        with Horizontal(id="charts"):
            yield PlotextPlot(id="goal-chart")
            yield PlotextPlot(id="length-chart")
        yield Static("", id="sessions-notes")

    def on_mount(self) -> None:
        self.query_one("#plans-field", Field).value = self.plans

    @on(Input.Changed, "#plans-field")
    def _plans_changed(self, event: Input.Changed) -> None:
        event.stop()
        if event.input.value != self.plans:
            self.plans = event.input.value
            self.post_message(self.PlansChanged(self.plans))

    def show_plan_problem(self, message: str) -> None:
        shown = self.query_one("#plans-message", Static)
        shown.update(plain(message))
        shown.set_class(bool(message), "-error")

    def show(self, result: SessionsResult | RoundFailure | None, stale: bool = False, busy: bool = False) -> None:
        heading = self.query_one("#sessions-heading", Static)
        table = self.query_one("#sessions-table", DataTable)
        charts = self.query_one("#charts")
        if result is None:
            heading.update(Text("solving the sessions…" if busy else "no figures yet", style="magenta"))
            return
        if isinstance(result, RoundFailure):
            heading.update(Text(result.message, style="yellow"))
            table.display = False
            charts.display = False
            return
        title = Text(result.heading, style="bold")
        if stale:
            title.append("  (last good figures)", style="yellow")
        if busy:
            title.append("  solving…", style="magenta")
        heading.update(title)
        table.display = True
        charts.display = bool(result.series)  # play with no goal has no goal chance and no length to draw
        table.clear(columns=True)
        table.add_columns(*[plain(header) for header in result.headers])
        for row in result.rows:
            table.add_row(plain(row[0]), *[Text(cell, justify="right") for cell in row[1:]])
        self._chart(
            "#goal-chart",
            "chance of the goal by starting bankroll",
            result,
            lambda s: (s.bankrolls, s.goal_chance),
            "bankroll",
        )
        self._chart(
            "#length-chart",
            "chance still playing after n rounds",
            result,
            lambda s: (s.rounds, s.still_playing),
            "rounds",
        )
        notes = self.query_one("#sessions-notes", Static)
        notes.update(plain("\n".join(f"note: {note}" for note in result.notes)))

    def _chart(self, selector: str, title: str, result: SessionsResult, pick, xlabel: str) -> None:
        widget = self.query_one(selector, PlotextPlot)
        plt = widget.plt
        plt.clear_data()
        plt.clear_figure()
        for series in result.series:
            xs, ys = pick(series)
            plt.plot(list(xs), list(ys), label=series.plan, marker="braille")
        plt.title(title)
        plt.xlabel(xlabel)
        plt.ylim(0, 1)
        widget.refresh()
