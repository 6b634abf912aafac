"""Analyses of a rotor: whirl modes over speed, critical speeds, critical speed map, unbalance response.

* :func:`rotor_modes`: damped complex modes at one speed, with the whirl
  direction (forward: the orbit turns with the spin) and the log decrement.
* :func:`campbell`: modes over a speed sweep, each branch tracked by the
  similarity of its shape (MAC) so that branches keep their identity where
  they cross.
* :func:`critical_speeds`: where an excitation order line meets a branch,
  by root finding on the whirl frequency (not the nearest grid speed).
* :func:`critical_speed_map`: undamped synchronous critical speeds against
  an isotropic support stiffness over several decades.
* :func:`unbalance_response_rotor`: steady response to rotating unbalances,
  amplitude (pk-pk) and phase at chosen stations.

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
from collections.abc import Callable, Sequence
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
    "CriticalSpeed",
    "critical_speeds",
    "CriticalSpeedMap",
    "critical_speed_map",
    "Unbalance",
    "UnbalanceResponse",
    "rotor_unbalance_response",
    "unbalance_response_rotor",
]

Whirl = Literal["forward", "backward"]
TWO_PI = 2.0 * math.pi


def _omega(speed: float) -> float:
    return TWO_PI * speed / 60.0


@dataclass(frozen=True)
class _Basis:
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


def _ritz_basis(rotor: Rotor, speed: float, count: int, loads: np.ndarray | None = None) -> _Basis:
    # Small dense algebra: one BLAS thread (two threads on these sizes cost ten times more on a busy machine).
    with blas_threads_for(rotor.size):
        return _build_ritz_basis(rotor, speed, count, loads)


def _build_ritz_basis(rotor: Rotor, speed: float, count: int, loads: np.ndarray | None) -> _Basis:
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
    return _Basis(vectors, vectors.T @ rotor.shaft_stiffness @ vectors, vectors.T @ rotor.gyroscopic @ vectors)


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


def _solve_modes(rotor: Rotor, speed: float, count: int, basis: _Basis | None) -> tuple[np.ndarray, np.ndarray]:
    omega = _omega(speed)
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
    _check_rotor(rotor)
    speed = as_si(speed, "speed", "speed", "nonnegative")
    count = _count(count, "count")
    with blas_threads_for(2 * rotor.size):
        basis = _ritz_basis(rotor, speed, count + 4) if reduced else None
        lam, shapes = _solve_modes(rotor, speed, count, basis)
    return _modes_from(rotor, speed, lam, shapes)


def _check_rotor(rotor: object) -> None:
    if not isinstance(rotor, Rotor):
        raise InputTypeError(f"rotor: got {type(rotor).__name__}; expected a Rotor (build one with rotor_model)")


def _count(value: object, name: str) -> int:
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


def _modes_from(rotor: Rotor, speed: float, lam: np.ndarray, shapes: np.ndarray) -> RotorModes:
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


def _mac(a: np.ndarray, b: np.ndarray) -> np.ndarray:
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

    Raises
    ------
    InputValueError, InputTypeError
        Not a rotor, fewer than 2 increasing speeds, a bad count, a speed outside a bearing table.
    """
    _check_rotor(rotor)
    grid = as_si_array(speeds, "speeds", "speed", "nonnegative")
    if grid.ndim != 1 or grid.size < 2 or np.any(np.diff(grid) <= 0):
        raise InputValueError("speeds: expected at least 2 increasing, finite speeds >= 0 rpm")
    count = _count(count, "count")
    extra = count + 4  # candidates at each speed, so a branch can be followed past a crossing
    freq = np.empty((grid.size, count))
    zeta = np.empty_like(freq)
    shapes = np.empty((grid.size, rotor.size, count), dtype=complex)
    votes = np.zeros(count)
    basis = _ritz_basis(rotor, float(np.median(grid)), extra) if reduced else None
    # The sweep's eigenproblems have the order of the basis, not of the model.
    with (
        blas_threads_for(2 * (basis.vectors.shape[1] if basis is not None else rotor.size)),
        progress_bar(grid.size, "Campbell sweep", progress) as tick,
    ):
        previous = None
        for i, speed in enumerate(grid):
            tick()
            lam, vec = _solve_modes(rotor, float(speed), extra, basis)
            modes = _modes_from(rotor, float(speed), lam, vec)
            if previous is None:
                pick = np.arange(count)
            else:
                mac = _mac(previous, modes.shapes)
                _, pick = scipy.optimize.linear_sum_assignment(-mac)
            freq[i] = modes.frequency[pick]
            zeta[i] = modes.damping_ratio[pick]
            shapes[i] = modes.shapes[:, pick]
            votes += np.array([1.0 if modes.whirl[p] == "forward" else -1.0 for p in pick])
            previous = shapes[i]
    whirl = tuple("forward" if v > 0 else "backward" for v in votes)
    return CampbellData(grid, freq, zeta, whirl, shapes, reduced)  # type: ignore[arg-type]


