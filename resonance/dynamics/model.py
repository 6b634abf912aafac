"""Many-degree-of-freedom models: mass, stiffness and damping matrices.

A :class:`MatrixModel` holds validated, symmetric ``M``, ``K`` and ``C``
matrices in SI units with a label per degree of freedom. It is built from
matrices (:func:`matrix_model`) or from lumped masses joined by springs and
dashpots (:func:`lumped_model`, :func:`chain_model`), for example a machine on
a skid on a foundation on soil.

References
----------
S. S. Rao, *Mechanical Vibrations*, 6th ed., 2017, ch. 5-6.
"""

from __future__ import annotations

from collections.abc import Mapping, Sequence
from dataclasses import dataclass, field

import numpy as np

from ..core.errors import InputTypeError, InputValueError
from ..core.inputs import as_matrix, as_si, as_si_array

__all__ = ["GROUND", "MatrixModel", "Spring", "chain_model", "lumped_model", "matrix_model"]

GROUND = "ground"


#: The largest matrix model accepted: dense eigen-solves grow with the cube of the size.
MAX_DOF = 1000


@dataclass(frozen=True)
class MatrixModel:
    """Validated linear model ``M x'' + C x' + K x = f``.

    Attributes
    ----------
    mass : numpy.ndarray
        Mass matrix [kg], symmetric positive definite.
    stiffness : numpy.ndarray
        Stiffness matrix [N/m], symmetric positive semi-definite.
    damping : numpy.ndarray
        Viscous damping matrix [N s/m], symmetric positive semi-definite.
    labels : tuple of str
        One name per degree of freedom.
    """

    mass: np.ndarray
    stiffness: np.ndarray
    damping: np.ndarray
    labels: tuple[str, ...] = field(default=())

    @property
    def size(self) -> int:
        """Number of degrees of freedom."""
        return self.mass.shape[0]

    def dof(self, label_or_index: str | int) -> int:
        """Index of a degree of freedom given by label or index."""
        if isinstance(label_or_index, str):
            if label_or_index not in self.labels:
                raise InputValueError(f"dof: got {label_or_index!r}; expected one of {list(self.labels)}")
            return self.labels.index(label_or_index)
        return check_dof(label_or_index, self.size, "dof")


def check_dof(index: object, size: int, name: str) -> int:
    """Return ``index`` as an int if it is a valid degree of freedom index."""
    if isinstance(index, bool) or not isinstance(index, (int, np.integer)):
        raise InputValueError(f"{name}: got {index!r}; expected an integer index 0..{size - 1}")
    if not 0 <= int(index) < size:
        raise InputValueError(f"{name}: got {index}; expected an index 0..{size - 1}")
    return int(index)


def _semidefinite(matrix: np.ndarray, name: str) -> None:
    eig = np.linalg.eigvalsh(matrix)
    scale = max(float(np.abs(eig).max()), np.finfo(float).tiny)
    if eig[0] < -1e-10 * scale:
        raise InputValueError(
            f"{name}: has a negative eigenvalue ({eig[0]:.4g}); expected a positive "
            "semi-definite matrix (no negative stiffness or damping)"
        )


def matrix_model(
    mass_matrix: object,
    stiffness_matrix: object,
    damping_matrix: object | None = None,
    labels: Sequence[str] | None = None,
) -> MatrixModel:
    """Validate ``M``, ``K`` and ``C`` into a :class:`MatrixModel`.

    Parameters
    ----------
    mass_matrix : array_like or pint.Quantity
        [kg], n x n, symmetric positive definite.
    stiffness_matrix : array_like or pint.Quantity
        [N/m], n x n, symmetric positive semi-definite.
    damping_matrix : array_like or pint.Quantity, optional
        [N s/m], n x n, symmetric positive semi-definite; zero if omitted.
    labels : sequence of str, optional
        Names of the degrees of freedom; ``dof0, dof1, ...`` if omitted.

    Returns
    -------
    MatrixModel
        The validated model (damping zero when not given).

    Raises
    ------
    InputValueError
        A matrix that is not square, of the wrong size, non-finite, not
        symmetric, or not (semi-)definite; labels of the wrong number.
    """
    m = as_matrix(mass_matrix, "mass_matrix", "mass")
    n = m.shape[0]
    if n == 0:
        raise InputValueError("mass_matrix: got an empty matrix; expected at least 1 x 1")
    if n > MAX_DOF:
        raise InputValueError(
            f"mass_matrix: {n} degrees of freedom; this tool's dense solvers take up to {MAX_DOF} "
            "(the modes of a 1000-degree-of-freedom model with general damping took 3 s on two cores): reduce the model"
        )
    try:
        np.linalg.cholesky(m)
    except np.linalg.LinAlgError:
        raise InputValueError(
            "mass_matrix: is not positive definite; every degree of freedom needs a positive mass (or inertia)"
        ) from None
    k = as_matrix(stiffness_matrix, "stiffness_matrix", "stiffness", n)
    _semidefinite(k, "stiffness_matrix")
    if damping_matrix is None:
        c = np.zeros_like(m)
    else:
        c = as_matrix(damping_matrix, "damping_matrix", "damping", n)
        _semidefinite(c, "damping_matrix")
    names = tuple(labels) if labels is not None else tuple(f"dof{i}" for i in range(n))
    if len(names) != n or len(set(names)) != n:
        raise InputValueError(f"labels: got {list(names)}; expected {n} distinct names")
    return MatrixModel(m, k, c, names)


