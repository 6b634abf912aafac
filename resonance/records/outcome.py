"""What every kind of study gives back and implements: :class:`StudyOutcome` and :class:`StudyKind`.

The outcome is the one result shape the ``check`` command, the records and the HTML report use (verdict,
summary, findings, record). Each kind's ``kind`` module implements the protocol; the registry
(:mod:`resonance.studies.registry`) asks them in turn.
"""

from __future__ import annotations

import importlib
import sys
from collections.abc import Mapping
from dataclasses import dataclass
from pathlib import Path
from typing import Any, Protocol

from ..checks.interference import FindingsTable
from ..core.units import UnitSystem
from .record import Record

__all__ = [
    "StudyKind",
    "StudyOutcome",
    "TableKind",
    "plain_outcome",
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
    """What every kind of study implements (its ``kind`` module), so the studies layer never looks inside it.

    A kind that can be sampled by an uncertainty study also has ``uncertain_targets(scenario) -> list[str]``
    (what an ``[uncertainty]`` table may vary) and ``variant_findings(scenario, varies, values) ->
    VariantFindings`` (the findings of a block of variants, one row of factors each; see
    :class:`~resonance.checks.variant_findings.VariantFindings`).
    """

    @property
    def name(self) -> str:
        """Short name of the kind (``"support"``, ``"rotor"``)."""

    @property
    def scenario_type(self) -> type:
        """The class of the scenarios this kind runs (imported when asked)."""

    def claims(self, tables: Mapping[str, Any]) -> bool:
        """True when a scenario's top-level tables are of this kind."""

    def parse(self, tables: Mapping[str, Any], source: str) -> Any:
        """The validated scenario; errors name ``source`` and the field."""

    def inputs(self, scenario: Any, base_dir: Path) -> list[Path]:
        """The files the study will read besides the scenario (measurements), for the output checks."""

    def run(self, scenario: Any, base_dir: Path, uncertainty: Any = None, progress: bool = False) -> StudyOutcome:
        """Run every check of the scenario (files named in it are relative to ``base_dir``).

        ``uncertainty`` is the scenario's uncertainty study when it has one (run by the studies layer, which
        owns where the work runs); ``progress`` shows progress bars of long work.
        """


class TableKind:
    """What most kinds' registry entries share: one table claims a scenario, no measurement file is read.

    The scenario's class and parser sit in the kind's ``scenario`` module (imported when first asked).

    A kind's entry sets :attr:`name`, :attr:`table` and :attr:`package` and writes its own ``run``.

    Attributes
    ----------
    name : str
        The kind's name.
    table : str
        The top-level table that makes a scenario of this kind (``"space"`` for ``[space]``).
    package : str
        The kind's package (``__package__`` of its ``kind`` module); its ``scenario`` module holds
        :attr:`scenario_class` and :attr:`parser`.
    scenario_class, parser : str
        The names of the scenario class and of its parser in that module.
    """

    name = ""
    table = ""
    package = ""
    scenario_class = ""
    parser = ""

    def _scenario_module(self) -> Any:
        return importlib.import_module(f"{self.package}.scenario")

    @property
    def scenario_type(self) -> type:
        """The class of the scenarios this kind runs (imported when asked)."""
        return getattr(self._scenario_module(), self.scenario_class)

    def owns(self, scenario: object) -> bool:
        """True when ``scenario`` is of this kind, without importing the kind when it cannot be.

        A scenario of a kind whose ``scenario`` module was never imported cannot exist, so a check of a support
        scenario does not import the rotor, torsion and space flows just to look.
        """
        module = sys.modules.get(f"{self.package}.scenario")
        return module is not None and isinstance(scenario, getattr(module, self.scenario_class))

    def claims(self, tables: Mapping[str, Any]) -> bool:
        """Scenarios with this kind's table."""
        return self.table in tables

    def parse(self, tables: Mapping[str, Any], source: str) -> Any:
        """The kind's parser on the tables; errors name ``source`` and the field."""
        return getattr(self._scenario_module(), self.parser)(tables, source)

    def inputs(self, scenario: Any, base_dir: Path) -> list[Path]:
        """None: the study reads no measurement file."""
        return []


def plain_outcome(kind: str, scenario: Any, result: Any, record: Record) -> StudyOutcome:
    """The outcome of a kind whose verdict is its result's alone (torsion, space).

    Parameters
    ----------
    kind : str
        The kind's name.
    scenario : object
        The validated scenario (its title and units).
    result : object
        The kind's result, with ``passed``, ``findings`` and ``summary(units)``.
    record : Record
        Its record.

    Returns
    -------
    StudyOutcome
        Verdict and summary from the result, no further tables.

    Raises
    ------
    Nothing
        The result is already validated.
    """
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
