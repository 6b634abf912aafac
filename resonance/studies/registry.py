"""The study registry and the one way in: every kind of study has the same shape.

A kind of study implements :class:`~resonance.records.outcome.StudyKind` in its ``kind`` module
(:mod:`resonance.kinds.support.kind`, ...): it says which scenario tables it claims, parses them into its
validated scenario, names the files the study will read, and runs the study into a
:class:`~resonance.records.outcome.StudyOutcome`. :data:`STUDY_KINDS` is the registry; :func:`study_kind_for`
picks the kind of a scenario file; :func:`load` reads and validates a scenario of any kind, :func:`run` runs
it (with its uncertainty study, where the scenario asks for one: this layer owns where that work runs), and
:func:`run_scenario_file` does both. A new kind adds its sub-package under :mod:`resonance.kinds`, one entry
here (or anywhere, with :func:`register_study_kind`) and its figures in :mod:`resonance.ui.report`; nothing
else branches on the kind.

Kinds today:

* ``support``: a machine on its support (``[model]``), with its field verification when the scenario
  has a ``[field]`` table;
* ``rotor``: a rotor on its bearings (``[rotor]``);
* ``torsion``: a drive train's torsional modes (``[torsion]``);
* ``space``: rigid bodies in space on mounts, frames and soil (``[space]``).
"""

from __future__ import annotations

import os
import weakref
from collections.abc import Mapping
from pathlib import Path
from typing import Any

from ..core.errors import InputTypeError
from ..kinds.rotor.kind import RotorStudy
from ..kinds.space.kind import SpaceStudy
from ..kinds.support.kind import SupportStudy
from ..kinds.torsion.kind import TorsionStudy
from ..records.outcome import StudyKind, StudyOutcome
from ..records.tables import ScenarioError, read_scenario_bytes

__all__ = [
    "STUDY_KINDS",
    "kind_of",
    "load",
    "parse_tables",
    "register_study_kind",
    "run",
    "run_scenario_file",
    "study_kind_for",
]


def _uncertainty(scenario: Any, executor: Any, progress: bool) -> Any:
    # The scenario's uncertainty study, when it has an [uncertainty] table.
    if not getattr(scenario, "uncertainty", None):
        return None
    from .uncertainty import run_uncertainty, uncertainty_spec

    spec = uncertainty_spec(scenario.uncertainty, scenario, scenario.source)
    return run_uncertainty(scenario, spec, executor, progress)


def parse_tables(tables: Mapping[str, Any], source: str) -> Any:
    """The validated scenario of the kind its tables describe, its ``[uncertainty]`` table checked too.

    Parameters
    ----------
    tables : mapping
        A scenario's top-level tables (as read from TOML).
    source : str
        The file name errors start with.

    Returns
    -------
    object
        The kind's validated scenario.

    Raises
    ------
    ScenarioError
        No kind claims the tables, or a field is invalid (naming ``source`` and the field); an
        ``[uncertainty]`` table is refused here, before any work.
    """
    scenario = study_kind_for(tables, source).parse(tables, source)
    if getattr(scenario, "uncertainty", None):
        from .uncertainty import uncertainty_spec

        uncertainty_spec(scenario.uncertainty, scenario, source)
    return scenario


#: The registry of kinds, asked in order; the first that claims a scenario runs it.
STUDY_KINDS: list[StudyKind] = [SpaceStudy(), TorsionStudy(), RotorStudy(), SupportStudy()]


def register_study_kind(kind: StudyKind, first: bool = True) -> None:
    """Add a kind of study to the registry (asked first by default, so it may claim before the others).

    Parameters
    ----------
    kind : StudyKind
        The kind to add.
    first : bool
        Ask it before the kinds registered already (default) or after them.

    Raises
    ------
    InputValueError
        A kind of that name is registered already.
    """
    if any(k.name == kind.name for k in STUDY_KINDS):
        raise ScenarioError(f"kind: a study kind named {kind.name!r} is registered already")
    STUDY_KINDS.insert(0 if first else len(STUDY_KINDS), kind)


