"""Field data: readers with validation, coast-down identification, impact-test FRFs and fits.

Sources: the "measured" data are synthesized from known systems with the
engine's receptance (checked against closed forms and scipy elsewhere); H1 =
S_fx / S_ff and coherence |S_fx|^2 / (S_ff S_xx) (Bendat & Piersol, Random
Data, 4th ed., sec. 9.1) checked against scipy.signal.csd / welch /
coherence as the reference library; the half-power AF (API RP 684, from
memory), the circle fit (Ewins, Modal Testing, 2nd ed., sec. 4.4, from
memory) and the rational-fraction fit (Richardson & Formenti 1982) are
checked against the known truth and against each other. Tolerances are
stated beside each check with the noise level.
"""

import math

import numpy as np
import pytest
import scipy.signal
from numpy.testing import assert_allclose

import resonance as R
from resonance.kinds.field.coastdown import find_resonances, fit_modes, measured_findings, measured_modes
from resonance.kinds.field.impact import circle_fit, h1_estimate, impact_frf, peak_pick, rfp_fit, stability_diagram
from resonance.kinds.field.readers import DataFileError, ImpactRecord, read_coastdown, read_impact

TRUTH_Z = 0.04  # modal damping of tools/make_field_data.py's invented machine


def two_mass(zeta=TRUTH_Z):
    base = R.lumped_model(
        {"housing": 900.0, "pedestal": 600.0},
        [R.Spring("pedestal", R.GROUND, 6.0e7), R.Spring("housing", "pedestal", 1.1e8)],
    )
    return R.matrix_model(base.mass, base.stiffness, R.modal_damping(base.mass, base.stiffness, zeta), base.labels)


TRUTH_F = tuple(R.modal_properties(two_mass()).frequency)  # 28.819 and 97.172 Hz


def write_coastdown(path, speed, x, *, header="speed_rpm,ch_amplitude,ch_phase", meta=True):
    lines = (
        ["# amplitude_unit = um", "# amplitude_convention = peak-to-peak", "# phase_convention = lag"] if meta else []
    )
    lines.append(header)
    lag = np.mod(np.degrees(-np.angle(x)), 360.0)
    lines += [f"{s:.1f},{2 * abs(v) * 1e6:.6f},{p:.4f}" for s, v, p in zip(speed, x, lag, strict=True)]
    path.write_text("\n".join(lines) + "\n")
    return path


def synthetic_coastdown(noise, seed=1, step=10.0):
    speed = np.arange(3600.0, 199.0, -step)
    w = 2 * math.pi * speed / 60
    x = R.model_receptance(two_mass(), speed / 60, 0)[:, 0] * 4e-3 * w**2
    rng = np.random.default_rng(seed)
    x = x + noise * np.abs(x).max() * (rng.standard_normal(x.size) + 1j * rng.standard_normal(x.size)) / math.sqrt(2)
    return speed, x


def test_reader_units_conventions_and_logged_repairs(tmp_path):
    speed, x = synthetic_coastdown(0.0)
    path = write_coastdown(tmp_path / "cd.csv", speed, x)
    before = path.read_bytes()
    data = read_coastdown(path)
    assert path.read_bytes() == before  # the user's file is never modified
    assert data.speed[0] < data.speed[-1]
    assert data.repairs == ("rows sorted by increasing speed (recorded as a coast-down)",)
    # A phase written wrapped to 0..360 deg (here a probe 200 deg round the shaft) is unwrapped, and said so.
    turned = read_coastdown(write_coastdown(tmp_path / "turned.csv", speed, x * np.exp(-1j * np.radians(200.0))))
    assert "phase of 'ch' unwrapped (jumps of 360 deg removed)" in turned.repairs
    shift = np.mod(turned.phase_lag("ch") - data.phase_lag("ch"), 2 * np.pi)
    assert_allclose(shift, np.radians(200.0), atol=1e-6)
    # pk-pk um in the file -> 0-peak m inside (pk-pk = 2 pk, ISO 2041); the lag convention is kept.
    assert_allclose(data.channel("ch"), x[::-1], rtol=1e-5)
    lead = read_coastdown(path, phase_convention="lead")
    assert_allclose(lead.phase_lag("ch")[100], -data.phase_lag("ch")[100] + 0, atol=1e-9)
    mils = read_coastdown(path, amplitude_unit="mil", amplitude_convention="rms")
    # The same numbers read as mil RMS: peak = v * 25.4 um * sqrt(2), against v * 1 um / 2 as um pk-pk.
    assert_allclose(mils.amplitude("ch"), data.amplitude("ch") * 25.4 * math.sqrt(2) * 2, rtol=1e-9)


