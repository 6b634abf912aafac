"""A real browser: Voila serves the single-mode notebook, headless Chromium drives it.

The page runs the notebook, shows the verdict (FAIL for the demo pump: its
lateral mode sits inside the 2x band, per the separation-margin definition of
API RP 684, from memory); moving the lower handle of the speed-range slider up
to about 1500 rpm clears the 2x coincidence by more than the required margin
and the verdict text must turn to PASS (the same change the headless panel
test checks against the engine). Uses Debian's chromium through the Python
playwright package; never a downloaded browser.
"""

from __future__ import annotations

import os
import shutil
import socket
import subprocess
import sys
import time
from pathlib import Path

import pytest

NOTEBOOKS = Path(__file__).resolve().parent.parent / "notebooks"
FLAGS = [
    "--headless",
    "--no-sandbox",
    "--disable-gpu",
    "--disable-background-networking",
    "--disable-component-update",
    "--disable-sync",
    "--no-first-run",
    "--disable-quic",
]


def _chromium() -> str:
    path = shutil.which("chromium")
    if path is None:
        if os.environ.get("CI"):
            pytest.fail("chromium is not installed; CI must install Debian's chromium (tools/run-tests.sh does)")
        pytest.skip("Debian's chromium is not installed (apt-get install chromium)")
    return path


def _free_port() -> int:
    with socket.socket() as s:
        s.bind(("127.0.0.1", 0))
        return int(s.getsockname()[1])


def _serve(notebook: str, root: Path) -> tuple[subprocess.Popen, str]:
    shutil.copy(NOTEBOOKS / notebook, root / notebook)
    shutil.copytree(NOTEBOOKS / "scenarios", root / "scenarios")
    shutil.copytree(NOTEBOOKS / "data", root / "data")
    env = dict(os.environ)
    for name in ("JUPYTER_CONFIG_DIR", "JUPYTER_RUNTIME_DIR", "JUPYTER_DATA_DIR"):
        folder = root / f".{name.lower()}"
        folder.mkdir()
        env[name] = str(folder)
    port = _free_port()
    process = subprocess.Popen(
        [sys.executable, "-m", "voila", "--no-browser", f"--port={port}", "--Voila.ip=127.0.0.1", notebook],
        cwd=root,
        env=env,
        stdout=subprocess.DEVNULL,
        stderr=subprocess.DEVNULL,
    )
    deadline = time.monotonic() + 60
    while time.monotonic() < deadline:
        with socket.socket() as s:
            if s.connect_ex(("127.0.0.1", port)) == 0:
                return process, f"http://127.0.0.1:{port}/"
        if process.poll() is not None:
            raise RuntimeError(f"voila exited with code {process.returncode}")
        time.sleep(0.2)
    process.kill()
    raise RuntimeError("voila did not start within 60 s")


def open_page(playwright, chromium: str, url: str):
    # playwright gives the browser a fresh temporary profile of its own.
    browser = playwright.chromium.launch(executable_path=chromium, args=FLAGS)
    page = browser.new_page(viewport={"width": 1280, "height": 1800})
    page.goto(url, timeout=120_000)
    return browser, page


@pytest.mark.browser
def test_speed_range_changes_verdict_in_the_browser(tmp_path):
    from playwright.sync_api import expect, sync_playwright

    chromium = _chromium()
    process, url = _serve("01_single_mode_check.ipynb", tmp_path)
    try:
        with sync_playwright() as p:
            browser, page = open_page(p, chromium, url)
            try:
                verdict = page.locator(".verdict").first
                expect(verdict).to_contain_text("Verdict: FAIL", timeout=120_000)
                # The plot is live: plotly drew the response curve into the page.
                expect(page.locator(".js-plotly-plot").first).to_be_visible(timeout=60_000)
                first_speed = "document.querySelector('.js-plotly-plot').data[0].x[0]"
                assert page.evaluate(first_speed) == pytest.approx(450.0)  # axis starts at half the minimum speed
                handle = page.locator(".widget-slider .noUi-handle-lower").first
                handle.focus()
                for _ in range(60):  # 900 -> 1500 rpm in steps of 10
                    handle.press("ArrowRight")
                expect(verdict).to_contain_text("Verdict: PASS", timeout=60_000)
                expect(page.locator(".widget-readout").first).to_contain_text("1500")
                # The figure's traces were updated in place in the page (the axis now starts at 750 rpm).
                page.wait_for_function(f"Math.abs({first_speed} - 750) < 1e-6", timeout=30_000)
                shots = os.environ.get("RESONANCE_SCREENSHOTS")
                if shots:
                    page.screenshot(path=str(Path(shots) / "01_single_mode_check_after.png"), full_page=False)
            finally:
                browser.close()
    finally:
        process.terminate()
        process.wait(timeout=20)


EXPECTED_TEXT = {
    "01_single_mode_check.ipynb": "Verdict: FAIL",
    "02_machine_on_support.ipynb": "Verdict: FAIL",
    "03_what_if.ipynb": "over the stiffness +/- 30 %",
    "04_calculation_record.ipynb": "VERDICT: FAIL",
    "05_rotor_critical_speeds.ipynb": "Forward critical speeds:",
    "06_field_verification.ipynb": "Field verdict:",
    "07_torsional_train.ipynb": "Forced torque:",
    "08_uncertainty_and_fixes.ipynb": "Probability that a margin fails",
    "09_supports_in_space.ipynb": "1x vibration at the probes",
}


@pytest.mark.browser
@pytest.mark.parametrize("notebook", sorted(EXPECTED_TEXT))
def test_every_notebook_renders_live(tmp_path, notebook):
    """Each notebook runs in Voila and shows its caution, widgets and verdict; optionally saves a screenshot."""
    from playwright.sync_api import expect, sync_playwright

    chromium = _chromium()
    process, url = _serve(notebook, tmp_path)
    try:
        with sync_playwright() as p:
            browser, page = open_page(p, chromium, url)
            try:
                expect(page.get_by_text(EXPECTED_TEXT[notebook]).first).to_be_visible(timeout=120_000)
                expect(page.get_by_text("Operating near an unverified resonance").first).to_be_visible(timeout=60_000)
                expect(page.locator(".widget-button, .widget-slider").first).to_be_visible(timeout=60_000)
                shots = os.environ.get("RESONANCE_SCREENSHOTS")
                if shots:
                    page.wait_for_timeout(1500)  # let plotly finish drawing
                    page.screenshot(path=str(Path(shots) / notebook.replace(".ipynb", ".png")))
            finally:
                browser.close()
    finally:
        process.terminate()
        process.wait(timeout=20)
