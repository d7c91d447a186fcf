"""The sessions view: the plans to compare, their figures side by side (with each plan's ruin with no
goal beside), and two charts with round ticks and a mark at the starting bankroll."""

from __future__ import annotations

from rich.text import Text
from textual import on
from textual.app import ComposeResult
from textual.containers import Horizontal, VerticalScroll
from textual.message import Message
from textual.widgets import Input, Label, Static
from textual_plotext import PlotextPlot

from oddsbench.report.chart_ticks import CHANCE_TICKS
from oddsbench.tui.analysis import RoundFailure, SessionsResult
from oddsbench.tui.plain import plain
from oddsbench.tui.widgets.fields import Field
from oddsbench.tui.widgets.figure_grid import FigureGrid
from oddsbench.tui.widgets.stale import marked_heading

PLAN_HINT = (
    "bankroll, goal: F2 > Session · plans: timid, bold, flat:B, fraction:F, kelly[:F], martingale:B:K, paroli:B:K, best"
)


class SessionsPanel(VerticalScroll):
    """Plans are typed here (not saved in the file); bankroll, goal and limits are the file's [session]."""

    class PlansChanged(Message):
        def __init__(self, text: str) -> None:
            super().__init__()
            self.text = text

    def __init__(self, plans: str, **kwargs) -> None:
        super().__init__(**kwargs)
        self.plans = plans
        self.plan_problem = ""

    def compose(self) -> ComposeResult:
        with Horizontal(classes="field-row"):
            yield Label("plans", classes="field-label")
            yield Field("plans", "timid, bold, flat:2", id="plans-field")
            yield Static("", id="plans-message", classes="field-message")
        yield Static(PLAN_HINT, classes="dialog-detail", id="plans-hint")
        yield Static("", id="sessions-heading", classes="figures-heading")
        yield FigureGrid(id="sessions-table", classes="figure-grid")
        with Horizontal(id="charts"):
            yield PlotextPlot(id="goal-chart")
            yield PlotextPlot(id="length-chart")
        yield Static("", id="sessions-notes", classes="notes")

    def on_mount(self) -> None:
        self.query_one("#plans-field", Field).value = self.plans

    @on(Input.Changed, "#plans-field")
    def _plans_changed(self, event: Input.Changed) -> None:
        event.stop()
        if event.input.value != self.plans:
            self.plans = event.input.value
            self.post_message(self.PlansChanged(self.plans))

    def show_plan_problem(self, message: str) -> None:
        self.plan_problem = message
        shown = self.query_one("#plans-message", Static)
        shown.update(plain(message))
        shown.set_class(bool(message), "-error")
        self.query_one("#plans-field", Field).set_class(bool(message), "-invalid")

    def show(
        self,
        result: SessionsResult | RoundFailure | None,
        stale: bool = False,
        busy: bool = False,
        kind: str | None = None,
    ) -> None:
        heading = self.query_one("#sessions-heading", Static)
        table = self.query_one("#sessions-table", FigureGrid)
        charts = self.query_one("#charts")
        if result is None:
            heading.update(Text("solving the sessions…" if busy else "no figures yet", style="magenta"))
            return
        if isinstance(result, RoundFailure):
            heading.update(plain(result.message, "yellow"))
            table.display = False
            charts.display = False
            self.query_one("#sessions-notes", Static).update("")
            return
        why = "the plans have a problem" if self.plan_problem else stale
        heading.update(marked_heading(result.heading, why, busy))
        table.display = True
        charts.display = bool(result.series)  # play with no goal has no goal chance and no length to draw
        table.show(result.table, kind)
        if result.series:
            self._chart("#goal-chart", result, "bankroll")
            self._chart("#length-chart", result, "rounds")
        notes = self.query_one("#sessions-notes", Static)
        notes.update(plain("\n".join(f"note: {note}" for note in result.notes)))

    def _chart(self, selector: str, result: SessionsResult, axis: str) -> None:
        widget = self.query_one(selector, PlotextPlot)
        plt = widget.plt
        plt.clear_data()
        plt.clear_figure()
        for series in result.series:
            if axis == "bankroll":
                xs, ys = series.bankrolls, series.goal_chance
            else:
                xs, ys = series.rounds, series.still_playing
            # one legend, on the goal chart (its top left stays clear: chances there start low); the
            # length chart's curves start at 1 in its top left, where a legend would hide them
            label = series.plan if axis == "bankroll" else None
            plt.plot(list(xs), list(ys), label=label, marker="braille")
        ticks = result.bankroll_ticks if axis == "bankroll" else result.round_ticks
        if ticks:
            plt.xticks([value for value, _ in ticks], [label for _, label in ticks])
            plt.xlim(ticks[0][0], ticks[-1][0])
        plt.yticks([value for value, _ in CHANCE_TICKS], [label for _, label in CHANCE_TICKS])
        plt.ylim(0, 1)
        if axis == "bankroll":
            plt.title("chance of the goal by starting bankroll")
            if result.bankroll is not None:
                plt.vline(result.bankroll, "white")
            plt.xlabel(f"bankroll (the line: yours, {result.bankroll_text})")
        else:
            plt.title("chance still playing after n rounds (plans coloured as on the left)")
            plt.xlabel("rounds")
        widget.refresh()
