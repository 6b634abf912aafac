"""Natural frequencies, damping and mode shapes of matrix models.

Undamped modes solve the generalized symmetric eigenproblem
``K phi = w^2 M phi`` (mass-normalized shapes). With damping, proportional
damping keeps the real shapes and gives each mode
``zeta_r = phi_r^T C phi_r / (2 w_r)``; general (non-proportional) damping is
solved exactly in first-order (state-space) form, whose complex eigenvalues
``lambda = -zeta wn +/- i wd`` give the natural frequency ``|lambda|`` and
damping ratio ``-Re(lambda) / |lambda|`` of each mode.

References
----------
.. [1] S. S. Rao, *Mechanical Vibrations*, 6th ed., 2017, ch. 6.
.. [2] M. I. Friswell, J. E. T. Penny, S. D. Garvey and A. W. Lees,
   *Dynamics of Rotating Machines*, Cambridge, 2010, sec. 2.5 (first-order form).
"""

from __future__ import annotations

import math
from dataclasses import dataclass, field
from typing import Literal

import numpy as np
import scipy.linalg

from ..core.errors import InputValueError
from ..core.inputs import as_si
from ..core.threads import blas_threads_for
from .damping import amplification_factor_from_damping_ratio, log_decrement
from .model import MatrixModel, matrix_model

__all__ = [
    "MODE_KINDS",
    "Mode",
    "ModeKind",
    "ModeSet",
    "balanced_state_matrix",
    "is_proportional",
    "modal_properties",
    "model_modes",
    "modes",
    "undamped_modes",
]

ModeSource = Literal["model", "rotor", "measured", "user"]
ModeKind = Literal["rotor-lateral", "structural", "torsional"]
MODE_KINDS: tuple[ModeKind, ...] = ("rotor-lateral", "structural", "torsional")


@dataclass(frozen=True)
class Mode:
    """One mode, from a model, a rotor analysis, a measurement or the user.

    Attributes
    ----------
    frequency : float
        Natural frequency [Hz] (undamped, ``|lambda| / 2 pi``).
    damping_ratio : float
        Damping ratio [-] (negative: unstable).
    label : str
        Name shown in tables.
    source : {"model", "rotor", "measured", "user"}
        Where the mode comes from.
    shape : numpy.ndarray or None
        Mode shape over the degrees of freedom, if known.
    whirl : {"forward", "backward"} or None
        Whirl direction of a rotor mode.
    amplification_factor_override : float or None
        An AF known directly (for example measured by the half-power method);
        otherwise AF is ``1 / (2 zeta)``.
    kind : {"rotor-lateral", "structural", "torsional"}
        What vibrates: a rotor's lateral (whirl) mode, a mode of the machine
        on its support or of the structure (the default), or a torsional mode
        of a drive train. It selects the margin rule (:mod:`resonance.checks.rules`).
        A measured mode keeps the kind of what was measured; ``source`` says
        it was measured.
    af_source : str
        Where the AF comes from, in words (for example ``"half-power of the
        computed unbalance response"``). Defaults to ``"1/(2 zeta) of the
        model's damping"``, or ``"given"`` with an override.
    """

    frequency: float
    damping_ratio: float
    label: str = "mode"
    source: ModeSource = "model"
    shape: np.ndarray | None = field(default=None, repr=False, compare=False)
    whirl: Literal["forward", "backward"] | None = None
    amplification_factor_override: float | None = None
    kind: ModeKind = "structural"
    af_source: str = ""

    def __post_init__(self) -> None:
        # Quantities (for example ureg("2400 cpm")) become floats in the package convention.
        try:
            frequency = as_si(self.frequency, f"{self.label}: frequency", "frequency")
            damping = as_si(self.damping_ratio, f"{self.label}: damping ratio", "ratio")
        except InputValueError:
            raise InputValueError(
                f"{self.label}: frequency {self.frequency!r} Hz, damping ratio {self.damping_ratio!r}; "
                "expected finite values"
            ) from None
        object.__setattr__(self, "frequency", frequency)
        object.__setattr__(self, "damping_ratio", damping)
        if not self.frequency > 0.0:
            raise InputValueError(f"{self.label}: frequency {self.frequency!r} Hz; expected a finite value > 0")
        af = self.amplification_factor_override
        if af is not None and not (af >= 1.0):
            raise InputValueError(f"{self.label}: amplification factor {af!r}; expected a value >= 1")
        if self.kind not in MODE_KINDS:
            raise InputValueError(f"{self.label}: kind {self.kind!r}; expected one of {MODE_KINDS}")
        if not self.af_source:
            default = "given" if af is not None else "1/(2 zeta) of the model's damping"
            object.__setattr__(self, "af_source", default)

    @property
    def amplification_factor(self) -> float:
        """Amplification factor [-]: the override, else ``1 / (2 zeta)``."""
        if self.amplification_factor_override is not None:
            return self.amplification_factor_override
        if self.damping_ratio <= 0.0:
            return math.inf
        return float(amplification_factor_from_damping_ratio(self.damping_ratio)[0])

    @property
    def log_decrement(self) -> float:
        """Logarithmic decrement [-]."""
        return float(log_decrement(self.damping_ratio)[0])

    @property
    def speed(self) -> float:
        """The frequency as a shaft speed [rpm] (1x coincidence)."""
        return 60.0 * self.frequency


