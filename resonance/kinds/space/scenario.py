"""Supports-in-space scenario files: bodies, frame, mounts, soil, unbalances and probes in TOML.

A scenario file with a ``[space]`` table (see ``notebooks/scenarios/fan_skid_block.toml``)::

    [space]
    damping_ratio = 0.02   # modal, on top of the mounts' and the soil's dashpots
    # A body by its box or by its 3 x 3 inertia tensor (inertia = [["70000 kg*m**2", ...], [...], [...]]).
    bodies = [
      { name = "fan", mass = "2400 kg", center = ["0 m", "0 m", "1.9 m"], box = ["2.0 m", "1.4 m", "1.5 m"] },
      { name = "block", mass = "52000 kg", center = ["0 m", "0 m", "0.6 m"], box = ["5 m", "4 m", "1.2 m"] },
    ]
    # An unbalance by amount, or by balance_grade with rotor_mass; forces take force and/or moment.
    unbalance = [{ body = "fan", point = ["0.9 m", "0 m", "1.9 m"], axis = [1, 0, 0], amount = "2500 g*mm" }]
    forces = [{ body = "fan", point = ["0 m", "0 m", "1.9 m"], force = ["0 N", "300 N", "0 N"], order = 2 }]
    probes = [{ label = "fan DE bearing", body = "fan", point = ["0.9 m", "0 m", "1.9 m"] }]

    [[space.mounts]]     # one table per mount (or an inline table on one line each)
    label = "isolator 1"
    body = "fan"
    other = "block"
    point = ["0.9 m", "0.6 m", "1.2 m"]
    stiffness = ["1.5 kN/mm", "1.5 kN/mm", "4 kN/mm"]
    damping = ["3 kN*s/m", "3 kN*s/m", "6 kN*s/m"]

    [space.soil]         # the footing: width_x and width_y, or radius
    body = "block"
    shear_modulus = "70 MPa"
    poisson_ratio = 0.33
    density = "1900 kg/m**3"
    width_x = "5 m"
    width_y = "4 m"
    embedment = "0.5 m"

A steel frame (optional) adds nodes, beams, fixed nodes and bodies attached rigidly to nodes::

    [space]
    nodes = [{ name = "n1", point = ["0 m", "0 m", "0.2 m"] }, { name = "n2", point = ["2 m", "0 m", "0.2 m"] }]
    fixed = ["n1"]
    attached = { fan = "n2" }

    [[space.beams]]
    label = "rail"
    between = ["n1", "n2"]
    youngs_modulus = "210 GPa"
    shear_modulus = "81 GPa"
    density = "7850 kg/m**3"
    area = "40 cm**2"
    iy = "2000 cm**4"
    iz = "400 cm**4"
    torsion_constant = "20 cm**4"

The soil is the footing under its body's base (the lowest face of the body's box, or of the box with the
same principal moments for a body given by its inertia, or ``point``), with the
stiffness and radiation damping of :mod:`resonance.kinds.space.soil`; its mass ratios take every body's mass and
inertia. Every mode (kind ``"structural"``) is checked against every excitation by the flat margin
(``margin.flat``); the unbalances rotate at 1x over the speeds; each probe's casing velocity in x, y and z
(RMS of the 1x response) is compared with the ISO 10816-3 zones (an estimate: the zones are broadband field
criteria). ``[whatif] tolerance`` sets a band on the mounts' stiffness, the soil's shear modulus and the frame
checked together; ``[whatif] vary_mounts`` names the mounts a what-if factor scales (the isolators, not the
anchor bolts; all mounts if omitted). Errors name the file and the field.
"""

from __future__ import annotations

import dataclasses
import math
import os
from collections.abc import Mapping
from dataclasses import dataclass
from pathlib import Path
from typing import Any

import numpy as np

