"""Presentation: plotly figures from results and ipywidgets panels.

Nothing here computes physics: figures are drawn from :class:`StudyResult`
and the what-if results, and panels edit a scenario and re-run
:func:`resonance.study.run_study`.
"""

from .field_panel import FieldPanel
from .panels import DesignPanel, RecordPanel, WhatIfPanel, multi_mode_panel, single_mode_panel
from .rotor_panel import RotorPanel
from .widgets import caution_banner

__all__ = [
    "DesignPanel",
    "FieldPanel",
    "RecordPanel",
    "RotorPanel",
    "WhatIfPanel",
    "caution_banner",
    "multi_mode_panel",
    "single_mode_panel",
]
