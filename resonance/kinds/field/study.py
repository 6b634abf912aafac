"""The field-verification flow: a scenario's ``[field]`` table -> measured modes, findings, a tuned model.

A support scenario may carry the measurements that verify it::

    [field]
    coastdown = "../data/coastdown_fan.csv"   # relative to the scenario file
    channel = "housing-X"
    band = ["800 rpm", "3000 rpm"]            # speeds searched and fitted (optional)
    impact = "../data/impact_fan.csv"         # optional
    impact_channel = "housing-X"
    record_length = "1 s"
    impact_band = ["10 Hz", "150 Hz"]
    impact_modes = 2                          # rational-fraction model order (modes in the band)
    tune = [{ spring = "floor", low = 0.25, high = 4.0 }]   # or { mass = "housing", ... }

:func:`run_field_study` finds the resonances of the coast-down (confirmed by
phase, half-power AF), fits them, checks them against the scenario's
excitations and speed range by the scenario's rule, identifies the impact
test's modes (rational-fraction fit), tunes the chosen springs and masses to
the measured frequencies (impact modes if given, else the coast-down's) and
re-runs the model checks with the tuned model.
"""

from __future__ import annotations

import os
from collections.abc import Callable, Mapping
from dataclasses import dataclass
from pathlib import Path
from typing import Any, TypeVar

from ...checks.interference import FindingsTable
from ...core.errors import InputValueError
from ...core.units import QuantityKind
from ...records.tables import ScenarioError, TableReader
from ..support.scenario import Scenario
from ..support.study import StudyResult, run_study
from .coastdown import ModalFit, Resonance, find_resonances, fit_modes, measured_findings, measured_modes
from .impact import Frf, Pole, impact_frf, rfp_fit, stability_diagram
from .readers import CoastDown, DataFileError, read_coastdown, read_impact
from .tuning import TunedModel, TuningParameter, tune_model

__all__ = ["SAME_MODE", "FieldSpec", "FieldStudyResult", "field_spec", "run_field_study"]

T = TypeVar("T")


@dataclass(frozen=True)
class FieldSpec:
    """The validated ``[field]`` table (paths resolved against the scenario's folder).

    Attributes
    ----------
    coastdown : pathlib.Path
        The coast-down file.
    channel : str
        Its channel analysed.
    band : (float, float) or None
        Speeds searched and fitted [rpm].
    impact : pathlib.Path or None
        The impact-test file.
    impact_channel : str or None
        Its response channel.
    record_length : float
        Length of each hit's record [s].
    impact_band : (float, float)
        Frequencies fitted [Hz].
    impact_modes : int
        Modes in the impact band.
    tune : tuple of TuningParameter
        What the tuning may change.
    """

    coastdown: Path
    channel: str
    band: tuple[float, float] | None
    impact: Path | None
    impact_channel: str | None
    record_length: float
    impact_band: tuple[float, float]
    impact_modes: int
    tune: tuple[TuningParameter, ...]


