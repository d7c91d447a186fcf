"""Read a ruleset file (TOML, format version 1) into exact data, collecting every problem.

Reading never raises for a bad file: each problem becomes a ``Problem`` line naming the file,
the state and the field, and the caller decides (the CLI exits 2, the TUI shows it inline).
This module reads the bytes and the TOML; ``document_checks`` checks the raw document,
``ruleset_reader`` builds the ruleset, ``validate`` checks the result.
"""

from __future__ import annotations

import tomllib
from collections.abc import Mapping
from dataclasses import dataclass, field, replace
from pathlib import Path
from typing import Any

from oddsbench.model.document_checks import document_problems
from oddsbench.model.errors import Problem, RulesetError
from oddsbench.model.families import FamilyMember
from oddsbench.model.file_read import FileRefused, read_text_capped
from oddsbench.model.numbers import Rational, text
from oddsbench.model.ruleset import Ruleset
from oddsbench.model.ruleset_reader import RulesetReader

MAX_FILE_BYTES = 2_000_000


@dataclass(frozen=True)
class LoadResult:
    """What reading found: the ruleset (None when any error) and every problem, in order; and, for
    the workbench's family forms, each family-made state's member (family, index values) and its
    plain table as expanded (even when another part of the file has an error)."""

    ruleset: Ruleset | None
    problems: tuple[Problem, ...]
    members: Mapping[str, FamilyMember] = field(default_factory=dict)
    member_tables: Mapping[str, Mapping[str, Any]] = field(default_factory=dict)
    text: str | None = None  # the file's text as read (once: what was checked is what is kept)

    @property
    def errors(self) -> tuple[Problem, ...]:
        return tuple(p for p in self.problems if p.is_error)

    @property
    def warnings(self) -> tuple[Problem, ...]:
        return tuple(p for p in self.problems if not p.is_error)


ParamOverrides = Mapping[str, Rational]


def read_ruleset_file(path: str | Path, params: ParamOverrides | None = None) -> LoadResult:
    """Read and validate a ruleset file; never raises for bad content.

    ``params`` replaces values of the file's ``[params]`` (by name) before anything else is
    evaluated, so later parameters and every outcome that depend on them follow.
    """
    path = Path(path)
    try:
        content = read_text_capped(path, MAX_FILE_BYTES, "is a folder, not a ruleset file")
    except FileRefused as refused:
        return _failed(path.name, str(refused))
    return replace(read_ruleset_text(content, path.name, params), text=content)


def read_ruleset_text(content: str, source: str = "<text>", params: ParamOverrides | None = None) -> LoadResult:
    """Read and validate ruleset text (the heart of ``oddsbench check``), optionally with
    parameter overrides as in ``read_ruleset_file``."""
    if len(content.encode("utf-8", "surrogatepass")) > MAX_FILE_BYTES:
        return _failed(source, f"text is over the limit of {MAX_FILE_BYTES:,} bytes")
    content = content.removeprefix("\ufeff")  # a byte-order mark some editors write
    if not content.strip():
        return _failed(source, "file is empty")
    try:
        document = tomllib.loads(content)
    except tomllib.TOMLDecodeError as error:
        return _failed(source, f"not valid TOML: {error}")
    except RecursionError:
        return _failed(source, "not valid TOML: nested too deeply")
    problems = document_problems(document, source)
    if problems:
        return LoadResult(None, tuple(problems))
    reader = RulesetReader(source, problems, params)
    ruleset = reader.read(document)
    if ruleset is not None:
        from oddsbench.model.validate import validate

        problems.extend(validate(ruleset))
    problems = one_per_cause(problems, reader.members)
    has_error = any(problem.is_error for problem in problems)
    return LoadResult(None if has_error else ruleset, tuple(problems), reader.members, reader.member_tables)


def _member_state(problem: Problem, members: dict[str, FamilyMember]) -> str | None:
    """The family-made state a problem is placed in, or None."""
    if not members or not problem.where.startswith("state '"):
        return None
    name = problem.where[len("state '") :].split("'", 1)[0]
    return name if name in members else None


def family_origin(problem: Problem, members: dict[str, FamilyMember]) -> Problem:
    """A problem in a state made by a family, with the family and index values added to its place."""
    name = _member_state(problem, members)
    if name is None:
        return problem
    member = members[name]
    index = ", ".join(f"{variable}={text(value)}" for variable, value in member.index)
    place = f"state {name!r}"
    where = problem.where.replace(place, f"{place} (family {member.family!r} at {index})", 1)
    return Problem(problem.source, where, problem.message, problem.severity)


def one_per_cause(problems: list[Problem], members: dict[str, FamilyMember]) -> list[Problem]:
    """Each problem with its family origin, a problem repeated in many members of one family (the same
    field, the same message, the member's own name aside) as one line: the first, with the count of the rest.
    """
    kept: list[Problem] = []
    first: dict[tuple[str, ...], int] = {}
    repeats: dict[int, int] = {}
    for problem in problems:
        name = _member_state(problem, members)
        if name is None:
            kept.append(problem)
            continue
        rest = problem.where[len(f"state {name!r}") :]
        cause = (problem.severity, members[name].family, rest.replace(name, "\0"), problem.message.replace(name, "\0"))
        if cause in first:
            repeats[first[cause]] = repeats.get(first[cause], 1) + 1
            continue
        first[cause] = len(kept)
        kept.append(family_origin(problem, members))
    for at, count in repeats.items():
        problem = kept[at]
        family = members[_member_state(problem, members) or ""].family
        more = count - 1
        message = f"{problem.message} (the same in {more:,} more state{'' if more == 1 else 's'} of family {family!r})"
        kept[at] = Problem(problem.source, problem.where, message, problem.severity)
    return kept


def load_ruleset(path: str | Path, params: ParamOverrides | None = None) -> Ruleset:
    """Read a ruleset file (with optional parameter overrides) or raise RulesetError."""
    return _unwrap(read_ruleset_file(path, params))


def load_ruleset_text(content: str, source: str = "<text>", params: ParamOverrides | None = None) -> Ruleset:
    """Read ruleset text (with optional parameter overrides) or raise RulesetError."""
    return _unwrap(read_ruleset_text(content, source, params))


def _unwrap(result: LoadResult) -> Ruleset:
    if result.ruleset is None:
        raise RulesetError(result.problems)
    return result.ruleset


def _failed(source: str, message: str) -> LoadResult:
    return LoadResult(None, (Problem(source, "", message),))
