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
from collections.abc import Callable, Sequence
from dataclasses import dataclass

import numpy as np

from ...checks.excitations import Excitation
from ...core.errors import InputTypeError, InputValueError
from ...core.inputs import as_si, check_parts
from ...dynamics.model import MatrixModel, matrix_model
from ...dynamics.modes import Mode, ModeSet, model_modes
from .elements import Coupling, GearMesh, Station, TorsionalShaft

__all__ = [
    "shaft_order",
    "TorsionalShape",
    "TorsionalTrain",
    "scale_couplings",
    "scale_dampers",
    "torsional_mode_list",
    "torsional_modes",
    "torsional_shapes",
    "torsional_train",
]


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
        A new train; the shafts keep their stiffness.

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
        A new train; the stiffnesses are unchanged.

    Raises
    ------
    InputValueError, InputTypeError
        Not a train, or a factor that is not finite and > 0.
    """
    c = _factor(train, factor)
    return _rebuilt(train, lambda s: dataclasses.replace(s, damping=s.damping * c))


def _factor(train: object, factor: object, name: str = "factor") -> float:
    if not isinstance(train, TorsionalTrain):
        raise InputTypeError(f"train: got {type(train).__name__}; expected a TorsionalTrain")
    return as_si(factor, name, "ratio", "positive")


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


def shaft_order(train: TorsionalTrain, shaft: str, order: float = 1.0, label: str | None = None) -> Excitation:
    """An order of one shaft's speed as an excitation of the train, referred to the reference shaft's speed.

    Parameters
    ----------
    train : TorsionalTrain
        The train.
    shaft : str
        The shaft whose speed excites (its 1x, 2x, or a gear mesh: teeth x that shaft's speed).
    order : float
        Multiple of that shaft's speed [-] (> 0).
    label : str, optional
        Name in tables.

    Returns
    -------
    Excitation
        Order ``order x n`` of the reference shaft's speed (``n`` the shaft's speed ratio); kind
        ``"synchronous"`` only for 1x of the reference shaft.

    Raises
    ------
    InputValueError
        An unknown shaft or an order that is not > 0.
    InputTypeError
        A train that is not a :class:`TorsionalTrain`.
    """
    n = _factor(train, order, "order")
    if shaft not in train.speed_ratio:
        raise InputValueError(f"shaft: got {shaft!r}; expected one of {sorted(train.speed_ratio)}")
    referred = n * train.speed_ratio[shaft]
    text = label if label is not None else f"{n:g}x {shaft}"
    return Excitation(text, order=referred, kind="synchronous" if referred == 1.0 else "order")
