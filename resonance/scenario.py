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
(:mod:`resonance.rules`): the rule named by ``margin.rule`` governs rotor
lateral modes against 1x; ``margin.flat`` (a percentage, required whenever
such a pair is checked) governs every structural mode and every other
excitation. ``rule = "flat-P"`` without ``flat`` applies P % to every pair.
"""

from __future__ import annotations

import dataclasses
import hashlib
import os
import sys
from collections.abc import Mapping, Sequence
from dataclasses import dataclass
from pathlib import Path
from typing import Any

import numpy as np
import tomli_w

from .damping import modal_damping
from .errors import InputTypeError, InputValueError
from .excitations import (
    EXCITATION_KINDS,
    Excitation,
    drive_electrical,
    line_frequency,
    permissible_unbalance,
)
from .inputs import as_si, parse_quantity
from .margins import ApiLateralRule, FlatRule, MarginRule, TableRule, rule_by_name
from .model import GROUND, MatrixModel, Spring, lumped_model, matrix_model
from .modes import MODE_KINDS
from .rules import TORSIONAL_RULE, RuleSet, is_flat
from .speed_range import OperatingRange, operating_range
from .units import UNIT_SYSTEMS, UnitSystem

if sys.version_info >= (3, 11):
    import tomllib
else:  # pragma: no cover - Python 3.10
    import tomli as tomllib

__all__ = [
    "MAX_MASSES",
    "ScenarioError",
    "MassSpec",
    "SpringSpec",
    "ModelSpec",
    "ResponseSpec",
    "VibrationSpec",
    "WhatIfSpec",
    "MotorSpec",
    "RecordSpec",
    "Scenario",
    "parse_scenario",
    "load_scenario",
    "read_scenario_file",
    "read_scenario_bytes",
    "scenario_to_dict",
    "save_scenario",
]


#: The largest lumped model a scenario may hold: the whole study of a 500-mass chain took 1.0 s on a 2-core
#: machine; the panels and the what-if band run it many times.
MAX_MASSES = 500


class ScenarioError(InputValueError):
    """A scenario file or table is invalid; the message names the file and field."""


@dataclass(frozen=True)
class MassSpec:
    """A lumped mass: ``name`` and ``mass`` [kg]."""

    name: str
    mass: float


@dataclass(frozen=True)
class SpringSpec:
    """A spring (with optional dashpot) between two masses or a mass and ground.

    ``stiffness`` [N/m], ``damping`` [N s/m]; ``label`` names it in what-if studies.
    """

    node_a: str
    node_b: str
    stiffness: float
    damping: float
    label: str


@dataclass(frozen=True)
class ModelSpec:
    """A lumped model with modal damping plus optional discrete dashpots.

    Attributes
    ----------
    masses, springs
        The lumped masses and their connections.
    damping_ratio : float
        Modal damping ratio given to every mode [-]; the dashpots of the
        springs add (non-proportional) damping on top.
    """

    masses: tuple[MassSpec, ...]
    springs: tuple[SpringSpec, ...]
    damping_ratio: float

    @property
    def labels(self) -> tuple[str, ...]:
        """Mass names in degree-of-freedom order."""
        return tuple(m.name for m in self.masses)

    def build(
        self,
        stiffness_scale: Mapping[str, float] | None = None,
        mass_scale: Mapping[str, float] | None = None,
        damping_ratio: float | None = None,
    ) -> MatrixModel:
        """The :class:`MatrixModel`, optionally with scaled springs and masses.

        Parameters
        ----------
        stiffness_scale : mapping of spring label to factor, optional
            Factors on the stiffness (and dashpot) of the named springs.
        mass_scale : mapping of mass name to factor, optional
            Factors on the named masses.
        damping_ratio : float, optional
            Modal damping ratio to use instead of the scenario's.
        """
        ks = stiffness_scale or {}
        ms = mass_scale or {}
        undamped = lumped_model(
            {m.name: m.mass * ms.get(m.name, 1.0) for m in self.masses},
            [Spring(s.node_a, s.node_b, s.stiffness * ks.get(s.label, 1.0), s.damping) for s in self.springs],
        )
        zeta = self.damping_ratio if damping_ratio is None else damping_ratio
        modal = modal_damping(undamped.mass, undamped.stiffness, zeta) if zeta > 0.0 else 0.0
        return matrix_model(undamped.mass, undamped.stiffness, undamped.damping + modal, undamped.labels)


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
    """ISO 10816-3 class for the casing-velocity zones: group 1 or 2, rigid or flexible."""

    group: int
    support: str


@dataclass(frozen=True)
class WhatIfSpec:
    """What a what-if study varies: spring labels, mass names, and the stiffness tolerance [-]."""

    vary_springs: tuple[str, ...]
    vary_masses: tuple[str, ...]
    tolerance: float


@dataclass(frozen=True)
class MotorSpec:
    """The driving motor, for its electrical excitations.

    Attributes
    ----------
    supply : {"drive", "line"}
        On a variable-speed drive (electrical frequency follows the speed) or
        on the line (fixed at ``line_frequency``).
    poles : int or None
        Number of poles (drive supply).
    slip : float
        Slip at the load of interest [-] (drive supply; 0 for a synchronous motor).
    line_frequency : float or None
        Supply frequency [Hz] (line supply).
    """

    supply: str
    poles: int | None
    slip: float
    line_frequency: float | None

    def excitation(self, multiple: float, label: str | None = None) -> Excitation:
        """The electrical excitation at ``multiple`` x the electrical frequency."""
        if self.supply == "drive":
            assert self.poles is not None  # validated with the supply
            return drive_electrical(self.poles, self.slip, multiple, label)
        assert self.line_frequency is not None
        e = line_frequency(self.line_frequency, multiple)
        return e if label is None else dataclasses.replace(e, label=label)


@dataclass(frozen=True)
class RecordSpec:
    """Revision control of the record: who prepared and checked it, which revision, when (text as given)."""

    preparer: str = ""
    checker: str = ""
    revision: str = ""
    date: str = ""


@dataclass(frozen=True)
class Scenario:
    """A validated scenario (see the module notes for the file format).

    ``sha256`` is the SHA-256 of the scenario file's bytes when it was loaded
    from a file (None for a scenario built or edited in memory).
    """

    title: str
    description: str
    units: UnitSystem
    speed: OperatingRange
    excitations: tuple[Excitation, ...]
    rules: RuleSet
    model: ModelSpec
    response: ResponseSpec
    vibration: VibrationSpec
    whatif: WhatIfSpec
    source: str = "<scenario>"
    field: Mapping[str, Any] | None = dataclasses.field(default=None, compare=False)
    motor: MotorSpec | None = None
    record: RecordSpec = dataclasses.field(default_factory=RecordSpec)
    sha256: str | None = dataclasses.field(default=None, compare=False)

    def replace(self, **changes: Any) -> Scenario:
        """A copy with some fields changed (the original is untouched; the copy has no file hash)."""
        return dataclasses.replace(self, **{"sha256": None, **changes})

    def with_speed(self, speed: OperatingRange) -> Scenario:
        """A copy with another speed range; a grade-based unbalance follows the new maximum speed."""
        response = self.response
        if response.balance_grade is not None and response.rotor_mass is not None:
            unbalance = permissible_unbalance(response.balance_grade, response.rotor_mass, speed.speed_max)
            response = dataclasses.replace(response, unbalance=unbalance)
        return dataclasses.replace(self, speed=speed, response=response)


# --- parsing helpers ---------------------------------------------------------


class _Reader:
    def __init__(self, source: str) -> None:
        self.source = source

    def fail(self, field: str, message: str) -> ScenarioError:
        return ScenarioError(f"{self.source}: {field}: {message}")

    def table(self, data: Mapping[str, Any], key: str, field: str, required: bool = True) -> Mapping[str, Any]:
        if key not in data:
            if required:
                raise self.fail(field, "missing; expected a table")
            return {}
        value = data[key]
        if not isinstance(value, Mapping):
            raise self.fail(field, f"got {value!r}; expected a table")
        return value

    def known(self, data: Mapping[str, Any], allowed: Sequence[str], field: str) -> None:
        unknown = sorted(set(data) - set(allowed))
        if unknown:
            raise self.fail(
                f"{field}.{unknown[0]}" if field else unknown[0], f"unknown field; expected one of {sorted(allowed)}"
            )

    def text(self, data: Mapping[str, Any], key: str, field: str, default: str | None = None) -> str:
        if key not in data:
            if default is None:
                raise self.fail(field, "missing; expected text")
            return default
        value = data[key]
        if not isinstance(value, str):
            raise self.fail(field, f"got {value!r}; expected text")
        return value

    def quantity(self, data: Mapping[str, Any], key: str, field: str, kind: str, sign: str = "any") -> float:
        if key not in data:
            raise self.fail(field, f"missing; expected a {kind.replace('_', ' ')}")
        return self.value(data[key], field, kind, sign)

    def value(self, raw: Any, field: str, kind: str, sign: str = "any") -> float:
        if isinstance(raw, bool):
            raise self.fail(field, f"got {raw!r}; expected a number or a value with a unit")
        try:
            if isinstance(raw, str):
                raw = parse_quantity(raw, "value")  # exactly one number and a unit, or refused
            return as_si(raw, "value", kind, sign)  # type: ignore[arg-type]
        except (InputTypeError, InputValueError) as error:
            raise self.fail(field, str(error).removeprefix("value: ")) from None

    def integer(self, data: Mapping[str, Any], key: str, field: str, default: int | None = None) -> int:
        if key not in data:
            if default is None:
                raise self.fail(field, "missing; expected a whole number")
            return default
        value = data[key]
        if isinstance(value, bool) or not isinstance(value, int):
            raise self.fail(field, f"got {value!r}; expected a whole number")
        return value

    def array(self, data: Mapping[str, Any], key: str, field: str, required: bool = True) -> list[Any]:
        if key not in data:
            if required:
                raise self.fail(field, "missing; expected a list")
            return []
        value = data[key]
        if not isinstance(value, list):
            raise self.fail(field, f"got {value!r}; expected a list")
        return value


def _head(r: _Reader, data: Mapping[str, Any]) -> tuple[str, str, UnitSystem]:
    head = r.table(data, "scenario", "scenario")
    r.known(head, ("title", "description", "units"), "scenario")
    units = r.text(head, "units", "scenario.units", "SI")
    if units not in UNIT_SYSTEMS:
        raise r.fail("scenario.units", f"got {units!r}; expected 'SI' or 'US'")
    return r.text(head, "title", "scenario.title"), r.text(head, "description", "scenario.description", ""), units  # type: ignore[return-value]


def _speed(r: _Reader, speed: Mapping[str, Any]) -> OperatingRange:
    r.known(speed, ("min", "max", "skip_bands"), "speed")
    low = r.quantity(speed, "min", "speed.min", "speed", "positive")
    high = r.quantity(speed, "max", "speed.max", "speed", "positive")
    if low > high:
        raise r.fail("speed.max", f"got {high:g} rpm, below speed.min = {low:g} rpm; expected min <= max")
    bands = []
    for i, band in enumerate(r.array(speed, "skip_bands", "speed.skip_bands", required=False)):
        if not isinstance(band, list) or len(band) != 2:
            raise r.fail(f"speed.skip_bands[{i}]", f"got {band!r}; expected [low, high]")
        bands.append(tuple(r.value(b, f"speed.skip_bands[{i}]", "speed", "positive") for b in band))
    try:
        return operating_range(low, high, bands)  # type: ignore[arg-type]
    except InputValueError as error:
        raise r.fail("speed.skip_bands", str(error)) from None


def _speed_table(speed: OperatingRange) -> dict[str, Any]:
    return {
        "min": f"{speed.speed_min!r} rpm",
        "max": f"{speed.speed_max!r} rpm",
        "skip_bands": [[f"{a!r} rpm", f"{b!r} rpm"] for a, b in speed.skip_bands],
    }


def _excitation_table(e: Excitation, motor: MotorSpec | None = None) -> dict[str, Any]:
    if e.kind == "electrical" and motor is not None:
        base = motor.excitation(1.0)
        multiple = (e.order / base.order) if e.order is not None else (e.frequency / base.frequency)  # type: ignore[operator]
        if motor.excitation(multiple).label == e.label:
            return {"electrical": multiple}
        return {"electrical": multiple, "label": e.label}
    key = {"order": e.order} if e.order is not None else {"frequency": f"{e.frequency!r} Hz"}
    return {**key, "label": e.label}


def _motor(r: _Reader, data: Mapping[str, Any]) -> MotorSpec | None:
    if not data:
        return None
    r.known(data, ("supply", "poles", "slip", "line_frequency"), "motor")
    supply = r.text(data, "supply", "motor.supply")
    if supply == "drive":
        if "line_frequency" in data:
            raise r.fail("motor.line_frequency", "a drive-fed motor's frequency follows the speed; remove it")
        poles = r.integer(data, "poles", "motor.poles")
        if not 2 <= poles <= 96 or poles % 2:
            raise r.fail("motor.poles", f"got {poles!r}; expected an even whole number from 2 to 96")
        if "slip" not in data:
            raise r.fail("motor.slip", "missing; expected the slip at the load of interest (0 for a synchronous motor)")
        slip = r.value(data["slip"], "motor.slip", "ratio", "nonnegative")
        if not slip < 0.2:
            raise r.fail("motor.slip", f"got {slip:g}; expected a fraction below 0.2 (1.3 % slip is 0.013)")
        return MotorSpec("drive", poles, slip, None)
    if supply == "line":
        for key in ("poles", "slip"):
            if key in data:
                raise r.fail(f"motor.{key}", "not used for a motor on the line; remove it")
        f = r.quantity(data, "line_frequency", "motor.line_frequency", "frequency", "positive")
        return MotorSpec("line", None, 0.0, f)
    raise r.fail("motor.supply", f"got {supply!r}; expected 'drive' or 'line'")


def _excitations(r: _Reader, items: list[Any], motor: MotorSpec | None = None) -> tuple[Excitation, ...]:
    out = []
    keys = ("order", "frequency", "electrical")
    for i, item in enumerate(items):
        field = f"excitations[{i}]"
        if not isinstance(item, Mapping):
            raise r.fail(field, f"got {item!r}; expected a table with order, frequency or electrical")
        r.known(item, (*keys, "label"), field)
        if sum(k in item for k in keys) != 1:
            raise r.fail(
                field,
                "give exactly one of order (multiple of running speed), frequency (fixed) or electrical "
                "(multiple of the motor's electrical frequency)",
            )
        label = r.text(item, "label", f"{field}.label", "") or None
        if "order" in item:
            order = r.value(item["order"], f"{field}.order", "ratio", "positive")
            out.append(Excitation(label or f"{order:g}x", order=order))
        elif "frequency" in item:
            frequency = r.value(item["frequency"], f"{field}.frequency", "frequency", "positive")
            out.append(Excitation(label or f"{frequency:g} Hz", frequency=frequency))
        else:
            if motor is None:
                raise r.fail(f"{field}.electrical", "needs a [motor] table (supply, poles and slip, or line_frequency)")
            multiple = r.value(item["electrical"], f"{field}.electrical", "ratio", "positive")
            out.append(motor.excitation(multiple, label))
    if not out:
        raise r.fail("excitations", "empty; expected at least one excitation")
    labels = [e.label for e in out]
    repeated = sorted({x for x in labels if labels.count(x) > 1})
    if repeated:
        raise r.fail("excitations", f"label {repeated[0]!r} is used twice; expected distinct labels")
    return tuple(out)


def _percent(r: _Reader, raw: Any, field: str) -> float:
    # A percentage is a plain number: "15 %" text would be read by pint as 0.15.
    if isinstance(raw, bool) or not isinstance(raw, (int, float)):
        raise r.fail(field, f"got {raw!r}; expected a plain number of percent (for 15 % write 15)")
    if not 0 < raw < 100:  # compared as given: a huge integer must not overflow a float
        raise r.fail(field, f"got {raw!r}; expected a percentage between 0 and 100")
    return float(raw)


def _rules(r: _Reader, data: Mapping[str, Any]) -> RuleSet:
    r.known(data, ("rule", "table", "name", "source", "flat", "torsional", "pairs"), "margin")
    lateral = _rule(r, data)
    flat: FlatRule | None = None
    if "flat" in data:
        flat = FlatRule(_percent(r, data["flat"], "margin.flat"))
    elif is_flat(lateral):
        flat = lateral  # type: ignore[assignment]  # rule = "flat-P": P % for every pair
    torsional = TORSIONAL_RULE
    if "torsional" in data:
        percent = _percent(r, data["torsional"], "margin.torsional")
        torsional = FlatRule(percent, name=f"torsional {percent:g} %", source=f"given in {r.source}")
    overrides = []
    for i, item in enumerate(r.array(data, "pairs", "margin.pairs", required=False)):
        field = f"margin.pairs[{i}]"
        if not isinstance(item, Mapping):
            raise r.fail(field, f"got {item!r}; expected a table with mode, excitation and rule")
        r.known(item, ("mode", "excitation", "rule"), field)
        mode = r.text(item, "mode", f"{field}.mode")
        if mode not in MODE_KINDS:
            raise r.fail(f"{field}.mode", f"got {mode!r}; expected one of {list(MODE_KINDS)}")
        excitation = r.text(item, "excitation", f"{field}.excitation")
        if excitation not in EXCITATION_KINDS:
            raise r.fail(f"{field}.excitation", f"got {excitation!r}; expected one of {list(EXCITATION_KINDS)}")
        try:
            rule = rule_by_name(r.text(item, "rule", f"{field}.rule"))
        except InputValueError as error:
            raise r.fail(f"{field}.rule", str(error).removeprefix("rule: ")) from None
        overrides.append((mode, excitation, rule))
    try:
        return RuleSet(lateral, flat, torsional, tuple(overrides))  # type: ignore[arg-type]
    except InputValueError as error:
        raise r.fail("margin.pairs", str(error).split(": ", 1)[1]) from None


def _rule(r: _Reader, data: Mapping[str, Any]) -> MarginRule:
    if "table" in data:
        table = r.table(data, "table", "margin.table")
        r.known(table, ("amplification_factors", "below", "above"), "margin.table")
        arrays = {}
        for key in ("amplification_factors", "below", "above"):
            values = r.array(table, key, f"margin.table.{key}")
            arrays[key] = tuple(r.value(v, f"margin.table.{key}[{j}]", "ratio") for j, v in enumerate(values))
        try:
            return TableRule(
                arrays["amplification_factors"],
                arrays["below"],
                arrays["above"],
                r.text(data, "name", "margin.name", "user table"),
                r.text(data, "source", "margin.source", f"user-defined in {r.source}"),
            )
        except InputValueError as error:
            raise r.fail("margin.table", str(error)) from None
    name = r.text(data, "rule", "margin.rule", "api-lateral")
    try:
        return rule_by_name(name)
    except InputValueError as error:
        raise r.fail("margin.rule", str(error).removeprefix("rule: ")) from None


def _model(r: _Reader, data: Mapping[str, Any]) -> ModelSpec:
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


def _response(r: _Reader, data: Mapping[str, Any], names: Sequence[str], speed_max: float) -> ResponseSpec:
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

    Raises
    ------
    ScenarioError
        Any missing, unknown or invalid field; the message names ``source``
        and the field.
    """
    r = _Reader(source)
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
        ),
        "",
    )
    field_table = r.table(data, "field", "field", required=False)
    title, description, units = _head(r, data)

    speed_range = _speed(r, r.table(data, "speed", "speed"))
    high = speed_range.speed_max
    model = _model(r, r.table(data, "model", "model"))
    response = _response(r, r.table(data, "response", "response"), model.labels, high)

    vibration = r.table(data, "vibration", "vibration", required=False)
    r.known(vibration, ("group", "support"), "vibration")
    group = r.integer(vibration, "group", "vibration.group", 2)
    support = r.text(vibration, "support", "vibration.support", "rigid")
    if group not in (1, 2) or support not in ("rigid", "flexible"):
        raise r.fail(
            "vibration", f"got group {group!r}, support {support!r}; expected group 1 or 2, 'rigid' or 'flexible'"
        )

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

    motor = _motor(r, r.table(data, "motor", "motor", required=False))
    rules = _rules(r, r.table(data, "margin", "margin", required=False))
    if rules.flat is None:
        raise r.fail(
            "margin.flat",
            "missing; the modes of a machine on its support are kept a flat margin from every excitation: give "
            "the percentage (10 to 20 % is common practice, no single source), e.g. flat = 15",
        )
    return Scenario(
        title=title,
        description=description,
        units=units,
        speed=speed_range,
        excitations=_excitations(r, r.array(data, "excitations", "excitations"), motor),
        rules=rules,
        model=model,
        response=response,
        vibration=VibrationSpec(group, support),
        whatif=WhatIfSpec(vary_springs, vary_masses, tolerance),
        source=source,
        field=dict(field_table) if field_table else None,
        motor=motor,
        record=record_spec(r, r.table(data, "record", "record", required=False)),
    )


