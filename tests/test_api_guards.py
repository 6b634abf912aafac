"""The Python API refuses what it cannot use, with the package's errors naming the parameter.

Swept the way python-control sweeps its functions for unknown keywords: every public function and
constructor that takes user values is called once with good values (invented), then once per parameter
with each bad value of a table (text where a number is needed, NaN, infinity, None, an object, and a
negative or zero value where the parameter must be positive). Every bad call must raise
``InputValueError`` or ``InputTypeError`` (subclasses of ValueError / TypeError) whose message names the
parameter: never AttributeError, IndexError, pint's own exceptions, or silent acceptance. Result holders
(``ModeSet``, ``Finding``, ``HalfPower``, ``RotorModes``...) are built by the package, not by users, and
are left out. Property tests (hypothesis) check the input layer on any finite number and any text.
"""

from __future__ import annotations

import math

import numpy as np
import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

import resonance as R
from resonance.core.inputs import as_si, parse_quantity
from resonance.kinds.rotor import (
    Bearing,
    Disc,
    Material,
    Pedestal,
    ShaftSection,
    Unbalance,
    campbell,
    critical_speed_map,
    rotor_model,
    rotor_modes,
    unbalance_response_rotor,
)

M, K, C = 100.0, 1e6, 200.0
F = [5.0, 10.0, 20.0]
MM, KK = [[2.0, 0.0], [0.0, 1.0]], [[3e4, -1e4], [-1e4, 1e4]]


def _rotor():
    return rotor_model(
        [ShaftSection(1.0, 0.1, elements=4)], [Disc(1, 50.0, 1.0, 0.5)], [Bearing(0, 1e8, 1e8), Bearing(1, 1e8, 1e8)]
    )


ROTOR = _rotor()

