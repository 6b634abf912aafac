"""Torsional trains: inertias joined by shafts, couplings and gear meshes, referred to one shaft.

A train is a set of named stations (rotor inertias of motors, impellers, fan wheels, gear wheels, coupling
hubs), each on a shaft that turns at a fixed ratio of the reference (driver) shaft's speed, joined by
torsional springs (shaft sections ``k = G J_p / L``, couplings from the maker's data) and by gear meshes.
Every station's inertia and every spring are referred to the reference shaft by the square of their
shaft's speed ratio ``n`` (``J_ref = n^2 J``, ``k_ref = n^2 k``); a rigid mesh makes the gear and the
pinion one referred degree of freedom, a mesh with stiffness joins them by a spring. The modes are those
of the referred model; shapes are given back in each station's own angle (``theta = n theta_ref``).

References
----------
.. [1] W. Ker Wilson, *Practical Solution of Torsional Vibration Problems*, vol. 1, 3rd ed., 1956 (referral
   of geared systems; Holzer's method) (from memory).
.. [2] E. J. Nestorides, *A Handbook on Torsional Vibration*, Cambridge, 1958 (from memory).
.. [3] S. S. Rao, *Mechanical Vibrations*, 6th ed., 2017, sec. 6.10 (torsional systems) and 5.6 (geared
   systems).
"""

from __future__ import annotations

import dataclasses
import math
from collections.abc import Callable, Mapping, Sequence
from dataclasses import dataclass

import numpy as np
import scipy.linalg

from ...core.errors import InputTypeError, InputValueError
from ...core.inputs import as_si, as_si_array, check_parts
from ...core.threads import blas_threads_for
from ...dynamics.model import MatrixModel, matrix_model
from ...dynamics.modes import Mode, ModeSet, model_modes, undamped_modes

__all__ = [
    "Coupling",
    "GearMesh",
    "Station",
    "TorsionalShaft",
    "TorsionalShape",
    "TorsionalTrain",
    "TorqueResponse",
    "hollow_shaft_stiffness",
    "stepped_shaft_stiffness",
    "scale_couplings",
    "scale_dampers",
    "torque_response",
    "torsional_mode_list",
    "torsional_modes",
    "torsional_shapes",
    "torsional_train",
]


def hollow_shaft_stiffness(
    shear_modulus: object, length: object, outer_diameter: object, inner_diameter: object = 0.0
) -> float:
    """Torsional stiffness of a uniform round shaft, ``k = G J_p / L`` with ``J_p = pi (D^4 - d^4) / 32``.

    Parameters
    ----------
    shear_modulus : float or pint.Quantity
        G [Pa] (> 0); steel about 79-81 GPa (from memory).
    length : float or pint.Quantity
        [m] (> 0).
    outer_diameter, inner_diameter : float or pint.Quantity
        D and d [m] (0 <= d < D).

    Returns
    -------
    float
        [N m/rad].

    Raises
    ------
    InputValueError, InputTypeError
        Non-positive or non-finite values, an inner diameter not below the outer, quantities of another kind.

    References
    ----------
    W. C. Young and R. G. Budynas, *Roark's Formulas for Stress and Strain*, 7th ed., 2002, table 10.1
    (circular and hollow circular sections) (from memory).

    Examples
    --------
    >>> round(hollow_shaft_stiffness(80e9, 1.0, 0.1) / 1e6, 3)  # MN m/rad
    0.785
    """
    g = as_si(shear_modulus, "shear_modulus", "pressure", "positive")
    length_m = as_si(length, "length", "length", "positive")
    d_out = as_si(outer_diameter, "outer_diameter", "length", "positive")
    d_in = as_si(inner_diameter, "inner_diameter", "length", "nonnegative")
    if not d_in < d_out:
        raise InputValueError(f"inner_diameter: got {d_in:g} m, not below the outer diameter {d_out:g} m")
    return g * math.pi * (d_out**4 - d_in**4) / 32.0 / length_m


