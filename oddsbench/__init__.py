"""oddsbench: exact and decimal mathematics of games of chance.

The Python API (``oddsbench.load``, ``oddsbench.round_figures``, ``oddsbench.sessions``, ``oddsbench.to_dict``...)
lives in ``oddsbench.api`` and is loaded on first use, so ``import oddsbench`` and ``oddsbench --help``
stay quick.
"""

import importlib as _importlib
import os as _os

# sympy reads its ground types once, at first import: ask for FLINT before anything imports it.
_os.environ.setdefault("SYMPY_GROUND_TYPES", "flint")

__version__ = "0.1.0"


def __getattr__(name: str):
    """``oddsbench.round_figures`` and the other names of ``oddsbench.api.__all__``, imported on first use."""
    if not name.startswith("_"):
        api = _importlib.import_module("oddsbench.api")
        if name in api.__all__:
            return getattr(api, name)
    raise AttributeError(f"module 'oddsbench' has no attribute {name!r}")
