"""The newer kinds' Python API refuses what it cannot use, with the package's errors naming the parameter.

The same sweep as tests/test_api_guards.py (after python-control's sweep of its functions): every public
constructor and function of the torsion, space, frame, soil, speed-range and uncertainty modules that takes
user values is called once with good (invented) values, then once per parameter with text, NaN, infinity,
None, an object, and a negative or zero value where the parameter must be positive. Every bad call must
raise ``InputValueError`` or ``InputTypeError`` naming the parameter: never AttributeError,
ZeroDivisionError, an unpacking error or silent acceptance. Results built by the package are left out.
"""

from __future__ import annotations

import numpy as np
import pytest
from test_api_guards import NONE, _bad_values, call_with_bad_value

from resonance.checks import speed_range
from resonance.kinds.space import bodies as space
from resonance.kinds.space import frame, soil
from resonance.kinds.space import modes as space_modes_module
from resonance.kinds.space import response as space_response_module
from resonance.kinds.torsion import elements
from resonance.kinds.torsion import response as torsion_response
from resonance.kinds.torsion import train as torsion
from resonance.studies import uncertainty

TRAIN = torsion.torsional_train(
    [elements.Station("m", 2.0), elements.Station("f", 1.0)], [elements.Coupling(("m", "f"), 1e5, label="c")]
)
BODY = space.RigidBody("skid", 500.0, [0.0, 0.0, 0.0], space.box_inertia(500.0, 2.0, 1.0, 0.5))
MOUNT = space.Mount("pad", [0.0, 0.0, -0.25], "skid", stiffness=[1e7, 1e7, 1e7], rotational_stiffness=[1e6] * 3)
MODEL = space.space_model([BODY], [MOUNT])

