"""What every kind's scenario shares: its head, speed range, excitations and rules, and how it is copied.

Each kind's scenario (:class:`~resonance.kinds.support.scenario.Scenario`, ``RotorScenario``,
``TorsionScenario``, ``SpaceScenario``) is a :class:`ScenarioHead` with the kind's own fields after these.
"""

from __future__ import annotations

import dataclasses
from dataclasses import dataclass
from typing import Any, Self

from ..checks.excitations import Excitation
from ..checks.rules import RuleSet
from ..checks.speed_range import OperatingRange
from ..core.units import UnitSystem

__all__ = ["ScenarioHead"]


@dataclass(frozen=True)
class ScenarioHead:
    """The fields every validated scenario starts with.

    Attributes
    ----------
    title, description : str
        As written in ``[scenario]``.
    units : {"SI", "US"}
        Display units of the records and panels.
    speed : OperatingRange
        Speeds of continuous operation [rpm] (of the driver shaft for a train).
    excitations : tuple of Excitation
        Orders, electrical and fixed sources, each with where it came from.
    rules : RuleSet
        The margin rules, each within its scope.
    """

    title: str
    description: str
    units: UnitSystem
    speed: OperatingRange
    excitations: tuple[Excitation, ...]
    rules: RuleSet

    def replace(self, **changes: Any) -> Self:
        """A copy with some fields changed (the original is untouched; the copy has no file hash unless given).

        Parameters
        ----------
        **changes
            Fields to change, by name.

        Returns
        -------
        ScenarioHead
            A scenario of the same kind.

        Raises
        ------
        TypeError
            An unknown field.
        """
        return dataclasses.replace(self, **{"sha256": None, **changes})
