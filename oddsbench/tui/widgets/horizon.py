"""The Horizon view: the numbers of rounds to look at, the figures after each side by side (one
column per N), the caution that belongs beside them, and two charts against N on a log scale: the
chance of being ahead, and the range the realised return to player lands in."""

from __future__ import annotations

from rich.text import Text
from textual import on
from textual.app import ComposeResult
from textual.containers import Horizontal, VerticalScroll
from textual.message import Message
from textual.widgets import Input, Label, Static
from textual_plotext import PlotextPlot

from oddsbench.report.cautions import HORIZON_CAUTIONS
from oddsbench.report.chart_ticks import CHANCE_TICKS
from oddsbench.tui.analysis import RoundFailure
from oddsbench.tui.horizons import HorizonView
from oddsbench.tui.plain import plain
from oddsbench.tui.widgets.fields import Field
from oddsbench.tui.widgets.figure_grid import FigureGrid
from oddsbench.tui.widgets.stale import marked_heading

ROUNDS_HINT = "N, N, ... · Tab: table · Shift+Tab, PgDn: charts · s: strategy · Esc: stop"
BAND_COLOURS = ("cyan", "blue", "magenta")  # one per band drawn, its low and high ends alike


class HorizonPanel(VerticalScroll):
    """The numbers of rounds are typed here (not saved in the file); the game is the open file."""

    class RoundsChanged(Message):
        def __init__(self, text: str) -> None:
            super().__init__()
            self.text = text

    def __init__(self, rounds: str, **kwargs) -> None:
        super().__init__(**kwargs)
        self.rounds = rounds
        self.rounds_problem = ""

    def compose(self) -> ComposeResult:
        with Horizontal(classes="field-row"):
            yield Label("rounds", classes="field-label")
            yield Field("rounds", "1, 10, 100", id="horizon-rounds")
            yield Static("", id="horizon-message", classes="field-message")
        yield Static(ROUNDS_HINT, classes="dialog-detail", id="horizon-hint")
        yield Static("", id="horizon-heading", classes="figures-heading")
        yield Static(Text(" ".join(HORIZON_CAUTIONS), style="#d8c8a8"), id="horizon-caution")
        yield FigureGrid(id="horizon-table", classes="figure-grid")
        with Horizontal(id="horizon-charts"):
            yield PlotextPlot(id="ahead-chart")
            yield PlotextPlot(id="return-chart")
        yield Static("", id="horizon-legend")
        yield Static("", id="horizon-notes", classes="notes")

    def on_mount(self) -> None:
        self.query_one("#horizon-rounds", Field).value = self.rounds

    @on(Input.Changed, "#horizon-rounds")
    def _rounds_changed(self, event: Input.Changed) -> None:
        event.stop()
        if event.input.value != self.rounds:
            self.rounds = event.input.value
            self.post_message(self.RoundsChanged(self.rounds))

    def show_rounds_problem(self, message: str) -> None:
        """A list of rounds that does not read (or that the core refuses): the line beside the field;
        the figures shown stay, marked as the last good ones."""
        self.rounds_problem = message
        shown = self.query_one("#horizon-message", Static)
        shown.update(plain(message))
        shown.set_class(bool(message), "-error")
        self.query_one("#horizon-rounds", Field).set_class(bool(message), "-invalid")

    def show(
        self,
        result: HorizonView | RoundFailure | None,
        stale: str | bool = False,
        busy: bool = False,
        kind: str | None = None,
    ) -> None:
        heading = self.query_one("#horizon-heading", Static)
        table = self.query_one("#horizon-table", FigureGrid)
        charts = self.query_one("#horizon-charts")
        if result is None:
            heading.update(Text("solving the rounds…" if busy else "no figures yet", style="magenta"))
            return
        if isinstance(result, RoundFailure):
            heading.update(plain(result.message, "yellow"))
            table.display = charts.display = False
            self.query_one("#horizon-notes", Static).update("")
            return
        why = "the rounds have a problem" if self.rounds_problem else stale
        text = marked_heading(result.heading, why, busy)
        text.no_wrap, text.overflow = True, "ellipsis"  # one line; the mark comes first, never cut off
        heading.update(text)
        table.display = charts.display = True
        table.show(result.table, kind)
        self._ahead_chart(result)
        self._band_chart(result)
        notes = self.query_one("#horizon-notes", Static)
        lines = [result.one_round] + [f"note: {note}" for note in result.notes]
        notes.update(plain("\n".join(lines)))

    def _axes(self, widget: PlotextPlot, result: HorizonView):
        plt = widget.plt
        plt.clear_data()
        plt.clear_figure()
        ticks = result.rounds_ticks
        plt.xticks([value for value, _ in ticks], [label for _, label in ticks])
        plt.xlim(ticks[0][0], ticks[-1][0])
        plt.xlabel("rounds N (log scale)")
        return plt

    def _ahead_chart(self, result: HorizonView) -> None:
        widget = self.query_one("#ahead-chart", PlotextPlot)
        plt = self._axes(widget, result)
        plt.plot(list(result.positions), list(result.ahead), marker="braille", color="green")
        plt.yticks([value for value, _ in CHANCE_TICKS], [label for _, label in CHANCE_TICKS])
        plt.ylim(0, 1)
        plt.title("chance ahead after N rounds")
        widget.refresh()

    def _band_chart(self, result: HorizonView) -> None:
        widget = self.query_one("#return-chart", PlotextPlot)
        plt = self._axes(widget, result)
        xs = list(result.positions)
        # the legend is a line under the charts: in a chart's top left it would hide where the bands start
        legend = Text("right: ", style="dim")
        for band, colour in zip(reversed(result.bands), BAND_COLOURS):
            plt.plot(xs, list(band.high), marker="braille", color=colour)
            plt.plot(xs, list(band.low), marker="braille", color=colour)
            legend.append("━━ ", style=colour)
            legend.append(f"{band.label}   ")
        if result.expected is not None:
            ends = [result.rounds_ticks[0][0], result.rounds_ticks[-1][0]]
            plt.plot(ends, [result.expected, result.expected], marker="braille", color="white")
            legend.append("━━ ", style="white")
            legend.append("expected return")
        self.query_one("#horizon-legend", Static).update(legend)
        ticks = result.band_ticks
        plt.yticks([value for value, _ in ticks], [label for _, label in ticks])
        plt.ylim(ticks[0][0], ticks[-1][0])
        plt.title(result.band_title)
        widget.refresh()
