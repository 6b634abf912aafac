"""The calculation record of a rotor study (text and JSON), like :mod:`resonance.records.record`."""

from __future__ import annotations

import datetime as _dt
from typing import Any

from ...checks.interference import verdict_line
from ...core.units import display_unit
from ...records.record import CAUTION, Record, RecordSection, record_head
from ...records.sections import (
    basis_lines,
    excitation_lines,
    excitation_rows,
    finding_pairs,
    header_lines,
    methods_used,
    uncertainty_lines,
)
from .scenario import rotor_scenario_to_dict
from .study import RotorStudyResult

__all__ = ["ROTOR_METHODS", "build_rotor_record"]

ROTOR_METHODS: tuple[tuple[str, str], ...] = (
    (
        "Shaft finite elements with rotary inertia, gyroscopic moments and Timoshenko shear",
        "H. D. Nelson and J. M. McVaugh, J. Eng. Ind. 98(2), 1976; H. D. Nelson, J. Mech. Des. 102(4), 1980",
    ),
    (
        "Damped whirl modes, Campbell diagram, log decrement; critical speeds by root finding on each tracked branch",
        "M. I. Friswell et al., Dynamics of Rotating Machines, Cambridge, 2010, ch. 3-6",
    ),
    ("Undamped critical speed map (synchronous forward whirl)", "API RP 684, 2nd ed. (from memory)"),
    ("Unbalance response; separation margin from the operating speed range", "API RP 684 2nd ed. (from memory)"),
    ("Shaft vibration limit 25.4 sqrt(12000 / N) um pk-pk, not above 25.4 um", "API Std 617, 8th ed. (from memory)"),
)


def _assumptions(result: RotorStudyResult) -> list[str]:
    s = result.scenario
    u_unit, u_factor = display_unit("unbalance", s.units)
    return [
        "Linear rotor-bearing model: lateral motion in two planes, rigid discs, bearings as linear springs and "
        "dashpots (coefficients interpolated over speed where tabulated); foundation rigid unless a pedestal is given.",
        f"Campbell data from {result.campbell.speed.size} speeds up to {s.sweep_max:g} rpm with a Ritz basis "
        "(lowest modes plus static bearing shapes); the lowest tracked modes agree with the full model to about 1e-5.",
        "1x criticals take their AF from the half-power points of the unbalance response at the probe that "
        "responds most; other criticals take 1 / (2 zeta) from the modal damping.",
        "Unbalance: "
        + ", ".join(f"{u.amount * u_factor:.4g} {u_unit} at station {u.station}" for u in s.unbalances(result.rotor))
        + "; "
        "predicted vibration is the orbit's major axis, peak-to-peak, at the probe stations.",
        f"Margin rules by scope (those applied): {s.rules.applied_description(finding_pairs(result.findings))}.",
        "A negative log decrement of any tracked mode up to the maximum continuous speed fails the check.",
    ]


def build_rotor_record(
    result: RotorStudyResult, created: _dt.datetime | None = None, uncertainty: RecordSection | None = None
) -> Record:
    """Build the record of a rotor study result.

    Parameters
    ----------
    result : RotorStudyResult
        The study to record.
    created : datetime, optional
        Time stamp (now, UTC, if omitted).
    uncertainty : RecordSection, optional
        Its uncertainty study (fails the verdict only above a given ``max_failure_probability``).

    Returns
    -------
    Record
        Data (JSON-ready, SI) and text (in the scenario's units) of the rotor study.

    Raises
    ------
    Nothing
        The result is already validated.
    """
    created = created or _dt.datetime.now(_dt.timezone.utc)
    s = result.scenario
    d_unit, d_factor = display_unit("displacement", s.units)
    l_unit, l_factor = display_unit("length", s.units)
    m_unit, m_factor = display_unit("mass", s.units)
    f_unit, f_factor = display_unit("frequency", s.units)
    digits = 1 if s.units == "SI" else 2
    data: dict[str, Any] = {
        **record_head("resonance-rotor-record/2", s.title, s.source, s.sha256, s.record, created),
        "scenario": rotor_scenario_to_dict(s),
        "excitations": excitation_rows(s.excitations),
        "assumptions": _assumptions(result),
        "methods": methods_used(ROTOR_METHODS, result.findings),
        "critical_speeds": [
            {
                "order": c.order,
                "branch": c.branch + 1,
                "speed_rpm": c.speed,
                "frequency_hz": c.frequency,
                "damping_ratio": c.damping_ratio,
                "whirl": c.whirl,
            }
            for c in result.criticals
        ],
        "findings": result.findings.to_records(),
        "stability": {"stable": result.stable, "unstable_points": [list(p) for p in result.unstable]},
        "vibration": {
            "peak_pk_pk_m": result.peak_vibration,
            "at_speed_rpm": result.peak_vibration_speed,
            "limit_pk_pk_m": result.vibration_limit,
            "passed": result.vibration_passed,
        },
        "verdict": result.verdict,
        "cautions": CAUTION,
    }
    if uncertainty is not None:
        data["uncertainty"] = uncertainty.record_data()
        if not uncertainty.passed:
            data["verdict"] = "FAIL"
    lines = [
        *header_lines("CALCULATION RECORD (ROTOR)", s.title, s.description, data),
        "INPUTS",
        f"  operating speed: {s.speed.describe()}; sweep to {s.sweep_max:g} rpm",
        f"  shaft: {len(s.sections)} sections, {result.rotor.nodes - 1} elements, "
        f"{result.rotor.node_z[-1] * l_factor:.4g} {l_unit} long; discs: "
        + (", ".join(f"{d.label} {d.mass * m_factor:.5g} {m_unit} at station {d.station}" for d in s.discs) or "none"),
        "  bearings: "
        + ", ".join(f"{b.label} at station {b.station}" + (" (speed table)" if b.speeds else "") for b in s.bearings),
        *excitation_lines(s.excitations),
        f"  margin rules (those applied): {s.rules.applied_description(finding_pairs(result.findings))}",
        "",
        *basis_lines(data),
        "CRITICAL SPEEDS (forward whirl)",
        *(
            f"  {c.speed:.0f} rpm ({c.order:g}x, branch {c.branch + 1}): "
            f"{c.frequency * f_factor:.{2 if s.units == 'SI' else 0}f} {f_unit}, damping ratio "
            f"{c.damping_ratio:.4f}, log dec. {c.to_mode().log_decrement:.3f}"
            for c in result.criticals
        ),
        *(["  none within the sweep"] if not result.criticals else []),
        "",
        "FINDINGS (worst first)",
        result.findings.to_text(system=s.units) if len(result.findings) else "  no critical speed to check",
        "",
        "STABILITY",
        f"  {'stable' if result.stable else 'UNSTABLE'}",
        "",
        "VIBRATION",
        f"  {result.peak_vibration * d_factor:.{digits}f} {d_unit} pk-pk at {result.peak_vibration_speed:.0f} rpm; "
        f"API limit {result.vibration_limit * d_factor:.{digits}f} {d_unit}",
        "",
        *(uncertainty_lines(data["uncertainty"]) if "uncertainty" in data else []),
        verdict_line(data["verdict"], result.findings, heading="VERDICT"),
        "",
        "CAUTION",
        f"  {CAUTION}",
    ]
    return Record(data, "\n".join(lines))
