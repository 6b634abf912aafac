"""Rotor scenario files: a rotor, its bearings, unbalance and speed range in TOML.

The same top-level tables as a support scenario (``scenario``, ``speed``,
``excitations``, ``margin``) plus a ``rotor`` table; its presence tells the
``check`` command which flow to run. Values are numbers in the package
convention or text with a unit. Example (see
``notebooks/scenarios/fan_rotor.toml`` for a complete file)::

    [rotor]
    sweep_max = "4500 rpm"     # Campbell and response sweep (default 1.5 x speed.max)
    modes = 8                  # branches tracked
    probes = [1, 3]            # stations where shaft vibration is read (default: the bearings)
    sections = [
      { length = "200 mm", outer_diameter = "90 mm", elements = 4 },
      { length = "1.0 m", outer_diameter = "110 mm", elements = 20, material = "steel" },
    ]
    discs = [{ station = 2, mass = "380 kg", polar_inertia = "38 kg*m**2", diametral_inertia = "20 kg*m**2" }]
    unbalance = [{ station = 2, balance_grade = 2.5, phase = 0 }]   # or amount = "500 g*mm"

    [[rotor.bearings]]
    station = 1
    label = "NDE"
    kxx = "300 kN/mm"
    kyy = "200 kN/mm"
    cxx = "30 kN*s/m"
    cyy = "30 kN*s/m"

    [[rotor.bearings]]   # speed-dependent: lists of values at `speeds`
    station = 3
    label = "DE"
    speeds = ["0 rpm", "4500 rpm"]
    kxx = ["250 kN/mm", "350 kN/mm"]
    kyy = ["180 kN/mm", "260 kN/mm"]
    cxx = "30 kN*s/m"
    cyy = "30 kN*s/m"

Errors name the file and the field, as for support scenarios.
"""

from __future__ import annotations

import dataclasses
import re
from collections.abc import Mapping
from dataclasses import dataclass
from typing import Any

import numpy as np

from ...checks.excitations import Excitation
from ...checks.unbalance import permissible_unbalance
from ...core.errors import InputValueError
from ...core.units import QuantityKind
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
from ...records.rule_tables import parse_rules, rules_table
from ...records.tables import RecordSpec, TableReader, parse_head, parse_record, scenario_loader
from .model import STEEL, Bearing, Disc, Material, Pedestal, Rotor, ShaftSection, rotor_model
from .response import Unbalance

__all__ = [
    "MAX_ELEMENTS",
    "UnbalanceSpec",
    "RotorScenario",
    "parse_rotor_scenario",
    "load_rotor_scenario",
    "rotor_scenario_to_dict",
    "scale_bearing",
]

#: The largest rotor a scenario may hold: the whole study of 100 elements took 2.6 s on a 2-core machine
#: (40 elements: about 0.5 s; 200: 12 s).
MAX_ELEMENTS = 100

_COEFFICIENTS = ("kxx", "kyy", "kxy", "kyx", "cxx", "cyy", "cxy", "cyx")


@dataclass(frozen=True)
class UnbalanceSpec:
    """An unbalance as given: a station, an amount [kg m] or a balance grade [mm/s], a phase [deg].

    Attributes
    ----------
    station : int
        Where it acts.
    amount : float or None
        [kg m], when given as an amount.
    balance_grade : float or None
        ISO 21940-11 grade [mm/s], when given as a grade.
    phase_deg : float
        Angular position [deg].
    """

    station: int
    amount: float | None
    balance_grade: float | None
    phase_deg: float