HEAD = "# amplitude_unit = um\n# amplitude_convention = peak\nspeed_rpm,ch_amplitude,ch_phase\n"


@pytest.mark.parametrize(
    ("text", "message"),
    [
        ("", r"cd\.csv: has no header row and no data"),
        ("# amplitude_unit = um\nspeed_rpm,ch_amplitude,ch_phase\n", r"line 2: a header with no data rows after it"),
        (
            "# amplitude_unit = um\n# amplitude_convention = peak\nspeed_rpm,ch_amplitude\n100,1\n",
            r"channel 'ch': needs both",
        ),
        (
            "# amplitude_unit = um\n# amplitude_convention = peak\nspeed_rpm,ch_amplitude,ch_phase,notes\n100,1,2,x\n",
            r"column 'notes': expected '<channel>_amplitude'",
        ),
        (
            HEAD + "100,1,2\n110,abc,3\n",
            r"line 5, column 'ch_amplitude': got 'abc'; expected a number",
        ),
        (
            HEAD + "100,1,2\n110,nan,3\n",
            r"line 5, column 'ch_amplitude': got 'nan'; expected a finite number",
        ),
        (
            HEAD + "100,1,2\n110,1,2,4\n",
            r"line 5: has 4 columns; the header has 3",
        ),
        (
            HEAD + "100,1,2\n90,1,2\n100,1,3\n",
            r"lines 4 and 6: the same speed 100 rpm twice",
        ),
        ("# amplitude_convention = peak\nspeed_rpm,ch_amplitude,ch_phase\n100,1,2\n", r"amplitude_unit: not given"),
        (
            "# amplitude_unit = um/s\n# amplitude_convention = peak\nspeed_rpm,ch_amplitude,ch_phase\n100,1,2\n",
            r"amplitude_unit: got 'um/s'; expected a displacement unit",
        ),
        (
            "# amplitude_unit = um\n# amplitude_convention = pp\nspeed_rpm,ch_amplitude,ch_phase\n100,1,2\n",
            r"amplitude_convention: got 'pp'",
        ),
        (
            "# amplitude_unit = um\n# amplitude_convention = peak\nrpm,ch_amplitude,ch_phase\n100,1,2\n",
            r"expected exactly one 'speed_rpm'",
        ),
    ],
)
def test_reader_errors_name_file_line_and_column(tmp_path, text, message):
    path = tmp_path / "cd.csv"
    path.write_text(text)
    with pytest.raises(DataFileError, match=message):
        read_coastdown(path)


@pytest.mark.parametrize(("noise", "f_tol", "af_tol"), [(0.0, 2e-3, 0.02), (0.01, 3e-3, 0.05), (0.03, 5e-3, 0.15)])
def test_coastdown_resonance_and_af(tmp_path, noise, f_tol, af_tol):
    # Truth: the first mode of the invented machine (28.819 Hz, zeta 0.04); half-power AF of an
    # unbalance response ~ 1 / (2 zeta) = 12.5 for light damping (API RP 684, from memory).
    speed, x = synthetic_coastdown(noise)
    data = read_coastdown(write_coastdown(tmp_path / "cd.csv", speed, x))
    (res,) = [r for r in find_resonances(data, "ch") if r.confirmed]
    assert_allclose(res.speed, 60 * TRUTH_F[0], rtol=f_tol)
    assert_allclose(res.amplification_factor, 1 / (2 * TRUTH_Z), rtol=af_tol)
    assert res.phase_change > 60.0  # the lag rises through the resonance (90 deg at an isolated mode)


