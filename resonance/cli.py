"""The ``check`` command: run every check of a scenario file, headless.

``python -m resonance check SCENARIO [--html FILE] [--json FILE]`` runs a
support scenario, or a rotor scenario (one with a ``rotor`` table), prints the
text record, writes the self-contained HTML record and the JSON of inputs and
findings when asked, and exits 0 when every check passes, 1 when any fails,
and 2 on bad input (with a message naming the file and the field). Records
are built in full before anything is written, and written through a
temporary file, so a failed run never leaves a partial record; the scenario
file is only read.
"""

from __future__ import annotations

import argparse
import json
import sys
from collections.abc import Sequence
from pathlib import Path

from .errors import InputTypeError, InputValueError
from .record import atomic_write, build_record
from .scenario import parse_scenario, read_scenario_file
from .study import run_study

__all__ = ["main"]

EXIT_PASS, EXIT_FAIL, EXIT_BAD_INPUT = 0, 1, 2


def _parser() -> argparse.ArgumentParser:
    parser = argparse.ArgumentParser(prog="python -m resonance", description="Resonance and separation-margin checks.")
    commands = parser.add_subparsers(dest="command", required=True)
    check = commands.add_parser("check", help="run every check of a scenario file")
    check.add_argument("scenario", type=Path, help="scenario file (TOML)")
    check.add_argument("--html", type=Path, help="write the self-contained HTML record here")
    check.add_argument("--json", type=Path, help="write the JSON record (inputs and findings) here")
    return parser


def _check(args: argparse.Namespace) -> int:
    for option in ("html", "json"):
        target = getattr(args, option)
        if target is not None and target.resolve() == args.scenario.resolve():
            raise InputValueError(f"--{option}: {target} is the scenario file itself; choose another file")
    data = read_scenario_file(args.scenario)
    name = args.scenario.name
    if "rotor" in data:  # a rotor scenario
        from .rotor.record import build_rotor_record
        from .rotor.scenario import parse_rotor_scenario
        from .rotor.study import run_rotor_study

        rotor_result = run_rotor_study(parse_rotor_scenario(data, name))
        record, passed = build_rotor_record(rotor_result), rotor_result.passed

        def page() -> str:
            from .ui.report import render_rotor_html

            return render_rotor_html(rotor_result, record)

    else:
        scenario = parse_scenario(data, name)
        result = run_study(scenario)
        field = None
        if scenario.field:  # measurements that verify the model
            from .field.study import run_field_study

            field = run_field_study(scenario, args.scenario.parent)
        record = build_record(result, field=field)
        passed = result.passed and (field is None or field.passed)

        def page() -> str:
            from .ui.report import render_html  # plotly is only needed for the HTML record

            return render_html(result, record, field)

    outputs: list[tuple[str, Path, str]] = []
    if args.json is not None:
        outputs.append(("json", args.json, json.dumps(record.data, indent=2)))
    if args.html is not None:
        outputs.append(("html", args.html, page()))
    for option, path, _ in outputs:
        if not path.parent.is_dir():
            raise InputValueError(f"--{option}: the folder {path.parent} does not exist")
    for _, path, text in outputs:
        atomic_write(path, text)
    print(record.text)
    for _, path, _ in outputs:
        print(f"wrote {path}")
    return EXIT_PASS if passed else EXIT_FAIL


def main(argv: Sequence[str] | None = None) -> int:
    """Entry point; returns the exit code."""
    args = _parser().parse_args(argv)
    try:
        return _check(args)
    except (InputValueError, InputTypeError) as error:
        print(f"error: {error}", file=sys.stderr)
        return EXIT_BAD_INPUT
