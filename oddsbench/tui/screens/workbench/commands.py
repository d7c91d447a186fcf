"""Adding, renaming and deleting states and parameters: a name dialog where one is needed, then one
``EditRequested`` posted on the screen, which applies it like any other edit (and makes it undoable)."""

from __future__ import annotations

from textual.screen import Screen

from oddsbench.model.document import RulesetDocument
from oddsbench.tui.screens.dialogs import AskName
from oddsbench.tui.widgets.edits import EditRequested
from oddsbench.tui.widgets.navigator import STATE


def state_command(screen: Screen, document: RulesetDocument, command: str, state: str | None) -> None:
    """``add``, ``add-end``, ``rename`` or ``delete`` a state, as asked from the list."""
    names = set(document.state_names())

    def free(name: str) -> str | None:
        if not name:
            return "a state name is needed"
        return f"a state named {name!r} already exists" if name in names else None

    if command in {"add", "add-end"}:
        kind = "end" if command == "add-end" else "outcomes"

        def added(name: str | None) -> None:
            if name:
                screen.post_message(
                    EditRequested(lambda doc: doc.add_state(name, kind), f"new state {name}", select=STATE + name)
                )

        question = "Name of the new end state" if kind == "end" else "Name of the new state"
        screen.app.push_screen(AskName(question, check=free), added)
    elif command == "rename" and state is not None:
        old = state

        def renamed(name: str | None) -> None:
            if name and name != old:
                screen.post_message(
                    EditRequested(
                        lambda doc: doc.rename_state(old, name), f"rename {old} to {name}", select=STATE + name
                    )
                )

        screen.app.push_screen(
            AskName(
                f"Rename state {old!r} (every reference follows)", old, check=lambda n: None if n == old else free(n)
            ),
            renamed,
        )
    elif command == "delete" and state is not None:
        name = state
        screen.post_message(EditRequested(lambda doc: doc.delete_state(name), f"delete state {name}"))
        screen.notify(f"deleted state {name!r}: Ctrl+Z brings it back")


def param_command(screen: Screen, document: RulesetDocument, command: str, name: str | None) -> None:
    """``add`` or ``delete`` a parameter, as asked from the parameter table."""
    if command == "add":
        taken = {existing for existing, _ in document.params()}

        def check(new: str) -> str | None:
            if not new.isidentifier():
                return "a parameter name must be letters, digits and _ (not starting with a digit)"
            return f"a parameter named {new!r} already exists" if new in taken else None

        def added(new: str | None) -> None:
            if new:
                screen.post_message(EditRequested(lambda doc: doc.add_param(new, "0"), f"new parameter {new}"))

        screen.app.push_screen(AskName("Name of the new parameter", check=check), added)
    elif command == "delete" and name:
        gone = name
        screen.post_message(EditRequested(lambda doc: doc.delete_param(gone), f"delete parameter {gone}"))
    elif command == "tune" and name:
        target_command(screen, document, name)


def target_command(screen: Screen, document: RulesetDocument, name: str) -> None:
    """The target dialog on parameter ``name``; the value chosen there is one undoable edit."""
    from oddsbench.tui.screens.tune_dialog import TuneDialog

    def applied(value: str | None) -> None:
        if value:
            screen.post_message(EditRequested(lambda doc: doc.set_param(name, value), f"target: {name} = {value}"))
            screen.notify(f"{name} set to {value}: Ctrl+Z brings the old value back")

    now = dict(document.params()).get(name, "")
    source = getattr(getattr(screen, "session", None), "source", "ruleset")
    strategy = getattr(screen, "strategy", None)
    screen.app.push_screen(TuneDialog(document.text(), source, name, now, strategy), applied)
