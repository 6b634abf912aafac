"""One flow from a scenario to results: modes, findings, forced response, vibration.

:func:`run_study` is what the notebooks, the panels and the ``check`` command
all call, so that a saved scenario reproduces whatever a notebook showed.
"""

from __future__ import annotations

import math
from dataclasses import dataclass

import numpy as np

from ...checks.interference import FindingsTable, interference_check, judge_damped, verdict_line, verdict_of
from ...checks.limits import (
    RIGID_SUPPORT_RATIO,
    iso_velocity_zone,
    iso_velocity_zone_limits,
    support_class,
    zone_criterion,
)
from ...checks.margins import HalfPower, half_power_points
from ...checks.unbalance import unbalance_force
from ...core.errors import InputValueError
from ...core.units import UnitSystem, display_unit
from ...dynamics.frf import model_receptance
from ...dynamics.harmonic import convert_amplitude, velocity_amplitude
from ...dynamics.model import MatrixModel
from ...dynamics.modes import Mode, ModeSet, modal_properties
from .scenario import Scenario

__all__ = [
    "StudyResult",
    "run_study",
    "shape_words",
    "speed_axis",
    "study_modes",
    "ACCEPTABLE_ZONES",
]

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
        ISO 10816-3 zone of that velocity, with the boundaries of ``support_used``.
    half_power : HalfPower or None
        Half-power analysis of the largest response peak on the axis, when
        the axis holds one with both half-power points (shown; the findings of
        structural modes use the flat rule, which does not depend on AF).
    support_computed : {"rigid", "flexible"}
        Support class from the lowest mode against the top running speed
        (:func:`resonance.checks.limits.support_class`).
    support_used : {"rigid", "flexible"}
        The class whose zone boundaries were used: rigid (the lower, more
        conservative boundaries) when either the declared or the computed class
        is rigid.
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
    support_computed: str = "rigid"
    support_used: str = "rigid"

    @property
    def vibration_passed(self) -> bool:
        """True when the predicted vibration lies in zone A or B (an estimate, see :meth:`vibration_line`)."""
        return self.zone in ACCEPTABLE_ZONES

    @property
    def passed(self) -> bool:
        """True when every margin check and the vibration check pass."""
        return self.findings.passed and self.vibration_passed

    @property
    def verdict(self) -> str:
        """``"PASS"``, ``"PASS WITH EXEMPTION"`` or ``"FAIL"`` for the whole scenario."""
        return verdict_of(self.passed, self.findings)

    def support_note(self, system: UnitSystem = "SI") -> str:
        """How the support class was chosen, in words."""
        declared = self.scenario.vibration.support
        f1 = min(m.frequency for m in self.modes)
        unit, factor = display_unit("frequency", system)
        digits = 1 if system == "SI" else 0
        basis = (
            f"lowest mode {f1 * factor:.{digits}f} {unit} against 1x at the top speed "
            f"{self.scenario.speed.speed_max / 60.0 * factor:.{digits}f} {unit}; rigid at "
            f"{RIGID_SUPPORT_RATIO:g} x or more, ISO 10816-3 sec. 3.3, from memory"
        )
        if declared == self.support_computed:
            return f"{declared} support (declared; the model agrees: {basis})"
        return (
            f"{self.support_used} support: declared {declared}, computed {self.support_computed} ({basis}); "
            "the more conservative rigid boundaries are used"
        )

    def vibration_line(self, system: UnitSystem = "SI") -> str:
        """The predicted vibration against the ISO zones, labelled as the estimate it is."""
        group = self.scenario.vibration.group
        b = iso_velocity_zone_limits(group, self.support_used)  # type: ignore[arg-type]
        unit, factor = display_unit("velocity", system)
        digits = 2 if system == "SI" else 3
        if not self.vibration_passed:
            judgement = "above the boundary for long-term operation"
        elif self.findings.verdict == "PASS":
            judgement = "within the zones for long-term operation, to be confirmed by measurement"
        else:
            judgement = "not a finding of acceptability while a resonance finding fails or is exempt inside the range"
        return (
            f"predicted 1x {self.peak_velocity_rms * factor:.{digits}f} {unit} RMS at "
            f"{self.peak_velocity_speed:.0f} rpm against the ISO 10816-3 zone boundaries (a field acceptance "
            f"criterion for broadband vibration, not a design margin): zone {self.zone}, B/C at "
            f"{b[1] * factor:.{digits}f} {unit} (group {group}, {self.support_note(system)}) -> {judgement}"
        )

    def summary(self, system: UnitSystem = "SI") -> str:
        """Three lines: the verdict, the margin checks and the vibration estimate (SI or US units)."""
        return (
            f"{verdict_line(self.verdict, self.findings)}\nMargins: {self.findings.summary()}\n"
            f"Vibration: {self.vibration_line(system)}"
        )


