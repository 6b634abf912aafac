"""Torsional scenario files: a drive train's stations, shafts, couplings, gear meshes and forcing in TOML.

A scenario file with a ``[torsion]`` table describes a drive train (see ``notebooks/scenarios/
compressor_train.toml``)::

    [speed]              # the driver shaft's speeds of continuous operation
    min = "1200 rpm"
    max = "1500 rpm"

    [motor]
    supply = "drive"
    poles = 4
    slip = 0.01
    electrical = [1, 2]  # the multiples of f_e checked (default on a drive: 1, 2, 6 and 12)

    [torsion]
    damping_ratio = 0.02  # modal damping for every mode (optional; else the elements' dampers)
    shaft_orders = [1, 2]  # each shaft's orders checked (default 1x and 2x)
    driver_shaft = "driver"  # the shaft [speed] gives (default: the shaft called "driver", or the only one)
    stations = [
      { name = "motor", inertia = "6 kg*m**2" },
      { name = "gear", inertia = "1.1 kg*m**2" },
      { name = "pinion", inertia = "0.05 kg*m**2", shaft = "hs" },
      { name = "compressor", inertia = "0.4 kg*m**2", shaft = "hs" },
    ]
    meshes = [{ gear = "gear", pinion = "pinion", gear_teeth = 96, pinion_teeth = 30 }]   # or ratio = 3.2
    shaft_excitations = [{ shaft = "hs", order = 4, label = "lobe pass" }]   # orders of any shaft's own speed

    [[torsion.couplings]]
    between = ["motor", "gear"]
    stiffness = "40 kN*m/rad"
    damping = "30 N*m*s/rad"
    label = "coupling"

    [[torsion.shafts]]   # by stiffness; by length, diameters and G; or by stepped sections in series
    between = ["pinion", "compressor"]
    shear_modulus = "80 GPa"
    label = "hs shaft"
    sections = [{ length = "0.4 m", outer_diameter = "60 mm" }, { length = "0.2 m", outer_diameter = "55 mm" }]

Every station's, shaft's and mesh's 1x and 2x (``shaft_orders``), each gear mesh (teeth x the gear's shaft
speed), the motor's electrical frequencies and any ``[[excitations]]`` are checked against every torsional
mode by the torsional rule (10 % unless ``margin.torsional`` says otherwise; API 617 / RP 684, from memory).

Where a margin cannot be met, harmonic torques and allowables give the forced response::

    [torsion]
    rated_torque = "7.6 kN*m"  # the driver's rated torque (for fraction_of_rated)
    # A torque as a fraction of the rated one, or torque = "76 N*m" on the station's own shaft.
    # Each coupling or shaft may carry allowable_torque; a shaft with diameters also allowable_stress.
    couplings = [{ between = ["motor", "gear"], stiffness = "40 kN*m/rad", allowable_torque = "1.9 kN*m" }]

    [[torsion.forcing]]
    label = "air-gap pulsation"
    station = "motor"
    excitation = "2 f_e (drive, 4 poles, slip 0.01)"
    fraction_of_rated = 0.01

``excitation`` is the label of a checked excitation: the torque has its frequency at every speed. Each
element's largest dynamic torque (and shear stress) over the operating speeds is compared with its
allowable; one over its allowable fails the study. Errors name the file and the field.
"""

from __future__ import annotations

import dataclasses
import math
from collections.abc import Mapping
from dataclasses import dataclass
from typing import Any

from ...checks.excitations import Excitation
from ...core.errors import InputValueError
from ...records.excitation_tables import MotorSpec, parse_excitations, parse_motor, parse_speed
from ...records.head import ScenarioHead
from ...records.rule_tables import parse_rules
from ...records.tables import (
    RecordSpec,
    ScenarioError,
    TableReader,
    parse_head,
    parse_record,
    plain_tables,
    scenario_loader,
)
from .elements import Coupling, GearMesh, Station, TorsionalShaft, hollow_shaft_stiffness, stepped_shaft_stiffness
from .torque import Allowable, TorqueCase
from .train import TorsionalTrain, shaft_order, torsional_train

