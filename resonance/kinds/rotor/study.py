"""The rotor flow: scenario -> rotor -> Campbell data, criticals, unbalance response -> findings.

The separation margins follow the API lateral approach: each 1x forward
critical speed is located on the unbalance response (the peak at the probe
that responds most), its amplification factor comes from the half-power
method on that response, and the required margin from the rule; criticals of
other orders (and 1x criticals whose peak the response sweep cannot resolve)
take their AF from the modal damping, ``1 / (2 zeta)``. A mode with negative
log decrement anywhere up to the maximum continuous speed fails the stability
check, and the predicted shaft vibration at the probes over the operating
speeds is compared with the API shaft vibration limit.

References
----------
API Std 617, 8th ed., 2014, and API RP 684, 2nd ed., 2005 (from memory).
"""

from __future__ import annotations

import dataclasses
import math
from dataclasses import dataclass

import numpy as np

from ...checks.excitations import Excitation
from ...checks.interference import FindingsTable, interference_check, verdict_line, verdict_of
from ...checks.limits import api_shaft_vibration_limit
from ...checks.margins import HalfPower, half_power_points
from ...core.errors import InputValueError
from ...core.units import UnitSystem, display_unit
from ...dynamics.modes import Mode
from .analysis import CampbellData, campbell, deflected_shape, rotor_modes
from .criticals import CriticalSpeed, CriticalSpeedMap, critical_speed_map, critical_speeds
from .model import Rotor
from .response import Unbalance, UnbalanceResponse, unbalance_response_rotor
from .scenario import RotorScenario

__all__ = ["RotorStudyResult", "run_rotor_study"]

CAMPBELL_POINTS = 41
RESPONSE_POINTS = 240


@dataclass(frozen=True)
class RotorStudyResult:
    """Everything one run of a rotor scenario gives.

    Attributes
    ----------
    scenario : RotorScenario
    rotor : Rotor
    campbell : CampbellData
    criticals : tuple of CriticalSpeed
        Forward criticals of every excitation order within the sweep.
    response : UnbalanceResponse
    half_power : tuple of (CriticalSpeed, HalfPower or None)
        The 1x criticals with their response-peak analysis (None: not resolved).
    modes : tuple of Mode
        What the interference check saw.
    findings : FindingsTable
    unstable : tuple of (float, int)
        (speed [rpm], branch) with negative log decrement up to the maximum speed.
    peak_vibration, peak_vibration_speed : float
        Largest major-axis shaft vibration [m pk-pk] at the probes over the operating speeds and where.
    vibration_limit : float
        API shaft vibration limit at the maximum continuous speed [m pk-pk].
    speed_map : CriticalSpeedMap
        Undamped critical speeds against isotropic support stiffness.
    bearing_curves : tuple of (str, numpy.ndarray, numpy.ndarray, numpy.ndarray)
        Each bearing's label, speeds [rpm] and kxx, kyy [N/m] over the sweep (to overlay on the map).
    shapes_at_max : tuple of (numpy.ndarray, numpy.ndarray)
        Deflected shape (node positions [m], relative semi-major axis) of each mode at ``shape_speed``.
    shape_speed : float
        The speed of the mode shapes [rpm] (the maximum continuous speed unless chosen).
    stiffness_scale, damping_scale : float
        The factors on the bearings' stiffness and damping [-].
    unbalances : tuple of Unbalance
        The unbalances the response was computed for [kg m].
    """

    scenario: RotorScenario
    rotor: Rotor
    campbell: CampbellData
    criticals: tuple[CriticalSpeed, ...]
    response: UnbalanceResponse
    half_power: tuple[tuple[CriticalSpeed, HalfPower | None], ...]
    modes: tuple[Mode, ...]
    findings: FindingsTable
    unstable: tuple[tuple[float, int], ...]
    peak_vibration: float
    peak_vibration_speed: float
    vibration_limit: float
    speed_map: CriticalSpeedMap
    bearing_curves: tuple[tuple[str, np.ndarray, np.ndarray, np.ndarray], ...]
    shapes_at_max: tuple[tuple[np.ndarray, np.ndarray], ...]
    shape_speed: float
    stiffness_scale: float = 1.0
    damping_scale: float = 1.0
    unbalances: tuple[Unbalance, ...] = ()

    @property
    def stable(self) -> bool:
        """True when no tracked mode has negative log decrement up to the maximum speed."""
        return not self.unstable

    @property
    def vibration_passed(self) -> bool:
        """True when the predicted shaft vibration is within the API limit."""
        return self.peak_vibration <= self.vibration_limit

    @property
    def passed(self) -> bool:
        """Margins, stability and vibration all pass."""
        return self.findings.passed and self.stable and self.vibration_passed

    @property
    def verdict(self) -> str:
        """``"PASS"``, ``"PASS WITH EXEMPTION"`` or ``"FAIL"``."""
        return verdict_of(self.passed, self.findings)

    def summary(self, system: UnitSystem = "SI") -> str:
        """Four lines: verdict, margins, stability, vibration."""
        unit, factor = display_unit("displacement", system)
        digits = 1 if system == "SI" else 2
        criticals = ", ".join(f"{c.speed:.0f} rpm ({c.order:g}x)" for c in self.criticals) or "none in the sweep"
        stability = (
            "stable: every tracked mode has positive log decrement up to the maximum speed"
            if self.stable
            else f"UNSTABLE: negative log decrement at {len(self.unstable)} sweep points, first at "
            f"{self.unstable[0][0]:.0f} rpm (branch {self.unstable[0][1] + 1})"
        )
        return (
            f"{verdict_line(self.verdict, self.findings)}\n"
            f"Forward critical speeds: {criticals}\n"
            f"Margins: {self.findings.summary() if len(self.findings) else 'no critical speed to check'}\n"
            f"Stability: {stability}\n"
            f"Vibration: {self.peak_vibration * factor:.{digits}f} {unit} pk-pk at {self.peak_vibration_speed:.0f} rpm "
            f"(API limit {self.vibration_limit * factor:.{digits}f} {unit}) -> "
            f"{'within' if self.vibration_passed else 'ABOVE'} the limit"
        )


