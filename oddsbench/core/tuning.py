"""Tune one parameter to hit a target figure: ``tune(game, name, target, settings, ...) -> TuneResults``.

Every figure of a finite round is a rational function of a parameter that enters the chances,
pays and stakes polynomially (``model/param_degree.py`` reads how it enters). Its degrees are
bounded by Cramer's rule: with D = (transient states whose chances depend on the parameter) x
(its degree in the chances), end chances and expected steps have numerator and denominator
degree <= D; the expected net numerator D + (degree in the pays); staked, house edge and return
D + the degree in the stakes; variances twice those. The function is reconstructed exactly from
that many exact solves (``solve/rational_function.py``) and confirmed at ``CONFIRM`` more; then
every value in the range where the file stays valid (each chance in [0, 1]) that gives the target
is found: rational ones exactly (and solved again at that value to confirm), the others as exact
algebraic numbers with certified decimals. Where the parameter enters otherwise (``floor``, a
comparison, an ``if``, a division by it, or a field that shapes the chain) the figure is
piecewise: ``core/tune_scan.py`` brackets the target by exact bisection instead.
"""

from __future__ import annotations

import dataclasses
import tomllib
from dataclasses import dataclass, field

from oddsbench.core.game import Game
from oddsbench.core.settings import DEFAULTS, Settings
from oddsbench.core.tune_points import ROUND_FIGURES, FigureAt, Point, shown_figure, spread
from oddsbench.core.tune_scan import Bracket, scan
from oddsbench.core.work import NO_WORK, Work, budgeted
from oddsbench.model.errors import OddsbenchError, SettingProblem, shown_name
from oddsbench.model.figure import Figure
from oddsbench.model.numbers import QQ, Rational, text
from oddsbench.model.param_degree import ParamDegrees, param_degrees
from oddsbench.solve.rational_function import (
    DegreeBoundFailed,
    RationalFunction,
    Solution,
    poly_value,
    reconstruct,
    sign_at,
    solutions,
)
from oddsbench.solve.return_table import CHANCE_FIGURES

CONFIRM = 3  # exact solves past the degree bound that must fit the function found
MAX_SOLVES = 1_500  # exact solves one reconstruction may take
DEFAULT_TOLERANCE = QQ(1, 10**9)
BREAK_EVEN = "house_edge"


@dataclass(frozen=True)
class DegreeBound:
    """Why the reconstruction needs ``numerator + denominator + 1`` exact solves."""

    numerator: int
    denominator: int
    rows: int  # transient states whose chances depend on the parameter
    states: int  # transient states of the chain (of the chain over (state, pay so far) for hit/push/loss)
    prob: int
    pay: int
    stake: int
    solves: int  # exact solves used for the function
    confirmed: int  # further solves that fit it


@dataclass(frozen=True)
class TunedValue:
    """A value of the parameter that gives the target: exact, valid (every chance in [0, 1] there;
    None when a chance is exactly 0 or 1 there, at an edge of the range) and, for a rational one,
    ``confirmed`` by solving the file again at that value."""

    solution: Solution
    valid: bool | None
    confirmed: bool | None = None
    problem: str | None = None


@dataclass(frozen=True)
class Edge:
    """One end of a valid interval of the parameter (None: unbounded), and whether it belongs to it."""

    at: Solution | None
    closed: bool


@dataclass(frozen=True)
class TuneResults:
    """The figure as a function of the parameter, and the values that give the target."""

    title: str
    source: str
    parameter: str
    current: Rational
    figure: str
    target: Rational
    target_given: bool
    strategy: str | None
    start: str | None
    kind: str  # "rational", "constant", "piecewise" or "not-polynomial" (the last two: bisection)
    formula: RationalFunction | None = None
    bound: DegreeBound | None = None
    valid_range: tuple[tuple[Edge, Edge], ...] = ()
    values: tuple[TunedValue, ...] = ()
    every_value: bool = False  # the figure equals the target for every valid value
    reasons: tuple[str, ...] = ()  # where the parameter enters otherwise than polynomially
    brackets: tuple[Bracket, ...] = ()
    scanned: tuple[Rational, Rational] | None = None
    tolerance: Rational = DEFAULT_TOLERANCE
    whole: bool = False  # only whole values scanned: brackets of neighbouring whole values, exact (no tolerance)
    figure_now: Figure | None = None
    notes: tuple[str, ...] = field(default_factory=tuple)


