"""A rotor-bearing system: shaft sections, rigid discs, bearings and pedestals.

Lateral motion in two planes. Degrees of freedom: at every node a
translation and a slope in the x-z plane, then the same in the y-z plane,
then two translations per pedestal. The equation of motion at spin speed
``W`` [rad/s] is ``M q'' + (C(N) + W G) q' + K(N) q = f``, with bearing
coefficients that may depend on the speed ``N`` [rpm] (tables, interpolated).

Stations are the ends of the shaft sections, numbered 0 to ``len(sections)``;
discs and bearings sit at stations. Sections may be split into several
elements; the stations stay where they are.

References
----------
H. D. Nelson and J. M. McVaugh, J. Eng. Ind. 98(2), 1976; H. D. Nelson,
J. Mech. Des. 102(4), 1980; M. I. Friswell, J. E. T. Penny, S. D. Garvey and
A. W. Lees, *Dynamics of Rotating Machines*, Cambridge, 2010, ch. 5.
"""

from __future__ import annotations

import math
from collections.abc import Sequence
from dataclasses import dataclass, field

import numpy as np

from ...core.errors import InputTypeError, InputValueError
from ...core.inputs import Sign, as_si, as_si_array, check_parts
from ...core.units import QuantityKind
from .elements import beam_rotary_mass, beam_stiffness, beam_translational_mass, shear_coefficient

__all__ = ["Material", "STEEL", "ShaftSection", "Disc", "Bearing", "Pedestal", "Rotor", "rotor_model"]


#: The largest rotor accepted by :func:`rotor_model` (scenarios allow fewer: see ``rotor.scenario.MAX_ELEMENTS``).
MAX_ROTOR_ELEMENTS = 200


def _convert(obj: object, name: str, kind: QuantityKind, sign: Sign = "any", label: str = "") -> None:
    """Convert a frozen dataclass field through the input layer, in place (errors name the field)."""
    where = f"{label}: {name}" if label else name
    object.__setattr__(obj, name, as_si(getattr(obj, name), where, kind, sign))


@dataclass(frozen=True)
class Material:
    """Density [kg/m^3], Young's modulus [Pa] and Poisson's ratio [-] (shear modulus from them).

    Attributes
    ----------
    density : float
        [kg/m^3].
    youngs_modulus : float
        [Pa].
    poisson_ratio : float
        [-], in (-1, 0.5).
    name : str
        Shown in records.
    """

    density: float
    youngs_modulus: float
    poisson_ratio: float
    name: str = "material"

    def __post_init__(self) -> None:
        _convert(self, "density", "density", "positive")
        _convert(self, "youngs_modulus", "pressure", "positive")
        _convert(self, "poisson_ratio", "ratio")
        if not -1.0 < self.poisson_ratio < 0.5:
            raise InputValueError(f"poisson_ratio: got {self.poisson_ratio:g}; expected a value in (-1, 0.5)")

    @property
    def shear_modulus(self) -> float:
        """``G = E / (2 (1 + nu))`` [Pa]."""
        return self.youngs_modulus / (2.0 * (1.0 + self.poisson_ratio))


# Carbon steel, common handbook values.
STEEL = Material(7850.0, 2.05e11, 0.29, "steel")


@dataclass(frozen=True)
class ShaftSection:
    """A uniform shaft section: length and diameters [m], material, elements to split it into.

    Attributes
    ----------
    length : float
        [m].
    outer_diameter, inner_diameter : float
        [m] (inner 0 for a solid shaft).
    material : Material
        Steel unless given.
    elements : int
        Finite elements the section is split into.
    """

    length: float
    outer_diameter: float
    inner_diameter: float = 0.0
    material: Material = STEEL
    elements: int = 1

    def __post_init__(self) -> None:
        _convert(self, "length", "length", "positive")
        _convert(self, "outer_diameter", "length", "positive")
        _convert(self, "inner_diameter", "length", "nonnegative")
        if not isinstance(self.material, Material):
            raise InputTypeError(f"material: got {type(self.material).__name__}; expected a Material")


