"""Coast-down and run-up identification: resonances, AF, a modal fit, and the margin checks.

A resonance candidate is a peak of the (peak-preserving smoothed) amplitude;
it is confirmed when the phase lag changes through it by at least a set
angle (90 deg for an isolated, lightly damped mode; 45 deg by default to
allow for neighbours and runout). Its AF comes from the half-power points of
the raw amplitude, with a warning when too few samples fall within the
half-power band or the data are too noisy to trust it. The least-squares fit
adjusts ``n`` modes to the complex response (amplitude and phase together):

``X(W) = c + b W^2 + sum_r a_r W^2 / (w_r^2 - W^2 + 2 i zeta_r w_r W)``

with complex residues ``a_r``, offset ``c`` (runout) and a residual
``b W^2`` term for modes above the band solved linearly at every step
(variable projection); the standard errors come from the Jacobian at the
solution.

References
----------
.. [1] API RP 684, 2nd ed., 2005 (half-power AF on measured response; from memory).
.. [2] D. J. Ewins, *Modal Testing*, 2nd ed., 2000, sec. 4.4 (curve fitting).
.. [3] G. H. Golub and V. Pereyra, "The differentiation of pseudo-inverses and
   nonlinear least squares problems whose variables separate", SIAM J. Numer.
   Anal. 10(2), 1973 (variable projection).
"""

from __future__ import annotations

import math
from collections.abc import Sequence
from dataclasses import dataclass, field

import numpy as np
import scipy.optimize
import scipy.signal

from ...checks.excitations import Excitation
from ...checks.interference import FindingsTable, interference_check
from ...checks.margins import HalfPower, MarginRule, half_power_points
from ...checks.rules import RuleSet
from ...checks.speed_range import OperatingRange
from ...core.errors import InputValueError
from ...dynamics.modes import Mode, ModeKind
from .readers import CoastDown

__all__ = ["Resonance", "find_resonances", "ModalFit", "FittedMode", "fit_modes", "measured_modes", "measured_findings"]


@dataclass(frozen=True)
class Resonance:
    """A resonance found on a coast-down channel.

    Attributes
    ----------
    speed : float
        Peak speed [rpm] (interpolated when the half-power analysis succeeds).
    amplitude : float
        Peak 0-peak amplitude [m].
    phase_change : float
        Change of phase lag across the peak's half-power band (or its flanks) [deg].
    confirmed : bool
        True when ``phase_change`` reaches the confirmation angle.
    half_power : HalfPower or None
        Half-power analysis, when both points lie inside the data.
    warnings : tuple of str
        Why the AF may not be trusted (coarse or noisy data, unresolved points).
    """

    speed: float
    amplitude: float
    phase_change: float
    confirmed: bool
    half_power: HalfPower | None
    warnings: tuple[str, ...] = field(default=())

    @property
    def amplification_factor(self) -> float | None:
        """AF by the half-power method, or None when it could not be found."""
        return None if self.half_power is None else self.half_power.amplification_factor


def _band(speed: np.ndarray, band: tuple[float, float] | None) -> np.ndarray:
    if band is None:
        return np.ones(speed.size, dtype=bool)
    low, high = band
    if not low < high:
        raise InputValueError(f"band: got {band!r}; expected (low, high) with low < high [rpm]")
    mask = (speed >= low) & (speed <= high)
    if mask.sum() < 5:
        raise InputValueError(f"band: {band!r} holds {int(mask.sum())} readings; expected at least 5")
    return mask