# name: (callable, good keyword arguments, {parameter: "+" positive | "0" nonnegative | "*" any sign})
CASES = {
    "Station": (elements.Station, {"name": "m", "inertia": 2.0}, {"inertia": "+"}),
    "TorsionalShaft": (
        elements.TorsionalShaft,
        {"between": ("a", "b"), "stiffness": 1e5, "damping": 10.0},
        {"stiffness": "+", "damping": "0"},
    ),
    "Coupling": (elements.Coupling, {"between": ("a", "b"), "stiffness": 1e5}, {"stiffness": "+", "damping": "0"}),
    "GearMesh": (elements.GearMesh, {"gear": "g", "pinion": "p", "ratio": 3.2}, {"ratio": "+"}),
    "hollow_shaft_stiffness": (
        elements.hollow_shaft_stiffness,
        {"shear_modulus": 80e9, "length": 1.0, "outer_diameter": 0.1},
        {"shear_modulus": "+", "length": "+", "outer_diameter": "+", "inner_diameter": "0"},
    ),
    "stepped_shaft_stiffness": (
        elements.stepped_shaft_stiffness,
        {"shear_modulus": 80e9, "sections": [(1.0, 0.1, 0.0)]},
        {"shear_modulus": "+", "sections": "*"},
    ),
    "shaft_order": (
        torsion.shaft_order,
        {"train": TRAIN, "shaft": "driver", "order": 2.0},
        {"train": "*", "shaft": "*", "order": "+"},
    ),
    "scale_couplings": (torsion.scale_couplings, {"train": TRAIN, "factor": 1.2}, {"train": "*", "factor": "+"}),
    "scale_dampers": (torsion.scale_dampers, {"train": TRAIN, "factor": 1.2}, {"train": "*", "factor": "+"}),
    "torque_response": (
        torsion_response.torque_response,
        {"train": TRAIN, "torques": {"m": 10.0}, "frequency": [5.0, 10.0]},
        {"train": "*", "torques": "*", "frequency": "+"},
    ),
    "torsional_mode_list": (torsion.torsional_mode_list, {"train": TRAIN}, {"train": "*", "damping_ratio": "0"}),
    "torsional_modes": (torsion.torsional_modes, {"train": TRAIN}, {"train": "*"}),
    "torsional_shapes": (torsion.torsional_shapes, {"train": TRAIN}, {"train": "*"}),
    "torsional_train": (
        torsion.torsional_train,
        {
            "stations": [elements.Station("m", 2.0), elements.Station("f", 1.0)],
            "springs": [elements.Coupling(("m", "f"), 1e5)],
        },
        {"stations": "*", "springs": "*", "meshes": "*"},
    ),
    "RigidBody": (
        space.RigidBody,
        {"name": "skid", "mass": 500.0, "center": [0.0, 0.0, 0.0], "inertia": space.box_inertia(500.0, 2.0, 1.0, 0.5)},
        {"mass": "+", "center": "*", "inertia": "*"},
    ),
    "Mount": (
        space.Mount,
        {"label": "pad", "point": [0.0, 0.0, 0.0], "body": "skid", "stiffness": [1e7, 1e7, 1e7]},
        {"point": "*", "stiffness": "0", "damping": "0", "rotational_stiffness": "0", "rotational_damping": "0"},
    ),
    "FrameNode": (space.FrameNode, {"name": "n1", "point": [0.0, 0.0, 1.0]}, {"point": "*"}),
    "box_inertia": (
        space.box_inertia,
        {"mass": 500.0, "lx": 2.0, "ly": 1.0, "lz": 0.5},
        {"mass": "+", "lx": "+", "ly": "+", "lz": "+"},
    ),
    "rotating_unbalance": (
        space_response_module.rotating_unbalance,
        {"body": "skid", "point": [0.0, 0.0, 0.0], "axis": [1.0, 0.0, 0.0], "unbalance": 1e-3, "frequency": [10.0]},
        {"point": "*", "axis": "*", "unbalance": "+", "frequency": "0"},
    ),
    "unbalance_reference": (space_response_module.unbalance_reference, {"axis": [0.0, 0.0, 1.0]}, {"axis": "*"}),
    "space_modes": (space_modes_module.space_modes, {"model": MODEL}, {"model": "*"}),
    "space_response": (
        space_response_module.space_response,
        {
            "model": MODEL,
            "loads": [space_response_module.rotating_unbalance("skid", [0, 0, 0], [1, 0, 0], 1e-3, [10.0])],
            "frequency": [10.0],
            "points": [("skid", [0.0, 0.0, 0.0])],
        },
        {"model": "*", "frequency": "0"},
    ),
    "space_model": (space.space_model, {"bodies": [BODY], "mounts": [MOUNT]}, {"bodies": "*", "mounts": "*"}),
    "orbit_major": (
        space_response_module.orbit_major,
        {"displacement": np.ones((1, 3), dtype=complex)},
        {"displacement": "*"},
    ),
    "Beam": (
        frame.Beam,
        {
            "label": "girder",
            "node_a": "a",
            "node_b": "b",
            "youngs_modulus": 2.1e11,
            "shear_modulus": 8e10,
            "density": 7850.0,
            "area": 4e-3,
            "iy": 5e-5,
            "iz": 3e-5,
            "torsion_constant": 1e-6,
        },
        {
            "youngs_modulus": "+",
            "shear_modulus": "+",
            "density": "+",
            "area": "+",
            "iy": "+",
            "iz": "+",
            "torsion_constant": "+",
        },
    ),
    "footing_impedance": (
        soil.footing_impedance,
        {
            "shear_modulus": 60e6,
            "poisson_ratio": 0.33,
            "density": 1900.0,
            "mass": 5e4,
            "rocking_inertia_x": 4e4,
            "rocking_inertia_y": 6e4,
            "torsion_inertia": 8e4,
            "radius": 2.0,
        },
        {"shear_modulus": "+", "density": "+", "mass": "+", "radius": "+"},
    ),
    "operating_range": (
        speed_range.operating_range,
        {"speed_min": 1000.0, "speed_max": 2000.0, "skip_bands": [(1200.0, 1300.0)]},
        {"speed_min": "+", "speed_max": "+", "skip_bands": "*"},
    ),
    "UncertainInput": (
        uncertainty.UncertainInput,
        {"vary": "spring:soil", "distribution": "uniform", "a": 0.8, "b": 1.2},
        {"distribution": "*", "a": "+", "b": "+"},
    ),
    "UncertaintySpec": (
        uncertainty.UncertaintySpec,
        {"inputs": (uncertainty.UncertainInput("spring:soil", "uniform", 0.8, 1.2),), "samples": 64},
        {"inputs": "*", "samples": "+", "sampling": "*", "seed": "0"},
    ),
}

EXTRA = {  # values of the wrong shape or kind that are not in the shared table
    "skip_bands": [(1, 2), 5, [(1200.0,)], [(1300.0, 1200.0)]],
    "sections": [[], [(1.0, 0.1)], "abc"],
    "stations": [[], [1, 2]],
    "springs": [[1]],
    "meshes": [[1]],
    "axis": [[0.0, 0.0, 0.0], [1.0, 0.0]],
    "center": [[0.0, 0.0]],
    "point": [[0.0, 0.0]],
    "inertia": [np.eye(2), -np.eye(3)],
    "torques": [{"nowhere": 1.0}, {"m": "abc"}, []],
    "displacement": [np.ones(2), np.ones((2, 2))],
    "distribution": ["gamma"],
    "sampling": ["mc"],
    "inputs": [()],
    "bodies": [[], [1], [BODY, BODY]],
    "mounts": [[1], [MOUNT, MOUNT]],
}
ALIASES = {"where": ("workers", "scheduler")}  # executor_for speaks of the command's options