from ...checks.excitations import Excitation
from ...checks.rules import RuleSet
from ...checks.speed_range import OperatingRange
from ...checks.unbalance import permissible_unbalance
from ...core.errors import InputValueError
from ...core.units import UnitSystem
from ...records.tables import (
    MotorSpec,
    RecordSpec,
    ScenarioError,
    TableReader,
    parse_excitations,
    parse_head,
    parse_motor,
    parse_record,
    parse_rules,
    parse_speed,
    parse_vibration,
    plain_tables,
    read_scenario_bytes,
)
from .bodies import (
    FrameNode,
    Mount,
    RigidBody,
    SpaceModel,
    box_inertia,
    equivalent_box,
    space_model,
)
from .frame import Beam
from .soil import FootingImpedance, footing_impedance, soil_mount

__all__ = ["SoilSpec", "SpaceScenario", "load_space_scenario", "parse_space_scenario"]


@dataclass(frozen=True)
class SoilSpec:
    """The soil under a body, as given.

    Attributes
    ----------
    body : str
        The block.
    point : numpy.ndarray
        Centre of the footing's base [m].
    shear_modulus, poisson_ratio, density : float
        ``G`` [Pa], ``nu`` [-], ``rho`` [kg/m^3].
    radius : float or None
        A circular footing's radius [m].
    width_x, width_y : float or None
        A rectangular footing's sides [m].
    embedment : float
        [m].
    """

    body: str
    point: np.ndarray
    shear_modulus: float
    poisson_ratio: float
    density: float
    radius: float | None
    width_x: float | None
    width_y: float | None
    embedment: float


