"""Forced response of rigid bodies in space: point loads, rotating unbalances, response at points.

The steady response at any point of a body, and the orbit's major axis.
"""

from __future__ import annotations

import math
from collections.abc import Sequence
from dataclasses import dataclass, field

import numpy as np

from ...core.errors import InputTypeError, InputValueError
from ...core.inputs import as_si, as_si_array
from .bodies import SpaceModel, vector3

__all__ = [
    "PointLoad",
    "orbit_major",
    "rotating_unbalance",
    "unbalance_reference",
    "space_response",
]


@dataclass(frozen=True)
class PointLoad:
    """A harmonic force (and moment) at a body point: complex amplitudes in global axes.

    Attributes
    ----------
    body : str
        The body loaded.
    point : numpy.ndarray
        Where [m].
    force : numpy.ndarray
        Complex force amplitude [N], three components (``F e^{i w t}``), per frequency (``n x 3``) or one
        for all.
    moment : numpy.ndarray
        Complex moment amplitude [N m], likewise.
    """

    body: str
    point: np.ndarray
    force: np.ndarray
    moment: np.ndarray = field(default_factory=lambda: np.zeros(3, dtype=complex))


def rotating_unbalance(body: str, point: object, axis: object, unbalance: object, frequency: object) -> PointLoad:
    """The rotating force of an unbalance on a shaft of given direction, at every frequency.

    Parameters
    ----------
    body : str
        The body carrying the rotor.
    point : array_like
        The unbalance plane's centre on the shaft axis [m].
    axis : array_like
        The shaft direction (any length; the rotor spins right-handed about it).
    unbalance : float or pint.Quantity
        ``m e`` [kg m] (> 0).
    frequency : array_like or pint.Quantity
        Running frequencies [Hz] (>= 0).

    Returns
    -------
    PointLoad
        ``F = m e w^2 (e1 - i e2)`` per frequency: the force ``m e w^2 (e1 cos wt + e2 sin wt)``, turning
        from ``e1`` towards ``e2`` with the shaft, right-handed about the axis (:func:`unbalance_reference`).

    Raises
    ------
    InputValueError
        A zero axis, a bad unbalance or frequency.

    Notes
    -----
    The phase reference: at ``t = 0`` the unbalance mass, and the force it throws out, lie along ``e1``; a
    quarter turn later along ``e2 = n x e1``. Every phase a study reports is a lag behind this force.

    References
    ----------
    ISO 21940-11 (the force ``U w^2``); S. S. Rao, *Mechanical Vibrations*, 6th ed., 2017, sec. 3.7
    (rotating unbalance); J. M. Vance, *Rotordynamics of Turbomachinery*, 1988, ch. 2 (the synchronous orbit
    turns with the rotor on an isotropic support; from memory).
    """
    e1, e2 = unbalance_reference(axis)
    u = as_si(unbalance, "unbalance", "unbalance", "positive")
    w = 2.0 * math.pi * as_si_array(frequency, "frequency", "frequency", "nonnegative")
    force = (u * w**2)[:, None] * (e1 - 1j * e2)[None, :]
    return PointLoad(body, vector3(point, "point"), force)


def unbalance_reference(axis: object) -> tuple[np.ndarray, np.ndarray]:
    """Where an unbalance on a shaft of this direction sits at ``t = 0``, and a quarter turn later.

    Parameters
    ----------
    axis : array_like
        The shaft direction ``n`` (any length); the rotor spins right-handed about it.

    Returns
    -------
    e1 : numpy.ndarray
        The unit direction of the unbalance at ``t = 0``: ``n x h`` normalised, ``h`` the global axis least
        aligned with ``n`` (x for a shaft along z: ``e1`` is then +y).
    e2 : numpy.ndarray
        ``n x e1``, where it is a quarter turn later (-x for a shaft along z).

    Raises
    ------
    InputValueError
        A zero or non-finite axis.

    Examples
    --------
    >>> e1, e2 = unbalance_reference([0, 0, 1])
    >>> e1.tolist(), e2.tolist()
    ([0.0, 1.0, 0.0], [-1.0, 0.0, 0.0])
    """
    n = vector3(axis, "axis", "ratio")
    largest = float(np.max(np.abs(n)))
    if not largest > 0.0:
        raise InputValueError("axis: got a zero vector; expected the shaft direction")
    n = n / largest  # a direction: scaled first, so that 1e300 components do not overflow the length
    n = n / float(np.linalg.norm(n))
    helper = np.eye(3)[int(np.argmin(np.abs(n)))]
    e1 = np.cross(n, helper)
    e1 /= np.linalg.norm(e1)
    e2 = np.cross(n, e1)
    return e1 + 0.0, e2 + 0.0  # + 0.0: no negative zeros in what is shown


