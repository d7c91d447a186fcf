"""``python -m oddsbench``."""

from oddsbench.cli.main import entry

entry()
