"""The Edit view's commands that need a question first: add (which kind, which name), rename, delete
(naming what refers to it), change the kind of a state, and the actions of a decision. Each asks in
a dialog, then posts one ``EditRequested`` on the screen, which applies it like any other edit (and
makes it undoable)."""

from __future__ import annotations

from collections.abc import Callable

from textual.screen import Screen

from oddsbench.model.document import RulesetDocument
from oddsbench.tui.screens.dialogs import AskFields, AskName, Choose
from oddsbench.tui.widgets.edits import EditRequested
from oddsbench.tui.widgets.navigator import FAMILY, STATE, STRATEGY

KIND_WORDS = {"outcomes": "plain outcomes", "choices": "a decision", "end": "an end state"}
MAX_LISTED = 6


def _post(screen: Screen, edit, label: str, select: str | None = None, done=None) -> None:
    screen.post_message(EditRequested(edit, label, select=select, done=done))


def _free(taken: set[str], what: str) -> Callable[[str], str | None]:
    def check(name: str) -> str | None:
        if not name:
            return f"a {what} name is needed"
        return f"a {what} named {name!r} already exists" if name in taken else None

    return check


def _listing(places: list[str]) -> str:
    shown = "; ".join(places[:MAX_LISTED])
    return shown + (f"; and {len(places) - MAX_LISTED} more" if len(places) > MAX_LISTED else "")


def _counted(what: str) -> Callable[[object], str | None]:
    """A message for an edit that returns how many strategy entries (or rules) it changed."""
    return lambda count: f"{count} strategy entr{'y' if count == 1 else 'ies'} {what}" if count else None


# ----- the list: add, rename, delete, kind -----


def entry_command(screen: Screen, document: RulesetDocument, command: str, entry: str | None, members=None) -> None:
    """A command from the list on the highlighted ``entry`` (``state:``, ``family:``, ``strategy:`` or a head entry)."""
    if command == "add":
        _ask_kind_to_add(screen, document, entry)
    elif command == "add-end":
        _add_state(screen, document, "end")
    elif entry is None:
        return
    elif command == "rename":
        _rename(screen, document, entry)
    elif command == "delete":
        _delete(screen, document, entry, members or {})
    elif command == "kind" and entry.startswith(STATE):
        ask_kind(screen, document, entry[len(STATE) :], False)
    elif command == "kind" and entry.startswith(FAMILY):
        ask_kind(screen, document, entry[len(FAMILY) :], True)


def _ask_kind_to_add(screen: Screen, document: RulesetDocument, entry: str | None) -> None:
    copy = entry[len(STRATEGY) :] if entry and entry.startswith(STRATEGY) else None
    answers = [("p", "Plain state"), ("d", "Decision state"), ("e", "End state"), ("f", "Family of states")]
    answers.append(("s", f"Strategy (a copy of {copy!r})" if copy else "Strategy"))

    def chosen(answer: str) -> None:
        if answer in ("p", "e"):
            _add_state(screen, document, "outcomes" if answer == "p" else "end")
        elif answer == "d":
            _add_decision(screen, document)
        elif answer == "f":
            _add_family(screen, document)
        elif answer == "s":
            _add_strategy(screen, document, copy)

    screen.app.push_screen(Choose("Add what?", answers), chosen)


def _add_state(screen: Screen, document: RulesetDocument, kind: str) -> None:
    def added(name: str | None) -> None:
        if name:
            _post(screen, lambda doc: doc.add_state(name, kind), f"new state {name}", STATE + name)

    question = "Name of the new end state" if kind == "end" else "Name of the new state"
    screen.app.push_screen(AskName(question, check=_free(set(document.state_names()), "state")), added)


def _add_decision(screen: Screen, document: RulesetDocument) -> None:
    free = _free(set(document.state_names()), "state")

    def check(values: dict[str, str]) -> str | None:
        actions = [a.strip() for a in values["actions"].split(",") if a.strip()]
        if not actions:
            return "actions: name at least one, e.g. hit, stand"
        if len(set(actions)) != len(actions):
            return "actions: each name once"
        return free(values["name"])

    def added(values: dict[str, str] | None) -> None:
        if values:
            name = values["name"]
            actions = tuple(a.strip() for a in values["actions"].split(",") if a.strip())
            _post(screen, lambda doc: doc.add_state(name, "choices", actions), f"new decision {name}", STATE + name)

    fields = [("name", "state name", ""), ("actions", "actions", "hit, stand")]
    screen.app.push_screen(AskFields("New decision state: the player chooses an action", fields, check), added)


