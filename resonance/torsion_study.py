"""The torsional flow: a ``[torsion]`` scenario -> train -> torsional modes -> findings -> record.

A scenario file with a ``[torsion]`` table describes a drive train (see ``notebooks/scenarios/
compressor_train.toml``)::

    [speed]                      # the driver shaft's speeds of continuous operation
    min = "1200 rpm"
    max = "1500 rpm"

    [torsion]
    damping_ratio = 0.02         # modal damping for every mode (optional; else the elements' dampers)
    shaft_orders = [1, 2]        # each shaft's orders checked (default 1x and 2x)
    stations = [
      { name = "motor", inertia = "6 kg*m**2" },                       # on the driver shaft
      { name = "pinion", inertia = "0.05 kg*m**2", shaft = "hs" },
    ]
    couplings = [{ between = ["motor", "gear"], stiffness = "40 kN*m/rad", damping = 30, label = "coupling" }]
    shafts = [{ between = ["pinion", "compressor"], length = "0.6 m", outer_diameter = "60 mm",
                shear_modulus = "80 GPa", label = "hs shaft" }]          # or stiffness = "..."
    meshes = [{ gear = "gear", pinion = "pinion", ratio = 3.2, gear_teeth = 97 }]

Every station's, shaft's and mesh's 1x and 2x (``shaft_orders``), each gear mesh (teeth x the gear's shaft
speed), the motor's electrical frequencies and any ``[[excitations]]`` are checked against every torsional
mode by the torsional rule (10 % unless ``margin.torsional`` says otherwise; API 617 / RP 684, from memory).
Errors name the file and the field.
"""

from __future__ import annotations

import dataclasses
import datetime as _dt
import os
from collections.abc import Mapping
from dataclasses import dataclass
from pathlib import Path
from typing import Any

from .errors import InputValueError
from .excitations import Excitation, shaft_order
from .interference import FindingsTable, interference_check, verdict_line, verdict_of
from .modes import Mode
from .record import CAUTION, Record, basis_lines, header_lines, methods_used, record_head
from .rules import RuleSet
from .speed_range import OperatingRange
from .tables import (
    MotorSpec,
    RecordSpec,
    TableReader,
    parse_excitations,
    parse_head,
    parse_motor,
    parse_record,
    parse_rules,
    parse_speed,
    read_scenario_bytes,
)
from .torsion import (
    Coupling,
    GearMesh,
    Station,
    TorsionalShaft,
    TorsionalShape,
    TorsionalTrain,
    hollow_shaft_stiffness,
    torsional_mode_list,
    torsional_shapes,
    torsional_train,
)
from .units import UnitSystem, display_unit