def record_spec(r: _Reader, data: Mapping[str, Any]) -> RecordSpec:
    """The ``[record]`` table: preparer, checker, revision and date, as text."""
    r.known(data, ("preparer", "checker", "revision", "date"), "record")
    values = {}
    for key in ("preparer", "checker", "revision", "date"):
        raw = data.get(key, "")
        if hasattr(raw, "isoformat"):  # a TOML date
            raw = raw.isoformat()
        if not isinstance(raw, str):
            raise r.fail(f"record.{key}", f"got {raw!r}; expected text")
        values[key] = raw
    return RecordSpec(**values)


def read_scenario_file(path: str | os.PathLike[str]) -> dict[str, Any]:
    """The tables of a scenario file (TOML), unvalidated. The file is only read.

    Raises
    ------
    ScenarioError
        The file is missing or is not valid TOML.
    """
    return read_scenario_bytes(path)[0]


def read_scenario_bytes(path: str | os.PathLike[str]) -> tuple[dict[str, Any], str]:
    """The tables of a scenario file and the SHA-256 of the very bytes they were read from.

    Raises
    ------
    ScenarioError
        The file is missing or is not valid TOML.
    """
    name = os.fspath(path)
    try:
        raw = Path(path).read_bytes()
    except OSError as error:
        raise ScenarioError(f"{name}: cannot be read ({error.strerror})") from None
    try:
        return tomllib.loads(raw.decode("utf-8")), hashlib.sha256(raw).hexdigest()
    except (UnicodeDecodeError, tomllib.TOMLDecodeError) as error:
        raise ScenarioError(f"{name}: is not valid TOML ({error})") from None


