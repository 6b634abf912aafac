"""Rigid bodies on mounts in space, and the soil under a block.

Sources beside each check: closed forms of a rigid block on springs (Harris' Shock and Vibration Handbook,
5th ed., ch. 30; from memory, and derived in the comments), hand statics, Maxwell's reciprocity, this
package's lumped chain (itself checked against closed forms in test_mdof.py), the rotating-unbalance force
``U w^2`` (ISO 21940-11), and for the soil Lysmer's analog against Richart's damping ratio (Lysmer & Richart
1966; Richart, Hall & Woods 1970; from memory).
"""

from __future__ import annotations

import math

import numpy as np
import pytest
from numpy.testing import assert_allclose

import resonance as R
from resonance.dynamics.model import Spring, lumped_model
from resonance.dynamics.modes import model_modes
from resonance.kinds.space.bodies import Mount, RigidBody, box_inertia, space_model
from resonance.kinds.space.modes import space_modes
from resonance.kinds.space.response import orbit_major, rotating_unbalance, space_response, unbalance_reference
from resonance.kinds.space.soil import footing_impedance, soil_mount

M, LX, LY, LZ = 20000.0, 4.0, 2.0, 1.5  # an invented block [kg, m]
A, B, H = 1.8, 0.8, 0.75  # springs at (+-A, +-B, -H) from the centre of gravity
KX, KY, KZ = 2e7, 3e7, 5e7  # each spring [N/m]


def _block(kx=KX, ky=KY, kz=KZ, height=H):
    body = RigidBody("block", M, [0.0, 0.0, 0.0], box_inertia(M, LX, LY, LZ))
    mounts = [
        Mount(f"m{i}", [sx * A, sy * B, -height], "block", stiffness=[kx, ky, kz])
        for i, (sx, sy) in enumerate([(1, 1), (1, -1), (-1, 1), (-1, -1)])
    ]
    return body, space_model([body], mounts)


def test_decoupled_vertical_and_torsional_modes_of_a_block_on_four_springs():
    body, model = _block()
    f = sorted(m.frequency for m in space_modes(model))
    # Vertical: 4 kz = m w^2. Torsion about z: sum (kx y^2 + ky x^2) = Izz w^2 (Harris ch. 30, from memory).
    vertical = math.sqrt(4 * KZ / M) / (2 * math.pi)
    torsion = math.sqrt(4 * (KX * B**2 + KY * A**2) / body.inertia[2, 2]) / (2 * math.pi)
    assert min(abs(np.array(f) - vertical)) < 1e-9 * vertical
    assert min(abs(np.array(f) - torsion)) < 1e-9 * torsion
    words = {round(m.frequency, 6): m.words for m in space_modes(model)}
    assert words[round(vertical, 6)] == "block: vertical (z)"
    assert words[round(torsion, 6)].startswith("block: twisting about z")


def test_coupled_rocking_and_sliding_against_the_characteristic_equation():
    # Sliding in x couples with rocking about y through the springs' height below the centre of gravity:
    # a spring at (x_s, y_s, -h) moves u_x = x - h ry, u_z = z - x_s ry, so
    #   K = [[4 kx, -4 kx h], [-4 kx h, 4 kx h^2 + 4 kz A^2]], M = diag(m, Iyy),
    # and w^2 are the roots of det(K - w^2 M) = 0 (Harris ch. 30, from memory; derived here).
    body, model = _block()
    iyy = body.inertia[1, 1]
    k11, k12, k22 = 4 * KX, -4 * KX * H, 4 * KX * H**2 + 4 * KZ * A**2
    a, b, c = M * iyy, -(k11 * iyy + k22 * M), k11 * k22 - k12**2
    roots = np.sqrt(
        np.array([(-b - math.sqrt(b * b - 4 * a * c)) / (2 * a), (-b + math.sqrt(b * b - 4 * a * c)) / (2 * a)])
    )
    expected = roots / (2 * math.pi)
    modes = space_modes(model)
    found = [m.frequency for m in modes if m.shares["block.x"] + m.shares["block.ry"] > 0.99]
    assert_allclose(sorted(found), expected, rtol=1e-9)
    # Strongly coupled (softer vertical springs, higher centre): the words name both motions.
    _, soft = _block(kz=1e7, height=1.5)
    low = min(
        (m for m in space_modes(soft) if m.shares["block.x"] + m.shares["block.ry"] > 0.99), key=lambda m: m.frequency
    )
    assert low.words == "block: sliding in x with rocking about y"