@dataclass(frozen=True)
class SpaceScenario:
    """A validated supports-in-space scenario.

    Attributes
    ----------
    title, description : str
        As written.
    units : {"SI", "US"}
        Display units.
    speed : OperatingRange
        Speeds of continuous operation [rpm].
    excitations : tuple of Excitation
        Orders, electrical and fixed sources.
    rules : RuleSet
        Margin rules (a flat margin is required).
    bodies, mounts, nodes, beams : tuple
        The model as given.
    fixed : tuple of str
        Frame nodes held.
    attached : dict of str to str
        Bodies fixed to nodes.
    soil : SoilSpec or None
        The soil under a block.
    damping_ratio : float
        Modal damping on top of the dashpots [-].
    unbalance : tuple of (str, numpy.ndarray, numpy.ndarray, float)
        Body, point, shaft axis and ``m e`` [kg m] of each unbalance.
    forces : tuple of (str, numpy.ndarray, numpy.ndarray, numpy.ndarray, float)
        Body, point, force [N] and moment [N m] amplitudes (global axes, in phase) and the running-speed order
        they act at (a misalignment force at 2x, a blade-pass force at 8x).
    probes : tuple of (str, str, numpy.ndarray)
        Label, body and point of each reading.
    group : {1, 2}
        ISO machine group.
    support : {"rigid", "flexible"}
        Declared support class.
    tolerance : float
        What-if band on mount stiffness and soil shear modulus [-].
    vary_mounts : tuple of str
        The mounts a what-if factor scales (isolators, not anchor bolts); all if the file names none.
    tables : dict
        As read.
    source : str
        The file name.
    motor : MotorSpec or None
        The motor.
    record : RecordSpec
        Revision fields.
    sha256 : str or None
        SHA-256 of the file's bytes.
    """

    title: str
    description: str
    units: UnitSystem
    speed: OperatingRange
    excitations: tuple[Excitation, ...]
    rules: RuleSet
    bodies: tuple[RigidBody, ...]
    mounts: tuple[Mount, ...]
    nodes: tuple[FrameNode, ...]
    beams: tuple[Beam, ...]
    fixed: tuple[str, ...]
    attached: dict[str, str]
    soil: SoilSpec | None
    damping_ratio: float
    unbalance: tuple[tuple[str, np.ndarray, np.ndarray, float], ...]
    forces: tuple[tuple[str, np.ndarray, np.ndarray, np.ndarray, float], ...]
    probes: tuple[tuple[str, str, np.ndarray], ...]
    group: int
    support: str
    tolerance: float
    vary_mounts: tuple[str, ...]
    tables: dict[str, Any] = dataclasses.field(compare=False)
    source: str = "<space scenario>"
    motor: MotorSpec | None = None
    record: RecordSpec = dataclasses.field(default_factory=RecordSpec)
    sha256: str | None = dataclasses.field(default=None, compare=False)

    def replace(self, **changes: Any) -> SpaceScenario:
        """A copy with some fields changed (the copy has no file hash unless given).

        Parameters
        ----------
        **changes
            Fields to change.

        Returns
        -------
        SpaceScenario

        Raises
        ------
        TypeError
            An unknown field.
        """
        return dataclasses.replace(self, **{"sha256": None, **changes})

    def footing(self, shear_factor: float = 1.0) -> FootingImpedance | None:
        """The soil's impedance (None without soil), with the shear modulus scaled.

        Parameters
        ----------
        shear_factor : float
            Factor on ``G`` [-].

        Returns
        -------
        FootingImpedance or None

        Raises
        ------
        InputValueError
            A factor the soil formulas refuse.
        """
        if self.soil is None:
            return None
        s = self.soil
        mass = sum(b.mass for b in self.bodies)
        inertia = np.zeros((3, 3))
        for b in self.bodies:  # every body about the footing's base centre (parallel axes)
            r = b.center - s.point
            inertia += b.inertia + b.mass * (float(r @ r) * np.eye(3) - np.outer(r, r))
        return footing_impedance(
            s.shear_modulus * shear_factor,
            s.poisson_ratio,
            s.density,
            mass,
            inertia[0, 0],
            inertia[1, 1],
            inertia[2, 2],
            s.radius,
            s.width_x,
            s.width_y,
            s.embedment,
        )

    def build(
        self,
        mount_factor: float = 1.0,
        shear_factor: float = 1.0,
        damping_ratio: float | None = None,
        frame_factor: float = 1.0,
    ) -> SpaceModel:
        """The assembled model with the mounts' stiffness, the soil's shear modulus and the frame scaled.

        Parameters
        ----------
        mount_factor : float
            Factor on the stiffness of the mounts in ``vary_mounts`` [-] (> 0).
        shear_factor : float
            Factor on the soil's shear modulus [-] (> 0).
        damping_ratio : float, optional
            Modal damping ratio instead of the scenario's.
        frame_factor : float
            Factor on every beam's Young's and shear moduli [-] (> 0).

        Returns
        -------
        SpaceModel

        Raises
        ------
        InputValueError
            A factor that is not finite and > 0, a mechanism.
        """
        for name, value in (
            ("mount_factor", mount_factor),
            ("shear_factor", shear_factor),
            ("frame_factor", frame_factor),
        ):
            if not (math.isfinite(value) and value > 0.0):
                raise InputValueError(f"{name}: got {value!r}; expected a finite factor > 0")
        mounts = [
            dataclasses.replace(
                m, stiffness=m.stiffness * mount_factor, rotational_stiffness=m.rotational_stiffness * mount_factor
            )
            if m.label in self.vary_mounts
            else m
            for m in self.mounts
        ]
        footing = self.footing(shear_factor)
        if footing is not None and self.soil is not None:
            mounts.append(soil_mount(footing, self.soil.body, self.soil.point))
        beams = [
            dataclasses.replace(
                b, youngs_modulus=b.youngs_modulus * frame_factor, shear_modulus=b.shear_modulus * frame_factor
            )
            for b in self.beams
        ]
        zeta = self.damping_ratio if damping_ratio is None else damping_ratio
        return space_model(self.bodies, mounts, self.nodes, beams, self.attached, self.fixed, zeta)


def _point(r: TableReader, raw: Any, field: str) -> np.ndarray:
    if not isinstance(raw, list) or len(raw) != 3:
        raise r.fail(field, f"got {raw!r}; expected three coordinates [x, y, z]")
    return np.array([r.value(v, f"{field}[{i}]", "length") for i, v in enumerate(raw)])


