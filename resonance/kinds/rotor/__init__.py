"""The rotor kind: a rotor on bearings (finite shaft elements, discs, bearings, pedestals) and its analyses.

The model: :mod:`.elements` (element matrices), :mod:`.model` (validated rotor and assembly),
:mod:`.analysis` (whirl modes at a speed and over a sweep), :mod:`.criticals` (critical speeds and the
critical speed map), :mod:`.response` (unbalance response). The flow: :mod:`.scenario` (the ``[rotor]``
tables), :mod:`.study` (findings and the API checks), :mod:`.record`. All produce the package's
:class:`~resonance.dynamics.modes.Mode`, so the interference check and the records work unchanged.
"""

from ...core.lazy import lazy_names

#: Where each name of the rotor kind lives: loaded on first use, so the registry's rotor entry (and with it
#: every ``check``) does not import the rotor analyses until a rotor scenario is run.
_NAMES = {
    "CampbellData": "analysis",
    "RotorModes": "analysis",
    "campbell": "analysis",
    "rotor_modes": "analysis",
    "critical_speed_map": "criticals",
    "critical_speeds": "criticals",
    "STEEL": "model",
    "Bearing": "model",
    "Disc": "model",
    "Material": "model",
    "Pedestal": "model",
    "Rotor": "model",
    "ShaftSection": "model",
    "rotor_model": "model",
    "Unbalance": "response",
    "UnbalanceResponse": "response",
    "rotor_unbalance_response": "response",
    "unbalance_response_rotor": "response",
    "RotorScenario": "scenario",
    "load_rotor_scenario": "scenario",
    "parse_rotor_scenario": "scenario",
    "RotorStudyResult": "study",
    "run_rotor_study": "study",
}
__all__ = list(_NAMES)  # the table above: one list of the kind's names


__getattr__, __dir__ = lazy_names(__name__, _NAMES, globals())