__all__ = [
    "TorsionScenario",
    "load_torsion_scenario",
    "parse_torsion_scenario",
]


@dataclass(frozen=True)
class TorsionScenario(ScenarioHead):
    """A validated torsional scenario.

    The head (title, description, units, speed, excitations, rules) is that of
    :class:`~resonance.records.head.ScenarioHead`; these follow it.

    Attributes
    ----------
    train : TorsionalTrain
        The referred train.
    damping_ratio : float or None
        Modal damping for every mode [-] (None: the elements' dampers).
    tables : dict
        The scenario's tables as read (for the record).
    source : str
        The file name.
    motor : MotorSpec or None
        The driving motor.
    record : RecordSpec
        Revision fields.
    sha256 : str or None
        SHA-256 of the file's bytes.
    forcing : tuple of TorqueCase
        Harmonic torques for the forced response (none: modes and margins only).
    allowables : dict of str to Allowable
        By element label, as given.
    """

    train: TorsionalTrain
    damping_ratio: float | None
    tables: dict[str, Any] = dataclasses.field(compare=False)
    source: str = "<torsion scenario>"
    motor: MotorSpec | None = None
    record: RecordSpec = dataclasses.field(default_factory=RecordSpec)
    sha256: str | None = dataclasses.field(default=None, compare=False)
    forcing: tuple[TorqueCase, ...] = ()
    allowables: dict[str, Allowable] = dataclasses.field(default_factory=dict)


