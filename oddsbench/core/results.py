"""Every result type a front end reads, in one place: the report layer, the workbench and the API
import them from here, never from the engines (so an engine can move without touching them)."""

from oddsbench.chain.round_distribution import RoundDistribution, RoundOutcome
from oddsbench.core.horizons import HorizonResults
from oddsbench.core.reports import ReportFigures
from oddsbench.core.rounds import BestResults
from oddsbench.core.session import PlanResult, SessionResults
from oddsbench.core.simulation import SessionRun, Simulation
from oddsbench.core.tune_scan import Bracket
from oddsbench.core.tuning import DegreeBound, Edge, TunedValue, TuneResults
from oddsbench.model.figure import Figure
from oddsbench.simulate.checks import Check
from oddsbench.simulate.round_sim import RoundSample
from oddsbench.simulate.session_sim import SessionSample
from oddsbench.solve.horizon import Horizon, ReturnRange
from oddsbench.solve.rational_function import RationalFunction, Solution
from oddsbench.solve.return_table import NetValue, PayShare, ReturnTable
from oddsbench.solve.round import RoundFigures
from oddsbench.solve.ruin import Certified, NoGoalRuin, RoundsToRuin
from oddsbench.solve.session import FinalValue
from oddsbench.strategy.best_policy import BestPolicy, Certificate, Improvement, StrategyCheck, Tie
from oddsbench.strategy.compare import RoundColumn, RoundResults
from oddsbench.strategy.no_goal_play import NoGoalFigures, NoGoalWalk
from oddsbench.strategy.session import SessionFigures, SessionSettings
from oddsbench.sweep.points import Point, PointResult
from oddsbench.sweep.runners import SweepResult
from oddsbench.sweep.spec import Axis, SweepSpec

__all__ = [
    "Axis",
    "Bracket",
    "DegreeBound",
    "Edge",
    "BestPolicy",
    "BestResults",
    "Certificate",
    "Certified",
    "Check",
    "Figure",
    "FinalValue",
    "Horizon",
    "HorizonResults",
    "Improvement",
    "NoGoalFigures",
    "NoGoalRuin",
    "NetValue",
    "NoGoalWalk",
    "PayShare",
    "PlanResult",
    "Point",
    "PointResult",
    "RationalFunction",
    "ReportFigures",
    "ReturnRange",
    "ReturnTable",
    "RoundColumn",
    "RoundDistribution",
    "RoundFigures",
    "RoundOutcome",
    "RoundResults",
    "RoundSample",
    "RoundsToRuin",
    "SessionFigures",
    "SessionResults",
    "SessionRun",
    "SessionSample",
    "SessionSettings",
    "Solution",
    "Simulation",
    "StrategyCheck",
    "SweepResult",
    "SweepSpec",
    "Tie",
    "TuneResults",
    "TunedValue",
]