@dataclass(frozen=True)
class RotorScenario(ScenarioHead):
    """A validated rotor scenario.

    The head (title, description, units, speed, excitations, rules) is that of
    :class:`~resonance.records.head.ScenarioHead`; these follow it.

    Attributes
    ----------
    sections, discs, bearings : tuple
        The rotor as given.
    unbalance : tuple of UnbalanceSpec
        The unbalances driving the response.
    probes : tuple of int
        Stations where the vibration is read.
    sweep_max : float
        Top of the Campbell and response sweeps [rpm].
    modes : int
        Branches tracked.
    source : str
        The file name.
    motor : MotorSpec or None
        The driving motor.
    record : RecordSpec
        Revision fields.
    sha256 : str or None
        SHA-256 of the file's bytes (None when edited in memory).
    uncertainty : mapping or None
        The ``[uncertainty]`` table, validated by :func:`resonance.studies.uncertainty.uncertainty_spec`.
    """

    sections: tuple[ShaftSection, ...]
    discs: tuple[Disc, ...]
    bearings: tuple[Bearing, ...]
    unbalance: tuple[UnbalanceSpec, ...]
    probes: tuple[int, ...]
    sweep_max: float
    modes: int
    source: str = "<rotor scenario>"
    motor: MotorSpec | None = None
    record: RecordSpec = dataclasses.field(default_factory=RecordSpec)
    sha256: str | None = dataclasses.field(default=None, compare=False)
    uncertainty: Mapping[str, Any] | None = dataclasses.field(default=None, compare=False)

    def build(self, stiffness_scale: float = 1.0, damping_scale: float = 1.0) -> Rotor:
        """The assembled rotor, with every bearing's stiffness and damping scaled by the factors."""
        bearings = [scale_bearing(b, stiffness_scale, damping_scale) for b in self.bearings]
        return rotor_model(self.sections, self.discs, bearings)

    def unbalances(self, rotor: Rotor) -> list[Unbalance]:
        """The unbalances in kg m; a balance grade uses the rotor's mass and the maximum speed (ISO 21940-11)."""
        x = [rotor.dof(node, "x") for node in range(rotor.nodes)]
        rotor_mass = float(rotor.mass[np.ix_(x, x)].sum())
        out = []
        for u in self.unbalance:
            amount = (
                u.amount
                if u.amount is not None
                else permissible_unbalance(u.balance_grade, rotor_mass, self.speed.speed_max)
            )
            out.append(Unbalance(u.station, float(amount), u.phase_deg))
        return out


def _material(r: TableReader, raw: Any, field: str) -> Material:
    if raw is None or raw == "steel":
        return STEEL
    if not isinstance(raw, Mapping):
        raise r.fail(field, f"got {raw!r}; expected 'steel' or a table with density, youngs_modulus, poisson_ratio")
    r.known(raw, ("density", "youngs_modulus", "poisson_ratio", "name"), field)
    density = r.value(raw.get("density"), f"{field}.density", "density", "positive") if "density" in raw else None
    if density is None:
        raise r.fail(f"{field}.density", "missing")
    modulus = r.quantity(raw, "youngs_modulus", f"{field}.youngs_modulus", "pressure", "positive")
    nu = r.quantity(raw, "poisson_ratio", f"{field}.poisson_ratio", "ratio")
    if not 0.0 <= nu < 0.5:
        raise r.fail(f"{field}.poisson_ratio", f"got {nu:g}; expected 0 <= nu < 0.5")
    return Material(density, modulus, nu, r.text(raw, "name", f"{field}.name", "material"))


def _coefficient(
    r: TableReader, raw: Any, field: str, kind: QuantityKind, count: int | None
) -> float | tuple[float, ...]:
    if isinstance(raw, list):
        if count is None:
            raise r.fail(field, "got a list; give `speeds` for speed-dependent coefficients")
        if len(raw) != count:
            raise r.fail(field, f"got {len(raw)} values for {count} speeds; expected one per speed")
        return tuple(r.value(v, f"{field}[{j}]", kind) for j, v in enumerate(raw))
    return r.value(raw, field, kind)