OPTIONAL = {"damping_ratio"}  # None is their documented default

SWEEP = [
    pytest.param(name, parameter, bad, id=f"{name}-{parameter}-{bad!r}"[:80])
    for name, (_, _, params) in CASES.items()
    for parameter, sign in params.items()
    for bad in _bad_values(sign) + EXTRA.get(parameter, [])
    if not (bad is NONE and parameter in OPTIONAL)
]


@pytest.mark.parametrize("name", sorted(CASES))
def test_good_call_works(name):
    function, good, _ = CASES[name]
    function(**good)


@pytest.mark.parametrize(("name", "parameter", "bad"), SWEEP)
def test_bad_value_raises_the_package_error_naming_the_parameter(name, parameter, bad):
    function, good, _ = CASES[name]
    call_with_bad_value(function, good, parameter, bad, ALIASES.get(parameter, ()))


CASES_MORE = {
    "executor_for": (
        __import__("resonance.core.executors", fromlist=["executor_for"]).executor_for,
        {"where": None},
        {"where": "*"},
    ),
    "induction_slip": (
        __import__("resonance.checks.electrical", fromlist=["induction_slip"]).induction_slip,
        {"speed": [1000.0, 1500.0], "rated_speed": 1500.0, "rated_slip": 0.01, "load": "constant torque"},
        {"speed": "+", "rated_speed": "+", "rated_slip": "0", "load": "*"},
    ),
    "rectangular_sliding_stiffness": (
        soil.rectangular_sliding_stiffness,
        {"shear_modulus": 60e6, "poisson_ratio": 0.33, "width_x": 5.0, "width_y": 3.6},
        {"shear_modulus": "+", "poisson_ratio": "0", "width_x": "+", "width_y": "+"},
    ),
}
EXTRA_MORE = {"where": ["abc", -1, 10_000, "tcp://127.0.0.1"], "load": ["fan law"]}
SWEEP_MORE = [
    pytest.param(name, parameter, bad, id=f"{name}-{parameter}-{bad!r}"[:80])
    for name, (_, _, params) in CASES_MORE.items()
    for parameter, sign in params.items()
    for bad in (EXTRA_MORE.get(parameter, []) if sign == "*" else _bad_values(sign) + EXTRA_MORE.get(parameter, []))
]


@pytest.mark.parametrize(("name", "parameter", "bad"), SWEEP_MORE)
def test_more_bad_values_raise_the_package_error_naming_the_parameter(name, parameter, bad):
    function, good, _ = CASES_MORE[name]
    call_with_bad_value(function, good, parameter, bad, ALIASES.get(parameter, ()))


def test_the_sweep_covers_every_public_function_of_the_newer_modules():
    from resonance import fleet
    from resonance.core import executors

    built = {  # results and holders built by the package, or swept in their own tests
        "TorsionalShape",
        "TorsionalTrain",
        "TorqueResponse",
        "PointLoad",
        "SpaceMode",
        "SpaceModel",
        "equivalent_box",  # takes a RigidBody's own mass and inertia (validated there)
        "point_motion",  # takes a RigidBody (validated there)
        "beam_matrices",  # takes a Beam (validated there)
        "beam_rotation",  # the Beam's geometry; swept through Beam and space_model in test_space.py
        "FootingImpedance",
        "FootingMotion",
        "soil_mount",  # takes a FootingImpedance
        "OperatingRange",
        "UncertaintyResult",
        "evaluate_chunk",
        "run_uncertainty",
        "sample_inputs",
        "sensitivity_indices",
        "uncertainty_lines",
        "uncertainty_spec",  # scenario tables: fuzzed in test_fuzz.py
        "DaskExecutor",
        "Executor",
        "ProcessExecutor",
        "SerialExecutor",
        "progress_bar",
        "FleetRow",
        "fleet_files",
        "fleet_summary_csv",
        "fleet_summary_text",
        "run_fleet",  # files and folders: tests/test_fleet.py
    }
    modules = (
        torsion,
        elements,
        torsion_response,
        space,
        space_modes_module,
        space_response_module,
        frame,
        soil,
        speed_range,
        uncertainty,
        executors,
        fleet,
    )
    public = {n for m in modules for n in m.__all__ if callable(getattr(m, n))}
    assert public - built - set(CASES) - set(CASES_MORE) == set()