def stepped_shaft_stiffness(shear_modulus: object, sections: Sequence[tuple[object, object, object]]) -> float:
    """Torsional stiffness of a stepped round shaft: its sections in series, ``1/k = sum L_i / (G J_i)``.

    Parameters
    ----------
    shear_modulus : float or pint.Quantity
        G [Pa] (> 0), the same for every section.
    sections : sequence of (length, outer_diameter, inner_diameter)
        Each uniform section's length and diameters [m] (0 <= d < D), from one station to the other.

    Returns
    -------
    float
        [N m/rad].

    Raises
    ------
    InputValueError, InputTypeError
        No section, or a section as :func:`hollow_shaft_stiffness` refuses it (named by its index).

    Notes
    -----
    Sections joined end to end carry the same torque and their twists add, so their compliances add
    (springs in series). The inertia of the sections belongs to the stations, as for a uniform shaft.

    References
    ----------
    S. S. Rao, *Mechanical Vibrations*, 6th ed., 2017, sec. 1.7 (springs in series); W. Ker Wilson,
    *Practical Solution of Torsional Vibration Problems*, vol. 1 (equivalent length of stepped shafts;
    from memory).

    Examples
    --------
    >>> k1 = hollow_shaft_stiffness(80e9, 0.3, 0.1)
    >>> k2 = hollow_shaft_stiffness(80e9, 0.2, 0.08)
    >>> round(stepped_shaft_stiffness(80e9, [(0.3, 0.1, 0.0), (0.2, 0.08, 0.0)]) / (k1 * k2 / (k1 + k2)), 12)
    1.0
    """
    if isinstance(sections, (str, bytes)) or not isinstance(sections, Sequence) or not sections:
        raise InputValueError(f"sections: got {sections!r}; expected one or more (length, outer, inner) sections")
    g = as_si(shear_modulus, "shear_modulus", "pressure", "positive")
    compliance = 0.0
    for i, section in enumerate(sections):
        if not isinstance(section, (tuple, list)) or len(section) != 3:
            raise InputValueError(f"sections[{i}]: got {section!r}; expected (length, outer_diameter, inner_diameter)")
        try:
            compliance += 1.0 / hollow_shaft_stiffness(g, *section)
        except (InputValueError, InputTypeError) as error:
            raise type(error)(f"sections[{i}]: {error}") from None
    return 1.0 / compliance


@dataclass(frozen=True)
class Station:
    """An inertia on a shaft.

    Attributes
    ----------
    name : str
        Unique name (``"motor"``, ``"impeller"``...).
    inertia : float
        Polar moment of inertia [kg m^2] (> 0); a quantity of ``R.ureg`` is converted (``"lb*ft**2"`` for WR^2).
    shaft : str
        The shaft it turns with (all stations of a shaft share its speed).
    """

    name: str
    inertia: float
    shaft: str = "driver"

    def __post_init__(self) -> None:
        object.__setattr__(self, "inertia", as_si(self.inertia, f"{self.name}: inertia", "inertia", "positive"))


@dataclass(frozen=True)
class TorsionalShaft:
    """A torsional spring (and damper) between two stations on the same shaft.

    Attributes
    ----------
    between : tuple of str
        The two stations.
    stiffness : float
        [N m/rad] (> 0); see :func:`hollow_shaft_stiffness`.
    damping : float
        [N m s/rad] (>= 0).
    label : str
        Name in tables (the element that twists most is named by it).
    outer_diameter, inner_diameter : float
        The section's diameters [m], when shear stresses are wanted (see :func:`torque_response`).
    """

    between: tuple[str, str]
    stiffness: float
    damping: float = 0.0
    label: str = ""
    outer_diameter: float | None = None
    inner_diameter: float = 0.0

    def __post_init__(self) -> None:
        where = self.label or "-".join(self.between)
        object.__setattr__(
            self, "stiffness", as_si(self.stiffness, f"{where}: stiffness", "moment_stiffness", "positive")
        )
        object.__setattr__(self, "damping", as_si(self.damping, f"{where}: damping", "moment_damping", "nonnegative"))
        if not self.label:
            object.__setattr__(self, "label", where)
        if self.outer_diameter is not None:
            d_out = as_si(self.outer_diameter, f"{where}: outer_diameter", "length", "positive")
            d_in = as_si(self.inner_diameter, f"{where}: inner_diameter", "length", "nonnegative")
            if not d_in < d_out:
                raise InputValueError(f"{where}: inner_diameter: got {d_in:g} m, not below the outer {d_out:g} m")
            object.__setattr__(self, "outer_diameter", d_out)
            object.__setattr__(self, "inner_diameter", d_in)

    @property
    def section_modulus(self) -> float | None:
        """Polar section modulus ``Z_p = pi (D^4 - d^4) / (16 D)`` [m^3], or None without diameters."""
        if self.outer_diameter is None:
            return None
        d_out, d_in = float(self.outer_diameter), float(self.inner_diameter)
        return math.pi * (d_out**4 - d_in**4) / (16.0 * d_out)