@dataclass(frozen=True)
class CriticalSpeed:
    """Where an order line meets a whirl branch.

    Attributes
    ----------
    order : float
        Excitation order [-].
    branch : int
        Campbell branch (0-based).
    speed : float
        Critical speed [rpm].
    frequency : float
        Whirl frequency there [Hz].
    damping_ratio : float
        [-].
    whirl : {"forward", "backward"}
        Whirl direction.
    """

    order: float
    branch: int
    speed: float
    frequency: float
    damping_ratio: float
    whirl: Whirl

    def to_mode(self) -> Mode:
        """The critical as a :class:`~resonance.dynamics.modes.Mode` for the interference check."""
        return Mode(
            self.frequency,
            self.damping_ratio,
            f"branch {self.branch + 1} ({self.whirl[0].upper()}W) at {self.speed:.0f} rpm",
            "rotor",
            whirl=self.whirl,
            kind="rotor-lateral",
            af_source="1/(2 zeta) of the rotor model's damping at the critical",
        )


def critical_speeds(
    rotor: Rotor, data: CampbellData, orders: Sequence[float] = (1.0,), whirl: Whirl | None = "forward"
) -> list[CriticalSpeed]:
    """Critical speeds: each order line ``f = n N / 60`` against each branch.

    Sign changes of ``f_branch(N) - n N / 60`` on the sweep's grid are refined
    by Brent's method on the rotor's modes, following the branch by its shape
    (with the same model, reduced or full, as the sweep).

    Parameters
    ----------
    rotor : Rotor
        The rotor the data came from.
    data : CampbellData
        From :func:`campbell`.
    orders : sequence of float
        Excitation orders (1 for unbalance).
    whirl : {"forward", "backward"} or None
        Only branches of this whirl direction (all when None).

    Returns
    -------
    list of CriticalSpeed
        By speed.

    Raises
    ------
    InputValueError
        An order that is not > 0.
    """
    out = []
    extra = data.frequency.shape[1] + 4
    basis = _ritz_basis(rotor, float(np.median(data.speed)), extra) if data.reduced else None
    for order in orders:
        if not order > 0:
            raise InputValueError(f"orders: got {order!r}; expected values > 0")
        for b in range(data.frequency.shape[1]):
            if whirl is not None and data.whirl[b] != whirl:
                continue
            g = data.frequency[:, b] - order * data.speed / 60.0
            for i in np.flatnonzero(np.sign(g[:-1]) * np.sign(g[1:]) < 0):
                reference = data.shapes[i, :, b : b + 1]

                def branch_mode(speed: float, reference: np.ndarray = reference) -> tuple[float, float]:
                    lam, vec = _solve_modes(rotor, speed, extra, basis)
                    modes = _modes_from(rotor, speed, lam, vec)
                    j = int(np.argmax(_mac(reference, modes.shapes)[0]))
                    return float(modes.frequency[j]), float(modes.damping_ratio[j])

                def residual(
                    speed: float,
                    order: float = order,
                    branch_mode: Callable[[float], tuple[float, float]] = branch_mode,
                ) -> float:
                    return branch_mode(speed)[0] - order * speed / 60.0

                try:
                    speed = scipy.optimize.brentq(residual, data.speed[i], data.speed[i + 1], xtol=1e-9, rtol=1e-12)
                    f, z = branch_mode(speed)
                except ValueError:
                    # The re-solved branch does not cross inside the bracket (two modes that swap between the
                    # grid speeds): take the crossing of the tracked branch, linear between its grid points.
                    t = float(g[i] / (g[i] - g[i + 1]))
                    speed = float(data.speed[i] + t * (data.speed[i + 1] - data.speed[i]))
                    f = order * speed / 60.0
                    z = float(data.damping_ratio[i, b] + t * (data.damping_ratio[i + 1, b] - data.damping_ratio[i, b]))
                out.append(CriticalSpeed(float(order), b, float(speed), f, z, data.whirl[b]))
    return sorted(out, key=lambda c: c.speed)