def parse_amount(spelled: str, setting: str, what: str | None = None) -> Rational:
    """An exact value of the setting ``setting`` (named ``what`` in a message, else its key):
    the expression language (``1/40``, ``0.015``), a trailing ``%`` (``1.5%`` is 3/200), or a
    decimal exponent (``1e-9``). Never evaluated as code."""
    import re

    from oddsbench.model.expr import ExpressionError, evaluate_text

    body = spelled.strip()
    scale = QQ(1)
    if body.endswith("%"):
        body, scale = body[:-1].strip(), QQ(1, 100)
    power = re.fullmatch(r"([0-9]+(?:\.[0-9]+)?)[eE]([+-]?[0-9]{1,3})", body)
    try:
        if power:
            return evaluate_text(power.group(1)) * QQ(10) ** int(power.group(2)) * scale
        return evaluate_text(body) * scale
    except ExpressionError as error:
        raise SettingProblem(
            f"{what or setting} {shown_name(spelled)}: not an exact value ({error})", setting
        ) from None


def parse_target(spelled: str) -> tuple[str, Rational]:
    """``FIGURE=VALUE`` (``house_edge=1.5%``, ``end:won=1/2``)."""
    figure, sign, value = spelled.partition("=")
    if not sign or not figure.strip() or not value.strip():
        raise SettingProblem(f"target {shown_name(spelled)}: expected FIGURE=VALUE, e.g. house_edge=1.5%", "target")
    return figure.strip(), parse_amount(value, "target", f"target {shown_name(figure.strip())} =")


@budgeted
def tune(
    game: Game,
    name: str,
    target: tuple[str, Rational] | None = None,
    settings: Settings = DEFAULTS,
    tolerance: Rational = DEFAULT_TOLERANCE,
    between: tuple[Rational, Rational] | None = None,
    work: Work = NO_WORK,
) -> TuneResults:
    """The figure of ``target`` (the house edge, 0: the break-even, when None) as a function of the
    parameter ``name``, and every value of it that gives the target."""
    from oddsbench.core.rounds import one_play

    ruleset = game.need_ruleset("tuning a parameter")
    params = dict(ruleset.params)
    if name not in params:
        known = ", ".join(repr(key) for key in params) or "none"
        raise SettingProblem(
            f"{ruleset.source}: parameter to vary {shown_name(name)}: no such parameter (its parameters: {known})",
            "vary",
        )
    figure, value = target if target is not None else (BREAK_EVEN, QQ(0))
    _check_figure(ruleset, figure)
    if figure == "net_sd" and value < 0:
        raise OddsbenchError(f"{ruleset.source}: net_sd is a standard deviation: a target below 0 is never reached")
    if tolerance <= 0:
        raise SettingProblem(f"tolerance {text(tolerance)}: must be above 0", "tolerance")
    if between is not None and between[0] >= between[1]:
        raise SettingProblem(
            f"range to scan {text(between[0])},{text(between[1])}: the first value must be below the second", "between"
        )
    strategy = one_play(ruleset, settings, "tuning")
    at = FigureAt(game, name, figure, strategy, settings, work)
    now = at(params[name])
    if now.problem is not None:
        raise OddsbenchError(now.problem)
    goal = value * value if figure == "net_sd" else value  # net_sd is solved squared: var / staked^2
    base = dict(
        title=ruleset.title,
        source=ruleset.source,
        parameter=name,
        current=params[name],
        figure=figure,
        target=value,
        target_given=target is not None,
        strategy=strategy,
        start=settings.starts,
        tolerance=tolerance,
        figure_now=shown_figure(figure, now.figure),
    )
    document = tomllib.loads(game.text or "")
    fixed = {key: value for key, value in game.params if key != name}  # overridden: constants here
    if fixed and isinstance(document.get("params"), dict):
        document["params"].update(fixed)
    degrees = param_degrees(document, name, params)
    reasons = list(degrees.not_polynomial)
    kind = "piecewise" if degrees.piecewise else "not-polynomial"
    if figure in CHANCE_FIGURES and degrees.pay:
        reasons.append(f"{figure} compares the net with 0, and {name} enters the pays")
        kind = "piecewise"
    if degrees.unused:
        every = now.figure == goal
        return TuneResults(**base, kind="constant", every_value=every, notes=(f"the round does not depend on {name}",))
    if not reasons:
        try:
            found = _rational(at, degrees, goal, base, params[name])
            if between is None:
                return found
            return dataclasses.replace(found, values=tuple(v for v in found.values if _within(v.solution, between)))
        except DegreeBoundFailed as error:
            reasons.append(f"the exact solves do not fit one rational function ({error})")
    brackets, scanned, notes, whole = scan(at, params[name], goal, tolerance, between, degrees.counts)
    return TuneResults(
        **base, kind=kind, reasons=tuple(reasons), brackets=brackets, scanned=scanned, notes=notes, whole=whole
    )


