"""One study layer: every kind of study (support, rotor, and those to come) has the same shape.

A kind of study implements :class:`StudyKind`: it says which scenario tables it claims, parses them into
its validated scenario, names the files the study will read, and runs the study into a
:class:`StudyOutcome`, the one result shape the ``check`` command, the records and the HTML report use
(verdict, summary, findings, record). :data:`STUDY_KINDS` is the registry; :func:`study_kind_for` picks
the kind of a scenario file, and :func:`run_scenario_file` runs one end to end. A new kind (torsional
trains, 3D supports) adds a class here (or anywhere, with :func:`register_study_kind`) and its figures in
:mod:`resonance.ui.report`; nothing else branches on the kind.

Kinds today:

* ``support``: a machine on its support (``[model]``), with its field verification when the scenario
  has a ``[field]`` table (:mod:`resonance.kinds.support.study`, :mod:`resonance.kinds.field.study`);
* ``rotor``: a rotor on its bearings (``[rotor]``; :mod:`resonance.kinds.rotor.study`);
* ``torsion``: a drive train's torsional modes (``[torsion]``; :mod:`resonance.kinds.torsion.study`).
"""

from __future__ import annotations

import os
import weakref
from collections.abc import Mapping
from dataclasses import dataclass
from pathlib import Path
from typing import Any, Protocol

from ..checks.interference import FindingsTable
from ..core.errors import InputTypeError
from ..core.units import UnitSystem
from ..kinds.support.record import build_record
from ..records.record import Record
from ..records.tables import ScenarioError, read_scenario_bytes

__all__ = [
    "STUDY_KINDS",
    "RotorStudy",
    "SpaceStudy",
    "StudyKind",
    "StudyOutcome",
    "SupportStudy",
    "TorsionStudy",
    "kind_of",
    "load",
    "register_study_kind",
    "run",
    "rotor_outcome",
    "run_scenario_file",
    "study_kind_for",
    "support_outcome",
]


@dataclass(frozen=True)
class StudyOutcome:
    """What one run of any kind of study gives, in one shape.

    Attributes
    ----------
    kind : str
        The kind's name (``"support"``, ``"rotor"``).
    title : str
        The scenario's title.
    units : {"SI", "US"}
        The scenario's unit system (for display).
    result : object
        The kind's own result (``StudyResult``, ``RotorStudyResult``...), for its figures.
    passed : bool
        True when every check of the study passes (an exemption passes, and is named).
    summary : str
        The verdict and its lines, in the scenario's units.
    findings : FindingsTable
        The margin findings of the model, worst first.
    tables : tuple of (str, FindingsTable)
        Further findings with a heading (measured modes, a tuned model).
    record : Record
        The calculation record (JSON-ready data and text).
    field : object or None
        The field verification, where the kind has one.
    uncertainty : object or None
        The uncertainty study, where the scenario asks for one.
    """

    kind: str
    title: str
    units: UnitSystem
    result: Any
    passed: bool
    summary: str
    findings: FindingsTable
    tables: tuple[tuple[str, FindingsTable], ...]
    record: Record
    field: Any = None
    uncertainty: Any = None

    @property
    def verdict(self) -> str:
        """``"PASS"``, ``"PASS WITH EXEMPTION"`` or ``"FAIL"`` (the record's)."""
        return str(self.record.data["verdict"])


class StudyKind(Protocol):
    """What every kind of study implements."""

    @property
    def name(self) -> str:
        """Short name of the kind (``"support"``, ``"rotor"``)."""

    def claims(self, tables: Mapping[str, Any]) -> bool:
        """True when a scenario's top-level tables are of this kind."""

    def parse(self, tables: Mapping[str, Any], source: str) -> Any:
        """The validated scenario; errors name ``source`` and the field."""

    def inputs(self, scenario: Any, base_dir: Path) -> list[Path]:
        """The files the study will read besides the scenario (measurements), for the output checks."""

    def run(self, scenario: Any, base_dir: Path) -> StudyOutcome:
        """Run every check of the scenario (files named in it are relative to ``base_dir``)."""


class SupportStudy:
    """A machine on its support: modes, interference, response, zones; field verification with ``[field]``."""

    name = "support"

    @property
    def scenario_type(self) -> type:
        """The class of the scenarios this kind runs (imported when asked)."""
        from ..kinds.support.scenario import Scenario

        return Scenario

    #: Where an uncertainty study's chunks run and whether it shows progress (the check command sets them).
    executor: Any = None
    progress: bool = False

    def claims(self, tables: Mapping[str, Any]) -> bool:
        """Scenarios with a ``[model]`` table."""
        return "model" in tables

    def parse(self, tables: Mapping[str, Any], source: str) -> Any:
        """See :func:`resonance.kinds.support.scenario.parse_scenario`."""
        from ..kinds.support.scenario import parse_scenario

        scenario = parse_scenario(tables, source)
        if scenario.uncertainty:
            from .uncertainty import uncertainty_spec

            uncertainty_spec(scenario.uncertainty, scenario, source)  # refused here, before any work
        return scenario

    def inputs(self, scenario: Any, base_dir: Path) -> list[Path]:
        """The coast-down and impact files of the ``[field]`` table, if any."""
        if not scenario.field:
            return []
        from ..kinds.field.study import field_spec

        spec = field_spec(scenario, base_dir)
        return [spec.coastdown, *([spec.impact] if spec.impact is not None else [])]

    def run(self, scenario: Any, base_dir: Path) -> StudyOutcome:
        """See :func:`~.support.study.run_study` and :func:`~.field.study.run_field_study`."""
        from ..kinds.support.study import run_study

        field = None
        if scenario.field:
            from ..kinds.field.study import run_field_study

            field = run_field_study(scenario, base_dir)
        uncertainty = _uncertainty(scenario, self.executor, self.progress)
        result = run_study(scenario)
        fixes = None
        if not result.findings.passed:
            from ..kinds.support.whatif import fix_options

            fixes = fix_options(scenario)
        return support_outcome(result, field, uncertainty=uncertainty, fixes=fixes)


