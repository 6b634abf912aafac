"""Modes and forced torque of a 30-station train at 2000 speeds: this package vs a per-speed solve loop.

An invented 30-station geared train (a motor, couplings, a x2.5 gear mesh, 29 shaft sections with dampers
on the couplings) under a harmonic torque at the motor following 1x over 2000 driver speeds. Printed side
by side in one run:

* this package: ``torsional_modes`` plus ``torque_response`` (modal superposition, one eigen-solve, then
  every element's torque at every speed),
* a per-speed loop: one dense complex solve of ``(K - w^2 J + i w C) theta = T`` per speed, then the same
  element torques,
* a batched dense solve (numpy's stacked solve, all speeds at once),

as times and ratios, plus the largest relative difference of the element torques from the loop's, for
element dampers (complex modes) and for a modal damping ratio (real modes). With ``--load`` the table is
measured again while another process keeps one core busy.

Run: ``python benchmarks/torsion_response.py [--load] [--repeats 20]``
"""

from __future__ import annotations

import argparse
import math
import statistics
import time

import numpy as np
import scipy.linalg
from _load import one_core_busy

from resonance.kinds.torsion.elements import Coupling, GearMesh, Station, TorsionalShaft
from resonance.kinds.torsion.response import torque_response
from resonance.kinds.torsion.train import TorsionalTrain, torsional_modes, torsional_train

SPEEDS = np.linspace(300.0, 3600.0, 2000)  # driver rpm


def train() -> TorsionalTrain:
    rng = np.random.default_rng(30)
    stations = [Station(f"s{i}", rng.uniform(0.05, 2.0), "driver" if i < 15 else "fast") for i in range(30)]
    springs = []
    for i in range(29):
        if i == 14:
            continue  # the mesh joins s14 and s15
        pair = (f"s{i}", f"s{i + 1}")
        if i % 7 == 3:
            springs.append(Coupling(pair, rng.uniform(2e4, 2e5), damping=rng.uniform(5, 60), label=f"coupling {i}"))
        else:
            springs.append(TorsionalShaft(pair, rng.uniform(5e5, 5e6), label=f"shaft {i}", outer_diameter=0.08))
    return torsional_train(stations, springs, [GearMesh("s14", "s15", 2.5, stiffness=8e7)])


def loop(t: TorsionalTrain, frequency: np.ndarray, load: np.ndarray, zeta: float | None) -> dict[str, np.ndarray]:
    """The reference: one dense solve per speed, element torques from the twists."""
    m, k, c = t.model.mass, t.model.stiffness, t.model.damping
    if zeta is not None:
        # Modal damping as a matrix: C = J Phi diag(2 zeta w_r) Phi^T J with mass-normalized Phi.
        lam, phi = scipy.linalg.eigh(k, m)
        c = m @ phi @ np.diag(2 * zeta * np.sqrt(np.clip(lam, 0, None))) @ phi.T @ m
    shaft_of = {s.name: s.shaft for s in t.stations}
    dampers = {s.label: s.damping for s in t.springs}
    out = {label: np.empty(frequency.size) for label, *_ in t.elements}
    for i, f in enumerate(frequency):
        w = 2 * math.pi * f
        theta = np.linalg.solve(k - w**2 * m + 1j * w * c, load)
        for label, a, b, kr in t.elements:
            n = t.speed_ratio[shaft_of[a] if label in dampers else shaft_of[b]]
            cr = dampers.get(label, 0.0) * n**2 if zeta is None else 0.0
            out[label][i] = abs((kr + 1j * w * cr) * (theta[t.dof[a]] - theta[t.dof[b]])) / n
    return out


def batched(t: TorsionalTrain, frequency: np.ndarray, load: np.ndarray) -> np.ndarray:
    """All speeds in one stacked dense solve (angles only)."""
    w = 2 * math.pi * frequency[:, None, None]
    dynamic = t.model.stiffness - w**2 * t.model.mass + 1j * w * t.model.damping
    return np.linalg.solve(dynamic, np.broadcast_to(load, (frequency.size, load.size))[..., None])


def median_time(fn, repeats: int) -> float:
    times = []
    for _ in range(repeats):
        start = time.perf_counter()
        fn()
        times.append(time.perf_counter() - start)
    return statistics.median(times)


def measure(repeats: int) -> list[str]:
    t = train()
    frequency = SPEEDS / 60.0  # 1x of the driver
    load = np.zeros(t.model.size)
    load[t.dof["s0"]] = 1000.0
    rows = []
    for name, zeta in (("element dampers (complex modes)", None), ("modal damping 0.02 (real modes)", 0.02)):

        def ours(z=zeta):
            torsional_modes(t)
            return torque_response(t, {"s0": 1000.0}, frequency, damping_ratio=z)

        ref = loop(t, frequency, load, zeta)
        got = ours().element_torque
        diff = max(float(np.max(np.abs(got[k] - ref[k]) / np.max(ref[k]))) for k in ref)
        this = median_time(ours, repeats)
        slow = median_time(lambda z=zeta: loop(t, frequency, load, z), max(3, repeats // 5))
        stacked = median_time(lambda: batched(t, frequency, load), max(3, repeats // 5))
        rows.append(
            f"{name:<34}{this * 1e3:>9.2f} ms{slow * 1e3:>11.1f} ms{stacked * 1e3:>10.1f} ms"
            f"{slow / this:>9.0f}x{stacked / this:>9.1f}x{diff:>11.1e}"
        )
    return rows


def main() -> None:
    parser = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    parser.add_argument("--repeats", type=int, default=20)
    parser.add_argument("--load", action="store_true", help="measure again with one core kept busy")
    args = parser.parse_args()
    header = (
        f"{'30 stations, 2000 speeds':<34}{'this':>12}{'loop':>14}{'stacked':>13}{'loop/this':>10}"
        f"{'stk/this':>9}{'max diff':>11}\n" + "-" * 103
    )
    print("idle machine:")
    print(header)
    print("\n".join(measure(args.repeats)))
    if args.load:
        with one_core_busy():
            print("one core kept busy by another process:")
            print(header)
            print("\n".join(measure(args.repeats)))
    print("target: at least 10x the loop and under 10 ms (modes and response together)")


if __name__ == "__main__":
    main()