def field_spec(scenario: Scenario, base_dir: str | os.PathLike[str] = ".") -> FieldSpec:
    """Validate a scenario's ``[field]`` table; errors name the file and field.

    Parameters
    ----------
    scenario : Scenario
        With a ``[field]`` table.
    base_dir : path-like
        Folder the table's file names are relative to.

    Returns
    -------
    FieldSpec

    Raises
    ------
    ScenarioError
        No table, an unknown field, an empty path, a bad band or count, a tune target not in the model.
    """
    if not scenario.field:
        raise ScenarioError(f"{scenario.source}: field: missing; the scenario has no measurements to verify it")
    r = TableReader(scenario.source)
    data: Mapping[str, Any] = scenario.field
    r.known(
        data,
        (
            "coastdown",
            "channel",
            "band",
            "impact",
            "impact_channel",
            "record_length",
            "impact_band",
            "impact_modes",
            "tune",
        ),
        "field",
    )
    base = Path(base_dir)

    def pair(key: str, kind: QuantityKind, default: tuple[float, float] | None) -> tuple[float, float] | None:
        if key not in data:
            return default
        raw = r.array(data, key, f"field.{key}")
        if len(raw) != 2:
            raise r.fail(f"field.{key}", f"got {raw!r}; expected [low, high]")
        low, high = (r.value(v, f"field.{key}", kind, "positive") for v in raw)
        if not low < high:
            raise r.fail(f"field.{key}", f"got {raw!r}; expected low < high")
        return low, high

    tune = []
    known = {"spring": [s.label for s in scenario.model.springs], "mass": list(scenario.model.labels)}
    for i, item in enumerate(r.array(data, "tune", "field.tune", required=False)):
        where = f"field.tune[{i}]"
        if not isinstance(item, Mapping) or ("spring" in item) == ("mass" in item):
            raise r.fail(where, "expected a table with exactly one of spring or mass")
        r.known(item, ("spring", "mass", "low", "high"), where)
        kind = "spring" if "spring" in item else "mass"
        target = r.text(item, kind, f"{where}.{kind}")
        if target not in known[kind]:
            raise r.fail(f"{where}.{kind}", f"got {target!r}, which is not in the model; expected one of {known[kind]}")
        low = r.value(item.get("low", 0.25), f"{where}.low", "ratio", "positive")
        high = r.value(item.get("high", 4.0), f"{where}.high", "ratio", "positive")
        if not low < 1.0 < high:
            raise r.fail(where, f"bounds ({low:g}, {high:g}); expected 0 < low < 1 < high")
        tune.append(TuningParameter(kind, target, low, high))  # type: ignore[arg-type]

    def path(key: str, required: bool) -> Path | None:
        if key not in data and not required:
            return None
        text = r.text(data, key, f"field.{key}")
        if not text.strip():
            # An empty path would name the scenario's own folder.
            raise r.fail(f"field.{key}", "is empty; expected the path of a measurement file")
        return base / text

    impact = path("impact", required=False)
    modes = r.integer(data, "impact_modes", "field.impact_modes", 2)
    if not 1 <= modes <= 10:
        raise r.fail("field.impact_modes", f"got {modes}; expected 1 to 10")
    coastdown = path("coastdown", required=True)
    assert coastdown is not None  # required
    return FieldSpec(
        coastdown,
        r.text(data, "channel", "field.channel"),
        pair("band", "speed", None),
        impact,
        r.text(data, "impact_channel", "field.impact_channel", "") or None,
        r.value(data.get("record_length", 1.0), "field.record_length", "time", "positive"),
        pair("impact_band", "frequency", (1.0, 500.0)),  # type: ignore[arg-type]
        modes,
        tuple(tune),
    )


#: A tuned-model mode this close in frequency to a measured one (a fraction of it) is that mode (common practice
#: for pairing measured and predicted modes by frequency where shapes are not measured).
SAME_MODE = 0.03