@dataclass(frozen=True)
class Disc:
    """A rigid disc at a station: mass [kg], polar and diametral inertia [kg m^2].

    Attributes
    ----------
    station : int
        Where it sits.
    mass : float
        [kg].
    polar_inertia, diametral_inertia : float
        [kg m^2].
    label : str
        Shown in records.
    """

    station: int
    mass: float
    polar_inertia: float
    diametral_inertia: float
    label: str = "disc"

    def __post_init__(self) -> None:
        _station(self.station, f"disc {self.label!r}")
        _convert(self, "mass", "mass", "positive")
        _convert(self, "polar_inertia", "inertia", "nonnegative")
        _convert(self, "diametral_inertia", "inertia", "nonnegative")


@dataclass(frozen=True)
class Pedestal:
    """A support mass [kg] between a bearing and the ground, with stiffness [N/m] and damping [N s/m].

    Attributes
    ----------
    mass : float
        [kg].
    kxx, kyy : float
        Stiffness to ground [N/m].
    cxx, cyy : float
        Damping to ground [N s/m].
    """

    mass: float
    kxx: float
    kyy: float
    cxx: float = 0.0
    cyy: float = 0.0

    def __post_init__(self) -> None:
        _convert(self, "mass", "mass", "positive")
        for name in ("kxx", "kyy"):
            _convert(self, name, "stiffness", "nonnegative")
        for name in ("cxx", "cyy"):
            _convert(self, name, "damping", "nonnegative")


@dataclass(frozen=True)
class Bearing:
    """A bearing at a station: direct and cross-coupled stiffness [N/m] and damping [N s/m].

    Each coefficient is a number, or a sequence of values at ``speeds`` [rpm]
    (linear interpolation; a speed outside the table is an error).
    ``tilt_stiffness`` [N m/rad] resists the slope in both planes (a clamped
    end, or a long bearing or pair of bearings treated as one).

    Attributes
    ----------
    station : int
        Where it sits.
    kxx, kyy, kxy, kyx : float or sequence of float
        Stiffness coefficients [N/m] (one per table speed when ``speeds`` is given).
    cxx, cyy, cxy, cyx : float or sequence of float
        Damping coefficients [N s/m].
    speeds : sequence of float or None
        Table speeds [rpm].
    pedestal : Pedestal or None
        A support mass between the bearing and the ground.
    label : str
        Shown in records and errors.
    tilt_stiffness : float
        [N m/rad].
    """

    station: int
    kxx: float | Sequence[float]
    kyy: float | Sequence[float]
    kxy: float | Sequence[float] = 0.0
    kyx: float | Sequence[float] = 0.0
    cxx: float | Sequence[float] = 0.0
    cyy: float | Sequence[float] = 0.0
    cxy: float | Sequence[float] = 0.0
    cyx: float | Sequence[float] = 0.0
    speeds: Sequence[float] | None = None
    pedestal: Pedestal | None = None
    label: str = "bearing"
    tilt_stiffness: float = 0.0

    def __post_init__(self) -> None:
        _station(self.station, f"bearing {self.label!r}")
        # Quantities (SI or US) become floats in the package convention here, so no later step strips a unit.
        for name in ("kxx", "kyy", "kxy", "kyx", "cxx", "cyy", "cxy", "cyx"):
            kind: QuantityKind = "stiffness" if name[0] == "k" else "damping"
            value = getattr(self, name)
            if isinstance(value, (list, tuple, np.ndarray)) or (
                hasattr(value, "magnitude") and np.ndim(value.magnitude) > 0
            ):
                object.__setattr__(self, name, tuple(as_si_array(value, f"{self.label}: {name}", kind).tolist()))
            else:
                _convert(self, name, kind, label=self.label)
        if self.speeds is not None:
            speeds = as_si_array(self.speeds, f"{self.label}: speeds", "speed", "nonnegative")
            object.__setattr__(self, "speeds", tuple(speeds.tolist()))
        _convert(self, "tilt_stiffness", "moment_stiffness", "nonnegative", label=self.label)
        # The coefficient table as one array, so a lookup is a single interpolation (sweeps call it often).
        names = ("kxx", "kxy", "kyx", "kyy", "cxx", "cxy", "cyx", "cyy")
        width = 1 if self.speeds is None else len(self.speeds)
        try:
            table = np.array([np.broadcast_to(np.asarray(getattr(self, n), dtype=float), (width,)) for n in names])
        except ValueError:
            table = None  # lengths that do not match the speeds: rotor_model names the field
        object.__setattr__(self, "_table", table)

    def coefficients(self, speed: float) -> tuple[np.ndarray, np.ndarray]:
        """Stiffness and damping matrices ``[[xx, xy], [yx, yy]]`` at a speed [rpm] (linear between table speeds)."""
        table: np.ndarray = self._table  # type: ignore[attr-defined]
        if self.speeds is None:
            values = table[:, 0]
        else:
            grid = np.asarray(self.speeds)
            if not grid[0] <= speed <= grid[-1]:
                raise InputValueError(
                    f"{self.label}: speed {speed:g} rpm is outside its coefficient table "
                    f"({grid[0]:g}-{grid[-1]:g} rpm); extend the table to cover the sweep"
                )
            i = min(int(np.searchsorted(grid, speed, side="right")) - 1, grid.size - 2)
            t = (speed - grid[i]) / (grid[i + 1] - grid[i])
            values = table[:, i] + t * (table[:, i + 1] - table[:, i])
        return values[:4].reshape(2, 2).copy(), values[4:].reshape(2, 2).copy()


