"""The ``check`` and ``compare`` commands.

``python -m resonance check SCENARIO [--html FILE] [--json FILE]`` runs a
scenario of any registered kind (:mod:`resonance.studies.registry`: support, rotor), prints the
text record, writes the self-contained HTML record and the JSON of inputs and
findings when asked, and exits 0 when every check passes (``PASS`` or ``PASS
WITH EXEMPTION``), 1 when any fails, and 2 on bad input (with a message naming
the file and the field, or the option). Output paths are checked before the
study runs; records are built in full before anything is written, and written
through a temporary file, so a failed run never leaves a partial record; the
scenario and measurement files are only read.

``python -m resonance check A.toml B.toml plant/ --summary out/ [--workers N | --scheduler ADDRESS]`` checks
a fleet (see :mod:`resonance.fleet`): one summary, each machine's records, exit 0 all pass, 1 any fails, 2 any
bad input (each bad file named; the rest still checked). ``--workers`` and ``--scheduler`` also spread an
uncertainty study's work.

``python -m resonance compare OLD.json NEW.json`` lists the inputs and
findings that changed between two JSON records and exits 0 when the verdict
is the same, 1 when it changed, and 2 on bad input.
"""

from __future__ import annotations

import argparse
import json
import os
import sys
from collections.abc import Sequence
from pathlib import Path
from typing import Any

from .core.errors import InputTypeError, InputValueError

__all__ = ["main"]

EXIT_PASS, EXIT_FAIL, EXIT_BAD_INPUT = 0, 1, 2


def _parser() -> argparse.ArgumentParser:
    parser = argparse.ArgumentParser(prog="python -m resonance", description="Resonance and separation-margin checks.")
    commands = parser.add_subparsers(dest="command", required=True)
    check = commands.add_parser("check", help="run every check of a scenario file, or of a fleet of them")
    check.add_argument("scenario", type=Path, nargs="+", help="scenario file (TOML); several, or folders, for a fleet")
    check.add_argument("--html", type=Path, help="write the self-contained HTML record here (one scenario)")
    check.add_argument("--json", type=Path, help="write the JSON record (inputs and findings) here (one scenario)")
    check.add_argument(
        "--summary", type=Path, help="fleet: write each machine's records and summary.txt/.csv/.html in this folder"
    )
    where = check.add_mutually_exclusive_group()
    where.add_argument(
        "--workers",
        type=int,
        help="local worker processes (0: one per core; default: one per core for a fleet, "
        "this process for one scenario)",
    )
    where.add_argument("--scheduler", help="a Dask scheduler address (tcp://host:8786): run there instead")
    compare = commands.add_parser("compare", help="compare two JSON records (inputs, findings, verdict)")
    compare.add_argument("old", type=Path, help="the earlier JSON record")
    compare.add_argument("new", type=Path, help="the later JSON record")
    return parser


def _same_file(a: Path, b: Path) -> bool:
    try:
        return a.resolve() == b.resolve() or (a.exists() and b.exists() and os.path.samefile(a, b))
    except OSError:
        return False


def check_outputs(outputs: dict[str, Path | None], inputs: Sequence[Path]) -> None:
    """Refuse output paths that cannot be written or would touch an input, before any work.

    Raises
    ------
    InputValueError
        Naming the option (``--html``, ``--json``) and the reason.
    """
    given = {option: path for option, path in outputs.items() if path is not None}
    seen: dict[Path, str] = {}
    for option, path in given.items():
        flag = f"--{option}"
        if str(path) == "" or path.name in ("", ".", ".."):
            raise InputValueError(f"{flag}: {str(path)!r} is not a file name")
        parent = path.parent if str(path.parent) else Path(".")
        try:
            limit = os.pathconf(parent if parent.is_dir() else ".", "PC_NAME_MAX")
        except (OSError, ValueError, AttributeError):
            limit = 255
        # The temporary file adds a leading dot and ".partial" to the name.
        if len(os.fsencode(path.name)) + len(".") + len(".partial") > limit:
            raise InputValueError(f"{flag}: the file name is longer than this file system allows ({limit} bytes)")
        for other, opt in seen.items():
            if _same_file(path, other):
                raise InputValueError(f"{flag}: {path} is also the path of {opt}; choose two different files")
        seen[path] = flag
        for source in inputs:
            if _same_file(path, source):
                raise InputValueError(f"{flag}: {path} is an input file ({source}); choose another file")
        if path.is_dir():
            raise InputValueError(f"{flag}: {path} is a folder; expected a file name")
        if not parent.is_dir():
            raise InputValueError(f"{flag}: the folder {parent} does not exist")
        if path.exists() and not os.access(path, os.W_OK):
            raise InputValueError(f"{flag}: {path} exists and is read-only")
        # Permission bits do not stop root, and a read-only mount shows none: try the temporary file itself.
        probe = parent / f".{path.name}.partial"
        try:
            descriptor = os.open(probe, os.O_CREAT | os.O_EXCL | os.O_WRONLY, 0o600)
        except FileExistsError:
            continue  # a stale temporary file of an interrupted run: the write replaces it
        except OSError as error:
            raise InputValueError(f"{flag}: cannot write in the folder {parent} ({error.strerror})") from None
        os.close(descriptor)
        os.unlink(probe)


