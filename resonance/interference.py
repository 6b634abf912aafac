"""The interference check: every mode against every excitation over the speed range.

For each mode and each excitation the check finds where they coincide (the
running speed at which an order line meets the natural frequency, or the
fixed excitation frequency), measures the separation margin from the speeds
of continuous operation, asks the margin rule what it requires for the mode's
amplification factor, and gives a verdict. The findings come back in a
:class:`FindingsTable`, worst first, that renders the same way as text, JSON
and HTML.
"""

from __future__ import annotations

import html
import json
import math
from collections.abc import Iterator, Sequence
from dataclasses import dataclass

from .errors import InputValueError
from .excitations import Excitation
from .margins import ApiLateralRule, Location, MarginRule, Side, range_margin
from .modes import Mode
from .speed_range import OperatingRange
from .units import UnitSystem, display_unit

__all__ = ["Finding", "FindingsTable", "interference_check"]


@dataclass(frozen=True)
class Finding:
    """One mode against one excitation.

    Attributes
    ----------
    mode : Mode
        The mode checked.
    excitation : Excitation
        The excitation checked.
    coincidence_speed : float or None
        Running speed [rpm] at which the excitation meets the mode's natural
        frequency; None for a fixed-frequency source.
    location : {"below", "inside", "above"}
        Where the coincidence lies relative to the speeds of continuous
        operation (for a fixed source: the mode relative to its frequency).
    margin : float
        Actual separation margin [percent]; negative inside the range.
    required_margin : float
        Margin the rule requires [percent].
    side : {"below", "above"}
        The side whose requirement applies.
    rule, rule_source : str
        The rule's name and the standard or practice it comes from.
    """

    mode: Mode
    excitation: Excitation
    coincidence_speed: float | None
    location: Location
    margin: float
    required_margin: float
    side: Side
    rule: str
    rule_source: str

    @property
    def passed(self) -> bool:
        """True when the margin meets the requirement (none required passes)."""
        return self.required_margin == 0.0 or self.margin >= self.required_margin

    @property
    def verdict(self) -> str:
        """``"PASS"`` or ``"FAIL"``."""
        return "PASS" if self.passed else "FAIL"

    @property
    def shortfall(self) -> float:
        """Required minus actual margin [percent points]; positive falls short."""
        return self.required_margin - self.margin

    def as_record(self) -> dict[str, object]:
        """The finding as plain JSON-ready values (SI; speeds in rpm)."""
        af = self.mode.amplification_factor
        return {
            "mode": self.mode.label,
            "mode_source": self.mode.source,
            "natural_frequency_hz": self.mode.frequency,
            "damping_ratio": self.mode.damping_ratio,
            "amplification_factor": af if math.isfinite(af) else None,
            "excitation": self.excitation.label,
            "excitation_order": self.excitation.order,
            "excitation_frequency_hz": self.excitation.frequency,
            "coincidence_speed_rpm": self.coincidence_speed,
            "location": self.location,
            "margin_percent": self.margin,
            "required_margin_percent": self.required_margin,
            "side": self.side,
            "rule": self.rule,
            "rule_source": self.rule_source,
            "verdict": self.verdict,
        }


def _columns(system: UnitSystem) -> tuple[str, ...]:
    unit = display_unit("frequency", system)[0]
    return ("mode", f"f_n [{unit}]", "AF", "excitation", "coincidence [rpm]", "where", "SM [%]", "req. [%]", "verdict")


