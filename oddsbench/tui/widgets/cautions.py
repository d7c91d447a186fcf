"""The cautions of ``report/cautions.py``, shown on every screen that shows figures."""

from __future__ import annotations

from textual.widgets import Static

from oddsbench.report.cautions import CAUTIONS


class CautionsBar(Static):
    """All cautions, joined into as few lines as the width allows."""

    def __init__(self, **kwargs) -> None:
        super().__init__(" · ".join(CAUTIONS), markup=False, **kwargs)
