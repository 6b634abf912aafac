"""The entries of a ``[space]`` table, read one table at a time: bodies, mounts, soil, frame, loads, probes.

Each reader returns the validated objects of its table; errors name the file and the field
(``fan.toml: space.mounts[2].stiffness: ...``). :func:`~resonance.kinds.space.scenario.parse_space_scenario`
puts them together.
"""

from __future__ import annotations

from collections.abc import Mapping, Sequence
from dataclasses import dataclass
from typing import Any

import numpy as np

from ...checks.unbalance import permissible_unbalance
from ...core.errors import InputValueError
from ...records.tables import ScenarioError, TableReader
from .bodies import FrameNode, Mount, RigidBody, box_inertia, equivalent_box
from .frame import Beam

__all__ = ["SoilSpec"]  # the readers are the scenario parser's own steps


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


def read_point(r: TableReader, raw: Any, field: str) -> np.ndarray:
    """A point ``[x, y, z]`` [m], or an error naming the field."""
    if not isinstance(raw, list) or len(raw) != 3:
        raise r.fail(field, f"got {raw!r}; expected three coordinates [x, y, z]")
    return np.array([r.value(v, f"{field}[{i}]", "length") for i, v in enumerate(raw)])


def read_triple(r: TableReader, item: Mapping[str, Any], key: str, field: str, kind: Any) -> np.ndarray:
    """Three non-negative values (x, y, z) of a mount, zero where not given, or an error naming the field."""
    raw = item.get(key, [0.0, 0.0, 0.0])
    if not isinstance(raw, list) or len(raw) != 3:
        raise r.fail(f"{field}.{key}", f"got {raw!r}; expected three values (x, y, z)")
    return np.array([r.value(v, f"{field}.{key}[{i}]", kind, "nonnegative") for i, v in enumerate(raw)])


def read_bodies(r: TableReader, t: Mapping[str, Any]) -> list[RigidBody]:
    """The ``space.bodies`` entries: each by its box or its inertia tensor."""
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
                    read_point(r, item.get("center"), f"{field}.center"),
                    inertia,
                )
            )
        except ScenarioError:
            raise  # already names the file and the field
        except InputValueError as error:
            raise r.fail(field, str(error)) from None
    return bodies


def read_mounts(r: TableReader, t: Mapping[str, Any]) -> list[Mount]:
    """The ``space.mounts`` entries: point, bodies joined, stiffness and damping in the mount's axes."""
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
                    read_point(r, item.get("point"), f"{field}.point"),
                    r.text(item, "body", f"{field}.body"),
                    r.text(item, "other", f"{field}.other", "ground"),
                    read_triple(r, item, "stiffness", field, "stiffness"),
                    read_triple(r, item, "damping", field, "damping"),
                    read_triple(r, item, "rotational_stiffness", field, "moment_stiffness"),
                    read_triple(r, item, "rotational_damping", field, "moment_damping"),
                )
            )
        except ScenarioError:
            raise  # already names the file and the field
        except InputValueError as error:
            raise r.fail(field, str(error)) from None
    return mounts


def read_soil(r: TableReader, t: Mapping[str, Any], bodies: Sequence[RigidBody]) -> SoilSpec | None:
    """The ``space.soil`` table (None without one): the footing under its block, its base and the soil."""
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
            base = read_point(r, s["point"], "space.soil.point")
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
    return soil


def read_frame(r: TableReader, t: Mapping[str, Any]) -> tuple[list[FrameNode], list[Beam]]:
    """The frame: ``space.nodes`` and ``space.beams``."""
    nodes = []
    for i, item in enumerate(r.array(t, "nodes", "space.nodes", required=False)):
        field = f"space.nodes[{i}]"
        if not isinstance(item, Mapping):
            raise r.fail(field, f"got {item!r}; expected a table with name and point")
        r.known(item, ("name", "point"), field)
        try:
            nodes.append(
                FrameNode(r.text(item, "name", f"{field}.name"), read_point(r, item.get("point"), f"{field}.point"))
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
    return nodes, beams


def read_unbalances(
    r: TableReader, t: Mapping[str, Any], rotor_speed: float
) -> list[tuple[str, np.ndarray, np.ndarray, float]]:
    """The ``space.unbalance`` entries as (body, point, axis, amount); a grade is taken at ``rotor_speed`` [rpm]."""
    unbalance = []
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
            (r.text(item, "body", f"{field}.body"), read_point(r, item.get("point"), f"{field}.point"), axis, amount)
        )
    return unbalance


def read_forces(r: TableReader, t: Mapping[str, Any]) -> list[tuple[str, np.ndarray, np.ndarray, np.ndarray, float]]:
    """The ``space.forces`` entries as (body, point, force, moment, order)."""
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
        point = read_point(r, item.get("point"), f"{field}.point")
        forces.append((r.text(item, "body", f"{field}.body"), point, vectors[0], vectors[1], order))
    return forces


def read_probes(r: TableReader, t: Mapping[str, Any]) -> list[tuple[str, str, np.ndarray]]:
    """The ``space.probes`` entries as (label, body, point)."""
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
                read_point(r, item.get("point"), f"{field}.point"),
            )
        )
    return probes
