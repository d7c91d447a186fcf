"""Resource limits shared by the layers and the command line (no imports: ``--help`` stays quick)."""

DEFAULT_MAX_STATES = 200_000
DEFAULT_EXACT_LIMIT = 5_000
DEFAULT_EXACT_BITS = 16_000_000_000
