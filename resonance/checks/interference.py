"""The interference check: every mode against every excitation over the speed range.

For each mode and each excitation the check finds where they coincide (the
running speed at which an order line meets the natural frequency, or the
fixed excitation frequency), measures the separation margin from the speeds
of continuous operation, takes the margin rule that governs that pair of mode
kind and excitation kind (:mod:`resonance.checks.rules`), asks it what it requires
for the mode's amplification factor, and gives a verdict: ``PASS``, ``FAIL``,
or ``EXEMPT`` where the rule requires no margin at this AF (the API
``AF < 2.5`` exemption). The findings come back in a :class:`FindingsTable`,
worst first, that renders the same way as text, JSON and HTML.
"""

from __future__ import annotations

import dataclasses
import html
import json
import math
from collections.abc import Iterator, Sequence
from dataclasses import dataclass
from typing import Literal

import numpy as np

from ..core.errors import InputTypeError, InputValueError
from ..core.units import UnitSystem, display_unit
from ..dynamics.modes import Mode
from .excitations import Excitation
from .margins import ApiLateralRule, Location, MarginRule, Side, range_margin, range_margins
from .rules import RuleSet, as_rule_set, is_flat
from .speed_range import OperatingRange

Verdict = Literal["PASS", "FAIL", "EXEMPT"]

__all__ = ["Finding", "FindingsTable", "interference_check", "judge_damped", "verdict_line", "verdict_of"]


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
        The side whose requirement applies (a flat rule is the same on both).
    rule, rule_source : str
        The name of the rule actually applied to this pair and the standard or
        practice it comes from.
    scope : str
        The pair in words (``"structural mode against 1x"``) and why the rule
        was chosen for it.
    margin_rule : MarginRule or None
        The rule object itself (for the keep-clear bands of the plots).
    damped : str
        Where the heavily damped rule (:class:`~resonance.checks.rules.DampedModeRule`) exempts the mode from the
        margin: the criterion in words (AF, its source, the rule); empty otherwise.
    amplitude : str
        The amplitude criterion as evaluated by the study (predicted vibration, where, the limit); empty
        until a study judges it (:func:`judge_damped`).
    amplitude_passed : bool or None
        The amplitude criterion's result; None until judged.
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
    scope: str = ""
    margin_rule: MarginRule | None = None
    damped: str = ""
    amplitude: str = ""
    amplitude_passed: bool | None = None

    @property
    def exempt(self) -> bool:
        """True when no margin is required: the API ``AF < 2.5`` exemption, or a heavily damped mode."""
        return self.required_margin == 0.0

    @property
    def exemption(self) -> str | None:
        """The exemption used, in words (with the amplitude criterion and its values where judged), or None."""
        if not self.exempt:
            return None
        if self.damped:
            return f"{self.damped}; {self.amplitude or 'the amplitude criterion is not evaluated here'}"
        af = self.mode.amplification_factor
        why = " (below 2.5: critically damped)" if isinstance(self.margin_rule, ApiLateralRule) else ""
        return f"{self.rule} requires no separation margin for AF {af:.2f}{why}"

    @property
    def passed(self) -> bool:
        """True when the margin meets the requirement (an exemption passes, unless its amplitude fails)."""
        if self.exempt:
            return self.amplitude_passed is not False
        return self.margin >= self.required_margin

    @property
    def verdict(self) -> Verdict:
        """``"PASS"``, ``"FAIL"`` or ``"EXEMPT"`` (no margin required by the rule's exemption)."""
        if self.exempt:
            return "EXEMPT" if self.passed else "FAIL"
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
            "amplification_factor_source": self.mode.af_source,
            "mode_kind": self.mode.kind,
            "excitation": self.excitation.label,
            "excitation_kind": self.excitation.kind,
            "excitation_order": self.excitation.order,
            "excitation_frequency_hz": self.excitation.frequency,
            "coincidence_speed_rpm": self.coincidence_speed,
            "location": self.location,
            "margin_percent": self.margin,
            "required_margin_percent": self.required_margin,
            "side": self.side,
            "rule": self.rule,
            "rule_source": self.rule_source,
            "rule_scope": self.scope,
            "exemption": self.exemption,
            "amplitude_criterion": self.amplitude or None,
            "amplitude_passed": self.amplitude_passed,
            "verdict": self.verdict,
        }