def _bearing(r: TableReader, item: Any, field: str) -> Bearing:
    if not isinstance(item, Mapping):
        raise r.fail(field, f"got {item!r}; expected a table")
    r.known(item, ("station", "label", "speeds", "tilt_stiffness", "pedestal", *_COEFFICIENTS), field)
    speeds = None
    if "speeds" in item:
        speeds = tuple(
            r.value(v, f"{field}.speeds[{j}]", "speed", "nonnegative")
            for j, v in enumerate(r.array(item, "speeds", f"{field}.speeds"))
        )
    count = None if speeds is None else len(speeds)
    values: dict[str, Any] = {}
    for name in _COEFFICIENTS:
        if name in ("kxx", "kyy") and name not in item:
            raise r.fail(f"{field}.{name}", "missing; expected a stiffness")
        values[name] = _coefficient(
            r, item.get(name, 0.0), f"{field}.{name}", "stiffness" if name[0] == "k" else "damping", count
        )
    pedestal = None
    if "pedestal" in item:
        p = r.table(item, "pedestal", f"{field}.pedestal")
        r.known(p, ("mass", "kxx", "kyy", "cxx", "cyy"), f"{field}.pedestal")
        pedestal = Pedestal(
            r.quantity(p, "mass", f"{field}.pedestal.mass", "mass", "positive"),
            r.quantity(p, "kxx", f"{field}.pedestal.kxx", "stiffness", "positive"),
            r.quantity(p, "kyy", f"{field}.pedestal.kyy", "stiffness", "positive"),
            r.value(p.get("cxx", 0.0), f"{field}.pedestal.cxx", "damping", "nonnegative"),
            r.value(p.get("cyy", 0.0), f"{field}.pedestal.cyy", "damping", "nonnegative"),
        )
    tilt = r.value(item.get("tilt_stiffness", 0.0), f"{field}.tilt_stiffness", "moment_stiffness", "nonnegative")
    return Bearing(
        r.integer(item, "station", f"{field}.station"),
        speeds=speeds,
        pedestal=pedestal,
        label=r.text(item, "label", f"{field}.label", field),
        tilt_stiffness=tilt,
        **values,
    )


def scale_bearing(bearing: Bearing, stiffness_scale: float = 1.0, damping_scale: float = 1.0) -> Bearing:
    """A bearing with its stiffness and damping coefficients (every table value) scaled by factors.

    Parameters
    ----------
    bearing : Bearing
        The bearing.
    stiffness_scale, damping_scale : float
        Factors on the stiffness and the damping coefficients [-].

    Returns
    -------
    Bearing

    Raises
    ------
    InputValueError
        Coefficients the scaled bearing refuses.
    """
    scaled: dict[str, Any] = {}
    for name in _COEFFICIENTS:
        value = np.asarray(getattr(bearing, name), dtype=float) * (stiffness_scale if name[0] == "k" else damping_scale)
        scaled[name] = tuple(value.tolist()) if value.ndim else float(value)
    return dataclasses.replace(bearing, **scaled)


