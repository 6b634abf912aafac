"""Scenario files: the whole input of a check, in plain TOML.

A scenario names the machine, its operating speed range (with drive skip
bands), the excitations, the margin rule, a lumped model of the machine and
its support, the unbalance that drives the response, the vibration class for
the ISO zones, and what a what-if study may vary. Values are numbers in the
package convention (SI base units, frequencies in Hz, speeds in rpm) or text
with a unit, such as ``"45 kN/mm"``, ``"2.5e5 lbf/in"`` or ``"1800 rpm"``.

Every error names the file and the field (``pump.toml: speed.max: ...``);
:func:`load_scenario` never writes, and :func:`save_scenario` refuses to
overwrite an existing file unless told to.

Example (see ``notebooks/scenarios/`` for complete files)::

    [scenario]
    title = "Cooling-water pump P-101 on steel skid"
    units = "SI"

    [speed]
    min = "900 rpm"
    max = "1800 rpm"
    skip_bands = [["1150 rpm", "1250 rpm"]]

    [[excitations]]
    order = 1

    [[excitations]]
    electrical = 2                  # twice the motor's electrical frequency (needs [motor])

    [[excitations]]
    frequency = "29.6 Hz"           # a fixed source
    label = "cooling tower fan"

    [motor]
    supply = "drive"                # "drive": f_e follows the speed; "line": fixed at line_frequency
    poles = 4
    slip = 0.013                    # at the load of interest; 0 for a synchronous motor
    # line_frequency = "50 Hz"      # for supply = "line"

    [margin]
    flat = 15                       # percent: structural modes, other orders, electrical and fixed sources
    rule = "api-lateral"            # rotor lateral modes against 1x (the default); "flat-P" or a table
    # torsional = 10                # percent, torsional modes (default 10, API 617 from memory)
    # pairs = [{ mode = "structural", excitation = "fixed", rule = "flat-20" }]

    [model]
    damping_ratio = 0.04
    masses = [{ name = "pump", mass = "1800 kg" }]
    springs = [{ between = ["pump", "ground"], stiffness = "45 kN/mm", label = "skid" }]

    [response]
    balance_grade = 6.3             # or: unbalance = "2000 g*mm"
    rotor_mass = "350 kg"
    force_at = "pump"
    measure_at = "pump"

    [vibration]
    group = 2
    support = "rigid"

    [whatif]
    vary_springs = ["skid"]
    tolerance = 0.3

    [record]                        # revision control of the calculation record (all optional)
    preparer = "A. Engineer"
    checker = "B. Reviewer"
    revision = "B"
    date = "2026-12-03"

Margin rules are applied only where the trade applies them
(:mod:`resonance.checks.rules`): the rule named by ``margin.rule`` governs rotor
lateral modes against 1x; ``margin.flat`` (a percentage, required whenever
such a pair is checked) governs every structural mode and every other
excitation. ``rule = "flat-P"`` without ``flat`` applies P % to every pair.
"""

from __future__ import annotations

import dataclasses
import os
from collections.abc import Mapping, Sequence
from dataclasses import dataclass
from pathlib import Path
from typing import Any

import numpy as np

from ...checks.speed_range import OperatingRange
from ...checks.unbalance import permissible_unbalance
from ...core.errors import InputValueError
from ...dynamics.lumped import MassSpec, ModelSpec, SpringSpec
from ...dynamics.model import GROUND
from ...records.excitation_tables import (
    MotorSpec,
    excitation_table,
    motor_table,
    parse_excitations,
    parse_motor,
    parse_speed,
    speed_table,
)
from ...records.head import ScenarioHead
from ...records.rule_tables import parse_rules, parse_vibration, rules_table
from ...records.tables import (
    RecordSpec,
    ScenarioError,
    TableReader,
    parse_head,
    parse_record,
    read_scenario_bytes,
    read_scenario_file,
    scenario_loader,
    write_scenario_table,
)