class Coupling(TorsionalShaft):
    """A flexible coupling: a torsional spring and damper from the maker's data.

    Attributes
    ----------
    between : tuple of str
        The two hubs' stations (on one shaft).
    stiffness : float
        Dynamic torsional stiffness [N m/rad] (> 0).
    damping : float
        [N m s/rad] (>= 0).
    label : str
        Name in tables.
    """


@dataclass(frozen=True)
class GearMesh:
    """A gear mesh: the pinion's shaft turns ``ratio`` times as fast as the gear's.

    Attributes
    ----------
    gear, pinion : str
        The stations of the two wheels (on different shafts).
    ratio : float
        Speed of the pinion's shaft over the gear's [-] (> 0; > 1 for a speed increaser).
    stiffness : float or None
        Mesh stiffness referred to the pinion's shaft [N m/rad]; None for a rigid mesh (gear and pinion
        then move as one referred degree of freedom).
    """

    gear: str
    pinion: str
    ratio: float
    stiffness: float | None = None

    def __post_init__(self) -> None:
        where = f"{self.gear}-{self.pinion}"
        ratio = as_si(self.ratio, f"{where}: ratio", "ratio", "positive")
        if not 1e-3 <= ratio <= 1e3:
            # Far wider than any gearbox; beyond it the referral (ratio squared) loses all meaning.
            raise InputValueError(f"{where}: ratio: got {ratio:g}; expected a speed ratio between 0.001 and 1000")
        object.__setattr__(self, "ratio", ratio)
        if self.stiffness is not None:
            k = as_si(self.stiffness, f"{where}: stiffness", "moment_stiffness", "positive")
            object.__setattr__(self, "stiffness", k)


@dataclass(frozen=True)
class TorsionalTrain:
    """A train referred to its reference shaft.

    Attributes
    ----------
    stations : tuple of Station
        As given.
    speed_ratio : dict of str to float
        Each shaft's speed over the reference shaft's [-].
    dof : dict of str to int
        Each station's referred degree of freedom (rigidly meshed wheels share one).
    model : MatrixModel
        Referred inertia [kg m^2], stiffness [N m/rad] and damping [N m s/rad] matrices.
    elements : tuple of (str, str, str, float)
        Label, the two stations and the stiffness referred to the reference shaft [N m/rad] of every spring
        (shafts, couplings, compliant meshes).
    reference : str
        The reference shaft (that of the first station).
    springs : tuple of TorsionalShaft
        The shafts and couplings as given (for torques and stresses).
    meshes : tuple of GearMesh
        The gear meshes as given.
    """

    stations: tuple[Station, ...]
    speed_ratio: dict[str, float]
    dof: dict[str, int]
    model: MatrixModel
    elements: tuple[tuple[str, str, str, float], ...]
    reference: str
    springs: tuple[TorsionalShaft, ...] = ()
    meshes: tuple[GearMesh, ...] = ()

    def ratio(self, station: str) -> float:
        """The speed ratio of a station's shaft to the reference shaft [-].

        Parameters
        ----------
        station : str
            A station's name.

        Returns
        -------
        float

        Raises
        ------
        KeyError
            An unknown station.
        """
        return self.speed_ratio[next(s.shaft for s in self.stations if s.name == station)]


