"""Synthesize the demo field data in notebooks/data/ from an invented machine with known parameters.

The "truth" is a two-mass model of a fan on its support (masses, stiffnesses and modal damping below),
computed with the package's own receptance; noise and a small runout are added with a fixed seed so
the files are reproducible. The identification tests synthesize their own data the same way in
memory; these files are for the notebook and the check command.

Run: ``python tools/make_field_data.py`` (overwrites the two demo files).
"""

from __future__ import annotations

import math
from pathlib import Path

import numpy as np

import resonance as R

OUT = Path(__file__).resolve().parent.parent / "notebooks" / "data"

# The invented machine: rotor-and-housing mass on a pedestal mass on the floor.
MASSES = [900.0, 600.0]  # kg
STIFFNESS = [6.0e7, 1.1e8]  # N/m (floor-pedestal, pedestal-housing)
DAMPING_RATIO = 0.04
UNBALANCE = 4.0e-3  # kg m


def machine() -> R.MatrixModel:
    base = R.lumped_model(
        {"housing": MASSES[0], "pedestal": MASSES[1]},
        [R.Spring("pedestal", R.GROUND, STIFFNESS[0]), R.Spring("housing", "pedestal", STIFFNESS[1])],
    )
    return R.matrix_model(
        base.mass, base.stiffness, R.modal_damping(base.mass, base.stiffness, DAMPING_RATIO), base.labels
    )


def coastdown(rng: np.random.Generator, noise: float = 0.01) -> tuple[np.ndarray, np.ndarray]:
    """Speeds [rpm] (high to low) and the complex 0-peak housing response [m]."""
    speed = np.arange(3600.0, 199.0, -10.0)
    w = 2 * math.pi * speed / 60
    h = R.model_receptance(machine(), speed / 60, 0)[:, 0]
    x = h * UNBALANCE * w**2 + 2e-6 * np.exp(0.3j)  # small runout
    scale = np.abs(x).max()
    x = x + noise * scale * (rng.standard_normal(x.size) + 1j * rng.standard_normal(x.size)) / math.sqrt(2)
    return speed, x


def write_coastdown(path: Path, speed: np.ndarray, x: np.ndarray) -> None:
    lag = np.mod(np.degrees(-np.angle(x)), 360.0)  # wrapped, as instruments write it
    lines = [
        "# invented demo: fan housing on its pedestal, coast-down from 3600 rpm",
        "# amplitude_unit = um",
        "# amplitude_convention = peak-to-peak",
        "# phase_convention = lag",
        "speed_rpm,housing-X_amplitude,housing-X_phase",
    ]
    lines += [f"{s:.0f},{2 * abs(v) * 1e6:.3f},{p:.2f}" for s, v, p in zip(speed, x, lag, strict=True)]
    path.write_text("\n".join(lines) + "\n", encoding="utf-8")


def impact(rng: np.random.Generator, hits: int = 4, fs: float = 1024.0, length: float = 1.0):
    """Force [N] and housing acceleration [m/s^2] of a series of hammer hits, simulated exactly."""
    model = machine()
    n = int(fs * length)
    force = np.zeros(hits * n)
    t = np.arange(n) / fs
    pulse_width = 0.006  # s, a half-sine hammer tip
    for k in range(hits):
        start = k * n + 50
        samples = int(pulse_width * fs)
        force[start : start + samples] = (
            800.0 * (1 + 0.1 * rng.standard_normal()) * np.sin(np.pi * np.arange(samples) / samples)
        )
    # Exact response by the frequency domain with a record long enough for the ringing to decay.
    spectrum = np.fft.rfft(force)
    f = np.fft.rfftfreq(force.size, 1 / fs)
    h = R.model_receptance(model, f, 0)[:, 0]
    acceleration = np.fft.irfft(-((2 * np.pi * f) ** 2) * h * spectrum, n=force.size)
    acceleration += 0.002 * np.abs(acceleration).max() * rng.standard_normal(acceleration.size)
    time = np.arange(force.size) / fs
    return time, force, acceleration, t


def write_impact(path: Path, time: np.ndarray, force: np.ndarray, acceleration: np.ndarray) -> None:
    lines = [
        "# invented demo: hammer hits on the fan housing, stopped machine",
        "# force_unit = N",
        "# response_unit = m/s**2",
        "time_s,force,housing-X",
    ]
    lines += [f"{t:.6f},{f:.4f},{a:.6f}" for t, f, a in zip(time, force, acceleration, strict=True)]
    path.write_text("\n".join(lines) + "\n", encoding="utf-8")


def main() -> None:
    rng = np.random.default_rng(2026)
    OUT.mkdir(parents=True, exist_ok=True)
    speed, x = coastdown(rng)
    write_coastdown(OUT / "coastdown_fan.csv", speed, x)
    time, force, acceleration, _ = impact(rng)
    write_impact(OUT / "impact_fan.csv", time, force, acceleration)
    modes = R.modal_properties(machine())
    print(
        "truth:",
        ", ".join(
            f"{f:.3f} Hz ({60 * f:.0f} rpm), zeta {z:.3f}"
            for f, z in zip(modes.frequency, modes.damping_ratio, strict=True)
        ),
    )


if __name__ == "__main__":
    main()