__all__ = [
    # the support scenario
    "MAX_MASSES",
    "ResponseSpec",
    "VibrationSpec",
    "WhatIfSpec",
    "MotorSpec",
    "RecordSpec",
    "Scenario",
    "parse_scenario",
    "load_scenario",
    "scenario_to_dict",
    "save_scenario",
    # shared with every kind of scenario, importable from here as before (defined in lumped and tables)
    "ScenarioError",
    "MassSpec",
    "SpringSpec",
    "ModelSpec",
    "read_scenario_file",
    "read_scenario_bytes",
    "write_scenario_table",
]


#: The largest lumped model a scenario may hold: the whole study of a 500-mass chain took 1.0 s on a 2-core
#: machine; the panels and the what-if band run it many times.
MAX_MASSES = 500


@dataclass(frozen=True)
class ResponseSpec:
    """What drives the forced response and where it is read.

    Attributes
    ----------
    unbalance : float
        Unbalance [kg m] acting at 1x.
    force_at, measure_at : str
        Mass names where the unbalance force acts and the response is read.
    balance_grade : float or None
        ISO 21940-11 grade [mm/s] the unbalance was set from, if any.
    rotor_mass : float or None
        Rotor mass [kg] for the grade.
    """

    unbalance: float
    force_at: str
    measure_at: str
    balance_grade: float | None = None
    rotor_mass: float | None = None

    @property
    def basis(self) -> str:
        """How the unbalance was set, for the record."""
        if self.balance_grade is None:
            return f"{self.unbalance * 1e6:.4g} g mm as given"
        return f"ISO 21940-11 G{self.balance_grade:g} for a {self.rotor_mass:g} kg rotor at the maximum speed"


@dataclass(frozen=True)
class VibrationSpec:
    """ISO 10816-3 class for the casing-velocity zones: group 1 or 2, rigid or flexible.

    Attributes
    ----------
    group : {1, 2}
        ISO 10816-3 machine group.
    support : {"rigid", "flexible"}
        The declared support class.
    """

    group: int
    support: str


@dataclass(frozen=True)
class WhatIfSpec:
    """What a what-if study varies: spring labels, mass names, and the stiffness tolerance [-].

    Attributes
    ----------
    vary_springs : tuple of str
        Spring labels a what-if study scales.
    vary_masses : tuple of str
        Mass names it scales.
    tolerance : float
        Relative stiffness band [-] (0.3 is +/- 30 %).
    """

    vary_springs: tuple[str, ...]
    vary_masses: tuple[str, ...]
    tolerance: float


@dataclass(frozen=True)
class Scenario(ScenarioHead):
    """A validated scenario (see the module notes for the file format).

    ``sha256`` is the SHA-256 of the scenario file's bytes when it was loaded
    from a file (None for a scenario built or edited in memory).

    The head (title, description, units, speed, excitations, rules) is that of
    :class:`~resonance.records.head.ScenarioHead`; these follow it.

    Attributes
    ----------
    model : ModelSpec
        The lumped model.
    response : ResponseSpec
        What drives the forced response and where it is read.
    vibration : VibrationSpec
        ISO zone class.
    whatif : WhatIfSpec
        What a what-if study varies.
    source : str
        The file name.
    field : mapping or None
        The ``[field]`` table, validated by :func:`resonance.kinds.field.study.field_spec`.
    motor : MotorSpec or None
        The driving motor.
    record : RecordSpec
        Revision fields.
    sha256 : str or None
        SHA-256 of the file's bytes.
    uncertainty : mapping or None
        The ``[uncertainty]`` table, validated by :func:`resonance.studies.uncertainty.uncertainty_spec`.
    """

    model: ModelSpec
    response: ResponseSpec
    vibration: VibrationSpec
    whatif: WhatIfSpec
    source: str = "<scenario>"
    field: Mapping[str, Any] | None = dataclasses.field(default=None, compare=False)
    motor: MotorSpec | None = None
    record: RecordSpec = dataclasses.field(default_factory=RecordSpec)
    sha256: str | None = dataclasses.field(default=None, compare=False)
    uncertainty: Mapping[str, Any] | None = dataclasses.field(default=None, compare=False)

    def with_speed(self, speed: OperatingRange) -> Scenario:
        """A copy with another speed range; a grade-based unbalance follows the new maximum speed."""
        response = self.response
        if response.balance_grade is not None and response.rotor_mass is not None:
            unbalance = permissible_unbalance(response.balance_grade, response.rotor_mass, speed.speed_max)
            response = dataclasses.replace(response, unbalance=unbalance)
        return dataclasses.replace(self, speed=speed, response=response)


