"""Whirl modes of a rotor: at one speed and over a speed sweep (Campbell data).

* :func:`rotor_modes`: damped complex modes at one speed, with the whirl
  direction (forward: the orbit turns with the spin) and the log decrement.
* :func:`campbell`: modes over a speed sweep, each branch tracked by the
  similarity of its shape (MAC) so that branches keep their identity where
  they cross.

Critical speeds and the critical speed map are in :mod:`resonance.kinds.rotor.criticals`, the unbalance
response in :mod:`resonance.kinds.rotor.response`; both use the basis and solver here.

Sweeps use a Ritz basis (the lowest undamped modes of the non-rotating rotor
on its bearings plus the static shapes of unit loads at every bearing), which
keeps a 100-speed sweep of a 40-element rotor well under a second; the full
model is used for single evaluations on request and in the tests.

References
----------
.. [1] M. I. Friswell, J. E. T. Penny, S. D. Garvey and A. W. Lees,
   *Dynamics of Rotating Machines*, Cambridge, 2010, ch. 3-6.
.. [2] API RP 684, 2nd ed., 2005 (log decrement, critical speed maps, unbalance
   response; from memory).
"""

from __future__ import annotations

import math
from collections.abc import Sequence
from dataclasses import dataclass
from typing import Literal

import numpy as np
import scipy.linalg
import scipy.optimize

from ...core.errors import InputTypeError, InputValueError
from ...core.executors import progress_bar
from ...core.inputs import as_si, as_si_array
from ...core.threads import blas_threads_for
from ...dynamics.damping import log_decrement
from ...dynamics.modes import Mode
from .model import Rotor

__all__ = [
    "RotorModes",
    "rotor_modes",
    "deflected_shape",
    "CampbellData",
    "campbell",
]


Whirl = Literal["forward", "backward"]


TWO_PI = 2.0 * math.pi


def spin_rate(speed: float) -> float:
    """Spin speed [rpm] as an angular rate [rad/s]."""
    return TWO_PI * speed / 60.0


@dataclass(frozen=True)
class RitzBasis:
    """A mass-orthonormal Ritz basis of a rotor at one speed, with the shaft and gyroscopic matrices projected once."""

    vectors: np.ndarray  # n x r, mass-orthonormal
    shaft_stiffness: np.ndarray  # projected once: T^T K_shaft T
    gyroscopic: np.ndarray  # T^T G T

    def project_supports(self, rotor: Rotor, speed: float) -> tuple[np.ndarray, np.ndarray]:
        """Projected bearing stiffness and damping; only the rows at the bearings are touched."""
        r = self.vectors.shape[1]
        k, c = np.zeros((r, r)), np.zeros((r, r))
        for dofs, kb, cb in rotor.bearing_blocks(speed):
            t = self.vectors[dofs]
            k += t.T @ kb @ t
            c += t.T @ cb @ t
        return k, c


def ritz_basis(rotor: Rotor, speed: float, count: int, loads: np.ndarray | None = None) -> RitzBasis:
    """The Ritz basis for ``count`` modes at ``speed`` [rpm]: low undamped modes and static shapes of the loads."""
    # Small dense algebra: one BLAS thread (two threads on these sizes cost ten times more on a busy machine).
    with blas_threads_for(rotor.size):
        return _build_ritz_basis(rotor, speed, count, loads)


def _build_ritz_basis(rotor: Rotor, speed: float, count: int, loads: np.ndarray | None) -> RitzBasis:
    k_bearing, _ = rotor.bearing_matrices(speed)
    k = rotor.shaft_stiffness + 0.5 * (k_bearing + k_bearing.T)
    m = rotor.mass
    extra = loads
    modes = min(rotor.size, max(count + 16, 16))
    _, low = scipy.linalg.eigh(k, m, subset_by_index=[0, modes - 1])
    # Static shapes of unit loads at the bearings make the basis follow bearing changes.
    shift = k + (TWO_PI * 1.0) ** 2 * m  # a small shift keeps a zero-stiffness bearing solvable
    loads = np.zeros((rotor.size, 0))
    for bearing in rotor.bearings:
        for direction in ("x", "y"):
            e = np.zeros((rotor.size, 1))
            e[rotor.station_dof(bearing.station, direction)] = 1.0
            loads = np.hstack([loads, e])
    if extra is not None:
        loads = np.hstack([loads, extra])  # static shapes of the applied loads (a static correction)
    static = scipy.linalg.solve(shift, loads, assume_a="sym")
    vectors = np.hstack([low, static])
    # Mass-orthonormalize (and drop dependent vectors).
    mr = vectors.T @ m @ vectors
    values, rotation = scipy.linalg.eigh(mr)
    keep = values > 1e-12 * values.max()
    vectors = vectors @ (rotation[:, keep] / np.sqrt(values[keep]))
    return RitzBasis(vectors, vectors.T @ rotor.shaft_stiffness @ vectors, vectors.T @ rotor.gyroscopic @ vectors)


