"""resonance: prove that a rotating machine does not run near a resonance.

The package computes the response, phase, modes and amplification of machines
and their supports, and checks every natural frequency against every
excitation across the operating speed range by the margin rules of the
governing standards. Plain numbers follow one convention: SI base units,
except that frequencies are in Hz and shaft speeds in rpm; pint quantities of
:data:`ureg` (whose rpm, cpm and mil are the machinery units) are accepted
everywhere. Amplitudes are 0-peak unless a name says otherwise.

Results are engineering estimates; they do not replace the governing
standard, the manufacturer's data, field verification or review by a
qualified engineer.

The names below are loaded on first use (a lazy namespace, PEP 562), so ``import resonance`` and
``python -m resonance --help`` start at once; each name lives in the module its concept belongs to. The one
way in for every kind of study: :func:`load` a scenario file, :func:`run` it, and :func:`panel` for the
notebook panel of any scenario.
"""

from __future__ import annotations

import importlib
import importlib.util
import sys
import types
from typing import Any

from ._version import __version__

#: Where each public name lives: loaded from there on first use.
_NAMES: dict[str, str] = {
    "ureg": "units",
    "Quantity": "units",
    "display_unit": "units",
    "InputValueError": "errors",
    "InputTypeError": "errors",
    "SteadyState": "sdof",
    "natural_frequency": "sdof",
    "damping_ratio": "sdof",
    "damping_coefficient": "sdof",
    "damped_natural_frequency": "sdof",
    "peak_frequency": "sdof",
    "sdof_receptance": "sdof",
    "harmonic_response": "sdof",
    "unbalance_response": "sdof",
    "base_excitation_response": "sdof",
    "transmissibility": "sdof",
    "convert_amplitude": "harmonic",
    "velocity_amplitude": "harmonic",
    "acceleration_amplitude": "harmonic",
    "log_decrement": "damping",
    "damping_ratio_from_log_decrement": "damping",
    "amplification_factor_from_damping_ratio": "damping",
    "damping_ratio_from_amplification_factor": "damping",
    "rayleigh_coefficients": "damping",
    "rayleigh_damping": "damping",
    "modal_damping": "damping",
    "MatrixModel": "model",
    "Spring": "model",
    "GROUND": "model",
    "matrix_model": "model",
    "lumped_model": "model",
    "chain_model": "model",
    "Mode": "modes",
    "ModeSet": "modes",
    "modes": "modes",
    "model_modes": "modes",
    "modal_properties": "modes",
    "receptance": "frf",
    "mobility": "frf",
    "accelerance": "frf",
    "model_receptance": "frf",
    "Excitation": "excitations",
    "running_speed_order": "excitations",
    "blade_pass": "excitations",
    "gear_mesh": "excitations",
    "fixed_frequency": "excitations",
    "twice_line_frequency": "excitations",
    "line_frequency": "excitations",
    "drive_electrical": "excitations",
    "electrical_order": "excitations",
    "permissible_unbalance": "excitations",
    "api_design_unbalance": "excitations",
    "unbalance_force": "excitations",
    "OperatingRange": "speed_range",
    "operating_range": "speed_range",
    "HalfPower": "margins",
    "half_power_points": "margins",
    "amplification_factor": "margins",
    "separation_margin": "margins",
    "required_separation_margin": "margins",
    "ApiLateralRule": "margins",
    "FlatRule": "margins",
    "TableRule": "margins",
    "rule_by_name": "margins",
    "RuleSet": "rules",
    "Finding": "interference",
    "FindingsTable": "interference",
    "interference_check": "interference",
    "iso_velocity_zone_limits": "limits",
    "iso_velocity_zone": "limits",
    "api_shaft_vibration_limit": "limits",
    "support_class": "limits",
    "load_scenario": "scenario",
    "run_study": "study",
    "load_rotor_scenario": "rotor.scenario",
    "run_rotor_study": "rotor.study",
    "run_field_study": "field.study",
    "run_scenario_file": "studies",
    "StudyOutcome": "studies",
    "build_record": "record",
    "load": "studies",
    "run": "studies",
    "StudyKind": "studies",
    "panel": "ui",
}

__all__ = ["__version__", *_NAMES]  # the table above, in its order: units, physics, checks, flows, the way in


class _Namespace(types.ModuleType):
    # Importing a submodule binds it on its package under its own name; where a public name is also a module
    # name (the function ``modes`` of ``resonance.modes``), the public name keeps its place, as in 0.2.
    def __setattr__(self, name: str, value: Any) -> None:
        if isinstance(value, types.ModuleType) and _NAMES.get(name) == name and hasattr(value, name):
            value = getattr(value, name)
        super().__setattr__(name, value)


sys.modules[__name__].__class__ = _Namespace


def __getattr__(name: str) -> Any:
    # PEP 562: import the module that holds a public name when it is first asked for.
    module = _NAMES.get(name)
    if module is None:
        if not name.startswith("_") and importlib.util.find_spec(f"{__name__}.{name}") is not None:
            return importlib.import_module(f".{name}", __name__)  # a submodule: ``resonance.record``, as in 0.2
        raise AttributeError(f"module 'resonance' has no attribute {name!r}")
    value = getattr(importlib.import_module(f".{module}", __name__), name)
    globals()[name] = value  # later look-ups skip this function
    return value


def __dir__() -> list[str]:
    return sorted({*globals(), *_NAMES})