# name: (callable, good keyword arguments, {parameter: "+" positive | "0" nonnegative | "*" any sign})
CASES = {
    "natural_frequency": (R.natural_frequency, {"mass": M, "stiffness": K}, {"mass": "+", "stiffness": "+"}),
    "damping_ratio": (
        R.damping_ratio,
        {"mass": M, "stiffness": K, "damping": C},
        {"mass": "+", "stiffness": "+", "damping": "0"},
    ),
    "damping_coefficient": (
        R.damping_coefficient,
        {"mass": M, "stiffness": K, "damping_ratio": 0.05},
        {"mass": "+", "stiffness": "+", "damping_ratio": "0"},
    ),
    "damped_natural_frequency": (
        R.damped_natural_frequency,
        {"mass": M, "stiffness": K, "damping": C},
        {"mass": "+", "stiffness": "+", "damping": "0"},
    ),
    "peak_frequency": (
        R.peak_frequency,
        {"mass": M, "stiffness": K, "damping": C},
        {"mass": "+", "stiffness": "+", "damping": "0"},
    ),
    "sdof_receptance": (
        R.sdof_receptance,
        {"mass": M, "stiffness": K, "damping": C, "frequency": F},
        {"mass": "+", "stiffness": "+", "damping": "0", "frequency": "0"},
    ),
    "harmonic_response": (
        R.harmonic_response,
        {"mass": M, "stiffness": K, "damping": C, "force": 10.0, "frequency": F},
        {"mass": "+", "stiffness": "+", "damping": "0", "force": "*", "frequency": "0"},
    ),
    "unbalance_response": (
        R.unbalance_response,
        {"mass": M, "stiffness": K, "damping": C, "unbalance": 1e-3, "frequency": F},
        {"mass": "+", "stiffness": "+", "damping": "0", "unbalance": "0", "frequency": "0"},
    ),
    "base_excitation_response": (
        R.base_excitation_response,
        {"mass": M, "stiffness": K, "damping": C, "base_amplitude": 1e-4, "frequency": F},
        {"mass": "+", "stiffness": "+", "damping": "0", "base_amplitude": "*", "frequency": "0"},
    ),
    "transmissibility": (
        R.transmissibility,
        {"mass": M, "stiffness": K, "damping": C, "frequency": F},
        {"mass": "+", "stiffness": "+", "damping": "0", "frequency": "0"},
    ),
    "convert_amplitude": (
        R.convert_amplitude,
        {"amplitude": [1.0], "from_convention": "peak", "to_convention": "rms"},
        {"amplitude": "0"},
    ),
    "velocity_amplitude": (
        R.velocity_amplitude,
        {"displacement": [1e-5], "frequency": F[:1]},
        {"displacement": "0", "frequency": "0"},
    ),
    "acceleration_amplitude": (
        R.acceleration_amplitude,
        {"displacement": [1e-5], "frequency": F[:1]},
        {"displacement": "0", "frequency": "0"},
    ),
    "log_decrement": (R.log_decrement, {"damping_ratio": 0.05}, {"damping_ratio": "*"}),  # negative: unstable
    "damping_ratio_from_log_decrement": (
        R.damping_ratio_from_log_decrement,
        {"log_decrement": 0.3},
        {"log_decrement": "*"},
    ),
    "amplification_factor_from_damping_ratio": (
        R.amplification_factor_from_damping_ratio,
        {"damping_ratio": 0.05},
        {"damping_ratio": "0"},  # 0 gives an infinite AF (undamped)
    ),
    "damping_ratio_from_amplification_factor": (
        R.damping_ratio_from_amplification_factor,
        {"amplification_factor": 10.0},
        {"amplification_factor": "+"},
    ),
    "rayleigh_coefficients": (
        R.rayleigh_coefficients,
        {"frequency_1": 5.0, "damping_ratio_1": 0.02, "frequency_2": 50.0, "damping_ratio_2": 0.03},
        {"frequency_1": "+", "damping_ratio_1": "0", "frequency_2": "+", "damping_ratio_2": "0"},
    ),
    "rayleigh_damping": (
        R.rayleigh_damping,
        {"mass_matrix": MM, "stiffness_matrix": KK, "alpha": 0.1, "beta": 1e-4},
        {"mass_matrix": "*", "stiffness_matrix": "*", "alpha": "0", "beta": "0"},
    ),
    "modal_damping": (
        R.modal_damping,
        {"mass_matrix": MM, "stiffness_matrix": KK, "damping_ratios": 0.05},
        {"mass_matrix": "*", "stiffness_matrix": "*", "damping_ratios": "0"},
    ),
    "matrix_model": (
        R.matrix_model,
        {"mass_matrix": MM, "stiffness_matrix": KK},
        {"mass_matrix": "*", "stiffness_matrix": "*"},
    ),
    "Spring": (R.Spring, {"node_a": "a", "node_b": "ground", "stiffness": K}, {"stiffness": "0", "damping": "0"}),
    "chain_model": (R.chain_model, {"masses": [M, M], "stiffnesses": [K, K]}, {"masses": "*", "stiffnesses": "*"}),
    "modes": (R.modes, {"mass_matrix": MM, "stiffness_matrix": KK}, {"mass_matrix": "*", "stiffness_matrix": "*"}),
    "receptance": (
        R.receptance,
        {"mass_matrix": MM, "stiffness_matrix": KK, "damping_matrix": None, "frequency": F, "input_dof": 0},
        {"mass_matrix": "*", "stiffness_matrix": "*", "frequency": "0", "input_dof": "0"},
    ),
    "Mode": (R.Mode, {"frequency": 20.0, "damping_ratio": 0.05}, {"frequency": "+", "damping_ratio": "*"}),
    "Excitation": (R.Excitation, {"label": "x", "order": 2.0}, {"order": "+"}),
    "running_speed_order": (R.running_speed_order, {"order": 2.0}, {"order": "+"}),
    "blade_pass": (R.blade_pass, {"blades": 7}, {"blades": "+"}),
    "gear_mesh": (R.gear_mesh, {"teeth": 31}, {"teeth": "+"}),
    "fixed_frequency": (R.fixed_frequency, {"frequency": 29.6, "label": "x"}, {"frequency": "+"}),
    "line_frequency": (
        R.line_frequency,
        {"supply_frequency": 50.0, "multiple": 2.0},
        {"supply_frequency": "+", "multiple": "+"},
    ),
    "drive_electrical": (
        R.drive_electrical,
        {"poles": 4, "slip": 0.01, "multiple": 2.0},
        {"poles": "+", "slip": "0", "multiple": "+"},
    ),
    "permissible_unbalance": (
        R.permissible_unbalance,
        {"grade": 6.3, "rotor_mass": 300.0, "speed": 1800.0},
        {"grade": "+", "rotor_mass": "+", "speed": "+"},
    ),
    "api_design_unbalance": (
        R.api_design_unbalance,
        {"journal_mass": 200.0, "speed": 3600.0},
        {"journal_mass": "+", "speed": "+"},
    ),
    "unbalance_force": (R.unbalance_force, {"unbalance": 1e-3, "speed": [1800.0]}, {"unbalance": "0", "speed": "0"}),
    "operating_range": (
        R.operating_range,
        {"speed_min": 900.0, "speed_max": 1800.0},
        {"speed_min": "+", "speed_max": "+"},
    ),
    "half_power_points": (
        R.half_power_points,
        {
            "frequency": np.linspace(5.0, 15.0, 41),
            "amplitude": np.abs(R.sdof_receptance(1.0, (20 * np.pi) ** 2, 6.0, np.linspace(5.0, 15.0, 41))),
        },
        {"frequency": "0", "amplitude": "+"},
    ),
    "separation_margin": (
        R.separation_margin,
        {"critical_speed": 1500.0, "speed_min": 1800.0, "speed_max": 3600.0},
        {"critical_speed": "+", "speed_min": "+", "speed_max": "+"},
    ),
    "required_separation_margin": (
        R.required_separation_margin,
        {"amplification_factor": 10.0, "side": "below"},
        {"amplification_factor": "+inf"},
    ),
    "FlatRule": (R.FlatRule, {"percent": 15.0}, {"percent": "+"}),
    "iso_velocity_zone": (
        R.iso_velocity_zone,
        {"velocity_rms": [1e-3], "group": 2, "support": "rigid"},
        {"velocity_rms": "0"},
    ),
    "api_shaft_vibration_limit": (R.api_shaft_vibration_limit, {"speed": 3600.0}, {"speed": "+"}),
    "support_class": (
        R.support_class,
        {"lowest_natural_frequency": 40.0, "running_speed": 1800.0},
        {"lowest_natural_frequency": "+", "running_speed": "+"},
    ),
    "Material": (
        Material,
        {"density": 7850.0, "youngs_modulus": 2e11, "poisson_ratio": 0.3},
        {"density": "+", "youngs_modulus": "+", "poisson_ratio": "*"},
    ),
    "ShaftSection": (
        ShaftSection,
        {"length": 1.0, "outer_diameter": 0.1},
        {"length": "+", "outer_diameter": "+", "inner_diameter": "0"},
    ),
    "Disc": (
        Disc,
        {"station": 1, "mass": 50.0, "polar_inertia": 1.0, "diametral_inertia": 0.5},
        {"mass": "+", "polar_inertia": "0", "diametral_inertia": "0"},
    ),
    "Pedestal": (Pedestal, {"mass": 80.0, "kxx": 1e8, "kyy": 1e8}, {"mass": "+", "kxx": "0", "kyy": "0"}),
    "Bearing": (Bearing, {"station": 0, "kxx": 1e8, "kyy": 1e8}, {"kxx": "*", "kyy": "*", "tilt_stiffness": "0"}),
    "Unbalance": (Unbalance, {"station": 1, "amount": 1e-3}, {"station": "0", "amount": "0", "phase_deg": "*"}),
    "rotor_modes": (
        rotor_modes,
        {"rotor": ROTOR, "speed": 1000.0, "count": 4},
        {"rotor": "*", "speed": "0", "count": "+"},
    ),
    "campbell": (
        campbell,
        {"rotor": ROTOR, "speeds": [0.0, 1000.0], "count": 2},
        {"rotor": "*", "speeds": "0", "count": "+"},
    ),
    "critical_speed_map": (
        critical_speed_map,
        {"rotor": ROTOR, "stiffness": [1e7, 1e8], "count": 2},
        {"rotor": "*", "stiffness": "+", "count": "+"},
    ),
    "unbalance_response_rotor": (
        unbalance_response_rotor,
        {"rotor": ROTOR, "unbalances": [Unbalance(1, 1e-3)], "speeds": [1000.0], "stations": [1]},
        {"rotor": "*", "speeds": "0"},
    ),
}