@dataclass(frozen=True)
class RotorModes:
    """Damped whirl modes at one speed, sorted by whirl frequency.

    Attributes
    ----------
    speed : float
        Spin speed [rpm].
    frequency : numpy.ndarray
        Whirl (damped natural) frequency ``Im(lambda) / 2 pi`` [Hz].
    natural_frequency : numpy.ndarray
        ``|lambda| / 2 pi`` [Hz].
    damping_ratio : numpy.ndarray
        ``-Re(lambda) / |lambda|`` [-]; negative is unstable.
    whirl : tuple of str
        ``"forward"`` or ``"backward"`` per mode.
    shapes : numpy.ndarray
        Complex mode shapes over all degrees of freedom, one column per mode.
    """

    speed: float
    frequency: np.ndarray
    natural_frequency: np.ndarray
    damping_ratio: np.ndarray
    whirl: tuple[Whirl, ...]
    shapes: np.ndarray

    @property
    def log_decrement(self) -> np.ndarray:
        """Logarithmic decrement per mode [-] (negative: unstable)."""
        return log_decrement(self.damping_ratio)

    @property
    def unstable(self) -> np.ndarray:
        """Indices of modes with negative damping (negative log decrement)."""
        return np.flatnonzero(self.damping_ratio < 0.0)

    def to_modes(self, prefix: str = "rotor mode") -> list[Mode]:
        """The modes as :class:`~resonance.dynamics.modes.Mode` (source ``"rotor"``, with whirl)."""
        return [
            Mode(
                float(f),
                float(z),
                f"{prefix} {i + 1} ({w[0].upper()}W)",
                "rotor",
                self.shapes[:, i],
                w,
                kind="rotor-lateral",
                af_source="1/(2 zeta) of the rotor model's damping",
            )
            for i, (f, z, w) in enumerate(zip(self.frequency, self.damping_ratio, self.whirl, strict=True))
        ]


def _whirl(rotor: Rotor, shapes: np.ndarray) -> tuple[Whirl, ...]:
    # For x = Re(X e^{i w t}), y = Re(Y e^{i w t}) with w > 0, the orbit turns from x to y (with the
    # spin) when Im(conj(X) Y) < 0; summed over the nodes it labels the mode.
    n = rotor.nodes
    x = shapes[0 : 2 * n : 2]
    y = shapes[2 * n : 4 * n : 2]
    turn = np.sum(np.imag(np.conj(x) * y), axis=0)
    return tuple("forward" if t < 0.0 else "backward" for t in turn)


def solve_modes(rotor: Rotor, speed: float, count: int, basis: RitzBasis | None) -> tuple[np.ndarray, np.ndarray]:
    """Eigenvalues and shapes of the first-order whirl problem at ``speed`` (reduced when a basis is given)."""
    omega = spin_rate(speed)
    if basis is not None:
        kb, cb = basis.project_supports(rotor, speed)
        kr, cr = basis.shaft_stiffness + kb, cb + omega * basis.gyroscopic
        r = kr.shape[0]
        a = np.zeros((2 * r, 2 * r))
        a[:r, r:] = np.eye(r)
        a[r:, :r] = -kr
        a[r:, r:] = -cr
        lam, vectors = scipy.linalg.eig(a)
        vectors = basis.vectors @ vectors[:r]
    else:
        k_bearing, c_bearing = rotor.bearing_matrices(speed)
        k = rotor.shaft_stiffness + k_bearing
        c = c_bearing + omega * rotor.gyroscopic
        n = rotor.size
        factor = scipy.linalg.cho_factor(rotor.mass)
        a = np.zeros((2 * n, 2 * n))
        a[:n, n:] = np.eye(n)
        a[n:, :n] = -scipy.linalg.cho_solve(factor, k)
        a[n:, n:] = -scipy.linalg.cho_solve(factor, c)
        lam, vectors = scipy.linalg.eig(a)
        vectors = vectors[:n]
    oscillating = lam.imag > 1e-2 * np.abs(lam)  # overdamped pairs (damping ratio ~ 1) do not whirl
    lam, vectors = lam[oscillating], vectors[:, oscillating]
    order = np.argsort(lam.imag)[:count]
    return lam[order], vectors[:, order]


