"""Where everything sits on the workbench: the view switcher (edit, round, strategies, sessions,
simulation, horizon, source), the detail pane under the views of figures, and the summary, the one-line
cautions and the keys that stay below every view."""

from __future__ import annotations

from textual.app import ComposeResult
from textual.containers import Horizontal, Vertical
from textual.widgets import ContentSwitcher, Footer, ProgressBar, Static

from oddsbench.tui import analysis
from oddsbench.tui.horizons import ROUNDS_TEXT
from oddsbench.tui.widgets.cautions import CautionsLine
from oddsbench.tui.widgets.deck_editor import DeckEditor
from oddsbench.tui.widgets.detail import DetailPane
from oddsbench.tui.widgets.family_editor import FamilyEditor
from oddsbench.tui.widgets.figure_grid import FigureGrid
from oddsbench.tui.widgets.figures import SummaryLine
from oddsbench.tui.widgets.horizon import HorizonPanel
from oddsbench.tui.widgets.navigator import Navigator
from oddsbench.tui.widgets.problems import ProblemsPanel
from oddsbench.tui.widgets.sessions import SessionsPanel
from oddsbench.tui.widgets.setup_editor import ParamsEditor, SessionEditor, SetupEditor
from oddsbench.tui.widgets.simulation import SimulationPanel
from oddsbench.tui.widgets.source_view import SourceView
from oddsbench.tui.widgets.state_editor import StateEditor
from oddsbench.tui.widgets.strategies import StrategiesPanel
from oddsbench.tui.widgets.strategy_editor import StrategyEditor
from oddsbench.tui.widgets.topbar import TopBar

FIGURE_VIEWS = ("round", "strategies", "sessions", "simulation", "horizon")  # the views with a detail pane


def workbench_layout() -> ComposeResult:
    """The widgets of one workbench, by id; the styles are in ``tui/styles/workbench.tcss``."""
    yield TopBar("", id="topbar")
    with ContentSwitcher(initial="edit", id="views"):
        with Horizontal(id="edit"):
            yield Navigator(id="navigator")
            with Vertical(id="editor-area"):
                with ContentSwitcher(initial="state-editor", id="editors"):
                    yield SetupEditor(id="setup-editor")
                    yield ParamsEditor(id="params-editor")
                    yield SessionEditor(id="session-editor")
                    yield DeckEditor(id="deck-editor")
                    yield StateEditor(id="state-editor")
                    yield FamilyEditor(id="family-editor")
                    yield StrategyEditor(id="strategy-editor")
                    yield Static("", id="toml-problem")
                yield ProblemsPanel(id="problems")
            with Vertical(id="side-figures"):
                yield Static("", classes="figures-heading", id="side-heading")
                yield FigureGrid(id="side-table", classes="figure-grid")
        with Vertical(id="round"):
            yield Static("", classes="figures-heading", id="round-heading")
            yield ProgressBar(total=None, show_eta=False, show_percentage=False, id="progress")
            yield FigureGrid(id="round-table", classes="figure-grid")
            yield Static("", id="law-heading", classes="section-heading")
            yield FigureGrid(id="law-table", classes="figure-grid return-grid")
            yield Static("", id="shares-heading", classes="section-heading")
            yield FigureGrid(id="shares-table", classes="figure-grid return-grid")
            yield Static("", id="round-notes", classes="notes")
        with Vertical(id="strategies"):
            yield StrategiesPanel(id="strategies-panel")
        with Vertical(id="sessions"):
            yield SessionsPanel(", ".join(analysis.DEFAULT_PLANS), id="sessions-panel")
        with Vertical(id="simulation"):
            yield SimulationPanel(id="simulation-panel")
        with Vertical(id="horizon"):
            yield HorizonPanel(ROUNDS_TEXT, id="horizon-panel")
        yield SourceView(id="source")
    yield DetailPane(id="detail")
    yield SummaryLine("", id="summary")
    yield CautionsLine(id="cautions")
    yield Footer()