def find_resonances(
    data: CoastDown,
    channel: str,
    band: tuple[float, float] | None = None,
    confirm_deg: float = 45.0,
    prominence: float = 0.1,
) -> list[Resonance]:
    """Resonances of one channel: amplitude peaks confirmed by the phase change.

    Parameters
    ----------
    data : CoastDown
        The measured coast-down or run-up.
    channel : str
        The channel to analyse.
    band : (float, float), optional
        Speeds to search [rpm].
    confirm_deg : float
        Phase change through a peak that confirms it [deg].
    prominence : float
        Minimum peak prominence as a fraction of the largest amplitude in the band.

    Returns
    -------
    list of Resonance
        Sorted by speed.

    Raises
    ------
    InputValueError
        An unknown channel, or a band holding fewer than 5 readings.
    """
    mask = _band(data.speed, band)
    speed = data.speed[mask]
    amplitude = data.amplitude(channel)[mask]
    lag = np.degrees(data.phase_lag(channel)[mask])
    window = min(len(speed) - (1 - len(speed) % 2), 7)
    smooth = scipy.signal.savgol_filter(amplitude, window, 2) if window >= 5 else amplitude
    peaks, _ = scipy.signal.find_peaks(smooth, prominence=prominence * float(amplitude.max()))
    noise = float(np.std(amplitude - smooth) / max(float(amplitude.max()), 1e-300))
    out = []
    for i in peaks:
        warnings = []
        hp: HalfPower | None
        try:
            hp = half_power_points(speed, amplitude, near=speed[i])
        except InputValueError as error:
            hp = None
            warnings.append(f"no AF: {error}")
        if hp is not None:
            inside = int(np.sum((speed > hp.lower) & (speed < hp.upper)))
            if inside < 3:
                warnings.append(
                    f"AF from {inside} readings inside the half-power band: the sweep is too coarse to trust it"
                )
            if noise > 0.05:
                warnings.append(f"noise {100 * noise:.0f} % of the peak: AF uncertain")
            lo, hi = hp.lower, hp.upper
        else:
            lo, hi = speed[max(i - 2, 0)], speed[min(i + 2, len(speed) - 1)]
        change = float(np.interp(hi, speed, lag) - np.interp(lo, speed, lag))
        peak_speed = hp.peak_frequency if hp is not None else float(speed[i])
        peak_amplitude = hp.peak_amplitude if hp is not None else float(amplitude[i])
        out.append(Resonance(peak_speed, peak_amplitude, change, abs(change) >= confirm_deg, hp, tuple(warnings)))
    return out


@dataclass(frozen=True)
class FittedMode:
    """A mode from the least-squares fit, with standard errors.

    Attributes
    ----------
    frequency : float
        Natural frequency [Hz].
    damping_ratio : float
        [-].
    frequency_std, damping_ratio_std : float
        Standard errors (sandwich estimator) [Hz], [-].
    residue : complex
        Modal constant of the response [m].
    """

    frequency: float
    damping_ratio: float
    frequency_std: float
    damping_ratio_std: float
    residue: complex

    @property
    def speed(self) -> float:
        """The 1x critical speed [rpm]."""
        return 60.0 * self.frequency

    @property
    def amplification_factor(self) -> float:
        """``1 / (2 zeta)`` [-]."""
        return 0.5 / self.damping_ratio


@dataclass(frozen=True)
class ModalFit:
    """Result of :func:`fit_modes`: the modes, the offset and the fitted curve.

    Attributes
    ----------
    modes : tuple of FittedMode
        By frequency.
    offset : complex
        Constant term (runout) [m].
    residual_term : complex
        Coefficient of the W^2 term standing for modes above the band [m].
    speed : numpy.ndarray
        Speeds fitted [rpm].
    fitted : numpy.ndarray
        The fitted complex response there [m].
    relative_residual : float
        ``||fitted - measured|| / ||measured||`` [-].
    """

    modes: tuple[FittedMode, ...]
    offset: complex
    residual_term: complex
    speed: np.ndarray
    fitted: np.ndarray
    relative_residual: float

    def evaluate(self, speed: np.ndarray) -> np.ndarray:
        """The fitted complex response at speeds [rpm]."""
        w = 2.0 * math.pi * np.asarray(speed, dtype=float) / 60.0
        w_max = 2.0 * math.pi * float(self.speed.max()) / 60.0
        out = self.offset + self.residual_term * (w / w_max) ** 2 + 0j
        for m in self.modes:
            wr = 2.0 * math.pi * m.frequency
            out += m.residue * w**2 / (wr**2 - w**2 + 2j * m.damping_ratio * wr * w)
        return out


