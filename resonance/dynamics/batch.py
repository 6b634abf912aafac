"""Many variants of one lumped model solved at once: stacked matrices, one batched eigen-solve.

An uncertainty study or a map of combined fixes asks for the modes of thousands of variants of one
:class:`~resonance.dynamics.lumped.ModelSpec` (each spring and mass scaled by its own factor, the damping ratio
changed). Building a :class:`~resonance.dynamics.model.MatrixModel` per variant costs a Python round trip each; here
the variants' matrices are stacked (``samples x n x n``) and solved together by numpy's batched eigen-solvers,
giving what :func:`resonance.dynamics.modes.model_modes` gives each variant (natural frequency ``|lambda| / 2 pi`` and
damping ratio of every oscillating mode, by ascending frequency).

References
----------
.. [1] R. W. Clough and J. Penzien, *Dynamics of Structures*, 2nd ed., 1993, sec. 12-5 (modal damping).
.. [2] D. J. Ewins, *Modal Testing*, 2nd ed., 2000, sec. 2.4 (complex modes of the first-order form).
"""

from __future__ import annotations

import math
from collections.abc import Mapping
from dataclasses import dataclass

import numpy as np

from ..core.errors import InputValueError
from ..core.threads import blas_threads_for
from .lumped import ModelSpec
from .model import GROUND

__all__ = ["BatchModes", "lumped_modes_batch"]


@dataclass(frozen=True)
class BatchModes:
    """The modes of many variants of one model.

    Attributes
    ----------
    frequency : numpy.ndarray
        Natural frequencies [Hz], ``samples x n``, ascending per row; NaN where a variant has fewer
        oscillating modes (overdamped or at 0 Hz, left out as :meth:`ModeSet.to_modes` leaves them out).
    damping_ratio : numpy.ndarray
        Modal damping ratios [-], same shape.
    """

    frequency: np.ndarray
    damping_ratio: np.ndarray


def _factors(values: Mapping[str, object] | None, names: tuple[str, ...], what: str, samples: int) -> np.ndarray:
    # One column of factors per name (1 where none is given), samples x len(names).
    out = np.ones((samples, len(names)))
    for key, value in (values or {}).items():
        if key not in names:
            raise InputValueError(f"{what}: names {key!r}; expected one of {list(names)}")
        column = np.broadcast_to(np.asarray(value, dtype=float), (samples,))
        if not np.all(np.isfinite(column) & (column > 0.0)):
            raise InputValueError(f"{what}[{key!r}]: expected finite factors > 0")
        out[:, names.index(key)] = column
    return out


def lumped_modes_batch(
    spec: ModelSpec,
    samples: int,
    stiffness_factors: Mapping[str, object] | None = None,
    mass_factors: Mapping[str, object] | None = None,
    damping_ratio: object | None = None,
) -> BatchModes:
    """Modes of ``samples`` variants of a lumped model, solved together.

    Parameters
    ----------
    spec : ModelSpec
        The nominal model (modal damping ratio plus the springs' dashpots).
    samples : int
        Number of variants (>= 1).
    stiffness_factors : mapping of spring label to array_like, optional
        Factor on each named spring's stiffness per variant (dashpots unchanged, as
        :meth:`ModelSpec.build` does).
    mass_factors : mapping of mass name to array_like, optional
        Factor on each named mass per variant.
    damping_ratio : array_like, optional
        Modal damping ratio per variant [-] (the model's if omitted).

    Returns
    -------
    BatchModes
        Natural frequencies and damping ratios of every variant, one row a variant.

    Raises
    ------
    InputValueError
        An unknown name, a factor that is not finite and > 0, a damping ratio outside [0, 1), fewer than one
        sample.

    Notes
    -----
    Undamped modes from the symmetric ``M^-1/2 K M^-1/2`` (masses are lumped, so ``M`` is diagonal); modal
    damping ``C = M Phi diag(2 zeta w) Phi^T M`` (Clough & Penzien); with dashpots the complex modes of
    ``[[0, I], [-M^-1 K, -M^-1 C]]``. Each variant's result equals :func:`resonance.dynamics.modes.model_modes` of
    ``spec.build(...)`` to rounding (``tests/test_uncertainty.py`` checks it).
    """
    if not (isinstance(samples, int) and samples >= 1):
        raise InputValueError(f"samples: got {samples!r}; expected a whole number >= 1")
    names = spec.labels
    labels = tuple(s.label for s in spec.springs)
    kf = _factors(stiffness_factors, labels, "stiffness_factors", samples)
    mf = _factors(mass_factors, names, "mass_factors", samples)
    zeta = np.broadcast_to(
        np.asarray(spec.damping_ratio if damping_ratio is None else damping_ratio, dtype=float), (samples,)
    )
    if not np.all(np.isfinite(zeta) & (zeta >= 0.0) & (zeta < 1.0)):
        raise InputValueError("damping_ratio: expected ratios >= 0 and below 1")
    n = len(names)
    mass = mf * np.array([m.mass for m in spec.masses])  # samples x n (diagonal)
    stiffness = np.zeros((samples, n, n))
    dashpots = np.zeros((n, n))
    for j, spring in enumerate(spec.springs):
        ends = [names.index(e) for e in (spring.node_a, spring.node_b) if e != GROUND]
        pattern = np.zeros((n, n))
        for a in ends:
            pattern[a, a] = 1.0
        if len(ends) == 2:
            pattern[ends[0], ends[1]] = pattern[ends[1], ends[0]] = -1.0
        stiffness += (kf[:, j] * spring.stiffness)[:, None, None] * pattern
        dashpots += spring.damping * pattern
    with blas_threads_for(2 * n):
        root = 1.0 / np.sqrt(mass)
        w2, v = np.linalg.eigh(root[:, :, None] * stiffness * root[:, None, :])
        w = np.sqrt(np.clip(w2, 0.0, None))
        phi = root[:, :, None] * v  # mass-normalized shapes
        if not np.any(dashpots):
            frequency = w / (2.0 * math.pi)
            ratio = np.broadcast_to(zeta[:, None], w.shape).copy()
            frequency[frequency <= 0.0] = np.nan
            ratio[np.isnan(frequency)] = np.nan
            return BatchModes(frequency, ratio)
        mp = mass[:, :, None] * phi
        damping = dashpots + np.einsum("sir,sr,sjr->sij", mp, 2.0 * zeta[:, None] * w, mp)
        state = np.zeros((samples, 2 * n, 2 * n))
        state[:, :n, n:] = np.eye(n)
        state[:, n:, :n] = -stiffness / mass[:, :, None]
        state[:, n:, n:] = -damping / mass[:, :, None]
        lam = np.linalg.eigvals(state)
    scale = np.abs(lam).max(axis=1, keepdims=True)
    oscillating = lam.imag > 1e-9 * scale  # one of each conjugate pair; overdamped roots are real
    size = np.where(oscillating, np.abs(lam), np.inf)
    order = np.argsort(size, axis=1)[:, :n]
    lam_sorted = np.take_along_axis(lam, order, axis=1)
    kept = np.isfinite(np.take_along_axis(size, order, axis=1))
    wn = np.where(kept, np.abs(lam_sorted), np.nan)
    return BatchModes(wn / (2.0 * math.pi), -lam_sorted.real / wn)