@dataclass(frozen=True)
class CriticalSpeedMap:
    """Undamped synchronous critical speeds against support stiffness.

    Attributes
    ----------
    stiffness : numpy.ndarray
        Isotropic support stiffness at every bearing [N/m].
    speed : numpy.ndarray
        Shape (stiffness values, count): critical speeds [rpm].
    """

    stiffness: np.ndarray
    speed: np.ndarray


def critical_speed_map(rotor: Rotor, stiffness: Sequence[float] | np.ndarray, count: int = 4) -> CriticalSpeedMap:
    """Undamped critical speed map: synchronous forward criticals vs support stiffness.

    Every bearing is replaced by an isotropic spring of the given stiffness
    (no damping, no cross-coupling; pedestals kept). For synchronous forward
    whirl the gyroscopic moment acts as a negative inertia, so the criticals
    solve ``K(k) phi = w^2 (M - P) phi`` in one plane (``P``: polar inertia).

    Parameters
    ----------
    rotor : Rotor
        The rotor (its shaft, discs and pedestals).
    stiffness : array_like or pint.Quantity
        Isotropic support stiffnesses [N/m] (> 0).
    count : int
        Critical speeds per stiffness.

    Returns
    -------
    CriticalSpeedMap

    Raises
    ------
    InputValueError, InputTypeError
        Not a rotor, bad stiffnesses or count.

    References
    ----------
    Friswell et al., *Dynamics of Rotating Machines*, 2010, sec. 3.6 and 6.2
    (synchronous whirl); API RP 684, 2nd ed., 2005 (critical speed map; from memory).
    """
    _check_rotor(rotor)
    values = as_si_array(stiffness, "stiffness", "stiffness", "positive")
    if values.ndim != 1 or values.size == 0:
        raise InputValueError("stiffness: expected a list of finite values > 0 N/m")
    count = _count(count, "count")
    n = rotor.nodes
    plane = list(range(2 * n)) + list(range(4 * n, rotor.size, 2))  # x plane of shaft and pedestals
    m = rotor.mass[np.ix_(plane, plane)]
    p = np.zeros_like(m)
    p[: 2 * n, : 2 * n] = rotor.polar_mass
    speeds = np.full((values.size, count), np.nan)
    pedestal_index = {}
    column = 2 * n
    for b in rotor.bearings:
        if b.pedestal is not None:
            pedestal_index[id(b)] = column
            column += 1
    with blas_threads_for(len(plane)):
        for i, k_support in enumerate(values):
            k = rotor.shaft_stiffness[np.ix_(plane, plane)].copy()
            for b in rotor.bearings:
                s = 2 * rotor.station_nodes[b.station]
                if b.pedestal is None:
                    k[s, s] += k_support
                else:
                    q = pedestal_index[id(b)]
                    k[np.ix_([s, q], [s, q])] += k_support * np.array([[1.0, -1.0], [-1.0, 1.0]])
                    k[q, q] += b.pedestal.kxx
            lam = scipy.linalg.eigvals(k, m - p)
            good = np.sort(lam.real[(np.abs(lam.imag) <= 1e-9 * np.abs(lam)) & (lam.real > 0) & np.isfinite(lam)])
            found = np.sqrt(good[:count]) * 60.0 / TWO_PI
            speeds[i, : found.size] = found
    return CriticalSpeedMap(values, speeds)