@dataclass(frozen=True)
class ModeSet:
    """Modes of a matrix model, sorted by ascending natural frequency.

    Attributes
    ----------
    frequency : numpy.ndarray
        Natural frequencies [Hz] (``|lambda| / 2 pi`` when damped).
    damping_ratio : numpy.ndarray
        Modal damping ratios [-].
    shapes : numpy.ndarray
        Mode shapes, one column per mode (n x m); real and mass-normalized for
        undamped or proportionally damped models, complex and scaled to a
        largest component of 1 otherwise.
    eigenvalues : numpy.ndarray
        Complex eigenvalues ``-zeta wn + i wd`` [rad/s].
    proportional : bool
        True when the damping is proportional (real shapes).
    overdamped : int
        Number of overdamped (non-oscillating) modes left out of the set
        (general damping only).
    """

    frequency: np.ndarray
    damping_ratio: np.ndarray
    shapes: np.ndarray
    eigenvalues: np.ndarray
    proportional: bool
    overdamped: int = 0

    def __len__(self) -> int:
        return int(self.frequency.size)

    @property
    def damped_frequency(self) -> np.ndarray:
        """Damped natural frequencies ``Im(lambda) / 2 pi`` [Hz]."""
        return self.eigenvalues.imag / (2.0 * math.pi)

    @property
    def log_decrement(self) -> np.ndarray:
        """Logarithmic decrements [-]."""
        return log_decrement(self.damping_ratio)

    @property
    def amplification_factor(self) -> np.ndarray:
        """Amplification factors ``1 / (2 zeta)`` [-] (inf when undamped)."""
        return amplification_factor_from_damping_ratio(np.clip(self.damping_ratio, 0.0, None))

    def to_modes(self, prefix: str = "mode", source: ModeSource = "model") -> list[Mode]:
        """The set as a list of :class:`Mode` (rigid-body modes at 0 Hz left out)."""
        return [
            Mode(float(f), float(z), f"{prefix} {i + 1}", source, self.shapes[:, i])
            for i, (f, z) in enumerate(zip(self.frequency, self.damping_ratio, strict=True))
            if f > 0.0
        ]


def is_proportional(model: MatrixModel, shapes: np.ndarray, rtol: float = 1e-9) -> bool:
    """True when ``Phi^T C Phi`` is diagonal, i.e. the undamped shapes decouple C.

    Parameters
    ----------
    model : MatrixModel
        The model.
    shapes : numpy.ndarray
        Undamped mass-normalized shapes, one column per mode.
    rtol : float
        Largest off-diagonal term allowed, relative to the largest term.

    Returns
    -------
    bool

    Raises
    ------
    ValueError
        Shapes whose size does not match the model (from numpy).
    """
    modal_c = shapes.T @ model.damping @ shapes
    scale = float(np.abs(modal_c).max())
    if scale == 0.0:
        return True
    off = modal_c - np.diag(np.diag(modal_c))
    return float(np.abs(off).max()) <= rtol * scale


def undamped_modes(model: MatrixModel) -> tuple[np.ndarray, np.ndarray]:
    """Undamped natural circular frequencies [rad/s] and mass-normalized shapes of ``K phi = w^2 M phi``.

    Rigid-body modes (eigenvalues below 1e-12 of the largest) come out at exactly 0.

    Parameters
    ----------
    model : MatrixModel
        The model.

    Returns
    -------
    omega : numpy.ndarray
        Natural circular frequencies [rad/s], ascending.
    shapes : numpy.ndarray
        Mass-normalized shapes, one column per mode.

    Raises
    ------
    numpy.linalg.LinAlgError
        Never for a validated model (M positive definite, K semi-definite).
    """
    w2, phi = scipy.linalg.eigh(model.stiffness, model.mass)
    scale = max(float(np.abs(w2).max()), np.finfo(float).tiny)
    w2 = np.where(np.abs(w2) < 1e-12 * scale, 0.0, w2)  # rigid-body modes
    return np.sqrt(np.clip(w2, 0.0, None)), phi


