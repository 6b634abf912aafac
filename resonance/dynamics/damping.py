"""Damping measures and damping matrices.

Conversions between damping ratio, logarithmic decrement and amplification
factor, and the damping matrices of many-degree-of-freedom models: Rayleigh
(proportional), modal ratios, and discrete dashpots (see
:mod:`resonance.dynamics.model`).

References
----------
.. [1] S. S. Rao, *Mechanical Vibrations*, 6th ed., 2017, sec. 2.6 (log
   decrement) and sec. 6.14 (proportional damping).
.. [2] API RP 684, *Rotordynamic Tutorial*, 2nd ed., 2005 (amplification
   factor; from memory).
"""

from __future__ import annotations

import math

import numpy as np
import scipy.linalg

from ..core.errors import InputValueError
from ..core.inputs import as_matrix, as_si, as_si_array

__all__ = [
    "amplification_factor_from_damping_ratio",
    "damping_ratio_from_amplification_factor",
    "damping_ratio_from_log_decrement",
    "log_decrement",
    "modal_damping",
    "rayleigh_coefficients",
    "rayleigh_damping",
]


def log_decrement(damping_ratio: object) -> np.ndarray:
    """Logarithmic decrement ``delta = 2 pi zeta / sqrt(1 - zeta^2)``.

    Parameters
    ----------
    damping_ratio : array_like
        Damping ratio(s) [-]; negative means an unstable mode.

    Returns
    -------
    numpy.ndarray
        Log decrement [-]; ``inf`` at and above critical damping (``|zeta| >= 1``).

    Raises
    ------
    InputValueError, InputTypeError
        A value that is not a finite number.

    Examples
    --------
    >>> round(float(log_decrement(0.1)[0]), 4)
    0.6315
    """
    zeta = as_si_array(damping_ratio, "damping_ratio", "ratio")
    with np.errstate(divide="ignore", invalid="ignore"):
        delta = 2.0 * np.pi * zeta / np.sqrt(1.0 - zeta**2)
    return np.where(np.abs(zeta) >= 1.0, np.copysign(np.inf, zeta), delta)


def damping_ratio_from_log_decrement(log_decrement: object) -> np.ndarray:
    """Damping ratio from a log decrement, ``zeta = delta / sqrt(4 pi^2 + delta^2)``.

    The inverse of :func:`log_decrement`.

    Parameters
    ----------
    log_decrement : array_like
        Logarithmic decrement(s) [-]; negative for an unstable mode.

    Returns
    -------
    numpy.ndarray
        Damping ratio(s) [-].

    Raises
    ------
    InputValueError, InputTypeError
        A value that is not a finite number.
    """
    delta = as_si_array(log_decrement, "log_decrement", "ratio")
    return delta / np.sqrt(4.0 * np.pi**2 + delta**2)


def amplification_factor_from_damping_ratio(damping_ratio: object) -> np.ndarray:
    """Amplification factor of a lightly damped mode, ``AF = 1 / (2 zeta)`` (= Q).

    Parameters
    ----------
    damping_ratio : array_like
        Damping ratio(s) [-] (>= 0).

    Returns
    -------
    numpy.ndarray
        AF [-]; ``inf`` for zero damping.

    Raises
    ------
    InputValueError, InputTypeError
        A negative or non-finite value.

    References
    ----------
    API RP 684, 2nd ed., 2005 (AF = Q for light damping; from memory).
    """
    zeta = as_si_array(damping_ratio, "damping_ratio", "ratio", "nonnegative")
    with np.errstate(divide="ignore"):
        return 1.0 / (2.0 * zeta)


def damping_ratio_from_amplification_factor(amplification_factor: object) -> np.ndarray:
    """Damping ratio of a lightly damped mode, ``zeta = 1 / (2 AF)``.

    Parameters
    ----------
    amplification_factor : array_like
        AF [-] (>= 1).

    Returns
    -------
    numpy.ndarray
        ``zeta = 1 / (2 AF)`` [-].

    Raises
    ------
    InputValueError
        If an AF is below 1 (no amplification is not a resonance).
    """
    af = as_si_array(amplification_factor, "amplification_factor", "ratio")
    if np.any(af < 1.0):
        raise InputValueError(f"amplification_factor: got {af[af < 1.0][0]:g}; expected a value >= 1")
    return 1.0 / (2.0 * af)


