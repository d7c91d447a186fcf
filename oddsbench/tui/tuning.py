"""The workbench's target action, as a pure function for a thread worker: ask the core to tune one
parameter of the text being edited, and hand back the report layer's text and the values that can
be applied. The workbench does no arithmetic: formula, values and wording come from the core and
``report/tune_report.py``.
"""

from __future__ import annotations

import dataclasses
from collections.abc import Callable
from dataclasses import dataclass

from oddsbench.model.errors import OddsbenchError, one_line
from oddsbench.tui.setting_ways import problem_line

DEFAULT_TARGET = "house_edge=0"


@dataclass(frozen=True)
class TuneView:
    """What the dialog shows: the whole answer as text, and (label, value text) pairs to apply."""

    text: str
    choices: tuple[tuple[str, str], ...]


def tune_view(
    text: str,
    source: str,
    name: str,
    target: str,
    strategy: str | None,
    should_stop: Callable[[], bool] | None = None,
) -> TuneView | str:
    """The target ``target`` (``FIGURE=VALUE``; empty: the break-even) for parameter ``name`` of the
    ruleset ``text``, played under ``strategy`` where it has decisions; a one-line message when it
    cannot be answered. Raises ``Cancelled`` when ``should_stop`` says so."""
    from oddsbench.core import game_from_text, parse_target, tune
    from oddsbench.core.settings import DEFAULTS
    from oddsbench.core.work import Work
    from oddsbench.model.errors import RulesetError
    from oddsbench.report.tune_report import applicable_values, tune_text

    try:
        game = game_from_text(text, source)
        ruleset = game.need_ruleset("tuning a parameter")
        settings = DEFAULTS
        if ruleset.has_decisions and strategy is not None:
            settings = dataclasses.replace(DEFAULTS, strategies=(strategy,))
        chosen = parse_target(target) if target.strip() else None
        work = Work(should_stop=should_stop) if should_stop is not None else Work()
        results = tune(game, name, chosen, settings, work=work)
    except RulesetError as error:
        return "the file has problems: fix them first (" + one_line(str(error).splitlines()[0]) + ")"
    except OddsbenchError as error:
        return one_line(problem_line(error))
    return TuneView(tune_text(results, cautions=False), tuple(applicable_values(results)))
