"""Compare what two checkouts produce: every demo scenario's records, and the notebooks' stored outputs.

A refactoring (modules moved or split, scaffolding written once) must not change what a user reads. This
script runs ``python -m resonance check`` on every scenario under ``notebooks/scenarios`` in this checkout and
in a baseline checkout (e.g. ``git worktree add /tmp/base <rev>``), writing the text, JSON and HTML records,
and compares them with the stamps taken out (the creation time, the software versions). With ``--notebooks``
it also compares the text outputs stored in the notebooks (nbval re-runs them against those in the tests).

    python tools/compare_outputs.py --baseline /tmp/base [--notebooks]

Prints one line per file (same / DIFFERENT with the first differing line) and exits 1 on any difference.
"""

from __future__ import annotations

import argparse
import difflib
import json
import os
import re
import subprocess
import sys
import tempfile
from pathlib import Path

HERE = Path(__file__).resolve().parent.parent
#: Stamps that differ between two runs of the same scenario: creation times, the package version and the
#: plotly figures' random ids. Everything else must match to the letter.
STAMPS = (
    (re.compile(r"\d{4}-\d\d-\d\dT\d\d:\d\d:\d\d(\.\d+)?(\+00:00|Z)?"), "<time>"),
    (re.compile(r"resonance \d+\.\d+\.\d+(\S*)"), "resonance <version>"),
    (re.compile(r'"resonance": "\d+\.\d+\.\d+[^"]*"'), '"resonance": "<version>"'),
    (re.compile(r"[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}"), "<figure id>"),
)


#: A plotly figure in an HTML record: its data and layout are compared as JSON values (the order of a layout's
#: keys follows the order the figure was styled in, which is not content).
FIGURE = re.compile(r'(Plotly\.newPlot\(\s*"[^"]+",\s*)(\[.*?\]),\s*(\{.*?\}),(\s*\{[^{}]*\}\s*\))', re.S)


def _sorted_figure(match: re.Match[str]) -> str:
    data, layout = (json.dumps(json.loads(match.group(k)), sort_keys=True) for k in (2, 3))
    return f"{match.group(1)}{data}, {layout},{match.group(4)}"


def _normalised(text: str) -> str:
    text = FIGURE.sub(_sorted_figure, text)
    for pattern, replacement in STAMPS:
        text = pattern.sub(replacement, text)
    return text


def _records(tree: Path, out: Path) -> dict[str, str]:
    # Every scenario's three records from this tree's package (first on the path), run from the tree.
    env = {**os.environ, "PYTHONPATH": str(tree)}
    texts: dict[str, str] = {}
    for scenario in sorted((tree / "notebooks" / "scenarios").glob("*.toml")):
        stem = scenario.stem
        json_path, html_path = out / f"{stem}.json", out / f"{stem}.html"
        command = ["-m", "resonance", "check", str(scenario.relative_to(tree)), "--json", str(json_path)]
        run = subprocess.run(
            [sys.executable, *command, "--html", str(html_path)],
            cwd=tree,
            env=env,
            capture_output=True,
            text=True,
            check=False,
        )
        texts[f"{stem}.txt"] = f"exit {run.returncode}\n{run.stdout}{run.stderr}".replace(str(out), "<out>")
        for path in (json_path, html_path):
            texts[path.name] = path.read_text() if path.exists() else "(not written)"
    return texts


def _notebook_outputs(tree: Path) -> dict[str, str]:
    texts = {}
    for notebook in sorted((tree / "notebooks").glob("*.ipynb")):
        cells = json.loads(notebook.read_text())["cells"]
        outputs = []
        for cell in cells:
            for output in cell.get("outputs", []):
                data = output.get("text") or output.get("data", {}).get("text/plain", "")
                outputs.append("".join(data) if isinstance(data, list) else str(data))
        texts[notebook.name] = "\n".join(outputs)
    return texts


def _compare(name: str, before: str, after: str) -> bool:
    a, b = _normalised(before).splitlines(), _normalised(after).splitlines()
    if a == b:
        print(f"same       {name}")
        return True
    diff = difflib.unified_diff(a, b, lineterm="", n=0)
    first = next((line for line in diff if line[:1] in "+-" and line[:3] not in ("---", "+++")), "")
    print(f"DIFFERENT  {name}: {first[:160]}")
    return False


def main(argv: list[str] | None = None) -> int:
    parser = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    parser.add_argument("--baseline", type=Path, required=True, help="a checkout of the earlier version")
    parser.add_argument("--notebooks", action="store_true", help="also compare the notebooks' stored outputs")
    args = parser.parse_args(argv)
    with tempfile.TemporaryDirectory() as before_dir, tempfile.TemporaryDirectory() as after_dir:
        before = _records(args.baseline.resolve(), Path(before_dir))
        after = _records(HERE, Path(after_dir))
    if args.notebooks:
        before |= _notebook_outputs(args.baseline.resolve())
        after |= _notebook_outputs(HERE)
    same = [_compare(name, before[name], after.get(name, "(missing)")) for name in sorted(before)]
    print(f"{sum(same)} of {len(same)} outputs the same")
    return 0 if all(same) else 1


if __name__ == "__main__":
    sys.exit(main())