def model_modes(model: MatrixModel) -> ModeSet:
    """Modes of a validated :class:`MatrixModel` (see :func:`modes`).

    Parameters
    ----------
    model : MatrixModel
        A validated model.

    Returns
    -------
    ModeSet
        Undamped, proportionally or generally damped modes (see :func:`modes`).

    Raises
    ------
    Nothing
        The model is validated; overdamped modes are counted and left out, not refused.
    """
    n = model.size
    with blas_threads_for(2 * n):
        w, phi = undamped_modes(model)
        if is_proportional(model, phi):
            cr = np.einsum("ir,ij,jr->r", phi, model.damping, phi)
            with np.errstate(divide="ignore", invalid="ignore"):
                zeta = np.where(w > 0.0, cr / (2.0 * w), 0.0)
            wd = w * np.sqrt(np.clip(1.0 - zeta**2, 0.0, None))
            lam = -zeta * w + 1j * wd
            return ModeSet(w / (2.0 * math.pi), zeta, phi, lam, True)
        a, phi, scale = balanced_state_matrix(model, (w, phi))
        lam, vectors = scipy.linalg.eig(a)
        oscillating = lam.imag > 1e-9 * np.abs(lam).max()
        lam = lam[oscillating]
        vectors = phi @ (vectors[:n, oscillating] / scale[:, None])
    order = np.argsort(np.abs(lam))
    lam, vectors = lam[order], vectors[:, order]
    wn = np.abs(lam)
    zeta = -lam.real / wn
    peak = vectors[np.argmax(np.abs(vectors), axis=0), np.arange(vectors.shape[1])]
    return ModeSet(wn / (2.0 * math.pi), zeta, vectors / peak, lam, False, n - int(lam.size))


def balanced_state_matrix(
    model: MatrixModel, undamped: tuple[np.ndarray, np.ndarray] | None = None
) -> tuple[np.ndarray, np.ndarray, np.ndarray]:
    """First-order form in undamped modal coordinates, balanced.

    With ``x = Phi q`` (mass-normalized Phi) and the state ``z = [S q; q']``,
    ``S = diag(w_r)`` (a reference frequency for rigid-body modes), the system
    matrix is ``[[0, S], [-W^2 S^-1, -Phi^T C Phi]]``, whose entries are all of
    the order of the natural frequencies.

    Parameters
    ----------
    model : MatrixModel
        The model.
    undamped : tuple of numpy.ndarray, optional
        Its undamped modes, when already solved (:func:`undamped_modes`).

    Returns
    -------
    a : numpy.ndarray
        The 2n x 2n system matrix.
    phi : numpy.ndarray
        Mass-normalized undamped shapes.
    scale : numpy.ndarray
        The diagonal of S [rad/s].

    Raises
    ------
    numpy.linalg.LinAlgError
        Never for a validated model.
    """
    n = model.size
    wr, phi = undamped if undamped is not None else undamped_modes(model)
    positive = wr[wr > 0.0]
    reference = float(positive.mean()) if positive.size else 1.0
    scale = np.where(wr > 0.0, wr, reference)
    a = np.zeros((2 * n, 2 * n))
    a[:n, n:] = np.diag(scale)
    a[n:, :n] = -np.diag(wr**2 / scale)
    a[n:, n:] = -(phi.T @ model.damping @ phi)
    return a, phi, scale


def modes(mass_matrix: object, stiffness_matrix: object, damping_matrix: object | None = None) -> ModeSet:
    """Natural frequencies, damping ratios and shapes of ``M x'' + C x' + K x = 0``.

    Parameters
    ----------
    mass_matrix : array_like or pint.Quantity
        [kg], n x n, symmetric positive definite.
    stiffness_matrix : array_like or pint.Quantity
        [N/m], symmetric positive semi-definite.
    damping_matrix : array_like or pint.Quantity, optional
        [N s/m], symmetric positive semi-definite; undamped modes if omitted.

    Returns
    -------
    ModeSet
        ``frequency`` [Hz] ascending, ``damping_ratio``, ``shapes`` and more.

    Raises
    ------
    InputValueError, InputTypeError
        Matrices that are not square, symmetric, finite, of one size, or M not positive definite.

    Notes
    -----
    Proportional damping (``Phi^T C Phi`` diagonal) keeps the real,
    mass-normalized undamped shapes. General damping uses the eigenvalues of
    the first-order form; overdamped modes, which do not oscillate, are left
    out and counted in ``overdamped``.

    References
    ----------
    Rao, *Mechanical Vibrations*, 6th ed., 2017, secs. 6.10 and 6.14;
    Friswell et al., *Dynamics of Rotating Machines*, 2010, sec. 2.5.

    Examples
    --------
    >>> result = modes([[2.0, 0.0], [0.0, 1.0]], [[6.0, -2.0], [-2.0, 4.0]])
    >>> (result.frequency * 2 * math.pi).round(6).tolist()
    [1.414214, 2.236068]
    """
    return modal_properties(matrix_model(mass_matrix, stiffness_matrix, damping_matrix))


#: The name of 0.1, kept working: the same function as :func:`model_modes` (functions on a
#: :class:`~resonance.dynamics.model.MatrixModel` are named ``model_*``, those on matrices have plain names).
modal_properties = model_modes