def space_response(
    model: SpaceModel, loads: Sequence[PointLoad], frequency: object, points: Sequence[tuple[str, object]]
) -> np.ndarray:
    """Steady complex displacement at body points under harmonic point loads.

    Parameters
    ----------
    model : SpaceModel
        From :func:`space_model`.
    loads : sequence of PointLoad
        The loads (forces per frequency or one for all).
    frequency : array_like or pint.Quantity
        Frequencies [Hz] (>= 0).
    points : sequence of (str, array_like)
        ``(body, point)`` where the motion is read.

    Returns
    -------
    numpy.ndarray
        Complex displacement amplitudes [m], ``len(frequency) x len(points) x 3`` (global x, y, z).

    Raises
    ------
    InputValueError
        An unknown body, a load of the wrong shape, a bad frequency.

    Notes
    -----
    ``(K - w^2 M + i w C) q = sum T_p^T F_p + [0; M_p]`` solved at every frequency; the amplitude of each
    direction is ``|u|`` and the phase lag ``-angle(u)``; :func:`orbit_major` gives the largest excursion.
    """
    if not isinstance(model, SpaceModel):
        raise InputTypeError(f"model: got {type(model).__name__}; expected a SpaceModel")
    w = 2.0 * math.pi * as_si_array(frequency, "frequency", "frequency", "nonnegative")
    n = model.model.size
    rhs = np.zeros((w.size, n), dtype=complex)
    for i, load in enumerate(loads):
        j, motion = model.motion(load.body, load.point)
        given = np.asarray(load.force, dtype=complex)
        if given.ndim not in (1, 2) or given.shape[-1] != 3 or (given.ndim == 2 and given.shape[0] != w.size):
            raise InputValueError(f"loads[{i}]: force: expected three components (per frequency or one for all)")
        force = np.broadcast_to(given, (w.size, 3))
        moment = np.broadcast_to(np.asarray(load.moment, dtype=complex), (w.size, 3))
        rhs[:, j : j + 6] += force @ motion
        rhs[:, j + 3 : j + 6] += moment
    reads = [model.motion(b, p) for b, p in points]
    m, k, c = model.model.mass, model.model.stiffness, model.model.damping
    dynamic = k[None] - (w**2)[:, None, None] * m[None] + 1j * w[:, None, None] * c[None]
    q = np.linalg.solve(dynamic, rhs[:, :, None])[:, :, 0]
    return np.stack([q[:, j : j + 6] @ t.T for j, t in reads], axis=1)


def orbit_major(displacement: np.ndarray) -> np.ndarray:
    """Semi-major axis of the elliptical path of a point moving ``Re(u e^{i w t})`` in space.

    Parameters
    ----------
    displacement : numpy.ndarray
        Complex amplitudes, ``... x 3``.

    Returns
    -------
    numpy.ndarray
        The largest excursion from the mean position [m] (0-peak), shape ``...``.

    Raises
    ------
    Nothing
        Plain arithmetic.

    Notes
    -----
    With ``u = a + i b`` the path is ``a cos wt - b sin wt``; its largest squared length is the largest
    eigenvalue of ``[[a.a, -a.b], [-a.b, b.b]]``.
    """
    try:
        u = np.asarray(displacement, dtype=complex)
    except (TypeError, ValueError):
        raise InputTypeError(f"displacement: got {displacement!r}; expected complex amplitudes (... x 3)") from None
    if u.ndim < 1 or u.shape[-1] != 3 or not np.all(np.isfinite(u)):
        raise InputValueError(f"displacement: got shape {u.shape}; expected finite complex amplitudes (... x 3)")
    a, b = u.real, u.imag
    aa, bb, ab = (a * a).sum(-1), (b * b).sum(-1), (a * b).sum(-1)
    mean, half = 0.5 * (aa + bb), np.sqrt(0.25 * (aa - bb) ** 2 + ab**2)
    return np.sqrt(mean + half)