def _model(r: TableReader, data: Mapping[str, Any]) -> ModelSpec:
    r.known(data, ("damping_ratio", "masses", "springs"), "model")
    zeta = r.quantity(data, "damping_ratio", "model.damping_ratio", "ratio", "nonnegative")
    if zeta >= 1.0:
        raise r.fail("model.damping_ratio", f"got {zeta:g}; expected a ratio below 1 (underdamped modes)")
    masses: list[MassSpec] = []
    for i, item in enumerate(r.array(data, "masses", "model.masses")):
        field = f"model.masses[{i}]"
        if not isinstance(item, Mapping):
            raise r.fail(field, f"got {item!r}; expected a table with name and mass")
        r.known(item, ("name", "mass"), field)
        name = r.text(item, "name", f"{field}.name")
        if name == GROUND or name in [m.name for m in masses]:
            raise r.fail(f"{field}.name", f"got {name!r}; expected a unique name other than {GROUND!r}")
        masses.append(MassSpec(name, r.quantity(item, "mass", f"{field}.mass", "mass", "positive")))
    if not masses:
        raise r.fail("model.masses", "empty; expected at least one mass")
    if len(masses) > MAX_MASSES:
        raise r.fail(
            "model.masses",
            f"{len(masses)} masses; this tool solves lumped models of up to {MAX_MASSES} masses in a few seconds "
            "(dense eigenproblems): reduce the model",
        )
    names = [m.name for m in masses]
    springs = []
    for i, item in enumerate(r.array(data, "springs", "model.springs")):
        field = f"model.springs[{i}]"
        if not isinstance(item, Mapping):
            raise r.fail(field, f"got {item!r}; expected a table with between and stiffness")
        r.known(item, ("between", "stiffness", "damping", "label"), field)
        between = r.array(item, "between", f"{field}.between")
        if len(between) != 2 or any(not isinstance(b, str) for b in between):
            raise r.fail(f"{field}.between", f"got {between!r}; expected two names")
        for b in between:
            if b not in [*names, GROUND]:
                raise r.fail(
                    f"{field}.between", f"names {b!r}, which is not a mass; expected one of {[*names, GROUND]}"
                )
        if between[0] == between[1]:
            raise r.fail(f"{field}.between", f"joins {between[0]!r} to itself")
        stiffness = r.quantity(item, "stiffness", f"{field}.stiffness", "stiffness", "positive")
        damping = r.value(item.get("damping", 0.0), f"{field}.damping", "damping", "nonnegative")
        label = r.text(item, "label", f"{field}.label", f"{between[0]}-{between[1]}")
        springs.append(SpringSpec(between[0], between[1], stiffness, damping, label))
    if not springs:
        raise r.fail("model.springs", "empty; expected at least one spring")
    if not any(GROUND in (s.node_a, s.node_b) for s in springs):
        raise r.fail("model.springs", "none is grounded; expected the support to reach 'ground'")
    labels = [s.label for s in springs]
    if len(set(labels)) != len(labels):
        raise r.fail("model.springs", f"labels {labels} repeat; expected distinct labels")
    spec = ModelSpec(tuple(masses), tuple(springs), zeta)
    try:
        model = spec.build()
    except InputValueError as error:
        raise r.fail("model", str(error)) from None
    if np.linalg.eigvalsh(model.stiffness)[0] <= 1e-12 * np.abs(model.stiffness).max():
        raise r.fail("model.springs", "leave a mass free to drift (a zero-frequency mode); connect every mass")
    return spec