def _check(args: argparse.Namespace) -> int:
    # The study's modules are imported here, not at the top: --help and argument errors answer at once.
    from .core.executors import executor_for
    from .records.tables import atomic_write
    from .studies.registry import kind_of, load, run

    progress = sys.stderr.isatty()
    paths: list[Path] = args.scenario
    if len(paths) > 1 or paths[0].is_dir() or args.summary is not None:
        # A fleet runs on local processes (one per core) unless told otherwise.
        workers = 0 if args.workers is None else args.workers
        return _fleet(args, executor_for(args.scheduler if args.scheduler else workers), progress)
    executor = executor_for(args.scheduler if args.scheduler else args.workers)
    path = paths[0]
    scenario = load(path)  # the one way in, as a notebook reads it
    check_outputs({"html": args.html, "json": args.json}, [path, *kind_of(scenario).inputs(scenario, path.parent)])
    outcome = run(scenario, path.parent, executor=executor, progress=progress)
    texts: list[tuple[Path, str]] = []
    if args.json is not None:
        texts.append((args.json, json.dumps(outcome.record.data, indent=2)))
    if args.html is not None:
        from .ui.report import render_outcome_html  # plotly is only needed for the HTML record

        texts.append((args.html, render_outcome_html(outcome)))
    for path, text in texts:
        atomic_write(path, text)
    print(outcome.record.text)
    for path, _ in texts:
        print(f"wrote {path}")
    return EXIT_PASS if outcome.passed else EXIT_FAIL


def _fleet(args: argparse.Namespace, executor: Any, progress: bool) -> int:
    from .fleet import BAD_INPUT, fleet_summary_text, run_fleet

    if args.html is not None or args.json is not None:
        raise InputValueError("--html/--json: a fleet writes one record per machine; give --summary FOLDER instead")
    rows = run_fleet(args.scenario, args.summary, executor, progress)
    print(fleet_summary_text(rows), end="")
    if args.summary is not None:
        print(f"wrote {args.summary / 'summary.html'}, summary.csv, summary.txt and each machine's records")
    if any(r.verdict == BAD_INPUT for r in rows):
        for r in rows:
            if r.verdict == BAD_INPUT:
                print(f"error: {r.worst}", file=sys.stderr)
        return EXIT_BAD_INPUT
    return EXIT_FAIL if any(r.verdict == "FAIL" for r in rows) else EXIT_PASS


def _compare(args: argparse.Namespace) -> int:
    from .records.compare import compare_records, load_record

    comparison = compare_records(load_record(args.old), load_record(args.new))
    print(comparison.to_text())
    return EXIT_FAIL if comparison.verdict_changed else EXIT_PASS


def main(argv: Sequence[str] | None = None) -> int:
    """Entry point; returns the exit code.

    Parameters
    ----------
    argv : sequence of str, optional
        The arguments (``sys.argv[1:]`` if omitted).

    Returns
    -------
    int
        0 pass, 1 fail (or a changed verdict for ``compare``), 2 bad input.

    Raises
    ------
    SystemExit
        On a usage error (from argparse, exit code 2).
    """
    args = _parser().parse_args(argv)
    try:
        return _compare(args) if args.command == "compare" else _check(args)
    except (InputValueError, InputTypeError) as error:
        print(f"error: {error}", file=sys.stderr)
        return EXIT_BAD_INPUT