def parse_rotor_scenario(data: Mapping[str, Any], source: str = "<rotor scenario>") -> RotorScenario:
    """Validate a rotor scenario given as nested tables (as read from TOML).

    Parameters
    ----------
    data : mapping
        The tables as read from TOML: ``[scenario]``, ``[speed]``, ``[rotor]`` (sections, discs, bearings,
        pedestals, unbalance, probes), ``[[excitations]]``, ``[motor]``, ``[margin]``, ``[uncertainty]``, ``[record]``.
    source : str
        The file name errors start with (``fan.toml: rotor.bearings[1].speeds: ...``).

    Returns
    -------
    RotorScenario
        The rotor, its bearings, unbalance and speeds, validated (no file hash).

    Raises
    ------
    ScenarioError
        Any missing, unknown or invalid field; the message names ``source`` and the field.
    """
    r = TableReader(source)
    r.known(data, ("scenario", "speed", "excitations", "motor", "margin", "rotor", "record", "uncertainty"), "")
    title, description, units = parse_head(r, data)
    speed = parse_speed(r, r.table(data, "speed", "speed"))
    motor = parse_motor(r, r.table(data, "motor", "motor", required=False))
    if motor is not None and (motor.load != "constant slip" or motor.slip_table):
        field = "motor.slip_table" if motor.slip_table else "motor.load"
        raise r.fail(field, "the rotor flow takes a constant slip (its critical speeds follow orders); give slip alone")
    rotor = r.table(data, "rotor", "rotor")
    r.known(rotor, ("sweep_max", "modes", "probes", "sections", "discs", "bearings", "unbalance"), "rotor")
    sections = []
    for i, item in enumerate(r.array(rotor, "sections", "rotor.sections")):
        field = f"rotor.sections[{i}]"
        if not isinstance(item, Mapping):
            raise r.fail(field, f"got {item!r}; expected a table")
        r.known(item, ("length", "outer_diameter", "inner_diameter", "elements", "material"), field)
        sections.append(
            ShaftSection(
                r.quantity(item, "length", f"{field}.length", "length", "positive"),
                r.quantity(item, "outer_diameter", f"{field}.outer_diameter", "length", "positive"),
                r.value(item.get("inner_diameter", 0.0), f"{field}.inner_diameter", "length", "nonnegative"),
                _material(r, item.get("material"), f"{field}.material"),
                r.integer(item, "elements", f"{field}.elements", 1),
            )
        )
    discs = []
    for i, item in enumerate(r.array(rotor, "discs", "rotor.discs", required=False)):
        field = f"rotor.discs[{i}]"
        if not isinstance(item, Mapping):
            raise r.fail(field, f"got {item!r}; expected a table")
        r.known(item, ("station", "mass", "polar_inertia", "diametral_inertia", "label"), field)
        discs.append(
            Disc(
                r.integer(item, "station", f"{field}.station"),
                r.quantity(item, "mass", f"{field}.mass", "mass", "positive"),
                r.quantity(item, "polar_inertia", f"{field}.polar_inertia", "inertia", "nonnegative"),
                r.quantity(item, "diametral_inertia", f"{field}.diametral_inertia", "inertia", "nonnegative"),
                r.text(item, "label", f"{field}.label", f"disc {i + 1}"),
            )
        )
    bearings = [
        _bearing(r, item, f"rotor.bearings[{i}]") for i, item in enumerate(r.array(rotor, "bearings", "rotor.bearings"))
    ]
    unbalance = []
    for i, item in enumerate(r.array(rotor, "unbalance", "rotor.unbalance")):
        field = f"rotor.unbalance[{i}]"
        if not isinstance(item, Mapping):
            raise r.fail(field, f"got {item!r}; expected a table")
        r.known(item, ("station", "amount", "balance_grade", "phase"), field)
        if ("amount" in item) == ("balance_grade" in item):
            raise r.fail(field, "give exactly one of amount or balance_grade")
        amount = r.quantity(item, "amount", f"{field}.amount", "unbalance", "positive") if "amount" in item else None
        grade = (
            r.quantity(item, "balance_grade", f"{field}.balance_grade", "balance_grade", "positive")
            if "balance_grade" in item
            else None
        )
        phase = r.value(item.get("phase", 0.0), f"{field}.phase", "ratio")
        unbalance.append(UnbalanceSpec(r.integer(item, "station", f"{field}.station"), amount, grade, phase))
    if not unbalance:
        raise r.fail("rotor.unbalance", "empty; expected at least one unbalance")
    elements = sum(x.elements for x in sections)
    if elements > MAX_ELEMENTS:
        raise r.fail(
            "rotor.sections",
            f"{elements} shaft elements in all; this tool solves rotors of up to {MAX_ELEMENTS} elements in a few "
            "seconds (the unbalance response solves the full model at every speed): use fewer elements per section",
        )
    probes = tuple(r.array(rotor, "probes", "rotor.probes", required=False)) or tuple(b.station for b in bearings)
    sweep_max = r.value(rotor.get("sweep_max", 1.5 * speed.speed_max), "rotor.sweep_max", "speed", "positive")
    if sweep_max <= speed.speed_max:
        raise r.fail("rotor.sweep_max", f"got {sweep_max:g} rpm; expected above speed.max = {speed.speed_max:g} rpm")
    modes = r.integer(rotor, "modes", "rotor.modes", 8)
    if not 1 <= modes <= 40:
        raise r.fail("rotor.modes", f"got {modes}; expected 1 to 40")
    scenario = RotorScenario(
        title,
        description,
        units,
        speed,
        _speed_following(r, parse_excitations(r, r.array(data, "excitations", "excitations"), motor)),
        parse_rules(r, r.table(data, "margin", "margin", required=False)),
        tuple(sections),
        tuple(discs),
        tuple(bearings),
        tuple(unbalance),
        probes,
        sweep_max,
        modes,
        source,
        motor,
        parse_record(r, r.table(data, "record", "record", required=False)),
        None,
        _uncertainty_table(r, data),
    )
    others = [e.label for e in scenario.excitations if e.kind != "synchronous"]
    if others and scenario.rules.flat is None:
        raise r.fail(
            "margin.flat",
            f"missing; {others[0]!r} is not 1x, and rotor modes are kept a flat margin from every source other than "
            "1x: give the percentage (10 to 20 % is common practice, no single source), e.g. flat = 15",
        )
    try:
        scenario.build()
    except InputValueError as error:
        # The assembly names its list entries (discs[0], bearings[1], sections[2]): name them in the file.
        text = str(error)
        entry = re.match(r"((?:discs|bearings|sections)\[\d+\])(?:\s*\([^)]*\))?(\.\w+)?:\s*(.*)", text)
        if entry is None:
            raise r.fail("rotor", text) from None
        field = f"rotor.{entry[1]}{entry[2] or ('.station' if 'station' in entry[3] else '')}"
        raise r.fail(field, entry[3]) from None
    stations = [(f"rotor.probes[{i}]", station) for i, station in enumerate(probes)]
    stations += [(f"rotor.unbalance[{i}].station", u.station) for i, u in enumerate(unbalance)]
    for field, station in stations:
        if isinstance(station, bool) or not isinstance(station, int):
            raise r.fail(field, f"got {station!r}; expected a whole station number")
        if not 0 <= station < len(sections) + 1:
            raise r.fail(field, f"got station {station}; expected 0 to {len(sections)} (section ends)")
    try:
        for b in bearings:
            b.coefficients(0.0 if b.speeds is None else b.speeds[0])
            if b.speeds is not None and (b.speeds[0] > 0.0 or b.speeds[-1] < sweep_max):
                raise InputValueError(
                    f"{b.label}: its coefficient table covers {b.speeds[0]:g}-{b.speeds[-1]:g} rpm; "
                    f"expected 0 to rotor.sweep_max = {sweep_max:g} rpm"
                )
    except InputValueError as error:
        raise r.fail("rotor", str(error)) from None
    return scenario