@dataclass(frozen=True)
class FindingsTable:
    """Findings sorted worst first (largest shortfall of margin first).

    Iterating gives the findings; ``len`` counts them.
    """

    findings: tuple[Finding, ...]

    def __post_init__(self) -> None:
        # The table keeps its promise whoever builds it: failures first, largest shortfall first.
        ordered = tuple(sorted(self.findings, key=lambda f: (f.passed, -f.shortfall)))
        object.__setattr__(self, "findings", ordered)

    @classmethod
    def combine(cls, tables: Sequence[FindingsTable]) -> FindingsTable:
        """One table of the findings of several, worst first."""
        return cls(tuple(f for table in tables for f in table))

    def __iter__(self) -> Iterator[Finding]:
        return iter(self.findings)

    def __len__(self) -> int:
        return len(self.findings)

    def __getitem__(self, index: int) -> Finding:
        return self.findings[index]

    @property
    def passed(self) -> bool:
        """True when every finding passes."""
        return all(f.passed for f in self.findings)

    @property
    def failures(self) -> tuple[Finding, ...]:
        """The failing findings, worst first."""
        return tuple(f for f in self.findings if not f.passed)

    def rows(self, precision: int = 1, system: UnitSystem = "SI") -> list[tuple[str, ...]]:
        """Rows of display strings, one per finding, in the column order of :meth:`to_text`.

        Frequencies are in Hz (SI) or cpm (US); speeds in rpm; margins in percent.
        """
        factor = display_unit("frequency", system)[1]
        digits = precision + 1 if system == "SI" else 0
        out: list[tuple[str, ...]] = []
        for f in self.findings:
            af = f.mode.amplification_factor
            out.append(
                (
                    f.mode.label,
                    f"{f.mode.frequency * factor:.{digits}f}",
                    "inf" if math.isinf(af) else f"{af:.{precision}f}",
                    f.excitation.label,
                    "-" if f.coincidence_speed is None else f"{f.coincidence_speed:.0f}",
                    f.location,
                    f"{f.margin:.{precision}f}",
                    f"{f.required_margin:.{precision}f}",
                    f.verdict,
                )
            )
        return out

    def to_text(self, precision: int = 1, system: UnitSystem = "SI") -> str:
        """A fixed-width text table, worst first, and a summary line."""
        columns = _columns(system)
        rows = [columns, *self.rows(precision, system)]
        widths = [max(len(r[c]) for r in rows) for c in range(len(columns))]
        lines = ["  ".join(cell.ljust(w) for cell, w in zip(row, widths, strict=True)).rstrip() for row in rows]
        lines.insert(1, "  ".join("-" * w for w in widths))
        lines.append(self.summary())
        return "\n".join(lines)

    def summary(self) -> str:
        """One line: how many checks, how many fail, the worst."""
        failures = self.failures
        if not self.findings:
            return "no checks"
        if not failures:
            return f"PASS: all {len(self)} checks meet the required margin"
        worst = failures[0]
        return (
            f"FAIL: {len(failures)} of {len(self)} checks short of the required margin; worst "
            f"{worst.mode.label} x {worst.excitation.label}: SM {worst.margin:.1f} % < "
            f"{worst.required_margin:.1f} % ({worst.rule})"
        )

    def to_records(self) -> list[dict[str, object]]:
        """The findings as a list of plain dicts (see :meth:`Finding.as_record`)."""
        return [f.as_record() for f in self.findings]

    def to_json(self) -> str:
        """JSON text of :meth:`to_records`."""
        return json.dumps(self.to_records(), indent=2)

    def to_html(self, precision: int = 1, system: UnitSystem = "SI") -> str:
        """An HTML table (no styles beyond a class per verdict)."""
        head = "".join(f"<th>{html.escape(c)}</th>" for c in _columns(system))
        body = []
        for f, row in zip(self.findings, self.rows(precision, system), strict=True):
            cells = "".join(f"<td>{html.escape(c)}</td>" for c in row)
            body.append(f'<tr class="{f.verdict.lower()}">{cells}</tr>')
        return (
            f'<table class="findings"><thead><tr>{head}</tr></thead>'
            f"<tbody>{''.join(body)}</tbody></table><p>{html.escape(self.summary())}</p>"
        )


def _finding(mode: Mode, excitation: Excitation, speed_range: OperatingRange, rule: MarginRule) -> Finding:
    af = mode.amplification_factor
    if excitation.order is not None:
        speed = 60.0 * mode.frequency / excitation.order
        margin, location, side = range_margin(speed, speed_range)
        coincidence: float | None = speed
    else:
        fe = float(excitation.frequency)  # type: ignore[arg-type]
        margin = 100.0 * abs(mode.frequency - fe) / fe
        side = "below" if mode.frequency < fe else "above"
        location = "inside" if margin == 0.0 else side
        coincidence = None
    required = rule.required(max(af, 1.0), side)
    return Finding(mode, excitation, coincidence, location, margin, required, side, rule.name, rule.source)


def interference_check(
    modes: Sequence[Mode],
    excitations: Sequence[Excitation],
    speed_range: OperatingRange,
    rule: MarginRule | None = None,
) -> FindingsTable:
    """Check every mode against every excitation across the operating range.

    Parameters
    ----------
    modes : sequence of Mode
        Natural frequencies with damping (or a known AF).
    excitations : sequence of Excitation
        Orders of running speed and fixed-frequency sources.
    speed_range : OperatingRange
        Speeds of continuous operation (see :func:`resonance.operating_range`).
    rule : MarginRule, optional
        The required-margin rule; the API lateral rule if omitted.

    Returns
    -------
    FindingsTable
        One finding per mode and excitation, worst first.

    Notes
    -----
    For an order ``n`` the coincidence speed is ``N_c = 60 f_n / n`` rpm and
    the margin is the separation margin of ``N_c`` from the allowed speeds,
    which equals the frequency separation of the mode from the band the order
    sweeps. For a fixed source at ``f_e`` the margin is
    ``100 |f_n - f_e| / f_e``. A mode with ``AF < 2.5`` under the API rule
    needs no margin (critically damped) and passes.

    References
    ----------
    API RP 684, 2nd ed., 2005; API Std 617, 8th ed., 2014 (from memory).
    """
    if not modes:
        raise InputValueError("modes: got none; expected at least one mode to check")
    if not excitations:
        raise InputValueError("excitations: got none; expected at least one excitation")
    for name, items, kind in (("modes", modes, Mode), ("excitations", excitations, Excitation)):
        for i, item in enumerate(items):
            if not isinstance(item, kind):
                raise TypeError(f"{name}[{i}]: got {type(item).__name__}; expected {kind.__name__}")
    if not isinstance(speed_range, OperatingRange):
        raise TypeError(
            f"speed_range: got {type(speed_range).__name__}; expected an OperatingRange "
            "(build one with resonance.operating_range)"
        )
    rule = rule if rule is not None else ApiLateralRule()
    return FindingsTable(tuple(_finding(m, e, speed_range, rule) for m in modes for e in excitations))
