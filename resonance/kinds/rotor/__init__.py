"""The rotor kind: a rotor on bearings (finite shaft elements, discs, bearings, pedestals) and its analyses.

The model: :mod:`.elements` (element matrices), :mod:`.model` (validated rotor and assembly),
:mod:`.analysis` (whirl modes at a speed and over a sweep), :mod:`.criticals` (critical speeds and the
critical speed map), :mod:`.response` (unbalance response). The flow: :mod:`.scenario` (the ``[rotor]``
tables), :mod:`.study` (findings and the API checks), :mod:`.record`. All produce the package's
:class:`~resonance.dynamics.modes.Mode`, so the interference check and the records work unchanged.
"""

from .analysis import CampbellData, RotorModes, campbell, rotor_modes
from .criticals import critical_speed_map, critical_speeds
from .model import STEEL, Bearing, Disc, Material, Pedestal, Rotor, ShaftSection, rotor_model
from .response import Unbalance, UnbalanceResponse, rotor_unbalance_response, unbalance_response_rotor
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