def torsional_train(
    stations: Sequence[Station],
    springs: Sequence[TorsionalShaft],
    meshes: Sequence[GearMesh] = (),
    reference: str | None = None,
) -> TorsionalTrain:
    """Assemble a train and refer it to its reference (driver) shaft.

    Parameters
    ----------
    stations : sequence of Station
        The inertias (unique names).
    springs : sequence of TorsionalShaft or Coupling
        Springs between two different stations of one shaft (unique labels).
    meshes : sequence of GearMesh
        Gear meshes between shafts; every shaft must be reached from the reference through them (branched
        trains, one gear driving two pinions, are allowed).
    reference : str, optional
        The shaft every speed and order refers to (the driver's); the first station's shaft if omitted.

    Returns
    -------
    TorsionalTrain

    Raises
    ------
    InputValueError
        No stations, repeated names or element labels, a spring or mesh naming a missing station, a spring
        from a station to itself or across shafts, a mesh within a shaft, shaft speeds that contradict each
        other, a reference shaft no station is on, a station or group of stations joined to nothing.
    InputTypeError
        An item of the wrong type.

    Notes
    -----
    Referral to the reference shaft: a station on a shaft turning ``n`` times as fast has kinetic energy
    ``J (n w)^2 / 2``, so its referred inertia is ``n^2 J``; likewise a spring's referred stiffness is
    ``n^2 k`` (Wilson, from memory; Rao sec. 5.6).
    """
    if not stations:
        raise InputValueError("stations: got none; expected the train's inertias")
    check_parts(stations=(stations, Station), springs=(springs, TorsionalShaft), meshes=(meshes, GearMesh))
    names = [s.name for s in stations]
    if len(set(names)) != len(names):
        raise InputValueError(f"stations: names {names} repeat; expected unique names")
    shaft_of = {s.name: s.shaft for s in stations}
    for i, m in enumerate(meshes):
        for end in (m.gear, m.pinion):
            if end not in shaft_of:
                raise InputValueError(f"meshes[{i}]: names {end!r}, which is not a station; expected one of {names}")
        if shaft_of[m.gear] == shaft_of[m.pinion]:
            raise InputValueError(f"meshes[{i}]: {m.gear!r} and {m.pinion!r} are on one shaft; a mesh joins two shafts")
    # Shaft speeds from the reference through the meshes (breadth first), checking for contradictions.
    if reference is None:
        reference = stations[0].shaft
    elif reference not in shaft_of.values():
        raise InputValueError(
            f"reference: got {reference!r}, a shaft no station is on; expected one of {sorted(set(shaft_of.values()))}"
        )
    ratio = {reference: 1.0}
    frontier = [reference]
    while frontier:
        shaft = frontier.pop()
        for m in meshes:
            a, b = shaft_of[m.gear], shaft_of[m.pinion]
            for here, there, factor in ((a, b, m.ratio), (b, a, 1.0 / m.ratio)):
                if here == shaft:
                    value = ratio[here] * factor
                    if there in ratio and not math.isclose(ratio[there], value, rel_tol=1e-9):
                        raise InputValueError(
                            f"meshes: shaft {there!r} would turn at {ratio[there]:g} and at {value:g} x the reference"
                        )
                    if there not in ratio:
                        ratio[there] = value
                        frontier.append(there)
    missing = sorted({s.shaft for s in stations} - set(ratio))
    if missing:
        raise InputValueError(f"meshes: shaft {missing[0]!r} is not geared to the reference shaft {reference!r}")
    _check_joined(stations, springs, meshes)
    # Referred degrees of freedom: rigid meshes merge their wheels.
    parent = {n: n for n in names}

    def root(n: str) -> str:
        while parent[n] != n:
            n = parent[n]
        return n

    for m in meshes:
        if m.stiffness is None:
            parent[root(m.pinion)] = root(m.gear)
    roots = list(dict.fromkeys(root(n) for n in names))
    dof = {n: roots.index(root(n)) for n in names}
    size = len(roots)
    mass = np.zeros((size, size))
    stiffness = np.zeros_like(mass)
    damping = np.zeros_like(mass)
    for s in stations:
        mass[dof[s.name], dof[s.name]] += s.inertia * ratio[s.shaft] ** 2
    elements = []
    for i, k in enumerate(springs):
        a, b = k.between
        for end in (a, b):
            if end not in shaft_of:
                raise InputValueError(
                    f"springs[{i}] ({k.label}): names {end!r}, which is not a station; expected one of {names}"
                )
        if shaft_of[a] != shaft_of[b]:
            raise InputValueError(f"springs[{i}] ({k.label}): joins two shafts; join shafts with a GearMesh")
        n2 = ratio[shaft_of[a]] ** 2
        _add(stiffness, dof[a], dof[b], k.stiffness * n2)
        _add(damping, dof[a], dof[b], k.damping * n2)
        elements.append((k.label, a, b, k.stiffness * n2))
    for m in meshes:
        if m.stiffness is not None:
            # Referred to the reference shaft through the pinion's ratio; the wheels turn in opposite senses,
            # which does not change frequencies (each shaft's angle is taken in its own sense).
            referred = m.stiffness * ratio[shaft_of[m.pinion]] ** 2
            _add(stiffness, dof[m.gear], dof[m.pinion], referred)
            elements.append((f"mesh {m.gear}-{m.pinion}", m.gear, m.pinion, referred))
    labels = tuple("+".join(n for n in names if dof[n] == j) for j in range(size))
    try:
        model = matrix_model(mass, stiffness, damping, labels)
    except InputValueError as error:
        raise InputValueError(f"train: {error}") from None
    return TorsionalTrain(tuple(stations), ratio, dof, model, tuple(elements), reference, tuple(springs), tuple(meshes))


