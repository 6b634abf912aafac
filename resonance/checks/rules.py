"""Which margin rule applies to which pair of mode and excitation: every rule within its scope.

A margin rule is written for a purpose, and the trade applies it only there:

* the amplification-factor rule of API 617 / API RP 684 (with its exemption
  for ``AF < 2.5``) governs the **lateral critical speeds of a rotor against
  its running speed (1x)**;
* supports, foundations and structures, every other order of running speed
  (2x, blade or vane pass, gear mesh), the motor's electrical frequencies and
  fixed-frequency sources are kept a **flat** margin away, the same on both
  sides and taken in frequency (10 to 20 % is common practice, with no single
  source: the scenario gives the value);
* torsional natural frequencies are kept at least 10 % from every excitation
  in the operating range (API Std 617 / API RP 684, from memory).

A :class:`RuleSet` holds these choices, with per-pair overrides; a rule that
depends on the amplification factor is refused for any pair outside its scope.

References
----------
.. [1] API Std 617, *Axial and Centrifugal Compressors and Expander-compressors*,
   8th ed., 2014, sec. 2.6 (lateral and torsional analyses; from memory).
.. [2] API RP 684, *Rotordynamic Tutorial*, 2nd ed., 2005 (from memory).
"""

from __future__ import annotations

from collections.abc import Iterable
from dataclasses import dataclass, field

from ..core.errors import InputTypeError, InputValueError
from ..dynamics.modes import MODE_KINDS, ModeKind
from .excitations import EXCITATION_KINDS, ExcitationKind
from .margins import ApiLateralRule, FlatRule, MarginRule

__all__ = ["TORSIONAL_RULE", "DampedModeRule", "RuleSet", "ScopedRule", "as_rule_set", "is_flat", "scope_words"]

#: The torsional separation rule: 10 % from every excitation (API Std 617 / RP 684, from memory).
TORSIONAL_RULE = FlatRule(10.0, name="torsional 10 %", source="API Std 617 8th ed. / API RP 684 2nd ed. (from memory)")

_MODE_WORDS = {"rotor-lateral": "rotor lateral mode", "structural": "structural mode", "torsional": "torsional mode"}
_EXCITATION_WORDS = {
    "synchronous": "1x",
    "order": "another order of running speed",
    "electrical": "an electrical frequency",
    "fixed": "a fixed-frequency source",
}


def is_flat(rule: MarginRule) -> bool:
    """True for a rule that requires the same margin whatever the damping and side (a flat rule).

    Parameters
    ----------
    rule : MarginRule
        Any margin rule.

    Returns
    -------
    bool
        True for a :class:`~resonance.checks.margins.FlatRule`.

    Raises
    ------
    Nothing
        Any object is answered.
    """
    return isinstance(rule, FlatRule)


def scope_words(mode_kind: ModeKind, excitation_kind: ExcitationKind) -> str:
    """The pair in words, e.g. ``"structural mode against 1x"``.

    Parameters
    ----------
    mode_kind : {"rotor-lateral", "structural", "torsional"}
        The mode's kind.
    excitation_kind : {"synchronous", "order", "electrical", "fixed"}
        The excitation's kind.

    Returns
    -------
    str
        The pair in words.

    Raises
    ------
    KeyError
        A kind that is not one of the above (the callers check kinds first).

    Examples
    --------
    >>> scope_words("rotor-lateral", "synchronous")
    'rotor lateral mode against 1x'
    """
    return f"{_MODE_WORDS[mode_kind]} against {_EXCITATION_WORDS[excitation_kind]}"