def parse_torsion_scenario(data: Mapping[str, Any], source: str = "<torsion scenario>") -> TorsionScenario:
    """Validate a torsional scenario given as nested tables (as read from TOML).

    Parameters
    ----------
    data : mapping
        The tables as read from TOML: ``[scenario]``, ``[speed]``, ``[torsion]`` (stations, shafts, couplings,
        meshes, forcing, allowables), ``[[excitations]]``, ``[motor]``, ``[margin]``, ``[record]``.
    source : str
        The file name errors start with (``train.toml: torsion.couplings[0].stiffness: ...``).

    Returns
    -------
    TorsionScenario
        The train, its excitations, forcing and allowables, validated (no file hash).

    Raises
    ------
    ScenarioError
        Any missing, unknown or invalid field, a disconnected train, contradictory gear ratios; the message
        names ``source`` and the field.
    """
    r = TableReader(source)
    r.known(data, ("scenario", "speed", "excitations", "motor", "margin", "torsion", "record"), "")
    title, description, units = parse_head(r, data)
    speed = parse_speed(r, r.table(data, "speed", "speed"))
    motor = parse_motor(r, r.table(data, "motor", "motor", required=False), "torsional")
    given = parse_excitations(r, r.array(data, "excitations", "excitations", required=False), motor, required=False)
    rules = parse_rules(r, r.table(data, "margin", "margin", required=False))
    t = r.table(data, "torsion", "torsion")
    r.known(
        t,
        (
            "damping_ratio",
            "driver_shaft",
            "shaft_orders",
            "shaft_excitations",
            "stations",
            "shafts",
            "couplings",
            "meshes",
            "rated_torque",
            "forcing",
        ),
        "torsion",
    )
    zeta = None
    if "damping_ratio" in t:
        zeta = r.value(t["damping_ratio"], "torsion.damping_ratio", "ratio", "nonnegative")
        if not zeta < 1.0:
            raise r.fail("torsion.damping_ratio", f"got {zeta:g}; expected a ratio below 1")
    stations = []
    for i, item in enumerate(r.array(t, "stations", "torsion.stations")):
        field = f"torsion.stations[{i}]"
        if not isinstance(item, Mapping):
            raise r.fail(field, f"got {item!r}; expected a table with name and inertia")
        r.known(item, ("name", "inertia", "shaft"), field)
        inertia = r.quantity(item, "inertia", f"{field}.inertia", "inertia", "positive")
        stations.append(
            Station(r.text(item, "name", f"{field}.name"), inertia, r.text(item, "shaft", f"{field}.shaft", "driver"))
        )
    driver = _driver_shaft(r, t, stations)
    springs: list[TorsionalShaft] = []
    allowables: dict[str, Allowable] = {}
    for key, kind in (("shafts", TorsionalShaft), ("couplings", Coupling)):
        for i, item in enumerate(r.array(t, key, f"torsion.{key}", required=False)):
            field = f"torsion.{key}[{i}]"
            spring, allowed = _parse_spring(r, item, field, kind)
            if spring.label in allowables:
                raise r.fail(
                    f"{field}.label", f"got {spring.label!r}, used by another element; expected a label of its own"
                )
            allowables[spring.label] = allowed
            springs.append(spring)
    meshes, teeth = [], []
    for i, item in enumerate(r.array(t, "meshes", "torsion.meshes", required=False)):
        field = f"torsion.meshes[{i}]"
        if not isinstance(item, Mapping):
            raise r.fail(field, f"got {item!r}; expected a table with gear, pinion and ratio")
        r.known(item, ("gear", "pinion", "ratio", "stiffness", "gear_teeth", "pinion_teeth", "allowable_torque"), field)
        z_gear = _teeth(r, item, "gear_teeth", field)
        z_pinion = _teeth(r, item, "pinion_teeth", field)
        if z_gear is None:  # a mesh declares its mesh frequency: it is checked, never skipped
            raise r.fail(
                f"{field}.gear_teeth",
                "missing; the gear mesh frequency (teeth x the gear's speed) is checked against every torsional "
                "mode: give the gear's teeth",
            )
        if "ratio" in item:
            ratio = r.quantity(item, "ratio", f"{field}.ratio", "ratio", "positive")
            if z_gear is not None and z_pinion is not None and not math.isclose(ratio, z_gear / z_pinion, rel_tol=1e-6):
                raise r.fail(
                    f"{field}.ratio",
                    f"got {ratio:g}, but {z_gear} / {z_pinion} teeth give {z_gear / z_pinion:.6g}; "
                    "expected the ratio of the teeth (or leave the ratio out)",
                )
        elif z_gear is not None and z_pinion is not None:
            ratio = z_gear / z_pinion
        else:
            raise r.fail(f"{field}.ratio", "missing; expected the speed ratio, or the gear's and the pinion's teeth")
        mesh_k: float | None = None
        if "stiffness" in item:
            mesh_k = r.value(item["stiffness"], f"{field}.stiffness", "moment_stiffness", "positive")
        try:
            mesh = GearMesh(
                r.text(item, "gear", f"{field}.gear"), r.text(item, "pinion", f"{field}.pinion"), ratio, mesh_k
            )
        except ScenarioError:
            raise
        except InputValueError as error:
            raise r.fail(f"{field}.ratio", str(error)) from None
        meshes.append(mesh)
        if "allowable_torque" in item:
            if mesh_k is None:
                raise r.fail(f"{field}.allowable_torque", "a rigid mesh carries no modelled twist; give its stiffness")
            allowables[f"mesh {meshes[-1].gear}-{meshes[-1].pinion}"] = _allowable(r, item, field, None)
        if z_gear is not None:
            teeth.append((i, meshes[-1], z_gear))
    try:
        train = torsional_train(stations, springs, meshes, driver)
    except InputValueError as error:
        text = str(error)
        head = text.split(":", 1)[0].split(" ")[0].split("[")[0]
        where = {
            "springs": "torsion.shafts/couplings",
            "springs/meshes": "torsion.shafts/couplings/meshes",
            "meshes": "torsion.meshes",
            "stations": "torsion.stations",
            "reference": "torsion.driver_shaft",
        }
        raise r.fail(where.get(head, "torsion"), text) from None
    if train.model.size < 2:
        raise r.fail(
            "torsion.stations",
            f"the train has {len(stations)} station(s) moving as one inertia: no torsional mode to check; "
            "expected two or more stations joined by shafts, couplings or compliant meshes",
        )
    orders = []
    for i, n in enumerate(r.array(t, "shaft_orders", "torsion.shaft_orders", required=False) or [1, 2]):
        orders.append(r.value(n, f"torsion.shaft_orders[{i}]", "ratio", "positive"))
    excitations = list(given)
    for shaft in train.speed_ratio:
        given_at = "torsion.shaft_orders" if "shaft_orders" in t else "torsion.shaft_orders (default 1x and 2x)"
        excitations += [
            dataclasses.replace(shaft_order(train, shaft, n, f"{n:g}x {shaft} shaft"), source=f"{given_at}, {shaft!r}")
            for n in orders
        ]
    shaft_of = {s.name: s.shaft for s in stations}
    for i, mesh, z in teeth:
        excitations.append(
            dataclasses.replace(
                shaft_order(train, shaft_of[mesh.gear], float(z), f"gear mesh {mesh.gear}-{mesh.pinion} ({z} teeth)"),
                source=f"torsion.meshes[{i}].gear_teeth ({z} x the speed of shaft {shaft_of[mesh.gear]!r})",
            )
        )
    excitations += _shaft_excitations(r, t, train)
    labels = [e.label for e in excitations]
    if len(set(labels)) != len(labels):
        repeated = sorted({x for x in labels if labels.count(x) > 1})
        raise r.fail("excitations", f"label {repeated[0]!r} is used twice; expected distinct labels")
    forcing = _parse_forcing(r, t, train, {e.label: e for e in excitations})
    return TorsionScenario(
        title,
        description,
        units,
        speed,
        tuple(excitations),
        rules,
        train,
        zeta,
        plain_tables(data),
        source,
        motor,
        parse_record(r, r.table(data, "record", "record", required=False)),
        None,
        forcing,
        allowables,
    )


