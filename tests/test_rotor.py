"""Rotor-bearing finite elements against closed forms.

Sources (each named again beside its check):
- Jeffcott rotor: disc at midspan of a massless shaft, w = sqrt(k / m), with
  k from the midspan deflection P L^3 / (48 E I) + P L / (4 kappa G A)
  (Timoshenko & Gere, *Mechanics of Materials*; shear term from Timoshenko beam
  theory) and supports in series; unbalance response X = U W^2 / (k - m W^2)
  (Jeffcott 1919; Rao, *Mechanical Vibrations*, 6th ed., sec. 3.7).
- Uniform beams (Blevins, *Formulas for Natural Frequency and Mode Shape*,
  1979, table 8-1): simply supported beta L = i pi; cantilever 1.87510,
  4.69409, 7.85476; free-free 4.73004, 7.85320, 10.99561.
- Timoshenko simply supported beam frequency equation
  (rho^2 I / (kappa G)) w^4 - (rho A + rho I k^2 (1 + E / (kappa G))) w^2 + E I k^4 = 0,
  k = i pi / L (Timoshenko 1921; S. M. Han, H. Benaroya and T. Wei, J. Sound
  Vib. 225(5), 1999; from memory).
- Disc on a cantilever with gyroscopic moments: det(K - w^2 diag(m, I_d) +
  w W diag(0, I_p)) = 0 with K the inverse of the tip flexibility
  [[L^3/(3EI) + L/(kappa G A), L^2/(2EI)], [L^2/(2EI), L/(EI)]] (Friswell et al.,
  *Dynamics of Rotating Machines*, 2010, sec. 3.5, derived the same way; tip
  flexibility from Timoshenko & Gere).
- Cross-coupled stiffness q destabilizes the forward mode of a Jeffcott rotor
  when q > c w_n (derived in the test from m z'' + c z' + (k - i q) z = 0;
  Friswell et al. 2010 sec. 5.x, from memory).
- Rigid rotor bouncing on two springs: w = sqrt(2 k / M) (common practice).
"""

import math

import numpy as np
import pytest
from numpy.testing import assert_allclose

from resonance.core.errors import InputValueError
from resonance.kinds.rotor import (
    STEEL,
    Bearing,
    Disc,
    Material,
    Pedestal,
    ShaftSection,
    Unbalance,
    campbell,
    critical_speed_map,
    critical_speeds,
    rotor_model,
    rotor_modes,
    unbalance_response_rotor,
)
from resonance.kinds.rotor.elements import shear_coefficient

E, G, RHO = STEEL.youngs_modulus, STEEL.shear_modulus, STEEL.density
RIGID = 1e14  # N/m: a support far stiffer than any shaft here
LIGHT = Material(1e-4, STEEL.youngs_modulus, STEEL.poisson_ratio, "massless steel")


def section_props(d):
    return math.pi * d**4 / 64, math.pi * d**2 / 4, shear_coefficient(d, 0.0, STEEL.poisson_ratio)


def uniform(length, d, elements, bearings, material=STEEL):
    return rotor_model([ShaftSection(length, d, material=material, elements=elements)], [], bearings)


def test_jeffcott_rigid_and_flexible_supports():
    L, d, m = 0.8, 0.04, 60.0
    i, a, kappa = section_props(d)
    k_shaft = 1.0 / (L**3 / (48 * E * i) + L / (4 * kappa * G * a))  # Timoshenko & Gere, with shear
    for kb in (RIGID, 2.0e6):
        k = 1.0 / (1.0 / k_shaft + 1.0 / (2.0 * kb))  # supports in series with the shaft
        rotor = rotor_model(
            [ShaftSection(L / 2, d, material=LIGHT, elements=4)] * 2,
            [Disc(1, m, 0.2, 0.1)],
            [Bearing(0, kb, kb), Bearing(2, kb, kb)],
        )
        modes = rotor_modes(rotor, 0.0, count=2, reduced=False)
        assert_allclose(modes.frequency, [math.sqrt(k / m) / (2 * math.pi)] * 2, rtol=1e-5)
        # The midspan disc does not tilt in this mode: the 1x critical is 60 fn whatever the spin.
        data = campbell(
            rotor, np.linspace(0.0, 1.5 * 60 * math.sqrt(k / m) / (2 * math.pi), 30), count=4, reduced=False
        )
        (critical,) = critical_speeds(rotor, data, orders=(1.0,))
        assert_allclose(critical.speed, 60 * math.sqrt(k / m) / (2 * math.pi), rtol=1e-5)
        # Undamped unbalance response away from resonance: X = U W^2 / (k - m W^2) (Rao sec. 3.7).
        speeds = np.array([0.5, 2.0]) * critical.speed
        response = unbalance_response_rotor(rotor, [Unbalance(1, 1e-3)], speeds, [1])
        w = 2 * math.pi * speeds / 60
        assert_allclose(np.abs(response.x[:, 0]), np.abs(1e-3 * w**2 / (k - m * w**2)), rtol=1e-5)
        assert_allclose(response.major_pk_pk[:, 0], 2 * np.abs(response.x[:, 0]), rtol=1e-9)  # circular orbit


