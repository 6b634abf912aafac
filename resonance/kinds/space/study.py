"""The flow for supports in space: a validated scenario -> model -> modes, findings, response, zones.

The study gives the modes in words, the findings, the response at the probes in every direction and the ISO
zones.
The scenario tables are read by :mod:`resonance.kinds.space.scenario`; the record is written by
:mod:`resonance.kinds.space.record`.
"""

from __future__ import annotations

import math
from dataclasses import dataclass

import numpy as np

from ...checks.interference import FindingsTable, interference_check, judge_damped, verdict_line, verdict_of
from ...checks.limits import iso_velocity_zone, support_class, zone_criterion
from ...core.units import UnitSystem, display_unit
from ...dynamics.harmonic import convert_amplitude
from ...dynamics.modes import Mode
from .bodies import SpaceModel
from .modes import SpaceMode, space_modes
from .response import PointLoad, rotating_unbalance, space_response
from .scenario import SpaceScenario

__all__ = ["SpaceStudyResult", "run_space_study"]


@dataclass(frozen=True)
class SpaceStudyResult:
    """Everything one run of a supports-in-space scenario gives.

    Attributes
    ----------
    scenario : SpaceScenario
        The scenario run.
    model : SpaceModel
        The assembled model.
    shapes : tuple of SpaceMode
        The modes with what moves in words.
    modes : tuple of Mode
        The same as structural modes for the interference check.
    findings : FindingsTable
        Every mode against every excitation, worst first.
    speed : numpy.ndarray
        Speeds of the response [rpm].
    displacement : numpy.ndarray
        Complex 1x displacement at each probe, ``speeds x probes x 3`` [m, 0-peak].
    velocity_rms : numpy.ndarray
        RMS velocity per probe and direction over the speeds [m/s], ``speeds x probes x 3``: the 1x unbalance
        response and each force at its order, added in quadrature.
    peak_velocity : tuple of (float, float, str)
        Per probe: the largest RMS velocity over the speeds of continuous operation [m/s], its speed [rpm]
        and its ISO zone.
    support_used : {"rigid", "flexible"}
        The zone boundaries used (rigid where either the declared or the computed class is rigid).
    band : tuple of (float, float, float, float)
        The tolerance band: mount, soil and frame factors and the worst margin minus required there
        [percent points] (reported; the verdict is the nominal model's).
    """

    scenario: SpaceScenario
    model: SpaceModel
    shapes: tuple[SpaceMode, ...]
    modes: tuple[Mode, ...]
    findings: FindingsTable
    speed: np.ndarray
    displacement: np.ndarray
    velocity_rms: np.ndarray
    peak_velocity: tuple[tuple[float, float, str], ...]
    support_used: str
    band: tuple[tuple[float, float, float, float], ...] = ()

    @property
    def band_passed(self) -> bool:
        """True when every margin passes at every corner of the tolerance band."""
        return all(excess >= 0.0 for *_, excess in self.band)

    def band_line(self) -> str:
        """The tolerance band in one line.

        Returns
        -------
        str
            PASS or how many of the band's combinations fail, and what the band varies.

        Raises
        ------
        Nothing
            Pure text.
        """
        if not self.band:
            return "not checked (tolerance 0, or a live panel)"
        t = self.scenario.tolerance
        what = (
            ["mounts"]
            + (["soil"] if self.scenario.soil is not None else [])
            + (["frame"] if self.scenario.beams else [])
        )
        failing = [b for b in self.band if b[3] < 0.0]
        head = "PASS" if not failing else f"FAIL at {len(failing)} of {len(self.band)} combinations"
        worst = min(self.band, key=lambda b: b[3])
        return (
            f"{head} over {' x '.join(what)} stiffness +/- {100 * t:.0f} % (worst margin minus required "
            f"{worst[3]:.1f} points at mounts x{worst[0]:.2f}, soil x{worst[1]:.2f}, frame x{worst[2]:.2f}; "
            "reported, the verdict is the nominal model's)"
        )

    @property
    def passed(self) -> bool:
        """True when every margin passes."""
        return self.findings.passed

    @property
    def verdict(self) -> str:
        """``"PASS"`` or ``"FAIL"``."""
        return verdict_of(self.passed, self.findings)

    def summary(self, system: UnitSystem = "SI") -> str:
        """The verdict, the modes in words and each probe's largest velocity, as text.

        Parameters
        ----------
        system : {"SI", "US"}
            Units of the frequencies and velocities.

        Returns
        -------
        str
            Verdict, modes and velocities, in the given units.

        Raises
        ------
        ValueError
            An unknown unit system.
        """
        f_unit, f_factor = display_unit("frequency", system)
        v_unit, v_factor = display_unit("velocity", system)
        digits = 2 if system == "SI" else 0
        modes = "; ".join(f"{s.frequency * f_factor:.{digits}f} {f_unit} {s.words}" for s in self.shapes[:6])
        probes = "; ".join(
            f"{label} {v * v_factor:.3g} {v_unit} RMS at {n:.0f} rpm (zone {z}, estimate)"
            for (label, _b, _p), (v, n, z) in zip(self.scenario.probes, self.peak_velocity, strict=True)
        )
        return (
            f"{verdict_line(self.verdict, self.findings)}\n"
            f"Lowest modes: {modes}\n"
            f"Margins: {self.findings.summary()}\n"
            f"Tolerance band: {self.band_line()}\n"
            f"1x vibration at the probes: {probes or 'no probe given'}"
        )


