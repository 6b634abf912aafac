"""Fleets: many scenario files checked in one run, with one summary.

``python -m resonance check A.toml B.toml plant/ --summary out/`` checks every scenario file given (a folder
gives its ``*.toml`` files), on local worker processes (one per core unless ``--workers`` says otherwise) or
a Dask cluster (``--scheduler``),
writes each machine's HTML and JSON records and a summary (``summary.txt``, ``summary.csv``,
``summary.html``: machine, verdict, worst finding and its margin, record link) into the summary folder, and
exits 0 when every machine passes, 1 when any fails and 2 when any file is bad input (each bad file named
with its error; the others are still checked).
"""

from __future__ import annotations

import csv
import io
import json
from collections.abc import Sequence
from dataclasses import dataclass
from pathlib import Path

from .core.errors import InputTypeError, InputValueError
from .core.executors import Executor, executor_for, progress_bar
from .records.tables import atomic_write
from .studies.registry import run_scenario_file

__all__ = ["FleetRow", "fleet_files", "fleet_summary_csv", "fleet_summary_text", "run_fleet"]

BAD_INPUT = "BAD INPUT"


@dataclass(frozen=True)
class FleetRow:
    """One machine of a fleet.

    Attributes
    ----------
    path : str
        The scenario file.
    title : str
        The scenario's title ("" when it could not be read).
    kind : str
        The kind of study ("" when it could not be read).
    verdict : str
        ``PASS``, ``PASS WITH EXEMPTION``, ``FAIL`` or ``BAD INPUT``.
    worst : str
        The worst finding in words (or the error for bad input).
    margin : float or None
        Its margin [percent].
    required : float or None
        Its required margin [percent].
    record : str or None
        The HTML record's file name in the summary folder.
    """

    path: str
    title: str
    kind: str
    verdict: str
    worst: str
    margin: float | None = None
    required: float | None = None
    record: str | None = None


def fleet_files(paths: Sequence[Path]) -> list[Path]:
    """The scenario files of a fleet: files as given, folders by their ``*.toml`` files (sorted).

    Parameters
    ----------
    paths : sequence of Path
        Files and folders.

    Returns
    -------
    list of Path
        Each file once, in the order given.

    Raises
    ------
    InputValueError
        A path that does not exist, or a folder without scenario files.
    """
    out: list[Path] = []
    for path in paths:
        if path.is_dir():
            found = sorted(p for p in path.glob("*.toml") if p.is_file())
            if not found:
                raise InputValueError(f"scenario: the folder {path} holds no scenario file (*.toml)")
            out += found
        elif path.exists():
            out.append(path)
        else:
            raise InputValueError(f"scenario: {path} does not exist")
    unique: list[Path] = []
    seen: set[Path] = set()
    for path in out:
        if path.resolve() not in seen:
            seen.add(path.resolve())
            unique.append(path)
    return unique


def _record_names(files: Sequence[Path]) -> list[str]:
    # One record name per file; files with the same name in different folders get their index added.
    stems = [f.stem for f in files]
    return [stem if stems.count(stem) == 1 else f"{stem}-{i + 1}" for i, stem in enumerate(stems)]


def check_file(item: tuple[str, str | None, str]) -> FleetRow:
    """Check one scenario file and write its records (a module-level function, for worker processes).

    Parameters
    ----------
    item : tuple of (str, str or None, str)
        The scenario file, the summary folder (None: no records written) and the record's base name.

    Returns
    -------
    FleetRow

    Raises
    ------
    Nothing
        Bad input becomes a ``BAD INPUT`` row naming the error.
    """
    path, folder, name = item
    try:
        outcome = run_scenario_file(path)
    except (InputValueError, InputTypeError) as error:
        return FleetRow(path, "", "", BAD_INPUT, str(error))
    findings = list(outcome.findings)
    worst = findings[0] if findings else None
    record = None
    if folder is not None:
        from .ui.report import render_outcome_html  # plotly is only needed for the HTML records

        atomic_write(Path(folder) / f"{name}.json", json.dumps(outcome.record.data, indent=2))
        atomic_write(Path(folder) / f"{name}.html", render_outcome_html(outcome))
        record = f"{name}.html"
    verdict = outcome.verdict
    return FleetRow(
        path,
        outcome.title,
        outcome.kind,
        verdict,
        f"{worst.mode.label} x {worst.excitation.label}: {worst.verdict}" if worst else "no finding",
        worst.margin if worst else None,
        worst.required_margin if worst else None,
        record,
    )