def _triple(r: TableReader, item: Mapping[str, Any], key: str, field: str, kind: Any) -> np.ndarray:
    raw = item.get(key, [0.0, 0.0, 0.0])
    if not isinstance(raw, list) or len(raw) != 3:
        raise r.fail(f"{field}.{key}", f"got {raw!r}; expected three values (x, y, z)")
    return np.array([r.value(v, f"{field}.{key}[{i}]", kind, "nonnegative") for i, v in enumerate(raw)])


def parse_space_scenario(data: Mapping[str, Any], source: str = "<space scenario>") -> SpaceScenario:
    """Validate a supports-in-space scenario given as nested tables (as read from TOML).

    Parameters
    ----------
    data : mapping
        The scenario's tables.
    source : str
        The file name errors start with.

    Returns
    -------
    SpaceScenario

    Raises
    ------
    ScenarioError
        Any missing, unknown or invalid field, a body with a non-physical inertia, a mount without stiffness,
        a mechanism; the message names ``source`` and the field.
    """
    r = TableReader(source)
    r.known(data, ("scenario", "speed", "excitations", "motor", "margin", "space", "vibration", "whatif", "record"), "")
    title, description, units = parse_head(r, data)
    speed = parse_speed(r, r.table(data, "speed", "speed"))
    motor = parse_motor(r, r.table(data, "motor", "motor", required=False))
    rules = parse_rules(r, r.table(data, "margin", "margin", required=False), judges_amplitude=True)
    if rules.flat is None:
        raise r.fail("margin.flat", "missing; supports are kept a flat margin from every excitation, e.g. flat = 15")
    t = r.table(data, "space", "space")
    r.known(
        t,
        (
            "damping_ratio",
            "bodies",
            "mounts",
            "soil",
            "nodes",
            "beams",
            "fixed",
            "attached",
            "unbalance",
            "forces",
            "probes",
        ),
        "space",
    )
    zeta = r.value(t.get("damping_ratio", 0.0), "space.damping_ratio", "ratio", "nonnegative")
    if not zeta < 1.0:
        raise r.fail("space.damping_ratio", f"got {zeta:g}; expected a ratio below 1")
    bodies = []
    for i, item in enumerate(r.array(t, "bodies", "space.bodies")):
        field = f"space.bodies[{i}]"
        if not isinstance(item, Mapping):
            raise r.fail(field, f"got {item!r}; expected a table with name, mass, center and box or inertia")
        r.known(item, ("name", "mass", "center", "box", "inertia"), field)
        mass = r.quantity(item, "mass", f"{field}.mass", "mass", "positive")
        if ("box" in item) == ("inertia" in item):
            raise r.fail(field, "give exactly one of box (edge lengths) or inertia (a 3 x 3 tensor)")
        if "box" in item:
            box = item["box"]
            if not isinstance(box, list) or len(box) != 3:
                raise r.fail(f"{field}.box", f"got {box!r}; expected three edge lengths")
            inertia = box_inertia(
                mass, *(r.value(v, f"{field}.box[{k}]", "length", "positive") for k, v in enumerate(box))
            )
        else:
            rows = item["inertia"]
            if (
                not isinstance(rows, list)
                or len(rows) != 3
                or not all(isinstance(x, list) and len(x) == 3 for x in rows)
            ):
                raise r.fail(f"{field}.inertia", "expected three rows of three values")
            inertia = np.array(
                [
                    [r.value(v, f"{field}.inertia[{a}][{b}]", "inertia") for b, v in enumerate(row)]
                    for a, row in enumerate(rows)
                ]
            )
        try:
            bodies.append(
                RigidBody(
                    r.text(item, "name", f"{field}.name"),
                    mass,
                    _point(r, item.get("center"), f"{field}.center"),
                    inertia,
                )
            )
        except ScenarioError:
            raise  # already names the file and the field
        except InputValueError as error:
            raise r.fail(field, str(error)) from None
    mounts = []
    for i, item in enumerate(r.array(t, "mounts", "space.mounts", required=False)):
        field = f"space.mounts[{i}]"
        if not isinstance(item, Mapping):
            raise r.fail(field, f"got {item!r}; expected a table")
        r.known(
            item,
            ("label", "body", "other", "point", "stiffness", "damping", "rotational_stiffness", "rotational_damping"),
            field,
        )
        try:
            mounts.append(
                Mount(
                    r.text(item, "label", f"{field}.label", f"mount {i + 1}"),
                    _point(r, item.get("point"), f"{field}.point"),
                    r.text(item, "body", f"{field}.body"),
                    r.text(item, "other", f"{field}.other", "ground"),
                    _triple(r, item, "stiffness", field, "stiffness"),
                    _triple(r, item, "damping", field, "damping"),
                    _triple(r, item, "rotational_stiffness", field, "moment_stiffness"),
                    _triple(r, item, "rotational_damping", field, "moment_damping"),
                )
            )
        except ScenarioError:
            raise  # already names the file and the field
        except InputValueError as error:
            raise r.fail(field, str(error)) from None
    soil = None
    if "soil" in t:
        s = r.table(t, "soil", "space.soil")
        r.known(
            s,
            ("body", "point", "shear_modulus", "poisson_ratio", "density", "radius", "width_x", "width_y", "embedment"),
            "space.soil",
        )
        body_name = r.text(s, "body", "space.soil.body")
        owner = next((b for b in bodies if b.name == body_name), None)
        if owner is None:
            raise r.fail("space.soil.body", f"got {body_name!r}; expected one of {[b.name for b in bodies]}")
        if "point" in s:
            base = _point(r, s["point"], "space.soil.point")
        else:  # the lowest face of the body's (equivalent) box: its centre minus half its height
            sides, axes = equivalent_box(owner.mass, owner.inertia)
            half = 0.5 * float(np.abs(axes[2]) @ sides)  # the box's half-height (its extent along z)
            base = np.round(owner.center - np.array([0.0, 0.0, half]), 9)  # to the nanometre: no round-off
        lengths = {
            k: r.quantity(s, k, f"space.soil.{k}", "length", "positive")
            for k in ("radius", "width_x", "width_y")
            if k in s
        }
        soil = SoilSpec(
            body_name,
            base,
            r.quantity(s, "shear_modulus", "space.soil.shear_modulus", "pressure", "positive"),
            r.quantity(s, "poisson_ratio", "space.soil.poisson_ratio", "ratio", "nonnegative"),
            r.quantity(s, "density", "space.soil.density", "density", "positive"),
            lengths.get("radius"),
            lengths.get("width_x"),
            lengths.get("width_y"),
            r.value(s.get("embedment", 0.0), "space.soil.embedment", "length", "nonnegative"),
        )
        height = 2.0 * float(owner.center[2] - base[2])  # the block's height, its base below its centre
        if soil.embedment > 0.0 and not soil.embedment <= height:
            raise r.fail(
                "space.soil.embedment",
                f"got {soil.embedment:g} m, deeper than the block {body_name!r} ({height:.4g} m from its base to "
                "its top); expected an embedment up to the block's height",
            )
    nodes = []
    for i, item in enumerate(r.array(t, "nodes", "space.nodes", required=False)):
        field = f"space.nodes[{i}]"
        if not isinstance(item, Mapping):
            raise r.fail(field, f"got {item!r}; expected a table with name and point")
        r.known(item, ("name", "point"), field)
        try:
            nodes.append(
                FrameNode(r.text(item, "name", f"{field}.name"), _point(r, item.get("point"), f"{field}.point"))
            )
        except ScenarioError:
            raise  # already names the file and the field
        except InputValueError as error:
            raise r.fail(field, str(error)) from None
    beams = []
    for i, item in enumerate(r.array(t, "beams", "space.beams", required=False)):
        field = f"space.beams[{i}]"
        if not isinstance(item, Mapping):
            raise r.fail(field, f"got {item!r}; expected a table")
        keys = ("youngs_modulus", "shear_modulus", "density", "area", "iy", "iz", "torsion_constant")
        r.known(item, ("label", "between", "up", *keys), field)
        between = r.array(item, "between", f"{field}.between")
        if len(between) != 2 or not all(isinstance(x, str) for x in between):
            raise r.fail(f"{field}.between", f"got {between!r}; expected two node names")
        kinds = ("pressure", "pressure", "density", "area", "second_moment", "second_moment", "second_moment")
        values = [r.quantity(item, k, f"{field}.{k}", kind, "positive") for k, kind in zip(keys, kinds, strict=True)]  # type: ignore[arg-type]
        up = None
        if "up" in item:
            raw = item["up"]
            if not isinstance(raw, list) or len(raw) != 3:
                raise r.fail(f"{field}.up", f"got {raw!r}; expected a direction [x, y, z]")
            up = np.array([r.value(v, f"{field}.up[{k}]", "ratio") for k, v in enumerate(raw)])
        try:
            e, g, rho, area, iy, iz, j = values
            label = r.text(item, "label", f"{field}.label", f"{between[0]}-{between[1]}")
            beams.append(Beam(label, between[0], between[1], e, g, rho, area, iy, iz, j, up))
        except ScenarioError:
            raise  # already names the file and the field
        except InputValueError as error:
            raise r.fail(field, str(error)) from None
    fixed = tuple(str(x) for x in r.array(t, "fixed", "space.fixed", required=False))
    attached = {str(k): str(v) for k, v in r.table(t, "attached", "space.attached", required=False).items()}
    unbalance = []
    rotor_speed = speed.speed_max
    for i, item in enumerate(r.array(t, "unbalance", "space.unbalance", required=False)):
        field = f"space.unbalance[{i}]"
        if not isinstance(item, Mapping):
            raise r.fail(field, f"got {item!r}; expected a table")
        r.known(item, ("body", "point", "axis", "amount", "balance_grade", "rotor_mass"), field)
        if "amount" in item and ("balance_grade" in item or "rotor_mass" in item):
            raise r.fail(
                field, "gives amount and a balance grade; expected one of amount, or balance_grade with rotor_mass"
            )
        if "amount" in item:
            amount = r.quantity(item, "amount", f"{field}.amount", "unbalance", "positive")
        elif "balance_grade" in item and "rotor_mass" in item:
            amount = permissible_unbalance(
                r.quantity(item, "balance_grade", f"{field}.balance_grade", "balance_grade", "positive"),
                r.quantity(item, "rotor_mass", f"{field}.rotor_mass", "mass", "positive"),
                rotor_speed,
            )
        else:
            raise r.fail(field, "give amount, or balance_grade with rotor_mass")
        axis_raw = item.get("axis")
        if not isinstance(axis_raw, list) or len(axis_raw) != 3:
            raise r.fail(f"{field}.axis", f"got {axis_raw!r}; expected the shaft direction [x, y, z]")
        axis = np.array([r.value(v, f"{field}.axis[{k}]", "ratio") for k, v in enumerate(axis_raw)])
        if not np.any(axis != 0.0):
            raise r.fail(f"{field}.axis", "got a zero vector; expected the shaft direction")
        unbalance.append(
            (r.text(item, "body", f"{field}.body"), _point(r, item.get("point"), f"{field}.point"), axis, amount)
        )
    forces = []
    for i, item in enumerate(r.array(t, "forces", "space.forces", required=False)):
        field = f"space.forces[{i}]"
        if not isinstance(item, Mapping):
            raise r.fail(field, f"got {item!r}; expected a table with body, point, force or moment, and order")
        r.known(item, ("body", "point", "force", "moment", "order"), field)
        if "force" not in item and "moment" not in item:
            raise r.fail(field, "give a force, a moment or both (three components each)")
        vectors = []
        for key, kind in (("force", "force"), ("moment", "torque")):
            raw = item.get(key, [0.0, 0.0, 0.0])
            if not isinstance(raw, list) or len(raw) != 3:
                raise r.fail(f"{field}.{key}", f"got {raw!r}; expected three components [x, y, z]")
            vectors.append(np.array([r.value(v, f"{field}.{key}[{k}]", kind) for k, v in enumerate(raw)]))  # type: ignore[arg-type]
        order = r.value(item.get("order", 1.0), f"{field}.order", "ratio", "positive")
        point = _point(r, item.get("point"), f"{field}.point")
        forces.append((r.text(item, "body", f"{field}.body"), point, vectors[0], vectors[1], order))
    probes = []
    for i, item in enumerate(r.array(t, "probes", "space.probes", required=False)):
        field = f"space.probes[{i}]"
        if not isinstance(item, Mapping):
            raise r.fail(field, f"got {item!r}; expected a table with label, body and point")
        r.known(item, ("label", "body", "point"), field)
        probes.append(
            (
                r.text(item, "label", f"{field}.label", f"probe {i + 1}"),
                r.text(item, "body", f"{field}.body"),
                _point(r, item.get("point"), f"{field}.point"),
            )
        )
    group, support = parse_vibration(r, r.table(data, "vibration", "vibration", required=False))
    whatif = r.table(data, "whatif", "whatif", required=False)
    r.known(whatif, ("tolerance", "vary_mounts"), "whatif")
    labels = [m.label for m in mounts]
    vary = tuple(str(x) for x in r.array(whatif, "vary_mounts", "whatif.vary_mounts", required=False)) or tuple(labels)
    for name in vary:
        if name not in labels:
            raise r.fail("whatif.vary_mounts", f"names {name!r}; expected mount labels from {labels}")
    tolerance = r.value(whatif.get("tolerance", 0.3), "whatif.tolerance", "ratio", "nonnegative")
    if not tolerance < 1.0:
        raise r.fail("whatif.tolerance", f"got {tolerance:g}; expected a fraction below 1")
    scenario = SpaceScenario(
        title,
        description,
        units,
        speed,
        parse_excitations(r, r.array(data, "excitations", "excitations"), motor),
        rules,
        tuple(bodies),
        tuple(mounts),
        tuple(nodes),
        tuple(beams),
        fixed,
        attached,
        soil,
        zeta,
        tuple(unbalance),
        tuple(forces),
        tuple(probes),
        group,
        support,
        tolerance,
        vary,
        plain_tables(data),
        source,
        motor,
        parse_record(r, r.table(data, "record", "record", required=False)),
    )
    for key, labels in (
        ("bodies", [b.name for b in bodies]),
        ("mounts", [m.label for m in mounts]),
        ("probes", [p[0] for p in probes]),
        ("nodes", [n.name for n in nodes]),
        ("beams", [b.label for b in beams]),
    ):
        repeated = sorted({x for x in labels if labels.count(x) > 1})
        if repeated:
            i = [j for j, x in enumerate(labels) if x == repeated[0]][1]
            raise r.fail(f"space.{key}[{i}]", f"{repeated[0]!r} is used twice; expected a name or label of its own")
    try:
        model = scenario.build()
    except InputValueError as error:
        raise r.fail("space", str(error)) from None
    # Each point read or loaded names its table and entry when its body or point is wrong.
    for key, items in (
        ("probes", [(b, p) for _label, b, p in scenario.probes]),
        ("unbalance", [(b, p) for b, p, _axis, _amount in scenario.unbalance]),
        ("forces", [(b, p) for b, p, *_ in scenario.forces]),
    ):
        for i, (body, point) in enumerate(items):
            try:
                model.motion(body, point)
            except InputValueError as error:
                raise r.fail(f"space.{key}[{i}].body", str(error).removeprefix("body: ")) from None
    return scenario


def load_space_scenario(path: str | os.PathLike[str]) -> SpaceScenario:
    """Read and validate a supports-in-space scenario file (TOML). The file is only read.

    Parameters
    ----------
    path : path-like
        The scenario file.

    Returns
    -------
    SpaceScenario
        With the file's SHA-256.

    Raises
    ------
    ScenarioError
        The file cannot be read, is not TOML, or has an invalid field.
    """
    data, sha256 = read_scenario_bytes(path)
    return parse_space_scenario(data, Path(os.fspath(path)).name).replace(sha256=sha256)