def load_scenario(path: str | os.PathLike[str]) -> Scenario:
    """Read and validate a scenario file (TOML). The file is only read.

    The scenario keeps the SHA-256 of the file's bytes for the record.

    Raises
    ------
    ScenarioError
        The file is missing, is not valid TOML, or has an invalid field.
    """
    data, sha256 = read_scenario_bytes(path)
    return parse_scenario(data, Path(os.fspath(path)).name).replace(sha256=sha256)


def _rules_table(rules: RuleSet) -> dict[str, Any]:
    out = _rule_table(rules.lateral_1x)
    if rules.flat is not None:
        out["flat"] = rules.flat.percent
    if rules.torsional != TORSIONAL_RULE:
        out["torsional"] = rules.torsional.percent
    if rules.overrides:
        out["pairs"] = [
            {"mode": m, "excitation": e, "rule": _rule_table(rule)["rule"]} for m, e, rule in rules.overrides
        ]
    return out


def _rule_table(rule: MarginRule) -> dict[str, Any]:
    if isinstance(rule, ApiLateralRule):
        return {"rule": "api-lateral"}
    if isinstance(rule, FlatRule):
        return {"rule": f"flat-{rule.percent:g}"}
    if isinstance(rule, TableRule):
        return {
            "name": rule.name,
            "source": rule.source,
            "table": {
                "amplification_factors": list(rule.amplification_factors),
                "below": list(rule.below),
                "above": list(rule.above),
            },
        }
    raise InputTypeError(f"rule: a {type(rule).__name__} cannot be saved to a scenario file")


