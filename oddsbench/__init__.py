"""oddsbench: exact and decimal mathematics of games of chance."""

import os as _os

# sympy reads its ground types once, at first import: ask for FLINT before anything imports it.
_os.environ.setdefault("SYMPY_GROUND_TYPES", "flint")

__version__ = "0.1.0"
