"""Receptance column of a non-proportionally damped chain: this package vs references.

Prints, side by side in one run, the time to compute the full receptance
column (force at the first mass, response at every mass) of a lumped chain
with discrete dashpots, at 2000 frequencies, with

* this package (``resonance.model_receptance``, state-space modal expansion),
* python-control's state-space frequency response of the same system,
* a per-frequency numpy solve loop of ``(K - w^2 M + i w C) x = e_j``,

as ratios, plus the largest relative difference between the three
(max over frequencies of ||H - H_loop|| / ||H_loop||). With ``--load`` the
same table is measured again while a second process keeps one core busy.

At n = 500 the two references are timed on every 10th frequency and scaled
by 10 (their cost per frequency is constant); the table says so.

Run: ``python benchmarks/receptance_speed.py [--load] [--sizes 10 100 500]``
"""

from __future__ import annotations

import argparse
import time
from functools import partial

import control
import numpy as np
from _load import one_core_busy

import resonance as R

FREQUENCIES = 2000


def chain(n: int) -> R.MatrixModel:
    rng = np.random.default_rng(n)
    return R.chain_model(rng.uniform(50, 150, n), rng.uniform(1e6, 5e6, n), rng.uniform(50, 2000, n))


def best_of(function, repeats: int) -> tuple[float, object]:
    best, result = float("inf"), None
    for _ in range(repeats):
        start = time.perf_counter()
        result = function()
        best = min(best, time.perf_counter() - start)
    return best, result


def loop_solve(model: R.MatrixModel, f: np.ndarray) -> np.ndarray:
    out = np.empty((f.size, model.size), dtype=complex)
    rhs = np.zeros(model.size)
    rhs[0] = 1.0
    for i, fi in enumerate(f):
        w = 2 * np.pi * fi
        out[i] = np.linalg.solve(model.stiffness - w * w * model.mass + 1j * w * model.damping, rhs)
    return out


def control_response(model: R.MatrixModel, f: np.ndarray) -> np.ndarray:
    n = model.size
    minv = np.linalg.inv(model.mass)
    a = np.block([[np.zeros((n, n)), np.eye(n)], [-minv @ model.stiffness, -minv @ model.damping]])
    b = np.vstack([np.zeros((n, 1)), minv[:, [0]]])
    c = np.hstack([np.eye(n), np.zeros((n, n))])
    system = control.ss(a, b, c, np.zeros((n, 1)))
    return np.asarray(control.frequency_response(system, 2 * np.pi * f).complex).reshape(n, -1).T


def error(h: np.ndarray, reference: np.ndarray) -> float:
    return float(np.max(np.linalg.norm(h - reference, axis=1) / np.linalg.norm(reference, axis=1)))


def measure(sizes: list[int]) -> list[str]:
    rows = []
    for n in sizes:
        model = chain(n)
        f = np.linspace(0.1, 1.3 * R.modal_properties(model).frequency.max(), FREQUENCIES)
        stride = 10 if n >= 300 else 1
        repeats = 5 if n <= 100 else 1
        t_pkg, h = best_of(partial(R.model_receptance, model, f, 0), repeats)
        t_ctl, h_ctl = best_of(partial(control_response, model, f[::stride]), 1 if n > 100 else 3)
        t_loop, h_loop = best_of(partial(loop_solve, model, f[::stride]), 1 if n > 100 else 3)
        t_ctl *= stride
        t_loop *= stride
        diff = max(error(h[::stride], h_loop), error(h_ctl, h_loop))
        note = f"  (references timed on every {stride}th frequency, x{stride})" if stride > 1 else ""
        rows.append(
            f"{n:>5}  {t_pkg * 1e3:>10.1f}  {t_ctl * 1e3:>12.1f}  {t_loop * 1e3:>10.1f}  "
            f"{t_ctl / t_pkg:>10.1f}x  {t_loop / t_pkg:>10.1f}x  {diff:>9.1e}{note}"
        )
    return rows


def main() -> None:
    parser = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    parser.add_argument("--sizes", type=int, nargs="+", default=[10, 100, 500])
    parser.add_argument("--load", action="store_true", help="measure again with one core kept busy")
    args = parser.parse_args()
    header = "    n   this [ms]  control [ms]   loop [ms]  control/this   loop/this   max diff\n" + "-" * 86
    print(f"receptance column, {FREQUENCIES} frequencies, non-proportional damping")
    print("idle machine:")
    print(header)
    print("\n".join(measure(args.sizes)))
    if args.load:
        with one_core_busy():
            print("one core kept busy by another process:")
            print(header)
            print("\n".join(measure(args.sizes)))
    print("targets: n=10 loop/this >= 10; n=100 control/this >= 30 and loop/this >= 2; max diff <= 1e-9")


if __name__ == "__main__":
    main()
