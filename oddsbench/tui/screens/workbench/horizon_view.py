"""The Horizon view (F10) on the workbench screen: the figures after N rounds of the open game under
the strategy selected (``s``), solved in the background whenever the text, the rounds or the
strategy change while the view is shown; a list of rounds that does not read keeps the last good
figures, marked.

A mixin of ``WorkbenchScreen``, as ``figure_views.py`` is; message handlers are named ``on_...``
so Textual finds them through the screen's class.
"""

from __future__ import annotations

from oddsbench.model.defaults import DEFAULT_HORIZON_ROUNDS
from oddsbench.model.errors import OddsbenchError
from oddsbench.tui.analysis import strategy_to_play
from oddsbench.tui.horizons import RoundsRefused
from oddsbench.tui.screens.workbench import background
from oddsbench.tui.screens.workbench.background import HORIZON, Comparison, Job
from oddsbench.tui.widgets.horizon import HorizonPanel

CANCELLED = "solve cancelled: Ctrl+R solves again"


class HorizonViews:
    """State and behaviour of the Horizon view (mixed into ``WorkbenchScreen``)."""

    def init_horizon_view(self) -> None:
        self.horizon_rounds = DEFAULT_HORIZON_ROUNDS
        self.horizon_comparison = Comparison()
        self.horizon_cancelled = False

    @property
    def horizon_result(self):
        """The figures after N rounds (or why they could not be found), as last solved."""
        return self.horizon_comparison.result

    def solve_horizon(self) -> None:
        """Solve the horizon unless this text, these rounds and this strategy are solved already."""
        ruleset = self.reading.ruleset if self.reading else None
        if ruleset is None:
            return
        strategy = strategy_to_play(ruleset, self.strategy)  # before the first round is solved too
        comparison = self.horizon_comparison
        if comparison.ask((self.session.text, self.horizon_rounds, strategy)):
            self.horizon_cancelled = False
            self._show_horizon()
            self._start(Job(HORIZON, comparison.key), background.horizon, ruleset, strategy, self.horizon_rounds)

    def _horizon_done(self, key: tuple, result) -> None:
        comparison = self.horizon_comparison
        if isinstance(result, RoundsRefused):
            # the core refused these rounds (too many values for the law): the last good figures stay
            if comparison.refused(key):
                self.query_one(HorizonPanel).show_rounds_problem(result.message)
                self._show_horizon()
            return
        if key == comparison.key:
            self.horizon_cancelled = result is None
        if comparison.ended(key, result):
            self._show_horizon()

    def _show_horizon(self) -> None:
        stale: str | bool = self.reading is not None and self.reading.ruleset is None
        if self.horizon_cancelled and not stale:
            stale = CANCELLED
        comparison = self.horizon_comparison
        result = comparison.result
        panel = self.query_one(HorizonPanel)
        panel.show(result, stale=stale, busy=comparison.busy, kind=self.cells)

    def escape_in_horizon(self) -> None:
        """Esc with nothing to cancel: from the rounds field back to the table."""
        table = self.query_one("#horizon-table")
        if table.display and not table.has_focus:
            table.focus()

    def on_horizon_panel_rounds_changed(self, event: HorizonPanel.RoundsChanged) -> None:
        """New rounds: solved at once; a list that does not read keeps the last good figures, marked."""
        from oddsbench.core.horizons import parse_rounds

        event.stop()
        panel = self.query_one(HorizonPanel)
        try:
            rounds = parse_rounds(event.text)
        except OddsbenchError as error:
            panel.show_rounds_problem(str(error))
            self._show_horizon()
            return
        panel.show_rounds_problem("")
        self.horizon_rounds = rounds
        self._show_horizon()
        self.solve_horizon()
