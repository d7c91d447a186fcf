"""The workbench application and its one factory, used by the CLI, the tests and the screenshots."""

from __future__ import annotations

import os
from collections.abc import Iterable
from pathlib import Path

from textual.app import App, SystemCommand
from textual.binding import Binding
from textual.screen import Screen

from oddsbench.model.atomic_write import write_text_atomically
from oddsbench.model.errors import OddsbenchError
from oddsbench.model.visible import visible
from oddsbench.tui.bundled import demo_ruleset
from oddsbench.tui.editing import EditSession
from oddsbench.tui.screens.dialogs import AskName, Choose
from oddsbench.tui.screens.help import HelpScreen
from oddsbench.tui.screens.open_file import NEW, OpenScreen
from oddsbench.tui.screens.workbench import WorkbenchScreen
from oddsbench.tui.screens.workbench.recovery import offer_recovery
from oddsbench.tui.templates import NEW_RULESET

STYLES = Path(__file__).parent / "styles"


class WorkbenchApp(App):
    """Holds the open file's screen; asks before anything that would lose unsaved edits."""

    CSS_PATH = [STYLES / "workbench.tcss", STYLES / "dialogs.tcss"]
    TITLE = "oddsbench"
    BINDINGS = [
        Binding("ctrl+q", "quit", "Quit", priority=True),
        Binding("f1", "help", "Help", priority=True),
        Binding("question_mark", "help", "Help", show=False),
        Binding("f9", "cautions", "Cautions in full", show=False, priority=True),
    ]

    def notify(self, message: str, *, title: str = "", severity="information", timeout=None, markup: bool = False):
        """Every notification as plain text: names and paths in it are never markup, never escapes."""
        super().notify(visible(message), title=visible(title), severity=severity, timeout=timeout, markup=False)

    def __init__(self, session: EditSession, folder: Path, missing: Path | None = None, cursor_blinks: bool = True):
        super().__init__()
        self.session = session
        self.folder = folder
        self.missing = missing
        self.cursor_blinks = cursor_blinks

    def on_mount(self) -> None:
        self.push_screen(WorkbenchScreen(self.session, self.folder))
        if self.missing is not None:
            self._offer_to_create(self.missing)
        else:
            self._offer_recovery()

    @property
    def workbench(self) -> WorkbenchScreen:
        for screen in reversed(self.screen_stack):
            if isinstance(screen, WorkbenchScreen):
                return screen
        raise LookupError("no workbench screen")

    # ----- opening -----

    def _offer_to_create(self, path: Path) -> None:
        def answered(answer: str) -> None:
            if answer == "c":
                try:
                    write_text_atomically(path, NEW_RULESET)
                    self._switch(EditSession.open(path))
                    self.notify(f"created {path} from the template")
                except OddsbenchError as error:
                    self.notify(str(error), severity="error")
            elif answer == "q":
                self.exit()
            else:
                self.notify(f"{path} was not created; showing {self.session.path}")

        self.push_screen(
            Choose(
                f"{path} does not exist. Create it from the template?",
                [("c", "Create"), ("d", "Show the demo"), ("q", "Quit")],
            ),
            answered,
        )

    def _switch(self, session: EditSession) -> None:
        """Replace the open file (the caller has already dealt with unsaved changes)."""
        self.session = session
        old = self.workbench
        old.recovery.release()  # the same file may be opened again: its claim must be free
        self.push_screen(WorkbenchScreen(session, self.folder))
        self.call_later(self._drop_screen, old)
        self._offer_recovery()

    def _offer_recovery(self) -> None:
        """Claim the open file's recovery copies and offer back what a killed session left."""
        screen = self.workbench
        offer_recovery(self, screen.recovery, self.session, screen.refresh_forms)

    async def _drop_screen(self, screen: WorkbenchScreen) -> None:
        if screen in self.screen_stack:
            self._screen_stack.remove(screen)
            await screen.remove()

    def _after_guard(self, then) -> None:
        """Run ``then`` once unsaved changes are saved or discarded (or straight away if none)."""
        session = self.workbench.session
        if not session.dirty:
            then()
            return

        def answered(answer: str) -> None:
            if answer == "s":
                screen = self.workbench
                if session.read_only:
                    screen.action_save_as()
                    return
                if screen.save_to(None):
                    then()
            elif answer == "d":
                self.workbench.drop_recovery()
                then()

        self.push_screen(
            Choose(
                "There are unsaved changes.",
                [("s", "Save"), ("d", "Discard them"), ("c", "Cancel")],
                detail=f"in {session.path or 'the new ruleset'}",
            ),
            answered,
        )

    def action_open(self) -> None:
        def chosen(choice: str | None) -> None:
            if choice is None:
                return
            if choice == NEW:
                self.action_new()
                return
            self._after_guard(lambda: self._open_path(Path(choice)))

        self.push_screen(OpenScreen(self.folder), chosen)

    def _open_path(self, path: Path) -> None:
        try:
            self._switch(EditSession.open(path))
        except OddsbenchError as error:
            self.notify(str(error), severity="error")

    def action_new(self) -> None:
        def named(value: str | None) -> None:
            if not value:
                return
            target = Path(value).expanduser()
            self._after_guard(lambda: self._switch(EditSession(NEW_RULESET, target, saved=False)))

        def check(value: str) -> str | None:
            if not value:
                return "a file name is needed"
            target = Path(value).expanduser()
            if target.exists():
                return f"{value} exists already: open it with Ctrl+O"
            return None if target.parent.is_dir() else f"no folder {target.parent}"

        self.push_screen(
            AskName("New ruleset from the template: file name", str(self.folder / "new-game.toml"), check=check), named
        )

    # ----- command palette -----

    def get_system_commands(self, screen: Screen) -> Iterable[SystemCommand]:
        """The workbench's own commands first, then Textual's (theme, keys, screenshot...)."""
        bench = self.workbench
        commands = (
            ("Open a ruleset", "bundled games, this folder, or a new one (Ctrl+O)", self.action_open),
            ("New ruleset from the template", "a small commented game to start from (Ctrl+N)", self.action_new),
            ("Save", "write the file atomically, comments kept (Ctrl+S)", bench.action_save),
            ("Save as", "write to another path (F12)", bench.action_save_as),
            ("Undo", "take back the last edit (Ctrl+Z)", bench.action_undo),
            ("Redo", "make the undone edit again (Ctrl+Y)", bench.action_redo),
            ("Edit view", "states, outcomes, setup and parameters (F2)", lambda: bench.action_view("edit")),
            ("Round figures", "every figure of one round, exact and decimal (F3)", lambda: bench.action_view("round")),
            (
                "Strategies",
                "named strategies beside the best play, where each loses (F4)",
                lambda: bench.action_view("strategies"),
            ),
            ("Sessions", "bankroll plans side by side, two charts (F5)", lambda: bench.action_view("sessions")),
            ("Source", "the file as text (F6)", lambda: bench.action_view("source")),
            (
                "Simulation",
                "play at random: estimates beside the exact figures (F7)",
                lambda: bench.action_view("simulation"),
            ),
            ("Write a report", "Markdown, CSV or JSON, as oddsbench report writes it (F8)", bench.action_write_report),
            (
                "Horizon",
                "the total after N rounds: chance ahead, return range, log-scale charts (F10)",
                lambda: bench.action_view("horizon"),
            ),
            ("Cautions", "the cautions in full (F9)", self.action_cautions),
            ("Solve again", "re-run the round solve; in Simulation, run (Ctrl+R)", bench.action_resolve),
            ("Help", "every key (F1)", self.action_help),
        )
        for title, help_text, callback in commands:
            yield SystemCommand(title, help_text, callback)
        yield from super().get_system_commands(screen)

    # ----- help and quitting -----

    def action_help(self) -> None:
        if isinstance(self.screen, HelpScreen):
            return
        self.push_screen(HelpScreen(help_areas()))

    def action_cautions(self) -> None:
        from oddsbench.tui.widgets.cautions import CautionsScreen

        if not isinstance(self.screen, CautionsScreen):
            self.push_screen(CautionsScreen())

    async def action_quit(self) -> None:
        self._after_guard(self.exit)


