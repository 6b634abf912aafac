"""The calculation record of a torsional study (text and JSON).

Inputs, methods, modes and their shapes, findings and the torque check.
"""

from __future__ import annotations

import datetime as _dt
from typing import Any

import numpy as np

from ...checks.interference import verdict_line
from ...core.units import UnitSystem, display_unit
from ...dynamics.modes import Mode
from ...records.record import CAUTION, Record, record_head
from ...records.sections import (
    basis_lines,
    excitation_lines,
    excitation_rows,
    finding_pairs,
    header_lines,
    methods_used,
)
from .study import TorsionStudyResult
from .torque import TorqueSweep
from .train import TorsionalTrain

__all__ = [
    "build_torsion_record",
]


TORSION_METHODS: tuple[tuple[str, str], ...] = (
    (
        "Train referred to the driver's shaft by the speed ratio squared; modes of K theta = w^2 J theta",
        "W. Ker Wilson, Practical Solution of Torsional Vibration Problems (from memory); Rao, Mechanical "
        "Vibrations, 6th ed., 2017, sec. 5.6 and 6.10",
    ),
    (
        "Shaft stiffness G J_p / L, J_p = pi (D^4 - d^4) / 32",
        "Roark's Formulas for Stress and Strain, 7th ed. (from memory)",
    ),
)


FORCED_METHOD: tuple[tuple[str, str], ...] = (
    (
        "Steady forced torque by modal superposition of the referred train (real modes for modal damping, complex "
        "modes for element dampers), over the operating speeds and every coincidence inside them; amplitudes of "
        "different cases added (conservative)",
        "D. J. Ewins, Modal Testing, 2nd ed., 2000, sec. 2.3-2.6; Rao, Mechanical Vibrations, 6th ed., sec. 6.10",
    ),
    ("Shear stress amplitude T / Z_p, Z_p = pi (D^4 - d^4) / (16 D)", "Roark's Formulas, 7th ed. (from memory)"),
)


def build_torsion_record(result: TorsionStudyResult, created: _dt.datetime | None = None) -> Record:
    """Build the record of a torsional study (text in the scenario's units, JSON in SI).

    Parameters
    ----------
    result : TorsionStudyResult
        The study to record.
    created : datetime, optional
        Time stamp (now, UTC, if omitted).

    Returns
    -------
    Record
        Data (JSON-ready, SI) and text (in the scenario's units) of the torsional study.

    Raises
    ------
    Nothing
        The result is already validated.
    """
    created = created or _dt.datetime.now(_dt.timezone.utc)
    s = result.scenario
    train = s.train
    j_unit, j_factor = display_unit("inertia", s.units)
    k_unit, k_factor = display_unit("moment_stiffness", s.units)
    f_unit, f_factor = display_unit("frequency", s.units)
    data: dict[str, Any] = {
        **record_head("resonance-torsion-record/1", s.title, s.source, s.sha256, s.record, created),
        "scenario": s.tables,
        "assumptions": [
            "Linear torsional model: rigid inertias joined by massless torsional springs; gear meshes rigid unless "
            "a mesh stiffness is given; backlash and nonlinear couplings not modelled.",
            "Every shaft turns at a fixed ratio of the driver's speed; inertias and stiffnesses are referred to the "
            "driver's shaft by the ratio squared.",
            "Damping: "
            + (
                f"modal ratio {s.damping_ratio:g} on every mode."
                if s.damping_ratio is not None
                else "the elements' dampers."
            ),
            f"Margin rules by scope (those applied): {s.rules.applied_description(finding_pairs(result.findings))}.",
            "Where a margin cannot be met, the steady dynamic torque and shear stress must be shown acceptable; "
            "fatigue design belongs to the governing code and a qualified engineer.",
        ],
        "methods": methods_used(TORSION_METHODS + (FORCED_METHOD if result.torque else ()), result.findings),
        "driver_shaft": train.reference,
        "speed_ratios": dict(train.speed_ratio),
        "excitations": excitation_rows(s.excitations),
        "modes": [
            {
                "frequency_hz": m.frequency,
                "damping_ratio": m.damping_ratio,
                "twists_most": sh.twists_most,
                "label": m.label,
            }
            for m, sh in zip(result.modes, result.shapes, strict=True)
        ],
        "findings": result.findings.to_records(),
        "forced_response": _forced_record(result.torque, train, result.modes),
        "verdict": result.verdict,
        "cautions": CAUTION,
    }
    lines = [
        *header_lines("CALCULATION RECORD (TORSION)", s.title, s.description, data),
        "INPUTS",
        f"  driver speed: {s.speed.describe()}",
        "  shafts: " + ", ".join(f"{name} x{ratio:.4g}" for name, ratio in train.speed_ratio.items()),
        "  stations: "
        + ", ".join(f"{st.name} {st.inertia * j_factor:.4g} {j_unit} ({st.shaft})" for st in train.stations),
        "  elements: " + ", ".join(f"{sp.label} {sp.stiffness * k_factor:.4g} {k_unit}" for sp in train.springs),
        f"  driver shaft: {train.reference!r} (stations "
        + ", ".join(st.name for st in train.stations if st.shaft == train.reference)
        + "); [speed] and every order are of its speed",
        *excitation_lines(s.excitations, f"the driver shaft {train.reference!r}"),
        "",
        *basis_lines(data),
        "TORSIONAL MODES",
        *(
            f"  {m.label}: {m.frequency * f_factor:.{2 if s.units == 'SI' else 0}f} {f_unit}; {sh.twists_most}"
            for m, sh in zip(result.modes, result.shapes, strict=True)
        ),
        "",
        "FINDINGS (worst first)",
        result.findings.to_text(system=s.units) if len(result.findings) else "  no mode to check",
        "",
        *_forced_lines(result, s.units),
        verdict_line(result.verdict, result.findings, heading="VERDICT"),
        "",
        "CAUTION",
        f"  {CAUTION}",
    ]
    return Record(data, "\n".join(lines))


