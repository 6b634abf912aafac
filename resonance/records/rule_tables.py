"""The margin rules and vibration criteria of a scenario, read and written back.

The ``[margin]`` and ``[vibration]`` tables every kind shares.
"""

from __future__ import annotations

from collections.abc import Mapping
from typing import Any

from ..checks.excitations import EXCITATION_KINDS
from ..checks.margins import ApiLateralRule, FlatRule, MarginRule, TableRule, rule_by_name
from ..checks.rules import TORSIONAL_RULE, DampedModeRule, RuleSet, is_flat
from ..core.errors import InputTypeError, InputValueError
from ..dynamics.modes import MODE_KINDS
from .tables import TableReader

__all__ = [
    "parse_vibration",
    "parse_percent",
    "parse_rule",
    "parse_rules",
    "rule_table",
    "rules_table",
]


def parse_percent(r: TableReader, raw: Any, field: str) -> float:
    """A percentage written as a plain number in (0, 100).

    Parameters
    ----------
    r : TableReader
        The reader of the scenario's source.
    raw : object
        The value as read.
    field : str
        The field, for the error.

    Returns
    -------
    float
        Percent.

    Raises
    ------
    ScenarioError
        Text (``"15 %"`` would read as 0.15), a boolean, or a value outside (0, 100).
    """
    # A percentage is a plain number: "15 %" text would be read by pint as 0.15.
    if isinstance(raw, bool) or not isinstance(raw, (int, float)):
        raise r.fail(field, f"got {raw!r}; expected a plain number of percent (for 15 % write 15)")
    if not 0 < raw < 100:  # compared as given: a huge integer must not overflow a float
        raise r.fail(field, f"got {raw!r}; expected a percentage between 0 and 100")
    return float(raw)


def parse_rules(r: TableReader, data: Mapping[str, Any], judges_amplitude: bool = False) -> RuleSet:
    """The ``[margin]`` table as a :class:`~resonance.checks.rules.RuleSet` (see the support scenario).

    Parameters
    ----------
    r : TableReader
        The reader of the scenario's source.
    data : mapping
        The ``[margin]`` table (empty when absent).
    judges_amplitude : bool
        The study predicts vibration against a limit, so heavily damped structural modes are judged by it
        (:class:`~resonance.checks.rules.DampedModeRule`, on by default; ``heavily_damped = false`` turns it off,
        ``damped_af_below`` sets its AF). Elsewhere those two fields are refused.

    Returns
    -------
    RuleSet

    Raises
    ------
    ScenarioError
        An unknown field or rule, a bad percentage, a pair of unknown kinds, an AF rule outside its scope, a
        heavily damped field in a study that does not judge amplitude.
    """
    damped_keys = ("heavily_damped", "damped_af_below")
    r.known(data, ("rule", "table", "name", "source", "flat", "torsional", "pairs", *damped_keys), "margin")
    damped: DampedModeRule | None = None
    if judges_amplitude:
        on = data.get("heavily_damped", True)
        if not isinstance(on, bool):
            raise r.fail("margin.heavily_damped", f"got {on!r}; expected true or false")
        if on:
            af = r.value(data.get("damped_af_below", 2.5), "margin.damped_af_below", "ratio", "positive")
            try:
                damped = DampedModeRule(af)
            except InputValueError as error:
                raise r.fail("margin.damped_af_below", str(error).split(": ", 1)[1]) from None
        elif "damped_af_below" in data:
            raise r.fail("margin.damped_af_below", "heavily_damped is false; remove one of the two")
    else:
        for key in damped_keys:
            if key in data:
                raise r.fail(
                    f"margin.{key}",
                    "this kind of study does not predict vibration against a limit, so no mode is judged by "
                    "amplitude here; remove it",
                )
    lateral = parse_rule(r, data)
    flat: FlatRule | None = None
    if "flat" in data:
        flat = FlatRule(parse_percent(r, data["flat"], "margin.flat"))
    elif is_flat(lateral):
        flat = lateral  # type: ignore[assignment]  # rule = "flat-P": P % for every pair
    torsional = TORSIONAL_RULE
    if "torsional" in data:
        percent = parse_percent(r, data["torsional"], "margin.torsional")
        torsional = FlatRule(percent, name=f"torsional {percent:g} %", source=f"given in {r.source}")
    overrides = []
    for i, item in enumerate(r.array(data, "pairs", "margin.pairs", required=False)):
        field = f"margin.pairs[{i}]"
        if not isinstance(item, Mapping):
            raise r.fail(field, f"got {item!r}; expected a table with mode, excitation and rule")
        r.known(item, ("mode", "excitation", "rule"), field)
        mode = r.text(item, "mode", f"{field}.mode")
        if mode not in MODE_KINDS:
            raise r.fail(f"{field}.mode", f"got {mode!r}; expected one of {list(MODE_KINDS)}")
        excitation = r.text(item, "excitation", f"{field}.excitation")
        if excitation not in EXCITATION_KINDS:
            raise r.fail(f"{field}.excitation", f"got {excitation!r}; expected one of {list(EXCITATION_KINDS)}")
        try:
            rule = rule_by_name(r.text(item, "rule", f"{field}.rule"))
        except InputValueError as error:
            raise r.fail(f"{field}.rule", str(error).removeprefix("rule: ")) from None
        overrides.append((mode, excitation, rule))
    try:
        return RuleSet(lateral, flat, torsional, tuple(overrides), damped)
    except InputValueError as error:
        raise r.fail("margin.pairs", str(error).split(": ", 1)[1]) from None