def _driver_shaft(r: TableReader, t: Mapping[str, Any], stations: list[Station]) -> str:
    # The shaft whose speed [speed] gives: named, or the one called "driver", or the only one. Never the
    # order of the stations, which would silently move every order and margin to another shaft's speed.
    shafts = list(dict.fromkeys(st.shaft for st in stations))
    if "driver_shaft" in t:
        name = r.text(t, "driver_shaft", "torsion.driver_shaft")
        if name not in shafts:
            raise r.fail("torsion.driver_shaft", f"got {name!r}, a shaft no station is on; expected one of {shafts}")
        return name
    if "driver" in shafts:
        return "driver"
    if len(shafts) == 1:
        return shafts[0]
    raise r.fail(
        "torsion.driver_shaft",
        f"missing; the stations are on shafts {shafts} and none is called 'driver': name the shaft whose speed "
        "[speed] gives",
    )


def _parse_spring(
    r: TableReader, item: Any, field: str, kind: type[TorsionalShaft]
) -> tuple[TorsionalShaft, Allowable]:
    # A shaft (stiffness, uniform section or stepped sections) or a coupling, with its allowable.
    if not isinstance(item, Mapping):
        raise r.fail(field, f"got {item!r}; expected a table with between and stiffness")
    allowed = ["between", "stiffness", "damping", "label", "outer_diameter", "inner_diameter", "allowable_torque"]
    shaft_only = ["length", "shear_modulus", "sections", "allowable_stress"]
    r.known(item, [*allowed, *(shaft_only if kind is TorsionalShaft else [])], field)
    between = r.array(item, "between", f"{field}.between")
    if len(between) != 2 or not all(isinstance(b, str) for b in between):
        raise r.fail(f"{field}.between", f"got {between!r}; expected two station names")
    if between[0] == between[1]:
        raise r.fail(f"{field}.between", f"got {between!r}; expected two different stations")
    d_out = (
        r.value(item["outer_diameter"], f"{field}.outer_diameter", "length", "positive")
        if "outer_diameter" in item
        else None
    )
    d_in = r.value(item.get("inner_diameter", 0.0), f"{field}.inner_diameter", "length", "nonnegative")
    ways = [k for k in ("stiffness", "length", "sections") if k in item]
    if len(ways) > 1:
        raise r.fail(field, f"gives {' and '.join(ways)}; expected one of stiffness, length (uniform) or sections")
    if "stiffness" in item:
        k = r.quantity(item, "stiffness", f"{field}.stiffness", "moment_stiffness", "positive")
    elif "sections" in item:
        if "outer_diameter" in item or "inner_diameter" in item:
            raise r.fail(f"{field}.outer_diameter", "the sections give the diameters; remove it")
        g = r.quantity(item, "shear_modulus", f"{field}.shear_modulus", "pressure", "positive")
        k, d_out, d_in = _stepped(r, item, field, g)
    elif "length" in item and d_out is not None:
        try:
            k = hollow_shaft_stiffness(
                r.quantity(item, "shear_modulus", f"{field}.shear_modulus", "pressure", "positive"),
                r.quantity(item, "length", f"{field}.length", "length", "positive"),
                d_out,
                d_in,
            )
        except InputValueError as error:
            raise r.fail(field, str(error)) from None
    else:
        raise r.fail(
            f"{field}.stiffness",
            "missing; expected a stiffness (or a shaft's length, diameters and G, or its sections and G)",
        )
    damping = r.value(item.get("damping", 0.0), f"{field}.damping", "moment_damping", "nonnegative")
    label = r.text(item, "label", f"{field}.label", f"{between[0]}-{between[1]}")
    allowable = _allowable(r, item, field, d_out)
    try:
        return kind((between[0], between[1]), k, damping, label, d_out, d_in), allowable
    except InputValueError as error:
        raise r.fail(field, str(error)) from None