@pytest.mark.parametrize(("elements", "rtol"), [(4, 2e-2), (8, 5e-3), (16, 5e-3)])
def test_simply_supported_shaft_converges_to_euler_bernoulli(elements, rtol):
    # Blevins table 8-1: beta_i L = i pi; slender shaft (L/d = 100), so shear and rotary inertia
    # lower the FE frequencies below Euler-Bernoulli by well under 0.5 %.
    L, d = 2.0, 0.02
    i, a, _ = section_props(d)
    rotor = uniform(L, d, elements, [Bearing(0, RIGID, RIGID), Bearing(1, RIGID, RIGID)])
    f = rotor_modes(rotor, 0.0, count=6, reduced=False).frequency[::2]
    expected = (np.arange(1, 4) * math.pi / L) ** 2 * math.sqrt(E * i / (RHO * a)) / (2 * math.pi)
    assert_allclose(f, expected, rtol=rtol)


def test_timoshenko_closed_form_slender_and_stubby():
    # Timoshenko SS frequency equation (from memory, see module notes): FE with 40 elements matches it
    # to 2e-4 slender and 2e-3 stubby; Euler-Bernoulli differs by > 25 % for the stubby shaft's 2nd mode.
    for L, d, tol in ((1.0, 0.05, 2e-4), (0.3, 0.1, 2e-3)):
        i, a, kappa = section_props(d)
        rotor = uniform(L, d, 40, [Bearing(0, RIGID, RIGID), Bearing(1, RIGID, RIGID)])
        f = rotor_modes(rotor, 0.0, count=6, reduced=False).frequency[::2]
        for n in range(3):
            k = (n + 1) * math.pi / L
            c4, c2, c0 = RHO**2 * i / (kappa * G), -(RHO * a + RHO * i * k**2 * (1 + E / (kappa * G))), E * i * k**4
            w = math.sqrt((-c2 - math.sqrt(c2**2 - 4 * c4 * c0)) / (2 * c4))
            assert_allclose(f[n], w / (2 * math.pi), rtol=tol)
        euler = (2 * math.pi / L) ** 2 * math.sqrt(E * i / (RHO * a)) / (2 * math.pi)
    assert f[1] < 0.75 * euler


def test_cantilever_and_free_free_beams():
    # Blevins table 8-1 (Euler-Bernoulli). Clamp: translation and tilt springs far stiffer than the
    # beam; L/d = 100 keeps shear and rotary inertia below the 0.3 % tolerance.
    L, d = 1.5, 0.015
    i, a, _ = section_props(d)
    scale = math.sqrt(E * i / (RHO * a * L**4)) / (2 * math.pi)
    clamped = uniform(L, d, 30, [Bearing(0, RIGID, RIGID, tilt_stiffness=RIGID)])
    f = rotor_modes(clamped, 0.0, count=6, reduced=False).frequency[::2]
    assert_allclose(f, np.array([1.87510, 4.69409, 7.85476]) ** 2 * scale, rtol=3e-3)
    free = uniform(L, d, 30, [Bearing(0, 1e-3, 1e-3), Bearing(1, 1e-3, 1e-3)])
    f = rotor_modes(free, 0.0, count=10, reduced=False).frequency
    flexible = f[f > 1.0][::2]
    assert_allclose(flexible[:3], np.array([4.73004, 7.85320, 10.99561]) ** 2 * scale, rtol=3e-3)