@dataclass(frozen=True)
class Rotor:
    """An assembled rotor (build with :func:`rotor_model`).

    Attributes
    ----------
    node_z : numpy.ndarray
        Axial position of every node [m].
    station_nodes : tuple of int
        The node of each station.
    mass, shaft_stiffness, gyroscopic : numpy.ndarray
        Mass [kg...], shaft stiffness [N/m...] and gyroscopic matrix per rad/s of spin [kg m^2...]
        over all degrees of freedom (bearings not included).
    bearings, discs : tuple
        The supports and discs.
    """

    node_z: np.ndarray
    station_nodes: tuple[int, ...]
    mass: np.ndarray
    shaft_stiffness: np.ndarray
    gyroscopic: np.ndarray
    bearings: tuple[Bearing, ...]
    discs: tuple[Disc, ...]
    polar_mass: np.ndarray = field(repr=False)

    @property
    def nodes(self) -> int:
        """Number of shaft nodes."""
        return int(self.node_z.size)

    @property
    def size(self) -> int:
        """Number of degrees of freedom."""
        return int(self.mass.shape[0])

    def dof(self, node: int, direction: str) -> int:
        """Index of the ``"x"``/``"y"`` translation or ``"sx"``/``"sy"`` slope of a node."""
        offset = {"x": 0, "sx": 1, "y": 2 * self.nodes, "sy": 2 * self.nodes + 1}[direction]
        return offset + 2 * node

    def station_dof(self, station: int, direction: str) -> int:
        """Index of a translation or slope at a station."""
        if not 0 <= station < len(self.station_nodes):
            raise InputValueError(f"station: got {station}; expected 0..{len(self.station_nodes) - 1}")
        return self.dof(self.station_nodes[station], direction)

    def bearing_blocks(self, speed: float) -> list[tuple[list[int], np.ndarray, np.ndarray]]:
        """The supports at a speed [rpm] as (degrees of freedom, stiffness block, damping block)."""
        blocks = []
        pedestal = 4 * self.nodes
        for bearing in self.bearings:
            kb, cb = bearing.coefficients(speed)
            tilt = [self.station_dof(bearing.station, "sx"), self.station_dof(bearing.station, "sy")]
            if bearing.tilt_stiffness:
                blocks.append((tilt, bearing.tilt_stiffness * np.eye(2), np.zeros((2, 2))))
            shaft = [self.station_dof(bearing.station, "x"), self.station_dof(bearing.station, "y")]
            if bearing.pedestal is None:
                blocks.append((shaft, kb, cb))
                continue
            p = bearing.pedestal
            coupling = np.array([[1.0, -1.0], [-1.0, 1.0]])
            blocks.append(
                (
                    [*shaft, pedestal, pedestal + 1],
                    np.kron(coupling, kb) + np.diag([0.0, 0.0, p.kxx, p.kyy]),
                    np.kron(coupling, cb) + np.diag([0.0, 0.0, p.cxx, p.cyy]),
                )
            )
            pedestal += 2
        return blocks

    def bearing_matrices(self, speed: float) -> tuple[np.ndarray, np.ndarray]:
        """Bearing and pedestal stiffness and damping over all degrees of freedom at a speed [rpm]."""
        k = np.zeros_like(self.mass)
        c = np.zeros_like(self.mass)
        for dofs, kb, cb in self.bearing_blocks(speed):
            k[np.ix_(dofs, dofs)] += kb
            c[np.ix_(dofs, dofs)] += cb
        return k, c