def run_fleet(
    paths: Sequence[Path], folder: Path | None = None, executor: Executor | None = None, progress: bool = False
) -> list[FleetRow]:
    """Check every scenario file of a fleet and write the records and the summary.

    Parameters
    ----------
    paths : sequence of Path
        Scenario files and folders (see :func:`fleet_files`).
    folder : Path, optional
        The summary folder (created if its parent exists): each machine's records and ``summary.txt``,
        ``summary.csv``, ``summary.html``. Nothing is written if omitted.
    executor : Executor, optional
        Where the files are checked (local processes, one per core, if omitted); the rows do not depend on it.
    progress : bool
        Show a progress bar.

    Returns
    -------
    list of FleetRow
        In the order of the files.

    Raises
    ------
    InputValueError
        A path that does not exist, an empty folder, a summary folder that cannot be made.
    """
    files = fleet_files(paths)
    if folder is not None:
        if folder.exists() and not folder.is_dir():
            raise InputValueError(f"--summary: {folder} is a file; expected a folder")
        if not folder.exists():
            if not folder.parent.is_dir():
                raise InputValueError(f"--summary: the folder {folder.parent} does not exist")
            try:
                folder.mkdir()
            except OSError as error:
                raise InputValueError(f"--summary: cannot make the folder {folder} ({error.strerror})") from None
        # Permission bits do not stop root, and a read-only mount shows none: try writing before any work.
        probe = folder / ".summary.partial"
        try:
            probe.write_bytes(b"")
            probe.unlink()
        except OSError as error:
            raise InputValueError(f"--summary: cannot write in the folder {folder} ({error.strerror})") from None
    names = _record_names(files)
    items = [(str(f), None if folder is None else str(folder), n) for f, n in zip(files, names, strict=True)]
    with progress_bar(len(items), "fleet", progress) as tick:
        rows = (executor or executor_for(0)).map(check_file, items, tick)
    if folder is not None:
        from .ui.report import render_fleet_html

        atomic_write(folder / "summary.txt", fleet_summary_text(rows))
        atomic_write(folder / "summary.csv", fleet_summary_csv(rows))
        atomic_write(folder / "summary.html", render_fleet_html(rows))
    return rows


def fleet_summary_text(rows: Sequence[FleetRow]) -> str:
    """The fleet summary as a text table with the counts.

    Parameters
    ----------
    rows : sequence of FleetRow
        The machines.

    Returns
    -------
    str
        The counts line, then one line per machine with its verdict.

    Raises
    ------
    Nothing
        Pure text.
    """
    counts = {v: sum(r.verdict == v for r in rows) for v in ("PASS", "PASS WITH EXEMPTION", "FAIL", BAD_INPUT)}
    lines = [
        f"FLEET: {len(rows)} machines; "
        + ", ".join(f"{n} {v}" for v, n in counts.items() if n)
        + ("" if counts["FAIL"] + counts[BAD_INPUT] else "; every machine passes"),
        "",
        f"{'verdict':<20} {'SM [%]':>7} {'req. [%]':>8}  {'machine':<40} worst finding (or error)",
    ]
    for r in rows:
        name = r.title or Path(r.path).name
        sm = "-" if r.margin is None else f"{r.margin:.1f}"
        req = "-" if r.required is None else f"{r.required:.1f}"
        lines.append(f"{r.verdict:<20} {sm:>7} {req:>8}  {name[:40]:<40} {r.worst}")
    return "\n".join(lines) + "\n"


def fleet_summary_csv(rows: Sequence[FleetRow]) -> str:
    """The fleet summary as CSV (one row per machine).

    Parameters
    ----------
    rows : sequence of FleetRow
        The machines.

    Returns
    -------
    str
        CSV text, a header row and one row per machine.

    Raises
    ------
    Nothing
        Pure text.
    """
    out = io.StringIO()
    writer = csv.writer(out, lineterminator="\n")
    writer.writerow(
        ["file", "machine", "kind", "verdict", "worst_finding", "margin_percent", "required_percent", "record"]
    )
    for r in rows:
        writer.writerow([r.path, r.title, r.kind, r.verdict, r.worst, r.margin, r.required, r.record or ""])
    return out.getvalue()