def _response(r: TableReader, data: Mapping[str, Any], names: Sequence[str], speed_max: float) -> ResponseSpec:
    r.known(data, ("unbalance", "balance_grade", "rotor_mass", "force_at", "measure_at"), "response")
    if "unbalance" in data:
        if "balance_grade" in data:
            raise r.fail("response", "give either unbalance or balance_grade with rotor_mass, not both")
        unbalance = r.quantity(data, "unbalance", "response.unbalance", "unbalance", "positive")
        grade: float | None = None
        rotor: float | None = None
    else:
        grade = r.quantity(data, "balance_grade", "response.balance_grade", "balance_grade", "positive")
        rotor = r.quantity(data, "rotor_mass", "response.rotor_mass", "mass", "positive")
        unbalance = permissible_unbalance(grade, rotor, speed_max)
    ends = []
    for key in ("force_at", "measure_at"):
        value = r.text(data, key, f"response.{key}", names[0])
        if value not in names:
            raise r.fail(f"response.{key}", f"got {value!r}; expected one of {list(names)}")
        ends.append(value)
    return ResponseSpec(unbalance, ends[0], ends[1], grade, rotor)


def parse_scenario(data: Mapping[str, Any], source: str = "<scenario>") -> Scenario:
    """Validate a scenario given as nested tables (as read from TOML).

    Parameters
    ----------
    data : mapping
        The tables as read from TOML: ``[scenario]``, ``[speed]``, ``[model]``, ``[[excitations]]``, ``[motor]``,
        ``[margin]``, ``[vibration]``, ``[whatif]``, ``[field]``, ``[uncertainty]``, ``[record]``.
    source : str
        The file name errors start with (``pump.toml: model.springs[0].stiffness: ...``).

    Returns
    -------
    Scenario
        The validated scenario.

    Raises
    ------
    ScenarioError
        Any missing, unknown or invalid field; the message names ``source``
        and the field.
    """
    r = TableReader(source)
    r.known(
        data,
        (
            "scenario",
            "speed",
            "excitations",
            "motor",
            "margin",
            "model",
            "response",
            "vibration",
            "whatif",
            "field",
            "record",
            "uncertainty",
        ),
        "",
    )
    field_table = r.table(data, "field", "field", required=False)
    title, description, units = parse_head(r, data)

    speed_range = parse_speed(r, r.table(data, "speed", "speed"))
    high = speed_range.speed_max
    model = _model(r, r.table(data, "model", "model"))
    response = _response(r, r.table(data, "response", "response"), model.labels, high)

    group, support = parse_vibration(r, r.table(data, "vibration", "vibration", required=False))

    whatif = r.table(data, "whatif", "whatif", required=False)
    r.known(whatif, ("vary_springs", "vary_masses", "tolerance"), "whatif")
    spring_labels = [s.label for s in model.springs]
    grounded = [s.label for s in model.springs if GROUND in (s.node_a, s.node_b)]
    vary_springs = tuple(r.array(whatif, "vary_springs", "whatif.vary_springs", required=False) or grounded)
    for name in vary_springs:
        if name not in spring_labels:
            raise r.fail("whatif.vary_springs", f"names {name!r}; expected spring labels from {spring_labels}")
    vary_masses = tuple(r.array(whatif, "vary_masses", "whatif.vary_masses", required=False) or model.labels)
    for name in vary_masses:
        if name not in model.labels:
            raise r.fail("whatif.vary_masses", f"names {name!r}; expected mass names from {list(model.labels)}")
    tolerance = r.value(whatif.get("tolerance", 0.3), "whatif.tolerance", "ratio", "nonnegative")
    if not tolerance < 1.0:
        raise r.fail("whatif.tolerance", f"got {tolerance:g}; expected a fraction below 1 (0.3 is +/- 30 %)")

    motor = parse_motor(r, r.table(data, "motor", "motor", required=False))
    rules = parse_rules(r, r.table(data, "margin", "margin", required=False), judges_amplitude=True)
    if rules.flat is None:
        raise r.fail(
            "margin.flat",
            "missing; the modes of a machine on its support are kept a flat margin from every excitation: give "
            "the percentage (10 to 20 % is common practice, no single source), e.g. flat = 15",
        )
    uncertainty = r.table(data, "uncertainty", "uncertainty", required=False)
    if "uncertainty" in data and not uncertainty:
        raise r.fail("uncertainty", "empty; give its inputs (or remove the table)")
    return Scenario(
        title=title,
        description=description,
        units=units,
        speed=speed_range,
        excitations=parse_excitations(r, r.array(data, "excitations", "excitations"), motor),
        rules=rules,
        model=model,
        response=response,
        vibration=VibrationSpec(group, support),
        whatif=WhatIfSpec(vary_springs, vary_masses, tolerance),
        source=source,
        field=dict(field_table) if field_table else None,
        motor=motor,
        record=parse_record(r, r.table(data, "record", "record", required=False)),
        uncertainty=dict(uncertainty) if uncertainty else None,
    )