def test_static_deflection_under_gravity_against_hand_statics():
    # Weight m g on four springs: each carries m g / 4, the block sinks m g / (4 kz) and does not tilt.
    _, model = _block()
    load = np.zeros(6)
    load[2] = -M * 9.80665
    q = np.linalg.solve(model.model.stiffness, load)
    assert_allclose(q[2], -M * 9.80665 / (4 * KZ), rtol=1e-12)
    assert_allclose(q[[0, 1, 3, 4, 5]], 0.0, atol=1e-15)


def test_receptance_is_reciprocal_between_points_of_two_bodies():
    # Maxwell-Betti: the displacement at B in j per unit force at A in i equals that at A in i per force at B in j.
    skid = RigidBody("skid", 3000.0, [0.2, 0.1, 1.2], box_inertia(3000.0, 3.0, 1.4, 0.5))
    block = RigidBody("block", M, [0.0, 0.0, 0.0], box_inertia(M, LX, LY, LZ))
    mounts = [
        Mount("pad 1", [1.2, 0.5, 0.8], "skid", "block", stiffness=[4e7, 3e7, 9e7], damping=[2e4, 2e4, 5e4]),
        Mount("pad 2", [-1.0, 0.6, 0.8], "skid", "block", stiffness=[4e7, 3e7, 9e7], damping=[2e4, 2e4, 5e4]),
        Mount("pad 3", [0.1, -0.6, 0.8], "skid", "block", stiffness=[4e7, 3e7, 9e7]),
        Mount(
            "soil",
            [0.0, 0.0, -0.75],
            "block",
            stiffness=[6e8, 6e8, 9e8],
            damping=[3e6, 3e6, 5e6],
            rotational_stiffness=[8e8, 2e9, 1e9],
            rotational_damping=[1e6, 2e6, 1e6],
        ),
    ]
    model = space_model([skid, block], mounts)
    a, b = ("skid", [1.4, 0.3, 1.4]), ("block", [-1.5, 0.9, 0.5])
    f = np.array([7.0, 23.0, 61.0])
    from resonance.kinds.space.response import PointLoad

    for i in range(3):
        for j in range(3):
            fi, fj = np.eye(3)[i], np.eye(3)[j]
            ab = space_response(model, [PointLoad(a[0], np.array(a[1]), fi)], f, [b])[:, 0, j]
            ba = space_response(model, [PointLoad(b[0], np.array(b[1]), fj)], f, [a])[:, 0, i]
            assert_allclose(ab, ba, rtol=1e-9)


def test_a_lumped_vertical_chain_is_a_special_case():
    # Two bodies stacked on one mount each, on the vertical line through both centres of gravity: vertical
    # motion decouples and its modes are those of the two-mass chain with the mounts' kz (test_mdof checks
    # the chain against closed forms).
    top = RigidBody("machine", 4000.0, [0, 0, 2.0], box_inertia(4000.0, 2.0, 1.0, 1.0))
    low = RigidBody("base", 9000.0, [0, 0, 0.5], box_inertia(9000.0, 3.0, 2.0, 1.0))
    mounts = [
        Mount("upper", [0, 0, 1.2], "machine", "base", stiffness=[5e7, 5e7, 2e8], rotational_stiffness=[3e7] * 3),
        Mount("lower", [0, 0, 0.0], "base", stiffness=[9e7, 9e7, 4e8], rotational_stiffness=[8e7] * 3),
    ]
    modes = space_modes(space_model([top, low], mounts))
    chain = model_modes(
        lumped_model(
            {"machine": 4000.0, "base": 9000.0}, [Spring("machine", "base", 2e8), Spring("base", "ground", 4e8)]
        )
    )
    vertical = sorted(m.frequency for m in modes if m.shares["machine.z"] + m.shares["base.z"] > 0.999)
    assert_allclose(vertical, chain.frequency, rtol=1e-10)


