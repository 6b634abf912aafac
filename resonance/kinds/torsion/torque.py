"""Dynamic torques of a torsional train: forcing cases, the sweep over speed, allowables.

Each element's peak torque and stress over the speed range against its allowable.
"""

from __future__ import annotations

from collections.abc import Mapping
from dataclasses import dataclass

import numpy as np

from ...checks.excitations import Excitation
from ...checks.speed_range import OperatingRange
from ...core.errors import InputValueError
from ...core.units import UnitSystem, display_unit
from ...dynamics.modes import Mode
from .response import torque_response
from .train import TorsionalTrain

__all__ = [
    "Allowable",
    "TorqueCase",
    "TorqueCheckRow",
    "TorqueSweep",
    "torque_sweep",
]


@dataclass(frozen=True)
class TorqueCase:
    """A harmonic torque at a station that follows one of the checked excitations across the speed range.

    Attributes
    ----------
    label : str
        Name in tables (``"air-gap torque pulsation"``).
    station : str
        The station it acts on.
    excitation : Excitation
        The source whose frequency it has at each speed (one of the scenario's excitations).
    torque : float
        Amplitude on the station's own shaft [N m].
    """

    label: str
    station: str
    excitation: Excitation
    torque: float


@dataclass(frozen=True)
class Allowable:
    """What an element may carry, as the user gives it (a coupling's vibratory rating, a fatigue allowable).

    Attributes
    ----------
    torque : float or None
        Allowable dynamic torque amplitude [N m], on the element's own shaft.
    stress : float or None
        Allowable shear stress amplitude [Pa] (shaft sections with diameters).
    """

    torque: float | None = None
    stress: float | None = None


@dataclass(frozen=True)
class TorqueCheckRow:
    """The largest dynamic torque in one element over the operating speeds, against its allowable.

    Attributes
    ----------
    element : str
        The shaft, coupling or mesh.
    peak_torque : float
        Largest dynamic torque amplitude [N m] on its own shaft, the cases' amplitudes added.
    speed : float
        Driver speed where it occurs [rpm].
    peak_stress : float or None
        Shear stress amplitude there [Pa] (sections with diameters).
    allowable : Allowable
        As given.
    utilisation : float or None
        The larger of peak/allowable for torque and stress [-]; None without an allowable.
    """

    element: str
    peak_torque: float
    speed: float
    peak_stress: float | None
    allowable: Allowable
    utilisation: float | None

    @property
    def status(self) -> str:
        """``"within allowable"``, ``"EXCEEDS ALLOWABLE"`` or ``"no allowable given"``."""
        if self.utilisation is None:
            return "no allowable given"
        return "within allowable" if self.utilisation <= 1.0 else "EXCEEDS ALLOWABLE"


@dataclass(frozen=True)
class TorqueSweep:
    """Dynamic torques over the operating speeds under the scenario's harmonic torques.

    Attributes
    ----------
    speed : numpy.ndarray
        Driver speeds [rpm] (a grid over each operating interval plus every coincidence inside it).
    cases : tuple of TorqueCase
        The harmonic torques.
    element_torque : dict of str to numpy.ndarray
        Per element, the torque amplitude per case (cases x speeds) [N m], on its own shaft.
    shear_stress : dict of str to numpy.ndarray
        Per section with diameters, the cases' stress amplitudes added (speeds) [Pa].
    rows : tuple of TorqueCheckRow
        Each element's peak against its allowable.
    """

    speed: np.ndarray
    cases: tuple[TorqueCase, ...]
    element_torque: dict[str, np.ndarray]
    shear_stress: dict[str, np.ndarray]
    rows: tuple[TorqueCheckRow, ...]

    @property
    def passed(self) -> bool:
        """True when no element exceeds its allowable."""
        return not any(r.status == "EXCEEDS ALLOWABLE" for r in self.rows)

    def summary(self, system: UnitSystem = "SI") -> str:
        """One line: the most utilised element, or the largest torque where no allowable is given.

        Parameters
        ----------
        system : {"SI", "US"}
            Display units.

        Returns
        -------
        str
            The governing element's torque and use of its allowable, in the given units.

        Raises
        ------
        ValueError
            An unknown unit system.
        """
        if not self.rows:
            return "no element to check"
        unit, factor = display_unit("torque", system)
        rated = [r for r in self.rows if r.utilisation is not None]
        worst = max(rated, key=lambda r: r.utilisation or 0.0) if rated else max(self.rows, key=lambda r: r.peak_torque)
        head = "every element within its allowable" if self.passed else "an element EXCEEDS its allowable"
        if not rated:
            head = "no allowable given"
        use = f", {100 * worst.utilisation:.0f} % of its allowable" if worst.utilisation is not None else ""
        return (
            f"{head}; largest: {worst.element} {worst.peak_torque * factor:.3g} {unit} at {worst.speed:.0f} rpm{use} "
            f"(cases' amplitudes added)"
        )


