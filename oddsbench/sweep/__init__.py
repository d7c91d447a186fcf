"""Parameter sweeps: a grid of ruleset parameters, strategies and session settings, one solve per point.

Above ``oddsbench/strategy`` and beside ``oddsbench/simulate``: reads specs (``model``), solves
points (``chain``, ``solve``, ``strategy``) and runs them on local processes or a Dask cluster.
"""