def test_a_rotating_unbalance_on_a_symmetric_mount_draws_a_circle():
    # One body on a mount at its centre of gravity, isotropic in the plane normal to the shaft (z): the force
    # U w^2 rotates, the centre describes a circle of radius U w^2 / |k - m w^2 + i w c| (ISO 21940-11 force).
    body = RigidBody("rotor", 500.0, [0, 0, 0], box_inertia(500.0, 1.0, 1.0, 1.0))
    mount = Mount(
        "bearing",
        [0, 0, 0],
        "rotor",
        stiffness=[4e7, 4e7, 4e7],
        damping=[2e3, 2e3, 2e3],
        rotational_stiffness=[1e7] * 3,
    )
    model = space_model([body], [mount])
    f = np.array([10.0, 45.0, 80.0])
    load = rotating_unbalance("rotor", [0, 0, 0], [0, 0, 1], 0.002, f)
    u = space_response(model, [load], f, [("rotor", [0, 0, 0])])[:, 0, :]
    w = 2 * math.pi * f
    radius = 0.002 * w**2 / np.abs(4e7 - 500.0 * w**2 + 1j * w * 2e3)
    assert_allclose(orbit_major(u), radius, rtol=1e-10)
    assert_allclose(np.abs(u[:, 0]), np.abs(u[:, 1]), rtol=1e-10)  # a circle: equal amplitudes in quadrature
    assert_allclose(np.abs(u[:, 2]), 0.0, atol=1e-18)


@pytest.mark.parametrize(
    ("build", "message"),
    [
        (lambda: RigidBody("skid", 100.0, [0, 0, 0], np.diag([1.0, -1.0, 1.0])), r"skid.*not positive definite"),
        (lambda: RigidBody("skid", 100.0, [0, 0, 0], np.diag([1.0, 1.0, 5.0])), r"skid.*triangle inequality"),
        (lambda: Mount("pad", [0, 0, 0], "skid", stiffness=[0, 0, 0]), r"mount 'pad': has no stiffness"),
        (
            lambda: space_model(
                [RigidBody("skid", 100.0, [0, 0, 0], np.eye(3))],
                [
                    Mount(f"m{i}", p, "skid", stiffness=[0, 0, 1e6])
                    for i, p in enumerate([[1, 1, 0], [1, -1, 0], [-1, 0, 0]])
                ],
            ),
            r"rigid-body mechanism: 'skid' moves freely",
        ),
        (
            lambda: space_model(
                [RigidBody("skid", 100.0, [0, 0, 0], np.eye(3))], [Mount("m", [0, 0, 0], "frame", stiffness=[1, 1, 1])]
            ),
            r"mount 'm': names 'frame', which is not a body",
        ),
    ],
)
def test_bad_models_are_refused_in_words(build, message):
    with pytest.raises(R.InputValueError, match=message):
        build()


def test_soil_vertical_damping_agrees_with_lysmers_analog():
    # Richart's D = 0.425 / sqrt(B) with c = 2 D sqrt(k m) equals Lysmer's analog dashpot
    # 3.4 r0^2 sqrt(rho G) / (1 - nu) exactly (both from memory; two published forms of one result).
    g, nu, rho, r0, m = 60e6, 0.33, 1900.0, 2.2, 150e3
    footing = footing_impedance(g, nu, rho, m, 2e5, 3e5, 2.5e5, radius=r0)
    assert_allclose(footing.z.stiffness, 4 * g * r0 / (1 - nu), rtol=1e-12)
    assert_allclose(footing.z.damping, 3.4 * r0**2 * math.sqrt(rho * g) / (1 - nu), rtol=1e-12)


def test_rectangular_footing_takes_equivalent_radii():
    # Equal area for translations, equal second moment for rocking, equal polar moment for torsion
    # (Richart, Hall & Woods 1970; from memory); a square footing of side s: r0 = s / sqrt(pi) etc.
    s = 3.0
    footing = footing_impedance(50e6, 0.3, 1800.0, 1e5, 1e5, 1e5, 1e5, width_x=s, width_y=s)
    assert_allclose(footing.z.radius, s / math.sqrt(math.pi), rtol=1e-12)
    assert_allclose(footing.rx.radius, (s**4 / (3 * math.pi)) ** 0.25, rtol=1e-12)
    assert_allclose(footing.rz.radius, (s**4 / (3 * math.pi)) ** 0.25, rtol=1e-12)  # s^2 (2 s^2) / (6 pi)
    with pytest.raises(R.InputValueError, match="poisson_ratio"):
        footing_impedance(50e6, 0.5, 1800.0, 1e5, 1e5, 1e5, 1e5, radius=1.0)
    with pytest.raises(R.InputValueError, match="either radius or both"):
        footing_impedance(50e6, 0.3, 1800.0, 1e5, 1e5, 1e5, 1e5)