def torque_sweep(
    train: TorsionalTrain,
    cases: tuple[TorqueCase, ...],
    speed: OperatingRange,
    allowables: Mapping[str, Allowable],
    damping_ratio: float | None = None,
    points: int = 201,
    modes: tuple[Mode, ...] = (),
) -> TorqueSweep:
    """Dynamic torque in every element over the operating speeds, checked against the allowables given.

    Parameters
    ----------
    train : TorsionalTrain
        The train.
    cases : tuple of TorqueCase
        The harmonic torques; each follows its excitation's frequency at every speed.
    speed : OperatingRange
        The driver's speeds of continuous operation [rpm].
    allowables : mapping of str to Allowable
        By element label; an element without one is reported, not judged.
    damping_ratio : float, optional
        Modal damping for every mode [-] (the element dampers if omitted).
    points : int
        Speeds per operating interval (>= 2), to which every coincidence inside it is added.
    modes : tuple of Mode
        The train's modes, whose coincidences with each case's excitation are added to the grid.

    Returns
    -------
    TorqueSweep

    Raises
    ------
    InputValueError
        Fewer than two points.

    Notes
    -----
    Torques of different cases act at different frequencies; their amplitudes are added, which bounds the
    peak of their sum from above (conservative). Steady state only: passing through a resonance on start-up
    is a transient analysis this package does not do.
    """
    if points < 2:
        raise InputValueError(f"points: got {points}; expected at least 2")
    grid = [np.linspace(low, high, points) for low, high in speed.intervals]
    for case in cases:
        for mode in modes:
            n_c = case.excitation.coincidence_speed(mode.frequency)
            if n_c is not None and speed.contains(n_c):
                grid.append(np.array([n_c]))
    n = np.unique(np.concatenate(grid)) if grid else np.zeros(0)
    n = n[n > 0.0]
    per_case: dict[str, list[np.ndarray]] = {label: [] for label, *_ in train.elements}
    stress: dict[str, np.ndarray] = {}
    for case in cases:
        out = torque_response(train, {case.station: case.torque}, case.excitation.frequency_at(n), damping_ratio)
        for label, values in out.element_torque.items():
            per_case[label].append(values)
        for label, values in out.shear_stress.items():
            stress[label] = stress.get(label, np.zeros(n.size)) + values
    torque = {label: np.array(v).reshape(len(cases), n.size) for label, v in per_case.items()}
    rows = []
    for label, values in torque.items():
        if not cases or n.size == 0:
            break
        total = values.sum(axis=0)
        i = int(np.argmax(total))
        allowed = allowables.get(label, Allowable())
        s = float(stress[label][i]) if label in stress else None
        ratios = []
        if allowed.torque is not None:
            ratios.append(float(total[i]) / allowed.torque)
        if allowed.stress is not None and label in stress:
            ratios.append(float(stress[label].max()) / allowed.stress)
        rows.append(TorqueCheckRow(label, float(total[i]), float(n[i]), s, allowed, max(ratios) if ratios else None))
    return TorqueSweep(n, cases, torque, stress, tuple(rows))
