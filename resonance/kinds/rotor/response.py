"""Unbalance response of a rotor: the forced whirl at every station over the speed sweep."""

from __future__ import annotations

import math
from collections.abc import Sequence
from dataclasses import dataclass

import numpy as np
import scipy.linalg
import scipy.optimize

from ...core.errors import InputTypeError, InputValueError
from ...core.inputs import as_si, as_si_array
from ...core.threads import blas_threads_for
from .analysis import check_rotor, ritz_basis, spin_rate
from .model import Rotor

__all__ = [
    "unbalance_response_rotor",
    "Unbalance",
    "UnbalanceResponse",
    "rotor_unbalance_response",
]


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
    check_rotor(rotor)
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
        basis = ritz_basis(rotor, float(np.median(grid)), 16, loads[:, np.any(loads != 0.0, axis=0)])
        t = basis.vectors
        force = t.T @ base
        rows = t[[d for pair in probes for d in pair]]
        r = t.shape[1]
        spins = np.array([spin_rate(float(v)) for v in grid])
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
            omega = spin_rate(float(speed))
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