def scale_couplings(train: TorsionalTrain, factor: object) -> TorsionalTrain:
    """The same train with every coupling's stiffness multiplied by a factor (a what-if on the maker's data).

    Parameters
    ----------
    train : TorsionalTrain
        From :func:`torsional_train`.
    factor : float
        Multiplier of each :class:`Coupling`'s stiffness [-] (> 0); shafts and meshes unchanged.

    Returns
    -------
    TorsionalTrain

    Raises
    ------
    InputValueError, InputTypeError
        Not a train, or a factor that is not finite and > 0.
    """
    k = _factor(train, factor)
    return _rebuilt(
        train, lambda s: dataclasses.replace(s, stiffness=s.stiffness * k) if isinstance(s, Coupling) else s
    )


def scale_dampers(train: TorsionalTrain, factor: object) -> TorsionalTrain:
    """The same train with every shaft's and coupling's damper multiplied by a factor.

    Parameters
    ----------
    train : TorsionalTrain
        From :func:`torsional_train`.
    factor : float
        Multiplier of each element damper [-] (> 0).

    Returns
    -------
    TorsionalTrain

    Raises
    ------
    InputValueError, InputTypeError
        Not a train, or a factor that is not finite and > 0.
    """
    c = _factor(train, factor)
    return _rebuilt(train, lambda s: dataclasses.replace(s, damping=s.damping * c))


def _factor(train: object, factor: object) -> float:
    if not isinstance(train, TorsionalTrain):
        raise InputTypeError(f"train: got {type(train).__name__}; expected a TorsionalTrain")
    return as_si(factor, "factor", "ratio", "positive")


def _rebuilt(train: TorsionalTrain, change: Callable[[TorsionalShaft], TorsionalShaft]) -> TorsionalTrain:
    return torsional_train(train.stations, [change(s) for s in train.springs], train.meshes, train.reference)


def _check_joined(stations: Sequence[Station], springs: Sequence[TorsionalShaft], meshes: Sequence[GearMesh]) -> None:
    # Every element joins two different stations under a label of its own, and every station is reached from
    # the first through springs and meshes: a dropped element would remove a mode and change the verdict.
    names = [s.name for s in stations]
    labels = [k.label for k in springs] + [f"mesh {m.gear}-{m.pinion}" for m in meshes]
    repeated = sorted({x for x in labels if labels.count(x) > 1})
    if repeated:
        raise InputValueError(f"springs/meshes: label {repeated[0]!r} is used twice; expected a label per element")
    group = {n: n for n in names}

    def root(n: str) -> str:
        while group[n] != n:
            n = group[n]
        return n

    for i, k in enumerate(springs):
        a, b = k.between
        if a == b:
            raise InputValueError(f"springs[{i}] ({k.label}): joins {a!r} to itself; expected two different stations")
        for end in (a, b):
            if end not in group:
                raise InputValueError(
                    f"springs[{i}] ({k.label}): names {end!r}, which is not a station; expected one of {names}"
                )
        group[root(a)] = root(b)
    for m in meshes:
        group[root(m.gear)] = root(m.pinion)
    alone = [n for n in names if root(n) != root(names[0])]
    if alone and len(names) > 1:
        raise InputValueError(
            f"stations: {', '.join(repr(n) for n in alone)} joined to nothing that reaches {names[0]!r}; "
            "expected every station joined by a shaft, coupling or mesh"
        )


