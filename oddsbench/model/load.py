"""Read a ruleset file (TOML, format version 1) into exact data, collecting every problem.

Reading never raises for a bad file: each problem becomes a ``Problem`` line naming the file,
the state and the field, and the caller decides (the CLI exits 2, the TUI shows it inline).
This module reads the bytes and the TOML; ``document_checks`` checks the raw document,
``ruleset_reader`` builds the ruleset, ``validate`` checks the result.
"""

from __future__ import annotations

import tomllib
from collections.abc import Mapping
from dataclasses import dataclass
from pathlib import Path

from oddsbench.model.document_checks import document_problems
from oddsbench.model.errors import Problem, RulesetError
from oddsbench.model.families import FamilyMember
from oddsbench.model.numbers import Rational, text
from oddsbench.model.ruleset import Ruleset
from oddsbench.model.ruleset_reader import RulesetReader

MAX_FILE_BYTES = 2_000_000


@dataclass(frozen=True)
class LoadResult:
    """What reading found: the ruleset (None when any error) and every problem, in order."""

    ruleset: Ruleset | None
    problems: tuple[Problem, ...]

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
    source = path.name
    try:
        if path.is_dir():
            return _failed(source, "is a folder, not a ruleset file")
        size = path.stat().st_size
        if size > MAX_FILE_BYTES:
            return _failed(source, f"file is {size:,} bytes, over the limit of {MAX_FILE_BYTES:,}")
        raw = path.read_bytes()
    except FileNotFoundError:
        return _failed(source, "no such file")
    except OSError as error:
        return _failed(source, f"cannot be read: {error.strerror or error}")
    try:
        content = raw.decode("utf-8")
    except UnicodeDecodeError as error:
        return _failed(source, f"is not UTF-8 text (bad byte at position {error.start})")
    return read_ruleset_text(content, source, params)


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

        problems.extend(family_origin(problem, reader.members) for problem in validate(ruleset))
    has_error = any(problem.is_error for problem in problems)
    return LoadResult(None if has_error else ruleset, tuple(problems))


def family_origin(problem: Problem, members: dict[str, FamilyMember]) -> Problem:
    """A problem in a state made by a family, with the family and index values added to its place."""
    if not members or not problem.where.startswith("state '"):
        return problem
    name = problem.where[len("state '") :].split("'", 1)[0]
    member = members.get(name)
    if member is None:
        return problem
    index = ", ".join(f"{variable}={text(value)}" for variable, value in member.index)
    place = f"state {name!r}"
    where = problem.where.replace(place, f"{place} (family {member.family!r} at {index})", 1)
    return Problem(problem.source, where, problem.message, problem.severity)


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
