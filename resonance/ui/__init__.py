"""Presentation: plotly figures from results and ipywidgets panels.

Nothing here computes physics: figures are drawn from the studies' results
and panels edit a scenario and re-run its study.
"""

from .field_panel import FieldPanel
from .panels import DesignPanel, RecordPanel, WhatIfPanel, multi_mode_panel, single_mode_panel
from .rotor_panel import RotorPanel
from .space_panel import SpacePanel
from .torsion_panel import TorsionPanel
from .uncertainty_panel import UncertaintyPanel
from .widgets import caution_banner

__all__ = [
    "DesignPanel",
    "FieldPanel",
    "RecordPanel",
    "RotorPanel",
    "SpacePanel",
    "TorsionPanel",
    "UncertaintyPanel",
    "WhatIfPanel",
    "caution_banner",
    "multi_mode_panel",
    "single_mode_panel",
]
