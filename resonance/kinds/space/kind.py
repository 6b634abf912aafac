"""The supports-in-space kind's entry in the study registry: the tables it claims, how it parses and runs."""

from __future__ import annotations

from collections.abc import Mapping
from pathlib import Path
from typing import Any

from ...records.outcome import StudyOutcome, plain_outcome

__all__ = [
    "SpaceStudy",
]


class SpaceStudy:
    """Supports in space: rigid bodies, frames, mounts and soil; modes in words, findings, bearing response."""

    name = "space"

    @property
    def scenario_type(self) -> type:
        """The class of the scenarios this kind runs (imported when asked)."""
        from .scenario import SpaceScenario

        return SpaceScenario

    def claims(self, tables: Mapping[str, Any]) -> bool:
        """Scenarios with a ``[space]`` table."""
        return "space" in tables

    def parse(self, tables: Mapping[str, Any], source: str) -> Any:
        """See :func:`resonance.kinds.space.scenario.parse_space_scenario`."""
        from .scenario import parse_space_scenario

        return parse_space_scenario(tables, source)

    def inputs(self, scenario: Any, base_dir: Path) -> list[Path]:
        """None: the study reads no measurement file."""
        return []

    def run(self, scenario: Any, base_dir: Path, uncertainty: Any = None, progress: bool = False) -> StudyOutcome:
        """See :func:`resonance.kinds.space.study.run_space_study`."""
        from .record import build_space_record
        from .study import run_space_study

        result = run_space_study(scenario)
        return plain_outcome(self.name, scenario, result, build_space_record(result))
