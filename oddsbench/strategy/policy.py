"""A file's named strategy as a policy (decision state -> action), for every command and layer above."""

from __future__ import annotations

from oddsbench.model.errors import OddsbenchError
from oddsbench.model.ruleset import Ruleset


def policy_for(ruleset: Ruleset, name: str | None) -> dict[str, str]:
    """The policy of the named strategy; empty for ``None`` (rounds without decisions)."""
    if name is None:
        return {}
    try:
        strategy = ruleset.strategy(name)
    except KeyError:
        known = ", ".join(s.name for s in ruleset.strategies) or "none defined"
        raise OddsbenchError(f"{ruleset.source}: unknown strategy {name!r} (known: {known})") from None
    return {state.name: strategy.action_for(state) for state in ruleset.states if state.is_decision}