def _stepped(r: TableReader, item: Mapping[str, Any], field: str, g: float) -> tuple[float, float, float]:
    # A stepped shaft's sections in series; the stress is taken at the section of least modulus (the largest).
    sections = []
    for j, sec in enumerate(r.array(item, "sections", f"{field}.sections")):
        where = f"{field}.sections[{j}]"
        if not isinstance(sec, Mapping):
            raise r.fail(where, f"got {sec!r}; expected a table with length and outer_diameter")
        r.known(sec, ("length", "outer_diameter", "inner_diameter"), where)
        sections.append(
            (
                r.quantity(sec, "length", f"{where}.length", "length", "positive"),
                r.quantity(sec, "outer_diameter", f"{where}.outer_diameter", "length", "positive"),
                r.value(sec.get("inner_diameter", 0.0), f"{where}.inner_diameter", "length", "nonnegative"),
            )
        )
    if not sections:
        raise r.fail(f"{field}.sections", "empty; expected one or more sections")
    try:
        k = stepped_shaft_stiffness(g, sections)
    except InputValueError as error:
        raise r.fail(f"{field}.{str(error).split(':', 1)[0]}", str(error).split(": ", 1)[1]) from None
    _, d_out, d_in = min(sections, key=lambda x: (x[1] ** 4 - x[2] ** 4) / x[1])
    return k, d_out, d_in


def _teeth(r: TableReader, item: Mapping[str, Any], key: str, field: str) -> int | None:
    if key not in item:
        return None
    z = r.integer(item, key, f"{field}.{key}")
    if not 1 <= z <= 10_000:
        raise r.fail(f"{field}.{key}", f"got {str(z)[:20]}; expected a whole number from 1 to 10000")
    return z


