"""Identification accuracy: frequency and damping error of every method, by noise level, with the spread over seeds.

Synthesizes hammer tests and coast-downs of a known three-mode structure (``tests/synthetic.py``: modal
superposition, exact for the sampled force; 18, 47 and 103 Hz, damping ratios 0.02, 0.03, 0.015), adds white
noise of 0, 0.1, 0.5 and 2 % of each channel's peak (proportional noise for the coast-down), and identifies
the modes by peak picking, the circle fit and the rational-fraction fit (each with the default exponential
window and without one) and by the coast-down modal fit. For each method and noise level it prints the
worst mode's error in frequency and in damping ratio as mean +/- standard deviation over the seeds, in
percent, side by side, so a user knows which method to trust at which noise.

Run: ``python benchmarks/identification_accuracy.py [--seeds 20]``
"""

from __future__ import annotations

import argparse
import sys
from pathlib import Path

import numpy as np

sys.path.insert(0, str(Path(__file__).resolve().parent.parent / "tests"))
from synthetic import THREE_MODES, coastdown, hammer_test  # the tests' closed forms

from resonance.kinds.field.coastdown import fit_modes
from resonance.kinds.field.impact import circle_fit, impact_frf, peak_pick, rfp_fit
from resonance.kinds.field.readers import CoastDown

NOISE = (0.0, 0.001, 0.005, 0.02)
BAND = (5.0, 150.0)
PEAK_BANDS = ((12.0, 24.0), (38.0, 56.0), (85.0, 120.0))
TRUE_F = np.array(THREE_MODES.frequency)
TRUE_Z = np.array(THREE_MODES.damping_ratio)


def _nearest(poles, f: float):
    return min(poles, key=lambda p: abs(p.frequency - f)) if poles else None


def _hammer_methods(noise: float, seed: int, window: bool) -> dict[str, np.ndarray]:
    frf = impact_frf(hammer_test(THREE_MODES, noise, seed), "acc", 2.0, exponential_tau=None if window else np.inf)
    out = {}
    for name, identify in (
        ("peak picking", lambda: [peak_pick(frf, b) for b in PEAK_BANDS]),
        ("circle fit", lambda: [circle_fit(frf, b) for b in PEAK_BANDS]),
        ("rational fraction", lambda: [_nearest(rfp_fit(frf, BAND, 3), f) for f in TRUE_F]),
    ):
        try:
            poles = identify()
            out[name] = np.array([[p.frequency, p.damping_ratio] if p else [np.nan, np.nan] for p in poles])
        except ValueError:
            out[name] = np.full((3, 2), np.nan)
    return out


def _coastdown_fit(noise: float, seed: int) -> np.ndarray:
    speeds = np.linspace(600.0, 7500.0, 700)
    amplitude, lag = coastdown(THREE_MODES, speeds, noise=noise, seed=seed)
    data = CoastDown(speeds, {"ch": amplitude * np.exp(-1j * np.radians(lag))}, "synthetic", ())
    fit = fit_modes(data, "ch", [(60.0 * f * 1.01, 0.03) for f in TRUE_F])
    return np.array([[m.frequency, m.damping_ratio] for m in fit.modes])


def _cell(errors: np.ndarray) -> str:
    # errors: (seeds, modes) in percent; the worst mode by mean absolute error.
    if np.all(np.isnan(errors)):
        return "failed"
    mean = np.nanmean(np.abs(errors), axis=0)
    worst = int(np.nanargmax(mean))
    return f"{mean[worst]:.2f} +/- {np.nanstd(errors[:, worst]):.2f}"


def measure(seeds: int) -> list[str]:
    rows = []
    for noise in NOISE:
        count = seeds if noise else 1
        results: dict[str, list[np.ndarray]] = {}
        for seed in range(count):
            for window in (True, False):
                for name, poles in _hammer_methods(noise, seed, window).items():
                    results.setdefault(f"{name}, {'window' if window else 'no window'}", []).append(poles)
            results.setdefault("coast-down modal fit", []).append(_coastdown_fit(noise, seed))
        for name, runs in results.items():
            stack = np.array(runs)
            f_err = 100.0 * (stack[:, :, 0] / TRUE_F - 1.0)
            z_err = 100.0 * (stack[:, :, 1] / TRUE_Z - 1.0)
            seeds_text = f"({count} seed{'s' if count > 1 else ''})"
            rows.append(f"{100 * noise:>5.1f} %  {name:<32} {_cell(f_err):>18} {_cell(z_err):>18}  {seeds_text}")
        rows.append("")
    return rows


def main() -> None:
    parser = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    parser.add_argument("--seeds", type=int, default=20)
    args = parser.parse_args()
    print("worst mode's mean |error| +/- its standard deviation over the seeds, in percent of the truth")
    print(f"{'noise':>7}  {'method':<32} {'frequency error %':>18} {'damping error %':>18}")
    print("-" * 92)
    print("\n".join(measure(args.seeds)))


if __name__ == "__main__":
    main()
