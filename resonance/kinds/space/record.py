"""The calculation record of a supports-in-space study (text and JSON).

Inputs, methods, modes in words, findings, the probes' motion and vibration zones.
"""

from __future__ import annotations

import datetime as _dt
from typing import Any

import numpy as np

from ...checks.interference import verdict_line
from ...core.units import display_unit
from ...records.record import CAUTION, Record, record_head
from ...records.sections import (
    basis_lines,
    excitation_lines,
    excitation_rows,
    finding_pairs,
    header_lines,
    methods_used,
)
from .response import orbit_major, unbalance_reference
from .study import SpaceStudyResult

__all__ = ["build_space_record"]


SPACE_METHODS: tuple[tuple[str, str], ...] = (
    (
        "Rigid bodies with six coordinates on mounts (small rotations), steel frames of 12 x 12 beam elements",
        "Harris' Shock and Vibration Handbook, 5th ed., ch. 30; Przemieniecki, Theory of Matrix Structural "
        "Analysis, 1968 (from memory)",
    ),
    (
        "Soil: rigid footing on an elastic half-space, equivalent radii, radiation damping from mass ratios",
        "Richart, Hall & Woods, Vibrations of Soils and Foundations, 1970 (from memory)",
    ),
)


def _probe_motion(result: SpaceStudyResult, k: int, speed: float) -> dict[str, Any]:
    # The probe's motion at the speed of its largest velocity: amplitude and phase lag per direction, orbit.
    i = int(np.argmin(np.abs(result.speed - speed)))
    u = result.displacement[i, k]
    return {
        "amplitude_m": [float(x) for x in np.abs(u)],
        "phase_lag_deg": [float(x) for x in np.degrees(np.mod(-np.angle(u), 2 * np.pi))],
        "orbit_major_m": float(orbit_major(u)),
    }


