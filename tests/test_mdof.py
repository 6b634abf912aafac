"""Matrix models, modes and receptance against closed forms and reference libraries.

Sources: closed-form eigenvalues of a 2x2 pencil (quadratic formula); the
fixed-free chain of n equal masses and springs, w_r = 2 sqrt(k/m)
sin((2r - 1) pi / (2 (2n + 1))) (L. Meirovitch, *Elements of Vibration
Analysis*, 2nd ed., 1986, sec. 4.x; from memory, checked here against
scipy.linalg.eigh of the same matrices too); Rayleigh damping zeta(w) =
alpha / (2 w) + beta w / 2 (Clough & Penzien, *Dynamics of Structures*, 2nd ed.,
1993, eq. 12-20); python-control's state-space frequency response for general
damping; scipy.linalg.eig of the textbook first-order form.
"""

import math

import control
import numpy as np
import pytest
import scipy.linalg
from hypothesis import given, settings
from hypothesis import strategies as st
from numpy.testing import assert_allclose

import resonance as R


def chain(n, m=100.0, k=1.0e6, c=None):
    return R.chain_model([m] * n, [k] * n, None if c is None else [c] * n)


def test_two_dof_closed_form():
    # det(K - w^2 M) = 0 for M = diag(m1, m2), K = [[k1 + k2, -k2], [-k2, k2]]: quadratic in w^2.
    m1, m2, k1, k2 = 800.0, 1200.0, 2.0e8, 5.0e7
    result = R.modes([[m1, 0], [0, m2]], [[k1 + k2, -k2], [-k2, k2]])
    a, b, c = m1 * m2, -(m1 * k2 + m2 * (k1 + k2)), k1 * k2
    w2 = np.array([(-b - math.sqrt(b * b - 4 * a * c)) / (2 * a), (-b + math.sqrt(b * b - 4 * a * c)) / (2 * a)])
    assert_allclose(result.frequency, np.sqrt(w2) / (2 * math.pi), rtol=1e-13)
    # Mass-normalized shapes: Phi^T M Phi = I (Rao sec. 6.10).
    phi = result.shapes
    assert_allclose(phi.T @ np.diag([m1, m2]) @ phi, np.eye(2), atol=1e-14)


@pytest.mark.parametrize("n", [3, 10])
def test_equal_chain_closed_form(n):
    # Fixed-free chain: w_r = 2 sqrt(k/m) sin((2r - 1) pi / (2 (2n + 1))) (Meirovitch, from memory).
    m, k = 50.0, 3.0e6
    result = R.modes(chain(n, m, k).mass, chain(n, m, k).stiffness)
    r = np.arange(1, n + 1)
    expected = 2 * math.sqrt(k / m) * np.sin((2 * r - 1) * math.pi / (2 * (2 * n + 1))) / (2 * math.pi)
    assert_allclose(result.frequency, expected, rtol=1e-12)


def test_lumped_builder_machine_on_skid_on_foundation():
    # The builder's matrices equal the hand-assembled ones (stiffness method, Rao sec. 5.x).
    model = R.lumped_model(
        {"machine": 1500.0, "skid": 900.0, "foundation": 20000.0},
        [
            R.Spring("machine", "skid", 8.0e7, 2.0e3),
            R.Spring("skid", "foundation", 3.0e8, 5.0e3),
            R.Spring("foundation", R.GROUND, 1.5e9, 4.0e5),
        ],
    )
    assert_allclose(
        model.stiffness,
        [[8.0e7, -8.0e7, 0.0], [-8.0e7, 3.8e8, -3.0e8], [0.0, -3.0e8, 1.8e9]],
    )
    assert_allclose(model.damping, [[2e3, -2e3, 0], [-2e3, 7e3, -5e3], [0, -5e3, 4.05e5]])
    assert model.labels == ("machine", "skid", "foundation")
    assert model.dof("skid") == 1


def test_rayleigh_damping_ratios():
    # zeta_r = alpha / (2 w_r) + beta w_r / 2 (Clough & Penzien eq. 12-20); coefficients hit both targets.
    model = chain(6, 80.0, 2.0e6)
    undamped = R.modes(model.mass, model.stiffness)
    alpha, beta = R.rayleigh_coefficients(undamped.frequency[0], 0.02, undamped.frequency[3], 0.05)
    damped = R.modes(model.mass, model.stiffness, R.rayleigh_damping(model.mass, model.stiffness, alpha, beta))
    w = 2 * math.pi * undamped.frequency
    assert damped.proportional
    assert_allclose(damped.damping_ratio, alpha / (2 * w) + beta * w / 2, rtol=1e-10)
    assert_allclose(damped.damping_ratio[[0, 3]], [0.02, 0.05], rtol=1e-10)