@dataclass(frozen=True)
class Spring:
    """A spring with a parallel dashpot between two masses (or a mass and ground).

    Attributes
    ----------
    node_a, node_b : str
        Names of the joined masses; ``"ground"`` for a fixed point.
    stiffness : float or pint.Quantity
        [N/m] (>= 0).
    damping : float or pint.Quantity
        Viscous coefficient [N s/m] (>= 0).
    """

    node_a: str
    node_b: str
    stiffness: object
    damping: object = 0.0

    def __post_init__(self) -> None:
        # Quantities become floats in the package convention here; the names are the parameter's.
        object.__setattr__(self, "stiffness", as_si(self.stiffness, "stiffness", "stiffness", "nonnegative"))
        object.__setattr__(self, "damping", as_si(self.damping, "damping", "damping", "nonnegative"))
        for name in ("node_a", "node_b"):
            if not isinstance(getattr(self, name), str):
                raise InputTypeError(f"{name}: got {getattr(self, name)!r}; expected the name of a mass or 'ground'")


def lumped_model(masses: Mapping[str, object], springs: Sequence[Spring]) -> MatrixModel:
    """Build a model from named lumped masses joined by springs and dashpots.

    Each mass has one translational degree of freedom. Dashpots are discrete,
    so the damping is in general non-proportional.

    Parameters
    ----------
    masses : mapping of str to float or pint.Quantity
        Mass of each node [kg] (> 0), in degree-of-freedom order.
    springs : sequence of Spring
        Connections; a node name of ``"ground"`` is a fixed point.

    Returns
    -------
    MatrixModel

    Raises
    ------
    InputValueError, InputTypeError
        No masses, a mass named ground, a spring naming an unknown mass or joining a mass to itself, bad values,
        too many degrees of freedom.

    Examples
    --------
    A pump (1200 kg) on a skid (800 kg) on isolators and anchors:

    >>> model = lumped_model(
    ...     {"pump": 1200.0, "skid": 800.0},
    ...     [Spring("pump", "skid", 5.0e7), Spring("skid", "ground", 2.0e8)],
    ... )
    >>> model.stiffness.tolist()
    [[50000000.0, -50000000.0], [-50000000.0, 250000000.0]]
    """
    names = list(masses)
    if not names:
        raise InputValueError("masses: got none; expected at least one mass")
    if GROUND in names:
        raise InputValueError(f"masses: {GROUND!r} is reserved for the fixed point; rename that mass")
    index = {name: i for i, name in enumerate(names)}
    n = len(names)
    m = np.diag([as_si(masses[name], f"masses[{name!r}]", "mass", "positive") for name in names])
    k = np.zeros((n, n))
    c = np.zeros((n, n))
    for number, spring in enumerate(springs):
        where = f"springs[{number}]"
        ends = []
        for end in (spring.node_a, spring.node_b):
            if end != GROUND and end not in index:
                raise InputValueError(
                    f"{where}: joins {end!r}, which is not a mass; expected one of {[*names, GROUND]}"
                )
            ends.append(index.get(end))
        if (ends[0] is None and ends[1] is None) or ends[0] == ends[1]:
            raise InputValueError(
                f"{where}: joins {spring.node_a!r} to {spring.node_b!r}; expected two different points"
            )
        ks = as_si(spring.stiffness, f"{where}.stiffness", "stiffness", "nonnegative")
        cs = as_si(spring.damping, f"{where}.damping", "damping", "nonnegative")
        for matrix, value in ((k, ks), (c, cs)):
            for i in ends:
                if i is not None:
                    matrix[i, i] += value
            if None not in ends:
                i, j = ends
                matrix[i, j] -= value
                matrix[j, i] -= value
    return matrix_model(m, k, c, names)


def chain_model(
    masses: Sequence[object],
    stiffnesses: Sequence[object],
    dampings: Sequence[object] | None = None,
) -> MatrixModel:
    """A grounded chain: spring ``i`` joins mass ``i - 1`` (ground for ``i = 0``) to mass ``i``.

    Parameters
    ----------
    masses : sequence of float or pint.Quantity
        [kg], n values.
    stiffnesses : sequence of float or pint.Quantity
        [N/m], n values (the first to ground).
    dampings : sequence of float or pint.Quantity, optional
        [N s/m], n values; undamped if omitted.

    Returns
    -------
    MatrixModel
        The chain, masses named ``m0`` .. ``m(n-1)``.

    Raises
    ------
    InputValueError, InputTypeError
        Lists of different lengths, bad values, too many masses.
    """
    m = as_si_array(masses, "masses", "mass", "positive")
    k = as_si_array(stiffnesses, "stiffnesses", "stiffness", "nonnegative")
    c = as_si_array(dampings, "dampings", "damping", "nonnegative") if dampings is not None else np.zeros(k.size)
    n = m.size
    if k.size != n or c.size != n:
        raise InputValueError(
            f"stiffnesses/dampings: got {k.size} and "
            f"{'none' if dampings is None else c.size} values; expected {n}, one per mass"
        )
    names = [f"m{i}" for i in range(n)]
    springs = [Spring(GROUND if i == 0 else names[i - 1], names[i], float(k[i]), float(c[i])) for i in range(n)]
    return lumped_model(dict(zip(names, m.tolist(), strict=True)), springs)
