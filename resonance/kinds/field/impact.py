"""Impact (bump) tests: H1 frequency response and coherence, and modal identification.

* :func:`impact_frf`: split a record into hits by a force trigger, apply a
  force window (the pulse kept, the rest zeroed) and an exponential window
  (both channels, so the FRF is that of the system with added damping
  ``1 / tau``, removed again by the identification), and average
  ``H1 = S_fx / S_ff`` with coherence ``|S_fx|^2 / (S_ff S_xx)``.
* :func:`peak_pick`: natural frequency and damping by the half-power method.
* :func:`circle_fit`: Kennedy-Pancu circle fit of the mobility near a peak.
* :func:`rfp_fit`: rational-fraction polynomial fit in a band, and
  :func:`stability_diagram` over model orders.

References
----------
.. [1] J. S. Bendat and A. G. Piersol, *Random Data*, 4th ed., Wiley, 2010, sec. 9.1 (H1, coherence).
.. [2] D. J. Ewins, *Modal Testing*, 2nd ed., 2000, sec. 3.6 (impact windows), 4.3 (peak picking),
   4.4 (circle fit; from memory).
.. [3] M. H. Richardson and D. L. Formenti, "Parameter estimation from frequency response
   measurements using rational fraction polynomials", Proc. 1st IMAC, 1982.
"""

from __future__ import annotations

import itertools
import math
from dataclasses import dataclass

import numpy as np

from ...checks.margins import half_power_points
from ...core.errors import InputValueError
from ...core.inputs import as_si
from .readers import ImpactRecord

__all__ = ["Frf", "impact_frf", "h1_estimate", "peak_pick", "circle_fit", "rfp_fit", "stability_diagram", "Pole"]


@dataclass(frozen=True)
class Frf:
    """An estimated frequency response: ``h`` [response unit / N] and ``coherence`` at ``frequency`` [Hz].

    ``quantity`` says what the response is (displacement, velocity or acceleration);
    ``exponential_tau`` is the exponential window's time constant [s] (inf: none).

    Attributes
    ----------
    frequency : numpy.ndarray
        [Hz].
    h : numpy.ndarray
        H1 estimate [response unit / N] (of the windowed records).
    coherence : numpy.ndarray
        [-].
    averages : int
        Number of hits averaged.
    quantity : {"displacement", "velocity", "acceleration"}
        What the response channel measures.
    exponential_tau : float
        Time constant of the exponential window [s]; ``inf`` without one.
    """

    frequency: np.ndarray
    h: np.ndarray
    coherence: np.ndarray
    averages: int
    quantity: str
    exponential_tau: float

    @property
    def sigma(self) -> float:
        """Decay rate the exponential window adds to every pole, ``1 / tau`` [1/s] (0 without a window)."""
        return 1.0 / self.exponential_tau if math.isfinite(self.exponential_tau) else 0.0

    @property
    def s(self) -> np.ndarray:
        """Where the estimate samples the system's transfer function: ``s = i w + 1 / tau`` [rad/s].

        Both channels windowed by ``exp(-t / tau)`` turn the Fourier transforms into Laplace transforms
        at ``i w + 1 / tau``, so H1 estimates the system's FRF there, not at ``i w``.
        """
        return 1j * 2.0 * math.pi * self.frequency + self.sigma

    def receptance(self) -> np.ndarray:
        """The FRF as displacement per force [m/N]: ``h / s^k`` at ``s = i w + 1 / tau`` (k = 1, 2 for v, a).

        Dividing by ``(i w)^k`` instead would distort the curve near low modes when a window is applied.
        """
        k = {"displacement": 0, "velocity": 1, "acceleration": 2}[self.quantity]
        s = self.s
        with np.errstate(divide="ignore", invalid="ignore"):
            return np.where(np.abs(s) > 0, self.h / s**k, 0.0)

    def mobility(self) -> np.ndarray:
        """The FRF as velocity per force [m/(N s)]: ``s`` times the receptance."""
        return self.s * self.receptance()

    def relative_std(self, floor: float = 1e-3) -> np.ndarray:
        """Relative standard deviation of the estimate from its coherence (at least ``floor``).

        ``std|H1| / |H1| = sqrt((1 - g^2) / (2 n_d g^2))`` with ``n_d`` averages (Bendat & Piersol, *Random
        Data*, 4th ed., 2010, table 9.6); with one average the coherence says nothing and the floor is used.
        """
        g2 = np.clip(self.coherence, 1e-12, 1.0)
        if self.averages < 2:
            return np.full(g2.shape, floor)
        return np.maximum(np.sqrt((1.0 - g2) / (2.0 * self.averages * g2)), floor)