def _basis(w: np.ndarray, theta: np.ndarray) -> np.ndarray:
    # Offset (runout) and a W^2 term standing for modes above the band, then one column per mode.
    n = theta.size // 2
    columns = [np.ones_like(w, dtype=complex), (w / w.max()) ** 2 + 0j]
    for r in range(n):
        wr, zeta = theta[2 * r], theta[2 * r + 1]
        columns.append(w**2 / (wr**2 - w**2 + 2j * zeta * wr * w))
    return np.stack(columns, axis=1)


def fit_modes(
    data: CoastDown,
    channel: str,
    initial: Sequence[tuple[float, float]],
    band: tuple[float, float] | None = None,
) -> ModalFit:
    """Fit modes to the complex response of one channel (amplitude and phase together).

    Parameters
    ----------
    data : CoastDown
        The measured coast-down or run-up.
    channel : str
        The channel to fit.
    initial : sequence of (speed [rpm], damping ratio)
        One starting guess per mode (for example from :func:`find_resonances`).
    band : (float, float), optional
        Speeds to fit [rpm].

    Returns
    -------
    ModalFit
        The fitted modes with their standard errors and the fit's residual.

    Raises
    ------
    InputValueError
        No initial guess, an unknown channel, or a band holding fewer than 5 readings.

    Notes
    -----
    Variable projection: only the frequencies and damping ratios are iterated; residues, the offset
    (runout) and a ``W^2`` term for modes above the band are solved linearly at each step. Residuals are
    weighted by ``1 / |x|`` (noise taken proportional to the reading, floored at 5 % of the peak). The
    standard errors come from the sandwich estimator ``(J^T J)^-1 J^T diag(r^2) J (J^T J)^-1`` on the
    fit's own residuals, so they stay honest when the noise is not what the weights assume; they do not
    include bias from a wrong model (too few modes, a non-viscous mechanism).

    References
    ----------
    G. H. Golub and V. Pereyra, "Separable nonlinear least squares: the variable projection method and its
    applications", Inverse Problems 19, 2003; H. White, "A heteroskedasticity-consistent covariance matrix
    estimator", Econometrica 48(4), 1980.
    """
    if not initial:
        raise InputValueError("initial: got none; expected one (speed, damping ratio) guess per mode")
    mask = _band(data.speed, band)
    speed = data.speed[mask]
    x = data.channel(channel)[mask]
    w = 2.0 * math.pi * speed / 60.0
    scale = float(np.abs(x).max())
    theta0 = np.array([v for s, z in initial for v in (2.0 * math.pi * s / 60.0, max(z, 1e-3))])
    # Relative weighting: amplitude and phase noise of field probes grows with the reading (floored at 5 % of
    # the peak, so near-zero readings cannot dominate).
    weight = 1.0 / np.maximum(np.abs(x), 0.05 * scale)

    def residual(theta: np.ndarray) -> np.ndarray:
        a = _basis(w, theta) * weight[:, None]
        coefficients, *_ = np.linalg.lstsq(a, x * weight, rcond=None)
        r = a @ coefficients - x * weight
        return np.concatenate([r.real, r.imag])

    lower = np.tile([0.2 * w.min(), 1e-4], len(initial))
    upper = np.tile([5.0 * w.max(), 0.9], len(initial))
    solution = scipy.optimize.least_squares(
        residual, np.clip(theta0, lower * 1.0001, upper * 0.9999), bounds=(lower, upper), x_scale="jac"
    )
    theta = solution.x
    a = _basis(w, theta)
    coefficients, *_ = np.linalg.lstsq(a * weight[:, None], x * weight, rcond=None)
    coefficients = coefficients / scale
    # Standard errors by the sandwich (heteroscedasticity-consistent) estimator from the residuals
    # themselves: valid whatever the noise's size pattern, where (J^T J)^-1 s^2 assumes it is the weights'.
    jac, res = solution.jac, solution.fun
    dof = max(2 * x.size - theta.size - 2 * a.shape[1], 1)
    try:
        bread = np.linalg.inv(jac.T @ jac)
        meat = (jac * (res**2)[:, None]).T @ jac * (2 * x.size / dof)
        std = np.sqrt(np.clip(np.diag(bread @ meat @ bread), 0.0, None))
    except np.linalg.LinAlgError:
        std = np.full(theta.size, np.inf)
    modes = tuple(
        FittedMode(
            theta[2 * r] / (2.0 * math.pi),
            theta[2 * r + 1],
            std[2 * r] / (2.0 * math.pi),
            std[2 * r + 1],
            complex(coefficients[r + 2] * scale),
        )
        for r in range(len(initial))
    )
    fitted = a @ coefficients * scale
    relative = float(np.linalg.norm(fitted - x) / np.linalg.norm(x))
    order = np.argsort([m.frequency for m in modes])
    return ModalFit(
        tuple(modes[i] for i in order),
        complex(coefficients[0] * scale),
        complex(coefficients[1] * scale),
        speed,
        fitted,
        relative,
    )


