"""10 000 variants of the three-mass support demo: batched modes and findings vs a per-sample loop.

Prints, side by side in one run, the time to check 10 000 Latin-hypercube variants of
``notebooks/scenarios/feed_pump_foundation.toml`` (its six uncertain inputs) with

* this package's batched path (``resonance.studies.uncertainty.evaluate_chunk``: stacked matrices, one batched
  eigen-solve, vectorized margins), on one core (BLAS limited to one thread),
* a per-sample loop over the existing flow: ``ModelSpec.build`` + ``model_modes`` + ``interference_check``
  (modes and findings, what the batched path computes), and
* a per-sample loop over the whole support study (``run_study``: also the forced response and zones),

the loops timed on a subset and scaled (their cost per sample is constant), with the ratios, the largest
difference of the worst margin between the batched path and the loop, and the time of the sensitivity
analysis (RBD-FAST) on the 10 000 samples. With ``--load`` the table is measured again while another
process keeps one core busy.

Run: ``python benchmarks/uncertainty_speed.py [--load] [--subset 300]``
"""

from __future__ import annotations

import argparse
import dataclasses
import time
from pathlib import Path

import numpy as np
from _load import one_core_busy
from threadpoolctl import threadpool_limits

from resonance.checks.interference import interference_check
from resonance.dynamics.modes import model_modes
from resonance.kinds.support.scenario import load_scenario
from resonance.kinds.support.study import run_study, study_modes
from resonance.studies.uncertainty import evaluate_chunk, sample_inputs, sensitivity_indices, uncertainty_spec

SCENARIO = Path(__file__).resolve().parent.parent / "notebooks" / "scenarios" / "feed_pump_foundation.toml"
SAMPLES = 10_000


def variant(scenario, inputs, row):
    stiffness, mass, zeta = {}, {}, scenario.model.damping_ratio
    for x, value in zip(inputs, row, strict=True):
        kind, _, name = x.vary.partition(":")
        if kind == "spring":
            stiffness[name] = value
        elif kind == "mass":
            mass[name] = value
        elif kind == "damping_ratio":
            zeta = scenario.model.damping_ratio * value
    return stiffness, mass, zeta


def loop_findings(scenario, inputs, rows):
    worst = []
    for row in rows:
        stiffness, mass, zeta = variant(scenario, inputs, row)
        model = scenario.model.build(stiffness, mass, zeta)
        modes = study_modes(model_modes(model), model.labels)
        table = interference_check(modes, scenario.excitations, scenario.speed, scenario.rules)
        worst.append(min(f.margin - f.required_margin for f in table))
    return np.array(worst)


def loop_study(scenario, inputs, rows):
    for row in rows:
        stiffness, mass, zeta = variant(scenario, inputs, row)
        run_study(scenario, model=scenario.model.build(stiffness, mass, zeta))


def measure(subset: int) -> list[str]:
    scenario = load_scenario(SCENARIO)
    spec = dataclasses.replace(uncertainty_spec(scenario.uncertainty, scenario, SCENARIO.name), samples=SAMPLES)
    values = sample_inputs(spec)
    with threadpool_limits(1):
        evaluate_chunk(scenario, spec.inputs, values[:64])  # warm up
        start = time.perf_counter()
        batched = evaluate_chunk(scenario, spec.inputs, values)
        t_batch = time.perf_counter() - start
        start = time.perf_counter()
        worst_loop = loop_findings(scenario, spec.inputs, values[:subset])
        t_loop = (time.perf_counter() - start) * SAMPLES / subset
        start = time.perf_counter()
        loop_study(scenario, spec.inputs, values[: subset // 3])
        t_study = (time.perf_counter() - start) * SAMPLES / (subset // 3)
        start = time.perf_counter()
        sensitivity_indices([x.vary for x in spec.inputs], values, batched.worst_excess, seed=1)
        t_sens = time.perf_counter() - start
    diff = float(np.max(np.abs(batched.worst_excess[:subset] - worst_loop)))
    return [
        f"{'batched (modes and findings), one core':<46}{t_batch:>9.3f} s",
        f"{'loop: build + modes + interference_check':<46}{t_loop:>9.2f} s{t_loop / t_batch:>8.0f}x",
        f"{'loop: whole support study (run_study)':<46}{t_study:>9.2f} s{t_study / t_batch:>8.0f}x",
        f"{'sensitivity (RBD-FAST, SALib), 10 000 samples':<46}{t_sens:>9.3f} s",
        f"largest difference of the worst margin, batched vs loop: {diff:.1e} percent points",
    ]


def main() -> None:
    parser = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    parser.add_argument("--subset", type=int, default=300, help="samples the loops are timed on (then scaled)")
    parser.add_argument("--load", action="store_true", help="measure again with one core kept busy")
    args = parser.parse_args()
    print(f"{SAMPLES} variants of {SCENARIO.name}; loops timed on {args.subset} (study: {args.subset // 3}) and scaled")
    print("idle machine:")
    print("\n".join(measure(args.subset)))
    if args.load:
        with one_core_busy():
            print("one core kept busy by another process:")
            print("\n".join(measure(args.subset)))
    print("targets: batched under 1 s on one core, at least 30x the per-sample loop over the existing study")


if __name__ == "__main__":
    main()
