"""Vibration limits against the published tables.

Sources: ISO 10816-3:2009 Table A.1 zone boundaries (mm/s RMS), group 1 rigid
2.3 / 4.5 / 7.1, flexible 3.5 / 7.1 / 11.0, group 2 rigid 1.4 / 2.8 / 4.5,
flexible 2.3 / 4.5 / 7.1 (from memory); API Std 617 8th ed. shaft limit
L = 25.4 sqrt(12000 / N) um pk-pk, capped at 25.4 um (from memory).
"""

import math

import pytest
from numpy.testing import assert_allclose

import resonance as R


@pytest.mark.parametrize(
    ("group", "support", "mm_s"),
    [
        (1, "rigid", (2.3, 4.5, 7.1)),
        (1, "flexible", (3.5, 7.1, 11.0)),
        (2, "rigid", (1.4, 2.8, 4.5)),
        (2, "flexible", (2.3, 4.5, 7.1)),
    ],
)
def test_iso_zone_limits(group, support, mm_s):
    assert_allclose(R.iso_velocity_zone_limits(group, support), [v * 1e-3 for v in mm_s], rtol=1e-15)


def test_iso_zone_of_values():
    # group 2 rigid: 1.0 -> A, 2.0 -> B, 3.0 -> C, 5.0 -> D mm/s RMS (ISO 10816-3 Table A.1, from memory).
    assert R.iso_velocity_zone([1.0e-3, 2.0e-3, 3.0e-3, 5.0e-3], 2, "rigid") == ["A", "B", "C", "D"]
    assert R.iso_velocity_zone(R.ureg("0.2 in/s"), 1, "flexible") == ["B"]  # 5.08 mm/s


def test_api_shaft_limit():
    # API 617 (from memory): 25.4 sqrt(12000 / N) um, not above 25.4 um.
    assert_allclose(R.api_shaft_vibration_limit(3600.0), 25.4e-6, rtol=1e-15)
    assert_allclose(R.api_shaft_vibration_limit(24000.0), 25.4e-6 * math.sqrt(0.5), rtol=1e-14)
    assert_allclose(R.ureg.Quantity(R.api_shaft_vibration_limit(12000.0), "m").to("mil").magnitude, 1.0, rtol=1e-14)


def test_bad_limit_inputs():
    with pytest.raises(R.InputValueError, match=r"group/support: got \(3, 'rigid'\)"):
        R.iso_velocity_zone_limits(3, "rigid")  # type: ignore[arg-type]
    with pytest.raises(R.InputValueError, match=r"velocity_rms: got -1 m/s"):
        R.iso_velocity_zone([-1.0], 1, "rigid")