def measured_modes(
    resonances: Sequence[Resonance], fit: ModalFit | None = None, kind: ModeKind = "structural"
) -> list[Mode]:
    """Measured modes for the checks: each confirmed resonance, with its half-power AF (or the fit's).

    Parameters
    ----------
    resonances : sequence of Resonance
        From :func:`find_resonances`; only confirmed ones become modes.
    fit : ModalFit, optional
        The modal fit, whose damping (and AF, where the half-power points were
        not resolved) is used.
    kind : {"structural", "rotor-lateral", "torsional"}
        What was measured (a casing or support: structural; a shaft probe:
        rotor lateral); it selects the margin rule.

    Returns
    -------
    list of Mode
        Source ``"measured"``, with the AF source in words.

    Raises
    ------
    InputValueError
        A kind that is not a mode kind.
    """
    out = []
    for i, res in enumerate(r for r in resonances if r.confirmed):
        af = res.amplification_factor
        source = "measured: half-power of the coast-down"
        zeta = 0.5 / af if af else 0.05
        if fit is not None and fit.modes:
            nearest = min(fit.modes, key=lambda m: abs(m.speed - res.speed))
            zeta = nearest.damping_ratio
            if af is None:
                af = nearest.amplification_factor
                source = "measured: 1/(2 zeta) of the coast-down modal fit"
        elif af is None:
            source = "not resolved by the coast-down (no half-power points); 1/(2 zeta) of an assumed 0.05"
        out.append(
            Mode(
                res.speed / 60.0,
                zeta,
                f"measured {i + 1} at {res.speed:.0f} rpm",
                "measured",
                amplification_factor_override=None if af is None else max(af, 1.0),
                kind=kind,
                af_source=source,
            )
        )
    return out


def measured_findings(
    modes: Sequence[Mode],
    excitations: Sequence[Excitation],
    speed_range: OperatingRange,
    rules: RuleSet | MarginRule | None = None,
) -> FindingsTable:
    """The interference check of measured modes (the same rules, in the same scopes, as the model checks).

    Parameters
    ----------
    modes : sequence of Mode
        Measured modes (:func:`measured_modes`).
    excitations : sequence of Excitation
        The scenario's excitations.
    speed_range : OperatingRange
        The speeds of continuous operation [rpm].
    rules : RuleSet or MarginRule, optional
        The scenario's rules.

    Returns
    -------
    FindingsTable
        One finding per measured mode and excitation, worst first.

    Raises
    ------
    InputValueError, InputTypeError
        As :func:`resonance.checks.interference.interference_check`.
    """
    return interference_check(list(modes), list(excitations), speed_range, rules)