def _columns(system: UnitSystem) -> tuple[str, ...]:
    unit = display_unit("frequency", system)[0]
    return (
        "mode",
        f"f_n [{unit}]",
        "AF",
        "excitation",
        "coincidence [rpm]",
        "where",
        "SM [%]",
        "req. [%]",
        "rule",
        "verdict",
    )


@dataclass(frozen=True)
class FindingsTable:
    """Findings sorted worst first (largest shortfall of margin first).

    Iterating gives the findings; ``len`` counts them.

    Attributes
    ----------
    findings : tuple of Finding
        Sorted on construction: failures (largest shortfall first), exemptions (inside the range first),
        passes.
    """

    findings: tuple[Finding, ...]

    def __post_init__(self) -> None:
        # The table keeps its promise whoever builds it: failures first (largest shortfall first),
        # then exemptions (inside the range first), then passes by smallest margin to spare.
        def rank(f: Finding) -> tuple[int, float]:
            if not f.passed:
                return (0, -f.shortfall)
            if f.exempt:
                return (1 if f.location == "inside" else 2, f.margin)
            return (3, -f.shortfall)

        object.__setattr__(self, "findings", tuple(sorted(self.findings, key=rank)))

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

    @property
    def exemptions(self) -> tuple[Finding, ...]:
        """The findings that pass by an exemption, those inside the operating range first."""
        return tuple(f for f in self.findings if f.exempt)

    @property
    def exempt_inside(self) -> tuple[Finding, ...]:
        """Exempt coincidences inside the operating range: never a plain PASS."""
        return tuple(f for f in self.findings if f.exempt and f.location == "inside")

    @property
    def verdict(self) -> str:
        """``"FAIL"``, ``"PASS WITH EXEMPTION"`` (an exempt coincidence inside the range) or ``"PASS"``."""
        if not self.passed:
            return "FAIL"
        return "PASS WITH EXEMPTION" if self.exempt_inside else "PASS"

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
                    "amplitude (heavily damped)" if f.damped else f.rule,
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
        """One line: how many checks, how many fail, the worst, and any exemption used."""
        failures = self.failures
        if not self.findings:
            return "no checks"
        exempt = self.exemptions
        note = ""
        if exempt:
            first = exempt[0]
            where = "inside the operating range" if first.location == "inside" else f"{first.location} the range"
            note = (
                f"; {len(exempt)} by exemption, e.g. {first.mode.label} x {first.excitation.label} {where}: "
                f"{first.exemption}"
            )
        if not failures:
            met = len(self) - len(exempt)
            return f"{self.verdict}: {met} of {len(self)} checks meet the required margin{note}"
        worst = failures[0]
        if worst.exempt:  # a heavily damped mode whose amplitude fails
            return (
                f"FAIL: {len(failures)} of {len(self)} checks fail; worst {worst.mode.label} x "
                f"{worst.excitation.label}: {worst.exemption}{note}"
            )
        # Enough digits that a shortfall never reads "15.0 % < 15.0 %".
        digits = next((d for d in (1, 2, 3) if round(worst.margin, d) < round(worst.required_margin, d)), 4)
        return (
            f"FAIL: {len(failures)} of {len(self)} checks short of the required margin; worst "
            f"{worst.mode.label} x {worst.excitation.label}: SM {worst.margin:.{digits}f} % < "
            f"{worst.required_margin:.{digits}f} % ({worst.rule}){note}"
        )

    def rules_used(self) -> list[str]:
        """Each rule applied, once, with the pairs it was applied to (for the record's methods)."""
        out: dict[str, set[str]] = {}
        damped: set[str] = set()
        for f in self.findings:
            out.setdefault(f"{f.rule} ({f.rule_source})", set()).add(f.scope.split(":")[0])
            if f.damped:
                damped.add(f.damped.split(": ", 1)[-1])
        lines = [f"{rule}: applied to {', '.join(sorted(scopes))}" for rule, scopes in out.items()]
        return lines + [f"heavily damped modes {rule}" for rule in sorted(damped)]

    def af_sources(self) -> list[str]:
        """Where the AF of each mode checked came from, once per source (for the record's methods)."""
        return sorted({f"{f.mode.af_source} ({f.mode.kind} modes)" for f in self.findings})

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


