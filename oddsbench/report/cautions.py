"""Responsible-gambling cautions shown wherever figures are shown."""

CAUTIONS: tuple[str, ...] = (
    "These figures are mathematics, not advice.",
    "No betting plan turns a negative expectation positive.",
    "Set limits of time and money before you play, and keep to them.",
    "Where play stops being fun, seek help from a local support service.",
    "Gambling law and age limits vary: defer to local law, and to licensed practice for certification.",
)

# Shown beside figures over many rounds (``oddsbench horizon``, the workbench's horizon chart).
HORIZON_CAUTIONS: tuple[str, ...] = (
    "Over many rounds the result converges on the house edge: the realised return to player closes in on its "
    "expected value, and no betting plan changes that.",
)


def caution_block() -> str:
    """The cautions as a short text block for terminal output."""
    return "Cautions:\n" + "\n".join(f"  - {line}" for line in CAUTIONS)