def h1_estimate(
    force: np.ndarray, response: np.ndarray, sample_rate: float
) -> tuple[np.ndarray, np.ndarray, np.ndarray]:
    """Average H1 and coherence over records (rows) of force and response.

    Parameters
    ----------
    force, response : numpy.ndarray
        Shape (records, samples), already windowed.
    sample_rate : float
        [Hz].

    Returns
    -------
    frequency, h1, coherence : numpy.ndarray

    Raises
    ------
    ValueError
        Force and response of different shapes (from numpy).
    """
    f = np.fft.rfft(force, axis=1)
    x = np.fft.rfft(response, axis=1)
    s_ff = np.mean(np.abs(f) ** 2, axis=0)
    s_xx = np.mean(np.abs(x) ** 2, axis=0)
    s_fx = np.mean(np.conj(f) * x, axis=0)
    with np.errstate(divide="ignore", invalid="ignore"):
        h1 = s_fx / s_ff
        coherence = np.abs(s_fx) ** 2 / (s_ff * s_xx)
    return np.fft.rfftfreq(force.shape[1], 1.0 / sample_rate), h1, np.nan_to_num(coherence)


def impact_frf(
    record: ImpactRecord,
    channel: str,
    record_length: float,
    trigger: float = 0.2,
    pretrigger: float = 0.005,
    force_window: float | None = None,
    exponential_tau: float | None = None,
) -> Frf:
    """H1 FRF of one response channel from a series of hammer hits.

    Parameters
    ----------
    record : ImpactRecord
        Force and responses of the hits.
    channel : str
        Response channel name.
    record_length : float
        Length of each hit's record [s].
    trigger : float
        Force level that starts a hit, as a fraction of the largest force.
    pretrigger : float
        Time kept before the trigger [s].
    force_window : float, optional
        Length kept of the force signal after the record start [s]; by default
        twice the pulse (from the trigger until the force falls below 5 % of its peak).
    exponential_tau : float, optional
        Time constant of the exponential window [s]; by default a quarter of the record.

    Returns
    -------
    Frf
        H1 [response unit / N] and coherence over frequency, with the window's time constant.

    Raises
    ------
    InputValueError
        No hit found, a hit too close to the end, or a bad channel.
    """
    if channel not in record.responses:
        raise InputValueError(f"channel: got {channel!r}; expected one of {sorted(record.responses)}")
    fs = record.sample_rate
    record_length = as_si(record_length, "record_length", "time", "positive")
    n = round(record_length * fs)
    if n < 16:
        raise InputValueError(
            f"record_length: got {record_length:g} s, {n} samples at {fs:g} Hz; expected at least 16 samples per hit"
        )
    pre = round(pretrigger * fs)
    force = record.force
    level = trigger * float(np.max(np.abs(force)))
    if level <= 0:
        raise InputValueError(f"{record.source}: the force channel is zero; no hit to analyse")
    above = np.flatnonzero(np.abs(force) >= level)
    starts = [int(above[0])]
    for i in above[1:]:
        if i >= starts[-1] + n:
            starts.append(int(i))
    starts = [s - pre for s in starts if s - pre >= 0 and s - pre + n <= force.size]
    if not starts:
        raise InputValueError(f"{record.source}: no complete hit of {record_length:g} s found; shorten record_length")
    tau = exponential_tau if exponential_tau is not None else record_length / 4.0
    t = np.arange(n) / fs
    exponential = np.exp(-t / tau)
    forces, responses = [], []
    for s in starts:
        f = force[s : s + n].copy()
        if force_window is None:
            peak = int(np.argmax(np.abs(f)))
            below = np.flatnonzero(np.abs(f[peak:]) < 0.05 * abs(f[peak]))
            end = min(n, peak + 2 * (int(below[0]) if below.size else n))
        else:
            end = min(n, round(force_window * fs))
        f[end:] = 0.0
        forces.append(f * exponential)
        responses.append(record.responses[channel][s : s + n] * exponential)
    frequency, h, coherence = h1_estimate(np.array(forces), np.array(responses), fs)
    return Frf(frequency, h, coherence, len(starts), record.quantity, tau)


@dataclass(frozen=True)
class Pole:
    """An identified mode: natural frequency [Hz] and damping ratio [-] (window damping removed).

    Attributes
    ----------
    frequency : float
        Natural frequency [Hz].
    damping_ratio : float
        [-].
    """

    frequency: float
    damping_ratio: float


def _unwindowed(frf: Frf, frequency: float, zeta: float) -> Pole:
    """The system's pole from one identified on the windowed curve as a function of ``i w``.

    A curve ``G(i w + sigma)`` read as a function of ``i w`` has the poles ``p - sigma``: the window's
    decay is added to each pole exactly, ``p = p_measured + sigma`` (no small-damping approximation).
    """
    wn = 2.0 * math.pi * frequency
    measured = complex(-zeta * wn, wn * math.sqrt(max(1.0 - zeta * zeta, 0.0)))
    p = measured + frf.sigma
    return Pole(abs(p) / (2.0 * math.pi), -p.real / abs(p))