@dataclass(frozen=True)
class FieldStudyResult:
    """What the measurements say, next to what the model said.

    Attributes
    ----------
    spec : FieldSpec
        The validated table.
    coastdown : CoastDown
        The measurement read.
    resonances : tuple of Resonance
        Amplitude peaks, confirmed or not by the phase.
    fit : ModalFit or None
        The coast-down modal fit.
    findings : FindingsTable or None
        Measured modes against the scenario's rules.
    frf : Frf or None
        The impact test's H1.
    impact_poles, stable_poles : tuple of Pole
        Identified modes, and those stable across model orders.
    tuned : TunedModel or None
        The model tuned to the measured frequencies.
    tuned_study : StudyResult or None
        The checks re-run on the tuned model.
    """

    spec: FieldSpec
    coastdown: CoastDown
    resonances: tuple[Resonance, ...]
    fit: ModalFit | None
    findings: FindingsTable | None
    frf: Frf | None
    impact_poles: tuple[Pole, ...]
    stable_poles: tuple[Pole, ...]
    tuned: TunedModel | None
    tuned_study: StudyResult | None

    @property
    def consistent_poles(self) -> int:
        """How many impact-test modes reappear (1 % in frequency) in the stability check across model orders."""
        return sum(
            any(abs(s.frequency - p.frequency) <= 0.01 * p.frequency for s in self.stable_poles)
            for p in self.impact_poles
        )

    @property
    def governing(self) -> FindingsTable:
        """The findings that govern: every measured one, and the tuned model's for the modes not measured.

        A measured mode governs where it was measured: a tuned-model mode within
        :data:`SAME_MODE` in frequency of a measured one is that mode, and its model findings are superseded.
        """
        measured = tuple(self.findings) if self.findings is not None else ()
        if self.tuned_study is None:
            return FindingsTable(measured)
        seen = [f.mode.frequency for f in measured]
        unmeasured = tuple(
            f for f in self.tuned_study.findings if not any(abs(f.mode.frequency - m) <= SAME_MODE * m for m in seen)
        )
        return FindingsTable(measured + unmeasured)

    @property
    def passed(self) -> bool:
        """The governing findings pass, and so does the tuned model's predicted vibration when there is one."""
        return self.governing.passed and (self.tuned_study is None or self.tuned_study.vibration_passed)

    @property
    def verdict_basis(self) -> str:
        """Why the field verdict is what it is, in words: which findings govern."""
        measured_failed = self.findings is not None and not self.findings.passed
        parts = []
        if self.findings is not None:
            parts.append(f"measured margins {'FAIL' if measured_failed else 'pass'} and govern the modes measured")
        if self.tuned_study is not None:
            rest = FindingsTable(tuple(f for f in self.governing if f not in tuple(self.findings or ())))
            parts.append(
                "the tuned model covers the modes and speeds not measured"
                + (f" ({'FAIL' if not rest.passed else 'pass'})" if len(rest) else " (none left)")
            )
            if not self.tuned_study.vibration_passed:
                parts.append("the tuned model's predicted vibration is outside zones A and B")
        return "; ".join(parts) or "nothing measured to judge"

    def record_data(self) -> dict[str, Any]:
        """The field verification's section of the record (JSON-ready): files, resonances, findings, tuning."""
        return {
            "coastdown_file": self.spec.coastdown.name,
            "impact_file": None if self.spec.impact is None else self.spec.impact.name,
            "resonances": [
                {
                    "speed_rpm": r.speed,
                    "amplification_factor": r.amplification_factor,
                    "phase_change_deg": r.phase_change,
                    "confirmed": r.confirmed,
                    "warnings": list(r.warnings),
                }
                for r in self.resonances
            ],
            "findings": self.findings.to_records() if self.findings else [],
            "impact_modes": [
                {"frequency_hz": p.frequency, "damping_ratio": p.damping_ratio} for p in self.impact_poles
            ],
            "tuned_factors": self.tuned.factors if self.tuned else {},
            "tuned_findings": self.tuned_study.findings.to_records() if self.tuned_study else [],
            "governing_findings": self.governing.to_records(),
            "verdict_basis": self.verdict_basis,
            "passed": self.passed,
            "summary": self.summary(),
        }

    def summary(self) -> str:
        """A few lines: resonances, measured margins, impact modes, tuning."""
        res = (
            "; ".join(
                f"{r.speed:.0f} rpm (AF {r.amplification_factor:.1f}, phase {r.phase_change:+.0f} deg"
                + (")" if r.confirmed else ", not confirmed by phase)")
                if r.amplification_factor is not None
                else f"{r.speed:.0f} rpm (no AF)"
                for r in self.resonances
            )
            or "none"
        )
        lines = [
            f"Field verdict: {'PASS' if self.passed else 'FAIL'} ({self.verdict_basis})",
            f"Coast-down resonances: {res}",
        ]
        if self.fit is not None:
            lines.append(
                "Fitted: "
                + "; ".join(
                    f"{m.speed:.0f} +/- {60 * m.frequency_std:.1f} rpm, "
                    f"zeta {m.damping_ratio:.4f} +/- {m.damping_ratio_std:.4f}"
                    for m in self.fit.modes
                )
            )
        lines.append(f"Measured margins: {self.findings.summary() if self.findings else 'no confirmed resonance'}")
        if self.impact_poles:
            lines.append(
                "Impact test modes: "
                + "; ".join(f"{p.frequency:.2f} Hz, zeta {p.damping_ratio:.4f}" for p in self.impact_poles)
                + f" ({self.consistent_poles} of {len(self.impact_poles)} stable across model orders)"
            )
        if self.tuned is not None and self.tuned_study is not None:
            lines.append(self.tuned.summary())
            lines.append(
                f"Tuned model (all its modes; where a mode was measured, the measurement governs): "
                f"{self.tuned_study.findings.summary()}"
            )
        return "\n".join(lines)


