"""A fleet of 200 invented scenarios: serial, 2 local worker processes, and a 2-worker Dask LocalCluster.

Writes 200 scenario files into a temporary folder (50 copies each of the cooling-water pump, the booster
pump with its 4096-sample uncertainty study, the compressor train and the fan rotor demos, each with its own
title and a stiffness changed by a few percent), then checks the fleet with ``resonance.fleet.run_fleet``
(no records written: the HTML records are about 5 MB each) and prints, side by side in one run, the wall
time of each executor, its speed-up over serial, the LocalCluster's start-up time (its overhead) and
whether every executor gave the same rows.

Run: ``python benchmarks/fleet_speed.py [--machines 200]``
"""

from __future__ import annotations

import argparse
import re
import tempfile
import time
from pathlib import Path

from resonance.core.executors import DaskExecutor, ProcessExecutor, SerialExecutor
from resonance.fleet import run_fleet

DEMOS = Path(__file__).resolve().parent.parent / "notebooks" / "scenarios"
SOURCES = ("cooling_water_pump.toml", "feed_pump_foundation.toml", "compressor_train.toml", "fan_rotor.toml")


def write_fleet(folder: Path, machines: int) -> None:
    for i in range(machines):
        name = SOURCES[i % len(SOURCES)]
        text = (DEMOS / name).read_text()
        text = re.sub(r'title = "([^"]*)"', lambda m, i=i: f'title = "{m.group(1)} #{i + 1:03d}"', text, count=1)
        # A different stiffness per machine: the first "N kN/mm" or "N kN*m/rad" scaled by a few percent.
        factor = 0.95 + 0.1 * ((i * 37) % 100) / 100
        text = re.sub(
            r'stiffness = "([0-9.]+) (kN/mm|kN\*m/rad|MN/m)"',
            lambda m, f=factor: f'stiffness = "{float(m.group(1)) * f:.6g} {m.group(2)}"',
            text,
            count=1,
        )
        (folder / f"machine_{i + 1:03d}_{name}").write_text(text)


def timed(fn):
    start = time.perf_counter()
    out = fn()
    return out, time.perf_counter() - start


def main() -> None:
    parser = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    parser.add_argument("--machines", type=int, default=200)
    args = parser.parse_args()
    from distributed import Client, LocalCluster

    with tempfile.TemporaryDirectory() as tmp:
        folder = Path(tmp)
        write_fleet(folder, args.machines)
        serial, t_serial = timed(lambda: run_fleet([folder], executor=SerialExecutor()))
        local, t_local = timed(lambda: run_fleet([folder], executor=ProcessExecutor(2)))
        start = time.perf_counter()
        with (
            LocalCluster(n_workers=2, threads_per_worker=1, host="127.0.0.1", dashboard_address=None) as cluster,
            Client(cluster) as client,
        ):
            t_start = time.perf_counter() - start
            remote, t_dask = timed(lambda: run_fleet([folder], executor=DaskExecutor(client)))
    verdicts = {v: sum(r.verdict == v for r in serial) for v in ("PASS", "FAIL", "BAD INPUT")}
    print(f"{args.machines} machines ({', '.join(f'{n} {v}' for v, n in verdicts.items())}), no records written")
    print(f"{'executor':<34}{'wall time':>10}{'vs serial':>11}")
    print(f"{'serial (this process)':<34}{t_serial:>9.1f}s{1.0:>10.2f}x")
    print(f"{'2 local worker processes':<34}{t_local:>9.1f}s{t_serial / t_local:>10.2f}x")
    print(f"{'Dask LocalCluster, 2 workers':<34}{t_dask:>9.1f}s{t_serial / t_dask:>10.2f}x")
    print(f"LocalCluster start-up (overhead, not in its wall time): {t_start:.1f} s")
    print(f"same rows on every executor: {serial == local == remote}")
    print("target: 2 local workers at least 1.7x serial")


if __name__ == "__main__":
    main()
