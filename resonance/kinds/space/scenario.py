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
from collections.abc import Mapping
from dataclasses import dataclass
from typing import Any

import numpy as np

from ...core.errors import InputValueError
from ...records.excitation_tables import MotorSpec, parse_excitations, parse_motor, parse_speed
from ...records.head import ScenarioHead
from ...records.rule_tables import parse_rules, parse_vibration
from ...records.tables import (
    RecordSpec,
    TableReader,
    parse_head,
    parse_record,
    plain_tables,
    scenario_loader,
)
from .bodies import (
    FrameNode,
    Mount,
    RigidBody,
    SpaceModel,
    space_model,
)
from .frame import Beam
from .soil import FootingImpedance, footing_impedance, soil_mount
from .tables import (
    SoilSpec,
    read_bodies,
    read_forces,
    read_frame,
    read_mounts,
    read_probes,
    read_soil,
    read_unbalances,
)

__all__ = ["SoilSpec", "SpaceScenario", "load_space_scenario", "parse_space_scenario"]


@dataclass(frozen=True)
class SpaceScenario(ScenarioHead):
    """A validated supports-in-space scenario.

    The head (title, description, units, speed, excitations, rules) is that of
    :class:`~resonance.records.head.ScenarioHead`; these follow it.

    Attributes
    ----------
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
            The model of the scaled scenario.

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


def parse_space_scenario(data: Mapping[str, Any], source: str = "<space scenario>") -> SpaceScenario:
    """Validate a supports-in-space scenario given as nested tables (as read from TOML).

    Parameters
    ----------
    data : mapping
        The tables as read from TOML: ``[scenario]``, ``[speed]``, ``[space]`` (bodies, mounts, soil, frame,
        loads, probes), ``[[excitations]]``, ``[motor]``, ``[margin]``, ``[vibration]``, ``[whatif]``, ``[record]``.
    source : str
        The file name errors start with (``skid.toml: space.mounts[2].stiffness: ...``).

    Returns
    -------
    SpaceScenario
        Bodies, mounts, frame, soil, loads and probes, validated (no file hash).

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
    bodies = read_bodies(r, t)
    mounts = read_mounts(r, t)
    soil = read_soil(r, t, bodies)
    nodes, beams = read_frame(r, t)
    fixed = tuple(str(x) for x in r.array(t, "fixed", "space.fixed", required=False))
    attached = {str(k): str(v) for k, v in r.table(t, "attached", "space.attached", required=False).items()}
    unbalance = read_unbalances(r, t, speed.speed_max)
    forces = read_forces(r, t)
    probes = read_probes(r, t)
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


load_space_scenario = scenario_loader(parse_space_scenario, "supports-in-space")