def _shaft_excitations(r: TableReader, t: Mapping[str, Any], train: TorsionalTrain) -> list[Excitation]:
    # Orders of any shaft's own speed (a screw compressor's lobe pass, a pump's vane pass on the output shaft).
    out = []
    for i, item in enumerate(r.array(t, "shaft_excitations", "torsion.shaft_excitations", required=False)):
        field = f"torsion.shaft_excitations[{i}]"
        if not isinstance(item, Mapping):
            raise r.fail(field, f"got {item!r}; expected a table with shaft, order and label")
        r.known(item, ("shaft", "order", "label"), field)
        shaft = r.text(item, "shaft", f"{field}.shaft")
        if shaft not in train.speed_ratio:
            raise r.fail(f"{field}.shaft", f"got {shaft!r}; expected one of {sorted(train.speed_ratio)}")
        order = r.quantity(item, "order", f"{field}.order", "ratio", "positive")
        label = r.text(item, "label", f"{field}.label", f"{order:g}x {shaft} shaft")
        out.append(
            dataclasses.replace(
                shaft_order(train, shaft, order, label), source=f"{field} ({order:g} x the speed of shaft {shaft!r})"
            )
        )
    return out


def _allowable(r: TableReader, item: Mapping[str, Any], field: str, d_out: float | None) -> Allowable:
    torque = None
    if "allowable_torque" in item:
        torque = r.quantity(item, "allowable_torque", f"{field}.allowable_torque", "torque", "positive")
    stress = None
    if "allowable_stress" in item:
        if d_out is None:
            raise r.fail(f"{field}.allowable_stress", "needs the section's outer_diameter to compute a stress")
        stress = r.quantity(item, "allowable_stress", f"{field}.allowable_stress", "stress", "positive")
    return Allowable(torque, stress)


def _parse_forcing(
    r: TableReader, t: Mapping[str, Any], train: TorsionalTrain, excitations: Mapping[str, Excitation]
) -> tuple[TorqueCase, ...]:
    rated = r.quantity(t, "rated_torque", "torsion.rated_torque", "torque", "positive") if "rated_torque" in t else None
    shaft_of = {st.name: st.shaft for st in train.stations}
    cases: list[TorqueCase] = []
    for i, item in enumerate(r.array(t, "forcing", "torsion.forcing", required=False)):
        field = f"torsion.forcing[{i}]"
        if not isinstance(item, Mapping):
            raise r.fail(field, f"got {item!r}; expected a table with station, excitation and torque")
        r.known(item, ("label", "station", "excitation", "torque", "fraction_of_rated"), field)
        station = r.text(item, "station", f"{field}.station")
        if station not in shaft_of:
            raise r.fail(f"{field}.station", f"got {station!r}; expected one of {sorted(shaft_of)}")
        source = r.text(item, "excitation", f"{field}.excitation")
        if source not in excitations:
            raise r.fail(
                f"{field}.excitation",
                f"got {source!r}; expected the label of a checked excitation, one of {sorted(excitations)}",
            )
        if ("torque" in item) == ("fraction_of_rated" in item):
            raise r.fail(field, "expected exactly one of torque or fraction_of_rated")
        if "torque" in item:
            torque = r.quantity(item, "torque", f"{field}.torque", "torque", "positive")
        else:
            if rated is None:
                raise r.fail(f"{field}.fraction_of_rated", "needs torsion.rated_torque (the driver's rated torque)")
            fraction = r.value(item["fraction_of_rated"], f"{field}.fraction_of_rated", "ratio", "positive")
            if not fraction <= 10.0:
                raise r.fail(
                    f"{field}.fraction_of_rated",
                    f"got {fraction:g}; expected a fraction of the rated torque up to 10 (0.01 is 1 %)",
                )
            # The driver's rated torque taken to the station's shaft (power is the same on every shaft).
            torque = fraction * rated / train.speed_ratio[shaft_of[station]]
        label = r.text(item, "label", f"{field}.label", f"{source} at {station}")
        cases.append(TorqueCase(label, station, excitations[source], torque))
    names = [c.label for c in cases]
    if len(set(names)) != len(names):
        raise r.fail("torsion.forcing", f"labels {names} repeat; expected distinct labels")
    return tuple(cases)


load_torsion_scenario = scenario_loader(parse_torsion_scenario, "torsional")