@dataclass(frozen=True)
class Unbalance:
    """An unbalance at a station: amount [kg m] and angular position [deg].

    ``amount`` may be a quantity (``ureg("500 g*mm")``, ``ureg("0.7 oz*in")``); ``phase_deg`` a plain
    number of degrees or an angle quantity.

    Attributes
    ----------
    station : int
        Where it acts.
    amount : float
        [kg m].
    phase_deg : float
        Angular position [deg].
    """

    station: int
    amount: float
    phase_deg: float = 0.0

    def __post_init__(self) -> None:
        if isinstance(self.station, bool) or not isinstance(self.station, (int, np.integer)):
            raise InputTypeError(f"station: got {self.station!r}; expected a whole number")
        object.__setattr__(self, "amount", as_si(self.amount, "amount", "unbalance", "nonnegative"))
        phase = self.phase_deg
        if hasattr(phase, "magnitude"):
            phase = float(as_si(phase, "phase_deg", "angle")) * 180.0 / math.pi
        object.__setattr__(self, "phase_deg", as_si(phase, "phase_deg", "ratio"))


@dataclass(frozen=True)
class UnbalanceResponse:
    """Steady unbalance response at probe stations over speed.

    Attributes
    ----------
    speed : numpy.ndarray
        Speeds [rpm].
    x, y : numpy.ndarray
        Shape (speeds, probes): complex amplitudes of the x and y motion [m] (0-peak).
    stations : tuple of int
        The probe stations.
    """

    speed: np.ndarray
    x: np.ndarray
    y: np.ndarray
    stations: tuple[int, ...]

    @property
    def major_pk_pk(self) -> np.ndarray:
        """Peak-to-peak length of the orbit's major axis [m], (speeds, probes)."""
        ax, ay = np.abs(self.x) ** 2, np.abs(self.y) ** 2
        cross = np.real(self.x * np.conj(self.y))
        semi = np.sqrt((ax + ay) / 2.0 + np.sqrt(((ax - ay) / 2.0) ** 2 + cross**2))
        return 2.0 * semi

    @property
    def x_pk_pk(self) -> np.ndarray:
        """Peak-to-peak amplitude of the x motion [m]."""
        return 2.0 * np.abs(self.x)

    @property
    def x_phase_lag_deg(self) -> np.ndarray:
        """Lag of the x motion behind the unbalance's x force component [deg], in [0, 360)."""
        return np.mod(-np.degrees(np.angle(self.x)), 360.0)