def rayleigh_coefficients(
    frequency_1: object, damping_ratio_1: object, frequency_2: object, damping_ratio_2: object
) -> tuple[float, float]:
    """Rayleigh coefficients ``(alpha, beta)`` that give two modal damping ratios.

    ``zeta(w) = alpha / (2 w) + beta w / 2`` passes through both points.

    Parameters
    ----------
    frequency_1, frequency_2 : float or pint.Quantity
        Two distinct natural frequencies [Hz] (> 0).
    damping_ratio_1, damping_ratio_2 : float
        The damping ratios wanted at them [-] (>= 0).

    Returns
    -------
    alpha : float
        Mass-proportional coefficient [1/s].
    beta : float
        Stiffness-proportional coefficient [s].

    Raises
    ------
    InputValueError, InputTypeError
        Non-positive or equal frequencies, negative damping, a quantity of the wrong kind.

    References
    ----------
    R. W. Clough and J. Penzien, *Dynamics of Structures*, 2nd ed., 1993, sec. 12-4.
    """
    f1 = as_si(frequency_1, "frequency_1", "frequency", "positive")
    f2 = as_si(frequency_2, "frequency_2", "frequency", "positive")
    z1 = as_si(damping_ratio_1, "damping_ratio_1", "ratio", "nonnegative")
    z2 = as_si(damping_ratio_2, "damping_ratio_2", "ratio", "nonnegative")
    if f1 == f2:
        raise InputValueError(f"frequency_2: got {f2:g} Hz, equal to frequency_1; expected two distinct frequencies")
    w1, w2 = 2.0 * math.pi * f1, 2.0 * math.pi * f2
    beta = 2.0 * (z2 * w2 - z1 * w1) / (w2**2 - w1**2)
    alpha = 2.0 * z1 * w1 - beta * w1**2
    return alpha, beta


def rayleigh_damping(mass_matrix: object, stiffness_matrix: object, alpha: float, beta: float) -> np.ndarray:
    """Rayleigh damping matrix ``C = alpha M + beta K`` [N s/m].

    Parameters
    ----------
    mass_matrix, stiffness_matrix : array_like or pint.Quantity
        Symmetric M [kg] and K [N/m] of the same size.
    alpha : float
        Mass coefficient [1/s] (>= 0).
    beta : float
        Stiffness coefficient [s] (>= 0).

    Returns
    -------
    numpy.ndarray
        ``C = alpha M + beta K`` [N s/m].

    Raises
    ------
    InputValueError, InputTypeError
        Matrices that are not square, symmetric, finite or of one size; negative or non-finite coefficients.
    """
    m = as_matrix(mass_matrix, "mass_matrix", "mass")
    k = as_matrix(stiffness_matrix, "stiffness_matrix", "stiffness", m.shape[0])
    a = as_si(alpha, "alpha", "ratio", "nonnegative")  # [1/s]
    b = as_si(beta, "beta", "ratio", "nonnegative")  # [s]
    return a * m + b * k


def modal_damping(mass_matrix: object, stiffness_matrix: object, damping_ratios: object) -> np.ndarray:
    """Damping matrix that gives each undamped mode its own damping ratio.

    ``C = M Phi diag(2 zeta_r w_r) Phi^T M`` with mass-normalized shapes Phi.

    Parameters
    ----------
    mass_matrix, stiffness_matrix : array_like
        [kg], [N/m], n x n.
    damping_ratios : array_like
        One ratio per mode (ascending frequency), or a single ratio for all.

    Returns
    -------
    numpy.ndarray
        Damping matrix [N s/m].

    Raises
    ------
    InputValueError, InputTypeError
        Bad matrices or damping ratios (see :func:`resonance.core.inputs.as_matrix`).

    References
    ----------
    R. W. Clough and J. Penzien, *Dynamics of Structures*, 2nd ed., 1993, sec. 12-5.
    """
    m = as_matrix(mass_matrix, "mass_matrix", "mass")
    k = as_matrix(stiffness_matrix, "stiffness_matrix", "stiffness", m.shape[0])
    n = m.shape[0]
    zeta = as_si_array(damping_ratios, "damping_ratios", "ratio", "nonnegative")
    if zeta.size == 1:
        zeta = np.full(n, zeta[0])
    if zeta.size != n:
        raise InputValueError(f"damping_ratios: got {zeta.size} ratios; expected 1 or {n} (one per mode)")
    w2, phi = scipy.linalg.eigh(k, m)
    w = np.sqrt(np.clip(w2, 0.0, None))
    mp = m @ phi
    return (mp * (2.0 * zeta * w)) @ mp.T