__all__ = [
    "TorsionScenario",
    "TorsionStudyResult",
    "build_torsion_record",
    "load_torsion_scenario",
    "parse_torsion_scenario",
    "run_torsion_study",
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


@dataclass(frozen=True)
class TorsionScenario:
    """A validated torsional scenario.

    Attributes
    ----------
    title, description : str
        As written.
    units : {"SI", "US"}
        Display units.
    speed : OperatingRange
        The driver shaft's speeds of continuous operation [rpm].
    excitations : tuple of Excitation
        Every source checked (shaft orders, gear meshes, electrical, given ones), in driver orders.
    rules : RuleSet
        Margin rules (the torsional rule applies to every torsional mode).
    train : TorsionalTrain
        The referred train.
    damping_ratio : float or None
        Modal damping for every mode [-] (None: the elements' dampers).
    tables : dict
        The scenario's tables as read (for the record).
    source : str
        The file name.
    motor : MotorSpec or None
        The driving motor.
    record : RecordSpec
        Revision fields.
    sha256 : str or None
        SHA-256 of the file's bytes.
    """

    title: str
    description: str
    units: UnitSystem
    speed: OperatingRange
    excitations: tuple[Excitation, ...]
    rules: RuleSet
    train: TorsionalTrain
    damping_ratio: float | None
    tables: dict[str, Any] = dataclasses.field(compare=False)
    source: str = "<torsion scenario>"
    motor: MotorSpec | None = None
    record: RecordSpec = dataclasses.field(default_factory=RecordSpec)
    sha256: str | None = dataclasses.field(default=None, compare=False)

    def replace(self, **changes: Any) -> TorsionScenario:
        """A copy with some fields changed (the copy has no file hash unless given).

        Parameters
        ----------
        **changes
            Fields to change.

        Returns
        -------
        TorsionScenario

        Raises
        ------
        TypeError
            An unknown field.
        """
        return dataclasses.replace(self, **{"sha256": None, **changes})


def _plain(value: Any) -> Any:
    # The tables as JSON-ready values (a TOML date becomes its ISO text).
    if isinstance(value, Mapping):
        return {str(k): _plain(v) for k, v in value.items()}
    if isinstance(value, list):
        return [_plain(v) for v in value]
    if isinstance(value, (str, int, float, bool)) or value is None:
        return value
    return value.isoformat() if hasattr(value, "isoformat") else str(value)


def parse_torsion_scenario(data: Mapping[str, Any], source: str = "<torsion scenario>") -> TorsionScenario:
    """Validate a torsional scenario given as nested tables (as read from TOML).

    Parameters
    ----------
    data : mapping
        The scenario's tables.
    source : str
        The file name errors start with.

    Returns
    -------
    TorsionScenario

    Raises
    ------
    ScenarioError
        Any missing, unknown or invalid field, a disconnected train, contradictory gear ratios; the message
        names ``source`` and the field.
    """
    r = TableReader(source)
    r.known(data, ("scenario", "speed", "excitations", "motor", "margin", "torsion", "record"), "")
    title, description, units = parse_head(r, data)
    speed = parse_speed(r, r.table(data, "speed", "speed"))
    motor = parse_motor(r, r.table(data, "motor", "motor", required=False))
    given = parse_excitations(r, r.array(data, "excitations", "excitations"), motor) if "excitations" in data else ()
    rules = parse_rules(r, r.table(data, "margin", "margin", required=False))
    t = r.table(data, "torsion", "torsion")
    r.known(t, ("damping_ratio", "shaft_orders", "stations", "shafts", "couplings", "meshes"), "torsion")
    zeta = None
    if "damping_ratio" in t:
        zeta = r.value(t["damping_ratio"], "torsion.damping_ratio", "ratio", "nonnegative")
        if not zeta < 1.0:
            raise r.fail("torsion.damping_ratio", f"got {zeta:g}; expected a ratio below 1")
    stations = []
    for i, item in enumerate(r.array(t, "stations", "torsion.stations")):
        field = f"torsion.stations[{i}]"
        if not isinstance(item, Mapping):
            raise r.fail(field, f"got {item!r}; expected a table with name and inertia")
        r.known(item, ("name", "inertia", "shaft"), field)
        inertia = r.quantity(item, "inertia", f"{field}.inertia", "inertia", "positive")
        stations.append(
            Station(r.text(item, "name", f"{field}.name"), inertia, r.text(item, "shaft", f"{field}.shaft", "driver"))
        )
    springs: list[TorsionalShaft] = []
    for key, kind in (("shafts", TorsionalShaft), ("couplings", Coupling)):
        for i, item in enumerate(r.array(t, key, f"torsion.{key}", required=False)):
            field = f"torsion.{key}[{i}]"
            if not isinstance(item, Mapping):
                raise r.fail(field, f"got {item!r}; expected a table with between and stiffness")
            allowed = ["between", "stiffness", "damping", "label", "outer_diameter", "inner_diameter"]
            r.known(item, [*allowed, *(["length", "shear_modulus"] if key == "shafts" else [])], field)
            between = r.array(item, "between", f"{field}.between")
            if len(between) != 2 or not all(isinstance(b, str) for b in between):
                raise r.fail(f"{field}.between", f"got {between!r}; expected two station names")
            d_out = (
                r.value(item["outer_diameter"], f"{field}.outer_diameter", "length", "positive")
                if "outer_diameter" in item
                else None
            )
            d_in = r.value(item.get("inner_diameter", 0.0), f"{field}.inner_diameter", "length", "nonnegative")
            if "stiffness" in item:
                k = r.quantity(item, "stiffness", f"{field}.stiffness", "moment_stiffness", "positive")
            elif key == "shafts" and d_out is not None:
                try:
                    k = hollow_shaft_stiffness(
                        r.quantity(item, "shear_modulus", f"{field}.shear_modulus", "pressure", "positive"),
                        r.quantity(item, "length", f"{field}.length", "length", "positive"),
                        d_out,
                        d_in,
                    )
                except InputValueError as error:
                    raise r.fail(field, str(error)) from None
            else:
                raise r.fail(
                    f"{field}.stiffness", "missing; expected a stiffness (or a shaft's length, diameters and G)"
                )
            damping = r.value(item.get("damping", 0.0), f"{field}.damping", "ratio", "nonnegative")
            label = r.text(item, "label", f"{field}.label", f"{between[0]}-{between[1]}")
            try:
                springs.append(kind((between[0], between[1]), k, damping, label, d_out, d_in))
            except InputValueError as error:
                raise r.fail(field, str(error)) from None
    meshes, teeth = [], []
    for i, item in enumerate(r.array(t, "meshes", "torsion.meshes", required=False)):
        field = f"torsion.meshes[{i}]"
        if not isinstance(item, Mapping):
            raise r.fail(field, f"got {item!r}; expected a table with gear, pinion and ratio")
        r.known(item, ("gear", "pinion", "ratio", "stiffness", "gear_teeth"), field)
        ratio = r.quantity(item, "ratio", f"{field}.ratio", "ratio", "positive")
        mesh_k: float | None = None
        if "stiffness" in item:
            mesh_k = r.value(item["stiffness"], f"{field}.stiffness", "moment_stiffness", "positive")
        meshes.append(
            GearMesh(r.text(item, "gear", f"{field}.gear"), r.text(item, "pinion", f"{field}.pinion"), ratio, mesh_k)
        )
        if "gear_teeth" in item:
            z = r.integer(item, "gear_teeth", f"{field}.gear_teeth")
            if z < 1:
                raise r.fail(f"{field}.gear_teeth", f"got {z}; expected a whole number >= 1")
            teeth.append((meshes[-1], z))
    try:
        train = torsional_train(stations, springs, meshes)
    except InputValueError as error:
        text = str(error)
        head = text.split(":", 1)[0].split(" ")[0].split("[")[0]
        where = {"springs": "torsion.shafts/couplings", "meshes": "torsion.meshes", "stations": "torsion.stations"}
        raise r.fail(where.get(head, "torsion"), text) from None
    orders = []
    for i, n in enumerate(r.array(t, "shaft_orders", "torsion.shaft_orders", required=False) or [1, 2]):
        orders.append(r.value(n, f"torsion.shaft_orders[{i}]", "ratio", "positive"))
    excitations = list(given)
    for shaft in train.speed_ratio:
        excitations += [shaft_order(train, shaft, n, f"{n:g}x {shaft} shaft") for n in orders]
    shaft_of = {s.name: s.shaft for s in stations}
    for mesh, z in teeth:
        excitations.append(
            shaft_order(train, shaft_of[mesh.gear], float(z), f"gear mesh {mesh.gear}-{mesh.pinion} ({z} teeth)")
        )
    labels = [e.label for e in excitations]
    if len(set(labels)) != len(labels):
        raise r.fail("excitations", f"labels {labels} repeat; expected distinct labels")
    return TorsionScenario(
        title,
        description,
        units,
        speed,
        tuple(excitations),
        rules,
        train,
        zeta,
        _plain(data),
        source,
        motor,
        parse_record(r, r.table(data, "record", "record", required=False)),
    )


def load_torsion_scenario(path: str | os.PathLike[str]) -> TorsionScenario:
    """Read and validate a torsional scenario file (TOML). The file is only read.

    Parameters
    ----------
    path : path-like
        The scenario file.

    Returns
    -------
    TorsionScenario
        With the file's SHA-256.

    Raises
    ------
    ScenarioError
        The file cannot be read, is not TOML, or has an invalid field.
    """
    data, sha256 = read_scenario_bytes(path)
    return parse_torsion_scenario(data, Path(os.fspath(path)).name).replace(sha256=sha256)


@dataclass(frozen=True)
class TorsionStudyResult:
    """Everything one run of a torsional scenario gives.

    Attributes
    ----------
    scenario : TorsionScenario
        The scenario run.
    modes : tuple of Mode
        Torsional modes (kind ``"torsional"``).
    shapes : tuple of TorsionalShape
        Their shapes and the element that twists most.
    findings : FindingsTable
        Every mode against every excitation, worst first.
    """

    scenario: TorsionScenario
    modes: tuple[Mode, ...]
    shapes: tuple[TorsionalShape, ...]
    findings: FindingsTable

    @property
    def passed(self) -> bool:
        """True when every finding passes."""
        return self.findings.passed

    @property
    def verdict(self) -> str:
        """``"PASS"``, ``"PASS WITH EXEMPTION"`` or ``"FAIL"``."""
        return verdict_of(self.passed, self.findings)

    def summary(self, system: UnitSystem = "SI") -> str:
        """The verdict, the torsional natural frequencies and the margins, as text.

        Parameters
        ----------
        system : {"SI", "US"}
            Display units.

        Returns
        -------
        str

        Raises
        ------
        ValueError
            An unknown unit system.
        """
        unit, factor = display_unit("frequency", system)
        digits = 2 if system == "SI" else 0
        modes = "; ".join(
            f"{m.frequency * factor:.{digits}f} {unit} ({s.twists_most})"
            for m, s in zip(self.modes, self.shapes, strict=True)
        )
        return (
            f"{verdict_line(self.verdict, self.findings)}\n"
            f"Torsional natural frequencies: {modes or 'none (a single inertia)'}\n"
            f"Margins: {self.findings.summary() if len(self.findings) else 'no mode to check'}"
        )


def run_torsion_study(scenario: TorsionScenario) -> TorsionStudyResult:
    """Run every torsional check of a scenario.

    Parameters
    ----------
    scenario : TorsionScenario
        The validated scenario.

    Returns
    -------
    TorsionStudyResult

    Raises
    ------
    InputValueError
        A scenario with no excitation to check.
    """
    modes = tuple(torsional_mode_list(scenario.train, scenario.damping_ratio))
    shapes = tuple(torsional_shapes(scenario.train))
    findings = (
        interference_check(list(modes), list(scenario.excitations), scenario.speed, scenario.rules)
        if modes
        else FindingsTable(())
    )
    return TorsionStudyResult(scenario, modes, shapes, findings)


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
            f"Margin rules by scope: {s.rules.description}.",
            "Where a margin cannot be met, the steady dynamic torque and shear stress must be shown acceptable; "
            "fatigue design belongs to the governing code and a qualified engineer.",
        ],
        "methods": methods_used(TORSION_METHODS, result.findings),
        "speed_ratios": dict(train.speed_ratio),
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
        "verdict": result.verdict,
        "cautions": CAUTION,
    }
    lines = [
        *header_lines("CALCULATION RECORD (TORSION)", s.title, s.description, data),
        "INPUTS",
        f"  driver speed: {s.speed.speed_min:g} to {s.speed.speed_max:g} rpm",
        "  shafts: " + ", ".join(f"{name} x{ratio:.4g}" for name, ratio in train.speed_ratio.items()),
        "  stations: "
        + ", ".join(f"{st.name} {st.inertia * j_factor:.4g} {j_unit} ({st.shaft})" for st in train.stations),
        "  elements: " + ", ".join(f"{sp.label} {sp.stiffness * k_factor:.4g} {k_unit}" for sp in train.springs),
        "  excitations: " + ", ".join(e.label for e in s.excitations),
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
        verdict_line(result.verdict, result.findings, heading="VERDICT"),
        "",
        "CAUTION",
        f"  {CAUTION}",
    ]
    return Record(data, "\n".join(lines))