TEXT, NAN, INF, NONE, OBJECT = "abc", math.nan, math.inf, None, object()


def _bad_values(sign: str) -> list[object]:
    bad = [TEXT, NAN, NONE, OBJECT] + ([] if sign == "+inf" else [INF])  # inf AF: an undamped mode
    if sign in ("+", "0", "+inf"):
        bad.append(-1.0)
    if sign in ("+", "+inf"):
        bad.append(0.0)
    return bad


SWEEP = [
    pytest.param(name, parameter, bad, id=f"{name}-{parameter}-{bad!r}"[:80])
    for name, (_, _, params) in CASES.items()
    for parameter, sign in params.items()
    for bad in _bad_values(sign)
]


@pytest.mark.parametrize("name", sorted(CASES))
def test_good_call_works(name):
    function, good, _ = CASES[name]
    function(**good)


def call_with_bad_value(function, good: dict, parameter: str, bad: object, aliases: tuple[str, ...] = ()) -> None:
    """Call with one bad value and check the package's error names the parameter (shared by both sweeps)."""
    arguments = dict(good)
    # Array parameters of numbers get the bad value in every element (same shape), so the element check is
    # swept too; a bad value that is itself a container replaces the whole argument.
    numbers = isinstance(good.get(parameter), (list, np.ndarray)) and all(
        isinstance(x, (int, float)) for x in np.ravel(np.asarray(good[parameter], dtype=object))
    )
    if numbers and bad is not NONE and not isinstance(bad, (list, tuple, np.ndarray, dict)):
        arguments[parameter] = np.full(np.shape(good[parameter]), bad, dtype=object).tolist()
    else:
        arguments[parameter] = bad
    with pytest.raises((R.InputValueError, R.InputTypeError)) as caught:
        function(**arguments)
    text = str(caught.value)
    words = (parameter.replace("_deg", "").split("_")[0], parameter, *aliases)
    assert any(w in text for w in words), text


