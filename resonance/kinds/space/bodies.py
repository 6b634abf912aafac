"""Rigid bodies in space on mounts and frames: six degrees of freedom per body, assembled into one model.

A machine, its skid and its block are rigid bodies (mass, centre of gravity, inertia tensor about the centre
of gravity in global axes) joined to each other and to ground by mounts at given points: three translational
stiffnesses and dampings in the mount's own axes, optionally three rotational ones (isolators, anchor bolts,
grout pads, the soil under a block from :mod:`resonance.kinds.space.soil`). Each body's coordinates are the translation
of its centre of gravity and a small rotation, ``q = [x, y, z, rx, ry, rz]``; a point ``p`` of the body
moves ``u = t + r x p_rel`` with ``p_rel = p - cg``, i.e. ``u = T q`` with ``T = [I, -[p_rel]x]``.

Global axes: any right-handed set; the demos take z up. Lengths in m, angles in rad, stiffness N/m and
N m/rad, damping N s/m and N m s/rad. The modes in words are in :mod:`resonance.kinds.space.modes`, the
response to unbalances and forces in :mod:`resonance.kinds.space.response`.

References
----------
.. [1] C. M. Harris and A. G. Piersol (eds.), *Harris' Shock and Vibration Handbook*, 5th ed., 2002, ch. 30
   (rigid body on resilient mounts: decoupled and coupled modes) (from memory).
.. [2] M. Géradin and D. Rixen, *Mechanical Vibrations*, 3rd ed., 2015, ch. 2 (rigid-body kinematics,
   small rotations).
"""

from __future__ import annotations

from collections.abc import Mapping, Sequence
from dataclasses import dataclass, field

import numpy as np

from ...core.errors import InputValueError
from ...core.inputs import as_matrix, as_si, as_si_array, check_parts
from ...dynamics.damping import modal_damping
from ...dynamics.model import MatrixModel, matrix_model
from .frame import Beam, beam_matrices

__all__ = [
    "DIRECTIONS",
    "FrameNode",
    "Mount",
    "RigidBody",
    "SpaceModel",
    "box_inertia",
    "equivalent_box",
    "point_motion",
    "space_model",
]


#: The six coordinates of a body, in order.
DIRECTIONS = ("x", "y", "z", "rx", "ry", "rz")


GROUND = "ground"


#: Each of the six rigid-body motions in words, as the mode descriptions and the errors say them.
MOTION_WORDS = {
    "x": "sliding in x",
    "y": "sliding in y",
    "z": "vertical (z)",
    "rx": "rocking about x",
    "ry": "rocking about y",
    "rz": "twisting about z",
}


def vector3(value: object, name: str, kind: str = "length", sign: str = "any") -> np.ndarray:
    """Three values (x, y, z) in SI, or an error naming the parameter."""
    out = as_si_array(value, name, kind, sign)  # type: ignore[arg-type]
    if out.shape != (3,):
        raise InputValueError(f"{name}: got {out.size} values; expected three (x, y, z)")
    return out


def _skew(r: np.ndarray) -> np.ndarray:
    return np.array([[0.0, -r[2], r[1]], [r[2], 0.0, -r[0]], [-r[1], r[0], 0.0]])


def equivalent_box(mass: float, inertia: np.ndarray) -> tuple[np.ndarray, np.ndarray]:
    """The uniform box with a body's mass and principal moments: its sides and their directions.

    Parameters
    ----------
    mass : float
        [kg].
    inertia : numpy.ndarray
        Inertia tensor about the centre of gravity [kg m^2].

    Returns
    -------
    sides : numpy.ndarray
        Edge lengths [m] along the principal axes (the inverse of :func:`box_inertia`).
    axes : numpy.ndarray
        The principal axes as columns (global coordinates).

    Raises
    ------
    Nothing
        Plain arithmetic (a body's inertia is validated).
    """
    moments, axes = np.linalg.eigh(inertia)
    i1, i2, i3 = moments
    sides = np.sqrt(np.clip(6.0 / mass * np.array([i2 + i3 - i1, i1 + i3 - i2, i1 + i2 - i3]), 0.0, None))
    return sides, axes