def test_block_on_soil_vertical_mode():
    # The soil as a mount under the block: the vertical mode is sqrt(kz / m) / 2 pi with the radiation
    # damping ratio D (a single degree of freedom; the footing's motions decouple for a mount under the CG
    # only vertically and in torsion).
    m = 150e3
    block = RigidBody("block", m, [0, 0, 0.75], box_inertia(m, 5.0, 4.0, 1.5))
    footing = footing_impedance(60e6, 0.33, 1900.0, m, 3e5, 4e5, 5e5, width_x=5.0, width_y=4.0)
    modes = space_modes(space_model([block], [soil_mount(footing, "block", [0, 0, 0])]))
    vertical = next(md for md in modes if md.shares["block.z"] > 0.999)
    wn = math.sqrt(footing.z.stiffness / m)
    zeta = footing.z.damping_ratio
    assert_allclose(vertical.frequency, wn / (2 * math.pi), rtol=1e-9)
    assert_allclose(vertical.damping_ratio, zeta, rtol=1e-9)


# --- steel frames ------------------------------------------------------------------------------------------

E, G, RHO = 210e9, 81e9, 7850.0  # steel
BW, BH = 0.10, 0.05  # solid rectangle, sides along local y and z [m]
AREA, IY, IZ = BW * BH, BW * BH**3 / 12, BH * BW**3 / 12  # IY about local y (bending in x-z), IZ about local z
J = 0.229 * BW * BH**3  # St Venant's torsion constant, b/t = 2 (Roark table 10.7, from memory)


def _cantilever(length=2.0, elements=12):
    from resonance.kinds.space.bodies import FrameNode
    from resonance.kinds.space.frame import Beam

    nodes = [FrameNode(f"n{i}", [length * i / elements, 0.0, 0.0]) for i in range(elements + 1)]
    beams = [Beam(f"b{i}", f"n{i}", f"n{i + 1}", E, G, RHO, AREA, IY, IZ, J) for i in range(elements)]
    return space_model([], [], nodes, beams, fixed=["n0"])


def test_frame_cantilever_against_blevins():
    # Blevins, Formulas for Natural Frequency and Mode Shape, table 8-1: f1 = 1.87510^2 / (2 pi L^2)
    # sqrt(E I / (rho A)) in each principal plane; axial f = (1 / 4L) sqrt(E / rho); torsion of a fixed-free
    # bar f = (1 / 4L) sqrt(G J / (rho Ip)), Ip = Iy + Iz (Blevins table 8-19, from memory).
    length = 2.0
    modes = space_modes(_cantilever(length))
    f = np.array([m.frequency for m in modes])
    lam = 1.87510407
    for second in (IY, IZ):
        expected = lam**2 / (2 * math.pi * length**2) * math.sqrt(E * second / (RHO * AREA))
        assert np.min(np.abs(f - expected)) / expected < 1e-4
    axial = math.sqrt(E / RHO) / (4 * length)
    torsion = math.sqrt(G * J / (RHO * (IY + IZ))) / (4 * length)
    assert np.min(np.abs(f - axial)) / axial < 1e-3
    assert np.min(np.abs(f - torsion)) / torsion < 1e-3