def scenario_to_dict(scenario: Scenario) -> dict[str, Any]:
    """The scenario as nested tables, in the package convention, ready for TOML.

    ``parse_scenario(scenario_to_dict(s))`` gives back an equal scenario.

    Parameters
    ----------
    scenario : Scenario
        The scenario.

    Returns
    -------
    dict
        Its tables, values as text with units in the package convention.

    Raises
    ------
    InputTypeError
        A margin rule with no scenario spelling.
    """
    m = scenario.model
    given = scenario.response
    response: dict[str, Any] = (
        {"unbalance": f"{given.unbalance!r} kg*m"}
        if given.balance_grade is None
        else {"balance_grade": given.balance_grade, "rotor_mass": f"{given.rotor_mass!r} kg"}
    )
    response.update(force_at=given.force_at, measure_at=given.measure_at)
    return {
        "scenario": {"title": scenario.title, "description": scenario.description, "units": scenario.units},
        "speed": speed_table(scenario.speed),
        "excitations": [
            excitation_table(e, scenario.motor) for e in scenario.excitations if not e.source.startswith("[motor]")
        ],
        **({"motor": motor_table(scenario.motor)} if scenario.motor else {}),
        "margin": rules_table(scenario.rules, judges_amplitude=True),
        "model": {
            "damping_ratio": m.damping_ratio,
            "masses": [{"name": x.name, "mass": f"{x.mass!r} kg"} for x in m.masses],
            "springs": [
                {
                    "between": [s.node_a, s.node_b],
                    "stiffness": f"{s.stiffness!r} N/m",
                    "damping": f"{s.damping!r} N*s/m",
                    "label": s.label,
                }
                for s in m.springs
            ],
        },
        "response": response,
        "vibration": {"group": scenario.vibration.group, "support": scenario.vibration.support},
        "whatif": {
            "vary_springs": list(scenario.whatif.vary_springs),
            "vary_masses": list(scenario.whatif.vary_masses),
            "tolerance": scenario.whatif.tolerance,
        },
        **({"field": dict(scenario.field)} if scenario.field else {}),
        **({"record": dataclasses.asdict(scenario.record)} if scenario.record != RecordSpec() else {}),
    }


def save_scenario(scenario: Scenario, path: str | os.PathLike[str], overwrite: bool = False) -> Path:
    """Write a scenario as TOML; an existing file is kept unless ``overwrite``.

    Parameters
    ----------
    scenario : Scenario
        The scenario to write.
    path : path-like
        Where to write.
    overwrite : bool
        Replace an existing file.

    Returns
    -------
    pathlib.Path
        The scenario's TOML file, which :func:`load_scenario` reads back to the same scenario.

    Raises
    ------
    FileExistsError
        ``path`` exists and ``overwrite`` is False.
    """
    return write_scenario_table(scenario_to_dict(scenario), path, overwrite)


load_scenario = scenario_loader(parse_scenario, "support")