class RotorStudy:
    """A rotor on its bearings: Campbell data, critical speeds, API margins, stability, shaft vibration."""

    name = "rotor"

    @property
    def scenario_type(self) -> type:
        """The class of the scenarios this kind runs (imported when asked)."""
        from ..kinds.rotor.scenario import RotorScenario

        return RotorScenario

    #: Where an uncertainty study's variants run and whether long work shows progress (the check command sets
    #: them on a copy).
    executor: Any = None
    progress: bool = False

    def claims(self, tables: Mapping[str, Any]) -> bool:
        """Scenarios with a ``[rotor]`` table."""
        return "rotor" in tables

    def parse(self, tables: Mapping[str, Any], source: str) -> Any:
        """See :func:`resonance.kinds.rotor.scenario.parse_rotor_scenario`."""
        from ..kinds.rotor.scenario import parse_rotor_scenario

        scenario = parse_rotor_scenario(tables, source)
        if scenario.uncertainty:
            from .uncertainty import uncertainty_spec

            uncertainty_spec(scenario.uncertainty, scenario, source)  # refused here, before any work
        return scenario

    def inputs(self, scenario: Any, base_dir: Path) -> list[Path]:
        """None: a rotor study reads no measurement file."""
        return []

    def run(self, scenario: Any, base_dir: Path) -> StudyOutcome:
        """See :func:`resonance.kinds.rotor.study.run_rotor_study`."""
        from ..kinds.rotor.study import run_rotor_study

        uncertainty = _uncertainty(scenario, self.executor, self.progress)
        return rotor_outcome(run_rotor_study(scenario, progress=self.progress), uncertainty=uncertainty)


class TorsionStudy:
    """A drive train: torsional modes against every shaft's orders, gear meshes and electrical sources."""

    name = "torsion"

    @property
    def scenario_type(self) -> type:
        """The class of the scenarios this kind runs (imported when asked)."""
        from ..kinds.torsion.scenario import TorsionScenario

        return TorsionScenario

    def claims(self, tables: Mapping[str, Any]) -> bool:
        """Scenarios with a ``[torsion]`` table."""
        return "torsion" in tables

    def parse(self, tables: Mapping[str, Any], source: str) -> Any:
        """See :func:`resonance.kinds.torsion.study.parse_torsion_scenario`."""
        from ..kinds.torsion.scenario import parse_torsion_scenario

        return parse_torsion_scenario(tables, source)

    def inputs(self, scenario: Any, base_dir: Path) -> list[Path]:
        """None: a torsional study reads no measurement file."""
        return []

    def run(self, scenario: Any, base_dir: Path) -> StudyOutcome:
        """See :func:`resonance.kinds.torsion.study.run_torsion_study`."""
        from ..kinds.torsion.record import build_torsion_record
        from ..kinds.torsion.study import run_torsion_study

        result = run_torsion_study(scenario)
        return _plain_outcome(self.name, scenario, result, build_torsion_record(result))


class SpaceStudy:
    """Supports in space: rigid bodies, frames, mounts and soil; modes in words, findings, bearing response."""

    name = "space"

    @property
    def scenario_type(self) -> type:
        """The class of the scenarios this kind runs (imported when asked)."""
        from ..kinds.space.scenario import SpaceScenario

        return SpaceScenario

    def claims(self, tables: Mapping[str, Any]) -> bool:
        """Scenarios with a ``[space]`` table."""
        return "space" in tables

    def parse(self, tables: Mapping[str, Any], source: str) -> Any:
        """See :func:`resonance.kinds.space.scenario.parse_space_scenario`."""
        from ..kinds.space.scenario import parse_space_scenario

        return parse_space_scenario(tables, source)

    def inputs(self, scenario: Any, base_dir: Path) -> list[Path]:
        """None: the study reads no measurement file."""
        return []

    def run(self, scenario: Any, base_dir: Path) -> StudyOutcome:
        """See :func:`resonance.kinds.space.study.run_space_study`."""
        from ..kinds.space.record import build_space_record
        from ..kinds.space.study import run_space_study

        result = run_space_study(scenario)
        return _plain_outcome(self.name, scenario, result, build_space_record(result))