def _check_figure(ruleset, figure: str) -> None:
    if figure in ROUND_FIGURES:
        return
    if figure.startswith("end:") and figure[4:] in ruleset.state_names:
        return
    labels = {state.result for state in ruleset.states if state.result}
    if figure.startswith("result:") and figure[7:] in labels:
        return
    raise OddsbenchError(
        f"{ruleset.source}: no figure {shown_name(figure)} (figures: {', '.join(ROUND_FIGURES)}, end:STATE, "
        "result:LABEL)"
    )


def _rational(at: FigureAt, degrees: ParamDegrees, goal: Rational, base: dict, current: Rational) -> TuneResults:
    first = at(current)
    candidates = spread(current, max(abs(current), QQ(1)) / 1024)
    points: list[Point] = []
    tried = 0

    def gather(count: int) -> None:
        nonlocal tried
        while len(points) < count:
            tried += 1
            if tried > MAX_SOLVES:
                raise OddsbenchError(_too_few(at, current, points, tried))
            point = at(next(candidates))
            if point.problem is None and point.shape == first.shape:
                points.append(point)

    gather(degrees.prob + 1)
    rows = _rows_depending(points)
    nodes = max(p.nodes for p in points)
    top, bottom = _bounds(at.figure, degrees, rows, nodes)
    gather(top + bottom + 1 + CONFIRM)
    formula = reconstruct([(p.value, p.figure) for p in points], top, bottom)
    states = nodes if at.figure in CHANCE_FIGURES else len(first.rows)
    stake = max(degrees.stake, degrees.round_stake)
    used = top + bottom + 1
    justified = DegreeBound(top, bottom, rows, states, degrees.prob, degrees.pay, stake, used, len(points) - used)
    constraints = _constraints(points[: degrees.prob + 1])
    found = solutions(formula, goal)
    notes: tuple[str, ...] = ()
    if at.figure == "net_sd":
        notes = ("net_sd is a square root: the formula is of net_sd squared (net variance / expected staked^2)",)
    return TuneResults(
        **base,
        kind="rational",
        formula=formula,
        bound=justified,
        values=() if found is None else tuple(_checked(at, s, constraints, goal) for s in found),
        every_value=found is None,
        valid_range=_valid_range(constraints),
        notes=notes,
    )


def _within(solution: Solution, between: tuple[Rational, Rational]) -> bool:
    """Whether a solution lies in [low, high] (an algebraic one by its certified digits)."""
    value = solution.exact if solution.exact is not None else _rational_of(solution)
    return between[0] <= value <= between[1]


def _too_few(at: FigureAt, current: Rational, points: list[Point], tried: int) -> str:
    problems = [p.problem for p in at.cache.values() if p.problem]
    why = f" (e.g. {problems[0]})" if problems else " (the chain changes shape there)"
    return (
        f"{at.game.source}: varying {at.name}: the file is valid at only {len(points)} of {tried} values tried near "
        f"{text(current)}{why}: not enough to find the figure as a function of {at.name}"
    )


def _rows_depending(points: list[Point]) -> int:
    """Transient states whose chances differ among the points: each chance is a polynomial of degree
    at most d in the parameter, so d + 1 equal values make it constant."""
    first = points[0].rows
    return sum(1 for i, row in enumerate(first) if any(p.rows[i] != row for p in points[1:]))


def _bounds(figure: str, degrees: ParamDegrees, rows: int, nodes: int) -> tuple[int, int]:
    """(numerator, denominator) degree bounds of a figure, from Cramer's rule (see the module text)."""
    d = rows * degrees.prob
    pay, stake = degrees.pay, max(degrees.stake, degrees.round_stake)
    if figure in CHANCE_FIGURES:
        d = nodes * degrees.prob if degrees.prob else 0
        return d, d
    if figure == "expected_net":
        return d + pay, d
    if figure == "expected_staked":
        return d + stake, d
    if figure in ("house_edge", "return_to_player"):
        return d + max(pay, stake), d + stake
    if figure == "net_variance":
        return 2 * d + 2 * pay, 2 * d
    if figure == "steps_variance":
        return 2 * d, 2 * d
    if figure == "net_sd":  # var / staked^2 = (M / det^2) / ((S / det)^2) = M / S^2
        return 2 * d + 2 * pay, 2 * (d + stake)
    return d, d  # end chances, result chances, expected steps