def _add_family(screen: Screen, document: RulesetDocument) -> None:
    free = _free(set(document.family_names()), "family")

    def check(values: dict[str, str]) -> str | None:
        if not values["variable"].isidentifier():
            return "index variable: letters, digits and _ (not starting with a digit)"
        return free(values["name"])

    def added(values: dict[str, str] | None) -> None:
        if values:
            name = values["name"]
            _post(
                screen,
                lambda doc: doc.add_family(name, values["state"], values["variable"], values["from"], values["to"]),
                f"new family {name}",
                FAMILY + name,
            )

    fields = [
        ("name", "family name", ""),
        ("state", "member names", ""),
        ("variable", "index variable", "i"),
        ("from", "from", "0"),
        ("to", "to", "9"),
    ]
    detail = 'Member names hold the index in braces, e.g. "total-{i}" (empty: the family name, a dash, {i}).'
    screen.app.push_screen(AskFields("New family of states", fields, check, detail), added)


def _add_strategy(screen: Screen, document: RulesetDocument, copy: str | None) -> None:
    owners = document.decision_owners()
    default = next((document.actions(owner, family)[0] for owner, family in owners), None)

    def added(name: str | None) -> None:
        if name:
            _post(screen, lambda doc: doc.add_strategy(name, copy, default), f"new strategy {name}", STRATEGY + name)

    question = f"Name of the new strategy (a copy of {copy!r})" if copy else "Name of the new strategy"
    screen.app.push_screen(AskName(question, check=_free(set(document.strategy_names()), "strategy")), added)


def _rename(screen: Screen, document: RulesetDocument, entry: str) -> None:
    for prefix, what, names, rename, follow in (
        (STATE, "state", document.state_names(), "rename_state", "every reference follows"),
        (FAMILY, "family", document.family_names(), "rename_family", "its strategy rules follow"),
        (STRATEGY, "strategy", document.strategy_names(), "rename_strategy", ""),
    ):
        if not entry.startswith(prefix):
            continue
        old = entry[len(prefix) :]
        free = _free(set(names), what)

        def renamed(name: str | None, old=old, prefix=prefix, rename=rename) -> None:
            if name and name != old:
                _post(screen, lambda doc: getattr(doc, rename)(old, name), f"rename {old} to {name}", prefix + name)

        question = f"Rename {what} {old!r}" + (f" ({follow})" if follow else "")
        screen.app.push_screen(
            AskName(question, old, check=lambda n, old=old, free=free: None if n == old else free(n)), renamed
        )
        return


def _delete(screen: Screen, document: RulesetDocument, entry: str, members) -> None:
    if entry.startswith(STATE):
        name = entry[len(STATE) :]
        references = document.state_references(name)
        edit, label, what = (lambda doc: doc.delete_state(name)), f"delete state {name}", f"state {name!r}"
    elif entry.startswith(FAMILY):
        name = entry[len(FAMILY) :]
        made = {state for state, member in members.items() if member.family == name}
        references = document.family_references(name) + document.references_to(made, skip_family=name)
        edit, label, what = (lambda doc: doc.delete_family(name)), f"delete family {name}", f"family {name!r}"
    elif entry.startswith(STRATEGY):
        name = entry[len(STRATEGY) :]
        references = []
        edit, label, what = (lambda doc: doc.delete_strategy(name)), f"delete strategy {name}", f"strategy {name!r}"
    else:
        return

    def deleted(answer: str = "d") -> None:
        if answer == "d":
            _post(screen, edit, label)
            screen.notify(f"deleted {what}: Ctrl+Z brings it back")

    if not references:
        deleted()
        return
    screen.app.push_screen(
        Choose(
            f"Delete {what}? It is named in {len(references)} place{'s' if len(references) != 1 else ''}.",
            [("d", "Delete"), ("c", "Cancel")],
            detail=f"Named by: {_listing(references)}. Those references will point nowhere.",
        ),
        deleted,
    )


