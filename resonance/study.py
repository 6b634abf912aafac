"""One flow from a scenario to results: modes, findings, forced response, vibration.

:func:`run_study` is what the notebooks, the panels and the ``check`` command
all call, so that a saved scenario reproduces whatever a notebook showed.
"""

from __future__ import annotations

import math
from dataclasses import dataclass

import numpy as np

from .errors import InputValueError
from .excitations import unbalance_force
from .frf import model_receptance
from .harmonic import convert_amplitude, velocity_amplitude
from .interference import FindingsTable, interference_check
from .limits import iso_velocity_zone, iso_velocity_zone_limits
from .margins import HalfPower, half_power_points
from .model import MatrixModel
from .modes import Mode, ModeSet, modal_properties
from .scenario import Scenario
from .units import UnitSystem, display_unit

__all__ = ["StudyResult", "run_study", "speed_axis", "study_modes", "ACCEPTABLE_ZONES"]

# ISO zones A and B allow unrestricted long-term operation (ISO 10816-3 sec. 5.3.1, from memory).
ACCEPTABLE_ZONES = ("A", "B")


@dataclass(frozen=True)
class StudyResult:
    """Everything one run of a scenario gives.

    Attributes
    ----------
    scenario : Scenario
    model : MatrixModel
    modeset : ModeSet
        Damped modes of the model.
    modes : tuple of Mode
        The modes as checked (labels name the mass that moves most).
    findings : FindingsTable
        Every mode against every excitation, worst first.
    speed : numpy.ndarray
        Speed axis of the forced response [rpm].
    displacement : numpy.ndarray
        Unbalance response at ``measure_at``, 0-peak [m].
    phase_lag : numpy.ndarray
        Lag of the response behind the unbalance force [rad], in [0, pi].
    receptance : numpy.ndarray
        ``|H|`` from ``force_at`` to ``measure_at`` over the same axis [m/N].
    velocity_rms : numpy.ndarray
        Casing velocity of the unbalance response, RMS [m/s].
    peak_velocity_rms, peak_velocity_speed : float
        The largest RMS velocity over the speeds of continuous operation [m/s]
        and the speed where it occurs [rpm].
    zone : str
        ISO 10816-3 zone of that velocity.
    half_power : HalfPower or None
        Half-power analysis of the largest response peak on the axis, when
        the axis holds one with both half-power points.
    """

    scenario: Scenario
    model: MatrixModel
    modeset: ModeSet
    modes: tuple[Mode, ...]
    findings: FindingsTable
    speed: np.ndarray
    displacement: np.ndarray
    phase_lag: np.ndarray
    receptance: np.ndarray
    velocity_rms: np.ndarray
    peak_velocity_rms: float
    peak_velocity_speed: float
    zone: str

    half_power: HalfPower | None

    @property
    def vibration_passed(self) -> bool:
        """True when the predicted vibration lies in an acceptable ISO zone (A or B)."""
        return self.zone in ACCEPTABLE_ZONES

    @property
    def passed(self) -> bool:
        """True when every margin check and the vibration check pass."""
        return self.findings.passed and self.vibration_passed

    @property
    def verdict(self) -> str:
        """``"PASS"`` or ``"FAIL"`` for the whole scenario."""
        return "PASS" if self.passed else "FAIL"

    def summary(self, system: UnitSystem = "SI") -> str:
        """Three lines: the verdict, the margin checks and the vibration check (SI or US units)."""
        b = iso_velocity_zone_limits(self.scenario.vibration.group, self.scenario.vibration.support)  # type: ignore[arg-type]
        unit, factor = display_unit("velocity", system)
        digits = 2 if system == "SI" else 3
        return (
            f"Verdict: {self.verdict}\nMargins: {self.findings.summary()}\n"
            f"Vibration: {self.peak_velocity_rms * factor:.{digits}f} {unit} RMS "
            f"at {self.peak_velocity_speed:.0f} rpm, "
            f"ISO 10816-3 zone {self.zone} (B/C at {b[1] * factor:.{digits}f} {unit}) -> "
            f"{'acceptable' if self.vibration_passed else 'NOT acceptable'} for long-term operation"
        )


def speed_axis(scenario: Scenario, modes: tuple[Mode, ...] | list[Mode], points: int = 600) -> np.ndarray:
    """Speed axis for response plots [rpm]: the range and the 1x criticals near it."""
    low = 0.5 * scenario.speed.speed_min
    high = 1.3 * scenario.speed.speed_max
    for mode in modes:
        if mode.speed < 3.0 * scenario.speed.speed_max:
            high = max(high, 1.25 * mode.speed)
    return np.linspace(low, high, points)


def study_modes(modeset: ModeSet, labels: tuple[str, ...]) -> tuple[Mode, ...]:
    """Modes labelled by number and the mass that moves most in each."""
    out = []
    for i, mode in enumerate(modeset.to_modes()):
        shape = np.abs(mode.shape) if mode.shape is not None else np.ones(len(labels))
        out.append(
            Mode(
                mode.frequency,
                mode.damping_ratio,
                f"mode {i + 1} ({labels[int(np.argmax(shape))]})",
                "model",
                mode.shape,
            )
        )
    return tuple(out)


def run_study(
    scenario: Scenario,
    *,
    model: MatrixModel | None = None,
    speed: np.ndarray | None = None,
) -> StudyResult:
    """Run every check of a scenario.

    Parameters
    ----------
    scenario : Scenario
        The validated input.
    model : MatrixModel, optional
        A model to use instead of ``scenario.model.build()`` (what-if studies).
    speed : numpy.ndarray, optional
        Speed axis [rpm] for the forced response; see :func:`speed_axis`.

    Returns
    -------
    StudyResult
    """
    model = model if model is not None else scenario.model.build()
    modeset = modal_properties(model)
    modes = study_modes(modeset, model.labels)
    findings = interference_check(modes, scenario.excitations, scenario.speed, scenario.rule)
    speed = speed if speed is not None else speed_axis(scenario, modes)
    j = model.dof(scenario.response.force_at)
    r = model.dof(scenario.response.measure_at)

    def response(speeds: np.ndarray) -> tuple[np.ndarray, np.ndarray]:
        # Receptance times the unbalance force U w^2 (in phase with the unbalance): the complex
        # 0-peak displacement, and the receptance magnitude itself.
        h = model_receptance(model, speeds / 60.0, j)[:, r]
        return h * unbalance_force(scenario.response.unbalance, speeds), np.abs(h)

    x, receptance = response(speed)
    displacement = np.abs(x)
    phase = np.clip(np.arctan2(-x.imag, x.real), 0.0, math.pi) + 0.0
    velocity_rms = convert_amplitude(velocity_amplitude(displacement, speed / 60.0), "peak", "rms")
    # The largest velocity over the speeds of continuous operation, on a fine grid of its own.
    running = np.concatenate([np.linspace(a, b, 200) for a, b in scenario.speed.intervals])
    v_run = convert_amplitude(velocity_amplitude(np.abs(response(running)[0]), running / 60.0), "peak", "rms")
    k = int(np.argmax(v_run))
    zone = iso_velocity_zone(v_run[k], scenario.vibration.group, scenario.vibration.support)[0]  # type: ignore[arg-type]
    try:
        half_power: HalfPower | None = half_power_points(speed, displacement)
    except InputValueError:
        half_power = None
    return StudyResult(
        scenario,
        model,
        modeset,
        modes,
        findings,
        speed,
        displacement,
        phase,
        receptance,
        velocity_rms,
        float(v_run[k]),
        float(running[k]),
        zone,
        half_power,
    )