def _mode_findings(
    mode: Mode, excitations: Sequence[Excitation], speed_range: OperatingRange, rules: RuleSet
) -> list[Finding]:
    # One mode against every excitation: the AF once, the order excitations' margins in one vectorized call.
    af = mode.amplification_factor
    follow = [e for e in excitations if e.order is not None]
    by_source: dict[int, tuple[float, float, Location, Side]] = {}
    if follow:
        speeds = np.array([float(e.coincidence_speeds(np.array(mode.frequency))) for e in follow])
        lows, highs = np.array(speed_range.intervals, dtype=float).T
        margins, locations, above = range_margins(speeds, lows, highs)
        words: tuple[Location, ...] = ("below", "inside", "above")
        for e, n, m, loc, up in zip(follow, speeds, margins, locations, above, strict=True):
            by_source[id(e)] = (float(n), float(m), words[int(loc) + 1], "above" if bool(up) else "below")
    required: dict[tuple[int, str], float] = {}  # one rule at one side asks the same of one mode
    return [_finding(mode, e, speed_range, rules, af, by_source.get(id(e)), required) for e in excitations]


def _finding(
    mode: Mode,
    excitation: Excitation,
    speed_range: OperatingRange,
    rules: RuleSet,
    af: float | None = None,
    order_margin: tuple[float, float, Location, Side] | None = None,
    cache: dict[tuple[int, str], float] | None = None,
) -> Finding:
    af = mode.amplification_factor if af is None else af
    scoped = rules.rule_for(mode.kind, excitation.kind)  # type: ignore[arg-type]
    rule = scoped.rule
    if excitation.order is not None:
        # For an order n the speed margin equals the frequency margin of f_n from the band n N / 60 sweeps; a
        # source whose frequency follows a law (a slip that follows the load) is judged by its coincidence speed.
        if order_margin is None:
            speed = float(excitation.coincidence_speeds(np.array(mode.frequency)))
            margin, location, side = range_margin(speed, speed_range)
        else:
            speed, margin, location, side = order_margin
        coincidence: float | None = speed
    else:
        fe = float(excitation.frequency)  # type: ignore[arg-type]
        margin = 100.0 * abs(mode.frequency - fe) / fe
        side = "below" if mode.frequency < fe else "above"
        location = "inside" if margin == 0.0 else side
        coincidence = None
    key = (id(rule), side)
    if cache is not None and key in cache:
        required = cache[key]
    else:
        required = rule.required(max(af, 1.0), side)
        if cache is not None:
            cache[key] = required
    margin_words = "flat margin in frequency, both sides" if is_flat(rule) else f"margin from the AF ({mode.af_source})"
    damped = ""
    if scoped.damped is not None and af < scoped.damped.af_below and margin < required:
        # Only where separation falls short: a heavily damped mode that meets the margin simply passes.
        required = 0.0
        damped = (
            f"heavily damped (AF {af:.2f} < {scoped.damped.af_below:g}, {mode.af_source}): judged by the predicted "
            f"vibration against the limit, not by separation ({scoped.damped.source})"
        )
    return Finding(
        mode,
        excitation,
        coincidence,
        location,
        margin,
        required,
        side,
        rule.name,
        rule.source,
        f"{scoped.scope}: {scoped.basis}; {margin_words}",
        rule,
        damped,
    )


def judge_damped(findings: FindingsTable, amplitude: str, passed: bool) -> FindingsTable:
    """The findings with each heavily damped exemption judged by the study's amplitude criterion.

    Parameters
    ----------
    findings : FindingsTable
        From :func:`interference_check` with a rule set whose ``damped`` rule applied.
    amplitude : str
        The criterion as evaluated, in words with its values (``"predicted 1x 1.9 mm/s RMS at ..., limit
        2.8 mm/s (zone B/C boundary)"``).
    passed : bool
        Whether the predicted vibration meets the limit.

    Returns
    -------
    FindingsTable
        The same findings, the heavily damped ones carrying ``amplitude`` and failing where it fails.

    Raises
    ------
    Nothing
        Pure data.
    """
    return FindingsTable(
        tuple(dataclasses.replace(f, amplitude=amplitude, amplitude_passed=passed) if f.damped else f for f in findings)
    )


