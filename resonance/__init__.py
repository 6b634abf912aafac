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
"""

from ._version import __version__
from .damping import (
    amplification_factor_from_damping_ratio,
    damping_ratio_from_amplification_factor,
    damping_ratio_from_log_decrement,
    log_decrement,
    modal_damping,
    rayleigh_coefficients,
    rayleigh_damping,
)
from .errors import InputTypeError, InputValueError
from .excitations import (
    Excitation,
    api_design_unbalance,
    blade_pass,
    drive_electrical,
    electrical_order,
    fixed_frequency,
    gear_mesh,
    line_frequency,
    permissible_unbalance,
    running_speed_order,
    twice_line_frequency,
    unbalance_force,
)

# The flows (scenario -> study -> record), so notebooks import from one place.
from .field.study import run_field_study
from .frf import accelerance, mobility, model_receptance, receptance
from .harmonic import acceleration_amplitude, convert_amplitude, velocity_amplitude
from .interference import Finding, FindingsTable, interference_check
from .limits import api_shaft_vibration_limit, iso_velocity_zone, iso_velocity_zone_limits, support_class
from .margins import (
    ApiLateralRule,
    FlatRule,
    HalfPower,
    TableRule,
    amplification_factor,
    half_power_points,
    required_separation_margin,
    rule_by_name,
    separation_margin,
)
from .model import GROUND, MatrixModel, Spring, chain_model, lumped_model, matrix_model
from .modes import Mode, ModeSet, modal_properties, model_modes, modes
from .record import build_record
from .rotor.scenario import load_rotor_scenario
from .rotor.study import run_rotor_study
from .rules import RuleSet
from .scenario import load_scenario
from .sdof import (
    SteadyState,
    base_excitation_response,
    damped_natural_frequency,
    damping_coefficient,
    damping_ratio,
    harmonic_response,
    natural_frequency,
    peak_frequency,
    sdof_receptance,
    transmissibility,
    unbalance_response,
)
from .speed_range import OperatingRange, operating_range
from .studies import StudyOutcome, run_scenario_file
from .study import run_study
from .units import Quantity, display_unit, ureg

__all__ = [
    "__version__",
    # units
    "ureg",
    "Quantity",
    "display_unit",
    # errors
    "InputValueError",
    "InputTypeError",
    # single degree of freedom
    "SteadyState",
    "natural_frequency",
    "damping_ratio",
    "damping_coefficient",
    "damped_natural_frequency",
    "peak_frequency",
    "sdof_receptance",
    "harmonic_response",
    "unbalance_response",
    "base_excitation_response",
    "transmissibility",
    # amplitudes
    "convert_amplitude",
    "velocity_amplitude",
    "acceleration_amplitude",
    # damping
    "log_decrement",
    "damping_ratio_from_log_decrement",
    "amplification_factor_from_damping_ratio",
    "damping_ratio_from_amplification_factor",
    "rayleigh_coefficients",
    "rayleigh_damping",
    "modal_damping",
    # matrix models
    "MatrixModel",
    "Spring",
    "GROUND",
    "matrix_model",
    "lumped_model",
    "chain_model",
    "Mode",
    "ModeSet",
    "modes",
    "model_modes",
    "modal_properties",
    "receptance",
    "mobility",
    "accelerance",
    "model_receptance",
    # excitations
    "Excitation",
    "running_speed_order",
    "blade_pass",
    "gear_mesh",
    "fixed_frequency",
    "twice_line_frequency",
    "line_frequency",
    "drive_electrical",
    "electrical_order",
    "permissible_unbalance",
    "api_design_unbalance",
    "unbalance_force",
    # margins and checks
    "OperatingRange",
    "operating_range",
    "HalfPower",
    "half_power_points",
    "amplification_factor",
    "separation_margin",
    "required_separation_margin",
    "ApiLateralRule",
    "FlatRule",
    "TableRule",
    "rule_by_name",
    "RuleSet",
    "Finding",
    "FindingsTable",
    "interference_check",
    # limits
    "iso_velocity_zone_limits",
    "iso_velocity_zone",
    "api_shaft_vibration_limit",
    "support_class",
    # flows
    "load_scenario",
    "run_study",
    "load_rotor_scenario",
    "run_rotor_study",
    "run_field_study",
    "run_scenario_file",
    "StudyOutcome",
    "build_record",
]