def _order_excitations(scenario: RotorScenario) -> list[Excitation]:
    fixed = [e.label for e in scenario.excitations if e.order is None]
    if fixed:
        # Never drop a source silently: a fixed frequency against speed-dependent whirl branches is not
        # a coincidence speed, and this flow does not check it.
        raise InputValueError(
            f"excitations: {fixed[0]!r} has a fixed frequency; the rotor flow checks sources that follow the "
            "speed (orders, drive-fed electrical frequencies); check fixed sources in a support scenario"
        )
    return list(scenario.excitations)


def _same_dynamics(a: RotorScenario, b: RotorScenario) -> bool:
    # What the Campbell data, the criticals and the map depend on (not the speed range, rules or units).
    fields = ("sections", "discs", "bearings", "sweep_max", "modes", "excitations")
    return all(getattr(a, f) == getattr(b, f) for f in fields)


def run_rotor_study(
    scenario: RotorScenario,
    stiffness_scale: float = 1.0,
    damping_scale: float = 1.0,
    shape_speed: float | None = None,
    previous: RotorStudyResult | None = None,
    progress: bool = False,
) -> RotorStudyResult:
    """Run every rotor check of a scenario (optionally with scaled bearing stiffness and damping).

    Parameters
    ----------
    scenario : RotorScenario
        The validated scenario.
    stiffness_scale, damping_scale : float
        Factors on every bearing's stiffness and damping [-] (> 0).
    shape_speed : float, optional
        Where the mode shapes are taken [rpm] (the maximum continuous speed if omitted).
    previous : RotorStudyResult, optional
        An earlier result (a panel's last update): whatever the change does not touch is reused (the
        Campbell data, criticals and critical speed map when only the speed range, the rules or the
        units moved; the unbalance response when the unbalances are the same too). The result is the
        same as without it.
    progress : bool
        Show a progress bar over the Campbell sweep.

    Returns
    -------
    RotorStudyResult
        Campbell data, critical speeds, findings, response and stability of the rotor.

    Raises
    ------
    InputValueError
        A factor that is not finite and positive, or a source the rotor flow does not check.
    """
    for name, value in (("stiffness_scale", stiffness_scale), ("damping_scale", damping_scale)):
        if not (math.isfinite(value) and value > 0.0):
            raise InputValueError(f"{name}: got {value!r}; expected a finite factor > 0")
    orders = _order_excitations(scenario)
    reuse = (
        previous is not None
        and (previous.stiffness_scale, previous.damping_scale) == (stiffness_scale, damping_scale)
        and _same_dynamics(previous.scenario, scenario)
    )
    if reuse:
        assert previous is not None
        rotor, data, criticals = previous.rotor, previous.campbell, previous.criticals
    else:
        rotor = scenario.build(stiffness_scale, damping_scale)
        data = campbell(rotor, np.linspace(0.0, scenario.sweep_max, CAMPBELL_POINTS), scenario.modes, progress=progress)
        criticals = tuple(critical_speeds(rotor, data, [e.order for e in orders]))  # type: ignore[misc]
    speeds = np.linspace(scenario.sweep_max / RESPONSE_POINTS, scenario.sweep_max, RESPONSE_POINTS)
    unbalances = scenario.unbalances(rotor)
    if (
        reuse
        and previous is not None
        and previous.unbalances == tuple(unbalances)
        and (previous.scenario.probes == scenario.probes)
    ):
        response = previous.response
    else:
        response = unbalance_response_rotor(rotor, unbalances, speeds, scenario.probes, reduced=True)
    amplitude = response.major_pk_pk
    probe = int(np.argmax(amplitude.max(axis=0)))
    tables = []
    analysed = []
    modes: list[Mode] = []
    for excitation in orders:
        found = []
        for c in (c for c in criticals if c.order == excitation.order):
            hp = None
            if excitation.kind == "synchronous":
                try:
                    hp = half_power_points(speeds, amplitude[:, probe], near=c.speed)
                except InputValueError:
                    hp = None
                if hp is not None and abs(hp.peak_frequency - c.speed) > 0.1 * c.speed:
                    hp = None  # the nearest resolved peak belongs to another critical
                analysed.append((c, hp))
            mode = c.to_mode()
            if hp is not None:
                mode = dataclasses.replace(
                    mode,
                    amplification_factor_override=max(1.0, hp.amplification_factor),
                    af_source="half-power of the computed unbalance response",
                )
            found.append(mode)
        modes += found
        if found:
            tables.append(interference_check(found, [excitation], scenario.speed, scenario.rules))
    running = np.concatenate([np.flatnonzero((speeds >= a) & (speeds <= b)) for a, b in scenario.speed.intervals])
    if running.size == 0:
        running = np.array([int(np.argmin(np.abs(speeds - scenario.speed.speed_max)))])
    worst = running[int(np.argmax(amplitude[running].max(axis=1)))]
    up_to_max = [(s, b) for s, b in data.unstable() if s <= scenario.speed.speed_max]
    curve_speeds = np.linspace(0.0, scenario.sweep_max, 25)
    curves = []
    for b in rotor.bearings:
        table = np.array([b.coefficients(float(n))[0] for n in curve_speeds])
        curves.append((b.label, curve_speeds, table[:, 0, 0], table[:, 1, 1]))
    # The map's stiffness axis comes from the bearings as given (unscaled), so it stays put while a factor
    # moves (and the map need not be recomputed): 1/100 of the softest to 100 x the stiffest coefficient.
    given = [np.atleast_1d(np.asarray(getattr(b, n), dtype=float)) for b in scenario.bearings for n in ("kxx", "kyy")]
    positive = [v[v > 0] for v in given if np.any(v > 0)]
    low = 0.01 * min(float(v.min()) for v in positive) if positive else 1e3
    high = 100.0 * max(float(v.max()) for v in positive) if positive else 1e10
    shape_speed = scenario.speed.speed_max if shape_speed is None else shape_speed
    if reuse and previous is not None and previous.shape_speed == shape_speed:
        shapes = previous.shapes_at_max
    else:
        at_max = rotor_modes(rotor, shape_speed, scenario.modes)
        shapes = tuple(deflected_shape(rotor, at_max, i) for i in range(at_max.shapes.shape[1]))
    grid = np.geomspace(max(low, 1e3), max(high, 1e4), 49)
    if (
        previous is not None
        and _same_dynamics(previous.scenario, scenario)
        and np.array_equal(previous.speed_map.stiffness, grid)
    ):
        speed_map = previous.speed_map  # the map depends on the shaft and the grid only
    else:
        speed_map = critical_speed_map(rotor, grid, count=4)
    return RotorStudyResult(
        scenario,
        rotor,
        data,
        criticals,
        response,
        tuple(analysed),
        tuple(modes),
        FindingsTable.combine(tables),
        tuple(up_to_max),
        float(amplitude[worst].max()),
        float(speeds[worst]),
        api_shaft_vibration_limit(scenario.speed.speed_max),
        speed_map,
        tuple(curves),
        shapes,
        float(shape_speed),
        stiffness_scale,
        damping_scale,
        tuple(unbalances),
    )