def test_modal_damping_gives_the_requested_ratios():
    # C = M Phi diag(2 zeta w) Phi^T M decouples with the given ratios (Clough & Penzien sec. 12-5).
    model = chain(5)
    ratios = [0.01, 0.02, 0.03, 0.04, 0.05]
    result = R.modes(model.mass, model.stiffness, R.modal_damping(model.mass, model.stiffness, ratios))
    assert result.proportional
    assert_allclose(result.damping_ratio, ratios, rtol=1e-10)


def test_general_damping_eigenvalues_match_first_order_form():
    # Reference: scipy.linalg.eig of the textbook first-order matrix [[0, I], [-M^-1 K, -M^-1 C]]
    # (Friswell et al., Dynamics of Rotating Machines, 2010, sec. 2.5).
    rng = np.random.default_rng(7)
    n = 8
    model = R.chain_model(rng.uniform(50, 150, n), rng.uniform(1e6, 5e6, n), rng.uniform(0, 3000, n))
    result = R.modal_properties(model)
    assert not result.proportional
    minv = np.linalg.inv(model.mass)
    a = np.block([[np.zeros((n, n)), np.eye(n)], [-minv @ model.stiffness, -minv @ model.damping]])
    lam = scipy.linalg.eigvals(a)
    lam = lam[lam.imag > 0]
    lam = lam[np.argsort(np.abs(lam))]
    assert_allclose(result.frequency, np.abs(lam) / (2 * math.pi), rtol=1e-10)
    assert_allclose(result.damping_ratio, -lam.real / np.abs(lam), rtol=1e-8)
    assert_allclose(result.damped_frequency, lam.imag / (2 * math.pi), rtol=1e-10)
    # Each complex shape satisfies (lambda^2 M + lambda C + K) u = 0.
    for r in range(n):
        lr, u = result.eigenvalues[r], result.shapes[:, r]
        residual = (lr**2 * model.mass + lr * model.damping + model.stiffness) @ u
        assert np.linalg.norm(residual) <= 1e-8 * np.linalg.norm(model.stiffness) * np.linalg.norm(u)


def test_log_decrement_relation():
    # delta = 2 pi zeta / sqrt(1 - zeta^2) (Rao eq. 2.85); zeta = 0.1 -> 0.6315 (Rao table, from memory).
    assert_allclose(R.log_decrement([0.1]), [2 * math.pi * 0.1 / math.sqrt(0.99)], rtol=1e-15)
    assert_allclose(R.log_decrement([0.1]), [0.6315], rtol=5e-4)
    assert_allclose(R.damping_ratio_from_log_decrement(R.log_decrement([0.03, 0.3])), [0.03, 0.3], rtol=1e-14)


def _random_general_chain(n, seed):
    rng = np.random.default_rng(seed)
    return R.chain_model(rng.uniform(50, 150, n), rng.uniform(1e6, 5e6, n), rng.uniform(50, 2000, n))


def _column_error(h, reference):
    return np.max(np.linalg.norm(h - reference, axis=1) / np.linalg.norm(reference, axis=1))


@pytest.mark.parametrize("n", [2, 10, 40])
def test_state_space_receptance_matches_python_control(n):
    # python-control's state-space frequency response of the same system (reference library).
    model = _random_general_chain(n, n)
    f = np.linspace(0.0, 1.3 * R.modal_properties(model).frequency.max(), 400)
    h = R.model_receptance(model, f, 0)
    minv = np.linalg.inv(model.mass)
    a = np.block([[np.zeros((n, n)), np.eye(n)], [-minv @ model.stiffness, -minv @ model.damping]])
    b = np.vstack([np.zeros((n, 1)), minv[:, [0]]])
    c = np.hstack([np.eye(n), np.zeros((n, n))])
    response = control.frequency_response(control.ss(a, b, c, np.zeros((n, 1))), 2 * np.pi * f)
    reference = np.asarray(response.complex).reshape(n, -1).T
    assert _column_error(h, reference) < 1e-9


@pytest.mark.parametrize("n", [3, 25])
def test_modal_superposition_equals_direct_solve_for_proportional_damping(n):
    model = chain(n)
    model = R.matrix_model(model.mass, model.stiffness, R.rayleigh_damping(model.mass, model.stiffness, 0.5, 2e-5))
    f = np.linspace(0.0, 40.0, 300)
    direct = R.model_receptance(model, f, n - 1, "direct")
    # Direct solve of (K - w^2 M + i w C) x = e_j, the definition (Ewins eq. 2.59).
    assert _column_error(R.model_receptance(model, f, n - 1, "modal"), direct) < 1e-10
    assert _column_error(R.model_receptance(model, f, n - 1, "state-space"), direct) < 1e-10