@dataclass(frozen=True)
class DampedModeRule:
    """Heavily damped modes are judged by the predicted vibration, not by separation.

    A structural mode whose amplification factor is below ``af_below`` does not amplify: a block on soil
    with radiation damping of 0.2 to 0.7 of critical is the usual case. The trade judges such a mode by the
    predicted amplitude at the machine against the vibration limit (common practice; ACI 351.3R discusses
    both criteria, from memory), as API RP 684 asks no separation margin of a rotor mode with AF < 2.5
    (from memory). Where such a mode falls short of the separation margin, its finding is ``EXEMPT`` from it
    and carries the amplitude criterion (a mode that meets the margin simply passes); a study that cannot
    evaluate the amplitude must not use this rule, and a failing amplitude fails the finding.

    Attributes
    ----------
    af_below : float
        The AF under which a mode is judged by amplitude [-] (2.5, after API RP 684's critically damped).
    kinds : tuple of str
        The mode kinds it applies to (structural modes only by default).
    source : str
        Where the rule comes from, for the record.
    """

    af_below: float = 2.5
    kinds: tuple[ModeKind, ...] = ("structural",)
    source: str = "common practice; ACI 351.3R and API RP 684's AF < 2.5 (from memory)"

    def __post_init__(self) -> None:
        if not (isinstance(self.af_below, (int, float)) and 1.0 < self.af_below <= 10.0):
            raise InputValueError(
                f"af_below: got {self.af_below!r}; expected an amplification factor above 1, up to 10"
            )
        for kind in self.kinds:
            if kind not in MODE_KINDS:
                raise InputValueError(f"kinds: got {kind!r}; expected mode kinds from {MODE_KINDS}")

    @property
    def description(self) -> str:
        """The rule and its scope in words."""
        kinds = ", ".join(f"{k} modes" for k in self.kinds)
        return (
            f"{kinds} with AF below {self.af_below:g}: judged by the predicted vibration against the limit, not by "
            f"separation ({self.source})"
        )


@dataclass(frozen=True)
class ScopedRule:
    """The rule chosen for one pair, and why.

    Attributes
    ----------
    rule : MarginRule
        The rule applied.
    scope : str
        The pair it was chosen for, in words.
    basis : str
        Why this rule: the default for the pair, or the scenario's override.
    damped : DampedModeRule or None
        The heavily damped rule where it may apply to the pair (not where the pair has an override).
    clause : str
        Which clause of the rule set chose it (``"lateral"``, ``"flat"``, ``"torsional"`` or
        ``"override:<mode kind>:<excitation kind>"``): the same rule object may stand in two clauses.
    """

    rule: MarginRule
    scope: str
    basis: str
    damped: DampedModeRule | None = None
    clause: str = ""