def build_space_record(result: SpaceStudyResult, created: _dt.datetime | None = None) -> Record:
    """Build the record of a supports-in-space study (text in the scenario's units, JSON in SI).

    Parameters
    ----------
    result : SpaceStudyResult
        The study to record.
    created : datetime, optional
        Time stamp (now, UTC, if omitted).

    Returns
    -------
    Record
        Data (JSON-ready, SI) and text (in the scenario's units) of the study in space.

    Raises
    ------
    Nothing
        The result is already validated.
    """
    created = created or _dt.datetime.now(_dt.timezone.utc)
    s = result.scenario
    f_unit, f_factor = display_unit("frequency", s.units)
    v_unit, v_factor = display_unit("velocity", s.units)
    m_unit, m_factor = display_unit("mass", s.units)
    u_unit, u_factor = display_unit("unbalance", s.units)
    d_unit, d_factor = display_unit("displacement", s.units)
    footing = s.footing()
    data: dict[str, Any] = {
        **record_head("resonance-space-record/1", s.title, s.source, s.sha256, s.record, created),
        "scenario": s.tables,
        "excitations": excitation_rows(s.excitations),
        "assumptions": [
            "Rigid bodies with small rotations on linear mounts; steel frames of Euler-Bernoulli beam elements with "
            "the section properties given; attached bodies rigidly fixed to their node.",
            f"Damping: the mounts' and the soil's dashpots plus modal damping {s.damping_ratio:g} on every mode.",
            "Soil: a rigid footing on a homogeneous elastic half-space; soil properties are the least certain "
            "input: check them with a geotechnical engineer and over the tolerance band.",
            f"Margin rules by scope (those applied): {s.rules.applied_description(finding_pairs(result.findings))}.",
            "Vibration: the 1x unbalance response, RMS, against the ISO 10816-3 zones (broadband field criteria): "
            "an estimate.",
        ],
        "methods": methods_used(SPACE_METHODS, result.findings),
        "modes": [
            {"frequency_hz": sh.frequency, "damping_ratio": sh.damping_ratio, "words": sh.words, "shares": sh.shares}
            for sh in result.shapes
        ],
        "soil": None
        if footing is None
        else {
            motion: {
                "stiffness": getattr(footing, motion).stiffness,
                "damping": getattr(footing, motion).damping,
                "damping_ratio": getattr(footing, motion).damping_ratio,
                "equivalent_radius_m": getattr(footing, motion).radius,
            }
            for motion in ("x", "y", "z", "rx", "ry", "rz")
        },
        "findings": result.findings.to_records(),
        "vibration": [
            {
                "probe": label,
                "velocity_rms_m_s": v,
                "speed_rpm": n,
                "zone": z,
                "support_used": result.support_used,
                **_probe_motion(result, k, n),
            }
            for k, ((label, _b, _p), (v, n, z)) in enumerate(zip(s.probes, result.peak_velocity, strict=True))
        ],
        # Each probe's 1x response over the whole speed axis, so a reviewer can redraw it (SI; phase lag
        # behind the unbalance force, whose t = 0 position the inputs name).
        "response_curves": {
            "speed_rpm": [float(x) for x in result.speed],
            "probes": [
                {
                    "probe": label,
                    "displacement_0_pk_m": np.abs(result.displacement[:, k, :]).round(15).tolist(),
                    "phase_lag_deg": np.degrees(np.mod(-np.angle(result.displacement[:, k, :]), 2 * np.pi))
                    .round(3)
                    .tolist(),
                    "velocity_rms_m_s": result.velocity_rms[:, k, :].round(12).tolist(),
                    "axes": ["x", "y", "z"],
                }
                for k, (label, _b, _p) in enumerate(s.probes)
            ],
        },
        "tolerance_band": {
            "tolerance": s.tolerance,
            "combinations": [
                {"mount_factor": a, "soil_factor": b, "frame_factor": c, "worst_excess_percent": e}
                for a, b, c, e in result.band
            ],
            "passed": result.band_passed,
            "summary": result.band_line(),
        },
        "verdict": result.verdict,
        "cautions": CAUTION,
    }
    lines = [
        *header_lines("CALCULATION RECORD (SUPPORT IN SPACE)", s.title, s.description, data),
        "INPUTS",
        f"  operating speed: {s.speed.describe()}",
        "  bodies: " + ", ".join(f"{b.name} {b.mass * m_factor:.5g} {m_unit}" for b in s.bodies),
        f"  mounts: {len(s.mounts)}; frame: {len(s.nodes)} nodes, {len(s.beams)} beams; soil: "
        + ("none" if s.soil is None else f"G {s.soil.shear_modulus / 1e6:.4g} MPa, nu {s.soil.poisson_ratio:g}"),
        *excitation_lines(s.excitations),
        *(
            f"  unbalance {u * u_factor:.4g} {u_unit} on {b} at {np.round(p, 4).tolist()} m, shaft along "
            f"{np.round(a, 4).tolist()}: at t = 0 it points along {np.round(unbalance_reference(a)[0], 4).tolist()} "
            "(the reference of every phase lag), turning right-handed about the shaft"
            for b, p, a, u in s.unbalance
        ),
        "",
        *basis_lines(data),
        "MODES",
        *(
            f"  mode {i + 1}: {sh.frequency * f_factor:.{2 if s.units == 'SI' else 0}f} {f_unit}, damping ratio "
            f"{sh.damping_ratio:.4f}; {sh.words}"
            for i, sh in enumerate(result.shapes)
        ),
        "",
        "FINDINGS (worst first)",
        result.findings.to_text(system=s.units),
        "",
        "VIBRATION (1x unbalance response, RMS; an estimate against the ISO zones)",
        *(
            f"  {row['probe']}: {row['velocity_rms_m_s'] * v_factor:.3g} {v_unit} at {row['speed_rpm']:.0f} rpm, "
            f"zone {row['zone']} ({result.support_used} boundaries); there x/y/z "
            + "/".join(f"{a * d_factor:.3g}" for a in row["amplitude_m"])
            + f" {d_unit} 0-pk, phase lag "
            + "/".join(f"{p:.0f}" for p in row["phase_lag_deg"])
            + f" deg, orbit major axis {row['orbit_major_m'] * d_factor:.3g} {d_unit}"
            for row in data["vibration"]
        ),
        "",
        "TOLERANCE BAND",
        f"  {result.band_line()}",
        "",
        verdict_line(result.verdict, result.findings, heading="VERDICT"),
        "",
        "CAUTION",
        f"  {CAUTION}",
    ]
    return Record(data, "\n".join(lines))
