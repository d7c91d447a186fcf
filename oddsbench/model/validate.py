"""Checks on a read ruleset: exact sums, known targets, a round that can end, reachability."""

from __future__ import annotations

from collections.abc import Iterable, Mapping

from oddsbench.model.errors import Problem
from oddsbench.model.numbers import QQ, text
from oddsbench.model.ruleset import Outcome, Ruleset, State

MAX_LISTED_STATES = 8
MAX_SUGGESTIONS = 20
MAX_NAMES_TO_SUGGEST_FROM = 5_000


def validate(ruleset: Ruleset) -> list[Problem]:
    """Every problem with the ruleset's graph and sums, errors and warnings alike."""
    problems: list[Problem] = []
    source = ruleset.source

    def error(where: str, message: str) -> None:
        problems.append(Problem(source, where, message))

    def warn(where: str, message: str) -> None:
        problems.append(Problem(source, where, message, "warning"))

    names = set(ruleset.state_names)
    suggest = _Suggester(names)
    if ruleset.start and ruleset.start not in names:
        error("[ruleset], start", f"unknown state {ruleset.start!r}{suggest(ruleset.start)}")
    for state in ruleset.states:
        for label, outcomes in _outcome_lists(state):
            where = f"state {state.name!r}{label}"
            for index, outcome in enumerate(outcomes, start=1):
                if outcome.to not in names:
                    error(f"{where}, outcome {index}, to", f"unknown state {outcome.to!r}{suggest(outcome.to)}")
            if state.by_cards(outcomes):
                continue  # chosen by the cards: checked hand by hand when the deal is expanded
            total = sum((outcome.prob for outcome in outcomes), QQ(0))
            if total != 1:
                error(where, f"probabilities sum to {text(total)}, not 1")
    problems.extend(_check_strategies(ruleset))
    if ruleset.deck is not None:
        for state in ruleset.states:
            if "[" in state.name or "]" in state.name:
                error(
                    f"state {state.name!r}", "in a deck game state names cannot hold '[' or ']' (they mark the hands)"
                )
    for first, second in look_alike_names(ruleset.state_names):
        warn(
            f"state {second!r}",
            f"looks like state {first!r} ({ascii(second)} and {ascii(first)} differ only in case, width or "
            "the encoding of accents)",
        )
    if any(problem.is_error for problem in problems) or not ruleset.start:
        return problems

    graph = successor_graph(ruleset.states)
    reachable = reachable_from(ruleset.start, graph)
    ends = {state.name for state in ruleset.states if state.is_end}
    can_end = reaching(ends, graph)
    position = {name: i for i, name in enumerate(ruleset.state_names)}
    for trapped_set in trapped_sets(reachable - can_end, graph):
        ordered = sorted(trapped_set, key=position.__getitem__)
        error(f"state {ordered[0]!r}", f"the round can never end from here: trapped in {{{_listing(ordered)}}}")
    if ruleset.state(ruleset.start).is_end:
        warn("[ruleset], start", f"the start state {ruleset.start!r} is an end state, so a round ends at once")
    unreachable = [name for name in ruleset.state_names if name not in reachable]
    if unreachable:
        warn("", f"unreachable from start {ruleset.start!r}: {_listing(unreachable)}")
    return problems


def look_alike_names(names: Iterable[str]) -> list[tuple[str, str]]:
    """Pairs of distinct names that read the same (Unicode compatibility form, case folded):
    in a shared file, 'Won' beside 'won' or a composed beside a decomposed 'é' is a trap."""
    import unicodedata

    seen: dict[str, str] = {}
    pairs = []
    for name in names:
        key = unicodedata.normalize("NFKC", name).casefold()
        if key in seen and seen[key] != name:
            pairs.append((seen[key], name))
        else:
            seen.setdefault(key, name)
    return pairs


def _outcome_lists(state: State) -> Iterable[tuple[str, tuple[Outcome, ...]]]:
    if state.outcomes:
        yield "", state.outcomes
    for action, outcomes in state.choices:
        yield f", choice {action!r}", outcomes


def successor_graph(states: Iterable[State]) -> dict[str, set[str]]:
    """Each state's possible next states (probability above zero, under any choice)."""
    graph: dict[str, set[str]] = {}
    for state in states:
        targets = graph.setdefault(state.name, set())
        for _, outcomes in _outcome_lists(state):
            targets.update(outcome.to for outcome in outcomes if outcome.prob > 0)
    return graph


def reachable_from(start: str, graph: Mapping[str, set[str]]) -> set[str]:
    seen = {start}
    stack = [start]
    while stack:
        for target in graph.get(stack.pop(), ()):
            if target not in seen:
                seen.add(target)
                stack.append(target)
    return seen


def reaching(targets: set[str], graph: Mapping[str, set[str]]) -> set[str]:
    """States from which some state in ``targets`` can be reached."""
    backward: dict[str, set[str]] = {}
    for source, successors in graph.items():
        for target in successors:
            backward.setdefault(target, set()).add(source)
    seen = set(targets)
    stack = list(targets)
    while stack:
        for source in backward.get(stack.pop(), ()):
            if source not in seen:
                seen.add(source)
                stack.append(source)
    return seen


