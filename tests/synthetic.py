"""Synthetic field data of a known modal model, from closed forms (used by the tests and the accuracy benchmark).

The structure is a sum of viscously damped modes with real residues (modal superposition; Ewins, *Modal
Testing*, 2nd ed., 2000, eq. 2.x): ``H(s) = sum_r A_r / (s^2 + 2 zeta_r w_r s + w_r^2)`` [m/N].

* Hammer tests: each mode's equation ``q'' + 2 zeta w q' + w^2 q = f(t)`` is integrated exactly for the
  sampled force taken as piecewise linear between samples (``scipy.signal.lsim``, first-order hold); the
  accelerometer reads ``sum_r A_r q_r''``. Hits follow back to back, each record starting from where the
  last one left off. Noise: white, a stated fraction of each channel's peak, on force and response.
* Coast-downs: the steady unbalance response ``U w^2 H(i w)`` at each speed, amplitude and phase lag.

Nothing here comes from the package's own generators; values are invented.
"""

from __future__ import annotations

import io
import math
from dataclasses import dataclass
from pathlib import Path

import numpy as np
import scipy.signal

from resonance.kinds.field.readers import ImpactRecord


@dataclass(frozen=True)
class ModalModel:
    """Natural frequencies [Hz], damping ratios [-] and receptance residues [1/kg] of the modes."""

    frequency: tuple[float, ...]
    damping_ratio: tuple[float, ...]
    residue: tuple[float, ...]

    def receptance(self, s: np.ndarray) -> np.ndarray:
        """``H(s)`` at complex ``s`` [rad/s] (``s = i w`` for the FRF)."""
        out = np.zeros(np.shape(s), dtype=complex)
        for f, z, a in zip(self.frequency, self.damping_ratio, self.residue, strict=True):
            w = 2.0 * math.pi * f
            out += a / (s**2 + 2.0 * z * w * s + w**2)
        return out

    def state_space(self) -> scipy.signal.StateSpace:
        """States ``(q_r, q_r')`` per mode; output the acceleration ``sum A_r q_r''``."""
        n = len(self.frequency)
        a = np.zeros((2 * n, 2 * n))
        b = np.zeros((2 * n, 1))
        c = np.zeros((1, 2 * n))
        d = np.zeros((1, 1))
        for r, (f, z, res) in enumerate(zip(self.frequency, self.damping_ratio, self.residue, strict=True)):
            w = 2.0 * math.pi * f
            a[2 * r, 2 * r + 1] = 1.0
            a[2 * r + 1, 2 * r] = -(w**2)
            a[2 * r + 1, 2 * r + 1] = -2.0 * z * w
            b[2 * r + 1, 0] = 1.0
            c[0, 2 * r] = -res * w**2
            c[0, 2 * r + 1] = -res * 2.0 * z * w
            d[0, 0] += res
        return scipy.signal.StateSpace(a, b, c, d)


#: Three well-separated modes of an invented frame: the lowest is the hard case for a windowed fit.
THREE_MODES = ModalModel((18.0, 47.0, 103.0), (0.02, 0.03, 0.015), (1.0 / 500.0, 1.0 / 800.0, -1.0 / 300.0))


def hammer_test(
    model: ModalModel,
    noise: float = 0.0,
    seed: int = 0,
    hits: int = 5,
    sample_rate: float = 1024.0,
    record_length: float = 2.0,
    pulse: float = 0.004,
    peak_force: float = 500.0,
) -> ImpactRecord:
    """Force and acceleration of ``hits`` hammer hits, back to back, with noise of ``noise`` x each peak."""
    n = round(record_length * sample_rate)
    t = np.arange(hits * n) / sample_rate
    force = np.zeros(t.size)
    width = round(pulse * sample_rate)
    for k in range(hits):
        start = k * n + round(0.02 * sample_rate)
        force[start : start + width + 1] = peak_force * np.sin(np.pi * np.arange(width + 1) / width)
    _, acceleration, _ = scipy.signal.lsim(model.state_space(), force, t, interp=True)
    rng = np.random.default_rng(seed)
    noisy_force = force + noise * np.abs(force).max() * rng.standard_normal(t.size)
    noisy_acc = acceleration + noise * np.abs(acceleration).max() * rng.standard_normal(t.size)
    return ImpactRecord(sample_rate, noisy_force, {"acc": noisy_acc}, "acceleration", "synthetic")


def impact_file(record: ImpactRecord, path: Path) -> Path:
    """Write a hammer test in the documented file format (time, force, response), 9 significant digits."""
    buffer = io.StringIO()
    buffer.write("# response_unit = m/s**2\n# force_unit = N\ntime_s,force,acc\n")
    t = np.arange(record.force.size) / record.sample_rate
    for row in zip(t, record.force, record.responses["acc"], strict=True):
        buffer.write(",".join(f"{v:.9g}" for v in row) + "\n")
    path.write_text(buffer.getvalue())
    return path


def coastdown(
    model: ModalModel, speeds: np.ndarray, unbalance: float = 1e-3, noise: float = 0.0, seed: int = 0
) -> tuple[np.ndarray, np.ndarray]:
    """Steady 1x unbalance response ``U w^2 H(i w)``: 0-peak amplitude [m] and phase lag [deg], with noise.

    The noise is proportional: each amplitude times ``(1 + noise e)``, each phase plus ``noise e`` rad.
    """
    w = 2.0 * math.pi * speeds / 60.0
    x = unbalance * w**2 * model.receptance(1j * w)
    rng = np.random.default_rng(seed)
    amplitude = np.abs(x) * (1.0 + noise * rng.standard_normal(w.size))
    lag = np.degrees(np.unwrap(-np.angle(x)) + noise * rng.standard_normal(w.size))
    return amplitude, lag