@pytest.mark.parametrize(("noise", "f_tol", "z_tol"), [(0.0, 1e-4, 2e-3), (0.01, 1e-3, 0.03), (0.03, 3e-3, 0.08)])
def test_modal_fit_recovers_frequency_and_damping(tmp_path, noise, f_tol, z_tol):
    speed, x = synthetic_coastdown(noise)
    data = read_coastdown(write_coastdown(tmp_path / "cd.csv", speed, x))
    fit = fit_modes(data, "ch", [(1700.0, 0.05)], band=(800.0, 3000.0))
    (mode,) = fit.modes
    assert_allclose(mode.frequency, TRUTH_F[0], rtol=f_tol)
    assert_allclose(mode.damping_ratio, TRUTH_Z, rtol=z_tol)
    if noise:
        assert abs(mode.frequency - TRUTH_F[0]) < 4 * mode.frequency_std + 1e-9  # the stated uncertainty covers it
        assert abs(mode.damping_ratio - TRUTH_Z) < 4 * mode.damping_ratio_std + 1e-9


def test_coarse_sweep_warns(tmp_path):
    speed, x = synthetic_coastdown(0.0, step=120.0)
    data = read_coastdown(write_coastdown(tmp_path / "cd.csv", speed, x))
    (res,) = [r for r in find_resonances(data, "ch") if r.confirmed]
    assert any("too coarse" in warning for warning in res.warnings)


def test_measured_findings_use_the_same_rules(tmp_path):
    speed, x = synthetic_coastdown(0.01)
    data = read_coastdown(write_coastdown(tmp_path / "cd.csv", speed, x))
    resonances = find_resonances(data, "ch")
    modes = measured_modes(resonances, fit_modes(data, "ch", [(1700.0, 0.05)], band=(800.0, 3000.0)))
    table = measured_findings(modes, [R.running_speed_order(1)], R.operating_range(900.0, 1500.0), R.FlatRule(15.0))
    (finding,) = table
    assert finding.mode.source == "measured"
    assert finding.mode.kind == "structural"
    assert finding.mode.af_source == "measured: half-power of the coast-down"
    assert_allclose(finding.margin, R.separation_margin(resonances[0].speed, 900.0, 1500.0), rtol=1e-12)
    assert finding.required_margin == 15.0  # a structural mode: the flat rule, whatever the AF
    # Measured on a shaft, the same resonance is a rotor lateral mode and the API rule applies (from memory).
    rotor = measured_modes(resonances, None, kind="rotor-lateral")
    (shaft,) = measured_findings(rotor, [R.running_speed_order(1)], R.operating_range(900.0, 1500.0))
    assert_allclose(shaft.required_margin, R.required_separation_margin(resonances[0].amplification_factor, "above"))


def simulate_impact(fs=512.0, length=4.0, hits=4, noise=0.0, seed=3):
    model = two_mass()
    n = int(fs * length)
    force = np.zeros(hits * n)
    for k in range(hits):
        start, samples = k * n + 20, int(0.006 * fs)
        force[start : start + samples] = 800.0 * np.sin(np.pi * np.arange(samples) / samples)
    f = np.fft.rfftfreq(force.size, 1 / fs)
    h = R.model_receptance(model, f, 0)[:, 0]
    response = np.fft.irfft(-((2 * np.pi * f) ** 2) * h * np.fft.rfft(force), n=force.size)
    rng = np.random.default_rng(seed)
    response = response + noise * np.abs(response).max() * rng.standard_normal(response.size)
    return ImpactRecord(fs, force, {"acc": response}, "acceleration", "simulated"), model


