"""The torsional kind's entry in the study registry: which tables it claims, how it parses and runs them."""

from __future__ import annotations

from pathlib import Path
from typing import Any

from ...records.outcome import StudyOutcome, TableKind, plain_outcome

__all__ = [
    "TorsionStudy",
]


class TorsionStudy(TableKind):
    """A drive train: torsional modes against every shaft's orders, gear meshes and electrical sources."""

    name = "torsion"
    table = "torsion"
    package = __package__
    scenario_class = "TorsionScenario"
    parser = "parse_torsion_scenario"

    def run(self, scenario: Any, base_dir: Path, uncertainty: Any = None, progress: bool = False) -> StudyOutcome:
        """See :func:`resonance.kinds.torsion.study.run_torsion_study`."""
        from .record import build_torsion_record
        from .study import run_torsion_study

        result = run_torsion_study(scenario)
        return plain_outcome(self.name, scenario, result, build_torsion_record(result))