def test_gyroscopic_split_of_disc_on_cantilever():
    L, d, m, ip, id_ = 0.5, 0.03, 20.0, 0.4, 0.25
    i, a, kappa = section_props(d)
    flexibility = np.array(
        [[L**3 / (3 * E * i) + L / (kappa * G * a), L**2 / (2 * E * i)], [L**2 / (2 * E * i), L / (E * i)]]
    )
    k = np.linalg.inv(flexibility)
    rotor = rotor_model(
        [ShaftSection(L, d, material=LIGHT, elements=2)],
        [Disc(1, m, ip, id_)],
        [Bearing(0, RIGID, RIGID, tilt_stiffness=RIGID)],
    )
    previous_forward = None
    for speed in (0.0, 3000.0, 10000.0):
        spin = 2 * math.pi * speed / 60
        det = np.poly1d([-m, 0, k[0, 0]]) * np.poly1d([-id_, ip * spin, k[1, 1]]) - k[0, 1] ** 2
        roots = np.roots(det.coeffs).real
        forward = np.sort(roots[roots > 0]) / (2 * math.pi)
        backward = np.sort(-roots[roots < 0]) / (2 * math.pi)
        modes = rotor_modes(rotor, speed, count=4, reduced=False)
        got_f = (
            np.sort(modes.frequency[[w == "forward" for w in modes.whirl]]) if speed else np.sort(modes.frequency)[::2]
        )
        got_b = np.sort(modes.frequency[[w == "backward" for w in modes.whirl]]) if speed else got_f
        assert_allclose(got_f, forward, rtol=1e-4)
        assert_allclose(got_b, backward, rtol=1e-4)
        if speed:
            assert np.all(got_b < got_f)  # backward below forward for each pair
        if previous_forward is not None:
            assert np.all(got_f > previous_forward)  # gyroscopic stiffening of forward whirl
        previous_forward = got_f


def fan():
    """Invented demo: a between-bearings fan shaft with an overhung-free impeller at 1.2 m."""
    sections = [
        ShaftSection(0.2, 0.09, elements=4),
        ShaftSection(1.0, 0.11, elements=20),
        ShaftSection(0.6, 0.11, elements=12),
        ShaftSection(0.2, 0.09, elements=4),
    ]
    bearings = [Bearing(1, 3e8, 2e8, cxx=3e4, cyy=3e4, label="NDE"), Bearing(3, 3e8, 2e8, cxx=3e4, cyy=3e4, label="DE")]
    return rotor_model(sections, [Disc(2, 380.0, 38.0, 20.0, "impeller")], bearings)


def test_isotropic_supports_give_equal_planes():
    # Symmetry (common practice): with isotropic bearings at zero speed every frequency is doubled.
    rotor = rotor_model(
        [ShaftSection(1.0, 0.1, elements=10)],
        [Disc(1, 50.0, 2.0, 1.0)],
        [Bearing(0, 1e8, 1e8, cxx=1e3, cyy=1e3), Bearing(1, 1e8, 1e8, cxx=1e3, cyy=1e3)],
    )
    f = rotor_modes(rotor, 0.0, count=6, reduced=False).frequency
    assert_allclose(f[0::2], f[1::2], rtol=1e-8)


def test_reduced_basis_matches_full_model():
    rotor = fan()
    for speed in (0.0, 4000.0):
        full = rotor_modes(rotor, speed, count=6, reduced=False)
        reduced = rotor_modes(rotor, speed, count=6)
        # The Ritz basis (lowest modes plus static bearing shapes) keeps the lowest four to 1e-5.
        assert_allclose(reduced.frequency[:4], full.frequency[:4], rtol=1e-5)
        assert_allclose(reduced.damping_ratio[:4], full.damping_ratio[:4], rtol=1e-3, atol=1e-7)


def test_campbell_tracks_branches_and_critical_is_a_root():
    rotor = fan()
    data = campbell(rotor, np.linspace(0.0, 6000.0, 61), count=6)
    # Tracking: away from zero speed every tracked shape keeps its branch's whirl direction.
    from resonance.kinds.rotor.analysis import _whirl

    for i in range(6, 61):
        assert _whirl(rotor, data.shapes[i]) == data.whirl
    criticals = critical_speeds(rotor, data, orders=(1.0,))
    assert criticals
    for c in criticals:
        assert c.whirl == "forward"
        assert not np.any(np.isclose(c.speed, data.speed, rtol=1e-6))  # root finding, not a grid speed
        at = rotor_modes(rotor, c.speed, count=8)
        assert np.min(np.abs(at.frequency - c.speed / 60)) < 1e-6 * c.frequency


def test_cross_coupling_instability_threshold():
    # m z'' + c z' + (k - i q) z = 0: the forward mode loses stability when q > c w_n (derived above).
    m, k, c = 100.0, 4e6, 400.0  # totals over both bearings
    wn = math.sqrt(k / m)
    for factor, unstable in ((0.8, False), (1.2, True)):
        q = factor * c * wn
        rotor = rotor_model(
            [ShaftSection(0.5, 0.2, material=LIGHT, elements=2)] * 2,
            [Disc(1, m, 1.0, 0.5)],
            [Bearing(s, k / 2, k / 2, kxy=q / 2, kyx=-q / 2, cxx=c / 2, cyy=c / 2) for s in (0, 2)],
        )
        modes = rotor_modes(rotor, 1000.0, count=2, reduced=False)
        forward = modes.whirl.index("forward")
        assert bool(modes.damping_ratio[forward] < 0) == unstable
        assert (forward in modes.unstable) == unstable
        assert bool(modes.log_decrement[forward] < 0) == unstable


