#!/usr/bin/env bash
# Install everything the tests need into .venv and run every test:
# lint (ruff), types (mypy), the API reference (Sphinx, warnings as errors),
# unit and property tests, doctests, the notebooks under nbval, and the
# browser test in Debian's chromium.
# Usage: bash tools/run-tests.sh [extra pytest arguments]
set -euo pipefail
cd "$(dirname "$0")/.."

python3 -m venv .venv
.venv/bin/python -m pip install --quiet --upgrade pip
.venv/bin/python -m pip install --quiet -e ".[test]"

# The browser test drives Debian's chromium; never a downloaded browser.
if ! command -v chromium >/dev/null 2>&1; then
  if [ "$(id -u)" = "0" ] && command -v apt-get >/dev/null 2>&1; then
    apt-get update -qq && apt-get install -y -qq chromium >/dev/null
  else
    echo "chromium is not installed: the browser test will be skipped (sudo apt-get install chromium)" >&2
  fi
fi

.venv/bin/ruff check resonance tests benchmarks notebooks docs
.venv/bin/ruff format --check resonance tests benchmarks
.venv/bin/mypy
# The API reference and the notebooks as pages, offline, warnings as errors.
.venv/bin/python -m sphinx -W -q -b html docs docs/_build

set +e
.venv/bin/python -m pytest "$@"
status=$?
set -e
if [ "$status" -eq 5 ]; then
  echo "pytest collected no tests: failing the run" >&2
  exit 1
fi
exit "$status"
