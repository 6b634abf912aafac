"""The torsional flow: a validated ``[torsion]`` scenario -> train -> torsional modes -> findings, torques.

The scenario tables are read by :mod:`resonance.kinds.torsion.scenario`, the forced torques by
:mod:`resonance.kinds.torsion.torque`, and the record is written by :mod:`resonance.kinds.torsion.record`.
"""

from __future__ import annotations

from dataclasses import dataclass

from ...checks.interference import FindingsTable, interference_check, verdict_line, verdict_of
from ...core.units import UnitSystem, display_unit
from ...dynamics.modes import Mode
from .scenario import TorsionScenario
from .torque import TorqueSweep, torque_sweep
from .train import TorsionalShape, torsional_mode_list, torsional_shapes

__all__ = [
    "TorsionStudyResult",
    "run_torsion_study",
]


@dataclass(frozen=True)
class TorsionStudyResult:
    """Everything one run of a torsional scenario gives.

    Attributes
    ----------
    scenario : TorsionScenario
        The scenario run.
    modes : tuple of Mode
        Torsional modes (kind ``"torsional"``).
    shapes : tuple of TorsionalShape
        Their shapes and the element that twists most.
    findings : FindingsTable
        Every mode against every excitation, worst first.
    torque : TorqueSweep or None
        The forced response over the operating speeds (None when the scenario gives no harmonic torque).
    """

    scenario: TorsionScenario
    modes: tuple[Mode, ...]
    shapes: tuple[TorsionalShape, ...]
    findings: FindingsTable
    torque: TorqueSweep | None = None

    @property
    def passed(self) -> bool:
        """True when every finding passes and no element exceeds its allowable."""
        return self.findings.passed and (self.torque is None or self.torque.passed)

    @property
    def verdict(self) -> str:
        """``"PASS"``, ``"PASS WITH EXEMPTION"`` or ``"FAIL"``."""
        return verdict_of(self.passed, self.findings)

    def summary(self, system: UnitSystem = "SI") -> str:
        """The verdict, the torsional natural frequencies and the margins, as text.

        Parameters
        ----------
        system : {"SI", "US"}
            Units of the frequencies (margins are in percent in both).

        Returns
        -------
        str
            Verdict, frequencies and margins, in the given units.

        Raises
        ------
        ValueError
            An unknown unit system.
        """
        unit, factor = display_unit("frequency", system)
        digits = 2 if system == "SI" else 0
        modes = "; ".join(
            f"{m.frequency * factor:.{digits}f} {unit} ({s.twists_most})"
            for m, s in zip(self.modes, self.shapes, strict=True)
        )
        text = (
            f"{verdict_line(self.verdict, self.findings)}\n"
            f"Torsional natural frequencies: {modes or 'none (a single inertia)'}\n"
            f"Margins: {self.findings.summary() if len(self.findings) else 'no mode to check'}"
        )
        if self.torque is not None:
            text += f"\nForced torque: {self.torque.summary(system)}"
        return text


def run_torsion_study(scenario: TorsionScenario) -> TorsionStudyResult:
    """Run every torsional check of a scenario.

    Parameters
    ----------
    scenario : TorsionScenario
        The validated scenario.

    Returns
    -------
    TorsionStudyResult
        Modes, shapes, findings and, with forcing, the torque sweep of the train.

    Raises
    ------
    InputValueError
        A scenario with no excitation to check.
    """
    modes = tuple(torsional_mode_list(scenario.train, scenario.damping_ratio))
    shapes = tuple(torsional_shapes(scenario.train))
    findings = (
        interference_check(list(modes), list(scenario.excitations), scenario.speed, scenario.rules)
        if modes
        else FindingsTable(())
    )
    torque = None
    if scenario.forcing:
        torque = torque_sweep(
            scenario.train, scenario.forcing, scenario.speed, scenario.allowables, scenario.damping_ratio, modes=modes
        )
    return TorsionStudyResult(scenario, modes, shapes, findings, torque)