def test_receptance_reciprocity_and_sdof_limit():
    # Maxwell reciprocity H_ij = H_ji (Ewins sec. 2.3); a 1-DOF model equals the SDOF formula.
    model = _random_general_chain(6, 3)
    f = np.linspace(1.0, 30.0, 50)
    h2 = R.model_receptance(model, f, 2)
    h4 = R.model_receptance(model, f, 4)
    assert_allclose(h2[:, 4], h4[:, 2], rtol=1e-9)
    single = R.receptance([[250.0]], [[4e7]], [[800.0]], f, 0)
    assert_allclose(single[:, 0], R.sdof_receptance(250.0, 4e7, 800.0, f), rtol=1e-12)


def test_mobility_and_accelerance():
    # Mobility = i w H, accelerance = -w^2 H (Ewins sec. 2.x).
    m, k, c = np.eye(2) * 10.0, [[2e5, -1e5], [-1e5, 1e5]], [[30.0, -10.0], [-10.0, 10.0]]
    f = np.array([5.0, 20.0])
    w = 2 * np.pi * f[:, None]
    h = R.receptance(m, k, c, f, 1)
    assert_allclose(R.mobility(m, k, c, f, 1), 1j * w * h, rtol=1e-15)
    assert_allclose(R.accelerance(m, k, c, f, 1), -(w**2) * h, rtol=1e-15)


@settings(max_examples=25, deadline=None)
@given(seed=st.integers(0, 10_000), n=st.integers(2, 7))
def test_modes_invariant_to_dof_ordering(seed, n):
    # Property: renumbering the degrees of freedom does not change frequencies or damping.
    model = _random_general_chain(n, seed)
    p = np.random.default_rng(seed + 1).permutation(n)
    a = R.modal_properties(model)
    b = R.modes(model.mass[np.ix_(p, p)], model.stiffness[np.ix_(p, p)], model.damping[np.ix_(p, p)])
    assert_allclose(b.frequency, a.frequency, rtol=1e-9)
    assert_allclose(b.damping_ratio, a.damping_ratio, rtol=1e-6, atol=1e-12)


def test_rigid_body_mode_of_free_system():
    # A free-free 2-mass system has a 0 Hz rigid-body mode and w^2 = k (1/m1 + 1/m2) (Rao sec. 5.x).
    result = R.modes(np.diag([2.0, 3.0]), [[6.0, -6.0], [-6.0, 6.0]])
    assert_allclose(result.frequency, [0.0, math.sqrt(6 * (1 / 2 + 1 / 3)) / (2 * math.pi)], atol=1e-12)
    assert [m.label for m in result.to_modes()] == ["mode 2"]


@pytest.mark.parametrize(
    ("call", "error", "message"),
    [
        (
            lambda: R.modes([[1.0, 0], [0, -1.0]], np.eye(2)),
            R.InputValueError,
            r"mass_matrix: is not positive definite",
        ),
        (
            lambda: R.modes(np.eye(2), [[1.0, 2.0], [0.0, 1.0]]),
            R.InputValueError,
            r"stiffness_matrix: the matrix is not symmetric",
        ),
        (
            lambda: R.modes(np.eye(2), [[1.0, 2.0], [2.0, 1.0]]),
            R.InputValueError,
            r"stiffness_matrix: has a negative eigenvalue",
        ),
        (
            lambda: R.modes(np.eye(2), np.eye(3)),
            R.InputValueError,
            r"stiffness_matrix: got shape \(3, 3\); expected \(2, 2\)",
        ),
        (
            lambda: R.modes(np.eye(2), np.eye(2), -np.eye(2)),
            R.InputValueError,
            r"damping_matrix: has a negative eigenvalue",
        ),
        (
            lambda: R.receptance(np.eye(2), np.eye(2), None, [1.0], 2),
            R.InputValueError,
            r"input_dof: got 2; expected an index 0\.\.1",
        ),
        (lambda: R.receptance(np.eye(2), np.eye(2), None, [1.0], 0, "fast"), ValueError, r"method: got 'fast'"),
        (lambda: R.modes(np.eye(2) * math.nan, np.eye(2)), R.InputValueError, r"mass_matrix: got nan kg"),
        (
            lambda: R.lumped_model({"a": 1.0}, [R.Spring("a", "b", 1.0)]),
            R.InputValueError,
            r"springs\[0\]: joins 'b', which is not a mass",
        ),
        (lambda: R.chain_model([1.0, 1.0], [1.0]), R.InputValueError, r"expected 2, one per mass"),
        (
            lambda: R.modal_damping(np.eye(3), np.eye(3), [0.1, 0.2]),
            R.InputValueError,
            r"damping_ratios: got 2 ratios; expected 1 or 3",
        ),
    ],
)
def test_bad_matrices(call, error, message):
    with pytest.raises(error, match=message):
        call()
