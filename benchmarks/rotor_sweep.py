"""Speed sweep of a 40-element rotor: damped whirl modes at 100 speeds.

Prints, side by side, the time of a 100-speed Campbell sweep (8 tracked
branches) of a 40-element between-bearings rotor with this package's Ritz
basis (the default) and with the full model, their ratio, and the largest
relative difference of the lowest four branch frequencies between the two;
then the other rotor analyses of a notebook update (critical speeds by root
finding, 240-speed unbalance response, critical speed map). With ``--load``
the same is measured again while another process keeps one core busy.

Run: ``python benchmarks/rotor_sweep.py [--load]``
"""

from __future__ import annotations

import argparse
import time

import numpy as np
from _load import one_core_busy

from resonance.kinds.rotor import (
    Bearing,
    Disc,
    ShaftSection,
    Unbalance,
    campbell,
    critical_speed_map,
    critical_speeds,
    rotor_model,
    unbalance_response_rotor,
)


def rotor():
    sections = [
        ShaftSection(0.2, 0.09, elements=4),
        ShaftSection(1.0, 0.11, elements=18),
        ShaftSection(0.6, 0.11, elements=14),
        ShaftSection(0.2, 0.09, elements=4),
    ]
    bearings = [
        Bearing(1, [2e8, 3e8], [1.5e8, 2e8], cxx=3e4, cyy=3e4, speeds=[0.0, 6000.0], label="NDE"),
        Bearing(3, [2e8, 3e8], [1.5e8, 2e8], cxx=3e4, cyy=3e4, speeds=[0.0, 6000.0], label="DE"),
    ]
    return rotor_model(sections, [Disc(2, 380.0, 38.0, 20.0, "impeller")], bearings)


def timed(function, *args, repeats=3, **kwargs):
    best, result = float("inf"), None
    for _ in range(repeats):
        start = time.perf_counter()
        result = function(*args, **kwargs)
        best = min(best, time.perf_counter() - start)
    return best, result


def measure() -> list[str]:
    r = rotor()
    speeds = np.linspace(0.0, 6000.0, 100)
    t_red, red = timed(campbell, r, speeds, 8)
    t_full, full = timed(campbell, r, speeds, 8, reduced=False, repeats=1)
    diff = float(np.max(np.abs(red.frequency[:, :4] - full.frequency[:, :4]) / full.frequency[:, :4]))
    t_crit, _ = timed(critical_speeds, r, red)
    grid = np.linspace(25, 6000, 240)
    t_unb, u_full = timed(unbalance_response_rotor, r, [Unbalance(2, 1e-3)], grid, [1, 2, 3])
    t_unb_red, u_red = timed(unbalance_response_rotor, r, [Unbalance(2, 1e-3)], grid, [1, 2, 3], reduced=True)
    u_diff = float(np.max(np.abs(u_red.major_pk_pk - u_full.major_pk_pk)) / np.max(u_full.major_pk_pk))
    t_map, _ = timed(critical_speed_map, r, np.geomspace(1e6, 1e10, 41))
    return [
        f"rotor: {r.nodes - 1} elements, {r.size} degrees of freedom; sweep of 100 speeds, 8 branches",
        f"  Campbell, Ritz basis   {t_red * 1e3:8.1f} ms",
        f"  Campbell, full model   {t_full * 1e3:8.1f} ms   full / Ritz = {t_full / t_red:.1f}x; "
        f"max rel. diff of branches 1-4: {diff:.1e}",
        f"  critical speeds (root finding)      {t_crit * 1e3:8.1f} ms",
        f"  unbalance response, 240 speeds      {t_unb * 1e3:8.1f} ms (full model)",
        f"  unbalance response, Ritz basis      {t_unb_red * 1e3:8.1f} ms   full / Ritz = {t_unb / t_unb_red:.1f}x; "
        f"max diff {u_diff:.1e} of the peak",
        f"  critical speed map, 41 stiffnesses  {t_map * 1e3:8.1f} ms",
    ]


def main() -> None:
    parser = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    parser.add_argument("--load", action="store_true", help="measure again with one core kept busy")
    args = parser.parse_args()
    print("idle machine:")
    print("\n".join(measure()))
    if args.load:
        with one_core_busy():
            print("one core kept busy by another process:")
            print("\n".join(measure()))
    print("target: a 100-speed sweep of a 40-element rotor well under 1 s")


if __name__ == "__main__":
    main()