def _positive(value: float, name: str, kind: QuantityKind) -> float:
    return as_si(value, name, kind, "positive")


def _station(station: object, where: str) -> None:
    # A station is a whole number (not text, not 1.5): an index into the shaft's stations.
    if isinstance(station, bool) or not isinstance(station, (int, np.integer)):
        raise InputTypeError(f"{where}: station: got {station!r}; expected a whole number (0 at the left end)")


def rotor_model(sections: Sequence[ShaftSection], discs: Sequence[Disc], bearings: Sequence[Bearing]) -> Rotor:
    """Assemble a rotor from shaft sections, discs and bearings.

    Parameters
    ----------
    sections : sequence of ShaftSection
        Shaft sections, station 0 at the left end.
    discs : sequence of Disc
        Rigid discs at stations.
    bearings : sequence of Bearing
        Bearings (and pedestals) at stations.

    Returns
    -------
    Rotor

    Raises
    ------
    InputValueError
        A non-positive length or diameter, an inner diameter not less than the
        outer, a disc or bearing at a station that does not exist, a rotor
        with no bearing (free-floating), a coefficient table that does not
        match its speeds, or a negative direct stiffness.
    """
    check_parts(sections=(sections, ShaftSection), discs=(discs, Disc), bearings=(bearings, Bearing))
    if not sections:
        raise InputValueError("sections: got none; expected at least one shaft section")
    lengths: list[float] = []
    nodes_per_station = [0]
    for i, s in enumerate(sections):
        where = f"sections[{i}]"
        length = _positive(s.length, f"{where}.length", "length")
        do = _positive(s.outer_diameter, f"{where}.outer_diameter", "length")
        di = as_si(s.inner_diameter, f"{where}.inner_diameter", "length", "nonnegative")
        if di >= do:
            raise InputValueError(f"{where}.inner_diameter: got {di:g} m, not less than the outer diameter {do:g} m")
        if isinstance(s.elements, bool) or not isinstance(s.elements, int) or s.elements < 1:
            raise InputValueError(f"{where}.elements: got {s.elements!r}; expected a whole number >= 1")
        if len(lengths) + s.elements > MAX_ROTOR_ELEMENTS:  # before the list is built: a typo may ask for 1e12
            raise InputValueError(
                f"sections: {sum(x.elements for x in sections)} shaft elements in all; this tool's rotor analyses "
                f"take up to {MAX_ROTOR_ELEMENTS} (a whole study of 200 took 12 s on two cores): use fewer elements"
            )
        lengths += [length / s.elements] * s.elements
        nodes_per_station.append(nodes_per_station[-1] + s.elements)
    n_nodes = len(lengths) + 1
    n_ped = sum(1 for b in bearings if b.pedestal is not None)
    size = 4 * n_nodes + 2 * n_ped
    plane_m = np.zeros((2 * n_nodes, 2 * n_nodes))
    plane_k = np.zeros_like(plane_m)
    plane_rot = np.zeros_like(plane_m)  # rotary inertia, whose double is the shaft's polar inertia
    element = 0
    for s in sections:
        do, di, mat = s.outer_diameter, s.inner_diameter, s.material
        area = math.pi * (do**2 - di**2) / 4.0
        inertia = math.pi * (do**4 - di**4) / 64.0
        kappa = shear_coefficient(do, di, mat.poisson_ratio)
        for _ in range(s.elements):
            length = lengths[element]
            phi = 12.0 * mat.youngs_modulus * inertia / (kappa * mat.shear_modulus * area * length**2)
            block = slice(2 * element, 2 * element + 4)
            plane_k[block, block] += beam_stiffness(mat.youngs_modulus * inertia, length, phi)
            plane_m[block, block] += beam_translational_mass(mat.density * area, length, phi)
            plane_rot[block, block] += beam_rotary_mass(mat.density * inertia, length, phi)
            element += 1
    stations = len(sections) + 1
    plane_polar = 2.0 * plane_rot
    plane_m = plane_m + plane_rot
    for i, disc in enumerate(discs):
        if not 0 <= disc.station < stations:
            raise InputValueError(
                f"discs[{i}] ({disc.label}): station {disc.station} does not exist; expected 0..{stations - 1}"
            )
        node = nodes_per_station[disc.station]
        plane_m[2 * node, 2 * node] += _positive(disc.mass, f"discs[{i}].mass", "mass")
        plane_m[2 * node + 1, 2 * node + 1] += as_si(
            disc.diametral_inertia, f"discs[{i}].diametral_inertia", "inertia", "nonnegative"
        )
        plane_polar[2 * node + 1, 2 * node + 1] += as_si(
            disc.polar_inertia, f"discs[{i}].polar_inertia", "inertia", "nonnegative"
        )
    if not bearings:
        raise InputValueError("bearings: got none; a free-floating rotor has no critical speeds; add its bearings")
    for i, b in enumerate(bearings):
        if not 0 <= b.station < stations:
            raise InputValueError(
                f"bearings[{i}] ({b.label}): station {b.station} does not exist; expected 0..{stations - 1}"
            )
        if b.speeds is not None:
            table = np.asarray(b.speeds, dtype=float)
            if table.ndim != 1 or table.size < 2 or np.any(np.diff(table) <= 0):
                raise InputValueError(f"bearings[{i}].speeds: expected at least 2 increasing speeds [rpm]")
            for name in ("kxx", "kyy", "kxy", "kyx", "cxx", "cyy", "cxy", "cyx"):
                values = np.atleast_1d(np.asarray(getattr(b, name), dtype=float))
                if values.size not in (1, table.size):
                    raise InputValueError(
                        f"bearings[{i}].{name}: got {values.size} values for {table.size} speeds; "
                        "expected one per speed"
                    )
        for name in ("kxx", "kyy"):
            values = np.atleast_1d(np.asarray(getattr(b, name), dtype=float))
            if np.any(~np.isfinite(values)) or np.any(values < 0.0):
                raise InputValueError(f"bearings[{i}].{name}: expected finite values >= 0 N/m")
    mass = np.zeros((size, size))
    stiffness = np.zeros_like(mass)
    gyro = np.zeros_like(mass)
    px, py = slice(0, 2 * n_nodes), slice(2 * n_nodes, 4 * n_nodes)
    for plane in (px, py):
        mass[plane, plane] = plane_m
        stiffness[plane, plane] = plane_k
    # Spin W about +z (x towards y): I_d s_x'' + W I_p s_y' = Q_sx and I_d s_y'' - W I_p s_x' = Q_sy,
    # so M q'' + W G q' with G = [[0, P], [-P, 0]] between the planes (P: polar inertia at the slopes).
    gyro[px, py] = plane_polar
    gyro[py, px] = -plane_polar
    offset = 4 * n_nodes
    for i, b in enumerate(bearings):
        if b.pedestal is not None:
            m = _positive(b.pedestal.mass, f"bearings[{i}].pedestal.mass", "mass")
            mass[offset, offset] = mass[offset + 1, offset + 1] = m
            offset += 2
    return Rotor(
        np.concatenate([[0.0], np.cumsum(lengths)]),
        tuple(nodes_per_station),
        mass,
        stiffness,
        gyro,
        tuple(bearings),
        tuple(discs),
        plane_polar,
    )
