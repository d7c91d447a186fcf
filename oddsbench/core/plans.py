"""The plan grammar as the front ends see it (the command line's help, the workbench's plan field).

One grammar for every command and the workbench: ``strategy/plans.py``; this module is how a
front end reaches it (light: no engine is loaded).
"""

from oddsbench.strategy.plans import NO_GOAL_PLANS, PLAN_HELP, Plan, parse_plan, parse_plans

__all__ = ["NO_GOAL_PLANS", "PLAN_HELP", "Plan", "parse_plan", "parse_plans"]