def rotor_modes(rotor: Rotor, speed: float, count: int = 8, reduced: bool = True) -> RotorModes:
    """Damped whirl modes of a rotor at one spin speed.

    Parameters
    ----------
    rotor : Rotor
        The assembled rotor.
    speed : float
        Spin speed [rpm] (>= 0).
    count : int
        Number of modes (lowest whirl frequencies).
    reduced : bool
        Use the Ritz basis (fast; the default) or the full model.

    Returns
    -------
    RotorModes

    Raises
    ------
    InputValueError, InputTypeError
        Not a rotor, a bad speed or count, a speed outside a bearing's coefficient table.
    """
    check_rotor(rotor)
    speed = as_si(speed, "speed", "speed", "nonnegative")
    count = count_of(count, "count")
    with blas_threads_for(2 * rotor.size):
        basis = ritz_basis(rotor, speed, count + 4) if reduced else None
        lam, shapes = solve_modes(rotor, speed, count, basis)
    return modes_from(rotor, speed, lam, shapes)


def check_rotor(rotor: object) -> None:
    """Refuse anything but a :class:`Rotor`, naming the parameter."""
    if not isinstance(rotor, Rotor):
        raise InputTypeError(f"rotor: got {type(rotor).__name__}; expected a Rotor (build one with rotor_model)")


def count_of(value: object, name: str) -> int:
    """A whole number >= 1, or an error naming the parameter."""
    if isinstance(value, bool) or not isinstance(value, (int, np.integer)) or value < 1:
        raise InputValueError(f"{name}: got {value!r}; expected a whole number >= 1")
    return int(value)


def _whirl_operator(rotor: Rotor) -> np.ndarray:
    """Hermitian H with u^H H u = sum over nodes of Im(conj(X) Y) (negative: forward whirl)."""
    n = rotor.nodes
    h = np.zeros((rotor.size, rotor.size), dtype=complex)
    for node in range(n):
        i, j = rotor.dof(node, "x"), rotor.dof(node, "y")
        h[i, j] = -0.5j  # Im(conj(x) y) = (conj(x) y - x conj(y)) / (2 i)
        h[j, i] = 0.5j
    return h


def _split_pairs(rotor: Rotor, lam: np.ndarray, shapes: np.ndarray) -> np.ndarray:
    """Within each pair of (nearly) equal eigenvalues, rotate to the circular forward and backward shapes.

    An isotropic rotor whose mode feels no gyroscopic moment has equal forward and backward
    frequencies; the solver then returns any two combinations, often planar. The whirl
    measure is a Hermitian form, so its eigenvectors in the pair's span are the pure whirls.
    """
    shapes = shapes.copy()
    h = None
    i = 0
    while i < lam.size - 1:
        if abs(lam[i + 1] - lam[i]) <= 1e-5 * abs(lam[i]):
            h = _whirl_operator(rotor) if h is None else h
            q, _ = np.linalg.qr(shapes[:, i : i + 2])
            _, rotation = np.linalg.eigh(q.conj().T @ h @ q)
            shapes[:, i : i + 2] = q @ rotation  # forward (negative measure) first
            i += 2
        else:
            i += 1
    return shapes


def modes_from(rotor: Rotor, speed: float, lam: np.ndarray, shapes: np.ndarray) -> RotorModes:
    """Whirl modes from eigenvalues and shapes: pairs split, shapes normalised, whirl direction found."""
    shapes = _split_pairs(rotor, lam, shapes)
    peak = shapes[np.argmax(np.abs(shapes), axis=0), np.arange(shapes.shape[1])]
    shapes = shapes / peak
    wn = np.abs(lam)
    return RotorModes(speed, lam.imag / TWO_PI, wn / TWO_PI, -lam.real / wn, _whirl(rotor, shapes), shapes)


def deflected_shape(rotor: Rotor, modes: RotorModes, index: int) -> tuple[np.ndarray, np.ndarray]:
    """Deflected shape of one mode along the shaft: node positions [m] and orbit semi-major axis.

    The shape is scaled to a largest semi-major axis of 1 (mode shapes have no absolute size).

    Parameters
    ----------
    rotor : Rotor
        The rotor.
    modes : RotorModes
        Its modes at one speed.
    index : int
        Which mode.

    Returns
    -------
    z : numpy.ndarray
        Node positions along the shaft [m].
    semi_major : numpy.ndarray
        Semi-major axis of each node's orbit, relative to the largest.

    Raises
    ------
    IndexError
        An index beyond the modes.
    """
    if not 0 <= index < modes.shapes.shape[1]:
        raise InputValueError(f"index: got {index}; expected 0..{modes.shapes.shape[1] - 1}")
    n = rotor.nodes
    u = modes.shapes[:, index]
    x, y = u[0 : 2 * n : 2], u[2 * n : 4 * n : 2]
    ax, ay, cross = np.abs(x) ** 2, np.abs(y) ** 2, np.real(x * np.conj(y))
    semi = np.sqrt((ax + ay) / 2.0 + np.sqrt(((ax - ay) / 2.0) ** 2 + cross**2))
    return rotor.node_z.copy(), semi / semi.max()