def trapped_sets(stuck: set[str], graph: Mapping[str, set[str]]) -> list[set[str]]:
    """The closed classes the stuck states fall into (bottom strongly connected components),
    in order of their first member by name. Every successor of a stuck state is stuck, so
    the components are found within ``stuck`` alone, in linear time."""
    components = strongly_connected(sorted(stuck), lambda name: graph.get(name, ()))
    closed = []
    for component in components:
        if all(target in component for name in component for target in graph.get(name, ())):
            closed.append(component)
    return sorted(closed, key=min)


def strongly_connected(nodes: Iterable[str], successors) -> list[set[str]]:
    """Tarjan's strongly connected components with an explicit stack (chains of a hundred
    thousand states must not hit the interpreter's recursion limit)."""
    index: dict[str, int] = {}
    low: dict[str, int] = {}
    on_stack: set[str] = set()
    stack: list[str] = []
    components: list[set[str]] = []
    for root in nodes:
        if root in index:
            continue
        work = [(root, iter(successors(root)))]
        index[root] = low[root] = len(index)
        stack.append(root)
        on_stack.add(root)
        while work:
            node, children = work[-1]
            advanced = False
            for child in children:
                if child not in index:
                    index[child] = low[child] = len(index)
                    stack.append(child)
                    on_stack.add(child)
                    work.append((child, iter(successors(child))))
                    advanced = True
                    break
                if child in on_stack:
                    low[node] = min(low[node], index[child])
            if advanced:
                continue
            work.pop()
            if work:
                parent = work[-1][0]
                low[parent] = min(low[parent], low[node])
            if low[node] == index[node]:
                component = set()
                while True:
                    member = stack.pop()
                    on_stack.discard(member)
                    component.add(member)
                    if member == node:
                        break
                components.append(component)
    return components


def _check_strategies(ruleset: Ruleset) -> list[Problem]:
    problems = []
    decision_states = {state.name: state for state in ruleset.states if state.is_decision}
    for strategy in ruleset.strategies:
        where = f"strategy {strategy.name!r}"
        for state_name, action in strategy.actions:
            state = decision_states.get(state_name)
            if state is None:
                reason = "no such state" if state_name not in ruleset.state_names else "not a decision state"
                problems.append(Problem(ruleset.source, f"{where}, {state_name}", reason))
            elif action not in state.actions:
                problems.append(
                    Problem(
                        ruleset.source,
                        f"{where}, {state_name}",
                        f"unknown action {action!r} (choose from {', '.join(state.actions)})",
                    )
                )
        for state_name, _, action in strategy.by_hand:
            state = decision_states.get(state_name)
            place = f"{where}, rule for {state_name!r}"
            if state is None:
                reason = "no such state" if state_name not in ruleset.state_names else "not a decision state"
                problems.append(Problem(ruleset.source, place, reason))
            elif action not in state.actions:
                offered = ", ".join(state.actions)
                problems.append(Problem(ruleset.source, place, f"unknown action {action!r} (choose from {offered})"))
        missing: list[str] = []
        not_offered: list[str] = []
        named = {name for name, _ in strategy.actions}
        by_hand = {name for name, _, _ in strategy.by_hand}
        for state in decision_states.values():
            action = strategy.action_for(state)
            if action is None and state.name in by_hand:
                continue  # rules by hand: every hand is checked when the deal is expanded
            if action is None:
                missing.append(state.name)
            elif action not in state.actions and state.name not in named:
                not_offered.append(state.name)
        if missing:
            # One line for all of them: a family can make hundreds of decision states.
            problems.append(
                Problem(ruleset.source, where, f"no action and no default for decision state(s) {_listing(missing)}")
            )
        if not_offered:
            first = decision_states[not_offered[0]]
            problems.append(
                Problem(
                    ruleset.source,
                    f"{where}, default",
                    f"action {strategy.default!r} is not offered in state(s) {_listing(not_offered)} "
                    f"(in {first.name!r} choose from {', '.join(first.actions)})",
                )
            )
    return problems


def _listing(names: list[str]) -> str:
    shown = ", ".join(repr(name) for name in names[:MAX_LISTED_STATES])
    more = len(names) - MAX_LISTED_STATES
    return shown + (f" and {more} more" if more > 0 else "")


class _Suggester:
    """'Did you mean' for unknown names, bounded: fuzzy matching costs time per known name,
    so a hostile file with thousands of bad targets gets only the first few suggestions."""

    def __init__(self, names: set[str]) -> None:
        self.names = sorted(names) if len(names) <= MAX_NAMES_TO_SUGGEST_FROM else []
        self.left = MAX_SUGGESTIONS

    def __call__(self, name: str) -> str:
        if self.left <= 0 or not self.names:
            return ""
        self.left -= 1
        import difflib

        close = difflib.get_close_matches(name, self.names, n=1)
        return f" (did you mean {close[0]!r}?)" if close else ""