@dataclass(frozen=True)
class RuleSet:
    """The margin rule for every pair of mode kind and excitation kind.

    Attributes
    ----------
    lateral_1x : MarginRule
        Rotor lateral modes against 1x: the API lateral rule unless chosen
        otherwise (a flat rule or a table of required margin against AF).
    flat : FlatRule or None
        Every other pair of a rotor lateral or structural mode: structural
        modes against every excitation, rotor modes against other orders,
        electrical and fixed sources. None when the scenario gives none; a
        check that needs it then fails naming the missing value.
    torsional : FlatRule
        Torsional modes against every excitation (10 %, API 617, from memory).
    overrides : tuple of (mode kind, excitation kind, MarginRule)
        Pairs with a rule of their own; rules that depend on the AF are
        allowed only for rotor lateral modes against 1x. An override also
        keeps the heavily damped rule off its pair.
    damped : DampedModeRule or None
        Heavily damped modes judged by amplitude (None: every mode by separation). Only a study that
        evaluates the predicted vibration sets it (supports and supports in space).

    Examples
    --------
    >>> rules = RuleSet(flat=FlatRule(15.0))
    >>> rules.rule_for("structural", "synchronous").rule.name
    'flat 15 %'
    >>> rules.rule_for("rotor-lateral", "synchronous").rule.name
    'API lateral'
    """

    lateral_1x: MarginRule = field(default_factory=ApiLateralRule)
    flat: FlatRule | None = None
    torsional: FlatRule = TORSIONAL_RULE
    overrides: tuple[tuple[ModeKind, ExcitationKind, MarginRule], ...] = ()
    damped: DampedModeRule | None = None

    def __post_init__(self) -> None:
        if self.damped is not None and not isinstance(self.damped, DampedModeRule):
            raise InputTypeError(f"damped: got {type(self.damped).__name__}; expected a DampedModeRule or None")
        if self.flat is not None and not is_flat(self.flat):
            raise InputTypeError(f"flat: got {type(self.flat).__name__}; expected a FlatRule (a percentage)")
        if not is_flat(self.torsional):
            raise InputTypeError(f"torsional: got {type(self.torsional).__name__}; expected a FlatRule")
        for i, (mode_kind, excitation_kind, rule) in enumerate(self.overrides):
            if mode_kind not in MODE_KINDS:
                raise InputValueError(f"overrides[{i}]: mode kind {mode_kind!r}; expected one of {MODE_KINDS}")
            if excitation_kind not in EXCITATION_KINDS:
                raise InputValueError(
                    f"overrides[{i}]: excitation kind {excitation_kind!r}; expected one of {EXCITATION_KINDS}"
                )
            if not is_flat(rule) and (mode_kind, excitation_kind) != ("rotor-lateral", "synchronous"):
                raise InputValueError(
                    f"overrides[{i}]: {rule.name!r} depends on the amplification factor, which the trade applies "
                    f"only to rotor lateral modes against 1x, not to a {scope_words(mode_kind, excitation_kind)}; "
                    "expected a flat percentage"
                )

    def rule_for(self, mode_kind: ModeKind, excitation_kind: ExcitationKind) -> ScopedRule:
        """The rule for one pair, with its scope and basis.

        Raises
        ------
        InputValueError
            The pair needs the flat margin and none was given.
        """
        scope = scope_words(mode_kind, excitation_kind)
        for m, e, rule in self.overrides:
            if (m, e) == (mode_kind, excitation_kind):
                return ScopedRule(rule, scope, "override for this pair", clause=f"override:{m}:{e}")
        damped = self.damped if self.damped is not None and mode_kind in self.damped.kinds else None
        if mode_kind == "torsional":
            return ScopedRule(self.torsional, scope, "torsional rule", damped, "torsional")
        if (mode_kind, excitation_kind) == ("rotor-lateral", "synchronous"):
            return ScopedRule(self.lateral_1x, scope, "rotor lateral rule at 1x", damped, "lateral")
        if self.flat is None:
            raise InputValueError(
                f"flat: missing; a {scope} needs a flat separation margin in percent "
                "(10 to 20 % is common practice, no single source): give margin.flat in the scenario"
            )
        return ScopedRule(self.flat, scope, "flat margin, in frequency, the same on both sides", damped, "flat")

    @property
    def description(self) -> str:
        """The rules in words, one clause per scope."""
        return "; ".join(text for text, _ in self._clauses())

    def applied_description(self, pairs: Iterable[tuple[ModeKind, ExcitationKind]]) -> str:
        """The rules in words, only the clauses whose scope holds one of the pairs checked.

        Parameters
        ----------
        pairs : iterable of (mode kind, excitation kind)
            The pairs a study checked (one per finding).

        Returns
        -------
        str
            One clause per rule applied, as :attr:`description` words them; ``"none applied (no mode met an
            excitation to check)"`` when there is no pair.

        Raises
        ------
        InputValueError
            A pair that needs the flat margin when none was given.
        """
        used = [self.rule_for(m, e) for m, e in set(pairs)]
        clauses = {s.clause for s in used} | ({"damped"} if any(s.damped is not None for s in used) else set())
        parts = [text for text, clause in self._clauses() if clause in clauses]
        return "; ".join(parts) or "none applied (no mode met an excitation to check)"

    def _clauses(self) -> list[tuple[str, str]]:
        # (words, the clause key rule_for gives), in the order the record lists them.
        parts = [(f"rotor lateral modes against 1x: {self.lateral_1x.name} ({self.lateral_1x.source})", "lateral")]
        if self.flat is not None:
            parts.append(
                (
                    f"structural modes, other orders, electrical and fixed sources: {self.flat.name} "
                    f"({self.flat.source}), in frequency, both sides",
                    "flat",
                )
            )
        parts.append((f"torsional modes: {self.torsional.name} ({self.torsional.source})", "torsional"))
        parts += [(f"{scope_words(m, e)}: {r.name} ({r.source})", f"override:{m}:{e}") for m, e, r in self.overrides]
        if self.damped is not None:
            parts.append((self.damped.description, "damped"))
        return parts


def as_rule_set(rules: RuleSet | MarginRule | None) -> RuleSet:
    """A :class:`RuleSet` from what a caller gave.

    None gives the defaults (API lateral at 1x for rotors, no flat margin); a
    flat rule applies to every pair (rotor lateral at 1x included); any other
    rule (the API lateral rule, a table against AF) governs rotor lateral
    modes against 1x only.

    Parameters
    ----------
    rules : RuleSet, MarginRule or None
        What the caller gave.

    Returns
    -------
    RuleSet

    Raises
    ------
    InputTypeError
        Something that is neither a rule set nor a margin rule.
    """
    if rules is None:
        return RuleSet()
    if isinstance(rules, RuleSet):
        return rules
    if not (hasattr(rules, "required") and hasattr(rules, "name") and hasattr(rules, "source")):
        raise InputTypeError(f"rules: got {type(rules).__name__}; expected a RuleSet or a margin rule")
    if isinstance(rules, FlatRule):
        return RuleSet(lateral_1x=rules, flat=rules)
    return RuleSet(lateral_1x=rules)
