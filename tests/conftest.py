import sys
from pathlib import Path

import matplotlib

matplotlib.use("Agg")

ROOT = Path(__file__).resolve().parents[1]
if str(ROOT / "src") not in sys.path:
    sys.path.insert(0, str(ROOT / "src"))

# Hypothesis profiles for the fuzz tests (tests/fuzzkit.py, tests/test_fuzz_*.py):
# "ci" (default) keeps the fuzz part of the suite within a few minutes on 2 cores;
# "long" (SATHEIGHT_FUZZ=long) runs FUZZ_SCALE times more cases per test.
import os  # noqa: E402

import pytest  # noqa: E402
from hypothesis import HealthCheck, settings  # noqa: E402

FUZZ_PROFILE = os.environ.get("SATHEIGHT_FUZZ", "ci")
settings.register_profile("ci", deadline=None, max_examples=100, print_blob=True,
                          suppress_health_check=[HealthCheck.too_slow, HealthCheck.data_too_large])
settings.register_profile("long", deadline=None, max_examples=2000, print_blob=True,
                          suppress_health_check=[HealthCheck.too_slow, HealthCheck.data_too_large])
settings.load_profile(FUZZ_PROFILE if FUZZ_PROFILE in ("ci", "long") else "ci")


def _is_fuzz(item) -> bool:
    """A fuzz test: any test in tests/test_fuzz_*.py, and any hypothesis test elsewhere.

    Generated-input tests are the slow part of the suite (minutes on 2 cores); the marker lets
    the README's command (``-m "not fuzz"``) stay within 3 minutes while ``.ci/run`` runs them
    in a second step (``-m fuzz``).
    """
    if item.path.name.startswith("test_fuzz_"):
        return True
    # hypothesis sets this attribute on every test decorated with @given (public since 3.x)
    return bool(getattr(getattr(item, "obj", None), "is_hypothesis_test", False))


def pytest_collection_modifyitems(config, items):
    for item in items:
        if _is_fuzz(item):
            item.add_marker(pytest.mark.fuzz)