def _constraints(points: list[Point]) -> tuple[tuple[Rational, ...], ...]:
    """Each chance that varies, as a polynomial (lowest power first) through the points (degree <= d,
    so d + 1 values fix it): the file is valid where every one lies in [0, 1]."""
    from oddsbench.solve.rational_function import reconstruct as fit

    if len(points) < 2:
        return ()
    found: dict[tuple, None] = {}
    for i, row in enumerate(points[0].rows):
        for k in range(len(row)):
            values = [(p.value, p.rows[i][k]) for p in points]
            if all(v == values[0][1] for _, v in values):
                continue
            chance = fit(values, len(points) - 1, 0)
            scale = QQ(chance.denominator[0])
            found[tuple(QQ(c) / scale for c in chance.numerator)] = None
    return tuple(found)


def _checked(at: FigureAt, solution: Solution, constraints, goal: Rational) -> TunedValue:
    """Whether the file is valid at a solution (every varying chance in [0, 1]) and, when it is
    rational, whether solving the file there gives the target exactly."""
    valid = _inside(constraints, solution)
    if solution.exact is None or valid is False:
        return TunedValue(solution, valid)
    point = at(solution.exact)
    if point.problem is not None:
        return TunedValue(solution, False, False, point.problem)
    return TunedValue(solution, valid, point.figure == goal)


def _inside(constraints, solution: Solution) -> bool | None:
    """True: every varying chance strictly inside [0, 1] or proved in it; None: one is exactly 0 or 1
    there (an edge of the valid range); False: one lies outside."""
    verdict: bool | None = True
    for chance in constraints:
        for polynomial in (chance, (1 - chance[0], *(-c for c in chance[1:]))):
            sign = sign_at(polynomial, solution)
            if sign is not None and sign < 0:
                return False
            if sign is None or sign == 0:
                verdict = None
    return verdict


def _valid_range(constraints) -> tuple[tuple[Edge, Edge], ...]:
    """The intervals where every varying chance lies in [0, 1], with exact (rational or algebraic) ends."""
    if not constraints:
        return ((Edge(None, False), Edge(None, False)),)
    breaks: dict[tuple, Solution] = {}
    for chance in constraints:
        function = _integer_function(chance)
        for level in (QQ(0), QQ(1)):
            for solution in solutions(function, level) or ():
                key = (solution.exact,) if solution.exact is not None else (solution.polynomial, solution.index)
                breaks[key] = solution
    ordered = sorted(breaks.values(), key=lambda s: s.approximate)
    intervals: list[tuple[Edge, Edge]] = []
    start: Edge | None = None
    previous: tuple[Solution, bool] | None = None  # the last break point and whether it is valid
    ends = [None, *ordered, None]
    for left, right in zip(ends, ends[1:]):
        inside = _between(left, right)
        ok = all(0 <= poly_value(chance, inside) <= 1 for chance in constraints)
        if ok and start is None:
            start = Edge(left, False)
        if not ok and start is not None:
            intervals.append((start, Edge(left, bool(previous and previous[1]))))
            start = None
        if right is None:
            break
        point_ok = _inside(constraints, right) is not False
        if point_ok and start is None:
            start = Edge(right, True)
        if not point_ok and start is not None:
            intervals.append((start, Edge(right, False)))
            start = None
        previous = (right, point_ok)
    if start is not None:
        intervals.append((start, Edge(None, False)))
    return tuple(intervals)


def _integer_function(chance: tuple[Rational, ...]) -> RationalFunction:
    """A polynomial with rational coefficients as an integer numerator over one integer."""
    import math

    from oddsbench.model.numbers import denominator, numerator

    scale = math.lcm(*(denominator(c) for c in chance))
    return RationalFunction(tuple(numerator(c * scale) for c in chance), (scale,))


def _between(left: Solution | None, right: Solution | None) -> Rational:
    """A rational strictly inside (left, right) (ends certified to 30 digits; None: unbounded)."""
    if left is None and right is None:
        return QQ(0)
    if left is None:
        return _rational_of(right) - 1
    if right is None:
        return _rational_of(left) + 1
    return (_rational_of(left) + _rational_of(right)) / 2


def _rational_of(solution: Solution) -> Rational:
    if solution.exact is not None:
        return solution.exact
    from oddsbench.core.tune_scan import decimal_rational

    return decimal_rational(solution.decimal.text)
