"""pytest setup: the built module and CLI come from the environment (CTest sets them)."""
import os
import sys

BUILD_MODULE_DIR = os.environ.get("RIDGECAL_PYTHON_MODULE_DIR")
if BUILD_MODULE_DIR:
    sys.path.insert(0, BUILD_MODULE_DIR)

# The CLI binary the byte-identity tests compare against.
CLI = os.environ.get("RIDGECAL_CLI", "ridgecal")
SAMPLES_DIR = os.environ.get(
    "RIDGECAL_SAMPLES_DIR",
    os.path.join(os.path.dirname(__file__), "..", "..", "calibration-samples"))


def pytest_configure(config):
    config.addinivalue_line("markers", "slow: timing test, judged on an idle machine")