def test_portal_frame_sway_with_a_machine_on_it():
    # Two columns of height h clamped at the base, a stiff girder, a machine of mass M fixed on the girder's
    # middle at its level: sway stiffness 2 x 12 E I / h^3 (columns fixed at both ends), f = sqrt(k / M) / 2 pi
    # (hand statics), the moving mass being the machine, the girder and 13/35 of each column (Rayleigh with
    # the fixed-guided static deflection shape; Blevins, table 8-1, from memory).
    from resonance.kinds.space.bodies import FrameNode
    from resonance.kinds.space.frame import Beam

    h, span, mass = 1.5, 2.0, 3000.0
    nodes = [
        FrameNode("foot L", [0, 0, 0]),
        FrameNode("top L", [0, 0, h]),
        FrameNode("mid", [span / 2, 0, h]),
        FrameNode("top R", [span, 0, h]),
        FrameNode("foot R", [span, 0, 0]),
    ]
    column = {
        "youngs_modulus": E,
        "shear_modulus": G,
        "density": RHO,
        "area": AREA,
        "iy": IY,
        "iz": IZ,
        "torsion_constant": J,
    }
    girder = {**column, "iy": IY * 1e4, "iz": IZ * 1e4, "torsion_constant": J * 1e4}
    beams = [
        Beam("column L", "foot L", "top L", up=np.array([1.0, 0, 0]), **column),
        Beam("column R", "foot R", "top R", up=np.array([1.0, 0, 0]), **column),
        Beam("girder 1", "top L", "mid", **girder),
        Beam("girder 2", "mid", "top R", **girder),
    ]
    machine = RigidBody("machine", mass, [span / 2, 0, h], box_inertia(mass, 1.0, 0.8, 0.6))
    model = space_model([machine], [], nodes, beams, attached={"machine": "mid"}, fixed=["foot L", "foot R"])
    # Columns bend about local z (up = global x makes local y = x-ish): sway in x uses the I about the axis
    # normal to the frame's plane; with up = x, local y = up x axis = x x z = -y, so sway in x bends about y.
    second = IY
    moving = mass + RHO * AREA * span + 2 * 13 / 35 * RHO * AREA * h
    expected = math.sqrt(2 * 12 * E * second / h**3 / moving) / (2 * math.pi)
    sway = next(m for m in space_modes(model) if m.shares["mid.x"] > 0.5)
    assert sway.frequency == pytest.approx(expected, rel=1e-3)
    assert sway.words.startswith("machine: sliding in x")  # the node is named by the body it carries


def _frame_case(fixed=("a",), beam_end="b"):
    from resonance.kinds.space.bodies import FrameNode
    from resonance.kinds.space.frame import Beam

    nodes = [FrameNode("a", [0, 0, 0]), FrameNode("b", [1, 0, 0])]
    beam = Beam("tube", "a", beam_end, E, G, RHO, AREA, IY, IZ, J)
    return space_model([], [], nodes, [beam], fixed=list(fixed))


@pytest.mark.parametrize(
    ("build", "message"),
    [
        (lambda: _frame_case(fixed=("z",)), r"fixed: 'z' is not a frame node"),
        (lambda: _frame_case(beam_end="c"), r"beam 'tube': names 'c', which is not a node"),
        (lambda: _frame_case(fixed=()), r"rigid-body mechanism: '[ab]' moves freely"),
        (lambda: _frame_case(fixed=("a", "b")), r"fixed: every node is held"),
    ],
)
def test_bad_frames_are_refused_in_words(build, message):
    with pytest.raises(R.InputValueError, match=message):
        build()


def test_frame_element_in_a_plane_equals_the_rotors_beam_element():
    # With no shear deformation (phi = 0) the rotor's Timoshenko element is the Euler-Bernoulli beam: the frame
    # element's bending blocks in each principal plane must equal it (x-z with the rotation's sign flipped,
    # a right-handed rotation about y lowering w; Przemieniecki ch. 5).
    from resonance.kinds.rotor.elements import beam_stiffness, beam_translational_mass
    from resonance.kinds.space.frame import Beam, beam_matrices

    length = 0.4
    beam = Beam("b", "a", "c", E, G, RHO, AREA, IY, IZ, J)
    k, m = beam_matrices(beam, np.zeros(3), np.array([length, 0.0, 0.0]))
    xy = [1, 5, 7, 11]
    xz = [2, 4, 8, 10]
    flip = np.diag([1.0, -1.0, 1.0, -1.0])
    assert_allclose(k[np.ix_(xy, xy)], beam_stiffness(E * IZ, length, 0.0), rtol=1e-12)
    assert_allclose(m[np.ix_(xy, xy)], beam_translational_mass(RHO * AREA, length, 0.0), rtol=1e-12, atol=1e-15)
    assert_allclose(flip @ k[np.ix_(xz, xz)] @ flip, beam_stiffness(E * IY, length, 0.0), rtol=1e-12)
    assert_allclose(
        flip @ m[np.ix_(xz, xz)] @ flip, beam_translational_mass(RHO * AREA, length, 0.0), rtol=1e-12, atol=1e-15
    )