def _forced_record(torque: TorqueSweep | None, train: TorsionalTrain, modes: tuple[Mode, ...]) -> dict[str, Any] | None:
    # The forced response in SI for the JSON record: the curves over the speeds, each element's torque at every
    # coincidence of a case's excitation with a mode, and the shaft each torque is on.
    if torque is None:
        return None
    shaft_of = _element_shafts(train)
    coincidences = []
    for j, case in enumerate(torque.cases):
        for mode in modes:
            n_c = case.excitation.coincidence_speed(mode.frequency)
            if n_c is None or not np.any(np.isclose(torque.speed, n_c, rtol=1e-12)):
                continue
            i = int(np.argmin(np.abs(torque.speed - n_c)))
            coincidences.append(
                {
                    "case": case.label,
                    "mode": mode.label,
                    "speed_rpm": float(torque.speed[i]),
                    "element_torque_n_m": {label: float(v[j, i]) for label, v in torque.element_torque.items()},
                }
            )
    return {
        "cases": [
            {"label": c.label, "station": c.station, "excitation": c.excitation.label, "torque_n_m": c.torque}
            for c in torque.cases
        ],
        "speed_rpm": [float(torque.speed[0]), float(torque.speed[-1])] if torque.speed.size else [],
        "curves": {
            "speed_rpm": [float(x) for x in torque.speed],
            "element_torque_n_m": {
                label: {"shaft": shaft_of.get(label, ""), "per_case": values.round(9).tolist()}
                for label, values in torque.element_torque.items()
            },
            "shear_stress_pa": {label: values.round(3).tolist() for label, values in torque.shear_stress.items()},
        },
        "at_coincidences": coincidences,
        "elements": [
            {
                "element": row.element,
                "shaft": shaft_of.get(row.element, ""),
                "peak_torque_n_m": row.peak_torque,
                "at_speed_rpm": row.speed,
                "peak_shear_stress_pa": row.peak_stress,
                "allowable_torque_n_m": row.allowable.torque,
                "allowable_shear_stress_pa": row.allowable.stress,
                "utilisation": row.utilisation,
                "status": row.status,
            }
            for row in torque.rows
        ],
        "passed": torque.passed,
    }


def _element_shafts(train: TorsionalTrain) -> dict[str, str]:
    # The shaft each element's torque is on, in words (a mesh's torque is on its pinion's shaft).
    shaft_of = {st.name: st.shaft for st in train.stations}
    out = {label: f"shaft {shaft_of[a]!r}" for label, a, _b, _k in train.elements if not label.startswith("mesh ")}
    for m in train.meshes:
        out[f"mesh {m.gear}-{m.pinion}"] = f"shaft {shaft_of[m.pinion]!r} (the pinion's)"
    return out


def _forced_lines(result: TorsionStudyResult, system: UnitSystem) -> list[str]:
    # The forced response in the text record, in the scenario's units.
    torque = result.torque
    if torque is None:
        return []
    t_unit, t_factor = display_unit("torque", system)
    p_unit, p_factor = display_unit("stress", system)

    def value(x: float | None, factor: float, unit: str) -> str:
        return "-" if x is None else f"{x * factor:.4g} {unit}"

    lines = [
        "FORCED TORQUE (steady state over the operating speeds; cases' amplitudes added)",
        *(
            f"  case {c.label}: {c.torque * t_factor:.3g} {t_unit} at {c.station}, at the frequency of "
            f"{c.excitation.label}"
            for c in torque.cases
        ),
        f"  {'element':<28}{'peak torque':>16}{'at rpm':>9}{'stress':>14}{'allowable':>26}{'use':>7}  status"
        "  (torque on)",
    ]
    shaft_of = _element_shafts(result.scenario.train)
    for row in torque.rows:
        allowed = " / ".join(
            x
            for x in (
                value(row.allowable.torque, t_factor, t_unit) if row.allowable.torque is not None else "",
                value(row.allowable.stress, p_factor, p_unit) if row.allowable.stress is not None else "",
            )
            if x
        )
        use = "-" if row.utilisation is None else f"{100 * row.utilisation:.0f} %"
        lines.append(
            f"  {row.element:<28}{value(row.peak_torque, t_factor, t_unit):>16}{row.speed:>9.0f}"
            f"{value(row.peak_stress, p_factor, p_unit):>14}{allowed or '-':>26}{use:>7}  {row.status}"
            f"  ({shaft_of.get(row.element, '-')})"
        )
    if not result.findings.passed and torque.passed:
        lines.append(
            "  The separation margin is not met. A governing standard may accept a coincidence on a stress "
            "analysis (API 617, from memory); the torques above are that evidence only where every element has "
            "an allowable. Accepting it is the reviewer's decision; the verdict stays FAIL."
        )
    lines.append("  Fatigue design belongs to the governing code and a qualified engineer.")
    return [*lines, ""]