def _add(matrix: np.ndarray, i: int, j: int, value: float) -> None:
    if i == j:
        return  # a spring between two rigidly meshed wheels does not twist
    matrix[i, i] += value
    matrix[j, j] += value
    matrix[i, j] -= value
    matrix[j, i] -= value


def torsional_modes(train: TorsionalTrain) -> ModeSet:
    """Torsional natural frequencies, damping and shapes of a train (referred to its reference shaft).

    Parameters
    ----------
    train : TorsionalTrain
        From :func:`torsional_train`.

    Returns
    -------
    ModeSet
        Frequencies [Hz] ascending, the free rigid-body rotation (0 Hz) first when the train is not held;
        shapes in referred angles (multiply a station's entry by :meth:`TorsionalTrain.ratio` for its own).

    Raises
    ------
    InputTypeError
        Not a train.
    """
    if not isinstance(train, TorsionalTrain):
        raise InputTypeError(f"train: got {type(train).__name__}; expected a TorsionalTrain")
    return model_modes(train.model)


@dataclass(frozen=True)
class TorsionalShape:
    """One torsional mode in words and numbers.

    Attributes
    ----------
    frequency : float
        Natural frequency [Hz].
    angles : dict of str to float
        Each station's angle in its own shaft's rotation, scaled so the largest is 1 [-].
    twist_share : dict of str to float
        Each element's share of the mode's strain energy [-] (the shares add up to 1).
    twists_most : str
        The element that takes most of the twist, and its share, in words.
    """

    frequency: float
    angles: dict[str, float]
    twist_share: dict[str, float]
    twists_most: str


def torsional_shapes(train: TorsionalTrain, modes: ModeSet | None = None) -> list[TorsionalShape]:
    """The elastic modes' shapes: angle per station, twist per element, the element that twists most.

    Parameters
    ----------
    train : TorsionalTrain
        From :func:`torsional_train`.
    modes : ModeSet, optional
        Its modes (:func:`torsional_modes` if omitted).

    Returns
    -------
    list of TorsionalShape
        One per elastic mode (the free rotation at 0 Hz left out), by frequency.

    Raises
    ------
    InputTypeError
        Not a train.
    """
    modes = modes if modes is not None else torsional_modes(train)
    out = []
    for i, f in enumerate(modes.frequency):
        if f <= 1e-6:
            continue
        phi = np.real(modes.shapes[:, i])
        own = {s.name: phi[train.dof[s.name]] * train.speed_ratio[s.shaft] for s in train.stations}
        scale = max(abs(v) for v in own.values()) or 1.0
        energy = {label: kr * (phi[train.dof[a]] - phi[train.dof[b]]) ** 2 for label, a, b, kr in train.elements}
        total = sum(energy.values()) or 1.0
        share = {label: e / total for label, e in energy.items()}
        top = max(share, key=share.__getitem__) if share else "-"
        words = f"{top} takes {100 * share[top]:.0f} % of the twist" if share else "no element twists"
        out.append(TorsionalShape(float(f), {n: v / scale for n, v in own.items()}, share, words))
    return out


def torsional_mode_list(train: TorsionalTrain, damping_ratio: float | None = None) -> list[Mode]:
    """The elastic modes as :class:`~resonance.dynamics.modes.Mode` of kind ``"torsional"`` for the interference check.

    Parameters
    ----------
    train : TorsionalTrain
        From :func:`torsional_train`.
    damping_ratio : float, optional
        A modal damping ratio for every mode [-]; the element dampers' if omitted.

    Returns
    -------
    list of Mode
        Labelled by number and the element that twists most; the AF source says which damping was used.

    Raises
    ------
    InputValueError, InputTypeError
        Not a train, or a damping ratio that is not finite and >= 0.
    """
    modes = torsional_modes(train)
    zeta_given = None if damping_ratio is None else as_si(damping_ratio, "damping_ratio", "ratio", "nonnegative")
    out = []
    shapes = torsional_shapes(train, modes)
    elastic = [i for i, f in enumerate(modes.frequency) if f > 1e-6]
    for n, (i, shape) in enumerate(zip(elastic, shapes, strict=True)):
        zeta = float(modes.damping_ratio[i]) if zeta_given is None else zeta_given
        source = "1/(2 zeta) of the element dampers" if zeta_given is None else "1/(2 zeta) of the given modal damping"
        out.append(
            Mode(
                shape.frequency,
                zeta,
                f"torsional mode {n + 1} ({shape.twists_most.split(' takes')[0]} twists most)",
                "model",
                modes.shapes[:, i],
                kind="torsional",
                af_source=source,
            )
        )
    return out


