"""Compute time per slider update of each notebook's panel, default scenarios.

For each notebook's panel this prints, side by side, the compute time of one
update (the study a slider change triggers: modes, checks, forced response,
and for the what-if panel the tolerance band too) and the time of the whole
headless update (compute plus refreshing the figure traces and tables in
place), as the median of repeated updates alternating between two slider
values, with the target ratio. With ``--load`` the same is measured again
while another process keeps one core busy.

Run: ``python benchmarks/panel_update.py [--load] [--repeats 40]``
"""

from __future__ import annotations

import argparse
import statistics
import time
from pathlib import Path

from _load import one_core_busy

from resonance.kinds.rotor.scenario import load_rotor_scenario
from resonance.kinds.space.scenario import load_space_scenario
from resonance.kinds.support.scenario import load_scenario
from resonance.kinds.torsion.scenario import load_torsion_scenario
from resonance.ui import RotorPanel, SpacePanel, TorsionPanel, WhatIfPanel, multi_mode_panel, single_mode_panel

SCENARIOS = Path(__file__).resolve().parent.parent / "notebooks" / "scenarios"
TARGET_MS = {"01": 50.0, "02": 50.0, "05": 80.0, "07": 50.0, "09": 100.0}  # and the space panel (09)


def _cases():
    pump = load_scenario(SCENARIOS / "cooling_water_pump.toml")
    foundation = load_scenario(SCENARIOS / "feed_pump_foundation.toml")
    fan = load_rotor_scenario(SCENARIOS / "fan_rotor.toml")
    train = load_torsion_scenario(SCENARIOS / "compressor_train.toml")
    block = load_space_scenario(SCENARIOS / "fan_skid_block.toml")
    return [
        ("01 single mode", single_mode_panel(pump), "damping", (0.04, 0.05)),
        ("02 machine on support", multi_mode_panel(foundation), "damping", (0.03, 0.04)),
        ("03 what-if (with +/-30 % band)", WhatIfPanel(foundation), "stiffness", (1.0, 1.05)),
        ("05 rotor: speed range", RotorPanel(fan), "speed", ((900, 1800), (900, 2000))),
        ("05 rotor: bearing stiffness", RotorPanel(fan), "stiffness", (1.0, 1.05)),
        ("07 torsion: coupling stiffness", TorsionPanel(train), "coupling", (1.0, 1.2)),
        ("07 torsion: damping", TorsionPanel(train), "damping", (0.02, 0.03)),
        ("09 space: soil shear modulus", SpacePanel(block), "soil", (1.0, 1.2)),
    ]


def measure(repeats: int) -> list[str]:
    rows = []
    for name, panel, control, values in _cases():
        slider = getattr(panel, control)
        compute, full = [], []
        for i in range(repeats):
            slider.unobserve_all("value")  # detach the panel: compute and update are timed explicitly below
            slider.value = values[i % 2]
            start = time.perf_counter()
            panel.compute()
            compute.append(time.perf_counter() - start)
            start = time.perf_counter()
            panel.update()
            full.append(time.perf_counter() - start)
        c, f = statistics.median(compute) * 1e3, statistics.median(full) * 1e3
        goal = TARGET_MS.get(name[:2])
        target = f"{goal / f:>6.1f}x under {goal:.0f} ms (full update)" if goal else "   (no target)"
        rows.append(f"{name:<32} {c:>10.1f} {f:>12.1f}   {target}")
    return rows


def main() -> None:
    parser = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    parser.add_argument("--repeats", type=int, default=40)
    parser.add_argument("--load", action="store_true", help="measure again with one core kept busy")
    args = parser.parse_args()
    header = f"{'panel':<32} {'compute [ms]':>10} {'full update [ms]':>12}   target\n" + "-" * 80
    print("idle machine:")
    print(header)
    print("\n".join(measure(args.repeats)))
    if args.load:
        with one_core_busy():
            print("one core kept busy by another process:")
            print(header)
            print("\n".join(measure(args.repeats)))


if __name__ == "__main__":
    main()
