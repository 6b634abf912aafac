"""The torsional kind's entry in the study registry: which tables it claims, how it parses and runs them."""

from __future__ import annotations

from collections.abc import Mapping
from pathlib import Path
from typing import Any

from ...records.outcome import StudyOutcome, plain_outcome

__all__ = [
    "TorsionStudy",
]


class TorsionStudy:
    """A drive train: torsional modes against every shaft's orders, gear meshes and electrical sources."""

    name = "torsion"

    @property
    def scenario_type(self) -> type:
        """The class of the scenarios this kind runs (imported when asked)."""
        from .scenario import TorsionScenario

        return TorsionScenario

    def claims(self, tables: Mapping[str, Any]) -> bool:
        """Scenarios with a ``[torsion]`` table."""
        return "torsion" in tables

    def parse(self, tables: Mapping[str, Any], source: str) -> Any:
        """See :func:`resonance.kinds.torsion.scenario.parse_torsion_scenario`."""
        from .scenario import parse_torsion_scenario

        return parse_torsion_scenario(tables, source)

    def inputs(self, scenario: Any, base_dir: Path) -> list[Path]:
        """None: a torsional study reads no measurement file."""
        return []

    def run(self, scenario: Any, base_dir: Path, uncertainty: Any = None, progress: bool = False) -> StudyOutcome:
        """See :func:`resonance.kinds.torsion.study.run_torsion_study`."""
        from .record import build_torsion_record
        from .study import run_torsion_study

        result = run_torsion_study(scenario)
        return plain_outcome(self.name, scenario, result, build_torsion_record(result))