def test_the_unbalance_turns_with_the_rotor_and_sits_along_e1_at_time_zero():
    # One body on an isotropic mount at its centre of gravity, a shaft along +z: below resonance the centre
    # moves in phase with the force U w^2 / (k - m w^2) (Rao, Mechanical Vibrations, 6th ed., sec. 3.7), the
    # orbit turns counterclockwise seen from +z, with the rotor (synchronous forward whirl of a Jeffcott rotor
    # on isotropic supports: Vance, Rotordynamics of Turbomachinery, 1988, ch. 2, from memory).
    m, k, u_me = 500.0, 4e7, 0.002
    body = RigidBody("rotor", m, [0, 0, 0], box_inertia(m, 1.0, 1.0, 1.0))
    mount = Mount("bearing", [0, 0, 0], "rotor", stiffness=[k, k, k], rotational_stiffness=[1e7] * 3)
    model = space_model([body], [mount])
    f = np.array([10.0, 20.0])  # below sqrt(k / m) / 2 pi = 45 Hz
    load = rotating_unbalance("rotor", [0, 0, 0], [0, 0, 1], u_me, f)
    u = space_response(model, [load], f, [("rotor", [0, 0, 0])])[:, 0, :]
    w = 2 * math.pi * f
    e1, e2 = unbalance_reference([0, 0, 1])
    assert_allclose(e1, [0, 1, 0], atol=1e-15)
    assert_allclose(e2, [-1, 0, 0], atol=1e-15)
    for i, wi in enumerate(w):
        t = np.linspace(0.0, 2 * math.pi / wi, 9)[:-1]
        x = np.real(u[i, 0] * np.exp(1j * wi * t))
        y = np.real(u[i, 1] * np.exp(1j * wi * t))
        radius = u_me * wi**2 / (k - m * wi**2)
        # t = 0: along e1 (+y); a quarter turn later along e2 (-x): the right-handed sense about +z.
        assert_allclose([x[0], y[0]], radius * e1[:2], atol=1e-12 * radius)
        assert_allclose([x[2], y[2]], radius * e2[:2], atol=1e-12 * radius)
        assert np.all(x * np.gradient(y) - y * np.gradient(x) > 0)  # counterclockwise seen from +z


def test_a_rectangular_footing_slides_more_stiffly_across_its_long_side():
    # Gazetas (1991), J. Geotech. Eng. 117(9), table 1, surface footings (from memory): across the long side
    # K_y = 2 G L (2 + 2.5 chi^0.85) / (2 - nu), along it K_x = K_y - 0.2 G L (1 - B / L) / (0.75 - nu),
    # chi = B / L. Checks: a square gives one value, within 1 % of Gazetas' circle of equal area 8 G r / (2 - nu);
    # the long side along x or along y swaps the two; the footing impedance uses them.
    from resonance.kinds.space.soil import footing_impedance, rectangular_sliding_stiffness

    g, nu = 70e6, 0.33
    kx, ky = rectangular_sliding_stiffness(g, nu, 4.0, 4.0)
    assert kx == ky
    assert_allclose(kx, 8 * g * math.sqrt(16 / math.pi) / (2 - nu), rtol=1e-2)
    along, across = rectangular_sliding_stiffness(g, nu, 5.0, 3.6)
    lateral = 2 * g * 2.5 * (2 + 2.5 * (1.8 / 2.5) ** 0.85) / (2 - nu)
    assert_allclose(across, lateral, rtol=1e-12)
    assert_allclose(along, lateral - 0.2 * g * 2.5 * (1 - 1.8 / 2.5) / (0.75 - nu), rtol=1e-12)
    assert across > along
    assert rectangular_sliding_stiffness(g, nu, 3.6, 5.0) == (across, along)
    footing = footing_impedance(g, nu, 1900.0, 5e4, 4e4, 6e4, 8e4, width_x=5.0, width_y=3.6)
    assert_allclose([footing.x.stiffness, footing.y.stiffness], [along, across], rtol=1e-12)  # no embedment
