"""The rotor kind's entry in the study registry: which tables it claims, how it parses and runs them."""

from __future__ import annotations

from collections.abc import Sequence
from pathlib import Path
from typing import Any

import numpy as np

from ...checks.variant_findings import VariantFindings
from ...records.outcome import StudyOutcome, TableKind
from ...records.record import Record

__all__ = [
    "RotorStudy",
    "rotor_outcome",
]


class RotorStudy(TableKind):
    """A rotor on its bearings: Campbell data, critical speeds, API margins, stability, shaft vibration."""

    name = "rotor"
    table = "rotor"
    package = __package__
    scenario_class = "RotorScenario"
    parser = "parse_rotor_scenario"

    def run(self, scenario: Any, base_dir: Path, uncertainty: Any = None, progress: bool = False) -> StudyOutcome:
        """See :func:`resonance.kinds.rotor.study.run_rotor_study`."""
        from .study import run_rotor_study

        return rotor_outcome(run_rotor_study(scenario, progress=progress), uncertainty=uncertainty)

    def uncertain_targets(self, scenario: Any) -> list[str]:
        """What an ``[uncertainty]`` table may vary: see :func:`~resonance.kinds.rotor.variants.uncertain_targets`."""
        from .variants import uncertain_targets

        return uncertain_targets(scenario)

    def variant_findings(self, scenario: Any, varies: Sequence[str], values: np.ndarray) -> VariantFindings:
        """The findings of a block of variants: see :func:`~resonance.kinds.rotor.variants.variant_findings`."""
        from .variants import variant_findings

        return variant_findings(scenario, varies, values)


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
        Its verdict, summary, findings and record.

    Raises
    ------
    Nothing
        The result is already validated.
    """
    from .record import build_rotor_record

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