@pytest.mark.parametrize(("name", "parameter", "bad"), SWEEP)
def test_bad_value_raises_the_package_error_naming_the_parameter(name, parameter, bad):
    function, good, _ = CASES[name]
    call_with_bad_value(function, good, parameter, bad)


def test_the_sweep_covers_every_public_constructor_and_function():
    import resonance.kinds.rotor as rotor_api

    results = {  # built by the package, not by users
        "ModeSet",
        "Finding",
        "FindingsTable",
        "HalfPower",
        "SteadyState",
        "MatrixModel",
        "OperatingRange",
        "Quantity",
        "display_unit",
        "InputValueError",
        "InputTypeError",
        "ApiLateralRule",
        "TableRule",
        "rule_by_name",
        "RuleSet",
        "interference_check",
        "iso_velocity_zone_limits",
        "lumped_model",
        "modal_properties",
        "model_receptance",
        "mobility",
        "accelerance",
        "twice_line_frequency",
        "electrical_order",
        "amplification_factor",
        "Rotor",
        "RotorModes",
        "CampbellData",
        "UnbalanceResponse",
        "RotorScenario",
        "RotorStudyResult",
        "critical_speeds",
        "load_rotor_scenario",
        "parse_rotor_scenario",
        "run_rotor_study",
        "rotor_model",
        "ureg",
        "__version__",
        "STEEL",
        "model_modes",
        "rotor_unbalance_response",
        "load_scenario",
        "run_study",
        "run_field_study",
        "run_scenario_file",
        "StudyOutcome",
        "build_record",
        "load",  # the one way in: tests/test_one_way_in.py
        "run",
        "panel",
        "StudyKind",
    }  # noqa: the ones left out are tested in their own modules (test_interference, test_mdof, test_rotor...)
    public = {n for n in R.__all__ if callable(getattr(R, n))} | set(rotor_api.__all__)
    assert public - results - set(CASES) == set()


@given(st.floats(allow_nan=True, allow_infinity=True) | st.integers() | st.text(max_size=20) | st.none())
@settings(max_examples=300, deadline=None)
def test_input_layer_accepts_or_refuses_cleanly(value):
    # Property: as_si either returns a finite float or raises the package's error naming the parameter.
    try:
        out = as_si(value, "stiffness", "stiffness", "positive")
    except (R.InputValueError, R.InputTypeError) as error:
        message = str(error)
    else:
        assert math.isfinite(out)
        assert out > 0.0
        return
    assert message.startswith("stiffness:")


@given(st.text(max_size=30))
@settings(max_examples=500, deadline=None)
def test_quantity_text_is_read_exactly_or_refused(text):
    # Property: any text gives a quantity whose number is written in the text, or the package's error.
    try:
        value = parse_quantity(text, "value")
    except (R.InputValueError, R.InputTypeError) as error:
        message = str(error)
    else:
        number = value.magnitude if hasattr(value, "magnitude") else value
        assert math.isfinite(number)
        assert text.strip()[0] in "+-.0123456789"
        return
    assert message.startswith("value: got")