def rotor_unbalance_response(
    rotor: Rotor,
    unbalances: Sequence[Unbalance],
    speeds: Sequence[float] | np.ndarray,
    stations: Sequence[int],
    reduced: bool = False,
) -> UnbalanceResponse:
    """Steady response to rotating unbalances, one solve per speed.

    The unbalance force ``U W^2`` turns with the spin: ``F_x = U W^2 cos(W t + a)``,
    ``F_y = U W^2 sin(W t + a)``. The x phase lag is measured from ``a = 0``.

    Parameters
    ----------
    rotor : Rotor
        The assembled rotor.
    unbalances : sequence of Unbalance
        Amounts [kg m] and angles [deg] at stations.
    speeds : array_like
        Spin speeds [rpm] (>= 0).
    stations : sequence of int
        Stations where the response is read.
    reduced : bool
        Solve in the Ritz basis of the sweeps (lowest modes, static bearing shapes, and the static
        shapes of the unbalance loads, a static correction) instead of the full model: the same
        answer to a few parts in 1e4 at a fraction of the time (see the tests).

    Returns
    -------
    UnbalanceResponse

    Raises
    ------
    InputValueError, InputTypeError
        A bad rotor, speed, unbalance or station.

    References
    ----------
    Friswell et al., *Dynamics of Rotating Machines*, 2010, sec. 6.4; R. R. Craig and A. J. Kurdila,
    *Fundamentals of Structural Dynamics*, 2nd ed., 2006, sec. 14.4 (static correction of modal bases).
    """
    _check_rotor(rotor)
    grid = as_si_array(speeds, "speeds", "speed", "nonnegative")
    if grid.ndim != 1 or grid.size == 0:
        raise InputValueError("speeds: expected a list of finite speeds >= 0 rpm")
    if not unbalances:
        raise InputValueError("unbalances: got none; expected at least one")
    probes = [(rotor.station_dof(s, "x"), rotor.station_dof(s, "y")) for s in stations]
    base = np.zeros(rotor.size, dtype=complex)
    for i, u in enumerate(unbalances):
        if not isinstance(u, Unbalance):
            raise InputTypeError(f"unbalances[{i}]: got {type(u).__name__}; expected an Unbalance")
        rotor.station_dof(u.station, "x")
        a = math.radians(u.phase_deg)
        base[rotor.station_dof(u.station, "x")] += u.amount * np.exp(1j * a)
        base[rotor.station_dof(u.station, "y")] += -1j * u.amount * np.exp(1j * a)
    x = np.empty((grid.size, len(probes)), dtype=complex)
    y = np.empty_like(x)
    if reduced:
        loads = np.column_stack([base.real, base.imag])
        basis = _ritz_basis(rotor, float(np.median(grid)), 16, loads[:, np.any(loads != 0.0, axis=0)])
        t = basis.vectors
        force = t.T @ base
        rows = t[[d for pair in probes for d in pair]]
        r = t.shape[1]
        spins = np.array([_omega(float(v)) for v in grid])
        stacked = np.empty((grid.size, r, r), dtype=complex)
        for i, speed in enumerate(grid):
            kb, cb = basis.project_supports(rotor, float(speed))
            stacked[i] = basis.shaft_stiffness + kb + 1j * spins[i] * (cb + spins[i] * basis.gyroscopic)
        stacked[:, np.arange(r), np.arange(r)] -= (spins**2)[:, None]  # mass-orthonormal basis: M_r = I
        with blas_threads_for(r):
            q = np.linalg.solve(stacked, (force[None, :] * (spins**2)[:, None])[:, :, None])[:, :, 0] @ rows.T
        x[:], y[:] = q[:, 0::2], q[:, 1::2]
        return UnbalanceResponse(grid, x, y, tuple(stations))
    with blas_threads_for(rotor.size):
        for i, speed in enumerate(grid):
            omega = _omega(float(speed))
            k_b, c_b = rotor.bearing_matrices(float(speed))
            dynamic = (
                rotor.shaft_stiffness + k_b - omega**2 * rotor.mass + 1j * omega * (c_b + omega * rotor.gyroscopic)
            )
            q = scipy.linalg.solve(dynamic, base * omega**2)
            for j, (dx, dy) in enumerate(probes):
                x[i, j], y[i, j] = q[dx], q[dy]
    return UnbalanceResponse(grid, x, y, tuple(stations))


#: The name of 0.1, kept working: the same function as :func:`rotor_unbalance_response` (functions on a
#: :class:`~resonance.kinds.rotor.model.Rotor` are named ``rotor_*``).
unbalance_response_rotor = rotor_unbalance_response