def run_field_study(
    scenario: Scenario,
    base_dir: str | os.PathLike[str] = ".",
    channel: str | None = None,
    band: tuple[float, float] | None = None,
) -> FieldStudyResult:
    """Run the field verification of a scenario (see the module notes).

    Parameters
    ----------
    scenario : Scenario
        With a ``[field]`` table.
    base_dir : path-like
        Folder the table's file names are relative to (the scenario file's folder).
    channel, band : optional
        Override the table's coast-down channel and fitting band [rpm].

    Returns
    -------
    FieldStudyResult

    Raises
    ------
    ScenarioError
        A bad ``[field]`` table, or an analysis that cannot run on the data, naming the field.
    DataFileError
        A measurement file that cannot be read, behind the scenario file and field.
    """
    spec = field_spec(scenario, base_dir)
    r = TableReader(scenario.source)

    def named(call: Callable[[], T], fields: Mapping[str, str]) -> T:
        # The analyses name their own parameters (band, channel...); the user wrote scenario fields.
        try:
            return call()
        except DataFileError:
            raise
        except InputValueError as error:
            text = str(error)
            parameter = text.split(":", 1)[0]
            field = fields.get(parameter, next(iter(fields.values())))
            raise r.fail(field, text.split(": ", 1)[1] if parameter in fields else text) from None

    def read(reader: Callable[[Path], T], path: Path, field: str) -> T:
        # The measurement file's own error (file, line, column) behind the scenario file and field that name it.
        try:
            return reader(path)
        except DataFileError as error:
            raise DataFileError(f"{scenario.source}: {field}: {error}") from None

    data = read(read_coastdown, spec.coastdown, "field.coastdown")
    channel = channel or spec.channel
    band = band or spec.band
    if channel not in data.channels:
        raise r.fail("field.channel", f"got {channel!r}; {spec.coastdown.name} has channels {sorted(data.channels)}")
    resonances = tuple(named(lambda: find_resonances(data, channel, band), {"band": "field.band"}))
    confirmed = [r for r in resonances if r.confirmed]
    fit = None
    if confirmed:
        initial = [(r.speed, 0.5 / r.amplification_factor if r.amplification_factor else 0.05) for r in confirmed]
        try:
            fit = fit_modes(data, channel, initial, band)
        except InputValueError:
            fit = None
    modes = measured_modes(resonances, fit)
    findings = measured_findings(modes, scenario.excitations, scenario.speed, scenario.rules) if modes else None
    frf: Frf | None = None
    poles: tuple[Pole, ...] = ()
    stable: tuple[Pole, ...] = ()
    if spec.impact is not None:
        record = read(read_impact, spec.impact, "field.impact")
        impact_channel = spec.impact_channel or next(iter(record.responses))
        if impact_channel not in record.responses:
            raise r.fail(
                "field.impact_channel",
                f"got {impact_channel!r}; {spec.impact.name} has response channels {sorted(record.responses)}",
            )
        impact_fields = {
            "channel": "field.impact_channel",
            "record_length": "field.record_length",
            record.source: "field.record_length",
        }
        frf = named(lambda: impact_frf(record, impact_channel, spec.record_length), impact_fields)
        band_fields = {"band": "field.impact_band", "modes": "field.impact_modes"}
        poles = tuple(named(lambda: rfp_fit(frf, spec.impact_band, spec.impact_modes), band_fields))
        # Consistency across model orders (a stability diagram up to two orders above the one used).
        _, stable_list = named(
            lambda: stability_diagram(frf, spec.impact_band, spec.impact_modes + 2, damping_tol=0.2), band_fields
        )
        stable = tuple(stable_list)
    tuned = tuned_study = None
    if spec.tune:
        measured = [p.frequency for p in poles] if poles else [m.frequency for m in modes]
        if measured:
            tuned = named(lambda: tune_model(scenario.model, measured, spec.tune), {"parameters": "field.tune"})
            tuned_study = run_study(scenario.replace(model=tuned.model))
    return FieldStudyResult(spec, data, resonances, fit, findings, frf, poles, stable, tuned, tuned_study)
