"""The ``oddsbench`` command line: one module per command, all sharing one error policy."""

from oddsbench.cli.main import main

__all__ = ["main"]