def _uncertainty(scenario: Any, executor: Any, progress: bool) -> Any:
    # The scenario's uncertainty study, when it has an [uncertainty] table.
    if not scenario.uncertainty:
        return None
    from .uncertainty import run_uncertainty, uncertainty_spec

    spec = uncertainty_spec(scenario.uncertainty, scenario, scenario.source)
    return run_uncertainty(scenario, spec, executor, progress)


def _plain_outcome(kind: str, scenario: Any, result: Any, record: Record) -> StudyOutcome:
    # The outcome of a kind whose verdict is its result's alone (torsion, space).
    return StudyOutcome(
        kind,
        scenario.title,
        scenario.units,
        result,
        result.passed,
        result.summary(scenario.units),
        result.findings,
        (),
        record,
    )


def support_outcome(
    result: Any, field: Any = None, record: Record | None = None, uncertainty: Any = None, fixes: Any = None
) -> StudyOutcome:
    """The outcome of a support study and, when given, its field verification.

    Parameters
    ----------
    result : StudyResult
        The support study.
    field : FieldStudyResult, optional
        Its field verification; the verdict then needs both to pass.
    record : Record, optional
        The record, when already built (built from ``result`` and ``field`` otherwise).
    uncertainty : UncertaintyResult, optional
        Its uncertainty study (fails the verdict only above a given ``max_failure_probability``).
    fixes : FixOptions, optional
        The smallest changes that make every margin check pass (a failing scenario's).

    Returns
    -------
    StudyOutcome

    Raises
    ------
    Nothing
        The results are already validated.
    """
    units = result.scenario.units
    record = record if record is not None else build_record(result, field=field, uncertainty=uncertainty, fixes=fixes)
    summary = result.summary(units)
    tables: list[tuple[str, FindingsTable]] = []
    if field is not None:
        if field.findings is not None:
            tables.append(("Field verification: measured modes against the rules", field.findings))
        if field.tuned_study is not None:
            tables.append(("Field verification: tuned model", field.tuned_study.findings))
        summary = (
            f"Verdict: {record.data['verdict']} (the design model and its field verification together)\n\n"
            f"Design model:\n{summary}\n\n{field.summary()}"
        )
    if fixes is not None:
        summary += "\n\nWhat would fix it:\n" + "\n".join(fixes.lines())
    if uncertainty is not None:
        summary += f"\n\nUncertainty:\n{uncertainty.summary()}"
    passed = result.passed and (field is None or field.passed) and (uncertainty is None or uncertainty.passed)
    return StudyOutcome(
        "support",
        result.scenario.title,
        units,
        result,
        passed,
        summary,
        result.findings,
        tuple(tables),
        record,
        field,
        uncertainty,
    )


def rotor_outcome(result: Any, record: Record | None = None, uncertainty: Any = None) -> StudyOutcome:
    """The outcome of a rotor study.

    Parameters
    ----------
    result : RotorStudyResult
        The rotor study.
    record : Record, optional
        The record, when already built.
    uncertainty : UncertaintyResult, optional
        Its uncertainty study (fails the verdict only above a given ``max_failure_probability``).

    Returns
    -------
    StudyOutcome

    Raises
    ------
    Nothing
        The result is already validated.
    """
    from ..kinds.rotor.record import build_rotor_record

    units = result.scenario.units
    record = record if record is not None else build_rotor_record(result, uncertainty=uncertainty)
    summary = result.summary(units)
    if uncertainty is not None:
        summary += f"\n\nUncertainty:\n{uncertainty.summary()}"
    passed = result.passed and (uncertainty is None or uncertainty.passed)
    title = result.scenario.title
    return StudyOutcome(
        "rotor", title, units, result, passed, summary, result.findings, (), record, uncertainty=uncertainty
    )


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
    scenario = study_kind_for(tables, source.name).parse(tables, source.name).replace(sha256=sha256)
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
        scenario_type = getattr(kind, "scenario_type", None)
        if scenario_type is not None and isinstance(scenario, scenario_type):
            return kind
    raise InputTypeError(
        f"scenario: got {type(scenario).__name__}; expected a scenario of one of the kinds "
        f"{[k.name for k in STUDY_KINDS]} (resonance.load reads one from a file)"
    )


def run(scenario: Any, folder: str | os.PathLike[str] | None = None) -> StudyOutcome:
    """Run every check of a scenario of any kind: verdict, findings, record.

    Parameters
    ----------
    scenario : object
        A validated scenario (:func:`load`).
    folder : path-like, optional
        Where the files the scenario names (measurements) are; the folder :func:`load` read it from, else
        the current one.

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
    return kind_of(scenario).run(scenario, base)


def run_scenario_file(path: str | os.PathLike[str]) -> StudyOutcome:
    """Read, validate and run a scenario file of any kind (the file is only read).

    Parameters
    ----------
    path : path-like
        The scenario file (TOML).

    Returns
    -------
    StudyOutcome

    Raises
    ------
    ScenarioError
        The file cannot be read, is not TOML, is of no known kind, or has an invalid field.
    """
    return run(load(path))  # one flow: the file's folder holds its measurement files