def _band_mask(frf: Frf, band: tuple[float, float]) -> np.ndarray:
    low, high = band
    mask = (frf.frequency >= low) & (frf.frequency <= high)
    if not low < high or mask.sum() < 5:
        raise InputValueError(
            f"band: got {band!r} with {int(mask.sum())} frequencies; expected low < high and at least 5"
        )
    return mask


def peak_pick(frf: Frf, band: tuple[float, float]) -> Pole:
    """Natural frequency and damping of the peak in a band by the half-power method on ``|receptance|``.

    Parameters
    ----------
    frf : Frf
        The estimate.
    band : (float, float)
        Frequencies [Hz] holding one peak.

    Returns
    -------
    Pole
        The system's natural frequency [Hz] and damping ratio (the window's decay removed).

    Raises
    ------
    InputValueError
        A band with fewer than 5 lines, or a half-power point outside it.
    """
    mask = _band_mask(frf, band)
    hp = half_power_points(frf.frequency[mask], np.abs(frf.receptance()[mask]))
    return _unwindowed(frf, hp.peak_frequency, hp.damping_ratio)


def circle_fit(frf: Frf, band: tuple[float, float]) -> Pole:
    """Kennedy-Pancu circle fit of the mobility in a band around one mode.

    The mobility of a viscously damped mode traces a circle in the Nyquist
    plane; the natural frequency is where the angle along the circle changes
    fastest with frequency, and the damping follows from the angles of the
    points either side: ``zeta = (w_a^2 - w_b^2) / (2 w_n (w_a tan(t_a / 2) + w_b tan(t_b / 2)))``.

    Parameters
    ----------
    frf : Frf
        The estimate.
    band : (float, float)
        Frequencies [Hz] around one mode.

    Returns
    -------
    Pole
        The system's natural frequency [Hz] and damping ratio (the window's decay removed).

    Raises
    ------
    InputValueError
        A band with fewer than 5 lines or without points on both sides of the peak.

    References
    ----------
    Ewins, *Modal Testing*, 2nd ed., 2000, sec. 4.4 (from memory).
    """
    mask = _band_mask(frf, band)
    w = 2.0 * math.pi * frf.frequency[mask]
    # The mobility as a function of i w (its circle and angles), with the window's decay put back at the end.
    y = frf.mobility()[mask]
    # Algebraic (Kasa) circle fit: x^2 + y^2 + D x + E y + F = 0.
    a = np.column_stack([y.real, y.imag, np.ones(y.size)])
    b = -(y.real**2 + y.imag**2)
    (d, e, _f0), *_ = np.linalg.lstsq(a, b, rcond=None)
    centre = complex(-d / 2.0, -e / 2.0)
    angle = np.unwrap(np.angle(y - centre))
    # Sweep rate of the angle against w^2; the natural frequency is its maximum (interpolated).
    w2 = w**2
    rate = np.abs(np.gradient(angle, w2))
    k = int(np.argmax(rate[1:-1])) + 1
    x0, x1, x2 = w2[k - 1 : k + 2]
    r0, r1, r2 = rate[k - 1 : k + 2]
    denominator = r0 - 2 * r1 + r2
    shift = 0.5 * (r0 - r2) / denominator if denominator != 0 else 0.0
    wn2 = x1 + shift * (x2 - x0) / 2.0
    wn = math.sqrt(wn2)
    theta_n = float(np.interp(wn2, w2, angle))
    estimates = []
    for i in range(y.size):
        for j in range(y.size):
            if w[i] > wn > w[j]:
                ta, tb = abs(angle[i] - theta_n), abs(theta_n - angle[j])
                if 0.2 < ta < 2.5 and 0.2 < tb < 2.5:
                    estimates.append(
                        (w[i] ** 2 - w[j] ** 2) / (2.0 * wn * (w[i] * math.tan(ta / 2) + w[j] * math.tan(tb / 2)))
                    )
    if not estimates:
        raise InputValueError(f"band: {band!r} does not hold points on both sides of the peak; widen it")
    zeta = float(np.median(estimates))
    return _unwindowed(frf, wn / (2.0 * math.pi), zeta)