@dataclass(frozen=True)
class TorqueResponse:
    """Steady response of a train to harmonic torques.

    Attributes
    ----------
    frequency : numpy.ndarray
        Excitation frequencies [Hz].
    element_torque : dict of str to numpy.ndarray
        Dynamic torque amplitude in each shaft and coupling, on its own shaft [N m] (spring and damper).
    shear_stress : dict of str to numpy.ndarray
        Shear stress amplitude ``T / Z_p`` [Pa] in each shaft section given with its diameters.
    station_angle : dict of str to numpy.ndarray
        Angle amplitude of each station in its own shaft's rotation [rad].
    """

    frequency: np.ndarray
    element_torque: dict[str, np.ndarray]
    shear_stress: dict[str, np.ndarray]
    station_angle: dict[str, np.ndarray]


def torque_response(
    train: TorsionalTrain, torques: dict[str, object], frequency: object, damping_ratio: object | None = None
) -> TorqueResponse:
    """Steady dynamic torques and stresses under harmonic torques at stations, at many frequencies at once.

    Parameters
    ----------
    train : TorsionalTrain
        From :func:`torsional_train`.
    torques : dict of str to float or pint.Quantity
        Torque amplitude at each excited station, on its own shaft [N m] (a pulsating air-gap torque, a gear
        mesh torque), all in phase at one frequency.
    frequency : array_like or pint.Quantity
        Excitation frequencies [Hz] (> 0: a free train has no steady response to a static torque).
    damping_ratio : float, optional
        A modal damping ratio for every mode [-], replacing the element dampers (as in
        :func:`torsional_mode_list`); element torques are then the springs' torques. The element dampers if
        omitted (their torque included).

    Returns
    -------
    TorqueResponse

    Raises
    ------
    InputValueError, InputTypeError
        Not a train, an unknown station, a torque or frequency that is not finite, a frequency <= 0, a damping
        ratio that is not finite and >= 0.

    Notes
    -----
    The referred equations ``(K - w^2 J + i w C) theta = T_ref`` are solved by modal superposition: the
    undamped modes once, then each elastic mode's coordinate at every frequency (real modes for modal or
    proportional damping, complex modes of the first-order form for element dampers; both exact). The free
    rotation carries no twist, so it enters the station angles only. A torque on a shaft turning ``n``
    times the reference speed is referred as ``n T`` (virtual work) and an element's referred torque is
    taken back to its own shaft as ``T_ref / n``. Fatigue design belongs to the governing code and a
    qualified engineer: compare the stresses with an allowable you are given, not with a guess.

    References
    ----------
    Rao, *Mechanical Vibrations*, 6th ed., 2017, sec. 6.10 and 5.6; Ewins, *Modal Testing*, 2nd ed., 2000,
    sec. 2.3-2.6 (modal superposition); Roark's Formulas, table 10.1 (``Z_p``) (from memory).
    """
    if not isinstance(train, TorsionalTrain):
        raise InputTypeError(f"train: got {type(train).__name__}; expected a TorsionalTrain")
    f = as_si_array(frequency, "frequency", "frequency", "positive")
    zeta = None if damping_ratio is None else as_si(damping_ratio, "damping_ratio", "ratio", "nonnegative")
    shaft_of = {s.name: s.shaft for s in train.stations}
    load = np.zeros(train.model.size)
    if not isinstance(torques, Mapping) or not torques:
        raise InputTypeError(f"torques: got {torques!r}; expected a mapping of station names to torques")
    for name, torque in torques.items():
        if name not in shaft_of:
            raise InputValueError(
                f"torques: names {name!r}, which is not a station; expected one of {sorted(shaft_of)}"
            )
        load[train.dof[name]] += as_si(torque, f"torques[{name!r}]", "torque") * train.speed_ratio[shaft_of[name]]
    w = 2.0 * math.pi * f
    with blas_threads_for(2 * train.model.size):
        parts = _modal_parts(train, zeta)
        q = parts.coordinates(load, w)
    theta = q @ parts.pe.T + (w[:, None] ** -2) * -(parts.p0 @ (parts.p0.T @ load))[None, :]
    angles = {s.name: np.abs(theta[:, train.dof[s.name]]) * train.speed_ratio[s.shaft] for s in train.stations}
    # Every element's twist from the elastic coordinates (the free rotation does not twist).
    incidence = np.zeros((len(train.elements), train.model.size))
    for row, (_label, a, b, _kr) in enumerate(train.elements):
        incidence[row, train.dof[a]] += 1.0
        incidence[row, train.dof[b]] -= 1.0
    twist = q @ (incidence @ parts.pe).T
    dampers = {s.label: s.damping for s in train.springs}
    torque_out: dict[str, np.ndarray] = {}
    stress: dict[str, np.ndarray] = {}
    sections = {s.label: s.section_modulus for s in train.springs}
    for row, (label, a, b, kr) in enumerate(train.elements):
        # Springs on their own shaft; compliant meshes on the pinion's shaft.
        n = train.speed_ratio[shaft_of[a] if label in dampers else shaft_of[b]]
        c = dampers.get(label, 0.0) * n**2 if zeta is None else 0.0
        torque_out[label] = np.abs((kr + 1j * w * c) * twist[:, row]) / n
        z_p = sections.get(label)
        if z_p is not None:
            stress[label] = torque_out[label] / z_p
    return TorqueResponse(f, torque_out, stress, angles)