def interference_check(
    modes: Sequence[Mode],
    excitations: Sequence[Excitation],
    speed_range: OperatingRange,
    rules: RuleSet | MarginRule | None = None,
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
    rules : RuleSet or MarginRule, optional
        Which rule governs which pair (see :class:`resonance.checks.rules.RuleSet`).
        A single flat rule applies to every pair; any other single rule (the
        API lateral rule, a table) governs rotor lateral modes against 1x only.
        Omitted: the API lateral rule there and no flat margin, so structural
        modes or other excitations raise an error asking for one.

    Returns
    -------
    FindingsTable
        One finding per mode and excitation, worst first.

    Raises
    ------
    InputValueError
        No modes or excitations, or a pair that needs a flat margin when none
        was given.
    InputTypeError
        A mode, excitation or speed range of the wrong type.

    Notes
    -----
    For an order ``n`` the coincidence speed is ``N_c = 60 f_n / n`` rpm and
    the margin is the separation margin of ``N_c`` from the allowed speeds,
    which equals the frequency separation of the mode from the band the order
    sweeps, ``100 (f_lo - f_n) / f_lo`` below it and ``100 (f_n - f_hi) / f_hi``
    above it. For a fixed source at ``f_e`` the margin is
    ``100 |f_n - f_e| / f_e``. Under the API lateral rule (rotor lateral modes
    against 1x only) a mode with ``AF < 2.5`` needs no margin: the finding is
    ``EXEMPT``, and an exempt coincidence inside the range makes the table's
    verdict ``PASS WITH EXEMPTION``.

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
                raise InputTypeError(f"{name}[{i}]: got {type(item).__name__}; expected {kind.__name__}")
    if not isinstance(speed_range, OperatingRange):
        raise InputTypeError(
            f"speed_range: got {type(speed_range).__name__}; expected an OperatingRange "
            "(build one with resonance.operating_range)"
        )
    rule_set = as_rule_set(rules)
    return FindingsTable(tuple(f for m in modes for f in _mode_findings(m, excitations, speed_range, rule_set)))


def verdict_of(passed: bool, findings: FindingsTable) -> str:
    """The verdict of a study: ``"FAIL"``, or the findings' verdict (``"PASS"`` or ``"PASS WITH EXEMPTION"``).

    Parameters
    ----------
    passed : bool
        Whether every check of the study passed (margins and the rest).
    findings : FindingsTable
        The margin findings.

    Returns
    -------
    str
        ``"FAIL"``, ``"PASS WITH EXEMPTION"`` or ``"PASS"``.

    Raises
    ------
    Nothing
        Pure text.
    """
    return findings.verdict if passed else "FAIL"


def verdict_line(verdict: str, findings: FindingsTable, heading: str = "Verdict") -> str:
    """``Verdict: ...``: what governs a failing verdict, and every exempt coincidence inside the operating range.

    Parameters
    ----------
    verdict : str
        The study's verdict.
    findings : FindingsTable
        The margin findings (their exempt coincidences inside the range are named).
    heading : str
        The word before the colon (``"VERDICT"`` in the text records).

    Returns
    -------
    str
        One line starting ``Verdict:`` (or the ``heading`` given).

    Raises
    ------
    Nothing
        Pure text.
    """
    exempt = findings.exempt_inside
    failing = [f for f in findings if not f.passed]
    names = "; ".join(
        f"{f.mode.label} x {f.excitation.label} inside the operating range, exempt: {f.exemption}" for f in exempt
    )
    if not exempt:
        return f"{heading}: {verdict}"
    if verdict != "FAIL" or not failing:
        return f"{heading}: {verdict} ({names})"
    # A failing verdict with exemptions names what fails first, so the exemptions do not read as its cause; the
    # exempt pairs are named only (each one's reason is in its finding).
    worst = f"{failing[0].mode.label} x {failing[0].excitation.label}"
    pairs = "; ".join(f"{f.mode.label} x {f.excitation.label}" for f in exempt)
    count = f"{len(exempt)} exempt coincidence{'s' if len(exempt) > 1 else ''} inside the operating range"
    return f"{heading}: FAIL (governed by {worst}; {count}, not the cause, reasons in the findings: {pairs})"