def test_h1_matches_the_exact_receptance():
    # Without an exponential window and with records long enough to decay, H1 of hammer hits is the
    # system's accelerance; compared with the engine's receptance times -w^2 (Ewins eq. 2.x).
    record, model = simulate_impact()
    frf = impact_frf(record, "acc", 4.0, exponential_tau=1e9)
    band = (frf.frequency > 5) & (frf.frequency < 150)
    exact = R.model_receptance(model, frf.frequency[band], 0)[:, 0]
    assert_allclose(frf.receptance()[band], exact, rtol=2e-3)
    assert frf.averages == 3
    assert np.all(frf.coherence[band] > 0.999)


def test_h1_and_coherence_match_scipy_signal():
    # Random force through the system plus output noise; segments with a Hann window, no overlap.
    rng = np.random.default_rng(5)
    fs, nper, segments = 256.0, 512, 40
    force = rng.standard_normal(nper * segments)
    f = np.fft.rfftfreq(force.size, 1 / fs)
    h = R.model_receptance(two_mass(), f, 0)[:, 0]
    response = np.fft.irfft(h * np.fft.rfft(force), n=force.size)
    response += 0.05 * response.std() * rng.standard_normal(response.size)
    window = np.hanning(nper + 1)[:-1]  # periodic Hann, as scipy's 'hann'
    fr = force.reshape(segments, nper) * window
    rr = response.reshape(segments, nper) * window
    _freq, h1, coherence = h1_estimate(fr, rr, fs)
    _, pff = scipy.signal.welch(force, fs, window="hann", nperseg=nper, noverlap=0, detrend=False)
    _, pfx = scipy.signal.csd(force, response, fs, window="hann", nperseg=nper, noverlap=0, detrend=False)
    _, coh = scipy.signal.coherence(force, response, fs, window="hann", nperseg=nper, noverlap=0, detrend=False)
    assert_allclose(h1[1:-1], (pfx / pff)[1:-1], rtol=1e-9)
    assert_allclose(coherence[1:-1], coh[1:-1], rtol=1e-9)


@pytest.mark.parametrize("noise", [0.0, 0.002])
def test_peak_pick_circle_fit_and_rfp_agree_with_truth(noise):
    record, _ = simulate_impact(noise=noise)
    frf = impact_frf(record, "acc", 4.0)  # exponential window tau = 1 s, removed from the damping
    for mode, band in ((0, (24.0, 34.0)), (1, (85.0, 110.0))):
        truth_f = TRUTH_F[mode]
        picks = [peak_pick(frf, band), circle_fit(frf, band)]
        rfp = min(rfp_fit(frf, (10.0, 150.0), 2), key=lambda p: abs(p.frequency - truth_f))
        # Peak picking is limited by the 0.25 Hz resolution and the neighbouring mode (1 %, 15 %);
        # the circle fit uses the band around the peak (0.6 %, 8 %); the RFP fit is the most sensitive to
        # noise in damping (0.4 %, 15 % at 0.2 % noise).
        for pole, f_tol, z_tol in ((picks[0], 1e-2, 0.15), (picks[1], 6e-3, 0.08), (rfp, 4e-3, 0.15)):
            assert_allclose(pole.frequency, truth_f, rtol=f_tol)
            assert_allclose(pole.damping_ratio, TRUTH_Z, rtol=z_tol)
        assert_allclose(picks[1].frequency, rfp.frequency, rtol=5e-3)  # the two fits agree with each other


def test_stability_diagram_keeps_the_true_poles():
    record, _ = simulate_impact()
    frf = impact_frf(record, "acc", 4.0)
    diagram, stable = stability_diagram(frf, (10.0, 150.0), max_modes=5, damping_tol=0.1)
    assert len(diagram) == 5
    for truth in TRUTH_F:
        assert any(abs(p.frequency - truth) < 0.01 * truth for p in stable)


