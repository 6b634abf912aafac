"""Frequency response functions of matrix models: receptance, mobility, accelerance.

``H(w) = (K - w^2 M + i w C)^-1`` is the displacement per unit harmonic force
(force ``F e^{i w t}``). One column (the force at ``input_dof``) is computed
for many frequencies at once:

* ``"modal"``: modal superposition over the real undamped modes, exact for
  undamped and proportionally damped models;
* ``"state-space"``: expansion over the complex modes of the first-order form,
  exact for general (non-proportional) damping;
* ``"direct"``: a linear solve at every frequency (the slow reference);
* ``"auto"`` (default): modal when the damping is proportional, else
  state-space.

References
----------
.. [1] D. J. Ewins, *Modal Testing: Theory, Practice and Application*, 2nd ed.,
   Research Studies Press, 2000, secs. 2.3-2.6.
.. [2] M. I. Friswell, J. E. T. Penny, S. D. Garvey and A. W. Lees,
   *Dynamics of Rotating Machines*, Cambridge, 2010, sec. 2.5.
"""

from __future__ import annotations

import math
from typing import Literal

import numpy as np
import scipy.linalg

from ..core.inputs import as_si_array
from ..core.threads import blas_threads_for
from .model import MatrixModel, check_dof, matrix_model
from .modes import balanced_state_matrix, is_proportional, undamped_modes

__all__ = ["FrfMethod", "accelerance", "mobility", "model_receptance", "receptance"]

FrfMethod = Literal["auto", "modal", "state-space", "direct"]
_METHODS = ("auto", "modal", "state-space", "direct")

# Frequencies per batched direct solve (keeps memory near 64 MB at n = 100).
_DIRECT_CHUNK_BYTES = 64 * 2**20


def _modal(model: MatrixModel, w: np.ndarray, j: int, undamped: tuple[np.ndarray, np.ndarray] | None) -> np.ndarray:
    wr, phi = undamped if undamped is not None else undamped_modes(model)
    cr = np.einsum("ir,ij,jr->r", phi, model.damping, phi)  # = 2 zeta_r w_r
    denominator = wr[None, :] ** 2 - w[:, None] ** 2 + 1j * w[:, None] * cr[None, :]
    return (phi[j][None, :] / denominator) @ phi.T


def _state_space(
    model: MatrixModel, w: np.ndarray, j: int, undamped: tuple[np.ndarray, np.ndarray] | None
) -> np.ndarray:
    # In undamped modal coordinates q (x = Phi q) the first-order form with the
    # state z = [S q; q'] is balanced (entries of the order of w_r), which keeps
    # its eigenvectors well conditioned; in physical coordinates the blocks
    # differ by w^2 and the expansion loses many digits.
    #   x = Phi [S^-1 0] V diag(1 / (i w - lambda)) V^-1 [0; Phi^T e_j]
    a, phi, scale = balanced_state_matrix(model, undamped)
    n = model.size
    lam, vectors = scipy.linalg.eig(a)
    load = np.zeros(2 * n)
    load[n:] = phi[j]
    participation = scipy.linalg.solve(vectors, load)
    displacement_rows = phi @ (vectors[:n] / scale[:, None])
    return (participation[None, :] / (1j * w[:, None] - lam[None, :])) @ displacement_rows.T


