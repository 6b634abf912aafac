"""Presentation: plotly figures from results and ipywidgets panels.

Nothing here computes physics: figures are drawn from the studies' results
and panels edit a scenario and re-run its study.
"""

from typing import Any

from ..core.errors import InputTypeError
from .field_panel import FieldPanel
from .panels import DesignPanel, RecordPanel, WhatIfPanel, multi_mode_panel, single_mode_panel
from .rotor_panel import RotorPanel
from .space_panel import SpacePanel
from .torsion_panel import TorsionPanel
from .uncertainty_panel import UncertaintyPanel
from .widgets import caution_banner


def panel(scenario: Any) -> Any:
    """The notebook panel for a scenario of any kind: the one panel factory.

    Parameters
    ----------
    scenario : object
        A validated scenario (``resonance.load``).

    Returns
    -------
    Panel
        ``single_mode_panel`` for a machine on a support of one mass, ``multi_mode_panel`` for more,
        ``RotorPanel``, ``TorsionPanel`` or ``SpacePanel``; its ``widget`` is what a notebook shows.

    Raises
    ------
    InputTypeError
        An object that is not a scenario of a kind with a panel.
    """
    from ..kinds.rotor.scenario import RotorScenario
    from ..kinds.space.scenario import SpaceScenario
    from ..kinds.support.scenario import Scenario
    from ..kinds.torsion.scenario import TorsionScenario

    if isinstance(scenario, Scenario):
        return single_mode_panel(scenario) if len(scenario.model.masses) == 1 else multi_mode_panel(scenario)
    if isinstance(scenario, RotorScenario):
        return RotorPanel(scenario)
    if isinstance(scenario, TorsionScenario):
        return TorsionPanel(scenario)
    if isinstance(scenario, SpaceScenario):
        return SpacePanel(scenario)
    raise InputTypeError(f"scenario: got {type(scenario).__name__}; expected a scenario (resonance.load reads one)")


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
    "panel",
    "single_mode_panel",
]
