"""The support kind's entry in the study registry: which tables it claims, how it parses and runs them."""

from __future__ import annotations

from collections.abc import Sequence
from pathlib import Path
from typing import Any

import numpy as np

from ...checks.interference import FindingsTable
from ...checks.variant_findings import VariantFindings
from ...records.outcome import StudyOutcome, TableKind
from ...records.record import Record
from .record import build_record

__all__ = [
    "SupportStudy",
    "support_outcome",
]


class SupportStudy(TableKind):
    """A machine on its support: modes, interference, response, zones; field verification with ``[field]``."""

    name = "support"
    table = "model"
    package = __package__
    scenario_class = "Scenario"
    parser = "parse_scenario"

    def inputs(self, scenario: Any, base_dir: Path) -> list[Path]:
        """The coast-down and impact files of the ``[field]`` table, if any."""
        if not scenario.field:
            return []
        from ..field.study import field_spec

        spec = field_spec(scenario, base_dir)
        return [spec.coastdown, *([spec.impact] if spec.impact is not None else [])]

    def run(self, scenario: Any, base_dir: Path, uncertainty: Any = None, progress: bool = False) -> StudyOutcome:
        """See :func:`~resonance.kinds.support.study.run_study` and the field verification."""
        from .study import run_study

        field = None
        if scenario.field:
            from ..field.study import run_field_study

            field = run_field_study(scenario, base_dir)
        result = run_study(scenario)
        fixes = None
        if not result.findings.passed:
            from .whatif import fix_options

            fixes = fix_options(scenario)
        return support_outcome(result, field, uncertainty=uncertainty, fixes=fixes)

    def uncertain_targets(self, scenario: Any) -> list[str]:
        """What an ``[uncertainty]`` table may vary: see :func:`~resonance.kinds.support.variants.uncertain_targets`."""
        from .variants import uncertain_targets

        return uncertain_targets(scenario)

    def variant_findings(self, scenario: Any, varies: Sequence[str], values: np.ndarray) -> VariantFindings:
        """The findings of a block of variants: see :func:`~resonance.kinds.support.variants.variant_findings`."""
        from .variants import variant_findings

        return variant_findings(scenario, varies, values)


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
        Its verdict (the model's and the field's together), summary, findings and record.

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
            # The design model's own verdict is one line of it, so the outcome says "Verdict" once.
            f"{summary.replace('Verdict: ', 'Design model: ', 1)}\n\n{field.summary()}"
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