def _direct(model: MatrixModel, w: np.ndarray, j: int) -> np.ndarray:
    n = model.size
    rhs = np.zeros((n, 1), dtype=complex)
    rhs[j] = 1.0
    chunk = max(1, _DIRECT_CHUNK_BYTES // (16 * n * n))
    out = np.empty((w.size, n), dtype=complex)
    for start in range(0, w.size, chunk):
        ws = w[start : start + chunk, None, None]
        dynamic = model.stiffness - ws**2 * model.mass + 1j * ws * model.damping
        out[start : start + chunk] = np.linalg.solve(dynamic, rhs)[..., 0]
    return out


def model_receptance(model: MatrixModel, frequency: object, input_dof: int, method: FrfMethod = "auto") -> np.ndarray:
    """Receptance column of a validated :class:`MatrixModel` (see :func:`receptance`).

    Parameters
    ----------
    model : MatrixModel
        The model.
    frequency : array_like or pint.Quantity
        Frequencies [Hz] (>= 0).
    input_dof : int
        Index of the degree of freedom where the force acts.
    method : {"auto", "modal", "state-space", "direct"}
        Solution method.

    Returns
    -------
    numpy.ndarray of complex, shape (len(frequency), n)
        Receptance [m/N] (see :func:`receptance`).

    Raises
    ------
    InputValueError, InputTypeError
        Bad frequencies or degree of freedom.
    ValueError
        An unknown method.
    """
    if method not in _METHODS:
        raise ValueError(f"method: got {method!r}; expected one of {list(_METHODS)}")
    j = check_dof(input_dof, model.size, "input_dof")
    w = 2.0 * math.pi * as_si_array(frequency, "frequency", "frequency", "nonnegative")
    with blas_threads_for(2 * model.size):
        undamped = None
        if method == "auto":
            undamped = undamped_modes(model)
            method = "modal" if is_proportional(model, undamped[1]) else "state-space"
        if method == "modal":
            return _modal(model, w, j, undamped)
        if method == "state-space":
            return _state_space(model, w, j, undamped)
        return _direct(model, w, j)


def receptance(
    mass_matrix: object,
    stiffness_matrix: object,
    damping_matrix: object | None,
    frequency: object,
    input_dof: int,
    method: FrfMethod = "auto",
) -> np.ndarray:
    """Receptance: displacement at every degree of freedom per unit force at one.

    Parameters
    ----------
    mass_matrix, stiffness_matrix : array_like or pint.Quantity
        [kg] and [N/m], n x n, symmetric (M positive definite).
    damping_matrix : array_like or pint.Quantity or None
        Viscous damping [N s/m], symmetric; None for undamped.
    frequency : array_like or pint.Quantity
        Frequencies [Hz] (>= 0).
    input_dof : int
        Index of the degree of freedom where the force acts.
    method : {"auto", "modal", "state-space", "direct"}
        Solution method (see the module notes); ``"modal"`` is exact only for
        proportional damping.

    Returns
    -------
    numpy.ndarray of complex, shape (len(frequency), n)
        ``H[i, r]``: displacement at dof ``r`` per unit force at ``input_dof``,
        at ``frequency[i]`` [m/N]; the phase lag is ``-angle(H)``.

    Raises
    ------
    InputValueError, InputTypeError
        Bad matrices (not square, symmetric, finite, definite), frequencies or degree of freedom.
    ValueError
        An unknown method.

    References
    ----------
    Ewins, *Modal Testing*, 2nd ed., 2000, eqs. 2.59 and 2.88.

    Examples
    --------
    >>> h = receptance([[1.0]], [[1.0e4]], None, [0.0], 0)
    >>> complex(h[0, 0])
    (0.0001+0j)
    """
    model = matrix_model(mass_matrix, stiffness_matrix, damping_matrix)
    return model_receptance(model, frequency, input_dof, method)


def _derivative(
    order: int,
    mass_matrix: object,
    stiffness_matrix: object,
    damping_matrix: object | None,
    frequency: object,
    input_dof: int,
    method: FrfMethod,
) -> np.ndarray:
    # Velocity and acceleration of a harmonic motion: (i w)^order times the displacement.
    h = receptance(mass_matrix, stiffness_matrix, damping_matrix, frequency, input_dof, method)
    w = 2.0 * math.pi * as_si_array(frequency, "frequency", "frequency", "nonnegative")
    return (1j * w[:, None]) ** order * h


def mobility(
    mass_matrix: object,
    stiffness_matrix: object,
    damping_matrix: object | None,
    frequency: object,
    input_dof: int,
    method: FrfMethod = "auto",
) -> np.ndarray:
    """Mobility ``i w H``: velocity per unit force [m/(N s)]; see :func:`receptance`.

    Parameters
    ----------
    mass_matrix, stiffness_matrix, damping_matrix, frequency, input_dof, method
        As :func:`receptance`.

    Returns
    -------
    numpy.ndarray of complex
        Mobility [m/(N s)].

    Raises
    ------
    InputValueError, InputTypeError, ValueError
        As :func:`receptance`.
    """
    return _derivative(1, mass_matrix, stiffness_matrix, damping_matrix, frequency, input_dof, method)


def accelerance(
    mass_matrix: object,
    stiffness_matrix: object,
    damping_matrix: object | None,
    frequency: object,
    input_dof: int,
    method: FrfMethod = "auto",
) -> np.ndarray:
    """Accelerance ``-w^2 H``: acceleration per unit force [m/(N s^2)]; see :func:`receptance`.

    Parameters
    ----------
    mass_matrix, stiffness_matrix, damping_matrix, frequency, input_dof, method
        As :func:`receptance`.

    Returns
    -------
    numpy.ndarray of complex
        Accelerance [m/(N s^2)].

    Raises
    ------
    InputValueError, InputTypeError, ValueError
        As :func:`receptance`.
    """
    return _derivative(2, mass_matrix, stiffness_matrix, damping_matrix, frequency, input_dof, method)