def modal_assurance(a: np.ndarray, b: np.ndarray) -> np.ndarray:
    """Modal assurance criterion between the columns of a and b (complex shapes)."""
    num = np.abs(a.conj().T @ b) ** 2
    return num / np.outer(np.sum(np.abs(a) ** 2, axis=0), np.sum(np.abs(b) ** 2, axis=0))


@dataclass(frozen=True)
class CampbellData:
    """Whirl modes over a speed sweep, tracked branch by branch.

    Attributes
    ----------
    speed : numpy.ndarray
        Spin speeds [rpm].
    frequency, damping_ratio : numpy.ndarray
        Shape (speeds, branches): whirl frequency [Hz] and damping ratio [-].
    whirl : tuple of str
        Whirl direction of each branch (the majority over the sweep).
    shapes : numpy.ndarray
        Shape (speeds, dofs, branches): the tracked complex shapes.
    """

    speed: np.ndarray
    frequency: np.ndarray
    damping_ratio: np.ndarray
    whirl: tuple[Whirl, ...]
    shapes: np.ndarray
    reduced: bool = True

    @property
    def log_decrement(self) -> np.ndarray:
        """Log decrement (speeds, branches) [-]."""
        return log_decrement(self.damping_ratio.ravel()).reshape(self.damping_ratio.shape)

    def unstable(self) -> list[tuple[float, int]]:
        """(speed [rpm], branch) pairs with negative log decrement."""
        i, j = np.nonzero(self.damping_ratio < 0.0)
        return [(float(self.speed[a]), int(b)) for a, b in zip(i, j, strict=True)]


def campbell(
    rotor: Rotor,
    speeds: Sequence[float] | np.ndarray,
    count: int = 8,
    reduced: bool = True,
    progress: bool = False,
) -> CampbellData:
    """Whirl frequencies and damping over a speed sweep (Campbell diagram data).

    Parameters
    ----------
    rotor : Rotor
        The assembled rotor.
    speeds : array_like
        Increasing spin speeds [rpm] (>= 0).
    count : int
        Number of branches to track (the lowest at the first speed).
    reduced : bool
        Use the Ritz basis (fast; the default) or the full model.
    progress : bool
        Show a progress bar over the speeds (a full-model sweep of a long rotor takes seconds).

    Returns
    -------
    CampbellData
        Each branch's whirl frequency and damping at every speed of the sweep.

    Raises
    ------
    InputValueError, InputTypeError
        Not a rotor, fewer than 2 increasing speeds, a bad count, a speed outside a bearing table.
    """
    check_rotor(rotor)
    grid = as_si_array(speeds, "speeds", "speed", "nonnegative")
    if grid.ndim != 1 or grid.size < 2 or np.any(np.diff(grid) <= 0):
        raise InputValueError("speeds: expected at least 2 increasing, finite speeds >= 0 rpm")
    count = count_of(count, "count")
    extra = count + 4  # candidates at each speed, so a branch can be followed past a crossing
    freq = np.empty((grid.size, count))
    zeta = np.empty_like(freq)
    shapes = np.empty((grid.size, rotor.size, count), dtype=complex)
    votes = np.zeros(count)
    basis = ritz_basis(rotor, float(np.median(grid)), extra) if reduced else None
    # The sweep's eigenproblems have the order of the basis, not of the model.
    with (
        blas_threads_for(2 * (basis.vectors.shape[1] if basis is not None else rotor.size)),
        progress_bar(grid.size, "Campbell sweep", progress) as tick,
    ):
        previous = None
        for i, speed in enumerate(grid):
            tick()
            lam, vec = solve_modes(rotor, float(speed), extra, basis)
            modes = modes_from(rotor, float(speed), lam, vec)
            if previous is None:
                pick = np.arange(count)
            else:
                mac = modal_assurance(previous, modes.shapes)
                _, pick = scipy.optimize.linear_sum_assignment(-mac)
            freq[i] = modes.frequency[pick]
            zeta[i] = modes.damping_ratio[pick]
            shapes[i] = modes.shapes[:, pick]
            votes += np.array([1.0 if modes.whirl[p] == "forward" else -1.0 for p in pick])
            previous = shapes[i]
    whirl = tuple("forward" if v > 0 else "backward" for v in votes)
    return CampbellData(grid, freq, zeta, whirl, shapes, reduced)  # type: ignore[arg-type]