def speed_axis(scenario: Scenario, modes: tuple[Mode, ...] | list[Mode], points: int = 600) -> np.ndarray:
    """Speed axis for response plots [rpm]: the range and the 1x criticals near it.

    Parameters
    ----------
    scenario : Scenario
        The scenario (its speed range).
    modes : sequence of Mode
        The modes whose 1x criticals the axis should reach.
    points : int
        Number of speeds.

    Returns
    -------
    numpy.ndarray
        Speeds [rpm].

    Raises
    ------
    Nothing
        The scenario is validated.
    """
    low = 0.5 * scenario.speed.speed_min
    high = 1.3 * scenario.speed.speed_max
    for mode in modes:
        if mode.speed < 3.0 * scenario.speed.speed_max:
            high = max(high, 1.25 * mode.speed)
    return np.linspace(low, high, points)


def shape_words(shape: np.ndarray | None, labels: tuple[str, ...]) -> str:
    """What a mode shape does, in words: the mass that moves most, and who moves with it or against it.

    Masses moving at least 30 % of the largest amplitude are named, ``with`` when in phase with
    the largest and ``against`` when in opposition (complex shapes are compared by the real part of
    ``conj(largest) x other``).

    Parameters
    ----------
    shape : numpy.ndarray or None
        A mode shape over the masses (complex allowed).
    labels : tuple of str
        The masses' names in degree-of-freedom order.

    Returns
    -------
    str
        The moving masses and their sense, as a phrase.

    Raises
    ------
    Nothing
        Pure text.

    Examples
    --------
    >>> shape_words(np.array([1.0, 0.8, 0.05]), ("machine", "baseplate", "block"))
    'machine with baseplate'
    >>> shape_words(np.array([-0.5, 1.0]), ("housing", "pedestal"))
    'pedestal against housing'
    """
    if shape is None or len(labels) == 1:
        return labels[0] if labels else "mode"
    amplitude = np.abs(shape)
    top = int(np.argmax(amplitude))
    with_: list[str] = []
    against: list[str] = []
    for j in np.argsort(-amplitude):
        if j == top or amplitude[j] < 0.3 * amplitude[top]:
            continue
        relation = float(np.real(np.conj(shape[top]) * shape[j]))
        (with_ if relation > 0.0 else against).append(labels[j])
    words = labels[top]
    if with_:
        words += " with " + " and ".join(with_)
    if against:
        words += " against " + " and ".join(against)
    return words


def study_modes(modeset: ModeSet, labels: tuple[str, ...]) -> tuple[Mode, ...]:
    """Structural modes labelled by number and what moves in each (see :func:`shape_words`).

    Parameters
    ----------
    modeset : ModeSet
        The model's modes.
    labels : tuple of str
        The masses' names.

    Returns
    -------
    tuple of Mode
        Structural modes with descriptive labels and their AF source.

    Raises
    ------
    Nothing
        Modes at 0 Hz (rigid-body) are left out by :meth:`ModeSet.to_modes`.
    """
    out = []
    for i, mode in enumerate(modeset.to_modes()):
        out.append(
            Mode(
                mode.frequency,
                mode.damping_ratio,
                f"mode {i + 1} ({shape_words(mode.shape, labels)})",
                "model",
                mode.shape,
                kind="structural",
                af_source="1/(2 zeta) of the assumed damping",
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

    Raises
    ------
    InputValueError
        A degree of freedom named in the scenario that the model does not have (parsing prevents it).
    """
    model = model if model is not None else scenario.model.build()
    modeset = modal_properties(model)
    modes = study_modes(modeset, model.labels)
    findings = interference_check(modes, scenario.excitations, scenario.speed, scenario.rules)
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
    computed = support_class(min(m.frequency for m in modes), scenario.speed.speed_max)
    used = "rigid" if "rigid" in (computed, scenario.vibration.support) else "flexible"
    zone = iso_velocity_zone(v_run[k], scenario.vibration.group, used)[0]  # type: ignore[arg-type]
    if any(f.damped for f in findings):
        findings = judge_damped(
            findings,
            *zone_criterion(
                float(v_run[k]),
                float(running[k]),
                repr(scenario.response.measure_at),
                scenario.vibration.group,  # type: ignore[arg-type]
                used,  # type: ignore[arg-type]
            ),
        )
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
        computed,
        used,
    )
