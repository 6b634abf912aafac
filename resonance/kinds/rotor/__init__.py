"""Rotor-bearing models: finite shaft elements, discs, bearings, and their analyses.

Layers as in the rest of the package: :mod:`.elements` (element matrices),
:mod:`.model` (validated rotor and assembly), :mod:`.analysis` (speed sweeps,
Campbell data, critical speeds, critical speed map, unbalance response,
stability). All produce the package's :class:`~resonance.dynamics.modes.Mode` so the
interference check and the records work unchanged.
"""

from .analysis import (
    CampbellData,
    RotorModes,
    Unbalance,
    UnbalanceResponse,
    campbell,
    critical_speed_map,
    critical_speeds,
    rotor_modes,
    rotor_unbalance_response,
    unbalance_response_rotor,
)
from .model import STEEL, Bearing, Disc, Material, Pedestal, Rotor, ShaftSection, rotor_model
from .scenario import RotorScenario, load_rotor_scenario, parse_rotor_scenario
from .study import RotorStudyResult, run_rotor_study

__all__ = [
    "Material",
    "STEEL",
    "ShaftSection",
    "Disc",
    "Bearing",
    "Pedestal",
    "Rotor",
    "rotor_model",
    "RotorModes",
    "rotor_modes",
    "CampbellData",
    "campbell",
    "critical_speeds",
    "critical_speed_map",
    "Unbalance",
    "UnbalanceResponse",
    "rotor_unbalance_response",
    "unbalance_response_rotor",
    "RotorScenario",
    "load_rotor_scenario",
    "parse_rotor_scenario",
    "RotorStudyResult",
    "run_rotor_study",
]