def help_areas() -> list[tuple[str, list]]:
    """Every key by where it works, read from the bindings themselves (help and README agree with them)."""
    from oddsbench.tui.widgets.deck_editor import CardCounts, DeckEditor
    from oddsbench.tui.widgets.figure_grid import FigureGrid
    from oddsbench.tui.widgets.navigator import Navigator
    from oddsbench.tui.widgets.setup_editor import ParamsEditor
    from oddsbench.tui.widgets.state_editor import OutcomeTable
    from oddsbench.tui.widgets.strategy_editor import StrategyTable

    return [
        ("Everywhere", list(WorkbenchApp.BINDINGS) + list(WorkbenchScreen.BINDINGS)),
        ("State list (left)", list(Navigator.BINDINGS)),
        ("Outcome table", list(OutcomeTable.BINDINGS)),
        ("Strategy table", list(StrategyTable.BINDINGS)),
        ("Parameters", list(ParamsEditor.BINDINGS)),
        ("Deck", list(CardCounts.BINDINGS) + list(DeckEditor.BINDINGS)),
        ("Tables of figures (Round, Strategies, Sessions, Simulation, Horizon)", list(FigureGrid.BINDINGS)),
        (
            "Fields",
            [
                Binding("tab", "", "next field"),
                Binding("shift+tab", "", "previous field"),
                Binding("enter", "", "next field (in Simulation: run)"),
                Binding("escape", "", "back to the table"),
            ],
        ),
        ("Command palette", [Binding("ctrl+p", "", "search every command by name")]),
    ]


def create_app(path: str | Path | None = None, folder: Path | None = None, cursor_blinks: bool = True) -> WorkbenchApp:
    """The workbench on ``path`` (a missing file is offered for creation), or on the bundled demo.

    Raises OddsbenchError for a file that cannot be read at all (the CLI turns it into exit 2).
    """
    folder = folder or Path.cwd()
    missing = None
    target = Path(path).expanduser() if path is not None else None
    if target is not None and not os.path.lexists(target):  # a loop or a dangling link is read (and refused) below
        missing, target = target, None
    if target is None:
        demo = demo_ruleset()
        session = EditSession.open(demo) if demo else EditSession(NEW_RULESET, None, saved=False)
    else:
        if target.is_dir():
            raise OddsbenchError(f"{target}: is a folder, not a ruleset file")
        session = EditSession.open(target)
    return WorkbenchApp(session, folder, missing, cursor_blinks)