def rfp_fit(frf: Frf, band: tuple[float, float], modes: int, iterations: int = 8) -> list[Pole]:
    """Rational-fraction polynomial fit of the receptance in a band.

    ``H(s) = N(s) / D(s)`` with ``D`` monic of degree ``2 modes`` and ``N`` of degree ``2 modes`` (the
    constant term of ``N / D`` at high frequency absorbs the modes above the band), fitted in the variable
    the estimate samples, ``s = i w + 1 / tau``: the roots of ``D`` are then the system's own poles, and
    the exponential window needs no correction.

    The linear fit of ``H D - N`` is iterated on its own denominator (Sanathanan and Koerner): each pass
    weights the equations by ``1 / (|D_prev(s)| std(H))``, so that it minimizes the output error
    ``(H - N / D) / std(H)``, with ``std(H)`` from the coherence of the H1 estimate (Bendat and Piersol) and
    at least 0.1 % of ``|H|``. Without this, a weight of ``1 / |H|`` lets noisy antiresonances and band
    edges decide the fit.

    Parameters
    ----------
    frf : Frf
        The estimate.
    band : (float, float)
        Frequencies [Hz] fitted.
    modes : int
        Number of modes in the band (>= 1).
    iterations : int
        Largest number of Sanathanan-Koerner passes.

    Returns
    -------
    list of Pole
        Underdamped poles in the band's neighbourhood, by frequency.

    Raises
    ------
    InputValueError
        A band with fewer than 5 lines, or a model order below 1.

    References
    ----------
    M. H. Richardson and D. L. Formenti, Proc. 1st IMAC, 1982 (ordinary polynomials here, normalized
    variable); C. K. Sanathanan and J. Koerner, "Transfer function synthesis as a ratio of two complex
    polynomials", IEEE Trans. Automatic Control 8(1), 1963, pp. 56-58; J. S. Bendat and A. G. Piersol,
    *Random Data*, 4th ed., 2010, sec. 9.2 (random error of H1).
    """
    if isinstance(modes, bool) or not isinstance(modes, (int, np.integer)) or modes < 1:
        raise InputValueError(f"modes: got {modes!r}; expected a whole number >= 1")
    mask = _band_mask(frf, band)
    s_points = frf.s[mask]
    h = frf.receptance()[mask]
    std = frf.relative_std()[mask] * np.abs(h)
    scale = float(np.abs(s_points).max())
    z = s_points / scale
    nd = 2 * int(modes)
    powers_d = np.column_stack([z**k for k in range(nd)])
    powers_n = np.column_stack([z**k for k in range(nd + 1)])
    a = np.hstack([powers_d * h[:, None], -powers_n])
    rhs = -(z**nd) * h
    denominator = np.ones(z.size, dtype=complex)
    coefficients = np.zeros(a.shape[1])
    for _ in range(iterations):
        weight = 1.0 / np.maximum(np.abs(denominator) * std, 1e-300)
        aw = a * weight[:, None]
        real = np.vstack([aw.real, aw.imag])
        norms = np.linalg.norm(real, axis=0)
        norms[norms == 0.0] = 1.0
        target = np.concatenate([(rhs * weight).real, (rhs * weight).imag])
        solution, *_ = np.linalg.lstsq(real / norms, target, rcond=None)
        solution = solution / norms
        d = np.concatenate([solution[:nd], [1.0]])
        new_denominator = np.polyval(d[::-1], z)
        converged = np.allclose(solution, coefficients, rtol=1e-10, atol=0.0)
        coefficients, denominator = solution, new_denominator
        if converged:
            break
    roots = np.roots(np.concatenate([coefficients[:nd], [1.0]])[::-1]) * scale
    poles = []
    for r in roots:
        if r.imag > 0 and r.real < 0:
            wn = abs(r)
            poles.append(Pole(wn / (2.0 * math.pi), -r.real / wn))
    return sorted(poles, key=lambda p: p.frequency)


def stability_diagram(
    frf: Frf, band: tuple[float, float], max_modes: int = 6, frequency_tol: float = 0.01, damping_tol: float = 0.05
) -> tuple[list[list[Pole]], list[Pole]]:
    """RFP poles for model orders 1..max_modes and the poles stable across consecutive orders.

    A pole is stable when the next order has a pole within ``frequency_tol`` in frequency and
    ``damping_tol`` (relative) in damping; the stable list holds the highest order's stable poles.

    Parameters
    ----------
    frf : Frf
        The estimate.
    band : (float, float)
        Frequencies [Hz] fitted.
    max_modes : int
        Highest model order.
    frequency_tol, damping_tol : float
        Relative changes between consecutive orders that count as stable.

    Returns
    -------
    diagram : list of list of Pole
        The poles of each order, 1 to ``max_modes``.
    stable : list of Pole
        The highest order's poles found again at the order below.

    Raises
    ------
    InputValueError
        As :func:`rfp_fit`.
    """
    diagram = [rfp_fit(frf, band, m) for m in range(1, max_modes + 1)]
    stable: list[Pole] = []
    for lower, upper in itertools.pairwise(diagram):
        stable = [
            p
            for p in upper
            if any(
                abs(p.frequency - q.frequency) <= frequency_tol * q.frequency
                and abs(p.damping_ratio - q.damping_ratio) <= damping_tol * max(q.damping_ratio, 1e-6)
                for q in lower
            )
        ]
    return diagram, stable
