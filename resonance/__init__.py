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

import sys
import types
from typing import Any

from ._version import __version__
from .core.lazy import lazy_names

#: Where each public name lives: loaded from there on first use.
_NAMES: dict[str, str] = {
    "ureg": "core.units",
    "Quantity": "core.units",
    "display_unit": "core.units",
    "InputValueError": "core.errors",
    "InputTypeError": "core.errors",
    "SteadyState": "dynamics.sdof",
    "natural_frequency": "dynamics.sdof",
    "damping_ratio": "dynamics.sdof",
    "damping_coefficient": "dynamics.sdof",
    "damped_natural_frequency": "dynamics.sdof",
    "peak_frequency": "dynamics.sdof",
    "sdof_receptance": "dynamics.sdof",
    "harmonic_response": "dynamics.sdof",
    "unbalance_response": "dynamics.sdof",
    "base_excitation_response": "dynamics.sdof",
    "transmissibility": "dynamics.sdof",
    "convert_amplitude": "dynamics.harmonic",
    "velocity_amplitude": "dynamics.harmonic",
    "acceleration_amplitude": "dynamics.harmonic",
    "log_decrement": "dynamics.damping",
    "damping_ratio_from_log_decrement": "dynamics.damping",
    "amplification_factor_from_damping_ratio": "dynamics.damping",
    "damping_ratio_from_amplification_factor": "dynamics.damping",
    "rayleigh_coefficients": "dynamics.damping",
    "rayleigh_damping": "dynamics.damping",
    "modal_damping": "dynamics.damping",
    "MatrixModel": "dynamics.model",
    "Spring": "dynamics.model",
    "GROUND": "dynamics.model",
    "matrix_model": "dynamics.model",
    "lumped_model": "dynamics.model",
    "chain_model": "dynamics.model",
    "Mode": "dynamics.modes",
    "ModeSet": "dynamics.modes",
    "modes": "dynamics.modes",
    "model_modes": "dynamics.modes",
    "modal_properties": "dynamics.modes",
    "receptance": "dynamics.frf",
    "mobility": "dynamics.frf",
    "accelerance": "dynamics.frf",
    "model_receptance": "dynamics.frf",
    "Excitation": "checks.excitations",
    "running_speed_order": "checks.excitations",
    "blade_pass": "checks.excitations",
    "gear_mesh": "checks.excitations",
    "fixed_frequency": "checks.excitations",
    "twice_line_frequency": "checks.electrical",
    "line_frequency": "checks.electrical",
    "drive_electrical": "checks.electrical",
    "electrical_order": "checks.electrical",
    "permissible_unbalance": "checks.unbalance",
    "api_design_unbalance": "checks.unbalance",
    "unbalance_force": "checks.unbalance",
    "OperatingRange": "checks.speed_range",
    "operating_range": "checks.speed_range",
    "HalfPower": "checks.margins",
    "half_power_points": "checks.margins",
    "amplification_factor": "checks.margins",
    "separation_margin": "checks.margins",
    "required_separation_margin": "checks.margins",
    "ApiLateralRule": "checks.margins",
    "FlatRule": "checks.margins",
    "TableRule": "checks.margins",
    "rule_by_name": "checks.margins",
    "RuleSet": "checks.rules",
    "Finding": "checks.interference",
    "FindingsTable": "checks.interference",
    "interference_check": "checks.interference",
    "iso_velocity_zone_limits": "checks.limits",
    "iso_velocity_zone": "checks.limits",
    "api_shaft_vibration_limit": "checks.limits",
    "support_class": "checks.limits",
    "load_scenario": "kinds.support.scenario",
    "run_study": "kinds.support.study",
    "load_rotor_scenario": "kinds.rotor.scenario",
    "run_rotor_study": "kinds.rotor.study",
    "run_field_study": "kinds.field.study",
    "run_scenario_file": "studies.registry",
    "StudyOutcome": "records.outcome",
    "build_record": "kinds.support.record",
    "load": "studies.registry",
    "run": "studies.registry",
    "StudyKind": "records.outcome",
    "panel": "ui",
}

__all__ = ["__version__", *_NAMES]  # the table above, in its order: units, physics, checks, flows, the way in


class _Namespace(types.ModuleType):
    # Importing a submodule binds it on its package under its own name; where a public name is also a module
    # name (the function ``modes`` of ``resonance.dynamics.modes``), the public name keeps its place, as in 0.2.
    def __setattr__(self, name: str, value: Any) -> None:
        if isinstance(value, types.ModuleType) and _NAMES.get(name) == name and hasattr(value, name):
            value = getattr(value, name)
        super().__setattr__(name, value)


sys.modules[__name__].__class__ = _Namespace


__getattr__, __dir__ = lazy_names(__name__, _NAMES, globals(), layers=True)  # a layer too: ``resonance.checks``