def ask_kind(screen: Screen, document: RulesetDocument, name: str, family: bool) -> None:
    """Turn a state (or a family's members) into plain outcomes, a decision or an end state."""
    kind = document.owner_kind(name, family)
    options = [("p", "Plain outcomes"), ("d", "A decision")] + ([] if family else [("e", "An end state")])
    answers = [(key, label) for key, label in options if {"p": "outcomes", "d": "choices", "e": "end"}[key] != kind]
    what = f"{'Family' if family else 'State'} {name!r}"

    def chosen(answer: str) -> None:
        if answer == "p":
            _post(screen, lambda doc: doc.make_plain(name, family), f"{name}: plain outcomes", done=_counted("dropped"))
        elif answer == "e":
            _post(screen, lambda doc: doc.make_end(name), f"{name}: end state", done=_counted("dropped"))
            screen.notify(f"{name!r} now ends the round: Ctrl+Z brings its outcomes back")
        elif answer == "d":

            def named(action: str | None) -> None:
                if action:
                    _post(
                        screen,
                        lambda doc: doc.make_decision(name, action, family),
                        f"{name}: a decision",
                        done=_counted("written"),
                    )

            question = "Name of the action its outcomes become" if kind == "outcomes" else "Name of its first action"
            screen.app.push_screen(AskName(question, "play"), named)

    screen.app.push_screen(Choose(f"{what} has {KIND_WORDS[kind]}. Make it:", answers + [("c", "Cancel")]), chosen)


# ----- the outcome table: actions -----


def outcome_command(
    screen: Screen, document: RulesetDocument, command: str, owner: str, family: bool, action: str | None
) -> None:
    """``add-action``, ``rename-action``, ``delete-action`` or ``kind``, from the outcome table."""
    actions = document.actions(owner, family)
    free = _free(set(actions), "action")
    if command == "kind":
        ask_kind(screen, document, owner, family)
    elif command == "add-action":

        def added(name: str | None) -> None:
            if name:
                _post(screen, lambda doc: doc.add_action(owner, name, family), f"new action {name} in {owner}")

        question = f"New action in {owner!r}" if actions else f"{owner!r} becomes a decision: name its first action"
        screen.app.push_screen(AskName(question, check=free), added)
    elif action is None:
        screen.notify("these are plain outcomes: c adds an action (the state becomes a decision)")
    elif command == "rename-action":

        def renamed(name: str | None) -> None:
            if name and name != action:
                _post(
                    screen,
                    lambda doc: doc.rename_action(owner, action, name, family),
                    f"rename action {action} to {name}",
                    done=_counted("follow"),
                )

        check = lambda n: None if n == action else free(n)  # noqa: E731
        screen.app.push_screen(AskName(f"Rename action {action!r} (strategies follow)", action, check), renamed)
    elif command == "delete-action":
        if len(actions) == 1:
            screen.notify("a decision needs an action: k turns the state into plain outcomes", severity="warning")
            return

        def deleted(answer: str) -> None:
            if answer == "d":
                _post(
                    screen,
                    lambda doc: doc.delete_action(owner, action, family),
                    f"delete action {action}",
                    done=_counted("dropped"),
                )

        screen.app.push_screen(
            Choose(f"Delete action {action!r} and its outcomes?", [("d", "Delete"), ("c", "Cancel")]), deleted
        )


# ----- parameters -----


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
                _post(screen, lambda doc: doc.add_param(new, "0"), f"new parameter {new}")

        screen.app.push_screen(AskName("Name of the new parameter", check=check), added)
    elif command == "delete" and name:
        gone = name
        _post(screen, lambda doc: doc.delete_param(gone), f"delete parameter {gone}")
    elif command == "tune" and name:
        target_command(screen, document, name)


def target_command(screen: Screen, document: RulesetDocument, name: str) -> None:
    """The target dialog on parameter ``name``; the value chosen there is one undoable edit."""
    from oddsbench.tui.screens.tune_dialog import TuneDialog

    def applied(value: str | None) -> None:
        if value:
            _post(screen, lambda doc: doc.set_param(name, value), f"target: {name} = {value}")
            screen.notify(f"{name} set to {value}: Ctrl+Z brings the old value back")

    now = dict(document.params()).get(name, "")
    source = getattr(getattr(screen, "session", None), "source", "ruleset")
    strategy = getattr(screen, "strategy", None)
    screen.app.push_screen(TuneDialog(document.text(), source, name, now, strategy), applied)
