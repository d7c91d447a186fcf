"""Monte Carlo cross-checks of the exact engines: vectorised sampling of chains (numpy Generator).

Sits beside ``oddsbench/strategy``: reads chains (``oddsbench/chain``) and exact figures
(``oddsbench/solve``); ``oddsbench/report`` and the CLI read its results.
"""