def study_kind_for(tables: Mapping[str, Any], source: str) -> StudyKind:
    """The kind of study a scenario's tables describe.

    Parameters
    ----------
    tables : mapping
        A scenario's top-level tables.
    source : str
        The file name, for the error.

    Returns
    -------
    StudyKind
        The first registered kind that claims the tables.

    Raises
    ------
    ScenarioError
        No registered kind claims the tables (naming the file and the tables each kind expects).
    """
    for kind in STUDY_KINDS:
        if kind.claims(tables):
            return kind
    raise ScenarioError(
        f"{source}: no [model], [rotor], [torsion] or [space] table; expected one of the study kinds "
        f"{[k.name for k in STUDY_KINDS]}"
    )


# Where load() read each scenario from, so that run() finds its measurement files (by identity; dropped with it).
_FOLDERS: dict[int, Path] = {}


def load(path: str | os.PathLike[str]) -> Any:
    """Read and validate a scenario file of any kind: the one way in (the file is only read).

    Parameters
    ----------
    path : path-like
        The scenario file (TOML).

    Returns
    -------
    Scenario, RotorScenario, TorsionScenario or SpaceScenario
        The validated scenario of the kind its tables describe (chosen through the registry, with the file's
        SHA-256); :func:`run` runs it.

    Raises
    ------
    ScenarioError
        The file cannot be read, is not TOML, is of no known kind, or has an invalid field.

    Examples
    --------
    >>> import resonance
    >>> scenario = resonance.load("notebooks/scenarios/compressor_train.toml")  # doctest: +SKIP
    >>> resonance.run(scenario).verdict  # doctest: +SKIP
    'FAIL'
    """
    source = Path(path)
    tables, sha256 = read_scenario_bytes(source)
    scenario = parse_tables(tables, source.name).replace(sha256=sha256)
    _FOLDERS[id(scenario)] = source.parent
    weakref.finalize(scenario, _FOLDERS.pop, id(scenario), None)
    return scenario


def kind_of(scenario: Any) -> StudyKind:
    """The registered kind of study that runs this scenario object.

    Parameters
    ----------
    scenario : object
        A validated scenario (:func:`load`, or a kind's own parser).

    Returns
    -------
    StudyKind

    Raises
    ------
    InputTypeError
        An object no registered kind runs.
    """
    for kind in STUDY_KINDS:
        owns = getattr(kind, "owns", None)  # a TableKind looks without importing other kinds
        if owns(scenario) if owns is not None else isinstance(scenario, kind.scenario_type):
            return kind
    raise InputTypeError(
        f"scenario: got {type(scenario).__name__}; expected a scenario of one of the kinds "
        f"{[k.name for k in STUDY_KINDS]} (resonance.load reads one from a file)"
    )


def run(
    scenario: Any, folder: str | os.PathLike[str] | None = None, executor: Any = None, progress: bool = False
) -> StudyOutcome:
    """Run every check of a scenario of any kind: verdict, findings, record.

    Parameters
    ----------
    scenario : object
        A validated scenario (:func:`load`).
    folder : path-like, optional
        Where the files the scenario names (measurements) are; the folder :func:`load` read it from, else
        the current one.
    executor : Executor, optional
        Where an uncertainty study's chunks run (:func:`resonance.core.executors.executor_for`); this process
        if omitted. The result does not depend on it.
    progress : bool
        Show progress bars of long work (the uncertainty study, a rotor's sweep).

    Returns
    -------
    StudyOutcome

    Raises
    ------
    InputTypeError
        An object that is not a scenario of a registered kind.
    InputValueError
        A file the scenario names cannot be read (naming the scenario's file and field).
    """
    base = Path(folder) if folder is not None else _FOLDERS.get(id(scenario), Path("."))
    kind = kind_of(scenario)
    uncertainty = _uncertainty(scenario, executor, progress)
    return kind.run(scenario, base, uncertainty=uncertainty, progress=progress)


def run_scenario_file(path: str | os.PathLike[str]) -> StudyOutcome:
    """Read, validate and run a scenario file of any kind (the file is only read).

    Parameters
    ----------
    path : path-like
        The scenario file (TOML).

    Returns
    -------
    StudyOutcome
        The outcome of the scenario's kind, with the file's hash in its record.

    Raises
    ------
    ScenarioError
        The file cannot be read, is not TOML, is of no known kind, or has an invalid field.
    """
    return run(load(path))  # one flow: the file's folder holds its measurement files