def _modal_parts(train: TorsionalTrain, damping_ratio: float | None) -> _ModalParts:
    # The undamped modes once; the free rotation (0 Hz) kept apart: it carries no twist and no damping, so the
    # elastic modes alone give every element's torque, exactly, at every frequency (Ewins sec. 2.3-2.6).
    wr, phi = undamped_modes(train.model)
    rigid = wr <= 2.0 * math.pi * 1e-6
    we, pe, p0 = wr[~rigid], phi[:, ~rigid], phi[:, rigid]
    if damping_ratio is not None:
        return _ModalParts(we, pe, p0, None, 2.0 * damping_ratio * we)
    if we.size == 0:
        return _ModalParts(we, pe, p0, None, np.zeros(0))
    d = pe.T @ train.model.damping @ pe  # 2 zeta_r w_r on the diagonal when proportional
    off = d - np.diag(np.diag(d))
    if not np.any(np.abs(off) > 1e-9 * max(float(np.abs(d).max()), 1e-300)):
        return _ModalParts(we, pe, p0, None, np.diag(d).copy())
    # General (element) damping: complex modes of the balanced first-order form in elastic modal
    # coordinates, state z = [W q; q'], A = [[0, W], [-W, -D]] (as in resonance.dynamics.frf).
    m = we.size
    a = np.block([[np.zeros((m, m)), np.diag(we)], [-np.diag(we), -d]])
    lam, vectors = scipy.linalg.eig(a)
    return _ModalParts(we, pe, p0, (lam, vectors), None)


@dataclass(frozen=True)
class _ModalParts:
    we: np.ndarray  # elastic natural frequencies [rad/s]
    pe: np.ndarray  # their mass-normalized shapes (n x m)
    p0: np.ndarray  # the free rotation's shape(s) (n x r)
    state: tuple[np.ndarray, np.ndarray] | None  # complex modes of the first-order form (general damping)
    cr: np.ndarray | None  # 2 zeta_r w_r (proportional or given modal damping)

    def coordinates(self, load: np.ndarray, w: np.ndarray) -> np.ndarray:
        # Elastic modal coordinates q (len(w) x m) under a load vector.
        p = self.pe.T @ load
        if self.cr is not None:
            return p[None, :] / (self.we[None, :] ** 2 - w[:, None] ** 2 + 1j * w[:, None] * self.cr[None, :])
        lam, vectors = self.state  # type: ignore[misc]
        m = self.we.size
        participation = scipy.linalg.solve(vectors, np.concatenate([np.zeros(m), p]))
        rows = vectors[:m] / self.we[:, None]
        return (participation[None, :] / (1j * w[:, None] - lam[None, :])) @ rows.T