def test_critical_speed_map_limits():
    # A symmetric rotor (uniform shaft, centred disc, bearings at the ends): bounce and rocking uncouple.
    rotor = rotor_model(
        [ShaftSection(0.8, 0.1, elements=8)] * 2,
        [Disc(1, 300.0, 20.0, 10.0)],
        [Bearing(0, 1e8, 1e8), Bearing(2, 1e8, 1e8)],
    )
    x = [rotor.dof(node, "x") for node in range(rotor.nodes)]
    total = float(rotor.mass[np.ix_(x, x)].sum())  # rigid translation: 1^T M 1 over the x translations
    stiffness = np.geomspace(1e4, 1e11, 15)
    ucs = critical_speed_map(rotor, stiffness, count=3)
    # Soft supports: the rotor bounces as a rigid body, w = sqrt(2 k / M) (common practice).
    assert_allclose(ucs.speed[0, 0], 60 * math.sqrt(2 * 1e4 / total) / (2 * math.pi), rtol=2e-3)
    assert np.all(np.diff(ucs.speed[:, 0]) > 0)  # criticals rise with support stiffness
    # Stiff supports: the first critical tends to the rotor on rigid pins.
    pinned = critical_speed_map(rotor, [1e14], count=1).speed[0, 0]
    assert_allclose(ucs.speed[-1, 0], pinned, rtol=2e-2)


def test_speed_dependent_bearings_and_pedestal():
    table = Bearing(1, [1e8, 3e8], [1e8, 3e8], speeds=[0.0, 6000.0], label="journal")
    rotor = rotor_model(
        [ShaftSection(0.5, 0.1, elements=2)] * 3,
        [Disc(2, 100.0, 2.0, 1.0)],
        [table, Bearing(2, 2e8, 2e8, pedestal=Pedestal(200.0, 5e8, 5e8))],
    )
    k, _ = table.coefficients(3000.0)
    assert_allclose(k, [[2e8, 0.0], [0.0, 2e8]])  # linear interpolation
    assert rotor.size == 4 * 7 + 2
    with pytest.raises(
        InputValueError, match=r"journal: speed 7000 rpm is outside its coefficient table \(0-6000 rpm\)"
    ):
        rotor_modes(rotor, 7000.0)


@pytest.mark.parametrize(
    ("call", "message"),
    [
        (
            lambda: rotor_model([ShaftSection(-1.0, 0.1)], [], [Bearing(0, 1e8, 1e8)]),
            r"^length: got -1 m; expected a value > 0",
        ),
        (
            lambda: rotor_model([ShaftSection(1.0, 0.0)], [], [Bearing(0, 1e8, 1e8)]),
            r"^outer_diameter: got 0 m; expected a value > 0",
        ),
        (
            lambda: rotor_model([ShaftSection(1.0, 0.1, 0.1)], [], [Bearing(0, 1e8, 1e8)]),
            r"inner_diameter: got 0\.1 m, not less than",
        ),
        (
            lambda: rotor_model([ShaftSection(1.0, 0.1)], [Disc(5, 1.0, 0.1, 0.1, "wheel")], [Bearing(0, 1e8, 1e8)]),
            r"discs\[0\] \(wheel\): station 5 does not exist",
        ),
        (
            lambda: rotor_model([ShaftSection(1.0, 0.1)], [], [Bearing(2, 1e8, 1e8, label="DE")]),
            r"bearings\[0\] \(DE\): station 2 does not exist",
        ),
        (lambda: rotor_model([ShaftSection(1.0, 0.1)], [], []), r"bearings: got none; a free-floating rotor"),
        (
            lambda: rotor_model([ShaftSection(1.0, 0.1)], [], [Bearing(0, [1.0, 2.0, 3.0], 1.0, speeds=[0.0, 100.0])]),
            r"bearings\[0\]\.kxx: got 3 values for 2 speeds",
        ),
        (
            lambda: rotor_model([ShaftSection(1.0, 0.1, elements=0)], [], [Bearing(0, 1e8, 1e8)]),
            r"sections\[0\]\.elements: got 0",
        ),
        (lambda: campbell(fan(), [100.0, 50.0]), r"speeds: expected at least 2 increasing"),
        (lambda: critical_speed_map(fan(), [-1.0]), r"stiffness: got -1 N/m; expected a value > 0"),
    ],
)
def test_bad_rotor_inputs(call, message):
    with pytest.raises(InputValueError, match=message):
        call()