def test_demo_files_read(tmp_path):
    from pathlib import Path

    data_dir = Path(__file__).resolve().parent.parent / "notebooks" / "data"
    data = read_coastdown(data_dir / "coastdown_fan.csv")
    assert "housing-X" in data.channels
    impact = read_impact(data_dir / "impact_fan.csv")
    assert impact.quantity == "acceleration"
    assert_allclose(impact.sample_rate, 1024.0, rtol=1e-3)
    bad = tmp_path / "imp.csv"
    # One dropped sample (0.3 s): the message names the line where the spacing breaks.
    bad.write_text("# response_unit = m/s**2\ntime_s,force,a\n0,1,2\n0.1,1,2\n0.2,1,2\n0.4,1,2\n0.5,1,2\n")
    with pytest.raises(
        DataFileError, match=r"imp\.csv: line 6, column 'time_s': the time step breaks here \(0\.2 s -> 0\.4 s"
    ):
        read_impact(bad)


def test_tuning_recovers_known_changes(foundation):
    # "Measured" frequencies from the same model with the mounting softened 20 % and the soil stiffened
    # 30 % (invented); tuning both from the design values must recover the factors (regression of a
    # least-squares update, Friswell & Mottershead 1995 ch. 5) with no mismatch left.
    from resonance.kinds.field.tuning import TuningParameter, apply_factors, tune_model

    truth = apply_factors(
        foundation.model, [TuningParameter("spring", "mounting"), TuningParameter("spring", "soil")], [0.8, 1.3]
    )
    measured = R.modal_properties(truth.build()).frequency
    tuned = tune_model(
        foundation.model, measured, [TuningParameter("spring", "mounting"), TuningParameter("spring", "soil")]
    )
    assert_allclose(list(tuned.factors.values()), [0.8, 1.3], rtol=1e-6)
    assert tuned.mismatch_after < 1e-6
    assert tuned.mismatch_before > 1.0
    # One parameter cannot match three frequencies exactly: the mismatch left is reported, not hidden.
    partial = tune_model(foundation.model, measured, [TuningParameter("spring", "mounting")])
    assert partial.mismatch_after > 0.01
    assert partial.rms_mismatch_after < partial.rms_mismatch_before
    assert foundation.model.springs[0].stiffness == 1.1e9  # the original scenario is untouched


def test_tuning_errors(foundation):
    from resonance.kinds.field.tuning import TuningParameter, tune_model

    with pytest.raises(R.InputValueError, match=r"spring 'anchor' is not in the model"):
        tune_model(foundation.model, [20.0], [TuningParameter("spring", "anchor")])
    with pytest.raises(R.InputValueError, match=r"bounds \(2\.0, 3\.0\)"):
        tune_model(foundation.model, [20.0], [TuningParameter("spring", "soil", 2.0, 3.0)])
    with pytest.raises(R.InputValueError, match=r"two frequencies pair with the same model mode"):
        tune_model(foundation.model, [19.0, 19.5], [TuningParameter("spring", "soil")])


def test_mixed_units_are_declared_per_channel(tmp_path):
    # Two channels, one in um and one in mil (1 mil = 25.4 um, NIST SP 811).
    text = (
        "# amplitude_unit = um\n# amplitude_unit.b = mil\n# amplitude_convention = peak\n"
        "speed_rpm,a_amplitude,a_phase,b_amplitude,b_phase\n100,25.4,10,1,10\n200,50.8,20,2,20\n"
    )
    path = tmp_path / "mixed.csv"
    path.write_text(text)
    data = read_coastdown(path)
    assert_allclose(data.amplitude("a"), data.amplitude("b"), rtol=1e-12)
    path.write_text(text.replace("amplitude_unit.b", "amplitude_unit.c"))
    with pytest.raises(DataFileError, match=r"amplitude_unit\.c: names no channel of the file"):
        read_coastdown(path)