def rotor_scenario_to_dict(scenario: RotorScenario) -> dict[str, Any]:
    """The rotor scenario as nested tables in the package convention (round-trips through the parser).

    Parameters
    ----------
    scenario : RotorScenario
        The scenario.

    Returns
    -------
    dict
        Its tables (round-trips through :func:`parse_rotor_scenario`).

    Raises
    ------
    InputTypeError
        A margin rule with no scenario spelling.
    """

    def values(raw: Any, unit: str) -> Any:
        if isinstance(raw, (tuple, list, np.ndarray)):
            return [f"{float(v)!r} {unit}" for v in raw]
        return f"{float(raw)!r} {unit}"

    def material(m: Material) -> Any:
        if m == STEEL:
            return "steel"
        return {
            "density": f"{m.density!r} kg/m**3",
            "youngs_modulus": f"{m.youngs_modulus!r} Pa",
            "poisson_ratio": m.poisson_ratio,
            "name": m.name,
        }

    bearings = []
    for b in scenario.bearings:
        table: dict[str, Any] = {
            "station": b.station,
            "label": b.label,
            "tilt_stiffness": f"{b.tilt_stiffness!r} N*m/rad",
        }
        if b.speeds is not None:
            table["speeds"] = values(b.speeds, "rpm")
        for name in _COEFFICIENTS:
            table[name] = values(getattr(b, name), "N/m" if name[0] == "k" else "N*s/m")
        if b.pedestal is not None:
            p = b.pedestal
            table["pedestal"] = {
                "mass": f"{p.mass!r} kg",
                "kxx": f"{p.kxx!r} N/m",
                "kyy": f"{p.kyy!r} N/m",
                "cxx": f"{p.cxx!r} N*s/m",
                "cyy": f"{p.cyy!r} N*s/m",
            }
        bearings.append(table)
    unbalance = []
    for u in scenario.unbalance:
        entry: dict[str, Any] = {"station": u.station, "phase": u.phase_deg}
        if u.amount is not None:
            entry["amount"] = f"{u.amount!r} kg*m"
        else:
            entry["balance_grade"] = u.balance_grade
        unbalance.append(entry)
    return {
        "scenario": {"title": scenario.title, "description": scenario.description, "units": scenario.units},
        "speed": speed_table(scenario.speed),
        "excitations": [
            excitation_table(e, scenario.motor) for e in scenario.excitations if not e.source.startswith("[motor]")
        ],
        **({"motor": motor_table(scenario.motor)} if scenario.motor else {}),
        "margin": rules_table(scenario.rules),
        **({"record": dataclasses.asdict(scenario.record)} if scenario.record != RecordSpec() else {}),
        "rotor": {
            "sweep_max": f"{scenario.sweep_max!r} rpm",
            "modes": scenario.modes,
            "probes": list(scenario.probes),
            "sections": [
                {
                    "length": f"{s.length!r} m",
                    "outer_diameter": f"{s.outer_diameter!r} m",
                    "inner_diameter": f"{s.inner_diameter!r} m",
                    "elements": s.elements,
                    "material": material(s.material),
                }
                for s in scenario.sections
            ],
            "discs": [
                {
                    "station": d.station,
                    "mass": f"{d.mass!r} kg",
                    "polar_inertia": f"{d.polar_inertia!r} kg*m**2",
                    "diametral_inertia": f"{d.diametral_inertia!r} kg*m**2",
                    "label": d.label,
                }
                for d in scenario.discs
            ],
            "bearings": bearings,
            "unbalance": unbalance,
        },
    }


def _uncertainty_table(r: TableReader, data: Mapping[str, Any]) -> dict[str, Any] | None:
    # The [uncertainty] table as given; an empty one is refused rather than silently running nothing.
    table = r.table(data, "uncertainty", "uncertainty", required=False)
    if "uncertainty" in data and not table:
        raise r.fail("uncertainty", "empty; give its inputs (or remove the table)")
    return dict(table) if table else None


def _speed_following(r: TableReader, excitations: tuple[Excitation, ...]) -> tuple[Excitation, ...]:
    # The rotor flow judges whirl branches against sources that follow the speed: a fixed source (a motor on
    # the line, a neighbour's frequency) is refused here, naming where it came from, never dropped silently.
    for i, e in enumerate(excitations):
        if e.order is None:
            field = "motor" if e.source.startswith("[motor]") else f"excitations[{i}]"
            raise r.fail(
                field,
                f"{e.label!r} has a fixed frequency; the rotor flow checks sources that follow the speed (orders, "
                "drive-fed electrical frequencies): check fixed sources in a support scenario",
            )
    return excitations


load_rotor_scenario = scenario_loader(parse_rotor_scenario, "rotor")
