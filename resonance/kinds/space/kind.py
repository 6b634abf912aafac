"""The supports-in-space kind's entry in the study registry: the tables it claims, how it parses and runs."""

from __future__ import annotations

from pathlib import Path
from typing import Any

from ...records.outcome import StudyOutcome, TableKind, plain_outcome

__all__ = [
    "SpaceStudy",
]


class SpaceStudy(TableKind):
    """Supports in space: rigid bodies, frames, mounts and soil; modes in words, findings, bearing response."""

    name = "space"
    table = "space"
    package = __package__
    scenario_class = "SpaceScenario"
    parser = "parse_space_scenario"

    def run(self, scenario: Any, base_dir: Path, uncertainty: Any = None, progress: bool = False) -> StudyOutcome:
        """See :func:`resonance.kinds.space.study.run_space_study`."""
        from .record import build_space_record
        from .study import run_space_study

        result = run_space_study(scenario)
        return plain_outcome(self.name, scenario, result, build_space_record(result))
