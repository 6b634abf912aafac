"""How fast the package starts: `import resonance`, `python -m resonance --help`, and a demo support check.

Each is a fresh interpreter (wall time, median of the runs), as a user meets it. With `--baseline DIR` (a
checkout of an earlier version, e.g. `git worktree add /tmp/v020 f553de9`) the same three are measured there
in the same run and printed side by side, with the ratio.

    python benchmarks/start_time.py [--runs 7] [--baseline DIR] [--load]

Targets (issue of record): import and --help under 0.3 s, the demo check under 1 s wall.
"""

from __future__ import annotations

import argparse
import contextlib
import os
import statistics
import subprocess
import sys
import time
from pathlib import Path

from _load import one_core_busy

HERE = Path(__file__).resolve().parent.parent
DEMO = "notebooks/scenarios/cooling_water_pump.toml"
COMMANDS = {
    "import resonance": ["-c", "import resonance"],
    "python -m resonance --help": ["-m", "resonance", "--help"],
    f"check {Path(DEMO).name}": ["-m", "resonance", "check", DEMO],
}


def _wall(tree: Path, arguments: list[str], runs: int) -> float:
    # The tree's package first on the path, run from the tree (the demo path is relative to it).
    env = {**os.environ, "PYTHONPATH": str(tree)}
    times = []
    for _ in range(runs):
        start = time.perf_counter()
        subprocess.run([sys.executable, *arguments], cwd=tree, env=env, capture_output=True, check=False)
        times.append(time.perf_counter() - start)
    return statistics.median(times)


def main() -> None:
    parser = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    parser.add_argument("--runs", type=int, default=7)
    parser.add_argument("--baseline", type=Path, help="a checkout of an earlier version to compare with")
    parser.add_argument("--load", action="store_true", help="keep one core busy while measuring")
    args = parser.parse_args()
    with one_core_busy() if args.load else contextlib.nullcontext():
        rows = []
        for label, arguments in COMMANDS.items():
            now = _wall(HERE, arguments, args.runs)
            before = _wall(args.baseline, arguments, args.runs) if args.baseline else None
            rows.append((label, now, before))
    print(f"start-up, wall time, median of {args.runs} fresh interpreters{' (one core busy)' if args.load else ''}")
    print(f"{'':32}{'this tree':>12}{'baseline':>12}{'ratio':>9}")
    for label, now, before in rows:
        if before is None:
            print(f"{label:32}{now:>11.3f}s{'-':>12}{'-':>9}")
        else:
            print(f"{label:32}{now:>11.3f}s{before:>11.3f}s{before / now:>8.1f}x")


if __name__ == "__main__":
    main()
