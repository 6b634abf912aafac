"""Shared fixtures: the demo scenarios (invented machines, see notebooks/scenarios/)."""

from pathlib import Path

import pytest

from resonance.kinds.support.scenario import load_scenario

SCENARIOS = Path(__file__).resolve().parent.parent / "notebooks" / "scenarios"


@pytest.fixture
def pump_path() -> Path:
    return SCENARIOS / "cooling_water_pump.toml"


@pytest.fixture
def foundation_path() -> Path:
    return SCENARIOS / "feed_pump_foundation.toml"


@pytest.fixture
def pump(pump_path):
    return load_scenario(pump_path)


@pytest.fixture
def foundation(foundation_path):
    return load_scenario(foundation_path)


@pytest.fixture
def fan():
    from resonance.kinds.rotor.scenario import load_rotor_scenario

    return load_rotor_scenario(SCENARIOS / "fan_rotor.toml")