def parse_rule(r: TableReader, data: Mapping[str, Any]) -> MarginRule:
    """The rotor lateral 1x rule of a ``[margin]`` table: a name or an AF table.

    Parameters
    ----------
    r : TableReader
        The reader of the scenario's source.
    data : mapping
        The ``[margin]`` table.

    Returns
    -------
    MarginRule
        ``margin.rule`` by name, or the ``margin.table`` rule.

    Raises
    ------
    ScenarioError
        An unknown rule name or a bad table.
    """
    if "table" in data:
        table = r.table(data, "table", "margin.table")
        r.known(table, ("amplification_factors", "below", "above"), "margin.table")
        arrays = {}
        for key in ("amplification_factors", "below", "above"):
            values = r.array(table, key, f"margin.table.{key}")
            arrays[key] = tuple(r.value(v, f"margin.table.{key}[{j}]", "ratio") for j, v in enumerate(values))
        try:
            return TableRule(
                arrays["amplification_factors"],
                arrays["below"],
                arrays["above"],
                r.text(data, "name", "margin.name", "user table"),
                r.text(data, "source", "margin.source", f"user-defined in {r.source}"),
            )
        except InputValueError as error:
            raise r.fail("margin.table", str(error)) from None
    name = r.text(data, "rule", "margin.rule", "api-lateral")
    try:
        return rule_by_name(name)
    except InputValueError as error:
        raise r.fail("margin.rule", str(error).removeprefix("rule: ")) from None


def parse_vibration(r: TableReader, data: Mapping[str, Any]) -> tuple[int, str]:
    """The ``[vibration]`` table: ISO 10816-3 machine group and declared support class.

    Parameters
    ----------
    r : TableReader
        The reader (its file name starts the errors).
    data : mapping
        The table (empty for the defaults: group 2, rigid).

    Returns
    -------
    tuple of (int, str)
        ``(group, support)``.

    Raises
    ------
    ScenarioError
        An unknown field, a group other than 1 or 2, a support other than rigid or flexible.
    """
    r.known(data, ("group", "support"), "vibration")
    group = r.integer(data, "group", "vibration.group", 2)
    support = r.text(data, "support", "vibration.support", "rigid")
    if group not in (1, 2) or support not in ("rigid", "flexible"):
        raise r.fail(
            "vibration", f"got group {group!r}, support {support!r}; expected group 1 or 2, 'rigid' or 'flexible'"
        )
    return group, support


def rules_table(rules: RuleSet, judges_amplitude: bool = False) -> dict[str, Any]:
    """A rule set as a ``[margin]`` table.

    Parameters
    ----------
    rules : RuleSet
        The rules to write.
    judges_amplitude : bool
        As for :func:`parse_rules`: the heavily damped rule is on unless the table says otherwise.

    Returns
    -------
    dict
        The ``[margin]`` table.

    Raises
    ------
    InputTypeError
        A rule with no scenario spelling.
    """
    out = rule_table(rules.lateral_1x)
    if rules.flat is not None:
        out["flat"] = rules.flat.percent
    if rules.torsional != TORSIONAL_RULE:
        out["torsional"] = rules.torsional.percent
    if rules.overrides:
        out["pairs"] = [
            {"mode": m, "excitation": e, "rule": rule_table(rule)["rule"]} for m, e, rule in rules.overrides
        ]
    if judges_amplitude and rules.damped is None:
        out["heavily_damped"] = False
    elif rules.damped is not None and rules.damped.af_below != DampedModeRule().af_below:
        out["damped_af_below"] = rules.damped.af_below
    return out


def rule_table(rule: MarginRule) -> dict[str, Any]:
    """One rule as ``[margin]`` keys.

    Parameters
    ----------
    rule : MarginRule
        The rule to write.

    Returns
    -------
    dict
        ``rule`` by name, or ``name``, ``source`` and ``table``.

    Raises
    ------
    InputTypeError
        A rule with no scenario spelling.
    """
    if isinstance(rule, ApiLateralRule):
        return {"rule": "api-lateral"}
    if isinstance(rule, FlatRule):
        return {"rule": f"flat-{rule.percent:g}"}
    if isinstance(rule, TableRule):
        return {
            "name": rule.name,
            "source": rule.source,
            "table": {
                "amplification_factors": list(rule.amplification_factors),
                "below": list(rule.below),
                "above": list(rule.above),
            },
        }
    raise InputTypeError(f"rule: a {type(rule).__name__} cannot be saved to a scenario file")