def box_inertia(mass: object, lx: object, ly: object, lz: object) -> np.ndarray:
    """Inertia tensor of a uniform box about its centre, box edges along the axes.

    Parameters
    ----------
    mass : float or pint.Quantity
        [kg] (> 0).
    lx, ly, lz : float or pint.Quantity
        Edge lengths [m] (> 0).

    Returns
    -------
    numpy.ndarray
        ``diag(m (ly^2 + lz^2), m (lx^2 + lz^2), m (lx^2 + ly^2)) / 12`` [kg m^2].

    Raises
    ------
    InputValueError, InputTypeError
        A value that is not finite and > 0.

    References
    ----------
    Any dynamics text (e.g. Meriam & Kraige, *Engineering Mechanics: Dynamics*, appendix D).
    """
    m = as_si(mass, "mass", "mass", "positive")
    a, b, c = (as_si(v, n, "length", "positive") for v, n in ((lx, "lx"), (ly, "ly"), (lz, "lz")))
    return np.diag([m * (b**2 + c**2), m * (a**2 + c**2), m * (a**2 + b**2)]) / 12.0


@dataclass(frozen=True)
class RigidBody:
    """A rigid body: mass, centre of gravity and inertia tensor about it (global axes).

    Attributes
    ----------
    name : str
        Unique name.
    mass : float
        [kg] (> 0).
    center : numpy.ndarray
        Centre of gravity [m], three coordinates.
    inertia : numpy.ndarray
        Inertia tensor about the centre of gravity [kg m^2], 3 x 3, symmetric positive definite, its
        principal moments meeting the triangle inequality (any real body does).
    """

    name: str
    mass: float
    center: np.ndarray
    inertia: np.ndarray

    def __post_init__(self) -> None:
        if not isinstance(self.name, str) or not self.name or self.name == GROUND:
            raise InputValueError(f"body name: got {self.name!r}; expected a name other than 'ground'")
        where = f"body {self.name!r}"
        object.__setattr__(self, "mass", as_si(self.mass, f"{where}: mass", "mass", "positive"))
        object.__setattr__(self, "center", vector3(self.center, f"{where}: center"))
        tensor = as_matrix(self.inertia, f"{where}: inertia", "inertia", 3)
        principal = np.linalg.eigvalsh(tensor)
        if principal[0] <= 0.0:
            raise InputValueError(
                f"{where}: inertia: not positive definite (principal moments {principal.round(6).tolist()} kg*m**2)"
            )
        if principal[2] > principal[0] + principal[1] * (1.0 + 1e-9):
            raise InputValueError(
                f"{where}: inertia: principal moments {principal.round(6).tolist()} kg*m**2 break the triangle "
                "inequality (I3 <= I1 + I2 for any real body)"
            )
        object.__setattr__(self, "inertia", tensor)

    @property
    def mass_matrix(self) -> np.ndarray:
        """The 6 x 6 mass matrix in the body's coordinates (about its centre of gravity)."""
        out = np.zeros((6, 6))
        out[:3, :3] = self.mass * np.eye(3)
        out[3:, 3:] = self.inertia
        return out


@dataclass(frozen=True)
class Mount:
    """A resilient mount (or an anchor, a grout pad, the soil) joining a body to another body or to ground.

    Attributes
    ----------
    label : str
        Name in tables.
    point : numpy.ndarray
        Where it acts [m] (global axes).
    body : str
        The body it carries.
    other : str
        The other body, or ``"ground"``.
    stiffness : numpy.ndarray
        Translational stiffness along the mount's three axes [N/m] (>= 0).
    damping : numpy.ndarray
        Translational damping along them [N s/m] (>= 0).
    rotational_stiffness : numpy.ndarray
        About the mount's axes [N m/rad] (>= 0).
    rotational_damping : numpy.ndarray
        About them [N m s/rad] (>= 0).
    axes : numpy.ndarray
        The mount's axes as rows in global coordinates (an orthonormal 3 x 3; identity: the global axes).
    """

    label: str
    point: np.ndarray
    body: str
    other: str = GROUND
    stiffness: np.ndarray = field(default_factory=lambda: np.zeros(3))
    damping: np.ndarray = field(default_factory=lambda: np.zeros(3))
    rotational_stiffness: np.ndarray = field(default_factory=lambda: np.zeros(3))
    rotational_damping: np.ndarray = field(default_factory=lambda: np.zeros(3))
    axes: np.ndarray = field(default_factory=lambda: np.eye(3))

    def __post_init__(self) -> None:
        where = f"mount {self.label!r}"
        object.__setattr__(self, "point", vector3(self.point, f"{where}: point"))
        for name, kind in (
            ("stiffness", "stiffness"),
            ("damping", "damping"),
            ("rotational_stiffness", "moment_stiffness"),
            ("rotational_damping", "moment_damping"),
        ):
            object.__setattr__(self, name, vector3(getattr(self, name), f"{where}: {name}", kind, "nonnegative"))
        if not (np.any(self.stiffness > 0.0) or np.any(self.rotational_stiffness > 0.0)):
            raise InputValueError(f"{where}: has no stiffness; expected at least one stiffness > 0")
        axes = np.asarray(self.axes, dtype=float)
        if axes.shape != (3, 3) or not np.allclose(axes @ axes.T, np.eye(3), atol=1e-9):
            raise InputValueError(f"{where}: axes: expected three orthonormal rows (a rotation matrix)")
        object.__setattr__(self, "axes", axes)
        if self.body == self.other:
            raise InputValueError(f"{where}: joins {self.body!r} to itself")