def scenario_to_dict(scenario: Scenario) -> dict[str, Any]:
    """The scenario as nested tables, in the package convention, ready for TOML.

    ``parse_scenario(scenario_to_dict(s))`` gives back an equal scenario.
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
        "speed": _speed_table(scenario.speed),
        "excitations": [_excitation_table(e, scenario.motor) for e in scenario.excitations],
        **({"motor": _motor_table(scenario.motor)} if scenario.motor else {}),
        "margin": _rules_table(scenario.rules),
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


def _motor_table(motor: MotorSpec) -> dict[str, Any]:
    if motor.supply == "drive":
        return {"supply": "drive", "poles": motor.poles, "slip": motor.slip}
    return {"supply": "line", "line_frequency": f"{motor.line_frequency!r} Hz"}


def save_scenario(scenario: Scenario, path: str | os.PathLike[str], overwrite: bool = False) -> Path:
    """Write a scenario as TOML; an existing file is kept unless ``overwrite``.

    Raises
    ------
    FileExistsError
        ``path`` exists and ``overwrite`` is False.
    """
    return write_scenario_table(scenario_to_dict(scenario), path, overwrite)


def write_scenario_table(table: Mapping[str, Any], path: str | os.PathLike[str], overwrite: bool = False) -> Path:
    """Write scenario tables as TOML through a temporary file; an existing file is kept unless ``overwrite``."""
    target = Path(path)
    if target.exists() and not overwrite:
        raise FileExistsError(f"{target}: exists; pass overwrite=True or choose another name")
    temporary = target.with_name(f".{target.name}.tmp")
    temporary.write_text(tomli_w.dumps(table), encoding="utf-8")
    os.replace(temporary, target)
    return target
