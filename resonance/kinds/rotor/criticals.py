"""Critical speeds of a rotor, and the undamped critical speed map against bearing stiffness.

* :func:`critical_speeds`: where an excitation order line meets a branch,
  by root finding on the whirl frequency (not the nearest grid speed).
* :func:`critical_speed_map`: undamped synchronous critical speeds against
  an isotropic support stiffness over several decades.

References
----------
.. [1] API RP 684, 2nd ed., 2005 (critical speed maps; from memory).
"""

from __future__ import annotations

from collections.abc import Callable, Sequence
from dataclasses import dataclass

import numpy as np
import scipy.linalg
import scipy.optimize

from ...core.errors import InputValueError
from ...core.inputs import as_si_array
from ...core.threads import blas_threads_for
from ...dynamics.modes import Mode
from .analysis import (
    TWO_PI,
    CampbellData,
    Whirl,
    check_rotor,
    count_of,
    modal_assurance,
    modes_from,
    ritz_basis,
    solve_modes,
)
from .model import Rotor

__all__ = [
    "CriticalSpeed",
    "critical_speeds",
    "CriticalSpeedMap",
    "critical_speed_map",
]


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
    basis = ritz_basis(rotor, float(np.median(data.speed)), extra) if data.reduced else None
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
                    lam, vec = solve_modes(rotor, speed, extra, basis)
                    modes = modes_from(rotor, speed, lam, vec)
                    j = int(np.argmax(modal_assurance(reference, modes.shapes)[0]))
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
    check_rotor(rotor)
    values = as_si_array(stiffness, "stiffness", "stiffness", "positive")
    if values.ndim != 1 or values.size == 0:
        raise InputValueError("stiffness: expected a list of finite values > 0 N/m")
    count = count_of(count, "count")
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
