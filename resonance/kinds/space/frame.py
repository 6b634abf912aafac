"""Three-dimensional beam elements for steel frames (skids, tables): stiffness and consistent mass.

A two-node Euler-Bernoulli beam with six coordinates per node (three translations, three small rotations),
axial, torsional and bending stiffness in both principal planes from the section properties the user gives
(area, the two second moments about the element's local axes, the torsion constant), and the consistent
mass matrix. Local x runs from the first node to the second; local y is ``up x x`` normalized and local z is
``x x y`` (so local z lies in the plane of the element and ``up``); ``up`` defaults to global z (global y for
a vertical element).

References
----------
.. [1] J. S. Przemieniecki, *Theory of Matrix Structural Analysis*, McGraw-Hill, 1968 (Dover 1985), ch. 5
   and 11 (the 12 x 12 stiffness and consistent mass) (from memory).
.. [2] R. D. Blevins, *Formulas for Natural Frequency and Mode Shape*, 1979, table 8-1 (the beam
   frequencies the tests use).
"""

from __future__ import annotations

from dataclasses import dataclass, field

import numpy as np

from ...core.errors import InputValueError
from ...core.inputs import as_si, as_si_array

__all__ = ["Beam", "beam_matrices", "beam_rotation"]


@dataclass(frozen=True)
class Beam:
    """A prismatic beam element between two frame nodes.

    Attributes
    ----------
    label : str
        Name in tables.
    node_a, node_b : str
        The nodes it joins.
    youngs_modulus, shear_modulus : float
        ``E``, ``G`` [Pa] (> 0).
    density : float
        [kg/m^3] (> 0).
    area : float
        Cross-section area [m^2] (> 0).
    iy, iz : float
        Second moments of area about local y and z [m^4] (> 0).
    torsion_constant : float
        ``J`` [m^4] (> 0); St Venant's, not the polar moment for an open section.
    up : numpy.ndarray
        A direction not along the element that fixes its local axes (see the module notes); None: global z
        (global y for a vertical element).
    """

    label: str
    node_a: str
    node_b: str
    youngs_modulus: float
    shear_modulus: float
    density: float
    area: float
    iy: float
    iz: float
    torsion_constant: float
    up: np.ndarray | None = field(default=None)

    def __post_init__(self) -> None:
        where = f"beam {self.label!r}"
        for name, kind in (
            ("youngs_modulus", "pressure"),
            ("shear_modulus", "pressure"),
            ("density", "density"),
            ("area", "area"),
            ("iy", "second_moment"),
            ("iz", "second_moment"),
            ("torsion_constant", "second_moment"),
        ):
            object.__setattr__(self, name, as_si(getattr(self, name), f"{where}: {name}", kind, "positive"))  # type: ignore[arg-type]
        if self.up is not None:
            up = as_si_array(self.up, f"{where}: up", "ratio")
            if up.shape != (3,) or not np.any(up != 0.0):
                raise InputValueError(f"{where}: up: expected a non-zero direction (three components)")
            object.__setattr__(self, "up", up / np.max(np.abs(up)))  # a direction: scaled, so it cannot overflow
        if self.node_a == self.node_b:
            raise InputValueError(f"{where}: joins node {self.node_a!r} to itself")


def beam_rotation(start: np.ndarray, end: np.ndarray, up: np.ndarray | None = None) -> tuple[np.ndarray, float]:
    """The element's local axes (rows, global coordinates) and its length.

    Parameters
    ----------
    start, end : numpy.ndarray
        The nodes' positions [m].
    up : numpy.ndarray, optional
        See :class:`Beam`.

    Returns
    -------
    rotation : numpy.ndarray
        3 x 3, rows local x, y, z.
    length : float
        [m].

    Raises
    ------
    InputValueError
        Coincident nodes, or ``up`` along the element.
    """
    axis = np.asarray(end, dtype=float) - np.asarray(start, dtype=float)
    length = float(np.linalg.norm(axis))
    if not length > 0.0:
        raise InputValueError("beam: its two nodes are at the same point")
    x = axis / length
    if up is None:
        up = np.array([0.0, 0.0, 1.0]) if abs(x[2]) < 0.999 else np.array([0.0, 1.0, 0.0])
    y = np.cross(np.asarray(up, dtype=float), x)
    if not np.linalg.norm(y) > 1e-9 * np.linalg.norm(up):
        raise InputValueError("beam: up lies along the element; give another direction")
    y /= np.linalg.norm(y)
    return np.vstack([x, y, np.cross(x, y)]), length


def beam_matrices(beam: Beam, start: np.ndarray, end: np.ndarray) -> tuple[np.ndarray, np.ndarray]:
    """Stiffness and consistent mass of a beam element in global axes (12 x 12).

    Parameters
    ----------
    beam : Beam
        The element.
    start, end : numpy.ndarray
        Its nodes' positions [m].

    Returns
    -------
    stiffness : numpy.ndarray
        [N/m, N/rad, N m/rad] in the order ``[u, v, w, rx, ry, rz]`` of each node.
    mass : numpy.ndarray
        [kg, kg m, kg m^2].

    Raises
    ------
    InputValueError
        Coincident nodes, or ``up`` along the element.
    """
    rotation, length = beam_rotation(start, end, beam.up)
    e, g, rho, a = beam.youngs_modulus, beam.shear_modulus, beam.density, beam.area
    iy, iz, j, el = beam.iy, beam.iz, beam.torsion_constant, length
    k = np.zeros((12, 12))
    m = np.zeros((12, 12))

    def put(target: np.ndarray, dofs: tuple[int, ...], block: np.ndarray) -> None:
        target[np.ix_(dofs, dofs)] += block

    pair = np.array([[1.0, -1.0], [-1.0, 1.0]])
    lumped = np.array([[2.0, 1.0], [1.0, 2.0]]) / 6.0
    put(k, (0, 6), e * a / el * pair)
    put(k, (3, 9), g * j / el * pair)
    put(m, (0, 6), rho * a * el * lumped)
    put(m, (3, 9), rho * (iy + iz) * el * lumped)
    # Bending in the local x-y plane (v, rz) and the x-z plane (w, ry): the signs of the rotation terms differ.
    for dofs, second, s in (((1, 5, 7, 11), iz, 1.0), ((2, 4, 8, 10), iy, -1.0)):
        kb = np.array(
            [
                [12.0, s * 6 * el, -12.0, s * 6 * el],
                [s * 6 * el, 4 * el**2, -s * 6 * el, 2 * el**2],
                [-12.0, -s * 6 * el, 12.0, -s * 6 * el],
                [s * 6 * el, 2 * el**2, -s * 6 * el, 4 * el**2],
            ]
        )
        mb = np.array(
            [
                [156.0, s * 22 * el, 54.0, -s * 13 * el],
                [s * 22 * el, 4 * el**2, s * 13 * el, -3 * el**2],
                [54.0, s * 13 * el, 156.0, -s * 22 * el],
                [-s * 13 * el, -3 * el**2, -s * 22 * el, 4 * el**2],
            ]
        )
        put(k, dofs, e * second / el**3 * kb)
        put(m, dofs, rho * a * el / 420.0 * mb)
    t = np.kron(np.eye(4), rotation)
    return t.T @ k @ t, t.T @ m @ t