def _structural_modes(shapes: tuple[SpaceMode, ...] | list[SpaceMode]) -> tuple[Mode, ...]:
    # The modes in words as structural modes for the interference check.
    return tuple(
        Mode(
            s.frequency,
            s.damping_ratio,
            f"mode {i + 1} ({s.words})",
            "model",
            kind="structural",
            af_source="1/(2 zeta) of the model's damping",
        )
        for i, s in enumerate(shapes)
        if s.frequency > 0.0
    )


def run_space_study(
    scenario: SpaceScenario,
    mount_factor: float = 1.0,
    shear_factor: float = 1.0,
    points: int = 240,
    band: bool = True,
    frame_factor: float = 1.0,
) -> SpaceStudyResult:
    """Run every check of a supports-in-space scenario.

    Parameters
    ----------
    scenario : SpaceScenario
        The validated scenario.
    mount_factor, shear_factor : float
        What-if factors on the mounts' stiffness and the soil's shear modulus [-].
    points : int
        Speeds of the response.
    band : bool
        Check the tolerance band (``[whatif] tolerance``: mounts, soil and frame each at ``1 -/+ t`` around
        the factors given, every combination); a live panel may skip it.
    frame_factor : float
        What-if factor on the frame's moduli [-].

    Returns
    -------
    SpaceStudyResult

    Raises
    ------
    InputValueError
        A factor that is not finite and > 0, or that makes a mechanism.
    """
    model = scenario.build(mount_factor, shear_factor, frame_factor=frame_factor)
    shapes = tuple(space_modes(model))
    modes = _structural_modes(shapes)
    findings = interference_check(list(modes), list(scenario.excitations), scenario.speed, scenario.rules)
    low, high = 0.5 * scenario.speed.speed_min, 1.3 * scenario.speed.speed_max
    grid = [np.linspace(low, high, points)]
    grid += [np.array([60.0 * m.frequency]) for m in modes if low < 60.0 * m.frequency < high]
    grid += [np.linspace(a, b, 2 if a < b else 1) for a, b in scenario.speed.intervals]  # a fixed speed too
    speed = np.unique(np.concatenate(grid))
    f = speed / 60.0
    loads = [rotating_unbalance(b, p, a, u, f) for b, p, a, u in scenario.unbalance]
    points_read = [(b, p) for _label, b, p in scenario.probes]
    if loads and points_read:
        displacement = space_response(model, loads, f, points_read)
    else:
        displacement = np.zeros((speed.size, len(points_read), 3), dtype=complex)
    # Forces at other orders respond at their own frequencies: their RMS velocities add to the 1x one in
    # quadrature (the RMS of a sum of harmonics at different frequencies).
    extra_square = np.zeros((speed.size, len(points_read), 3))
    rms = float(convert_amplitude(1.0, "peak", "rms")[0])
    for body, point, force, moment, order in scenario.forces if points_read else ():
        fo = order * f
        u = space_response(
            model, [PointLoad(body, point, force.astype(complex), moment.astype(complex))], fo, points_read
        )
        extra_square += (np.abs(u) * (2.0 * math.pi * fo)[:, None, None] * rms) ** 2
    # 0-peak displacement to RMS velocity of a sine: w |u| / sqrt(2) (the factor of convert_amplitude).
    velocity = np.sqrt((np.abs(displacement) * (2.0 * math.pi * f)[:, None, None] * rms) ** 2 + extra_square)
    computed = support_class(min(m.frequency for m in modes), scenario.speed.speed_max)
    used = "rigid" if "rigid" in (computed, scenario.support) else "flexible"
    running = np.array([scenario.speed.contains(n) for n in speed])
    peaks = []
    for k in range(len(points_read)):
        v = velocity[:, k, :].max(axis=1)
        v_run = np.where(running, v, -1.0)
        i = int(np.argmax(v_run))
        zone = iso_velocity_zone(max(float(v_run[i]), 0.0), scenario.group, used)[0]  # type: ignore[arg-type]
        peaks.append((float(v_run[i]), float(speed[i]), zone))
    if any(f.damped for f in findings):
        if peaks and loads:
            k = max(range(len(peaks)), key=lambda j: peaks[j][0])
            text, ok = zone_criterion(peaks[k][0], peaks[k][1], repr(scenario.probes[k][0]), scenario.group, used)  # type: ignore[arg-type]
        else:
            text, ok = "no unbalance and probe to predict the vibration: the amplitude cannot be judged", False
        findings = judge_damped(findings, text, ok)
    corners: list[tuple[float, float, float, float]] = []
    t = scenario.tolerance
    if band and t > 0.0:
        steps = (1.0 - t, 1.0, 1.0 + t)
        soils = steps if scenario.soil is not None else (1.0,)
        frames = steps if scenario.beams else (1.0,)
        for km in steps:
            for ks in soils:
                for kf in frames:
                    varied = scenario.build(mount_factor * km, shear_factor * ks, frame_factor=frame_factor * kf)
                    found = list(_structural_modes(space_modes(varied)))
                    table = interference_check(found, list(scenario.excitations), scenario.speed, scenario.rules)
                    corners.append((km, ks, kf, min(f.margin - f.required_margin for f in table)))
    return SpaceStudyResult(
        scenario, model, shapes, modes, findings, speed, displacement, velocity, tuple(peaks), used, tuple(corners)
    )