@dataclass(frozen=True)
class FrameNode:
    """A node of a steel frame: six coordinates at a point.

    Attributes
    ----------
    name : str
        Unique name (bodies and nodes share one namespace).
    point : numpy.ndarray
        Position [m].
    """

    name: str
    point: np.ndarray

    def __post_init__(self) -> None:
        if not isinstance(self.name, str) or not self.name or self.name == GROUND:
            raise InputValueError(f"node name: got {self.name!r}; expected a name other than 'ground'")
        object.__setattr__(self, "point", vector3(self.point, f"node {self.name!r}: point"))


@dataclass(frozen=True)
class SpaceModel:
    """Bodies, frame nodes, beams and mounts assembled: six coordinates per free body and per node.

    Attributes
    ----------
    bodies : tuple of RigidBody
        Every body (free ones own coordinates; attached ones ride rigidly on their node).
    mounts : tuple of Mount
        As given.
    model : MatrixModel
        Mass, stiffness and damping matrices; labels ``"owner.x"`` ... ``"owner.rz"``.
    owners : tuple of str
        Who owns each block of six coordinates (free bodies, then nodes).
    origins : tuple of numpy.ndarray
        Each owner's reference point (a body's centre of gravity, a node's position) [m].
    attached : dict of str to str
        Bodies fixed rigidly to a node.
    beams : tuple of Beam
        The frame's elements.
    """

    bodies: tuple[RigidBody, ...]
    mounts: tuple[Mount, ...]
    model: MatrixModel
    owners: tuple[str, ...] = ()
    origins: tuple[np.ndarray, ...] = ()
    attached: dict[str, str] = field(default_factory=dict)
    beams: tuple[Beam, ...] = ()

    def index(self, name: str) -> int:
        """The first coordinate of a body or node (an attached body's is its node's).

        Parameters
        ----------
        name : str
            A body or a node.

        Returns
        -------
        int

        Raises
        ------
        InputValueError
            An unknown name.
        """
        owner = self.attached.get(name, name)
        if owner not in self.owners:
            raise InputValueError(f"body: got {name!r}; expected one of {sorted({*self.owners, *self.attached})}")
        return 6 * self.owners.index(owner)

    def body(self, name: str) -> RigidBody:
        """A body by name.

        Parameters
        ----------
        name : str
            Its name.

        Returns
        -------
        RigidBody

        Raises
        ------
        InputValueError
            An unknown body.
        """
        for b in self.bodies:
            if b.name == name:
                return b
        raise InputValueError(f"body: got {name!r}; expected one of {[b.name for b in self.bodies]}")

    def motion(self, name: str, point: object) -> tuple[int, np.ndarray]:
        """Where a body's or node's point moves from: the owner's first coordinate and ``T`` (``u = T q``).

        Parameters
        ----------
        name : str
            A body or node.
        point : array_like
            The point [m].

        Returns
        -------
        tuple of (int, numpy.ndarray)
            The first coordinate and the 3 x 6 matrix.

        Raises
        ------
        InputValueError
            An unknown name or a bad point.
        """
        j = self.index(name)
        return j, _motion(self.origins[j // 6], point)


def _motion(origin: np.ndarray, point: object) -> np.ndarray:
    return np.hstack([np.eye(3), -_skew(vector3(point, "point") - origin)])


def point_motion(body: RigidBody, point: object) -> np.ndarray:
    """The 3 x 6 matrix ``T`` giving a body point's displacement from the body's coordinates, ``u = T q``.

    Parameters
    ----------
    body : RigidBody
        The body.
    point : array_like
        The point [m] (global axes).

    Returns
    -------
    numpy.ndarray
        ``[I, -[p - cg]x]`` (small rotations).

    Raises
    ------
    InputValueError
        A point that is not three finite coordinates.
    """
    return _motion(body.center, point)


def space_model(
    bodies: Sequence[RigidBody],
    mounts: Sequence[Mount],
    nodes: Sequence[FrameNode] = (),
    beams: Sequence[Beam] = (),
    attached: Mapping[str, str] | None = None,
    fixed: Sequence[str] = (),
    damping_ratio: float = 0.0,
) -> SpaceModel:
    """Assemble bodies, a frame and mounts into one model, refusing mechanisms.

    Parameters
    ----------
    bodies : sequence of RigidBody
        Unique names.
    mounts : sequence of Mount
        Each joining a body or node to another body or node, or to ground.
    nodes : sequence of FrameNode
        The frame's nodes (names distinct from the bodies').
    beams : sequence of Beam
        The frame's elements between nodes.
    attached : mapping of body to node, optional
        Bodies fixed rigidly to a node (a machine bolted to its skid's frame): the body's mass and inertia
        ride on the node's coordinates, exactly.
    fixed : sequence of str
        Frame nodes clamped to ground (all six coordinates held): column feet cast in, welded to an embedded
        plate. A very stiff mount would do the same but spoils the numerics; give anchors their real
        stiffness as mounts instead when they are not rigid.
    damping_ratio : float
        Modal damping on every mode [-], added to the mounts' dashpots (Clough & Penzien sec. 12-5).

    Returns
    -------
    SpaceModel
        The bodies, mounts and beams with the assembled matrix model and whose each coordinate is.

    Raises
    ------
    InputValueError
        No bodies or nodes, repeated names, a mount, beam or attachment naming something missing, a
        rigid-body mechanism (a motion nothing resists; the message says which body or node moves how).
    InputTypeError
        An item of the wrong type.
    """
    check_parts(bodies=(bodies, RigidBody), mounts=(mounts, Mount), nodes=(nodes, FrameNode), beams=(beams, Beam))
    attached = dict(attached or {})
    if not bodies and not nodes:
        raise InputValueError("bodies: got none; expected at least one rigid body or frame node")
    names = [b.name for b in bodies] + [n.name for n in nodes]
    if len(set(names)) != len(names):
        raise InputValueError(f"bodies/nodes: names {names} repeat; expected unique names")
    element_labels = [m.label for m in mounts] + [b.label for b in beams]
    repeated = sorted({x for x in element_labels if element_labels.count(x) > 1})
    if repeated:
        raise InputValueError(f"mounts/beams: label {repeated[0]!r} is used twice; expected a label of its own")
    node_at = {n.name: n for n in nodes}
    for body, node in attached.items():
        if body not in [b.name for b in bodies] or node not in node_at:
            raise InputValueError(f"attached: {body!r} -> {node!r}; expected a body and a frame node")
    owners = [b.name for b in bodies if b.name not in attached] + [n.name for n in nodes]
    origins = [b.center for b in bodies if b.name not in attached] + [n.point for n in nodes]
    n = 6 * len(owners)
    mass = np.zeros((n, n))
    stiffness = np.zeros((n, n))
    damping = np.zeros((n, n))
    for b in bodies:
        j = 6 * owners.index(attached.get(b.name, b.name))
        # A body on a node: its centre moves [[I, -[r]x], [0, I]] q_node with r = cg - node (a rigid link).
        link = np.eye(6)
        link[:3, 3:] = -_skew(b.center - origins[j // 6])
        mass[j : j + 6, j : j + 6] += link.T @ b.mass_matrix @ link
    for beam in beams:
        for end in (beam.node_a, beam.node_b):
            if end not in node_at:
                raise InputValueError(
                    f"beam {beam.label!r}: names {end!r}, which is not a node; expected one of {sorted(node_at)}"
                )
    ends = {e for beam in beams for e in (beam.node_a, beam.node_b)}
    for node in node_at:
        if node not in ends and node not in attached.values():
            raise InputValueError(
                f"node {node!r}: joined to no beam and carrying no body; expected every frame node at a beam's end"
            )
    for beam in beams:
        try:
            kb, mb = beam_matrices(beam, node_at[beam.node_a].point, node_at[beam.node_b].point)
        except InputValueError as error:
            raise InputValueError(f"beam {beam.label!r}: {str(error).removeprefix('beam: ')}") from None
        dofs = [*range(6 * owners.index(beam.node_a), 6 * owners.index(beam.node_a) + 6)]
        dofs += [*range(6 * owners.index(beam.node_b), 6 * owners.index(beam.node_b) + 6)]
        stiffness[np.ix_(dofs, dofs)] += kb
        mass[np.ix_(dofs, dofs)] += mb
    for m in mounts:
        # The relative motion at the mount point, translations and rotations, in the mount's axes.
        rows = np.zeros((6, n))
        for sign, name in ((1.0, m.body), (-1.0, m.other)):
            if name == GROUND:
                continue
            owner = attached.get(name, name)
            if owner not in owners:
                raise InputValueError(
                    f"mount {m.label!r}: names {name!r}, which is not a body; expected one of {sorted(names)}"
                )
            j = 6 * owners.index(owner)
            rows[:3, j : j + 6] += sign * _motion(origins[j // 6], m.point)
            rows[3:, j + 3 : j + 6] += sign * np.eye(3)
        local = np.zeros((6, 6))
        local[:3, :3], local[3:, 3:] = m.axes, m.axes
        transform = local @ rows
        k = np.diag(np.concatenate([m.stiffness, m.rotational_stiffness]))
        c = np.diag(np.concatenate([m.damping, m.rotational_damping]))
        stiffness += transform.T @ k @ transform
        damping += transform.T @ c @ transform
    for node in fixed:
        if node not in node_at:
            raise InputValueError(f"fixed: {node!r} is not a frame node; expected one of {sorted(node_at)}")
        if node in attached.values():
            raise InputValueError(f"fixed: node {node!r} carries an attached body; a held node cannot move it")
    keep = [6 * k + d for k, o in enumerate(owners) if o not in fixed for d in range(6)]
    mass, stiffness, damping = (a[np.ix_(keep, keep)] for a in (mass, stiffness, damping))
    origins = [p for o, p in zip(owners, origins, strict=True) if o not in fixed]
    owners = [o for o in owners if o not in fixed]
    if not owners:
        raise InputValueError("fixed: every node is held; nothing can move")
    labels = tuple(f"{o}.{d}" for o in owners for d in DIRECTIONS)
    zeta = as_si(damping_ratio, "damping_ratio", "ratio", "nonnegative")
    for matrix in (mass, stiffness, damping):
        _clear_roundoff(matrix)
    _refuse_mechanism(mass, stiffness, labels)
    if zeta > 0.0:
        damping = _clear_roundoff(damping + modal_damping(mass, stiffness, zeta))
    return SpaceModel(
        tuple(bodies),
        tuple(mounts),
        matrix_model(mass, stiffness, damping, labels),
        tuple(owners),
        tuple(origins),
        attached,
        tuple(beams),
    )


def _clear_roundoff(matrix: np.ndarray) -> np.ndarray:
    # Rotations into element and mount axes leave round-off where an entry is zero: clear it in place.
    matrix[np.abs(matrix) < 1e-13 * max(float(np.abs(matrix).max()), 1e-300)] = 0.0
    return matrix


def _refuse_mechanism(mass: np.ndarray, stiffness: np.ndarray, labels: tuple[str, ...]) -> None:
    # A motion with (numerically) no strain energy is a mechanism: name the coordinate that dominates it. The
    # stiffness is scaled by its own diagonal, so stiff anchors do not hide a free motion elsewhere.
    diagonal = np.diag(stiffness).copy()
    shape = None
    if np.any(diagonal <= 0.0):
        shape = (diagonal <= 0.0).astype(float)
    else:
        root = 1.0 / np.sqrt(diagonal)
        scaled = root[:, None] * stiffness * root[None, :]
        w2, v = np.linalg.eigh(0.5 * (scaled + scaled.T))
        if w2[0] < 1e-11:
            shape = root * v[:, 0]
    if shape is not None:
        weight = np.abs(shape) * np.sqrt(np.diag(mass))
        dominant = labels[int(np.argmax(weight if np.any(weight > 0.0) else np.abs(shape)))]
        body, direction = dominant.rsplit(".", 1)
        raise InputValueError(
            f"mounts: the model has a rigid-body mechanism: {body!r} moves freely ({MOTION_WORDS[direction]}); "
            "add a mount (or a mount stiffness) that resists it"
        )
